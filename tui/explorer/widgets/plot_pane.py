"""A plotext plot that rebuilds its picture only when what it shows has changed.

textual-plotext rebuilds the whole picture on every refresh; here the built text is kept and
reused while the size, theme and the subclass's `picture_key()` stay the same. Its screen lines
are made once per picture and the cursor is written into them (`crosshair.strips_with_crosshair`;
`render()` gives the same picture as text, `crosshair.with_crosshair`), so a cursor move costs
neither a rebuild nor a new conversion to screen lines; `redraw()` repaints only the lines that
changed.
In ASCII mode the built text is translated character for character (the layout does not move).
"""

from __future__ import annotations

from collections.abc import Callable, Hashable
from typing import Self

from rich.text import Text
from textual.app import RenderResult
from textual.geometry import Region
from textual.strip import Strip
from textual.visual import Visual, visualize
from textual_plotext import PlotextPlot
from textual_plotext.plot import Plot

from ..crosshair import Crosshair, crosshair_cells, strips_with_crosshair, with_crosshair
from ..glyphs import Glyphs
from .plot_text import styled_plot_text


class CachedPlot(PlotextPlot):
    """Base of the explorer's plots: subclasses say what to draw and when it changes."""

    def __init__(self, glyphs: Glyphs, *, id: str | None = None) -> None:
        super().__init__(id=id)
        self.glyphs = glyphs
        self._built_key: Hashable | None = None
        self._built: Text | None = None
        self._strips_key: Hashable | None = None      # the picture's screen lines, and
        self._strips: list[Strip] = []                # those with the cursor written over them
        self._picture_lines: list[str] = []
        self._lines_key: Hashable | None = None
        self._lines: list[Strip] = []
        self._stale = True    # the lines must be made again before the next line is drawn

    def picture_key(self) -> Hashable:
        """A value that changes whenever the picture without the cursor would change (size and
        theme aside)."""
        raise NotImplementedError

    def crosshair(self) -> Crosshair | None:
        """Where to draw the cursor over the picture (None: nowhere)."""
        return None

    def draw(self, plt: Plot, width: int, height: int) -> None:
        """Issue the plot calls for a picture of width x height cells."""
        raise NotImplementedError

    def _picture(self) -> Text:
        """The built picture without the cursor, rebuilt only when its key changes."""
        width, height = self.size.width, self.size.height
        key = (width, height, self.app.theme, self.picture_key())
        if key != self._built_key or self._built is None:
            self._built = self.build_text(self.plt, width, height, self.app.theme,
                                          lambda plt: self.draw(plt, width, height))
            self._built_key = key
        return self._built

    def build_text(self, plt: Plot, width: int, height: int, theme: str,
                   draw: Callable[[Plot], None]) -> Text:
        """A picture of width x height cells built with `plt` (the widget's own, or another in
        a worker thread): `draw` issues the plot calls."""
        plt.clear_figure()
        plt.plotsize(width, height)
        plt._set_size(width, height)  # the same belt-and-braces call as PlotextPlot.render
        plt.theme(self._get_plotext_theme_name(theme))
        if width > 8 and height > 4:
            draw(plt)
        return styled_plot_text(self.glyphs.plot_text(plt.build()))

    def render(self) -> RenderResult:
        picture = self._picture()
        crosshair = self.crosshair()
        return picture if crosshair is None else with_crosshair(picture, crosshair, self.glyphs)

    def _screen_lines(self) -> list[Strip]:
        """The screen lines now: the picture's lines (converted once per picture) with the
        cursor written over them (once per cursor position)."""
        picture = self._picture()
        width, height = self.size
        base_key = (id(picture), width, height, self.visual_style)
        if base_key != self._strips_key:
            self._strips = Visual.to_strips(self, visualize(self, picture), width, height,
                                            self.visual_style)
            self._picture_lines = picture.plain.split("\n")
            self._strips_key = base_key
        crosshair = self.crosshair()
        cells = {} if crosshair is None else crosshair_cells(self._picture_lines, crosshair,
                                                             self.glyphs)
        key = (base_key, tuple(sorted(cells.items())))
        if key != self._lines_key:
            self._lines = strips_with_crosshair(self._strips, cells, self.visual_style.rich_style)
            self._lines_key = key
        return self._lines

    def refresh(self, *regions: Region, **options) -> Self:
        if not regions:
            self._stale = True    # a whole repaint: the lines are made again on the next frame
        return super().refresh(*regions, **options)

    def redraw(self) -> None:
        """After the cursor or what is shown changed: repaint only the screen lines that
        differ from those on screen (a move in temperature changes two lines of the diagram)."""
        if not self.is_mounted or not self.display or self._stale:
            self.refresh()
            return
        before = self._lines
        after = self._screen_lines()
        if len(before) != len(after):
            self.refresh()
            return
        width = self.size.width
        for y, (old, new) in enumerate(zip(before, after)):
            if old is not new:
                super().refresh(Region(0, y, width, 1))

    def render_line(self, y: int) -> Strip:
        """One screen line, from the lines made once per frame."""
        if self._stale:
            self._screen_lines()
            self._stale = False
        lines = self._lines
        return lines[y] if 0 <= y < len(lines) else Strip.blank(
            self.size.width, self.visual_style.rich_style)
