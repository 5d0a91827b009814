"""An isothermal section: the stable phases of a binary at one temperature, for every composition.

The method (the CALPHAD way of finding the global minimum of G in a binary): sample every solution
phase on one composition grid, take the lower convex hull of all samples and compounds, refine each
hull edge that joins two different phases (or two distant parts of one phase: a miscibility gap)
into an exact common tangent by Newton's method, then check that no phase lies below any tangent
line anywhere (its driving force), adding the missing phase and rebuilding where one does.

Point queries take a fast path (refine only the edge under the composition and check its line);
the whole section, with every tie-line, is built on demand and cached.
"""

from __future__ import annotations

import weakref
from bisect import bisect_left, bisect_right
from functools import cached_property
from typing import Callable, NamedTuple

import numpy as np

from .grid import DEFAULT_POINTS, composition_grid, gibbs_table, grid_list, magnetic_on_grid, scaled_curvature_on_grid
from .hull import lower_hull
from ..models.phases import CompoundPhase, SolutionAtT, SolutionPhase
from ..models.polynomials import FunctionStack, TemperatureFunction, terms
from ..units import GAS_CONSTANT as R
from .tangent import common_tangent, lowest_against_line, tangent_to_point

#: The hull is taken over every HULL_STRIDE-th grid point; checks use the whole grid.
HULL_STRIDE = 4
#: A phase below a tangent line by more than this (J/mol) makes the line wrong.
DRIVING_FORCE_TOLERANCE = 1e-7
_MAX_REPAIRS = 6


class TieLine(NamedTuple):
    """Two phases in equilibrium at one temperature.

    `x` holds (x_A, x_B) of each phase (mole fractions), left phase first (smaller x_B);
    `mu` holds the common chemical potentials (mu_A, mu_B) in J/mol.
    """

    phases: tuple[str, str]
    x: tuple[tuple[float, float], tuple[float, float]]
    mu: tuple[float, float]
    converged: bool = True

    @property
    def x_B(self) -> tuple[float, float]:
        return self.x[0][1], self.x[1][1]


class LocalState(NamedTuple):
    """The stable state at one overall composition: (phase, (x_A, x_B), mole amount) per phase,
    the chemical potentials (mu_A, mu_B) in J/mol (None where undefined at a pure element) and the
    molar Gibbs energy of the alloy in J/mol."""

    phases: tuple[tuple[str, tuple[float, float], float], ...]
    mu: tuple[float | None, float | None]
    gibbs: float
    converged: bool


class PhasesAtT(NamedTuple):
    """A section's phases at its temperature, without its grid: what an answer keeps to
    compute its phases' dG/dT on first access."""

    solutions: list[SolutionAtT]
    compounds: tuple[CompoundPhase, ...]
    index: dict[str, int]

    def phase(self, name: str) -> SolutionAtT | CompoundPhase:
        """Phase `name`: a solution as `SolutionAtT`, a compound as its model."""
        k = self.index[name]
        n = len(self.solutions)
        return self.solutions[k] if k < n else self.compounds[k - n]


