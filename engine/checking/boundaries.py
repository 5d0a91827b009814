"""Phase boundaries solved directly at one stated point: the liquidus and solidus temperatures of
an alloy, and the composition of a phase on its tie-line to a partner at one temperature.

Liquidus at x0: above it the liquid alone (the lower envelope of the liquid phases at x0) is
stable, so every other phase lies above the liquid's tangent line at x0. The signed distance of
the lowest other phase below that line, D(T) = min over phases and x of [G(x) - line(x)] / RT,
is positive above the liquidus and zero on it, where the partner's chemical potentials equal the
liquid's (the common tangent). The solidus is the same construction with the roles exchanged:
the liquid's distance below the line of the solid phases' envelope at x0. The root of D is
bracketed by a scan from the top of the system's temperature window (or around a hint) and
solved by the Illinois method to 1e-9 K.

Temperatures in K, compositions as mole fraction of B, energies in J/mol.
"""

from __future__ import annotations

import dataclasses
from dataclasses import dataclass

import numpy as np

from ..minimize.equilibrium import section_at
from ..minimize.grid import DEFAULT_POINTS, composition_grid
from ..models.phases import CompoundPhase
from ..minimize.section import Section, TieLine
from ..diagrams.special import bracket_root
from ..minimize.tangent import lowest_against_line
from ..units import GAS_CONSTANT

LIQUID = "liquid"
#: Temperature levels of the scan from the top of the window that brackets a boundary.
SCAN_LEVELS = 96
#: The boundary temperature is solved to this many K.
TEMPERATURE_TOLERANCE_K = 1e-9
#: Half-widths (K) tried around a hint before falling back to the full scan.
_HINT_WIDTHS_K = (0.25, 2.0, 16.0)
#: Grid minima within this many RT of the lowest one are refined by Newton as well.
_REFINE_MARGIN = 0.05


class BoundaryNotFound(ValueError):
    """The model has no such boundary in the system's temperature window; one line says why."""


@dataclass(frozen=True)
class BoundaryCrossing:
    """A liquidus or solidus: temperature (K) and the phase that first touches there
    (`partner`, with its x_B) -- the first solid below a liquidus, the liquid at a solidus."""

    temperature_K: float
    partner: str
    partner_x_B: float


def subsystem(system, names: list[str]):
    """The same system restricted to the phases `names` (a view for metastable constructions)."""
    return dataclasses.replace(system, phases={n: system.phases[n] for n in names})


def lowest_below_line(system, T: float, names: list[str], mu: tuple[float, float]) -> tuple[float, str, float]:
    """The lowest point of the phases `names` relative to the line mu_A x_A + mu_B x_B (J/mol)
    at T (K): (distance / RT, phase, x_B). Negative where a phase lies below the line."""
    xa, xb = composition_grid(DEFAULT_POINTS)
    RT = GAS_CONSTANT * T
    best = (np.inf, "", 0.0)
    for name in names:
        phase = system.phases[name]
        if isinstance(phase, CompoundPhase):
            d = (phase.gibbs(T) - mu[0] * phase.x[0] - mu[1] * phase.x[1]) / RT
            if d < best[0]:
                best = (float(d), name, float(phase.x[1]))
            continue
        at = phase.at(T)
        row = (at.gibbs(xa, xb) - mu[0] * xa - mu[1] * xb) / RT
        low = float(row.min())
        dips = np.flatnonzero((row[1:-1] <= row[:-2]) & (row[1:-1] <= row[2:]) & (row[1:-1] <= low + _REFINE_MARGIN)) + 1
        for i in dips:
            r = lowest_against_line(at, mu[1] - mu[0], (float(xa[i]), float(xb[i])))
            xa_r, xb_r = r.x[0]
            d_r = float(at.gibbs(xa_r, xb_r) - mu[0] * xa_r - mu[1] * xb_r) / RT
            if r.converged and d_r < best[0]:
                best = (d_r, name, xb_r)
        for i in (0, len(row) - 1):
            if row[i] < best[0]:
                best = (float(row[i]), name, float(xb[i]))
    return best


def _envelope_line(system, T: float, names: list[str], x0: float) -> tuple[float, float] | None:
    """(mu_A, mu_B) of the lower envelope of the phases `names` at x0 and T (K); None at the
    exact composition of a compound (no unique line)."""
    state = Section(subsystem(system, names), T).state_at(1.0 - x0, x0)
    if state.mu[0] is None or state.mu[1] is None:
        return None
    return state.mu


