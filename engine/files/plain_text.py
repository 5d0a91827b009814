"""Text from files made safe for a terminal: control characters (escape sequences that set the
window title, clear the screen or move the cursor; bidirectional overrides; invisible format
characters) are removed."""

from __future__ import annotations

import re

#: An escape sequence (CSI, OSC, or a two-character escape), removed whole.
_ESCAPE_SEQUENCE = re.compile(r"\x1b(\[[0-?]*[ -/]*[@-~]?|\][^\x07\x1b]*(\x07|\x1b\\)?|[@-_]?)|\x9b[0-?]*[ -/]*[@-~]?")
#: Invisible format characters besides: direction marks, zero-width spaces and joiners, the line
#: and paragraph separators, the word joiner and the byte-order mark (one name could pass for another).
_INVISIBLE = "\u061c\u200b-\u200f\u2028\u2029\u2060-\u2064\ufeff"
_CONTROLS = re.compile(rf"[\x00-\x1f\x7f-\x9f\u202a-\u202e\u2066-\u2069{_INVISIBLE}]")
_CONTROLS_BUT_LINES = re.compile(rf"[\x00-\x09\x0b-\x1f\x7f-\x9f\u202a-\u202e\u2066-\u2069{_INVISIBLE}]")


def without_controls(text: str, keep_newlines: bool = False) -> str:
    """`text` without escape sequences and control characters; tabs become spaces, and newlines
    are kept only with `keep_newlines` (other line breaks become spaces)."""
    text = _ESCAPE_SEQUENCE.sub("", text).replace("\t", " ")
    if keep_newlines:
        return _CONTROLS_BUT_LINES.sub("", text.replace("\r\n", "\n"))
    return _CONTROLS.sub("", text.replace("\r\n", " ").replace("\n", " ").replace("\r", " "))


def has_controls(text: str) -> bool:
    """Whether `text` holds any control character (tab and newline included)."""
    return _CONTROLS.search(text) is not None
