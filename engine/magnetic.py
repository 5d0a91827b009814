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


def hillert_jarl(tau: np.ndarray, p: float) -> tuple[np.ndarray, np.ndarray, np.ndarray]:
    """f(tau) and its first and second derivatives in tau.

    `p` is the share of the magnetic enthalpy absorbed above the Curie temperature
    (0.40 for bcc, 0.28 for other structures). `tau` must be positive.
    """
    tau = np.asarray(tau, dtype=float)
    D = _denominator(p)
    k = (474.0 / 497.0) * (1.0 / p - 1.0)
    below = tau <= 1.0
    t = np.where(below, tau, 1.0)  # keeps both branches finite
    f_lo = 1.0 - (79.0 / (140.0 * p) / t + k * (t**3 / 6.0 + t**9 / 135.0 + t**15 / 600.0)) / D
    d1_lo = -(-79.0 / (140.0 * p) / t**2 + k * (t**2 / 2.0 + t**8 / 15.0 + t**14 / 40.0)) / D
    d2_lo = -(2.0 * 79.0 / (140.0 * p) / t**3 + k * (t + 8.0 * t**7 / 15.0 + 14.0 * t**13 / 40.0)) / D
    u = np.where(below, 1.0, tau)
    f_hi = -(u**-5 / 10.0 + u**-15 / 315.0 + u**-25 / 1500.0) / D
    d1_hi = (u**-6 / 2.0 + u**-16 / 21.0 + u**-26 / 60.0) / D
    d2_hi = -(3.0 * u**-7 + 16.0 * u**-17 / 21.0 + 26.0 * u**-27 / 60.0) / D
    return np.where(below, f_lo, f_hi), np.where(below, d1_lo, d1_hi), np.where(below, d2_lo, d2_hi)
