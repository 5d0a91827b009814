"""The composition grid every phase is sampled on: dense next to both pure elements.

x_B = sin^2(pi u / 2) for u evenly spaced on [0, 1]; x_A = cos^2(pi u / 2) is computed on its own
so that neither fraction loses digits near its pure element. Both ends are exact.

At a new temperature every solution phase's G on the grid is one matrix product: the ten terms
of a temperature piece at T times a table of the phase's coefficients on the grid's composition
basis (`gibbs_basis`, `gibbs_table`), made once per phase and piece; a magnetic term is added on
its own: where its Tc and beta do not depend on temperature, another product of a few powers of
T with coefficients tabulated on the grid once per phase (`MagneticPowers`). The scaled
curvature x_A x_B G'' (the sign of the spinodal) is the phase's coefficients at T times another
basis (`curvature_basis`), plus its magnetic term's.
"""

from __future__ import annotations

from functools import lru_cache

import numpy as np

from ..models.magnetic import hillert_jarl_constants
from ..units import GAS_CONSTANT as R_GAS

DEFAULT_POINTS = 257


@lru_cache(maxsize=8)
def composition_grid(n: int = DEFAULT_POINTS) -> tuple[np.ndarray, np.ndarray]:
    """(x_A, x_B) mole fractions on n grid points, x_B increasing from exactly 0 to exactly 1."""
    u = np.linspace(0.0, 1.0, n)
    xb = np.sin(0.5 * np.pi * u) ** 2
    xa = np.cos(0.5 * np.pi * u) ** 2
    xb[0], xa[0], xb[-1], xa[-1] = 0.0, 1.0, 1.0, 0.0
    xa.setflags(write=False)
    xb.setflags(write=False)
    return xa, xb


@lru_cache(maxsize=8)
def grid_list(n: int = DEFAULT_POINTS) -> tuple[float, ...]:
    """x_B on the n-point grid as Python floats (for bisect on single compositions)."""
    return tuple(composition_grid(n)[1].tolist())


@lru_cache(maxsize=8)
def ideal_mixing_on_grid(n: int = DEFAULT_POINTS) -> np.ndarray:
    """x_A ln x_A + x_B ln x_B on the grid (0 at both ends); times RT it is the ideal mixing term."""
    xa, xb = composition_grid(n)
    out = np.zeros(n)
    out[1:-1] = xa[1:-1] * np.log(xa[1:-1]) + xb[1:-1] * np.log(xb[1:-1])
    out.setflags(write=False)
    return out


@lru_cache(maxsize=8)
def gibbs_basis(n: int, order: int) -> np.ndarray:
    """(3 + order, n): the composition functions whose combination is a solution's G on the n-point
    grid: x_A, x_B, x_A ln x_A + x_B ln x_B, then x_A x_B (x_A - x_B)^k for k < order (the
    Redlich-Kister terms)."""
    xa, xb = composition_grid(n)
    d = xa - xb
    rows = [xa, xb, ideal_mixing_on_grid(n)] + [xa * xb * d**k for k in range(order)]
    out = np.array(rows)
    out.setflags(write=False)
    return out


@lru_cache(maxsize=8)
def curvature_basis(n: int, order: int) -> np.ndarray:
    """(1 + order, n): the composition functions whose combination is a solution's scaled
    curvature x_A x_B d2G/dx_B2 on the n-point grid: 1 (times RT), then x_A x_B times the second
    derivative along x_B of x_A x_B (x_A - x_B)^k for k < order (times L[k])."""
    xa, xb = composition_grid(n)
    d = xa - xb
    p = xa * xb
    rows = [np.ones(n)] + [p * (-2 * (2 * k + 1) * d**k + (4 * k * (k - 1) * p * d ** (k - 2) if k >= 2 else 0.0))
                           for k in range(order)]
    out = np.array(rows)
    out.setflags(write=False)
    return out


def scaled_curvature_on_grid(solutions: list, n: int = DEFAULT_POINTS) -> np.ndarray:
    """(len(solutions), n): x_A x_B d2G/dx_B2 (J/mol) of each solution phase at one temperature
    (`SolutionAtT`) on the n-point grid; negative inside a spinodal."""
    order = max(len(s.L) for s in solutions)
    C = np.array([s.curvature_coefficients(order) for s in solutions]) @ curvature_basis(n, order)
    for k, s in enumerate(solutions):
        if s.phase.magnetic is not None:
            C[k] += magnetic_on_grid(s, n, curvature=True)
    return C


def gibbs_table(rows: np.ndarray, order: int, n: int = DEFAULT_POINTS) -> np.ndarray:
    """(10, n): a solution's G (J/mol) without its magnetic term on the n-point grid as a linear
    function of the ten terms of a temperature piece (`polynomials.terms`): the
    terms at T times it are G on the grid at T. `rows` holds the coefficient rows (in the order
    of `polynomials.COEFFICIENTS`) of its end members G_A, G_B and Redlich-Kister terms L[0],
    L[1], ... on one interval where none changes piece; `order` (at least their number) is the
    basis's (`gibbs_basis`). The ideal-mixing coefficient R T is R times the term T."""
    C = np.zeros((3 + order, 10))
    C[0], C[1] = rows[0], rows[1]
    C[2, 1] = R_GAS
    C[3:1 + len(rows)] = rows[2:]
    return C.T @ gibbs_basis(n, order)


