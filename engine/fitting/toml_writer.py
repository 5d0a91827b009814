"""Writing a system document back to TOML (tomllib reads only), and writing files atomically.

The writer covers what system files hold: tables, arrays of tables, inline tables and arrays,
strings, integers, finite floats and booleans. Tables holding tables or lists become [sections]
([phase.liquid], [fit]); the top-level lists of tables ([[check]], [[measured]]) become arrays of
tables; everything else is written inline ({ a = -5000, b = 1.5 }). Floats are written with
Python's shortest repr, so tomllib reads back exactly the same numbers.
"""

from __future__ import annotations

import math
import re
from typing import Any

_BARE_KEY = re.compile(r"[A-Za-z0-9_-]+")
_ESCAPES = {"\\": "\\\\", '"': '\\"', "\b": "\\b", "\t": "\\t", "\n": "\\n", "\f": "\\f", "\r": "\\r"}


def _key(k: str) -> str:
    return k if _BARE_KEY.fullmatch(k) else _string(k)


def _string(s: str) -> str:
    out = []
    for ch in s:
        if ch in _ESCAPES:
            out.append(_ESCAPES[ch])
        elif ord(ch) < 0x20 or ord(ch) == 0x7F:
            out.append(f"\\u{ord(ch):04X}")
        else:
            out.append(ch)
    return '"' + "".join(out) + '"'


def value_text(v: Any) -> str:
    """One TOML value, inline."""
    if isinstance(v, bool):
        return "true" if v else "false"
    if isinstance(v, int):
        return str(v)
    if isinstance(v, float):
        if not math.isfinite(v):
            raise ValueError(f"cannot write the non-finite number {v!r} to a system file")
        return repr(v)
    if isinstance(v, str):
        return _string(v)
    if isinstance(v, dict):
        return "{ " + ", ".join(f"{_key(str(k))} = {value_text(x)}" for k, x in v.items()) + " }" if v else "{}"
    if isinstance(v, (list, tuple)):
        return "[ " + ", ".join(value_text(x) for x in v) + " ]" if v else "[]"
    raise ValueError(f"cannot write a value of type {type(v).__name__} to a system file")


def _is_section(v: Any) -> bool:
    """Tables holding tables or lists are sections; tables of plain values are written inline."""
    return isinstance(v, dict) and any(isinstance(x, (dict, list)) for x in v.values())


def _is_table_array(v: Any) -> bool:
    return isinstance(v, list) and bool(v) and all(isinstance(x, dict) for x in v)


def _table(lines: list[str], name: str, table: dict) -> None:
    """Write `table` under the header `name` ("" for the top level)."""
    top = name == ""
    simple = {k: v for k, v in table.items() if not _is_section(v) and not (top and _is_table_array(v))}
    if name and (simple or not table):
        lines.append(f"\n[{name}]")
    for k, v in simple.items():
        lines.append(f"{_key(str(k))} = {value_text(v)}")
    for k, v in table.items():
        sub = f"{name}.{_key(str(k))}" if name else _key(str(k))
        if _is_section(v):
            _table(lines, sub, v)
        elif top and _is_table_array(v):
            for item in v:
                lines.append(f"\n[[{sub}]]")
                lines += [f"{_key(str(ik))} = {value_text(iv)}" for ik, iv in item.items()]


def toml_text(doc: dict, header: str = "") -> str:
    """The TOML text of `doc`, after `header` (lines of comment, '# ' added to each)."""
    lines = [f"# {h}" if h else "#" for h in header.splitlines()]
    _table(lines, "", doc)
    return "\n".join(lines).lstrip("\n") + "\n"
