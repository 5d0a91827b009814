"""Where an alloy lies against the eutectic it freezes through: at it, or on the side with less
(hypoeutectic) or more (hypereutectic) of the system's second element B.

The eutectic an alloy of mole fraction x_B freezes through at equilibrium is the eutectic
reaction whose two solid ends enclose x_B; its liquid's composition is the eutectic
composition. Compositions as mole fractions of B, temperatures in K.
"""

from __future__ import annotations

from dataclasses import dataclass

from .melt import LIQUID


@dataclass(frozen=True)
class EutecticPosition:
    """The eutectic an alloy freezes through (`temperature_K`, liquid composition `x_eutectic`)
    and which side of it the alloy lies on: "hypo" (less B), "hyper" (more B) or "at"."""

    temperature_K: float
    x_eutectic: float
    side: str


def eutectic_position(diagram, x_B: float, same: float = 1e-6) -> EutecticPosition | None:
    """The position of the alloy x_B against the eutectic it freezes through (None: it freezes
    through none). `same`: the largest |x_B - x_eutectic| (mole fraction) that is "at" it."""
    for invariant in diagram.invariants:
        if invariant.kind != "eutectic":
            continue
        liquid = [x for name, x in invariant.phases if name == LIQUID]
        solids = [x for name, x in invariant.phases if name != LIQUID]
        if len(liquid) != 1 or len(solids) != 2:
            continue
        if not min(solids) <= x_B <= max(solids):
            continue
        x_e = liquid[0]
        side = "at" if abs(x_B - x_e) <= same else ("hypo" if x_B < x_e else "hyper")
        return EutecticPosition(invariant.temperature_K, x_e, side)
    return None
