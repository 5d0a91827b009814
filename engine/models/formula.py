"""Chemical formulas of compounds, written plainly: "Al2Cu", "Cu6Sn5", "Mg2Si", "Al0.6Mg0.4"."""

from __future__ import annotations

import re

_TOKEN = re.compile(r"([A-Z][a-z]?)(\d+(?:\.\d+)?)?")


def parse_formula(text: str) -> dict[str, float]:
    """Element -> count (atoms per formula unit). Raises ValueError on anything else."""
    if not isinstance(text, str) or not text:
        raise ValueError("expected a formula such as \"Al2Cu\"")
    counts: dict[str, float] = {}
    pos = 0
    for m in _TOKEN.finditer(text):
        if m.start() != pos:
            break
        el, n = m.group(1), m.group(2)
        counts[el] = counts.get(el, 0.0) + (float(n) if n else 1.0)
        pos = m.end()
    if pos != len(text) or not counts:
        raise ValueError(f"cannot read formula {text!r}; expected element symbols with counts, such as \"Al2Cu\"")
    if any(v <= 0 for v in counts.values()):
        raise ValueError(f"formula {text!r} has a count that is not positive")
    return counts
