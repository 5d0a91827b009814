"""Special points of a binary phase diagram, each solved directly with temperature free.

- three-phase (invariant) equilibria: equal chemical potentials of both elements in three phases;
- congruent points: two phases of the same composition in equilibrium (a compound melting to a
  liquid of its own composition, or a solution's melting maximum or minimum);
- critical points of a miscibility gap: d2G/dx2 = d3G/dx3 = 0.
Temperatures in K, compositions as mole fraction of B, energies in J/mol.
"""

from __future__ import annotations

from dataclasses import dataclass

import numpy as np

from ..minimize.newton import newton
from ..models.phases import CompoundPhase
from ..units import GAS_CONSTANT as R
from ..minimize.tangent import fractions, logit

#: Chemical potentials of the phases at a special point agree to this many J/mol.
POTENTIAL_TOLERANCE = 1e-8


@dataclass(frozen=True)
class SpecialSolution:
    """A solved special point: temperature (K), each phase's (name, x_A, x_B), and whether the
    solve converged."""

    temperature_K: float
    phases: tuple[tuple[str, float, float], ...]
    converged: bool


def three_phase(system, entries: list[tuple[str, float]], T0: float,
                x_A: list[float] | None = None, mu: tuple[float, float] | None = None) -> SpecialSolution:
    """The three-phase equilibrium of `entries` (phase name, starting x_B), from T0 (K).

    `x_A` gives each entry's starting A fraction computed on its own (default 1 - x_B): a nearly
    pure B side, such as x_A = 1e-75 under a large positive interaction, has 1 - x_B = 0 in
    floating point, and a start there would sit far short of the answer in y, beyond the reach
    of the solver's limited steps. `mu` is a starting common line (mu_A, mu_B) in J/mol (default:
    the first solution entry's potentials); with it, an entry that starts exactly at a pure
    element (its solubility below what the caller resolved) starts instead from Henry's law,
    RT ln x of the dilute element = its potential on the line minus the phase's at a dilute
    reference composition.

    The same solution phase may appear twice (a monotectic's two liquids). Unknowns: T, the
    common line (mu_A, mu_B) and the composition y = ln(xB/xA) of each solution entry."""
    phases = [system.phases[name] for name, _ in entries]
    sol_idx = [i for i, p in enumerate(phases) if not isinstance(p, CompoundPhase)]
    starts_A = [1.0 - x for _name, x in entries] if x_A is None else list(x_A)
    y0 = [logit(starts_A[i], entries[i][1]) for i in sol_idx]
    def potentials(i: int, y: float, T: float) -> tuple[float, float]:
        xa, xb = fractions(y)
        ma, mb = phases[i].at(T).potentials(xa, xb)
        return float(ma), float(mb)

    if mu is not None:
        for k, i in enumerate(sol_idx):
            if starts_A[i] <= 0.0 or entries[i][1] <= 0.0:
                y0[k] = _henry_start(lambda y, i=i: potentials(i, y, T0), y0[k], mu, R * T0)
    # start the common line from the caller's, else from the first solution entry
    if mu is not None:
        mu0 = mu
    elif sol_idx:
        mu0 = potentials(sol_idx[0], y0[0], T0)
    else:
        c0, c1 = phases[0], phases[1]
        slope = (c1.gibbs(T0) - c0.gibbs(T0)) / (c1.x[1] - c0.x[1])
        mua = c0.gibbs(T0) - slope * c0.x[1]
        mu0 = (mua, mua + slope)

    def residual(u: np.ndarray) -> np.ndarray:
        T, mua, mub = u[0], u[1], u[2]
        out = []
        k = 3
        for i, p in enumerate(phases):
            if isinstance(p, CompoundPhase):
                out.append(p.x[0] * mua + p.x[1] * mub - p.gibbs(T))
            else:
                ma, mb = potentials(i, u[k], T)
                out += [ma - mua, mb - mub]
                k += 1
        return np.array(out)

    u0 = np.array([T0, mu0[0], mu0[1], *y0])
    steps = np.array([1e-3, 1.0, 1.0] + [1e-6] * len(y0))
    max_step = np.array([20.0, 1e9, 1e9] + [3.0] * len(y0))
    r = newton(residual, u0, steps, POTENTIAL_TOLERANCE, max_step)
    T = float(r.x[0])
    out = []
    k = 3
    for i, (name, _x) in enumerate(entries):
        p = phases[i]
        if isinstance(p, CompoundPhase):
            out.append((name, float(p.x[0]), float(p.x[1])))
        else:
            xa, xb = fractions(float(r.x[k]))
            out.append((name, xa, xb))
            k += 1
    return SpecialSolution(T, tuple(out), r.converged)


