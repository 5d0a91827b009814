"""The status pane: what the alloy holds at the cursor, as lines of text."""

from __future__ import annotations

from rich.text import Text
from textual.widgets import Static

from ..status_lines import Line


class StatusPane(Static):
    """Shows (role, text) lines; the stylesheet styles each role through component classes."""

    COMPONENT_CLASSES = {"status-pane--heading", "status-pane--value", "status-pane--note",
                         "status-pane--warning"}

    def show_lines(self, lines: list[Line]) -> None:
        """Replace the pane's text with these lines."""
        text = Text(no_wrap=False, overflow="fold")
        for index, (role, line) in enumerate(lines):
            if index:
                text.append("\n")
            text.append(line, style=self.get_component_rich_style(f"status-pane--{role}"))
        self.update(text, layout=False)   # the pane's size never depends on its text

    def plain_text(self) -> str:
        """The pane's text without styles (what a reader sees)."""
        return str(self.render())
