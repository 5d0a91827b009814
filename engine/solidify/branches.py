"""Liquidus branches: the liquidus of one primary solid, traced exactly from its hot end to its
cold end.

Each liquid + solid field of the mapped diagram (engine/diagram.py) gives one branch. Its points
are solved at exact liquid compositions (engine/solidify_liquidus.py) by predictor-corrector
continuation in the liquid's y = ln(xB/xA); the step adapts so that cubic Hermite interpolation
between the points (values and slopes are both known) reproduces T and the solid's y as exact
solves give them (measured on the shipped systems: within 1e-4 K and 1e-6 in y). Along the branch the Scheil integral

    Phi(y) = integral of dx_L / (x_L - x_S)    (x: mole fraction of B)

is accumulated by Gauss-Legendre quadrature on the Hermite representation; the liquid fraction of
any alloy whose liquid runs along the branch is then f_L = exp(-(Phi(y) - Phi(y_0))) (E. Scheil,
Z. Metallkd. 34 (1942) 70; G.H. Gulliver, J. Inst. Met. 9 (1913) 120).

Temperatures in K, compositions as mole fractions of B unless a name says y.
"""

from __future__ import annotations

import math
from dataclasses import dataclass
from functools import lru_cache

import numpy as np

from ..diagrams.diagram import Invariant, map_diagram
from ..models.phases import CompoundPhase
from .liquidus import LIQUID, LiquidusPoint, solve_liquidus_point
from ..minimize.tangent import logit

#: |y| of the first point traced next to a pure element (x about 2e-16).
PURE_END_Y = 36.0
#: Offset in y from a congruent point where a branch starts or stops (its integrand is singular).
CONGRUENT_OFFSET_Y = 1e-7
#: Largest predictor error accepted per step: temperature (K) and the solid's y.
_TOL_T = 2e-2
_TOL_YS = 2e-3
_MAX_STEP_Y = 1.0
_MAX_STEP_K = 5.0
#: Largest relative change of the Scheil integrand over one step.
_MAX_INTEGRAND_CHANGE = 0.2
_MIN_STEP_Y = 1e-13
_GAUSS_Y, _GAUSS_W = np.polynomial.legendre.leggauss(8)
#: Two ends closer than this (K, mole fraction) are the same point of the diagram.
_SAME_K = 1e-6
_SAME_X = 1e-7


class BranchError(ValueError):
    """A liquidus branch could not be traced; the message says where."""


@dataclass(frozen=True)
class BranchEnd:
    """One end of a liquidus branch: temperature (K), x_B of the liquid and of the solid, and
    what the diagram has there: "melting" (a pure element), "congruent", "window" (the edge of
    the mapped temperature window) or the kind of the invariant reaction (`invariant`)."""

    temperature_K: float
    x_liquid: float
    x_solid: float
    kind: str
    invariant: Invariant | None = None


def _y_of(x: float) -> float:
    return logit(1.0 - x, x)


def fractions_array(y: np.ndarray) -> tuple[np.ndarray, np.ndarray]:
    """(x_A, x_B) from y = ln(xB/xA), element-wise, each computed without cancellation."""
    y = np.asarray(y, dtype=float)
    return 1.0 / (1.0 + np.exp(y)), 1.0 / (1.0 + np.exp(-y))


def gap_array(y: np.ndarray, ys: np.ndarray) -> np.ndarray:
    """x_B(liquid) - x_B(solid) from both y values, from the fractions that keep their digits."""
    la, lb = fractions_array(y)
    sa, sb = fractions_array(ys)
    return np.where(lb <= 0.5, lb - sb, sa - la)


def interval_of(nodes: np.ndarray, y: np.ndarray) -> np.ndarray:
    """Index i of the interval [nodes_i, nodes_i+1] holding each y, for monotone `nodes`
    (increasing or decreasing; clipped to the first and last interval)."""
    sign = 1.0 if nodes[-1] > nodes[0] else -1.0
    k = np.searchsorted(sign * nodes, sign * np.asarray(y, dtype=float), side="right") - 1
    return np.clip(k, 0, len(nodes) - 2)


def hermite_at(nodes: np.ndarray, values: np.ndarray, derivatives: np.ndarray, y: np.ndarray) -> np.ndarray:
    """The cubic Hermite curve through (nodes, values) with slopes `derivatives`, at y."""
    i = interval_of(nodes, y)
    return hermite(nodes[i], nodes[i + 1], values[i], values[i + 1], derivatives[i], derivatives[i + 1], y)[0]


