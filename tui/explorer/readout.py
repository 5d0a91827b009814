"""Temperatures as a practitioner quotes them, in whatever unit they are already in.

Percentages are quoted by the line-mode commands' own rule (`ladle.tui.quote.percent`), so the
explorer and `ladle point` print the same digits.
"""

from __future__ import annotations


def format_temperature_value(value: float, decimals: int = 0) -> str:
    """A temperature's number: "183", "456.2" (boundaries and reactions to the whole degree,
    the cursor to a tenth); never "-0"."""
    text = f"{value:.{decimals}f}"
    return text.lstrip("-") if float(text) == 0.0 else text


def format_step(value: float) -> str:
    """A step size without trailing zeros: 10 -> "10", 0.5 -> "0.5", 0.02 -> "0.02"."""
    return f"{value:.6g}"
