"""One alloy through temperature: every temperature at which its set of stable phases changes.

Method: point equilibria (`ladle.engine.equilibrate`) on a descending temperature scan from above
the liquidus to room temperature (or the lowest temperature the system's models cover); each
interval whose two ends differ in their stable phases is narrowed until it is narrower than the
stated tolerance (engine/diagrams/phase_change.py: regula falsi on the amount of the phase that
appears, bisection otherwise), and what lies between the change found and the interval's cold end
is searched again, so that two changes inside one step are both found. This needs no mapped
diagram, so it serves any number of elements.

A field that lies entirely between two scan levels (narrower in temperature than the scan step)
and has the same phases on both sides is not seen; the step is an argument for that reason.

Units: temperatures in K; compositions in mole fractions of the system's elements, in their order;
phase amounts as mole fractions of the alloy's atoms and as mass fractions of the alloy.
"""

from __future__ import annotations

from collections.abc import Sequence
from dataclasses import dataclass

import numpy as np

from ..minimize.equilibrium import PhaseShare, PointEquilibrium, equilibrate
from .phase_change import narrow_change, phase_set

#: Room temperature (K): the lowest temperature of a transition scan unless the models stop higher.
ROOM_TEMPERATURE_K = 298.15
#: Default scan step (K) and bisection tolerance (K).
DEFAULT_STEP_K = 1.0
DEFAULT_TOLERANCE_K = 1e-6
#: The scan starts this far (K) above the first temperature where the alloy is all liquid.
_ABOVE_LIQUIDUS_K = 5.0
#: Step (K) of the search upward for a temperature where the alloy is all liquid.
_LIQUID_SEARCH_STEP_K = 50.0
_LIQUID = "liquid"


@dataclass(frozen=True)
class Transition:
    """On cooling through `temperature_K` (K) the stable phases change from `above` to `below`.

    `temperature_K` is the middle of a bracket no wider than `uncertainty_K` (K) that holds the
    change; `below_equilibrium` and `above_equilibrium` are the point equilibria at the bracket's
    lower and upper ends (within `uncertainty_K` of the change, except that the upper one is the
    scan level above where no probe fell on that side).
    """

    temperature_K: float
    above: tuple[str, ...]
    below: tuple[str, ...]
    uncertainty_K: float
    below_equilibrium: PointEquilibrium
    above_equilibrium: PointEquilibrium

    @property
    def amounts_below(self) -> tuple[PhaseShare, ...]:
        """The phases just below the change: names, compositions (mole and mass fractions) and
        amounts (mole fraction of atoms, mass fraction)."""
        return self.below_equilibrium.phases


@dataclass(frozen=True)
class AlloyTransitions:
    """Every change of an alloy's stable phases between `highest_K` and `lowest_K` (K), from hot
    to cold.

    `composition` holds the alloy's mole fractions of the system's elements; `top` and `bottom`
    are the stable phases at the two ends of the scan; `step_K` (K) is the scan step and
    `tolerance_K` (K) the width to which each change was bracketed; `warnings` name point
    equilibria that did not converge.
    """

    composition: np.ndarray
    highest_K: float
    lowest_K: float
    step_K: float
    tolerance_K: float
    top: tuple[str, ...]
    bottom: tuple[str, ...]
    transitions: tuple[Transition, ...]
    warnings: tuple[str, ...] = ()

    @property
    def liquidus_K(self) -> float | None:
        """The highest change out of the all-liquid state (K), or None if the alloy is never all
        liquid in the scan."""
        return next((t.temperature_K for t in self.transitions if t.above == (_LIQUID,)), None)

    @property
    def solidus_K(self) -> float | None:
        """The lowest change at which the liquid disappears on cooling (K), or None."""
        return next((t.temperature_K for t in reversed(self.transitions)
                     if _LIQUID in t.above and _LIQUID not in t.below), None)


def _mole_fractions(system, composition: float | Sequence[float] | np.ndarray) -> np.ndarray:
    """The alloy's mole fractions of every element of `system`: a float is x of the second
    element of a binary. Raises ValueError for anything else."""
    n = len(system.elements)
    if isinstance(composition, (int, float, np.floating)) and not isinstance(composition, bool):
        if n != 2:
            raise ValueError(f"a single mole fraction names an alloy of a binary system only; "
                             f"{system.name} has {n} elements: give one fraction per element")
        x_b = float(composition)
        if not 0.0 <= x_b <= 1.0:
            raise ValueError(f"mole fraction {x_b!r} is outside 0-1")
        return np.array([1.0 - x_b, x_b])
    x = np.asarray(composition, dtype=float)
    if x.shape != (n,):
        raise ValueError(f"expected {n} mole fractions (one per element of {system.name}), found shape {x.shape}")
    if not np.all(np.isfinite(x)) or np.any(x < 0.0) or abs(x.sum() - 1.0) > 1e-9:
        raise ValueError("mole fractions must be finite, non-negative and sum to 1")
    return x


def _equilibrium(system, T: float, x: np.ndarray) -> PointEquilibrium:
    """The point equilibrium at T (K): a binary alloy is passed as its x_B (the form every version
    of `equilibrate` accepts), a larger system's as its array of mole fractions."""
    if len(x) == 2:
        return equilibrate(system, T, float(x[1]))
    return equilibrate(system, T, x)


