"""The line where a point is typed ("650C 12wt%"), with its reason when the entry is bad."""

from __future__ import annotations

from collections.abc import Callable

from textual.app import ComposeResult
from textual.containers import Vertical
from textual.widgets import Input, Static

from ..entry import EntryError, TypedPoint, parse_point


class PointEntry(Vertical):
    """An input line and a problem line under it; hidden until opened."""

    def compose(self) -> ComposeResult:
        yield Input(id="point-input")
        yield Static("", id="point-problem", markup=False)   # the typed text, as typed

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
        """Hide the entry (where it is open) and give the keys back to the screen."""
        if self.display:
            self.clear_problem()
            self.display = False
            self.screen.set_focus(None)

    def submit(self, text: str, system, go: Callable[[TypedPoint], None]) -> bool:
        """Read the typed `text` as a point of `system` and `go` there (go may refuse it with
        EntryError or ValueError, one line); close the entry and say True, or show why not and
        keep the text for correcting."""
        try:
            go(parse_point(text, system.elements, system.molar_mass, system.alloys))
        except (EntryError, ValueError) as error:
            self.show_problem(str(error))
            return False
        self.close()
        return True

    def show_problem(self, reason: str) -> None:
        """Mark the entry as bad, with the reason; the text stays for correcting."""
        self.query_one(Input).add_class("-bad")
        self.query_one("#point-problem", Static).update(f"not used: {reason}")

    def clear_problem(self) -> None:
        """Remove the bad mark."""
        self.query_one(Input).remove_class("-bad")
        self.query_one("#point-problem", Static).update("")
