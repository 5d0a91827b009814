"""Numbers as a practitioner quotes them: temperatures to the degree (or tenth near a boundary
check), percentages to three significant figures, energies to the joule; and text from the
person or a file as a message shows it: on one line, escaped and shortened."""

from __future__ import annotations

import math
import os
import sys

from ladle.engine.units import kelvin_to


def degree_sign() -> str:
    """'°' where the output can carry it, else ''."""
    enc = (getattr(sys.stdout, "encoding", "") or "").lower()
    return "°" if "utf" in enc else ""


def temperature(T_K: float, unit: str, decimals: int = 1) -> str:
    """'1250.0 °C', '1523.2 K', '2282.0 °F'."""
    value = kelvin_to(T_K, unit)
    sign = "" if unit == "K" else degree_sign()
    return f"{value:.{decimals}f} {sign}{unit}".removeprefix("-" if round(value, decimals) == 0 else "+")


def temperature_difference(dT_K: float, unit: str, decimals: int = 1) -> str:
    """A temperature difference in the unit the temperatures are shown in: '40.0 °C' (the same
    number in K), '72.0 °F'. ladle's one convention: a difference takes the temperatures' unit
    and is always named as one (a range, a superheat, a distance up or down)."""
    value = dT_K * 1.8 if unit == "F" else dT_K
    sign = "" if unit == "K" else degree_sign()
    return f"{value:.{decimals}f} {sign}{unit}"


SMALLEST_PERCENT = 1e-3   # shares below this (and within it of 100 %) are numerical noise to a reader
#: Percentages below this are shown as nothing ('0'): rounding noise of sums near 1 (1e-13 of the
#: alloy), well below a content anyone types (1e-9 wt% is shown '<0.001', as its at% is).
NOTHING_PERCENT = 1e-11


def percent(fraction: float) -> str:
    """A fraction as a percentage with three significant figures: '40.0', '2.51', '0.800',
    '0.00310'; below 0.001 % '<0.001' (and '0' for nothing), and a near-pure value never
    rounded up to 100 ('99.98', '>99.999'; within NOTHING_PERCENT of it, rounding noise of a
    sum, '100.0'). JSON output keeps full precision instead."""
    v = 100.0 * fraction
    a = abs(v)
    if a < NOTHING_PERCENT:
        return "0"
    if a >= 9.995:   # what rounds to 10.00 is shown as 10.0
        rest = 100.0 - a
        if abs(rest) < NOTHING_PERCENT:    # the whole, off by rounding noise only (0.9999999999999999)
            return f"{math.copysign(100.0, v):.1f}"
        if 0.0 < rest < SMALLEST_PERCENT:
            return f">{100.0 - SMALLEST_PERCENT:g}"
        if 0.0 < rest < 0.05:  # never round a near-pure value up to 100
            return f"{v:.{-math.floor(math.log10(rest))}f}"
        return f"{v:.1f}"
    if a >= 1:
        return f"{v:.2f}"
    if a >= SMALLEST_PERCENT:
        return f"{v:#.3g}"
    return f"<{SMALLEST_PERCENT:g}"


def energy(j_per_mol: float) -> str:
    """'-98765 J/mol'."""
    return f"{j_per_mol:.0f} J/mol"


#: Longest message text echoed from the user's input or a file (characters); longer text is
#: shortened in the middle.
LONGEST_ECHO = 300


def shortened(text: str, limit: int = LONGEST_ECHO) -> str:
    """`text`, or its beginning and end around '...(N characters)...' when longer than `limit`."""
    if len(text) <= limit:
        return text
    head, tail = (2 * limit) // 3, limit // 4
    return f"{text[:head]}...({len(text)} characters)...{text[-tail:]}"


def one_line(text: str, limit: int = LONGEST_ECHO * 2) -> str:
    """A message made safe for one terminal line: control characters (newlines, escape
    sequences) shown as backslash escapes, and no longer than about `limit` characters."""
    from ladle.engine.files.plain_text import has_controls

    if has_controls(text):
        text = "".join(repr(ch)[1:-1] if has_controls(ch) else ch for ch in text)
    return shortened(text, limit)


def quoted_path(path: object) -> str:
    """A path for a message: as it is when plain, else quoted with escapes; shortened when long."""
    from ladle.engine.files.plain_text import has_controls

    text = os.fsdecode(path) if isinstance(path, (bytes, os.PathLike)) else str(path)
    if has_controls(text) or text != text.strip() or not text:
        text = repr(text)
    return shortened(text)
