"""Newton's method for common tangents (tie-lines) and tangent-plane distances in a binary.

Compositions are solved in y = ln(xB / xA), in which dilute solubilities of 1e-20 are reached in
a few steps; xA = 1 / (1 + e^y) and xB = 1 / (1 + e^-y) are computed separately so that neither
loses digits next to a pure element.
"""

from __future__ import annotations

import math
from typing import NamedTuple

from ..models.phases import SolutionAtT

#: Largest change of y = ln(xB/xA) allowed in one Newton step.
_MAX_STEP = 6.0
_MAX_ITER = 60


def fractions(y: float) -> tuple[float, float]:
    """(xA, xB) from y = ln(xB/xA)."""
    if y >= 0:
        e = math.exp(-y)
        return e / (1.0 + e), 1.0 / (1.0 + e)
    e = math.exp(y)
    return 1.0 / (1.0 + e), e / (1.0 + e)


#: Starting value of y for a start exactly at a pure element (x about 1e-17 from it).
_PURE_END_Y = 40.0


def logit(xa: float, xb: float) -> float:
    """y = ln(xB/xA); a start exactly at a pure element is moved just inside the range."""
    if xb <= 0.0:
        return -_PURE_END_Y
    if xa <= 0.0:
        return _PURE_END_Y
    return math.log(xb) - math.log(xa)


def _clip(step: float) -> float:
    return max(-_MAX_STEP, min(_MAX_STEP, step))


class TangentResult(NamedTuple):
    """Outcome of a tangent solve. `x` holds (xA, xB) of each solution phase solved for; `mu`
    the chemical potentials (mu_A, mu_B) in J/mol of the first phase at exactly x where the
    solve evaluated them there (its last step), else None."""

    converged: bool
    x: tuple[tuple[float, float], ...]
    iterations: int
    residual: float  # J/mol
    mu: tuple[float, float] | None = None


def _tolerance(RT: float, rtol: float) -> float:
    return rtol * RT


#: Below this residual (times RT) Newton's method is in its quadratic regime: the next step
#: brings the residual to about its square (times RT), below any tolerance asked for here. That
#: step is then the last one; the residual after it is checked and iterations go on if it
#: is not below the tolerance.
_QUADRATIC = 1e-6


def common_tangent(P: SolutionAtT, Q: SolutionAtT, start_p: tuple[float, float], start_q: tuple[float, float],
                   rtol: float = 1e-12) -> TangentResult:
    """Compositions of phases P and Q with equal chemical potentials of both elements.

    Starts from (xA, xB) of each phase; stops when the largest potential difference is below
    rtol * RT (J/mol), then takes one more step (or, where a step from the quadratic regime
    reached the tolerance, at once). For P is Q (a miscibility gap) the trivial solution with
    equal compositions is reported as not converged.
    """
    y1, y2 = logit(*start_p), logit(*start_q)
    tol = _tolerance(P.RT, rtol)
    quadratic = _QUADRATIC * P.RT
    done = last = False
    res = math.inf
    for it in range(1, _MAX_ITER + 1):
        xa1, xb1 = fractions(y1)
        xa2, xb2 = fractions(y2)
        ma1, mb1, s1 = P.potentials_and_curvature(xa1, xb1)
        ma2, mb2, s2 = Q.potentials_and_curvature(xa2, xb2)
        f1, f2 = float(ma1 - ma2), float(mb1 - mb2)
        res = max(abs(f1), abs(f2))
        if done or (last and res < tol):
            done = True
            break
        if res < tol:
            done = True
        last = res < quadratic
        # d mu_A / dy = -xB s,  d mu_B / dy = xA s  (s = xA xB G'')
        j11, j12, j21, j22 = -xb1 * s1, xb2 * s2, xa1 * s1, -xa2 * s2
        det = j11 * j22 - j12 * j21
        if det == 0.0 or not math.isfinite(det):
            return TangentResult(False, ((xa1, xb1), (xa2, xb2)), it, res)
        dy1 = (-f1 * j22 + f2 * j12) / det
        dy2 = (-j11 * f2 + j21 * f1) / det
        y1 += _clip(dy1)
        y2 += _clip(dy2)
    else:
        done = False                    # the last step was not evaluated
    xa1, xb1 = fractions(y1)
    xa2, xb2 = fractions(y2)
    trivial = P is Q and abs(y1 - y2) < 1e-7
    mu = (float(ma1), float(mb1)) if done else None
    return TangentResult(res < 10 * tol and not trivial, ((xa1, xb1), (xa2, xb2)), it, res, mu)


def tangent_to_point(P: SolutionAtT, point: tuple[float, float], g_point: float, start: tuple[float, float],
                     rtol: float = 1e-12) -> TangentResult:
    """Composition of solution P whose tangent passes through the fixed point (xA, xB, G) of a compound."""
    xa_c, xb_c = point
    y = logit(*start)
    side = 1.0 if start[1] > xb_c else -1.0
    # the compound's composition in y (x_B rises with y): a step may not reach it
    y_c = math.log(xb_c) - math.log(xa_c) if xa_c > 0.0 and xb_c > 0.0 else -side * math.inf
    tol = _tolerance(P.RT, rtol)
    quadratic = _QUADRATIC * P.RT
    done = last = False
    res = math.inf
    for it in range(1, _MAX_ITER + 1):
        xa, xb = fractions(y)
        ma, mb, s = P.potentials_and_curvature(xa, xb)
        f = float(xa_c * ma + xb_c * mb - g_point)
        res = abs(f)
        if done or (last and res < tol):
            done = True
            break
        if res < tol:
            done = True
        last = res < quadratic
        d = float(s) * (xb_c - xb)
        if d == 0.0:
            done = True                 # x is where the potentials were evaluated
            break
        y_new = y - _clip(f / d)
        # never cross the compound's composition: halve the step instead
        while (y_new - y_c) * side <= 0:
            y_new = 0.5 * (y + y_new)
            if abs(y_new - y) < 1e-15:
                break
        y = y_new
    else:
        done = False                    # the last step was not evaluated
    xa, xb = fractions(y)
    mu = (float(ma), float(mb)) if done else None
    return TangentResult(res < 10 * tol, ((xa, xb),), it, res, mu)


def lowest_against_line(P: SolutionAtT, slope: float, start: tuple[float, float], rtol: float = 1e-12) -> TangentResult:
    """Composition where P's G has the given slope dG/dxB (J/mol): the local extremum of
    G_P(x) minus a line of that slope, found by Newton from `start` (a local minimum on a grid)."""
    y = logit(*start)
    tol = _tolerance(P.RT, rtol)
    res = math.inf
    for it in range(1, _MAX_ITER + 1):
        xa, xb = fractions(y)
        h = float(P.slope(xa, xb)) - slope
        res = abs(h)
        s = float(P.scaled_curvature(xa, xb))
        if res < tol or s <= 0.0:
            break
        y -= _clip(h / s)
    xa, xb = fractions(y)
    return TangentResult(res < 10 * tol, ((xa, xb),), it, res)