def hermite(y0, y1, f0, f1, d0, d1, y):
    """Cubic Hermite interpolation on [y0, y1] (values f, slopes d): (value, slope) at y."""
    h = y1 - y0
    t = (y - y0) / h
    t2, t3 = t * t, t * t * t
    value = (2 * t3 - 3 * t2 + 1) * f0 + (t3 - 2 * t2 + t) * h * d0 + (-2 * t3 + 3 * t2) * f1 + (t3 - t2) * h * d1
    slope = ((6 * t2 - 6 * t) * f0 + (3 * t2 - 4 * t + 1) * h * d0 + (-6 * t2 + 6 * t) * f1 + (3 * t2 - 2 * t) * h * d1) / h
    return value, slope


class Branch:
    """A traced liquidus branch of `solid`, from `top` (hot end) to `bottom` (cold end).

    Arrays per point, in the order traced: `y` (liquid), `T` (K), `dT` (dT/dy), `ys` and `dys`
    (the solid's y and dy_S/dy; constant for a compound) and `phi` (the Scheil integral from the
    first point). `direction` is +1 where the liquid's x_B grows along the branch, else -1."""

    def __init__(self, system, solid: str, top: BranchEnd, bottom: BranchEnd, points: list[LiquidusPoint]) -> None:
        self.system = system
        self.solid = solid
        self.top = top
        self.bottom = bottom
        self.is_compound = isinstance(system.phases[solid], CompoundPhase)
        self.y = np.array([p.y for p in points])
        self.T = np.array([p.temperature_K for p in points])
        self.dT = np.array([p.dT_dy for p in points])
        if self.is_compound:
            c = system.phases[solid].x
            self.ys = np.full(len(points), logit(float(c[0]), float(c[1])))
            self.dys = np.zeros(len(points))
        else:
            self.ys = np.array([p.y_solid for p in points])
            self.dys = np.array([p.dys_dy for p in points])
        self.direction = 1.0 if self.y[-1] > self.y[0] else -1.0
        pieces = self._integral(np.arange(len(self.y) - 1), self.y[1:])
        self.phi = np.concatenate([[0.0], np.cumsum(pieces)])

    # --- interpolation ---------------------------------------------------------------------------
    def interval(self, y: np.ndarray) -> np.ndarray:
        """Index i of the interval [y_i, y_i+1] holding each y (clipped to the branch)."""
        return interval_of(self.y, y)

    def temperature(self, y: np.ndarray) -> np.ndarray:
        """Liquidus temperature (K) at the liquid's y."""
        return hermite_at(self.y, self.T, self.dT, y)

    def solid_y(self, y: np.ndarray, i: np.ndarray | None = None) -> np.ndarray:
        """y of the solid in equilibrium with the liquid at y."""
        i = self.interval(y) if i is None else i
        return hermite(self.y[i], self.y[i + 1], self.ys[i], self.ys[i + 1], self.dys[i], self.dys[i + 1], y)[0]

    def integrand(self, y: np.ndarray, i: np.ndarray) -> np.ndarray:
        """d Phi / dy = xA xB / (x_L - x_S) of the liquid at y (interval i)."""
        la, lb = fractions_array(y)
        return la * lb / gap_array(y, self.solid_y(y, i))

    def _integral(self, i: np.ndarray, y: np.ndarray) -> np.ndarray:
        """Integral of the Scheil integrand from y_i to y (inside interval i), Gauss-Legendre."""
        a = self.y[i]
        half = 0.5 * (np.asarray(y) - a)
        mid = a + half
        nodes = mid[..., None] + half[..., None] * _GAUSS_Y
        values = self.integrand(nodes, np.broadcast_to(np.asarray(i)[..., None], nodes.shape))
        return half * (values @ _GAUSS_W)

    def phi_at(self, y: np.ndarray) -> np.ndarray:
        """The Scheil integral Phi (dimensionless) from the first point to y."""
        y = np.asarray(y, dtype=float)
        i = self.interval(y)
        return self.phi[i] + self._integral(i, y)

    def y_at_phi(self, target: np.ndarray) -> np.ndarray:
        """y where Phi reaches `target` (Phi grows along the branch); NaN beyond its end."""
        target = np.asarray(target, dtype=float)
        k = np.searchsorted(self.phi, target, side="right") - 1
        inside = (k >= 0) & (k < len(self.phi) - 1)
        k = np.clip(k, 0, len(self.phi) - 2)
        y0, y1 = self.y[k], self.y[k + 1]
        f0, f1 = self.phi[k], self.phi[k + 1]
        y = y0 + (target - f0) / (f1 - f0) * (y1 - y0)
        lo, hi = np.minimum(y0, y1), np.maximum(y0, y1)
        for _ in range(30):
            value = self.phi[k] + self._integral(k, y)
            step = (value - target) / self.integrand(y, k)
            y = np.clip(y - step, lo, hi)
            if np.all(np.abs(step) < 1e-14 * (1.0 + np.abs(y))):
                break
        return np.where(inside, y, np.nan)


