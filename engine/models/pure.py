"""Transitions of a pure element between the phases of a system.

The stable phase of pure element i at T is the phase with the lowest G_i(T); a transition is a
temperature where the lowest two cross. Found by scanning and bisection on the element's
temperature functions only (no mixing involved).
"""

from __future__ import annotations

import math
from dataclasses import dataclass

import numpy as np

from ..units import GAS_CONSTANT
from .magnetic import hillert_jarl
from .phases import SolutionPhase
from .sublattice import SublatticePhase


@dataclass(frozen=True)
class PureTransition:
    """Pure `element` changes from phase `below` to phase `above` at `temperature_K`."""

    element: str
    temperature_K: float
    below: str
    above: str


def _pure_function(phase, index: int):
    """The G(T) function of pure element `index` in a substitutional solution phase (either
    form), or None for other phases and for a solution that does not hold the element."""
    if isinstance(phase, SolutionPhase):
        return phase.endmembers[index]
    if isinstance(phase, SublatticePhase) and phase.is_substitutional:
        return phase.end_members.get((phase.elements[index],))
    return None


def _pure_magnetic(phase, index: int, T: float) -> float:
    """G (J/mol) of the magnetic term of pure element `index` in a substitutional solution phase
    at T (K): R T ln(1 + beta) f(T / Tc) with the element's own Curie temperature and moment
    (antiferromagnetic values divided by the phase's factor); 0 for a phase without the term.
    (A substitutional sublattice phase's magnetic terms are not read here: no shipped one has
    them.)"""
    mag = phase.magnetic if isinstance(phase, SolutionPhase) else None
    if mag is None:
        return 0.0
    tc, beta = float(mag.curie_K[index]), float(mag.moment[index])
    tc = tc / mag.antiferro_factor if tc < 0.0 else tc
    beta = beta / mag.antiferro_factor if beta < 0.0 else beta
    if tc <= 1e-9:
        return 0.0
    return GAS_CONSTANT * T * math.log1p(beta) * hillert_jarl(T / tc, mag.above_curie_fraction, 0)[0]


def _pure_gibbs(phases: dict, index: int, T: float) -> dict[str, float]:
    """G (J/mol) of pure element `index` in every solution phase that is defined at T: its end
    member's function and, where the phase has one, its magnetic term (the same G the
    equilibrium sees at the pure element)."""
    out = {}
    for name, ph in phases.items():
        f = _pure_function(ph, index)
        if f is not None and f.lower_K <= T <= f.upper_K:
            out[name] = f.value(T) + _pure_magnetic(ph, index, T)
    return out


def stable_pure_phase(phases: dict, index: int, T: float) -> str:
    """Name of the solution phase in which pure element `index` has the lowest G at T (K)."""
    g = _pure_gibbs(phases, index, T)
    return min(g, key=g.get)


def pure_transitions(phases: dict, index: int, element: str, lo_K: float, hi_K: float,
                     tol_K: float = 1e-7) -> list[PureTransition]:
    """Every change of the stable pure phase of element `index` between lo_K and hi_K (K)."""
    grid = np.linspace(lo_K, hi_K, 400).tolist()
    names = [stable_pure_phase(phases, index, T) for T in grid]
    found = []
    for i in range(len(grid) - 1):
        if names[i] == names[i + 1]:
            continue
        a, b = grid[i], grid[i + 1]
        low, high = names[i], names[i + 1]
        while b - a > tol_K:
            m = 0.5 * (a + b)
            if stable_pure_phase(phases, index, m) == low:
                a = m
            else:
                b = m
        found.append(PureTransition(element, float(0.5 * (a + b)), low, high))
    return found


def melting_point(phases: dict, index: int, element: str, lo_K: float, hi_K: float) -> float | None:
    """Melting temperature (K) of the pure element: the transition whose upper phase is `liquid`."""
    for t in pure_transitions(phases, index, element, lo_K, hi_K):
        if t.above == "liquid":
            return t.temperature_K
    return None

