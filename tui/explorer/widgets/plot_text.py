"""Plot text with ANSI colour codes turned into styled Rich text, quickly.

plotext colours a picture with SGR sequences, each coloured run followed by a reset. Rich's
general ANSI decoder handles every terminal sequence and costs about as much as building the
plot; this reader handles SGR runs only, and decodes each distinct run of codes once.
"""

from __future__ import annotations

import re
from functools import lru_cache

from rich.ansi import AnsiDecoder
from rich.style import Style
from rich.text import Span, Text

_SGR = re.compile(r"\x1b\[([0-9;]*)m")


@lru_cache(maxsize=256)
def _style(codes: str) -> Style | None:
    """The style of one combination of SGR codes ("38;5;12", "48;5;15;38;5;10")."""
    decoded = next(iter(AnsiDecoder().decode(f"\x1b[{codes}mX")))
    return decoded.spans[0].style if decoded.spans else None   # type: ignore[return-value]


def styled_plot_text(ansi: str) -> Text:
    """The same text and styles as rich.text.Text.from_ansi for plotext's output."""
    pieces = _SGR.split(ansi)
    plain: list[str] = []
    spans: list[Span] = []
    position = 0
    codes: list[str] = []
    for index, piece in enumerate(pieces):
        if index % 2:                          # an SGR parameter list
            if piece in ("", "0"):
                codes = []
            else:
                codes.append(piece)
            continue
        if not piece:
            continue
        plain.append(piece)
        end = position + len(piece)
        if codes:
            style = _style(";".join(codes))
            if style is not None:
                spans.append(Span(position, end, style))
        position = end
    return Text("".join(plain), spans=spans, end="")
