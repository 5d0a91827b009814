"""The top line: the system, its title, and which view is showing."""

from __future__ import annotations

from rich.text import Text
from textual.widgets import Static

VIEWS = (("diagram", "1 diagram"), ("energy", "2 energy"), ("reactions", "3 reactions"),
         ("cooling", "4 cooling"))


class TitleBar(Static):
    """ "pb-sn  Lead-tin (soft solders)     [1 diagram]  2 energy  3 reactions" """

    COMPONENT_CLASSES = {"title-bar--system", "title-bar--active"}

    def show(self, system_name: str, title: str, view: str, width: int) -> None:
        """Redraw for this system and view; the active view is bracketed (and styled)."""
        tabs = Text()
        for key, label in VIEWS:
            tabs.append("  ")
            if key == view:
                tabs.append(f"[{label}]", style=self.get_component_rich_style("title-bar--active"))
            else:
                tabs.append(f" {label} ")
        left = Text(f" {system_name}", style=self.get_component_rich_style("title-bar--system"))
        room = width - len(left) - len(tabs) - 1
        if room > 3 and title:
            left.append("  " + (title if len(title) + 2 <= room else title[:room - 3] + "~"))
        left.append(" " * max(width - len(left) - len(tabs), 1))
        self.update(left + tabs)
