"""The characters the explorer draws with: a Unicode set and a plain-ASCII set.

The ASCII set is for old terminals and serial consoles (`--ascii` or LADLE_ASCII=1): every glyph
is a printable 7-bit character, and `Glyphs.plot_text` maps the plot's box-drawing, braille and
block characters one for one, so a plot keeps its layout when translated.
"""

from __future__ import annotations

import unicodedata
from dataclasses import dataclass

# Marker and block characters that plotext emits, mapped to ASCII of equal width.
_MARKS_TO_ASCII = {
    "•": "*", "●": "o", "▪": "#", "█": "#", "▄": "_", "▀": "^", "▌": "|", "▐": "|",
    "·": ".", "°": " ", "×": "x", "◆": "o", "■": "#", "▲": "^", "▼": "v", "≈": "~",
}


def _ascii_table() -> dict[int, str]:
    """Box drawing (U+2500..U+257F) as - = | +, braille cells (U+2800..U+28FF) as . or :,
    and the markers above."""
    table = {ord(mark): text for mark, text in _MARKS_TO_ASCII.items()}
    for code in range(0x2500, 0x2580):
        name = unicodedata.name(chr(code), "")
        across, down = "HORIZONTAL" in name, "VERTICAL" in name
        table[code] = ("=" if "DOUBLE" in name else "-") if across and not down else (
            "|" if down and not across else "+")
    for code in range(0x2800, 0x2900):
        dots = bin(code - 0x2800).count("1")
        table[code] = " " if dots == 0 else ("." if dots <= 2 else ":")
    return table


@dataclass(frozen=True)
class Glyphs:
    """One consistent set of characters for the whole screen."""

    ascii_only: bool
    degree: str          # before C and F: "°C" or "C"
    left: str
    right: str
    up: str
    down: str
    boundary_marker: str   # plotext markers: traced boundaries,
    invariant_marker: str  # invariant (three-phase) lines,
    crosshair_marker: str  # the cursor's crosshair lines,
    cursor_marker: str     # the cursor's point (and a compound's point),
    envelope_marker: str   # and the lower envelope of the Gibbs energy curves

    def plot_text(self, text: str) -> str:
        """The plot's built text, translated to ASCII in ASCII mode (same length, same layout;
        a character with no ASCII form becomes "?")."""
        if not self.ascii_only:
            return text
        text = text.translate(_ASCII_TABLE)
        return text if text.isascii() else "".join(c if c.isascii() else "?" for c in text)

    def temperature_unit(self, unit: str) -> str:
        """The printed unit of a temperature: "°C", "°F", "K" (ASCII: "C", "F", "K")."""
        return unit if unit == "K" else f"{self.degree}{unit}"


_ASCII_TABLE = _ascii_table()

UNICODE = Glyphs(
    ascii_only=False, degree="°", left="←", right="→", up="↑", down="↓",
    boundary_marker="braille", invariant_marker="═", crosshair_marker="·", cursor_marker="╋",
    envelope_marker="•",
)

ASCII = Glyphs(
    ascii_only=True, degree="", left="<", right=">", up="^", down="v",
    boundary_marker="*", invariant_marker="=", crosshair_marker=".", cursor_marker="X",
    envelope_marker="o",
)


def glyphs_for(ascii_only: bool) -> Glyphs:
    """The glyph set for ASCII-only (True) or Unicode (False) drawing."""
    return ASCII if ascii_only else UNICODE
