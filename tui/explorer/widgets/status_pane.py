"""The status pane: what the alloy holds at the cursor, as lines of text."""

from __future__ import annotations

import textwrap
from typing import Self

from rich.text import Text
from textual.geometry import Region
from textual.strip import Strip
from textual.visual import Visual, visualize
from textual.widget import Widget

from ..status_lines import Line


class StatusPane(Widget):
    """Shows (role, text) lines; the stylesheet styles each role through component classes.
    A line longer than the pane wraps at its words, its further rows indented under its text.
    Each line is turned into screen lines once,
    and only the screen lines that differ from those shown are repainted."""

    COMPONENT_CLASSES = {"status-pane--heading", "status-pane--value", "status-pane--note",
                         "status-pane--warning"}

    def __init__(self, *, id: str | None = None) -> None:
        super().__init__(id=id)
        self._wanted: list[list[Line]] = [[]]   # the lines, then shorter ones
        self._lines: list[Line] = []            # those shown
        self._rows: list[Strip] = []            # the screen lines shown, top to bottom
        self._made: dict[tuple[Line, int], list[Strip]] = {}   # one line's screen lines, by width
        self._stale = True     # styles or size changed: every screen line is made again

    def show_lines(self, lines: list[Line], *shorter: list[Line]) -> None:
        """Replace the pane's text with these lines, or, where they would not fit the pane's
        height, with the first of `shorter` (the same facts in fewer lines, in order of
        preference) that fits: no line is ever cut off."""
        self._wanted = [list(lines), *shorter]
        width = self.size.width
        if self._stale or not width:
            self.refresh()
            return
        before, after = self._rows, self._make_rows()
        self._rows = after
        for y in range(max(len(before), len(after))):
            if y >= len(before) or y >= len(after) or before[y] is not after[y]:
                self.refresh(Region(0, y, width, 1))

    def _make_rows(self) -> list[Strip]:
        width = self.size.width
        if not width:
            return []
        made: dict[tuple[Line, int], list[Strip]] = {}
        for lines in self._wanted:
            rows = self._rows_of(lines, width, made)
            if len(rows) <= self.size.height:
                break
        self._lines = lines
        self._made = made    # keeps the lines shown now, drops those of earlier positions
        return rows

    def _rows_of(self, lines: list[Line], width: int,
                 made: dict[tuple[Line, int], list[Strip]]) -> list[Strip]:
        rows: list[Strip] = []
        for line in lines:
            key = (line, width)
            strips = self._made.get(key)
            if strips is None:
                role, text = line
                styled = Text(_hanging(text, width), style=self.get_component_rich_style(f"status-pane--{role}"),
                              no_wrap=False, overflow="fold")
                strips = Visual.to_strips(self, visualize(self, styled), width, None,
                                          self.visual_style)
            made[key] = strips
            rows += strips
        return rows

    def refresh(self, *regions: Region, **options) -> Self:
        if not regions:      # a whole repaint (new size, theme or styles)
            self._stale = True
        return super().refresh(*regions, **options)

    def render_line(self, y: int) -> Strip:
        if self._stale:
            self._made = {}
            self._rows = self._make_rows()
            self._stale = False
        rows = self._rows
        return rows[y] if 0 <= y < len(rows) else Strip.blank(self.size.width,
                                                               self.visual_style.rich_style)

    def rows_needed(self) -> int:
        """How many screen lines the pane's text takes (more than its height: some are cut)."""
        return len(self._rows)

    def plain_text(self) -> str:
        """The pane's text without styles (what a reader sees)."""
        lines = self._lines if self.size.width else self._wanted[0]
        return "\n".join(text for _, text in lines)


def _hanging(text: str, width: int) -> str:
    """`text` as it fits a pane `width` cells wide: unchanged where it fits, else broken at its
    words (a hyphen holds its word together: '(Ag-rich)') with each further row indented two
    cells more than the line ('too small: delta ferrite +' over '   liquid', not a row starting
    at the pane's edge as a new line would)."""
    if len(text) <= width:
        return text
    lead = " " * (len(text) - len(text.lstrip(" ")) + 2)
    return "\n".join(textwrap.wrap(text, width, subsequent_indent=lead, break_on_hyphens=False)) or text
