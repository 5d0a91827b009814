"""The bottom line: the most used keys, as many as the width allows."""

from __future__ import annotations

from textual.widgets import Static

from ..glyphs import Glyphs
from ..keymap import key_bar_text


class KeyBar(Static):
    """Lists keys from the key map; `?` opens the full list."""

    def __init__(self, glyphs: Glyphs, *, id: str | None = None) -> None:
        super().__init__(id=id)
        self.glyphs = glyphs

    def on_resize(self) -> None:
        self.update(key_bar_text(self.glyphs, self.size.width))