class BinaryPhases:
    """A binary system's phases in the order sections use them (solutions, then compounds),
    sorted once per system: `names`, `index` (name to position), the solution and compound
    models, `n_sol` and each compound's (x_A, x_B); every phase's temperature functions stacked
    (`functions`), each phase's share of them a slice (`slices`, in the order of `names`).

    Everything a section needs at a new temperature is linear in the ten terms of a temperature
    piece (`polynomials.terms`): the solutions' function values, each compound's G and the
    solutions' G on the composition grid (without a magnetic term). Per interval between piece
    limits and grid size these are the columns of one matrix (`_tables`), so that `at` is one
    matrix product."""

    def __init__(self, system) -> None:
        solutions = [(n, p) for n, p in system.phases.items() if isinstance(p, SolutionPhase)]
        compounds = [(n, p) for n, p in system.phases.items() if isinstance(p, CompoundPhase)]
        self.names: tuple[str, ...] = tuple(n for n, _p in solutions + compounds)
        self.index = {n: i for i, n in enumerate(self.names)}
        self.n_sol = len(solutions)
        self.solutions: tuple[SolutionPhase, ...] = tuple(p for _n, p in solutions)
        self.compounds: tuple[CompoundPhase, ...] = tuple(p for _n, p in compounds)
        self.comp_x = tuple((float(c.x[0]), float(c.x[1])) for c in self.compounds)
        functions: list[TemperatureFunction] = []
        self.slices: list[slice] = []
        for p in self.solutions + self.compounds:
            self.slices.append(slice(len(functions), len(functions) + len(p.temperature_functions)))
            functions += p.temperature_functions
        self.functions = FunctionStack(tuple(functions))
        #: the solutions' functions come first in `functions`: this many
        self._solution_functions = self.slices[self.n_sol].start if self.compounds else len(functions)
        self._grids: dict[int, _GridTables] = {}

    def grid(self, n: int) -> "_GridTables":
        """What sections on the n-point grid share (`_GridTables`), made on first use."""
        found = self._grids.get(n)
        if found is None:
            found = self._grids[n] = _GridTables(self, n)
        return found

    def _table(self, rows: np.ndarray, n: int) -> np.ndarray:
        """(10, columns) on one interval whose function coefficients are `rows` (functions, 10):
        the solutions' functions; the hull's candidates (`_GridTables`): every HULL_STRIDE-th
        grid point of each solution, then each compound's G (its formation energy plus its mole
        fractions times its references' G, as `CompoundPhase.gibbs_from_values`); then each
        solution's G on the n-point grid (`grid.gibbs_table`), phase after phase."""
        order = max((len(p.binary_terms) for p in self.solutions), default=0)
        grids = [gibbs_table(rows[cut.start:cut.start + 2 + len(p.binary_terms)], order, n)
                 for p, cut in zip(self.solutions, self.slices)]
        columns = [rows[:self._solution_functions].T] + [g[:, ::HULL_STRIDE] for g in grids]
        for c, cut in zip(self.compounds, self.slices[self.n_sol:]):
            g = rows[cut.start].copy()
            for xi, row in zip(c.x.tolist(), rows[cut.start + 1:cut.stop]):
                g += xi * row
            columns.append(g[:, None])
        return np.ascontiguousarray(np.hstack(columns + grids))

    def at(self, T: float, n: int) -> tuple[list[SolutionAtT], np.ndarray, np.ndarray]:
        """Every solution at T (K), the G (J/mol) of the hull's candidates (`_GridTables`) and
        the solutions' G (J/mol) on the n-point grid, as rows of one (solutions, n) array, all
        without magnetic terms: one product of the terms at T with the interval's table.
        Temperature derivatives are left to first use (`SolutionAtT`, `CompoundPhase.gibbs_dT`):
        a point answer needs them only for its own phases, and only where they are read."""
        grid = self.grid(n)
        row = terms(T) @ grid.tables[self.functions.piece(T)]
        F = self._solution_functions
        end = F + len(grid.hull_xb_list)
        values = row[:F].tolist()
        cut = self.slices
        solutions = [SolutionAtT(p, T, values[cut[k]]) for k, p in enumerate(self.solutions)]
        return solutions, row[F:end], row[end:].reshape(self.n_sol, n)


class _GridTables:
    """What every section of one system on the n-point grid shares: the matrices of
    `BinaryPhases.at` per interval between piece limits (`tables`); x_A and x_B repeated once
    per solution (`lines`, (2, solutions n): a line's value at every grid point of every
    solution is (mu_A, mu_B) times it); and the candidates of the hull: every HULL_STRIDE-th
    grid point (`coarse_xb`, x_B as Python floats, `coarse` of them) of each solution, phase
    after phase, then each compound (`hull_xb` as an array, `hull_xb_list` and `hull_xa_list`
    as Python floats)."""

    __slots__ = ("tables", "lines", "hull_xb", "hull_xb_list", "hull_xa_list", "coarse_xb", "coarse")

    def __init__(self, phases: BinaryPhases, n: int) -> None:
        self.tables = tuple(phases._table(rows, n) for rows in phases.functions.piece_rows)
        xa, xb = composition_grid(n)
        self.lines = np.array((np.tile(xa, phases.n_sol), np.tile(xb, phases.n_sol)))
        self.lines.setflags(write=False)
        self.coarse_xb = xb[::HULL_STRIDE].tolist()
        self.coarse = len(self.coarse_xb)
        self.hull_xb_list = self.coarse_xb * phases.n_sol + [x[1] for x in phases.comp_x]
        self.hull_xa_list = xa[::HULL_STRIDE].tolist() * phases.n_sol + [x[0] for x in phases.comp_x]
        self.hull_xb = np.array(self.hull_xb_list)
        self.hull_xb.setflags(write=False)


