"""A sample cloud over the site fractions of a phase, dense near the corners and edges of every
sublattice's simplex: the minimiser's own sampling where a phase's `samples()` cannot serve (a
phase restricted to fewer constituents because an element is absent from the alloy) and for model
phases that have no sampler of their own.

Each sublattice's site fractions are the normalised products of a one-dimensional grid that is
log-spaced down to 1e-6 (dilute solubilities matter to users) and even in the middle; sublattices
are combined as a Cartesian product. Units: site fractions (dimensionless).
"""

from __future__ import annotations

from functools import lru_cache
from itertools import product

import numpy as np

#: Site fractions closer to a pure constituent than this are not sampled separately.
SMALLEST_FRACTION = 1e-6
#: Upper bound on the points of one phase's cloud (the grids are thinned to stay below it).
MAX_POINTS = 1500


@lru_cache(maxsize=64)
def simplex_points(m: int, budget: int) -> np.ndarray:
    """Points on the (m-1)-simplex (rows summing to 1, shape (k, m)), at most about `budget` of
    them, dense near every corner and edge. Read-only."""
    if m == 1:
        out = np.ones((1, 1))
    elif m == 2:
        n = max(8, budget)
        n_log = max(3, n // 6)
        tail = np.logspace(np.log10(SMALLEST_FRACTION), -2, n_log)
        u = np.linspace(0.0, 1.0, max(3, n - 2 * n_log))[1:-1]
        middle = np.sin(0.5 * np.pi * u) ** 2
        middle = middle[(middle > 1e-2) & (middle < 1.0 - 1e-2)]
        t = np.concatenate([[0.0], tail, middle, 1.0 - tail[::-1], [1.0]])
        out = np.column_stack([1.0 - t, t])
        out[-1] = (0.0, 1.0)
    else:
        q = 3
        while (q + 1) ** m <= 2 * budget:
            q += 1
        n_log = max(1, q // 4)
        grid = np.concatenate([[0.0], np.logspace(np.log10(SMALLEST_FRACTION), -1.5, n_log),
                               np.linspace(0.0, 1.0, q - n_log)[1:]])
        w = np.array(list(product(grid, repeat=m)))
        w = w[w.sum(axis=1) > 0.0]
        out = w / w.sum(axis=1, keepdims=True)
        out = np.unique(np.round(out, 13), axis=0)
    out.setflags(write=False)
    return out


def site_fraction_cloud(groups: list[np.ndarray], n_vars: int, active: np.ndarray | None = None,
                        budget: int = MAX_POINTS) -> np.ndarray:
    """Site fractions (k, n_vars) over every sublattice (`groups`: index arrays into y). Variables
    where `active` is False stay exactly 0; a sublattice needs at least one active variable."""
    per_group = []
    sizes = []
    for g in groups:
        idx = g if active is None else g[active[g]]
        if len(idx) == 0:
            raise ValueError("a sublattice has no constituent left")
        sizes.append(len(idx))
        per_group.append(idx)
    free = [s for s in sizes if s > 1]
    share = budget ** (1.0 / len(free)) if free else 1.0
    parts = [simplex_points(s, int(share)) if s > 1 else simplex_points(1, 1) for s in sizes]
    count = int(np.prod([len(p) for p in parts]))
    Y = np.zeros((count, n_vars))
    grids = np.meshgrid(*[np.arange(len(p)) for p in parts], indexing="ij")
    for idx, part, sel in zip(per_group, parts, grids):
        Y[:, idx] = part[sel.ravel()]
    return Y
