"""Invariant reactions of four solid phases in a ternary system (no liquid): one solid giving three
(`eutectoid`), two giving two (`quasi-peritectoid`), three giving one (`peritectoid`), the names
`liquidus_projection.classify` gives from the reaction's coefficients.

Method: isothermal sections (`isothermal.map_isothermal`, a coarse grid) on a ladder of
temperatures over the system's window. Below and above a four-phase plane of solids the
three-phase triangles differ: two triangles that share two phases give way to two others (or one
to three, or three to one), so a triangle of solids that vanishes between two rungs and one that
appears there, four phases together, mark a candidate. At the composition in the middle of those
four phases' corners (and, failing that, the middles of the two triangles) the change of the
stable phases is narrowed in temperature by point equilibria (`phase_change.narrow_change`); it
is an invariant where the phases on the two sides make four solids together. Their compositions
are the point equilibria's on either side; the reaction's coefficients and its direction on
cooling (giving off heat) follow as for the liquid's invariants
(`liquidus_projection.four_phase_reaction`).

A plane whose triangles hold no node of the coarse grid, or that lies between two rungs together
with another change of the same triangles, can be missed: the scan sees what the grid resolves.
A system of fewer than four solid phases is not scanned (a miscibility gap's second composition
set as the fourth solid is not looked for). Temperatures in K, compositions in mole fractions.
"""

from __future__ import annotations

import numpy as np

from ..minimize.equilibrium import equilibrate
from .isothermal import map_isothermal
from .liquidus_projection import LIQUID, FourPhaseReaction, four_phase_reaction
from .phase_change import narrow_change, phase_set

#: Rungs of the temperature ladder and steps per side of the sections' grid.
SCAN_RUNGS = 12
SCAN_DIVISIONS = 10
#: Each invariant's temperature is narrowed to this (K).
TOLERANCE_K = 1e-6


def _solid_triangles(section) -> dict[frozenset, np.ndarray]:
    """The three-phase fields of solids of a section: phases -> the corners (3, 3)."""
    out = {}
    for f in section.fields:
        if len(f.phases) == 3 and LIQUID not in f.phases and f.triangles:
            out[frozenset(f.phases)] = np.array(f.triangles[0])
    return out


def solid_invariants(system, rungs: int = SCAN_RUNGS, divisions: int = SCAN_DIVISIONS) -> list[FourPhaseReaction]:
    """The invariant reactions of four solid phases of the ternary `system` within its window,
    hottest first (see the module for the method and what it can miss)."""
    solids = [n for n in system.models if n != LIQUID]
    if len(system.elements) != 3 or len(solids) < 4:
        return []
    lo, hi = system.temperature_range_K
    ladder = np.linspace(hi, lo, rungs)
    found: list[FourPhaseReaction] = []
    above = _solid_triangles(map_isothermal(system, float(ladder[0]), divisions))
    for T_hot, T_cold in zip(ladder[:-1], ladder[1:]):
        below = _solid_triangles(map_isothermal(system, float(T_cold), divisions))
        for gone in set(above) - set(below):
            for new in set(below) - set(above):
                if len(gone | new) != 4:
                    continue
                reaction = _narrowed(system, float(T_hot), float(T_cold), above[gone], below[new], gone | new)
                if reaction is not None and not any(abs(r.temperature_K - reaction.temperature_K) < 10 * TOLERANCE_K
                                                    and {p[0] for p in r.phases} == {p[0] for p in reaction.phases}
                                                    for r in found):
                    found.append(reaction)
        above = below
    return sorted(found, key=lambda r: -r.temperature_K)


def _narrowed(system, T_hot: float, T_cold: float, corners_hot: np.ndarray, corners_cold: np.ndarray,
              phases: frozenset) -> FourPhaseReaction | None:
    """The four-phase invariant of `phases` between T_hot and T_cold (K), narrowed at the middle
    of the two triangles' corners or at either triangle's middle; None where none of these
    compositions changes from three of the phases to the other three of them."""
    for z in (np.vstack([corners_hot, corners_cold]).mean(axis=0), corners_hot.mean(axis=0), corners_cold.mean(axis=0)):
        z = z / z.sum()
        hot, cold = equilibrate(system, T_hot, z), equilibrate(system, T_cold, z)
        k_hot, k_cold = phase_set(hot), phase_set(cold)
        if len(k_hot) != 3 or len(k_cold) != 3 or set(k_hot) | set(k_cold) != set(phases):
            continue
        near, far, near_eq, far_eq = narrow_change(lambda T: equilibrate(system, T, z), T_hot, T_cold, k_hot, hot,
                                                   cold, TOLERANCE_K, system)
        if set(phase_set(near_eq)) | set(phase_set(far_eq)) != set(phases):
            continue
        return _reaction(system, 0.5 * (near + far), near_eq, far_eq)
    return None


def _reaction(system, T: float, hot, cold) -> FourPhaseReaction:
    """The reaction at T (K) among the phases of the equilibria just above (`hot`) and below."""
    shares = {p.name: p for p in cold.phases}
    shares.update({p.name: p for p in hot.phases})
    return four_phase_reaction(T, [(name, system.models[name], np.concatenate(shares[name].site_fractions))
                                   for name in sorted(shares)])