def _distance_function(system, x0: float, kind: str):
    """D(T) for a liquidus (kind "liquidus") or solidus ("solidus") at x0; see the module text.
    Returns (D, phases touching) where D > 0 means "above the boundary" for both kinds."""
    liquids = [n for n in system.phases if n == LIQUID]
    others = [n for n in system.phases if n != LIQUID]
    if not liquids or not others:
        raise BoundaryNotFound(f"a {kind} needs a liquid and at least one other phase")
    own, touching, sign = (liquids, others, 1.0) if kind == "liquidus" else (others, liquids, -1.0)
    found: dict[float, tuple[str, float]] = {}

    def D(T: float) -> float:
        mu = _envelope_line(system, T, own, x0)
        if mu is None:
            raise BoundaryNotFound(f"at {100 * x0:g} at% the solid phases meet in a compound of exactly that "
                                   f"composition; give its melting as an invariant (congruent) fact instead")
        d, name, x = lowest_below_line(system, T, touching, mu)
        found[T] = (name, x)
        return sign * d

    return D, found


def _scan_bracket(D, lo: float, hi: float) -> tuple[float, float] | None:
    """The first interval, going down from hi (K), where D changes from positive to not."""
    temps = np.linspace(hi, lo, SCAN_LEVELS)
    upper = float(temps[0])
    if D(upper) <= 0:
        return None
    for T in temps[1:]:
        if D(float(T)) <= 0:
            return float(T), upper
        upper = float(T)
    return None


def _hint_bracket(D, hint: float, lo: float, hi: float) -> tuple[float, float] | None:
    for w in _HINT_WIDTHS_K:
        a, b = max(lo, hint - w), min(hi, hint + w)
        if D(b) > 0 >= D(a):
            return a, b
    return None


def boundary_temperature(system, x0: float, kind: str, hint_K: float | None = None) -> BoundaryCrossing:
    """The liquidus (kind "liquidus") or solidus ("solidus") temperature (K) of the alloy with
    mole fraction x0 of B: the highest temperature, coming down from the top of the system's
    window, where a solid first appears (liquidus) or the last liquid goes (solidus).

    With `hint_K` the root is looked for near that temperature first (used by the fitting
    command between nearby parameter sets); without it the whole window is scanned from the top.
    Raises BoundaryNotFound when there is none in the window.
    """
    if not 0.0 < x0 < 1.0:
        el = system.elements[0] if x0 <= 0.0 else system.elements[1]
        T = system.melting_points.get(el)
        if T is None:
            raise BoundaryNotFound(f"pure {el} does not melt in this model's temperature range")
        return BoundaryCrossing(float(T), LIQUID if kind == "solidus" else el, x0)
    lo, hi = system.temperature_range_K
    D, found = _distance_function(system, x0, kind)
    bracket = _hint_bracket(D, hint_K, lo, hi) if hint_K is not None else None
    if bracket is None:
        bracket = _scan_bracket(D, lo, hi)
    if bracket is None:
        raise BoundaryNotFound(f"the model has no {kind} at {100 * x0:.4g} at% {system.elements[1]} "
                               f"between {lo:.1f} and {hi:.1f} K")
    T = bracket_root(D, bracket[0], bracket[1], xtol=TEMPERATURE_TOLERANCE_K)
    name, x = found.get(T) or found[min(found, key=lambda t: abs(t - T))]
    return BoundaryCrossing(float(T), name, x)


def tie_line_between(system, T: float, phase: str, partner: str, near_x: float, stable: bool = True) -> TieLine | None:
    """The tie-line at T (K) between `phase` and `partner` whose `phase` end is nearest to
    near_x (mole fraction of B); None if there is none. With stable=False the tie-line of the
    two phases alone is taken (it may be metastable where a third phase is stable)."""
    if stable:
        ties = section_at(system, T).tie_lines
    else:
        names = [phase] if phase == partner else [phase, partner]
        ties = Section(subsystem(system, names), T).tie_lines
    best, best_d = None, np.inf
    for t in ties:
        if sorted(t.phases) != sorted((phase, partner)):
            continue
        d = min(abs(x - near_x) for name, x in zip(t.phases, t.x_B) if name == phase)
        if d < best_d:
            best, best_d = t, d
    return best


def phase_end(tie: TieLine, phase: str, near_x: float) -> float:
    """x_B of `phase` on the tie-line (the end nearest near_x where both ends are that phase)."""
    ends = [x for name, x in zip(tie.phases, tie.x_B) if name == phase]
    return min(ends, key=lambda x: abs(x - near_x))
