"""The line where a point is typed ("650C 12wt%"), with its reason when the entry is bad."""

from __future__ import annotations

from textual.app import ComposeResult
from textual.containers import Vertical
from textual.widgets import Input, Static


class PointEntry(Vertical):
    """An input line and a problem line under it; hidden until opened."""

    def compose(self) -> ComposeResult:
        yield Input(id="point-input")
        yield Static("", id="point-problem")

    def on_mount(self) -> None:
        self.query_one(Input).cursor_blink = False   # no idle output over slow links

    def open(self, element: str) -> None:
        """Show the entry, empty, with the keyboard in it; the example names `element`."""
        self.clear_problem()
        field = self.query_one(Input)
        field.placeholder = f"650C 12wt%   923K 20at%   {element}=12wt%   (Enter: go, Esc: back)"
        field.value = ""
        self.display = True
        field.focus()

    def close(self) -> None:
        """Hide the entry."""
        self.clear_problem()
        self.display = False

    def show_problem(self, reason: str) -> None:
        """Mark the entry as bad, with the reason; the text stays for correcting."""
        self.query_one(Input).add_class("-bad")
        self.query_one("#point-problem", Static).update(f"not used: {reason}")

    def clear_problem(self) -> None:
        """Remove the bad mark."""
        self.query_one(Input).remove_class("-bad")
        self.query_one("#point-problem", Static).update("")