def per_system(cache: weakref.WeakKeyDictionary, system, build: Callable):
    """cache[system], made by build(system) on first use and kept while the system lives
    (systems are not changed in place); an object that takes no weak reference is not kept."""
    try:
        found = cache.get(system)
    except TypeError:
        return build(system)
    if found is None:
        found = cache[system] = build(system)
    return found


_binary_phases: "weakref.WeakKeyDictionary[object, BinaryPhases]" = weakref.WeakKeyDictionary()


def binary_phases(system) -> BinaryPhases:
    """The system's BinaryPhases, built on first use."""
    return per_system(_binary_phases, system, BinaryPhases)


class Section:
    """Stable phases of `system` at temperature T (K), for any overall composition."""

    def __init__(self, system, T: float, points: int = DEFAULT_POINTS) -> None:
        self.system = system
        self.T = float(T)
        self.xa, self.xb = composition_grid(points)
        phases = binary_phases(system)
        self.names: tuple[str, ...] = phases.names
        self.n_sol = phases.n_sol
        #: The G (J/mol) of the hull's candidates (`_GridTables`: coarse grid points of each
        #: solution, then the compounds) and (solutions, grid points) every solution's G on the grid
        self.solutions, self._hull_g, self.G = phases.at(self.T, points)
        self._grid = grid = phases.grid(points)
        m = grid.coarse
        for k, sol in enumerate(self.solutions):
            if sol.phase.magnetic is not None:
                magnetic = magnetic_on_grid(sol, points)
                self.G[k] += magnetic
                self._hull_g[k * m:(k + 1) * m] += magnetic[::HULL_STRIDE]
        self.compounds: tuple[CompoundPhase, ...] = phases.compounds
        self.comp_x = phases.comp_x
        self.comp_g: list[float] = self._hull_g[self.n_sol * m:].tolist()
        self.RT = self.solutions[0].RT if self.solutions else 8.314462618 * self.T
        self.phases_at_T = PhasesAtT(self.solutions, self.compounds, phases.index)
        #: Refined tie-lines by the seed points they started from, (phase, grid index or -1) each.
        self._ties: dict[tuple[int, int, int, int], TieLine | None] = {}
        #: Hull edges found by `_bridge`: (right end's x_B, left end's x_B, i, j), sorted. One
        #: list, changed by one insert, so that threads sharing the section keep it whole.
        self._edges: list[tuple[float, float, int, int]] = []
        #: Tie-lines ((phase, x_B) pairs and mu) whose driving-force check passed: it depends on
        #: nothing else, so it is not repeated for the next composition on the same tie-line.
        self._verified: set = set()
        self._index = phases.index
        #: x_A x_B d2G/dx_B2 of every solution on the grid, formed on first use (`_curvatures`).
        self._scaled_curvature: np.ndarray | None = None

    def _curvatures(self) -> np.ndarray:
        """(solutions, grid points): x_A x_B d2G/dx_B2 (J/mol) of every solution on the grid."""
        if self._scaled_curvature is None:
            self._scaled_curvature = scaled_curvature_on_grid(self.solutions, len(self.xb))
        return self._scaled_curvature

    # --- hull --------------------------------------------------------------------------------
    @cached_property
    def _points(self):
        """The hull's candidate points and vertices without repairs (see `_hull_points`)."""
        return self._hull_points([])

    def _hull_points(self, extra: list[tuple[int, float, float, float]]):
        """Candidate points sorted by x_B: the coarse grid envelope, compounds and `extra`
        (phase, xA, xB, G). Returns Python lists (xb, xa, g, phase index, grid index or -1)
        and the hull vertex indices."""
        coarse = self.G[:, ::HULL_STRIDE]
        xb, xa = self._grid.coarse_xb.copy(), self._grid.hull_xa_list[:coarse.shape[1]]
        g, phase = coarse.min(axis=0).tolist(), coarse.argmin(axis=0).tolist()
        grid = list(range(len(xb)))
        add = [(self.n_sol + k, cx[0], cx[1], cg) for k, (cx, cg) in enumerate(zip(self.comp_x, self.comp_g))] + extra
        for ph, pa, pb, pg in add:
            i = bisect_left(xb, pb)
            if i < len(xb) and xb[i] == pb:       # keep the lower of two points at one x_B
                if pg < g[i]:
                    xa[i], g[i], phase[i], grid[i] = pa, pg, ph, -1
                continue
            xb.insert(i, pb)
            xa.insert(i, pa)
            g.insert(i, pg)
            phase.insert(i, ph)
            grid.insert(i, -1)
        return xb, xa, g, phase, grid, lower_hull(xb, g)

    def _seed(self, k: int) -> tuple[int, int, float, float, float]:
        """Candidate k of the point queries: (phase, coarse grid index or -1, x_A, x_B, G): every
        solution's coarse grid points, phase after phase, then the compounds."""
        grid = self._grid
        s, c = divmod(k, grid.coarse)
        if s < self.n_sol:
            return s, c, grid.hull_xa_list[k], grid.hull_xb_list[k], float(self._hull_g[k])
        c = k - self.n_sol * grid.coarse
        return self.n_sol + c, -1, self.comp_x[c][0], self.comp_x[c][1], self.comp_g[c]

    def _bridge(self, xb0: float) -> tuple[int, int]:
        """The lower hull's edge over x_B = xb0 (0 < xb0 < 1) among the hull's candidates, as
        indices (i, j) of `_seed` with x_B(i) < xb0 <= x_B(j): from the coarse grid points on
        either side, the candidate lying lowest below the line through the pair replaces the
        pair's end on its side until none lies below (the line's value at xb0 falls each step).
        Edges are remembered: another composition inside one found before takes it again (hull
        edges do not overlap, so the edge whose range holds xb0 is the edge over it)."""
        edges = self._edges
        k = bisect_left(edges, (xb0,))
        if k < len(edges) and edges[k][1] < xb0 <= edges[k][0]:     # inside an edge found before
            return edges[k][2], edges[k][3]
        i, j = self._new_bridge(xb0)
        hull_xb = self._grid.hull_xb_list
        edge = (hull_xb[j], hull_xb[i], i, j)
        k = bisect_left(edges, edge)
        if k == len(edges) or edges[k] != edge:
            edges.insert(k, edge)
        return i, j

    def _new_bridge(self, xb0: float) -> tuple[int, int]:
        """`_bridge` computed afresh."""
        grid = self._grid
        x, g = grid.hull_xb, self._hull_g
        xs = grid.hull_xb_list
        j = bisect_left(grid.coarse_xb, xb0)
        # start from the solution lowest at the coarse grid point j
        at_j = g[j:self.n_sol * grid.coarse:grid.coarse].tolist()
        j += at_j.index(min(at_j)) * grid.coarse
        i = j - 1
        xi, gi, xj, gj = xs[i], float(g[i]), xs[j], float(g[j])
        for _ in range(len(xs)):
            slope = (gj - gi) / (xj - xi)
            level = gi - slope * xi
            d = g - slope * x
            k = int(d.argmin())
            if float(d[k]) >= level - 1e-9 * (1.0 + abs(level)):
                break
            xk, gk = xs[k], float(g[k])
            if xk < xb0:
                i, xi, gi = k, xk, gk
            else:
                j, xj, gj = k, xk, gk
        return i, j

    def _is_single_phase_edge(self, p: int, grid_p: int, q: int, grid_q: int) -> bool:
        """Whether two candidates (phase, grid index or -1) are neighbouring coarse grid points
        of one solution."""
        return p == q and p < self.n_sol and grid_p >= 0 and grid_q == grid_p + 1

    # --- tie-lines ----------------------------------------------------------------------------
    def _line_through(self, p1: tuple[float, float], g1: float, p2: tuple[float, float], g2: float) -> tuple[float, float]:
        """(mu_A, mu_B) of the line through two points (x, G)."""
        slope = (g2 - g1) / (p2[1] - p1[1])
        mu_a = g1 - slope * p1[1]
        return mu_a, mu_a + slope

    def refine(self, p: int, q: int, xp: tuple[float, float], xq: tuple[float, float], gp: float, gq: float) -> TieLine | None:
        """Exact tie-line between phases p and q (indices) started from two hull vertices.
        None where a gap inside one phase closes (no tie-line)."""
        names = (self.names[p], self.names[q])
        if p < self.n_sol and q < self.n_sol:
            r = common_tangent(self.solutions[p], self.solutions[q], xp, xq)
            if p == q and not r.converged and abs(r.x[0][1] - r.x[1][1]) < 1e-6:
                return None
            (xa1, xb1), (xa2, xb2) = r.x
            if r.converged and xb1 < xb2:
                mu = r.mu if r.mu is not None else self.solutions[p].potentials(xa1, xb1)
                return TieLine(names, r.x, (float(mu[0]), float(mu[1])), True)
            return TieLine(names, (xp, xq), self._line_through(xp, gp, xq, gq), False)
        if p < self.n_sol or q < self.n_sol:
            sol, start, comp = (p, xp, q) if p < self.n_sol else (q, xq, p)
            k = comp - self.n_sol
            r = tangent_to_point(self.solutions[sol], self.comp_x[k], self.comp_g[k], start)
            xs = r.x[0]
            if r.converged:
                mu = r.mu if r.mu is not None else self.solutions[sol].potentials(*xs)
                pair = (xs, self.comp_x[k]) if sol == p else (self.comp_x[k], xs)
                return TieLine(names, pair, (float(mu[0]), float(mu[1])), True)
            return TieLine(names, (xp, xq), self._line_through(xp, gp, xq, gq), False)
        return TieLine(names, (xp, xq), self._line_through(xp, gp, xq, gq), True)

    def _edge_tie(self, a: tuple[int, int, float, float, float], b: tuple[int, int, float, float, float],
                  remember: bool = True) -> TieLine | None:
        """The refined tie-line of the hull edge between candidates a and b, each (phase, grid
        index or -1, x_A, x_B, G); remembered by its seed points (`remember`: where they are
        grid points or compounds)."""
        key = (a[0], a[1], b[0], b[1])
        if remember and key in self._ties:
            return self._ties[key]
        tie = self.refine(a[0], b[0], (a[2], a[3]), (b[2], b[3]), a[4], b[4])
        if remember:
            self._ties[key] = tie
        return tie

    def phase_at(self, name: str) -> SolutionAtT | CompoundPhase:
        """Phase `name` at the section's temperature: a solution as `SolutionAtT`, a compound as
        its model (its G at T is in `comp_g`)."""
        return self.phases_at_T.phase(name)

    # --- driving forces -------------------------------------------------------------------------
    def violations(self, mu: tuple[float, float], touching: tuple[tuple[int, float], ...] = (),
                   skip_tol: float = DRIVING_FORCE_TOLERANCE) -> list[tuple[int, float, float, float]]:
        """Points (phase, xA, xB, G) of any phase lying below the line mu_A xA + mu_B xB (J/mol)
        by more than the tolerance: each phase's local dips on the grid, refined by Newton.
        `touching` lists (phase index, x_B) where a phase is known to touch the line; the grid
        dip next to it is that touching point and is not refined again."""
        mu_a, mu_b = mu
        found = []
        # G minus the line at every grid point of every solution, flat (one row per solution)
        flat = self.G.ravel() - np.dot(mu, self._grid.lines)
        # A dip (a grid point not above either neighbour) counts only below 2e-3 RT, and a pure
        # element or compound only below -skip_tol: only the few grid points below 2e-3 RT are
        # looked at; a neighbour not among them lies higher.
        n = self.G.shape[1]
        low = (flat < 2e-3 * self.RT).nonzero()[0]
        flat_index, below = low.tolist(), flat[low].tolist()
        last = len(below) - 1
        near = None
        ends = []
        for k, f in enumerate(flat_index):
            d_grid = below[k]
            s, i = divmod(f, n)
            end = i == 0 or i == n - 1
            if end and d_grid < -skip_tol:          # a pure element below the line
                ends.append((i, s))
                continue
            # a lower neighbour on the grid (the neighbours among the low points are next in the list)
            if (i > 0 and k > 0 and flat_index[k - 1] == f - 1 and d_grid > below[k - 1]) or \
                    (i < n - 1 and k < last and flat_index[k + 1] == f + 1 and d_grid > below[k + 1]):
                continue
            if near is None:
                grid = grid_list(n)
                near = {(ph, bisect_left(grid, xt)) for ph, xt in touching}
            if (s, i) in near or (s, i - 1) in near or (s, i + 1) in near:
                continue
            sol = self.solutions[s]
            xa_i, xb_i = float(self.xa[i]), float(self.xb[i])
            # a dip whose grid value lies above the most a smooth curve can sag between
            # neighbouring grid points (G'' h^2 / 8, doubled) cannot reach below the line; at a
            # pure element's end (G'' unbounded there) the dip inside the last cell is always sought
            if not end:
                h = 0.5 * float(self.xb[i + 1] - self.xb[i - 1])
                sag = float(sol.curvature(xa_i, xb_i)) * h * h / 4.0
                if d_grid > max(sag, 0.0) + skip_tol:
                    continue
            r = lowest_against_line(sol, mu_b - mu_a, (xa_i, xb_i))
            xa_, xb_ = r.x[0]
            g = float(sol.gibbs(xa_, xb_))
            d = g - (mu_a * xa_ + mu_b * xb_)
            if not r.converged or d > d_grid:
                xa_, xb_, g, d = xa_i, xb_i, float(self.G[s, i]), d_grid
            if d < -skip_tol:
                found.append((s, xa_, xb_, g))
        for col, s in sorted(ends):
            found.append((s, float(self.xa[col]), float(self.xb[col]), float(self.G[s, col])))
        for k, (cx, cg) in enumerate(zip(self.comp_x, self.comp_g)):
            if cg - (mu_a * cx[0] + mu_b * cx[1]) < -skip_tol:
                found.append((self.n_sol + k, cx[0], cx[1], cg))
        return found

    def spinodal(self, s: int, lo: float, hi: float) -> tuple[float, float] | None:
        """The first interval of x_B in [lo, hi] (widened by one grid cell each side) where
        solution s has negative curvature (its spinodal), ends located to 1e-12, or None.
        Curvature minima between grid points are examined on a finer local grid so that a
        spinodal narrower than a grid cell is found."""
        sol = self.solutions[s]
        grid = grid_list(len(self.xb))
        n = len(grid)
        i0 = max(bisect_left(grid, lo) - 1, 1)
        i1 = min(bisect_right(grid, hi) + 1, n - 1)
        if i1 - i0 < 1:
            return None
        if sol.phase.magnetic is None and self._curvature_stays_positive(s, grid[i0], grid[i1 - 1]):
            return None
        xb = self.xb[i0:i1]
        c = self._curvatures()[s, i0:i1]
        if float(c.min()) >= 0.05 * self.RT:        # no negative curvature, no minimum close to it
            return None
        neg = np.flatnonzero(c < 0)
        if len(neg) == 0:
            small = np.flatnonzero((c[1:-1] <= c[:-2]) & (c[1:-1] <= c[2:]) & (c[1:-1] < 0.05 * self.RT)) + 1
            for i in small:
                u = np.linspace(xb[i - 1], xb[i + 1], 65)
                cu = sol.scaled_curvature(1.0 - u, u)
                if (cu < 0).any():
                    xb, c = u, cu
                    neg = np.flatnonzero(c < 0)
                    break
            else:
                return None
        first, last = neg[0], neg[0]
        while last + 1 < len(c) and c[last + 1] < 0:
            last += 1
        left = self._curvature_root(sol, xb[first - 1], xb[first]) if first > 0 else float(xb[first])
        right = self._curvature_root(sol, xb[last], xb[last + 1]) if last + 1 < len(c) else float(xb[last])
        return left, right

    def _curvature_stays_positive(self, s: int, lo: float, hi: float) -> bool:
        """Whether solution s (no magnetic term) has a scaled curvature of at least 0.05 RT at
        every x_B in [lo, hi], by a bound: x_A x_B G'' = RT + x_A x_B sum_k L[k] t_k(x) with
        t_0 = -2 and |t_k| <= 2 (2k + 1) + k (k - 1) (|x_A - x_B| <= 1, x_A x_B <= 1/4), so the
        sum is at least -(2 L[0] + sum_{k>0} |L[k]| (2 (2k + 1) + k (k - 1))): a negative L[0]
        (attraction) only adds curvature."""
        L = self.solutions[s].L
        bound = sum(abs(Lk) * (2 * (2 * k + 1) + k * (k - 1)) for k, Lk in enumerate(L) if k) + (2.0 * L[0] if L else 0.0)
        if bound <= 0.0:
            return True
        p_max = 0.25 if lo <= 0.5 <= hi else max(lo * (1.0 - lo), hi * (1.0 - hi))
        return p_max * bound <= 0.95 * self.RT

    @staticmethod
    def _curvature_root(sol: SolutionAtT, a: float, b: float) -> float:
        """x_B between a and b where the curvature of `sol` changes sign (bisection)."""
        ca = float(sol.scaled_curvature(1.0 - a, a))
        for _ in range(60):
            m = 0.5 * (a + b)
            cm = float(sol.scaled_curvature(1.0 - m, m))
            if (cm < 0) == (ca < 0):
                a, ca = m, cm
            else:
                b = m
            if b - a < 1e-13:
                break
        return 0.5 * (a + b)

    def _gap_points(self, s: int, lo: float, hi: float) -> list[tuple[int, float, float, float]]:
        """The two compositions of a miscibility gap of solution s hidden inside (lo, hi), as
        hull points (phase, xA, xB, G); empty when there is none."""
        sp = self.spinodal(s, lo, hi)
        if sp is None:
            return []
        w = max(sp[1] - sp[0], 1e-9)
        left = max(sp[0] - w, 0.5 * (lo + sp[0]))
        right = min(sp[1] + w, 0.5 * (hi + sp[1]))
        sol = self.solutions[s]
        r = common_tangent(sol, sol, (1.0 - left, left), (1.0 - right, right))
        if not r.converged:
            return []
        return [(s, xa, xb, float(sol.gibbs(xa, xb))) for xa, xb in r.x]

    # --- whole section ------------------------------------------------------------------------------
    @cached_property
    def tie_lines(self) -> list[TieLine]:
        """Every tie-line of the section, ordered by composition, checked against every phase."""
        extra: list[tuple[int, float, float, float]] = []
        ties: list[TieLine] = []
        for _round in range(_MAX_REPAIRS):
            xb, xa, g, phase, grid, hull = self._points if not extra else self._hull_points(extra)
            ties = []
            for i, j in zip(hull[:-1], hull[1:]):
                if not self._is_single_phase_edge(phase[i], grid[i], phase[j], grid[j]):
                    tie = self._edge_tie((phase[i], grid[i], xa[i], xb[i], g[i]), (phase[j], grid[j], xa[j], xb[j], g[j]),
                                         remember=not extra)
                    if tie is not None:
                        ties.append(tie)
            ties = self._merge_crossings(ties)
            missing = [v for t in ties for v in self.violations(t.mu)]
            missing += self._envelope_violations(ties)
            if not missing:
                break
            extra = extra + missing
        return ties

    def _merge_crossings(self, ties: list[TieLine]) -> list[TieLine]:
        """Replace two neighbouring tie-lines whose middle phase has no range of its own."""
        index = {n: i for i, n in enumerate(self.names)}
        k = 0
        while k < len(ties) - 1:
            a, b = ties[k], ties[k + 1]
            if a.x_B[1] > b.x_B[0] + 1e-12:
                p, q = index[a.phases[0]], index[b.phases[1]]
                gp = self._gibbs_of(p, a.x[0])
                gq = self._gibbs_of(q, b.x[1])
                merged = self.refine(p, q, a.x[0], b.x[1], gp, gq)
                ties[k:k + 2] = [merged] if merged is not None else []
                k = max(k - 1, 0)
            else:
                k += 1
        return ties

    def _gibbs_of(self, phase: int, x: tuple[float, float]) -> float:
        if phase < self.n_sol:
            return float(self.solutions[phase].gibbs(*x))
        return self.comp_g[phase - self.n_sol]

    def _envelope_violations(self, ties: list[TieLine]) -> list[tuple[int, float, float, float]]:
        """Grid points of any phase below the single-phase stretches of the envelope."""
        found: list[tuple[int, float, float, float]] = []
        index = {n: i for i, n in enumerate(self.names)}
        bounds = [0.0] + [v for t in ties for v in t.x_B] + [1.0]
        if ties:
            owners = [ties[0].phases[0]] + [t.phases[1] for t in ties]
        else:
            owners = [self.names[self._points[3][0]]]
        for (lo, hi), owner in zip(zip(bounds[::2], bounds[1::2]), owners):
            p = index[owner]
            if p >= self.n_sol:
                continue
            found += self._gap_points(p, lo, hi)
            inside = (self.xb > lo) & (self.xb < hi)
            if not inside.any():
                continue
            below = self.G[:, inside] < self.G[p, inside] - 1e-9 * (1.0 + np.abs(self.G[p, inside]))
            for s, cols in zip(*np.nonzero(below)):
                i = np.flatnonzero(inside)[cols]
                found.append((int(s), float(self.xa[i]), float(self.xb[i]), float(self.G[s, i])))
                break
        return found

    # --- queries --------------------------------------------------------------------------------------
    def state_at(self, xa0: float, xb0: float) -> LocalState:
        """The stable state at overall composition (x_A, x_B): fast path, verified, else the
        whole section."""
        if xb0 <= 0.0 or xa0 <= 0.0:
            return self._pure_state(0 if xb0 <= 0.0 else 1)
        state = self._fast_state(xa0, xb0)
        if state is not None and state.mu[0] is not None:
            touching = tuple([(self._index[name], x[1]) for name, x, _amount in state.phases])
            if len(touching) == 2 and (touching, state.mu) in self._verified:
                return state                    # this tie-line passed the check before
            if not self.violations(state.mu, touching):
                if len(touching) == 2:
                    self._verified.add((touching, state.mu))
                return state
        return self._state_from_ties(self.tie_lines, xa0, xb0)

    def _pure_state(self, end: int) -> LocalState:
        col = 0 if end == 0 else self.G.shape[1] - 1
        s = int(np.argmin(self.G[:, col]))
        x = (1.0, 0.0) if end == 0 else (0.0, 1.0)
        g = float(self.G[s, col])
        mu = (g, None) if end == 0 else (None, g)
        return LocalState(((self.names[s], x, 1.0),), mu, g, True)

    def _single(self, phase: int, xa0: float, xb0: float, converged: bool = True) -> LocalState:
        if phase >= self.n_sol:
            k = phase - self.n_sol
            g = self.comp_g[k]
            return LocalState(((self.names[phase], self.comp_x[k], 1.0),), (None, None), g, converged)
        mu_a, mu_b = self.solutions[phase].potentials(xa0, xb0)
        mu_a, mu_b = float(mu_a), float(mu_b)
        # G = x_A mu_A + x_B mu_B (Euler's theorem for a molar quantity): no second evaluation
        return LocalState(((self.names[phase], (xa0, xb0), 1.0),), (mu_a, mu_b), xa0 * mu_a + xb0 * mu_b, converged)

    def _two(self, tie: TieLine, xa0: float, xb0: float) -> LocalState:
        """Lever rule on a tie-line; an alloy exactly at one end is that phase alone."""
        (_, xb1), (_, xb2) = tie.x
        width = xb2 - xb1
        f2 = (xb0 - xb1) / width
        f1 = (xb2 - xb0) / width
        g = tie.mu[0] * xa0 + tie.mu[1] * xb0
        shares = tuple([(name, x, f) for name, x, f in zip(tie.phases, tie.x, (f1, f2)) if f > 0.0])
        return LocalState(shares, tie.mu, g, tie.converged)

    def _fast_state(self, xa0: float, xb0: float) -> LocalState | None:
        i, j = self._bridge(xb0)
        a, b = self._seed(i), self._seed(j)
        p, q = a[0], b[0]
        if xb0 == b[3] and q >= self.n_sol:
            return None
        if self._is_single_phase_edge(p, a[1], q, b[1]):
            if self.spinodal(p, a[3], b[3]) is not None:
                return None
            return self._single(p, xa0, xb0)
        tie = self._edge_tie(a, b)
        if tie is None:
            return self._single(p, xa0, xb0)
        if not tie.converged:
            return None
        lo, hi = tie.x_B
        if lo <= xb0 <= hi:
            return self._two(tie, xa0, xb0)
        side = p if xb0 < lo else q
        if side >= self.n_sol or self.spinodal(side, min(xb0, lo, a[3]), max(xb0, hi, b[3])) is not None:
            return None
        return self._single(side, xa0, xb0)

    def _state_from_ties(self, ties: list[TieLine], xa0: float, xb0: float) -> LocalState:
        index = {n: i for i, n in enumerate(self.names)}
        for t in ties:
            lo, hi = t.x_B
            if lo <= xb0 <= hi and hi > lo:
                return self._two(t, xa0, xb0)
        owner = None
        for t in ties:
            if xb0 < t.x_B[0]:
                owner = t.phases[0]
                break
            owner = t.phases[1]
        if owner is None:
            owner = self.names[int(np.argmin(self.G[:, int(np.searchsorted(self.xb, xb0))]))]
        converged = all(t.converged for t in ties)
        return self._single(index[owner], xa0, xb0, converged)

    def envelope(self, xa: np.ndarray, xb: np.ndarray) -> np.ndarray:
        """The lower envelope of every phase's G (J/mol) at the compositions (xa, xb): the
        alloy's equilibrium Gibbs energy, common tangents inside two-phase fields."""
        g = np.min([s.gibbs(xa, xb) for s in self.solutions], axis=0)
        for t in self.tie_lines:
            lo, hi = t.x_B
            inside = (xb >= lo) & (xb <= hi)
            g = np.where(inside, t.mu[0] * xa + t.mu[1] * xb, g)
        return g

    # --- curves for display ---------------------------------------------------------------------------
    def curves(self) -> dict[str, tuple[np.ndarray, np.ndarray]]:
        """Each phase's G (J/mol) against x_B on the grid; a compound is a single point."""
        out = {n: (self.xb, self.G[s]) for s, n in enumerate(self.names[:self.n_sol])}
        for k, name in enumerate(self.names[self.n_sol:]):
            out[name] = (np.array([self.comp_x[k][1]]), np.array([self.comp_g[k]]))
        return out
