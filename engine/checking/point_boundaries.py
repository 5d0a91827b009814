"""Liquidus, solidus and tie-line facts of a binary whose diagram is not mapped (sublattice
phases, as in Fe-C), measured from point equilibria of the general engine instead of the traced
diagram's sections.

- liquidus, solidus: the one-alloy transition scan (engine/diagrams/alloy_transitions.py) of the
  fact's alloy, as for systems of three or more elements;
- boundary (the composition of `phase` on its stable tie-line to `partner` at one temperature):
  point equilibria at that temperature across the covered composition range, denser around the
  stated composition; every answer whose stable phases are exactly the two named ones lies on
  the tie-line (a binary's two-phase field has one tie-line per temperature), and the named
  phase's end nearest the stated composition is the model's value.

Temperatures in K, compositions as mole fraction of the second element.
"""

from __future__ import annotations

import numpy as np

from ..models.system import Fact
from .measure import FactOutcome, composition_comparison, temperature_comparison

#: Overall compositions tried across the covered range, and around the stated one.
_ACROSS, _AROUND = 48, 12
#: Half-width (mole fraction) of the compositions tried around the stated one.
_AROUND_WIDTH = 0.02
#: Bisection steps between two tried compositions: finds a field down to 2^-40 of their spacing.
_BISECTIONS = 40


def point_boundary(system, fact: Fact) -> FactOutcome:
    """The model against a liquidus, solidus or boundary fact of a binary, from point equilibria."""
    if fact.kind in ("liquidus", "solidus"):
        from ..diagrams.alloy_transitions import alloy_transitions

        scan = alloy_transitions(system, np.array([1.0 - fact.x_B, fact.x_B]))
        T = scan.liquidus_K if fact.kind == "liquidus" else scan.solidus_K
        problem = None if T is not None else f"the model has no {fact.kind} of this alloy in its range"
        return FactOutcome(fact, (temperature_comparison(fact, T),), problem)
    quantity = f"x({fact.phase})"
    x = tie_line_end(system, fact.temperature_K, fact.phase, fact.partner, fact.x_B)
    comparison = composition_comparison(fact, None, quantity, 100 * fact.x_B, None if x is None else 100 * x)
    if x is None:
        return FactOutcome(fact, (comparison,),
                           f"the model has no {fact.phase} + {fact.partner} tie-line at {fact.temperature_K:.2f} K")
    return FactOutcome(fact, (comparison,))


def tie_line_end(system, T: float, phase: str, partner: str, near_x: float) -> float | None:
    """x_B of `phase` on the stable tie-line to `partner` at T (K), the end nearest near_x where
    the two are one phase split in a miscibility gap; None where the scan finds no such tie-line.
    A two-phase field narrower than the scan's spacing lies between two tried compositions whose
    stable phases differ: it is found there by bisection."""
    from ..minimize.equilibrium import equilibrate

    def phases_at(x_B: float):
        state = equilibrate(system, T, np.array([1.0 - x_B, x_B]))
        return tuple(sorted(state.phase_names)), state

    lo, hi = system.covers
    tried = np.unique(np.clip(np.concatenate([
        np.linspace(lo, hi, _ACROSS + 2)[1:-1],
        near_x + np.linspace(-_AROUND_WIDTH, _AROUND_WIDTH, _AROUND)]), lo + 1e-9, hi - 1e-9))
    wanted = tuple(sorted((phase, partner)))
    scanned = [phases_at(float(x)) for x in tried]
    found = [state for names, state in scanned if names == wanted]
    if not found:
        for (a, (names_a, _sa)), (b, (names_b, _sb)) in zip(zip(tried, scanned), zip(tried[1:], scanned[1:])):
            if names_a != names_b and set(wanted) <= set(names_a) | set(names_b):
                state = _bisect(phases_at, float(a), float(b), names_a, wanted)
                if state is not None:
                    found.append(state)
    ends = [float(p.x[1]) for state in found for p in state.phases if p.name == phase]
    return min(ends, key=lambda x: abs(x - near_x)) if ends else None


def _bisect(phases_at, a: float, b: float, names_a: tuple[str, ...], wanted: tuple[str, ...]):
    """The state at a composition between a and b (mole fractions of B) whose phases are `wanted`,
    by bisection on the change of stable phases between them; None if none is met."""
    for _ in range(_BISECTIONS):
        m = 0.5 * (a + b)
        names, state = phases_at(m)
        if names == wanted:
            return state
        if names == names_a:
            a = m
        else:
            b = m
    return None