def _henry_start(potentials, y_edge: float, mu: tuple[float, float], RT: float) -> float:
    """y of a phase's dilute end in equilibrium with the line `mu`, by Henry's law from the
    reference composition y_edge (the dilute element's RT ln x grows one RT per unit of y);
    never closer to the middle than y_edge."""
    ma, mb = potentials(y_edge)
    if y_edge < 0:      # B dilute in an A-rich phase: mu_B = ref + RT (y - y_edge)
        return min(y_edge, y_edge + (mu[1] - mb) / RT)
    return max(y_edge, y_edge - (mu[0] - ma) / RT)   # A dilute: mu_A = ref - RT (y - y_edge)


def compound_congruent(system, compound: str, solution: str, lo: float, hi: float) -> SpecialSolution | None:
    """Temperature in [lo, hi] (K) where `solution` at the compound's composition has the
    compound's Gibbs energy: the compound melts (or transforms) congruently."""
    c = system.phases[compound]
    s = system.phases[solution]
    xa, xb = float(c.x[0]), float(c.x[1])

    def f(T: float) -> float:
        return float(s.at(T).gibbs(xa, xb)) - c.gibbs(T)

    T = bracket_root(f, lo, hi)
    if T is None:
        return None
    return SpecialSolution(T, ((solution, xa, xb), (compound, xa, xb)), True)


def solution_congruent(system, p: str, q: str, x0: float, T0: float) -> SpecialSolution:
    """Maximum or minimum where solutions p and q meet at one composition (from x0, T0)."""
    P, Q = system.phases[p], system.phases[q]

    def residual(u: np.ndarray) -> np.ndarray:
        xa, xb = fractions(u[1])
        a, b = P.at(u[0]), Q.at(u[0])
        return np.array([float(a.gibbs(xa, xb) - b.gibbs(xa, xb)), float(a.slope(xa, xb) - b.slope(xa, xb))])

    r = newton(residual, np.array([T0, logit(1.0 - x0, x0)]), np.array([1e-3, 1e-6]), POTENTIAL_TOLERANCE,
               np.array([20.0, 2.0]))
    xa, xb = fractions(float(r.x[1]))
    return SpecialSolution(float(r.x[0]), ((p, xa, xb), (q, xa, xb)), r.converged)


def critical_point(system, phase: str, x0: float, T0: float) -> SpecialSolution:
    """Critical point of a miscibility gap in `phase`: curvature and its derivative both zero."""
    P = system.phases[phase]
    h = 1e-4

    def curv(T: float, y: float) -> float:
        xa, xb = fractions(y)
        return float(P.at(T).scaled_curvature(xa, xb))

    def residual(u: np.ndarray) -> np.ndarray:
        T, y = u
        return np.array([curv(T, y), (curv(T, y + h) - curv(T, y - h)) / (2 * h)])

    r = newton(residual, np.array([T0, logit(1.0 - x0, x0)]), np.array([1e-3, 1e-5]), 1e-9 * 8.314 * T0,
               np.array([20.0, 1.0]))
    xa, xb = fractions(float(r.x[1]))
    return SpecialSolution(float(r.x[0]), ((phase, xa, xb),), r.converged)


def bracket_root(f, a: float, b: float, xtol: float = 1e-9, max_iter: int = 200) -> float | None:
    """A root of f in [a, b] by the Illinois (modified false position) method; None without a
    sign change."""
    fa, fb = f(a), f(b)
    if fa == 0.0:
        return a
    if fb == 0.0:
        return b
    if (fa > 0) == (fb > 0):
        return None
    side = 0
    c = a
    for _ in range(max_iter):
        c = (a * fb - b * fa) / (fb - fa)
        if not (min(a, b) < c < max(a, b)):
            c = 0.5 * (a + b)
        fc = f(c)
        if fc == 0.0 or abs(b - a) < xtol:
            return c
        if (fc > 0) == (fb > 0):
            b, fb = c, fc
            if side == -1:
                fa *= 0.5
            side = -1
        else:
            a, fa = c, fc
            if side == 1:
                fb *= 0.5
            side = 1
        if abs(b - a) < xtol:
            return 0.5 * (a + b)
    return c


def classify(middle: str, outer: tuple[str, str], middle_forms_on_cooling: bool) -> str:
    """Name of a three-phase reaction from its middle phase (by composition), its two outer
    phases and whether the middle phase forms or disappears on cooling."""
    liquid = [n == "liquid" for n in outer]
    if not middle_forms_on_cooling:          # middle -> outer1 + outer2 on cooling
        if middle == "liquid":
            return "monotectic" if any(liquid) else "eutectic"
        if any(liquid):
            return "metatectic" if not all(liquid) else "syntectic"
        return "eutectoid"
    # outer1 + outer2 -> middle on cooling
    if all(liquid):
        return "syntectic"
    if any(liquid):
        return "peritectic"
    if middle == "liquid":
        return "metatectic"
    return "peritectoid"