def invert_hermite(y: np.ndarray, values: np.ndarray, derivatives: np.ndarray, target: np.ndarray) -> np.ndarray:
    """The y where the Hermite curve through (y, values) with slopes `derivatives` equals
    `target`; the values must be monotone. Targets outside their range give NaN.

    Each target is iterated until its own Newton step is below 1e-14 (relative), so its answer
    does not depend on the other targets of the call."""
    target = np.asarray(target, dtype=float)
    sign = 1.0 if values[-1] > values[0] else -1.0
    k = np.searchsorted(sign * values, sign * target, side="right") - 1
    inside = ((k >= 0) & (k < len(values) - 1)) | (target == values[-1])
    answer = np.full(target.shape, np.nan)
    target = target[inside]
    k = np.clip(k[inside], 0, len(values) - 2)
    y0, y1 = y[k], y[k + 1]
    f0, f1 = values[k], values[k + 1]
    d0, d1 = derivatives[k], derivatives[k + 1]
    with np.errstate(divide="ignore", invalid="ignore"):
        guess = np.where(f1 != f0, y0 + (target - f0) / (f1 - f0) * (y1 - y0), y0)
    lo, hi = np.minimum(y0, y1), np.maximum(y0, y1)
    guess = np.clip(guess, lo, hi)
    active = np.arange(guess.size)
    for _ in range(30):
        if not active.size:
            break
        g = guess[active]
        v, s = hermite(y0[active], y1[active], f0[active], f1[active], d0[active], d1[active], g)
        with np.errstate(divide="ignore", invalid="ignore"):
            step = np.where(s != 0, (v - target[active]) / s, 0.0)
        g = np.clip(g - step, lo[active], hi[active])
        guess[active] = g
        active = active[np.abs(step) >= 1e-14 * (1.0 + np.abs(g))]
    answer[inside] = guess
    return answer


# --- tracing --------------------------------------------------------------------------------------
def _integrand_log_slope(p: LiquidusPoint) -> float:
    """d ln|dPhi/dy| / dy at a point: how fast the Scheil integrand changes (per unit y)."""
    xa, xb = p.liquid
    sa, sb = p.solid
    return (xa - xb) - (xa * xb - sa * sb * p.dys_dy) / p.gap


def _start_y(end: BranchEnd, toward: float) -> float:
    """Liquid y where tracing starts or stops at a branch end; `toward` is the sign of the
    direction into the branch."""
    if end.kind == "melting" and end.x_liquid in (0.0, 1.0):
        return PURE_END_Y if end.x_liquid == 1.0 else -PURE_END_Y
    y = _y_of(end.x_liquid)
    if end.kind == "congruent":
        y += toward * CONGRUENT_OFFSET_Y
    return y


