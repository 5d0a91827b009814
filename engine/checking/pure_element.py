"""The model's values of a pure element's own facts (systems/FORMAT.md, "Measured facts"), which
the element data build in and which are therefore shown apart from the independent checks:

- melting, transformation: the temperature (K) at which the stable phase of the pure element
  changes (to liquid, or from the named phase above to the one below), from the transition scan
  of the pure element (engine/diagrams/alloy_transitions.py) within SCAN_HALF_WIDTH_K of the fact;
- curie: the Curie temperature (K) of the pure element in a phase, where its heat capacity
  Cp = -T d2G/dT2 peaks (second differences of G in steps of 0.5 K, with h = 0.01 K).
"""

from __future__ import annotations

import numpy as np

from ..models.system import Fact
from .measure import Comparison, FactOutcome, temperature_spread

#: The scan runs this far (K) on each side of the fact's temperature, or three tolerances if wider.
SCAN_HALF_WIDTH_K = 40.0
#: The heat-capacity peak is searched this far (K) on each side of the fact's temperature.
CURIE_HALF_WIDTH_K = 60.0


def _half_width(fact: Fact, least: float) -> float:
    return max(least, 3.0 * (temperature_spread(fact) or 0.0))


def _compared(fact: Fact, T: float | None, problem: str | None = None) -> FactOutcome:
    return FactOutcome(fact, (Comparison("temperature", "K", fact.temperature_K, T, temperature_spread(fact)),), problem)


def pure_element_change(system, fact: Fact, above: str, below: str | None) -> FactOutcome:
    """The temperature at which pure `fact.element` changes on cooling from the phase `above` to
    `below` (None: any phase other than `above`), from its transition scan."""
    from ..diagrams.alloy_transitions import alloy_transitions

    half = _half_width(fact, SCAN_HALF_WIDTH_K)
    lo, hi = system.model_range_K
    x = np.eye(len(system.elements))[system.elements.index(fact.element)]
    scan = alloy_transitions(system, x, highest_K=min(hi, fact.temperature_K + half),
                             lowest_K=max(lo, fact.temperature_K - half))
    found = [t for t in scan.transitions if t.above == (above,) and len(t.below) == 1 and t.below[0] != above
             and below in (None, t.below[0])]
    if not found:
        what = f"{above} to {below}" if below else f"{above} to a solid"
        return _compared(fact, None, f"pure {fact.element} does not change from {what} within {half:g} K of "
                                     f"{fact.temperature_K:.2f} K in this model")
    return _compared(fact, min((t.temperature_K for t in found), key=lambda T: abs(T - fact.temperature_K)))


def curie_temperature(system, fact: Fact) -> FactOutcome:
    """Where the heat capacity of pure `fact.element` in `fact.phase` peaks near the fact's
    temperature."""
    phase = system.models[fact.phase]
    y = []
    for lattice in phase.constituents:   # the element where the sublattice holds it, else vacancies
        fill = fact.element if fact.element in lattice else "Va" if "Va" in lattice else None
        if fill is None:
            return _compared(fact, None, f"{fact.phase} cannot hold pure {fact.element}")
        y += [1.0 if c == fill else 0.0 for c in lattice]
    y = np.array(y)
    half, h = _half_width(fact, CURIE_HALF_WIDTH_K), 1e-2
    Ts = np.arange(fact.temperature_K - half, fact.temperature_K + half + 0.25, 0.5)
    G = np.array([[float(phase.at(T + d).gibbs(y)) for d in (-h, 0.0, h)] for T in Ts])
    cp = -Ts * (G[:, 0] - 2.0 * G[:, 1] + G[:, 2]) / h**2
    k = int(np.argmax(cp))
    if k in (0, len(Ts) - 1):
        return _compared(fact, None, f"the heat capacity of pure {fact.element} in {fact.phase} has no peak within "
                                     f"{half:g} K of {fact.temperature_K:.2f} K")
    return _compared(fact, float(Ts[k]))
