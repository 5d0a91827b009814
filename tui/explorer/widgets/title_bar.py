"""The top line: the system, its title (never cut: it wraps onto a second line), the range
the model covers, and which view is showing."""

from __future__ import annotations

import textwrap

from rich.text import Text
from textual.widgets import Static

VIEWS = (("diagram", "1 diagram"), ("energy", "2 energy"), ("reactions", "3 reactions"),
         ("cooling", "4 cooling"))


class TitleBar(Static):
    """ "pb-sn  Lead-tin (soft solders)     [1 diagram]  2 energy  3 reactions" """

    COMPONENT_CLASSES = {"title-bar--system", "title-bar--active"}

    _shown: tuple | None = None   # what the bar shows now (its text is redrawn only on a change)

    def show(self, system_name: str, title: str, note: str, view: str, width: int) -> None:
        """Redraw for this system and view; the active view is bracketed (and styled). The
        other views are named in full where the title leaves room, else by their keys; a
        `note` (the range the model covers) that does not fit beside the title goes whole onto
        the next line."""
        shown = (system_name, title, note, view, width)
        if shown == self._shown:
            return
        self._shown = shown
        words = " ".join(filter(None, (title, note)))
        for short in (False, True):
            tabs = self._tabs(view, short)
            if len(system_name) + len(words) + len(tabs) + 4 <= width:
                break
        first = Text(f" {system_name}", style=self.get_component_rich_style("title-bar--system"))
        room = max(width - len(first) - 2 - len(tabs) - 1, 10)
        if len(words) > room and note and len(title) <= room:
            lines = [title, note]
        else:
            lines = textwrap.wrap(words, room) or [""]
        head = lines[0]
        rest = textwrap.wrap(" ".join(lines[1:]), max(width - len(first) - 3, 10))
        first.append(f"  {head}")
        first.append(" " * max(width - len(first) - len(tabs), 1))
        text = first + tabs
        for line in rest:
            text.append("\n" + " " * (len(system_name) + 3) + line)
        self.update(text)

    def _tabs(self, view: str, short: bool) -> Text:
        tabs = Text()
        for key, label in VIEWS:
            if key == view:
                tabs.append(" ")
                tabs.append(f"[{label}]", style=self.get_component_rich_style("title-bar--active"))
            else:
                tabs.append(f" {label.split()[0] if short else label}")
        tabs.append(" ")
        return tabs