def trace_branch(system, solid: str, top: BranchEnd, bottom: BranchEnd) -> Branch:
    """Trace the liquidus of `solid` from `top` to `bottom` (see the module notes)."""
    sign = 1.0 if bottom.x_liquid > top.x_liquid else -1.0
    y = _start_y(top, sign)
    y_stop = _start_y(bottom, -sign)
    ys0 = None if top.x_solid in (0.0, 1.0) else _y_of(top.x_solid)
    p = solve_liquidus_point(system, solid, y, top.temperature_K, ys0 if ys0 is not None else y)
    if p is None:
        raise BranchError(f"the liquidus of {solid} could not be solved at its hot end "
                          f"({top.temperature_K:.2f} K, liquid x_B {top.x_liquid:.6g})")
    points = [p]
    h = sign * min(0.05, abs(y_stop - y))
    while sign * (y_stop - y) > 0.0:
        remaining = y_stop - y
        h = remaining if abs(h) >= abs(remaining) else h
        T_guess = p.temperature_K + p.dT_dy * h
        ys_guess = None if p.y_solid is None else p.y_solid + p.dys_dy * h
        q = solve_liquidus_point(system, solid, y + h, T_guess, ys_guess)
        if q is None or q.gap * p.gap <= 0.0:
            h *= 0.5
            if abs(h) < _MIN_STEP_Y:
                raise BranchError(f"the liquidus of {solid} could not be followed below "
                                  f"{p.temperature_K:.2f} K (liquid x_B {p.liquid[1]:.6g})")
            continue
        err = abs(q.temperature_K - T_guess) / _TOL_T
        if ys_guess is not None:
            err = max(err, abs(q.y_solid - ys_guess) / _TOL_YS)
        if err > 1.0 and abs(h) > 1e-9:
            h *= max(0.1, 0.8 / math.sqrt(err))
            continue
        points.append(q)
        p, y = q, y + h
        grow = min(3.0, 0.8 / math.sqrt(max(err, 1e-6)))
        limit = min(_MAX_STEP_Y, _MAX_INTEGRAND_CHANGE / max(abs(_integrand_log_slope(p)), 1e-12),
                    _MAX_STEP_K / max(abs(p.dT_dy), 1e-12))
        h = sign * min(abs(h) * grow, limit)
    return Branch(system, solid, top, bottom, points)


# --- from the diagram --------------------------------------------------------------------------------
def _end_kind(diagram, T: float, x_liquid: float, x_solid: float) -> tuple[str, Invariant | None]:
    for inv in diagram.invariants:
        if abs(inv.temperature_K - T) < _SAME_K and any(n == LIQUID and abs(x - x_liquid) < _SAME_X for n, x in inv.phases):
            return inv.kind, inv
    if x_liquid in (0.0, 1.0):
        return "melting", None
    for sp in diagram.special_points:
        if sp.kind == "congruent" and abs(sp.temperature_K - T) < _SAME_K and abs(sp.x_B - x_liquid) < _SAME_X:
            return "congruent", None
    if abs(x_liquid - x_solid) < _SAME_X:
        return "congruent", None
    return "window", None


@lru_cache(maxsize=16)
def liquidus_branches(system) -> tuple[Branch, ...]:
    """Every liquidus branch of `system` (one per liquid + solid field of its diagram), traced;
    cached per system."""
    diagram = map_diagram(system)
    branches = []
    for f in diagram.fields:
        if f.phases.count(LIQUID) != 1 or len(f.T) < 2:
            continue
        li = f.phases.index(LIQUID)
        solid = f.phases[1 - li]
        ends = []
        for k in (-1, 0):
            T, xl, xs = float(f.T[k]), float(f.x[k, li]), float(f.x[k, 1 - li])
            kind, inv = _end_kind(diagram, T, xl, xs)
            ends.append(BranchEnd(T, xl, xs, kind, inv))
        branches.append(trace_branch(system, solid, ends[0], ends[1]))
    return tuple(branches)


def logit_array(x: np.ndarray) -> np.ndarray:
    """y = ln(xB/xA) of mole fractions x_B (x_A taken as 1 - x_B), -inf and inf at the ends."""
    x = np.asarray(x, dtype=float)
    with np.errstate(divide="ignore"):
        return np.log(x) - np.log1p(-x)


def continuation(branches: tuple[Branch, ...], branch: Branch) -> Branch | None:
    """The branch the liquid follows after the cold end of `branch` (past a peritectic point),
    or None where it cannot go on (a eutectic, a melting minimum, the window's edge)."""
    inv = branch.bottom.invariant
    if inv is None:
        return None
    return next((c for c in branches if c is not branch and c.top.invariant is inv
                 and abs(c.top.x_liquid - branch.bottom.x_liquid) < _SAME_X), None)


def chain_from(branches: tuple[Branch, ...], first: Branch) -> list[Branch]:
    """The branches the liquid runs down from `first` on, past every peritectic point."""
    chain = [first]
    while (nxt := continuation(branches, chain[-1])) is not None and nxt not in chain:
        chain.append(nxt)
    return chain
