"""The magnetic contribution to the Gibbs energy of a ferromagnetic phase.

G. Inden, Physica B 103 (1981) 82, in the polynomial approximation of M. Hillert and M. Jarl,
Calphad 2 (1978) 227-238:

    G_mag = R T ln(beta + 1) f(tau),   tau = T / Tc,

with Tc the Curie temperature (K) and beta the mean magnetic moment (Bohr magnetons per atom).
"""

from __future__ import annotations

import numpy as np


def _denominator(p: float) -> float:
    return 518.0 / 1125.0 + (11692.0 / 15975.0) * (1.0 / p - 1.0)


def where(condition, a, b):
    """np.where for arrays, a plain conditional for Python scalars (fast in Newton loops)."""
    if isinstance(condition, np.ndarray):
        return np.where(condition, a, b)
    return a if condition else b


def hillert_jarl_constants(p: float) -> tuple[float, float, float]:
    """(a, k, D) of the Hillert-Jarl polynomials for the share p: below the Curie temperature
    f = 1 - (a / tau + k (tau^3 / 6 + tau^9 / 135 + tau^15 / 600)) / D, above it
    f = -(tau^-5 / 10 + tau^-15 / 315 + tau^-25 / 1500) / D."""
    return 79.0 / (140.0 * p), (474.0 / 497.0) * (1.0 / p - 1.0), _denominator(p)


def hillert_jarl(tau, p: float, order: int = 2):
    """f(tau) and its first and second derivatives in tau (arrays, or floats for a float); with
    `order` 0 or 1 the derivatives beyond it are not computed (None).

    `p` is the share of the magnetic enthalpy absorbed above the Curie temperature
    (0.40 for bcc, 0.28 for other structures). `tau` must be positive. A single number takes
    only its own branch (below or above the Curie temperature); an array takes both where it
    holds both.
    """
    a, k, D = hillert_jarl_constants(p)
    if not isinstance(tau, np.ndarray):
        return _below(tau, a, k, D, order) if tau <= 1.0 else _above(1.0 / tau, D, order)
    below = tau <= 1.0
    if below.all():
        return _below(tau, a, k, D, order)
    if not below.any():
        return _above(1.0 / tau, D, order)
    lo = _below(where(below, tau, 1.0), a, k, D, order)     # both branches kept finite
    hi = _above(1.0 / where(below, 1.0, tau), D, order)    # 1 / tau above the Curie temperature
    return tuple(None if l is None else where(below, l, h) for l, h in zip(lo, hi))


def _below(t, a: float, k: float, D: float, order: int):
    """f, f', f'' (up to `order`) below the Curie temperature, t = tau <= 1."""
    t2 = t * t
    t3 = t2 * t
    t6 = t3 * t3
    t7 = t6 * t
    t8 = t7 * t
    t13 = t6 * t7
    t14 = t13 * t
    f = 1.0 - (a / t + k * (t3 / 6.0 + t8 * t / 135.0 + t14 * t / 600.0)) / D
    if order == 0:
        return f, None, None
    d1 = -(-a / t2 + k * (t2 / 2.0 + t8 / 15.0 + t14 / 40.0)) / D
    if order == 1:
        return f, d1, None
    return f, d1, -(2.0 * a / t3 + k * (t + 8.0 * t7 / 15.0 + 14.0 * t13 / 40.0)) / D


def _above(v, D: float, order: int):
    """f, f', f'' (up to `order`) above the Curie temperature, v = 1/tau < 1."""
    v5 = v * v * v * v * v
    v10 = v5 * v5
    v15 = v10 * v5
    v25 = v15 * v10
    f = -(v5 / 10.0 + v15 / 315.0 + v25 / 1500.0) / D
    if order == 0:
        return f, None, None
    d1 = (v5 * v / 2.0 + v15 * v / 21.0 + v25 * v / 60.0) / D
    if order == 1:
        return f, d1, None
    return f, d1, -(3.0 * v5 * v * v + 16.0 * v15 * v * v / 21.0 + 26.0 * v25 * v * v / 60.0) / D