def _window(system) -> tuple[float, float, float]:
    """(lowest, highest start, ceiling) K: room temperature or the lowest temperature the models
    cover; the top of the system's diagram window; the highest temperature the models cover."""
    m_lo, m_hi = system.model_range_K
    c_lo, c_hi = system.covers_K
    lowest = max(ROOM_TEMPERATURE_K, m_lo, c_lo)
    ceiling = min(m_hi, c_hi)
    start = min(system.temperature_range_K[1], ceiling)
    return lowest, start, ceiling


class _Scan:
    """The scan of one alloy: every point equilibrium it solved, and its warnings."""

    def __init__(self, system, x: np.ndarray, tolerance_K: float) -> None:
        self.system = system
        self.x = x
        self.tolerance_K = tolerance_K
        self.unconverged_K: list[float] = []

    def at(self, T: float) -> PointEquilibrium:
        eq = _equilibrium(self.system, T, self.x)
        if not eq.converged:
            self.unconverged_K.append(T)
        return eq

    def warnings(self) -> tuple[str, ...]:
        """One line on the point equilibria that did not converge, if any."""
        if not self.unconverged_K:
            return ()
        lo, hi = min(self.unconverged_K), max(self.unconverged_K)
        where = f"at {lo:.2f} K" if hi - lo < 0.005 else f"between {lo:.2f} and {hi:.2f} K"
        return (f"{len(self.unconverged_K)} point equilibria {where} did not converge to their tolerance; "
                "changes near there are less certain",)

    def start(self, top_K: float, ceiling_K: float) -> tuple[float, PointEquilibrium]:
        """Where the scan begins (K): above the liquidus when the system has a liquid and the
        models reach that high, else at the top of the diagram window."""
        T, eq = top_K, self.at(top_K)
        if _LIQUID not in self.system.phases or eq.phase_names == (_LIQUID,):
            return T, eq
        while eq.phase_names != (_LIQUID,) and T < ceiling_K:
            T = min(T + _LIQUID_SEARCH_STEP_K, ceiling_K)
            eq = self.at(T)
        if eq.phase_names == (_LIQUID,) and T + _ABOVE_LIQUIDUS_K <= ceiling_K:
            T += _ABOVE_LIQUIDUS_K
            eq = self.at(T)
        return T, eq

    def changes(self, hi: tuple[float, PointEquilibrium], lo: tuple[float, PointEquilibrium]) -> list[Transition]:
        """The changes between two temperatures (hi above lo, K) whose phase sets differ, each
        narrowed to the tolerance, hot to cold."""
        (t_hi, e_hi), (t_lo, e_lo) = hi, lo
        if phase_set(e_hi) == phase_set(e_lo):
            return []
        near, far, near_eq, far_eq = narrow_change(self.at, t_hi, t_lo, phase_set(e_hi), e_hi, e_lo, self.tolerance_K,
                                                   self.system)
        near_eq = near_eq or e_hi
        change = Transition(0.5 * (near + far), near_eq.phase_names, far_eq.phase_names, abs(near - far), far_eq, near_eq)
        return [change] + self.changes((far, far_eq), lo)


def alloy_transitions(system, composition: float | Sequence[float] | np.ndarray, *,
                      step_K: float = DEFAULT_STEP_K, tolerance_K: float = DEFAULT_TOLERANCE_K,
                      lowest_K: float | None = None, highest_K: float | None = None) -> AlloyTransitions:
    """Every temperature (K) at which the stable phases of one alloy change, from hot to cold.

    `composition`: mole fraction of the second element of a binary, or the mole fractions of
    every element of the system in its order (summing to 1). The scan runs from `highest_K`
    (default: 5 K above the first temperature, searched upward from the top of the system's
    diagram window, at which the alloy is all liquid; the window's top where the models stop
    first) down to `lowest_K` (default: room temperature, 298.15 K, or the lowest temperature
    the models cover) in steps of at most `step_K` (K); each change is bracketed to
    `tolerance_K` (K). Raises ValueError for a bad composition or window.
    """
    if not (step_K > 0 and tolerance_K > 0):
        raise ValueError("step_K and tolerance_K must be positive")
    x = _mole_fractions(system, composition)
    low_default, top, ceiling = _window(system)
    scan = _Scan(system, x, tolerance_K)
    lo = low_default if lowest_K is None else float(lowest_K)
    if highest_K is None:
        hi, top_eq = scan.start(top, ceiling)
    else:
        hi = float(highest_K)
        top_eq = scan.at(hi)
    if not hi > lo:
        raise ValueError(f"the scan's top ({hi:g} K) must lie above its bottom ({lo:g} K)")
    levels = np.linspace(hi, lo, int(np.ceil((hi - lo) / step_K)) + 1)
    found: list[Transition] = []
    above = (float(levels[0]), top_eq)
    for T in levels[1:]:
        below = (float(T), scan.at(float(T)))
        found += scan.changes(above, below)
        above = below
    return AlloyTransitions(x, hi, lo, float(step_K), float(tolerance_K), top_eq.phase_names,
                            above[1].phase_names, tuple(found), scan.warnings())
