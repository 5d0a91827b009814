"""Numbers as a practitioner quotes them: temperatures to the degree (or tenth near a boundary
check), percentages to three significant figures, energies to the joule."""

from __future__ import annotations

import math
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
    return f"{value:.{decimals}f} {sign}{unit}"


def percent(fraction: float) -> str:
    """A fraction as a percentage with about three significant figures: '40.0', '2.51', '0.0031'."""
    v = 100.0 * fraction
    a = abs(v)
    if a == 0.0:
        return "0"
    if a >= 10:
        rest = 100.0 - a
        if 0.0 < rest < 0.05:  # never round a near-pure value up to 100
            return f"{v:.{min(12, 1 - math.floor(math.log10(rest)))}f}"
        return f"{v:.1f}"
    if a >= 1:
        return f"{v:.2f}"
    if a >= 1e-3:
        return f"{v:.3g}"
    return f"{v:.1e}"


def energy(j_per_mol: float) -> str:
    """'-98765 J/mol'."""
    return f"{j_per_mol:.0f} J/mol"
