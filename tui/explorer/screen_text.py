"""The screen as plain text, line by line: for the text snapshot key and for tests."""

from __future__ import annotations

import io

from rich.console import Console
from textual.app import App


def screen_text(app: App) -> str:
    """What the terminal shows now, as text without styles (trailing spaces removed)."""
    width, height = app.size
    console = Console(width=width, height=height, file=io.StringIO(), force_terminal=True,
                      color_system=None, record=True, legacy_windows=False, safe_box=False)
    console.print(app.screen._compositor.render_update(
        full=True, screen_stack=app._background_screens))
    lines = console.export_text(styles=False).split("\n")
    return "\n".join(line.rstrip() for line in lines[:height]) + "\n"
