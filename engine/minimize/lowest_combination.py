"""The lowest combination of sampled points at one overall composition: a linear program over a
point cloud, solved by the revised simplex method in numpy.

    minimise sum_k w_k G_k   subject to   sum_k w_k x_k = z,   w >= 0

(G_k in J per mole of atoms, x_k mole fractions, w_k moles of atoms per mole of alloy). The
minimum is the lower convex hull of the cloud at z; the basis holds at most N points (N elements)
and its dual values are the chemical potentials of the hull's facet. The revised simplex method
is G.B. Dantzig's (Linear Programming and Extensions, Princeton 1963); its use for the Gibbs
energy minimum is W.B. White, S.M. Johnson and G.B. Dantzig, J. Chem. Phys. 28 (1958) 751. Each
iteration computes the chemical potentials mu from the basis and lets the point with the most
negative driving force G_k - mu.x_k enter (Dantzig's rule). Columns can be appended later and the
solve continued from the last basis (column generation): the minimiser adds refined points that
way. Written for N <= about 8 elements (an N x N solve per iteration); numpy only, because
importing scipy.optimize costs about 0.5-0.9 s, more than a whole line command.
"""

from __future__ import annotations

import numpy as np

#: A point enters the basis when its driving force is below -ENTER_TOLERANCE (J/mol, relative to
#: 1 + |G_k|) and it is not in the basis already: while an artificial column is in the basis, mu
#: reaches 1e11 J/mol and the rounding of mu.x alone can put a basic point's driving force below
#: the tolerance, even with a fresh inverse; entering itself changes nothing, so it did so until
#: the iteration limit (a tin solder with ppm of Ag and Cu stopped so, still artificial).
ENTER_TOLERANCE = 1e-9
#: Points priced in the first, coarse solve (every k-th point of a larger cloud).
COARSE_POINTS = 400
#: Clouds larger than this are priced in full only to choose a shortlist (the points whose
#: driving force is at least SHORTLIST_SHARE of the most negative one) and to confirm optimality;
#: the iterations between price the shortlist alone (partial pricing).
SHORTLIST_FROM = 2000
SHORTLIST_SHARE = 0.05
#: Energy (J/mol) above every point given to the artificial start columns (pure elements).
_ARTIFICIAL_MARGIN = 1e7


