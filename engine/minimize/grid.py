"""The composition grid every phase is sampled on: dense next to both pure elements.

x_B = sin^2(pi u / 2) for u evenly spaced on [0, 1]; x_A = cos^2(pi u / 2) is computed on its own
so that neither fraction loses digits near its pure element. Both ends are exact.

At a new temperature every solution phase's G on the grid is one matrix product: the phase's
coefficients at T (`SolutionAtT.grid_coefficients`) times the grid's composition basis
(`gibbs_basis`); a magnetic term is added on its own, its Tc and beta with their composition
derivatives tabulated on the grid once per phase where they do not depend on temperature
(`magnetic_shape_on_grid`). The scaled curvature x_A x_B G'' (the sign of the spinodal) is
formed the same way (`curvature_basis`).
"""

from __future__ import annotations

from functools import lru_cache

import numpy as np

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


def scaled_curvature_on_grid(solutions: list, n: int = DEFAULT_POINTS, magnetic: bool = True) -> np.ndarray:
    """(len(solutions), n): x_A x_B d2G/dx_B2 (J/mol) of each solution phase at one temperature
    (`SolutionAtT`) on the n-point grid; negative inside a spinodal. `magnetic` False leaves
    the magnetic terms out (the caller adds them where it needs them)."""
    order = max(len(s.L) for s in solutions)
    C = np.array([s.curvature_coefficients(order) for s in solutions]) @ curvature_basis(n, order)
    for k, s in enumerate(solutions):
        if magnetic and s.phase.magnetic is not None:
            xa, xb = composition_grid(n)
            C[k] += s.magnetic_scaled_curvature(xa, xb, magnetic_shape_on_grid(s, n))
    return C


def gibbs_on_grid(solutions: list, n: int = DEFAULT_POINTS, coefficients: np.ndarray | None = None) -> np.ndarray:
    """(len(solutions), n): G (J/mol) of each solution phase at one temperature (`SolutionAtT`)
    on the n-point grid. `coefficients` may hold their `grid_coefficients` as rows of one matrix
    (of any order at least the longest Redlich-Kister series), where the caller has them."""
    if coefficients is None:
        order = max(len(s.L) for s in solutions)
        coefficients = np.array([s.grid_coefficients(order) for s in solutions])
    G = coefficients @ gibbs_basis(n, coefficients.shape[1] - 3)
    for k, s in enumerate(solutions):
        if s.phase.magnetic is not None:
            xa, xb = composition_grid(n)
            G[k] += s.magnetic_gibbs(xa, xb, _magnetic_parameters_on_grid(s, n))
    return G


#: The magnetic term's shape (`SolutionAtT.magnetic_shape`) on the grid of phases whose Tc and
#: beta do not depend on temperature, by (id(phase), n); each entry keeps its phase, so that the
#: id is not reused while it lives.
_magnetic_shapes: dict[tuple[int, int], tuple[object, tuple[np.ndarray, ...]]] = {}
_MAGNETIC_SHAPES_KEPT = 64


def magnetic_shape_on_grid(s, n: int) -> tuple[np.ndarray, ...] | None:
    """`SolutionAtT.magnetic_shape` on the n-point grid, computed once per phase where it does
    not depend on temperature; None where it does (computed with the term then)."""
    phase = s.phase
    if not phase.magnetic_parameters_constant:
        return None
    key = (id(phase), n)
    found = _magnetic_shapes.get(key)
    if found is not None and found[0] is phase:
        return found[1]
    shape = s.magnetic_shape(*composition_grid(n))
    for a in shape:
        a.setflags(write=False)
    if len(_magnetic_shapes) >= _MAGNETIC_SHAPES_KEPT:
        _magnetic_shapes.clear()
    _magnetic_shapes[key] = (phase, shape)
    return shape


def _magnetic_parameters_on_grid(s, n: int) -> tuple[np.ndarray, ...] | None:
    """`SolutionAtT.magnetic_parameters` on the n-point grid (active, Tc, ln(1 + beta)), from
    the tabulated shape; None where they depend on temperature."""
    shape = magnetic_shape_on_grid(s, n)
    return None if shape is None else (shape[0], shape[1], shape[4])
