"""The system picker: type to narrow the list (by name, title, source or an alloy's name), Enter to
open, Esc to go back."""

from __future__ import annotations

import textwrap

from rich.text import Text
from textual.app import ComposeResult
from textual.binding import Binding
from textual.containers import Vertical
from textual.screen import ModalScreen
from textual.widgets import Input, OptionList, Static
from textual.widgets.option_list import Option, OptionDoesNotExist
from textual.worker import get_current_worker

from ladle.tui.quote import one_line

from ..system_choices import SystemChoice, with_check_result


class SystemPicker(ModalScreen[str | None]):
    """Returns the chosen system's name, or None."""

    BINDINGS = [
        Binding("escape", "cancel", "back", show=False),
        Binding("down", "to_list", show=False),
    ]

    def __init__(self, choices: list[SystemChoice], current: str) -> None:
        super().__init__()
        self.choices = choices
        self.current = current

    def compose(self) -> ComposeResult:
        with Vertical(id="picker"):
            yield Static("SYSTEMS  (type to narrow, Enter opens, Esc back)", id="picker-title")
            yield Input(placeholder="search name, title, source or alloy (SAC305)", id="picker-filter")
            yield OptionList(id="picker-list")

    def on_mount(self) -> None:
        field = self.query_one(Input)
        field.cursor_blink = False
        self._fill("")
        field.focus()
        self.run_worker(self._count_checks, thread=True, exclusive=True)

    def reopen(self, current: str) -> None:
        """Ready the kept picker to be shown again: the open system marked, the filter empty
        (the explorer keeps one picker, so that it opens without being built anew)."""
        self.current = current
        field = self.query_one(Input)
        field.value = ""
        self._fill("")
        field.focus()

    def _count_checks(self) -> None:
        """In a thread: how many independent checks each system passes, each shown as soon as it
        is counted (a file seen for the first time takes seconds; given up when the worker is
        cancelled, as when the explorer quits)."""
        worker = get_current_worker()
        for i, choice in enumerate(list(self.choices)):
            if worker.is_cancelled:
                return
            self.app.call_from_thread(self._show_count, i, with_check_result(choice))

    def _show_count(self, index: int, counted: SystemChoice) -> None:
        """Put a counted choice in its place, and in the list where the filter shows it (its
        line alone: the highlight and the scrolling stay where the user has them)."""
        self.choices[index] = counted
        try:
            self.query_one(OptionList).replace_option_prompt(counted.name,
                                                             self._describe(counted, self.query_one(Input).value))
        except OptionDoesNotExist:
            pass

    def _fill(self, query: str) -> None:
        """The choices matching `query`, the system named by it first, then those whose names
        hold it (each group in the catalog's order); where none matches, a line that says so."""
        options = self.query_one(OptionList)
        options.clear_options()
        matching = sorted((choice for choice in self.choices if choice.matches(query)), key=lambda c: c.rank(query))
        options.add_options([Option(self._describe(choice, query), id=choice.name,   # one refresh
                                    disabled=bool(choice.problem))
                             for choice in matching]
                            or [Option(Text(f"  no system's name, title, source or alloy holds {one_line(repr(query))}"),
                                       disabled=True)])
        if matching:
            options.highlighted = 0

    def _describe(self, choice: SystemChoice, query: str = "") -> Text:
        width = max(self.app.size.width * 9 // 10 - 8, 30)   # the list's inner width
        mark = "*" if choice.name == self.current else " "
        text = Text(f"{mark} {choice.name}", style="bold")
        if choice.problem:
            text.append(f"\n    cannot open: {choice.problem}"[:width])
            return text
        lead = len(text.plain) + 2     # the title's first line follows the name
        title = textwrap.wrap(choice.title, width, initial_indent=" " * lead, subsequent_indent="    ")
        text.append("  " + "\n".join(title)[lead:])     # a wrapped title goes on indented
        text.append(f"\n    {choice.checks}")
        source = choice.source.replace("\n", " ")
        text.append(f"\n    {source if len(source) <= width - 4 else source[:width - 5] + '~'}")
        named = choice.alloys_named(query)
        if named:       # found by an alloy's name: which one
            text.append("\n" + "\n".join(textwrap.wrap(f"alloy {', '.join(named)}", width, initial_indent="    ",
                                                       subsequent_indent="      ")), style="bold")
        return text

    def on_input_changed(self, event: Input.Changed) -> None:
        self._fill(event.value)

    def on_input_submitted(self, event: Input.Submitted) -> None:
        options = self.query_one(OptionList)
        if options.highlighted is not None:
            self.dismiss(options.get_option_at_index(options.highlighted).id)

    def on_option_list_option_selected(self, event: OptionList.OptionSelected) -> None:
        self.dismiss(event.option.id)

    def action_to_list(self) -> None:
        self.query_one(OptionList).focus()

    def action_cancel(self) -> None:
        self.dismiss(None)