class LowestCombination:
    """The linear program over a cloud of points (X: (k, N) mole fractions, G: (k,) J/mol) at
    overall composition z (N,), solved on construction; `add` appends points and re-solves.

    After solving: `basis` (N point indices; -1 - i is the artificial pure element i),
    `weights` (N, moles of atoms), `mu` (N, J/mol), `gibbs` (J/mol) and `iterations`.
    """

    def __init__(self, X: np.ndarray, G: np.ndarray, z: np.ndarray, max_iterations: int | None = None,
                 start: np.ndarray | None = None, transposed: bool = False, corners: np.ndarray | None = None) -> None:
        """`X` is (k, N), or (N, k) C-contiguous with `transposed`; `start` (N point indices) is
        a basis to try first (the last answer's at a nearby composition): used when feasible.
        `corners` (N point indices, -1 where there is none) may name a point at each pure
        element: they replace the artificial columns of the first basis (a feasible basis
        whose weights are z), which saves the iterations that drive the artificial columns out."""
        self.z = np.asarray(z, dtype=float)
        n = len(self.z)
        self.XT = X if transposed else np.ascontiguousarray(np.asarray(X, dtype=float).T)   # (N, k): fast pricing
        self.G = np.asarray(G, dtype=float)
        self.artificial_cost = float(np.max(self.G)) + _ARTIFICIAL_MARGIN if len(self.G) else _ARTIFICIAL_MARGIN
        self.basis = -1 - np.arange(n)
        self.iterations = 0
        self.max_iterations = max_iterations or 60 * n + 40
        self.converged = False
        if start is not None and self._feasible(np.asarray(start)):
            self.basis = np.array(start)
        else:
            if corners is not None:
                self.basis = np.where(corners >= 0, corners, self.basis)
            stride = len(self.G) // COARSE_POINTS
            if stride > 1:                          # a coarse solve first, then every point
                self._solve(stride)
        self._solve()

    def _feasible(self, basis: np.ndarray) -> bool:
        """Whether `basis` (N point indices) is a nonsingular basis with weights >= 0 at z."""
        if len(basis) != len(self.z) or np.any(basis >= len(self.G)):
            return False
        cols, _cost = self._columns(basis)
        if np.linalg.matrix_rank(cols) < len(self.z):
            return False
        return bool(np.all(np.linalg.solve(cols.T, self.z) >= -1e-12))

    # --- the basis ---------------------------------------------------------------------------
    def _columns(self, idx: np.ndarray) -> tuple[np.ndarray, np.ndarray]:
        n = len(self.z)
        cols = np.empty((len(idx), n))
        cost = np.empty(len(idx))
        real = idx >= 0
        cols[real] = self.XT[:, idx[real]].T
        cost[real] = self.G[idx[real]]
        art = ~real
        cols[art] = np.eye(n)[-1 - idx[art]]
        cost[art] = self.artificial_cost
        return cols, cost

    def _solve(self, stride: int = 1) -> None:
        """Simplex iterations from the current basis, pricing every `stride`-th point."""
        XT, G = (self.XT, self.G) if stride == 1 else (np.ascontiguousarray(self.XT[:, ::stride]), self.G[::stride].copy())
        cols, cost = self._columns(self.basis)
        inv = np.linalg.inv(cols.T)                  # B^-1, B = the basis columns side by side
        w = inv @ self.z
        converged = False
        since_refactor = 0
        short = None                                 # the shortlist being priced, or None: every point
        artificial = bool((self.basis < 0).any())    # an artificial column in the basis (see ENTER_TOLERANCE)
        while self.iterations < self.max_iterations:
            mu = cost @ inv                          # B^T mu = c_B
            if short is not None:
                d = short_G - mu @ short_XT
                k = int(d.argmin())
                if d[k] > -ENTER_TOLERANCE * (1.0 + abs(short_G[k])):
                    short = None                     # optimal on the shortlist: price every point
                    continue
                k = int(short[k])
            else:
                d = G - mu @ XT
                k = int(d.argmin()) if len(d) else -1
                if k < 0 or d[k] > -ENTER_TOLERANCE * (1.0 + abs(G[k])):
                    converged = True
                    break
                if len(d) > SHORTLIST_FROM:          # the most promising points, priced alone until
                    short = np.flatnonzero(d < SHORTLIST_SHARE * d[k])     # none of them enters
                    short_XT, short_G = XT[:, short], G[short]
            if artificial and k * stride in self.basis:     # entering itself would change nothing
                if since_refactor:                   # a fresh inverse first, as every 20th step makes
                    inv = np.linalg.inv(cols.T)
                    w = inv @ self.z
                    since_refactor = 0
                    continue
                if short is not None:
                    short = None
                    continue
                converged = True                     # still priced below by rounding alone: optimal
                break
            u = inv @ XT[:, k]
            r, step = -1, np.inf                     # the ratio test, in Python floats (N is small)
            for i, (ui, wi) in enumerate(zip(u.tolist(), w.tolist())):
                if ui > 1e-12 and max(wi, 0.0) / ui < step:
                    r, step = i, max(wi, 0.0) / ui
            if r < 0:                                # unbounded cannot happen on a simplex
                break
            w = w - step * u
            w[r] = step
            self.basis[r] = k * stride
            if artificial:
                artificial = bool((self.basis < 0).any())
            cols[r], cost[r] = XT[:, k], G[k]
            since_refactor += 1
            if since_refactor >= 20:                 # fresh inverse now and then: rounding
                inv = np.linalg.inv(cols.T)
                w = inv @ self.z
                since_refactor = 0
            else:                                    # product-form update of the inverse
                pivot = inv[r] / u[r]
                inv = inv - u[:, None] * pivot
                inv[r] = pivot
            self.iterations += 1
        self.converged = converged
        if stride == 1:                              # the answer (a coarse solve only starts the full one)
            self.weights = np.linalg.solve(cols.T, self.z)
            self.mu = np.linalg.solve(cols, cost)
            self.gibbs = float(self.weights @ cost)

    # --- public ------------------------------------------------------------------------------
    def add(self, X: np.ndarray, G: np.ndarray, restart: np.ndarray | None = None) -> None:
        """Append points (X: (k, N), G: (k,)) and continue the solve from the current basis, or
        from `restart` (N point indices forming a feasible basis, such as refined phases whose
        amounts make z) when given and not singular."""
        self.XT = np.hstack([self.XT, np.asarray(X, dtype=float).T])
        self.G = np.concatenate([self.G, G])
        if restart is not None and self._feasible(np.asarray(restart)):
            self.basis = np.array(restart)
        self.max_iterations = self.iterations + 60 * len(self.z) + 40
        self._solve()

    @property
    def uses_artificial(self) -> bool:
        """True if an artificial column still carries weight (the cloud cannot make z)."""
        return bool(np.any((self.basis < 0) & (self.weights > 1e-12)))
