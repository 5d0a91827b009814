"""Invariant reactions of a binary whose diagram is not mapped (sublattice phases, as in Fe-C),
measured on the transition scan of one alloy (engine/diagrams/alloy_transitions.py) instead of
the mapped diagram.

The alloy is the fact's middle phase composition (the one between the other two; where only two
phases are named, the one that is not a pure element): cooling it crosses the reaction wherever
the model has it nearby. The change whose phases above and below together are three, the named
ones among them, is the model's reaction; the phases' compositions are read
from the equilibria just above and below it (within the scan's tolerance, 1e-3 K). Its kind comes
from where the model's middle phase stands: on the hot side only for a eutectic (or eutectoid
without liquid), on the cold side only for a peritectic (or peritectoid). Temperatures in K,
compositions in at% of the second element.
"""

from __future__ import annotations

import numpy as np

from ..models.system import Fact
from .measure import FactOutcome, reaction_comparisons, reaction_name, temperature_spread

#: The scan runs this far (K) on each side of the fact's temperature, or three tolerances if wider.
SCAN_HALF_WIDTH_K = 40.0


def scanned_invariant(system, fact: Fact) -> FactOutcome:
    """The model against an invariant fact of a binary, from the transition scan of the fact's
    middle phase composition."""
    from ..diagrams.alloy_transitions import alloy_transitions

    named = {name for name, _x in fact.phase_x_B}
    names = " + ".join(name for name, _x in fact.phase_x_B)
    missing = sorted(named - set(system.phases))
    if missing:
        return FactOutcome(fact, reaction_comparisons(fact, None, ()),
                           f"{', '.join(missing)} left out of this system: the reaction cannot occur")
    x_mid = _scanned_alloy(fact)
    if x_mid is None:
        return FactOutcome(fact, reaction_comparisons(fact, None, ()),
                           "an invariant of a binary without a mapped diagram is measured from three named phases, "
                           "or two of which one is a pure element")
    half = max(SCAN_HALF_WIDTH_K, 3.0 * (temperature_spread(fact) or 0.0))
    lo, hi = system.model_range_K
    scan = alloy_transitions(system, np.array([1.0 - x_mid, x_mid]), highest_K=min(hi, fact.temperature_K + half),
                             lowest_K=max(lo, fact.temperature_K - half))
    found = [t for t in scan.transitions
             if named <= set(t.above) | set(t.below) and len(set(t.above) | set(t.below)) == 3]
    if not found:
        return FactOutcome(fact, reaction_comparisons(fact, None, ()),
                           f"the model has no {reaction_name(fact.reaction)} of {names} within {half:g} K of "
                           f"{fact.temperature_K:.2f} K at {100 * x_mid:.4g} at% {system.elements[1]}")
    t = min(found, key=lambda c: abs(c.temperature_K - fact.temperature_K))
    shares = {p.name: float(p.x[1]) for eq in (t.below_equilibrium, t.above_equilibrium) for p in eq.phases}
    kind = _kind(shares, set(t.above), set(t.below))
    problem = None if kind == fact.reaction else \
        f"the model's reaction of {names} at {t.temperature_K:.2f} K is a {kind}, not a {fact.reaction}"
    return FactOutcome(fact, reaction_comparisons(fact, t.temperature_K, tuple(shares.items())), problem, kind)


def _scanned_alloy(fact: Fact) -> float | None:
    """x_B of the alloy whose cooling crosses the fact's reaction: the middle of three named
    compositions, or of two the one that is not a pure element; None otherwise."""
    xs = sorted(x for _n, x in fact.phase_x_B)
    if len(xs) == 3 and len(set(n for n, _x in fact.phase_x_B)) == 3:
        return xs[1]
    inner = [x for x in xs if 0.0 < x < 1.0]
    return inner[0] if len(xs) == 2 and len(inner) == 1 else None


def _kind(x_B: dict[str, float], above: set[str], below: set[str]) -> str:
    """The kind of a binary's three-phase reaction from its phases' compositions (`x_B`) and the
    phase sets just above and below it."""
    middle = sorted(x_B, key=x_B.get)[1]
    liquid = "liquid" in x_B
    if middle in above and middle not in below:
        return "eutectic" if liquid else "eutectoid"
    return "peritectic" if liquid else "peritectoid"
