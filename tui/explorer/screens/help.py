"""The help screen: every key, and the safety cautions (general and of this system)."""

from __future__ import annotations

from rich.table import Table
from rich.text import Text
from textual.app import ComposeResult
from textual.binding import Binding
from textual.containers import VerticalScroll
from textual.screen import ModalScreen
from textual.widgets import Static

from ..cautions import GENERAL_CAUTIONS
from ..glyphs import Glyphs
from ..keymap import help_rows


class HelpScreen(ModalScreen[None]):
    """Keys and cautions; any of Esc, q, ? closes it."""

    BINDINGS = [Binding("escape,q,question_mark,f1", "close", "close", show=False)]

    def __init__(self, glyphs: Glyphs, system_name: str, system_safety: str, element: str,
                 rows: list[tuple[str, str]] | None = None) -> None:
        super().__init__()
        self.glyphs = glyphs
        self.system_name = system_name
        self.system_safety = system_safety
        self.element = element
        self.rows = rows   # (keys, what they do) of the screen that opened the help; None: the main screen's

    def compose(self) -> ComposeResult:
        with VerticalScroll(id="help-body") as body:
            body.border_title = "HELP: safety and keys (Esc closes)"
            yield Static(self._cautions(), id="help-cautions")   # first: seen without scrolling
            yield Static(self._keys(), id="help-keys")
            yield Static(f"Esc closes this help. {self.glyphs.up}{self.glyphs.down} "
                         "PgUp PgDn scroll.", id="help-close")

    def on_mount(self) -> None:
        self.query_one("#help-body").focus()

    def _keys(self) -> Table:
        table = Table(title="KEYS", title_justify="left", box=None, show_header=False,
                      padding=(0, 1), expand=True)
        table.add_column("keys", no_wrap=True, style="bold")
        table.add_column("what they do", ratio=1)
        for keys, what in self.rows or help_rows(self.glyphs, self.element):
            table.add_row(keys, what)
        return table

    def _cautions(self) -> Text:
        text = Text("SAFETY\n", style="bold")
        if self.system_safety:
            text.append(f"{self.system_name}: ", style="bold")
            text.append(self.system_safety + "\n")
        for caution in GENERAL_CAUTIONS:
            text.append(f"- {caution}\n")
        text.append("\n")
        return text

    def action_close(self) -> None:
        self.dismiss(None)
