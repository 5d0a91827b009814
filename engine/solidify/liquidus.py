"""Points of the liquidus solved at an exact liquid composition.

Given the liquid's composition and the solid that forms from it, the temperature and the solid's
composition follow from equal chemical potentials of both elements in the two phases (the common
tangent): two equations in T and y_S = ln(xB/xA) of the solid, solved by Newton's method. For a
stoichiometric compound there is one equation in T: the liquid's tangent passes through the
compound's point. The derivatives of T and y_S along the liquidus with respect to the liquid's
y = ln(xB/xA) come from the same Jacobian (implicit differentiation).

Temperatures in K, chemical potentials in J/mol, compositions as (x_A, x_B) pairs of mole
fractions carried separately (engine/tangent.py).
"""

from __future__ import annotations

import math
from dataclasses import dataclass

from ..models.phases import CompoundPhase, SolutionPhase
from ..models.polynomials import TemperatureOutOfRange
from ..minimize.tangent import fractions
from ..units import GAS_CONSTANT

LIQUID = "liquid"
#: The solve stops when both potential differences are below this share of RT (J/mol).
_RTOL = 1e-12
_MAX_ITER = 40
_MAX_DT_K = 50.0
_MAX_DY = 6.0


@dataclass(frozen=True)
class LiquidusPoint:
    """The liquid (x_A, x_B) at `temperature_K` in equilibrium with `solid_phase` of composition
    `solid` (x_A, x_B). `y` and `y_solid` are ln(xB/xA) of the liquid and the solid (y_solid is
    None for a compound); `dT_dy` (K) and `dys_dy` are their rates of change along the liquidus
    per unit of the liquid's y; `mu` the common chemical potentials (J/mol) and `mu_dT` the
    liquid's partial molar temperature derivatives d mu_i/dT = -S_i (J/(mol K))."""

    temperature_K: float
    y: float
    liquid: tuple[float, float]
    solid_phase: str
    y_solid: float | None
    solid: tuple[float, float]
    dT_dy: float
    dys_dy: float
    mu: tuple[float, float]
    mu_dT: tuple[float, float]

    @property
    def gap(self) -> float:
        """x_B of the liquid minus x_B of the solid (mole fraction), taken from whichever of the
        two separately carried fractions keeps its digits."""
        if self.liquid[1] <= 0.5:
            return self.liquid[1] - self.solid[1]
        return self.solid[0] - self.liquid[0]


def potentials_with_slopes(phase: SolutionPhase, T: float, xa: float, xb: float) -> tuple[tuple[float, float], tuple[float, float]]:
    """Chemical potentials (mu_A, mu_B) in J/mol of a solution at T (K) and (xa, xb), and their
    temperature derivatives at fixed composition in J/(mol K) (analytic: `potentials_dT`)."""
    at = phase.at(T)
    ma, mb = at.potentials(xa, xb)
    da, db = at.potentials_dT(xa, xb)
    return (float(ma), float(mb)), (float(da), float(db))


def solve_liquidus_point(system, solid: str, y: float, T0: float, ys0: float | None = None) -> LiquidusPoint | None:
    """The liquidus point of liquid y = ln(xB/xA) against `solid`, by Newton's method from T0 (K)
    and, for a solution, the solid's starting y_S (default: the liquid's). None when the solve
    does not converge or leaves the models' temperature range."""
    liquid = system.phases[LIQUID]
    phase = system.phases[solid]
    try:
        if isinstance(phase, CompoundPhase):
            return _against_compound(liquid, phase, solid, y, T0)
        return _against_solution(liquid, phase, solid, y, T0, y if ys0 is None else ys0)
    except (TemperatureOutOfRange, ZeroDivisionError, OverflowError, ValueError):
        return None


def _against_solution(liquid: SolutionPhase, phase: SolutionPhase, name: str, y: float, T: float,
                      ys: float) -> LiquidusPoint | None:
    xa, xb = fractions(y)
    done = False
    for _ in range(_MAX_ITER):
        xsa, xsb = fractions(ys)
        mu_l, dl = potentials_with_slopes(liquid, T, xa, xb)
        mu_s, ds = potentials_with_slopes(phase, T, xsa, xsb)
        f0, f1 = mu_l[0] - mu_s[0], mu_l[1] - mu_s[1]
        # Jacobian columns: d/dT at fixed compositions; d/dy_S = -d mu_S/dy_S = (xB s, -xA s)
        jt0, jt1 = dl[0] - ds[0], dl[1] - ds[1]
        s = float(phase.at(T).scaled_curvature(xsa, xsb))
        jy0, jy1 = xsb * s, -xsa * s
        det = jt0 * jy1 - jy0 * jt1
        if det == 0.0 or not math.isfinite(det):
            return None
        if done:
            # along the liquidus: J (dT, dy_S) = -d mu_L/dy = -(-xB sL, xA sL)
            sl = float(liquid.at(T).scaled_curvature(xa, xb))
            r0, r1 = xb * sl, -xa * sl
            dT_dy = (r0 * jy1 - jy0 * r1) / det
            dys_dy = (jt0 * r1 - jt1 * r0) / det
            return LiquidusPoint(T, y, (xa, xb), name, ys, (xsa, xsb), dT_dy, dys_dy, mu_l, dl)
        if max(abs(f0), abs(f1)) < _RTOL * GAS_CONSTANT * T:
            done = True    # converged: one more step, then report
        dT = (-f0 * jy1 + jy0 * f1) / det
        dys = (-jt0 * f1 + jt1 * f0) / det
        T += max(-_MAX_DT_K, min(_MAX_DT_K, dT))
        ys += max(-_MAX_DY, min(_MAX_DY, dys))
    return None


def _against_compound(liquid: SolutionPhase, phase: CompoundPhase, name: str, y: float, T: float) -> LiquidusPoint | None:
    xa, xb = fractions(y)
    ca, cb = float(phase.x[0]), float(phase.x[1])
    done = False
    for _ in range(_MAX_ITER):
        mu_l, dl = potentials_with_slopes(liquid, T, xa, xb)
        f = ca * mu_l[0] + cb * mu_l[1] - phase.gibbs(T)
        jt = ca * dl[0] + cb * dl[1] - phase.gibbs_dT(T)
        if jt == 0.0 or not math.isfinite(jt):
            return None
        if done:
            sl = float(liquid.at(T).scaled_curvature(xa, xb))
            dT_dy = -sl * (cb - xb) / jt
            return LiquidusPoint(T, y, (xa, xb), name, None, (ca, cb), dT_dy, 0.0, mu_l, dl)
        if abs(f) < _RTOL * GAS_CONSTANT * T:
            done = True
        T += max(-_MAX_DT_K, min(_MAX_DT_K, -f / jt))
    return None