class MagneticPowers:
    """A magnetic phase's term on the grid as sums of powers of T, where its Tc and beta do not
    depend on temperature. With tau = T/Tc, the Hillert-Jarl function above the Curie
    temperature is a sum of tau^-5, tau^-15 and tau^-25, below it of 1, 1/tau, tau^3, tau^9 and
    tau^15, and so are tau f' and tau^2 f''; times R T (and the composition derivatives of Tc and
    ln(1 + beta) for the curvature) each grid point's term is a sum of powers of T with
    coefficients fixed per phase: above, T^-4, T^-14, T^-24; below, T, 1, T^4, T^10, T^16. The
    coefficients are tabulated once per phase (rows of `above` and `below`, for G and for the
    scaled curvature x_A x_B d2G/dx_B2, J/mol); at T each is one matrix-vector product, each
    grid point taking the branch of its own tau (below where T <= Tc). The same function as
    `SolutionAtT.magnetic_gibbs` and `magnetic_scaled_curvature`, its terms summed in another
    order."""

    def __init__(self, s, n: int) -> None:
        xa, xb = composition_grid(n)
        active, tc, tc1, tc2, u, u1, u2 = s.magnetic_shape(xa, xb)
        a, k, D = hillert_jarl_constants(s.phase.magnetic.above_curie_fraction)
        on = np.where(active, R_GAS, 0.0)
        r1, r2 = tc1 / tc, tc2 / tc
        # x_A x_B d2G/dx2 / (R T) = x_A x_B (P f + Q tau f' + S tau^2 f'')
        P = xa * xb * u2 * on
        Q = xa * xb * (u * (2.0 * r1 * r1 - r2) - 2.0 * u1 * r1) * on
        S = xa * xb * u * r1 * r1 * on
        U = u * on
        tc5 = tc**5
        tc15 = tc5 * tc5 * tc5
        above = np.array([tc5 * -U / 10.0, tc15 * -U / 315.0, tc15 * tc5 * tc5 * -U / 1500.0,
                          tc5 * (-P / 10.0 + Q / 2.0 - 3.0 * S),
                          tc15 * (-P / 315.0 + Q / 21.0 - 16.0 * S / 21.0),
                          tc15 * tc5 * tc5 * (-P / 1500.0 + Q / 60.0 - 26.0 * S / 60.0)]) / D
        tc3 = tc * tc * tc
        tc9 = tc3 * tc3 * tc3
        below = np.array([U, -a * tc * U / D, -k * U / (6.0 * D * tc3), -k * U / (135.0 * D * tc9),
                          -k * U / (600.0 * D * tc9 * tc3 * tc3),
                          P, a * tc * (-P + Q - 2.0 * S) / D, k * (-P / 6.0 - Q / 2.0 - S) / (D * tc3),
                          k * (-P / 135.0 - Q / 15.0 - 8.0 * S / 15.0) / (D * tc9),
                          k * (-P / 600.0 - Q / 40.0 - 14.0 * S / 40.0) / (D * tc9 * tc3 * tc3)])
        self.above = (above[:3], above[3:])
        self.below = (below[:5], below[5:])
        #: Tc (K) on the grid where the term is active (0 elsewhere), and its largest value
        self.curie = np.where(active, tc, 0.0)
        self.curie_max = float(self.curie.max())

    def at(self, T: float, curvature: bool) -> np.ndarray:
        """The term's G (J/mol), or with `curvature` its x_A x_B d2G/dx_B2, on the grid at T (K)."""
        which = 1 if curvature else 0
        t4 = T**-4
        t10 = T**-10
        g = np.array((t4, t4 * t10, t4 * t10 * t10)) @ self.above[which]
        if T > self.curie_max:
            return g
        T4 = T**4
        T6 = T**6
        below = np.array((T, 1.0, T4, T4 * T6, T4 * T6 * T6)) @ self.below[which]
        return np.where(T <= self.curie, below, g)


#: The magnetic term's tables (`MagneticPowers`) of phases whose Tc and beta do not depend on
#: temperature, by (id(phase), n); each entry keeps its phase, so that the id is not reused
#: while it lives.
_magnetic_tables: dict[tuple[int, int], tuple[object, MagneticPowers]] = {}
_MAGNETIC_TABLES_KEPT = 64


def magnetic_on_grid(s, n: int, curvature: bool = False) -> np.ndarray:
    """The magnetic term of solution s (`SolutionAtT`) on the n-point grid: G (J/mol), or with
    `curvature` its x_A x_B d2G/dx_B2; from the phase's `MagneticPowers` (made on first use)
    where its Tc and beta do not depend on temperature, else from the term itself."""
    phase = s.phase
    if not phase.magnetic_parameters_constant:
        xa, xb = composition_grid(n)
        return s.magnetic_scaled_curvature(xa, xb) if curvature else s.magnetic_gibbs(xa, xb)
    key = (id(phase), n)
    found = _magnetic_tables.get(key)
    if found is None or found[0] is not phase:
        if len(_magnetic_tables) >= _MAGNETIC_TABLES_KEPT:
            _magnetic_tables.clear()
        found = _magnetic_tables[key] = (phase, MagneticPowers(s, n))
    return found[1].at(s.T, curvature)
