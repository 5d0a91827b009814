"""Audit of the general minimiser on the shipped systems against an independent reference (run on
demand, not collected by pytest):

    python tests/benchmarks/global_minimum_audit.py [--json] [--systems ag-au-cu fe-c ...]
                                                    [--points 300] [--seed 1]

For every shipped system of three or more elements or with sublattice phases (and every shipped
binary, through `general_equilibrium`), at random temperatures inside the file's covered window
(`covers_K`, cut to where every phase is defined) and random compositions inside its covered range
(`covers_at_percent`), plus each named alloy of the file every 20 K (--alloy-step), the engine's answer is
compared with a reference that shares none of the minimiser's code (only the phases' Gibbs-energy
models, `phase.at(T).gibbs`):

1. every phase sampled densely over its site fractions (a uniform grid with log-spaced tails down
   to 1e-7 toward every corner and edge of each sublattice's simplex; about 20,000 points for a
   ternary solution), G per mole of atoms at T;
2. the lower convex hull of all samples (scipy.spatial.ConvexHull, Qhull) keeps the candidates;
   the lowest combination at the alloy's composition is a linear program over them
   (scipy.optimize.linprog, HiGHS): an upper bound of the true minimum, since it is a state the
   alloy can take;
3. refined locally: around every point of that combination a finer grid (radius shrinking five
   times by 0.3) is added and the program solved again; the last refinement's gain is the
   reference's remaining sampling error (it converges geometrically);
4. the driving force of every phase against the reference's chemical potentials (the program's
   dual values) on its samples, and scipy.optimize.minimize (L-BFGS-B over softmax-parametrised
   site fractions) from up to four separate low regions of each phase: a point below the plane
   (a phase or a second composition set the samples under-resolved, as near the top of a
   miscibility gap) is added and steps 2-3 repeat.

A miss is a point where the engine's G lies above the reference by more than MISS_J_PER_MOL (the
reference is a real state, so a higher engine G is a real miss; the sampling error only bounds how
many misses the reference can overlook), where the engine says converged=False, or where it
raises instead of answering (an error). A point where no HiGHS solver of the reference's linear
program ends with a solution is counted apart (`reference_failed`), neither miss nor pass. For binaries
the binary shortcut (`equilibrate`, independently verified) is compared as well (G, phase names,
compositions); for a system of three elements, its binary edges (one element absent) against the
shortcut on the shipped binary of the other two (the ternary is built on it: Muggianu's
extrapolation and ternary terms vanish on the edge), inside both files' covered ranges.

`--screen TEMPERATURES PER_T` checks many more points cheaply: every engine answer against the
unrefined hull of a finer grid (the facet over the alloy is itself a state the alloy can take),
the full reference only where the engine lies above it; it resolves misses larger than the
coarse hull's own error (about 0.01-0.2 J/mol), the full audit those larger than about 1e-4.
Run against the engine before the two fixes of the 14-carat gold's gap (commits b9f3027 and
e9959c0), the screen of ag-au-cu at 900-1000 K finds 5 misses of 2-4.6 J/mol in 2000 points.

`--json` prints {"systems": {name: {points, misses, worst_dG_J_per_mol, unconverged, ...}},
"points": total, "misses": total, "worst_dG_J_per_mol": ...} with the misses' reproducers
(system, T, mole fractions).
"""

from __future__ import annotations

import argparse
import json
import sys
import time
from dataclasses import dataclass, field
from itertools import permutations

import numpy as np
from scipy.optimize import linprog, minimize
from scipy.spatial import ConvexHull, QhullError

from ladle.engine import find_system
from ladle.engine.files.catalog import list_systems
from ladle.engine.minimize.equilibrium import _binary_shortcut, equilibrate, general_equilibrium
from ladle.engine.units import mole_from_mass

#: An engine G this far above the reference (J/mol) is a miss.
MISS_J_PER_MOL = 1e-4
#: Driving force (J/mol) below which scipy's local search counts a point as below the plane.
BELOW_PLANE = 1e-7
#: Samples of a phase within this of the reference's plane (J/mol) seed scipy's local search.
SEED_MARGIN = 30.0
REFINEMENTS = 5
#: Hull points this far above the plane of the facet over the alloy (J/mol) are left out of the
#: refinements' programs (and taken back where the refined plane passes above them).
PRUNE_MARGIN = 40.0
SHRINK = 0.3
TAIL = np.logspace(-7.0, -1.5, 12)
MULTICOMPONENT = ("ag-cu-sn", "ag-au-cu", "al-mg-si", "bi-pb-sn", "cu-sn", "fe-c", "fe-fe3c", "fe-c-si")


def simplex_grid(m: int, n: int) -> np.ndarray:
    """Points of the (m-1)-simplex (rows summing to 1): a uniform grid of step 1/n with log-spaced
    tails toward every corner and edge (every coordinate ordering, so each edge is dense)."""
    if m == 1:
        return np.ones((1, 1))
    line = np.unique(np.concatenate([np.linspace(0.0, 1.0, n + 1), TAIL, 1.0 - TAIL]))
    if m == 2:
        return np.column_stack([line, 1.0 - line])
    if m != 3:
        raise ValueError("the audit samples sublattices of at most three constituents")
    a, b = np.meshgrid(line, line, indexing="ij")
    a, b = a.ravel(), b.ravel()
    keep = a + b <= 1.0 + 1e-15
    base = np.column_stack([a[keep], b[keep], np.clip(1.0 - a[keep] - b[keep], 0.0, None)])
    pts = np.vstack([base[:, p] for p in permutations(range(3))])
    return np.unique(np.round(pts, 15), axis=0)


@dataclass
class PhaseCloud:
    """One phase's samples: site fractions Y, atoms per formula unit, mole fractions X."""

    name: str
    groups: list
    element_matrix: np.ndarray
    Y: np.ndarray
    atoms: np.ndarray
    X: np.ndarray


def phase_cloud(name: str, model, n: int) -> PhaseCloud:
    """Samples of a phase (model: the phase at some T) over every sublattice's simplex."""
    parts = [simplex_grid(len(g), n) for g in model.groups]
    idx = np.meshgrid(*[np.arange(len(p)) for p in parts], indexing="ij")
    Y = np.zeros((int(np.prod([len(p) for p in parts])), model.n_vars))
    for g, p, sel in zip(model.groups, parts, idx):
        Y[:, g] = p[sel.ravel()]
    E = np.asarray(model.element_matrix, dtype=float)
    nel = Y @ E
    atoms = nel.sum(axis=1)
    keep = atoms > 1e-12
    return PhaseCloud(name, [np.asarray(g) for g in model.groups], E, Y[keep], atoms[keep], nel[keep] / atoms[keep, None])


def local_grid(cloud: PhaseCloud, y: np.ndarray, r: float, k: int = 4) -> np.ndarray:
    """Site fractions around y: in each sublattice the two smallest fractions (one of a pair)
    moved by up to r (relative steps for dilute ones), the largest taking up the rest."""
    per_group = []
    for g in cloud.groups:
        yg = y[g]
        if len(g) == 1:
            per_group.append(yg[None, :])
            continue
        order = np.argsort(yg)
        vary = order[:-1]
        axes = []
        for j in vary:
            v = yg[j]
            if v < 4.0 * r:
                steps = np.concatenate([v * np.exp(np.linspace(-3.0, 3.0, 2 * k + 1)), v + np.linspace(-r, r, 2 * k + 1)])
            else:
                steps = v + np.linspace(-r, r, 2 * k + 1)
            axes.append(np.unique(np.clip(steps, 0.0, 1.0)))
        mesh = np.meshgrid(*axes, indexing="ij")
        pts = np.zeros((mesh[0].size, len(g)))
        for j, mj in zip(vary, mesh):
            pts[:, j] = mj.ravel()
        rest = 1.0 - pts.sum(axis=1)
        pts[:, order[-1]] = rest
        per_group.append(pts[rest >= 0.0])
    idx = np.meshgrid(*[np.arange(len(p)) for p in per_group], indexing="ij")
    out = np.zeros((idx[0].size, len(y)))
    for g, p, sel in zip(cloud.groups, per_group, idx):
        out[:, g] = p[sel.ravel()]
    return out


class Reference:
    """The reference minimum of a system's phases at one temperature (see the module docstring)."""

    def __init__(self, clouds: list[PhaseCloud], models: dict, active: np.ndarray) -> None:
        self.models = models
        self.active = active
        self.clouds = []
        for c in clouds:
            keep = ~np.any(c.X[:, ~active] > 0.0, axis=1)
            if not keep.any():
                continue
            with np.errstate(all="ignore"):
                G = models[c.name].gibbs(c.Y[keep]) / c.atoms[keep]
            ok = np.isfinite(G)
            Y = c.Y[keep][ok]
            self.clouds.append((c, Y, c.X[keep][ok][:, active], G[ok]))
        X = np.vstack([x for _c, _y, x, _g in self.clouds])
        G = np.concatenate([g for *_r, g in self.clouds])
        owner = np.concatenate([np.full(len(g), i) for i, (*_r, g) in enumerate(self.clouds)])
        Y = [y for _c, y, _x, _g in self.clouds]
        rows = np.concatenate([np.arange(len(y)) for y in Y])
        keep, self.facets = self._lower_hull(X, G)
        self.X, self.G, self.owner = X[keep], G[keep], owner[keep]
        self.Y = [Y[o][r] for o, r in zip(owner[keep], rows[keep])]

    @staticmethod
    def _lower_hull(X: np.ndarray, G: np.ndarray) -> tuple[np.ndarray, tuple | None]:
        """Indices of the points on the lower convex hull and its facets (vertex indices into the
        kept points, and each facet's inverse barycentric matrix), or every point and None where
        Qhull cannot help."""
        n = X.shape[1]
        if n == 1 or len(G) <= n + 1:
            return np.arange(len(G)), None
        g = (G - G.mean()) / (np.ptp(G) or 1.0)
        try:
            hull = ConvexHull(np.column_stack([X[:, 1:], g]))
        except QhullError:
            return np.arange(len(G)), None
        simplices = hull.simplices[hull.equations[:, -2] < -1e-12]
        keep, inverse = np.unique(simplices.ravel(), return_inverse=True)
        simplices = inverse.reshape(simplices.shape)
        P = X[keep][:, 1:]
        M = np.swapaxes(P[simplices[:, 1:]] - P[simplices[:, :1]], 1, 2)     # (f, n-1, n-1)
        ok = np.abs(np.linalg.det(M)) > 1e-14
        return keep, (simplices[ok], np.linalg.inv(M[ok]), P[simplices[ok, 0]])

    def _facet_at(self, z: np.ndarray) -> np.ndarray | None:
        """The lower hull's chemical potentials at z (the plane of the facet over z), or None."""
        if self.facets is None:
            return None
        simplices, inv, origin = self.facets
        lam = np.einsum("fij,fj->fi", inv, z[1:] - origin)
        bary = np.column_stack([1.0 - lam.sum(axis=1), lam])
        inside = np.flatnonzero(np.all(bary >= -1e-12, axis=1))
        if not len(inside):
            return None
        idx = simplices[inside[0]]
        try:
            return np.linalg.solve(self.X[idx], self.G[idx])
        except np.linalg.LinAlgError:
            return None

    def _point(self, owner: int, y: np.ndarray) -> tuple[np.ndarray, float]:
        c = self.clouds[owner][0]
        n = y @ c.element_matrix
        atoms = float(n.sum())
        return n[self.active] / atoms, float(self.models[c.name].gibbs(y[None, :])[0]) / atoms

    def _lp(self, X: np.ndarray, G: np.ndarray, z: np.ndarray):
        """The lowest combination by HiGHS: its default choice of solver, then the dual simplex
        and the interior-point solver where one ends without a recognised status."""
        for method in ("highs", "highs-ds", "highs-ipm"):
            res = linprog(G, A_eq=X.T, b_eq=z, bounds=(0, None), method=method)
            if res.status == 0:
                return float(res.fun), res.x, np.asarray(res.eqlin.marginals)
        raise ReferenceFailed(f"reference linear program failed: {res.message}")

    def minimum(self, z: np.ndarray) -> dict:
        """The reference at overall composition z (mole fractions of the present elements)."""
        mu = self._facet_at(z)
        if mu is None:
            _g, _w, mu = self._lp(self.X, self.G, z)
        near = self.G - self.X @ mu < PRUNE_MARGIN         # hull points the refinements can use
        X, G, owner = [self.X[near]], [self.G[near]], [self.owner[near]]
        Y = [y for y, k in zip(self.Y, near) if k]
        history = []
        for _outer in range(6):
            r = 0.01
            for _ in range(REFINEMENTS + 1):
                Xa, Ga, Oa = np.vstack(X), np.concatenate(G), np.concatenate(owner)
                g, w, mu = self._lp(Xa, Ga, z)
                history.append(g)
                basis = np.flatnonzero(w > 1e-12)
                for k in basis:
                    c = self.clouds[Oa[k]][0]
                    pts = local_grid(c, Y[k], r)
                    nel = pts @ c.element_matrix
                    atoms = nel.sum(axis=1)
                    with np.errstate(all="ignore"):
                        gg = self.models[c.name].gibbs(pts) / atoms
                    ok = np.isfinite(gg) & (atoms > 1e-12) & ~np.any(nel[:, ~self.active] > 0.0, axis=1)
                    X.append(nel[ok][:, self.active] / atoms[ok, None])
                    G.append(gg[ok])
                    owner.append(np.full(int(ok.sum()), Oa[k]))
                    Y.extend(pts[ok])
                r *= SHRINK
            found = self._below_plane(mu, [(Oa[k], Y[k]) for k in basis])
            pruned = np.flatnonzero(~near & (self.G - self.X @ mu < -1e-9))   # hull points left out below the plane
            if not found and not len(pruned):
                break
            near[pruned] = True
            X.append(self.X[pruned])
            G.append(self.G[pruned])
            owner.append(self.owner[pruned])
            Y.extend(self.Y[k] for k in pruned)
            for o, y in found:
                for yy in local_grid(self.clouds[o][0], y, 1e-3):
                    if np.any((yy @ self.clouds[o][0].element_matrix)[~self.active] > 0.0):
                        continue
                    x, gg = self._point(o, yy)
                    X.append(x[None, :])
                    G.append(np.array([gg]))
                    owner.append(np.array([o]))
                    Y.append(yy)
        Xa, Ga, Oa = np.vstack(X), np.concatenate(G), np.concatenate(owner)
        g, w, mu = self._lp(Xa, Ga, z)
        basis = np.flatnonzero(w > 1e-12)
        phases = [(self.clouds[Oa[k]][0].name, float(w[k]), Xa[k]) for k in basis]
        return {"gibbs": g, "mu": mu, "error": max(0.0, history[-2] - history[-1]) if len(history) > 1 else np.inf,
                "phases": phases, "below_plane_rounds": _outer}

    def _below_plane(self, mu: np.ndarray, basis: list) -> list:
        """Points of any phase below the plane mu found by scipy's L-BFGS-B from low samples."""
        found = []
        for o, (c, Yc, Xc, Gc) in enumerate(self.clouds):
            d = Gc - Xc @ mu
            allowed = ~np.any(c.element_matrix[:, ~self.active] != 0.0, axis=1)
            if not any(allowed[g].sum() > 1 for g in c.groups):
                if d[0] < -1e-6:
                    found.append((o, Yc[0]))
                continue
            order = np.argsort(d)
            seeds = []
            mine = [y for b, y in basis if b == o]
            for k in order[:4000]:
                if d[k] > SEED_MARGIN:
                    break
                if all(np.max(np.abs(Yc[k] - y)) > 0.03 for y in mine) and all(np.max(np.abs(Yc[k] - Yc[j])) > 0.05 for j in seeds):
                    seeds.append(k)
                    if len(seeds) == 4:
                        break
            for k in seeds:
                y, df = self._descend(c, Yc[k], mu)
                if df < -BELOW_PLANE * max(1.0, 1e-4 * abs(float(np.min(Gc)))):
                    found.append((o, y))
        return found

    def _descend(self, c: PhaseCloud, y0: np.ndarray, mu: np.ndarray) -> tuple[np.ndarray, float]:
        """Minimum of the driving force (J per mole of atoms) from y0, L-BFGS-B over softmax logits
        (the phase model's gradient by the chain rule)."""
        model = self.models[c.name]
        E = c.element_matrix
        allowed = ~np.any(E[:, ~self.active] != 0.0, axis=1)      # constituents of present elements
        free = [g[allowed[g]] for g in c.groups if allowed[g].sum() > 1]
        e_mu = E[:, self.active] @ mu
        e_atoms = E.sum(axis=1)

        def y_of(u):
            y = y0.copy()
            i = 0
            for g in free:
                v = np.exp(u[i:i + len(g)] - u[i:i + len(g)].max())
                y[g] = v / v.sum()
                i += len(g)
            return y

        def f(u):
            y = y_of(u)
            atoms = float(y @ e_atoms)
            with np.errstate(all="ignore"):
                val = (float(model.gibbs(y[None, :])[0]) - float(y @ e_mu)) / atoms
                gy = (np.asarray(model.gradient(y[None, :]))[0] - e_mu - val * e_atoms) / atoms
            if not (np.isfinite(val) and np.all(np.isfinite(gy))):
                return 1e12, np.zeros_like(u)
            grad = []
            for g in free:
                yg = y[g]
                grad.append(yg * gy[g] - yg * float(yg @ gy[g]))
            return val, np.concatenate(grad)

        u0 = np.concatenate([np.log(np.maximum(y0[g], 1e-12)) for g in free])
        res = minimize(f, u0, jac=True, method="L-BFGS-B", options={"maxiter": 200, "ftol": 1e-13, "gtol": 1e-9})
        return y_of(res.x), float(res.fun)


class ReferenceFailed(RuntimeError):
    """The reference could not be computed at a point (no solver of the linear program ended
    with a solution): counted apart, neither a miss nor a pass."""


@dataclass
class Tally:
    points: int = 0
    misses: list = field(default_factory=list)
    unconverged: list = field(default_factory=list)
    phase_set_differs: int = 0
    worst_dG: float = -np.inf
    worst_error: float = 0.0
    shortcut_points: int = 0
    shortcut_worst_dx: float = 0.0
    shortcut_worst_dG: float = 0.0
    shortcut_differs: list = field(default_factory=list)
    errors: list = field(default_factory=list)
    reference_failed: list = field(default_factory=list)
    edge_points: int = 0
    edge_worst_dG: float = 0.0
    edge_differs: list = field(default_factory=list)
    seconds: float = 0.0


def composition_sets(points: list) -> list[str]:
    """The phase names of the reference's lowest combination, one per composition set: points of
    one phase closer than 0.02 (mole fractions) are one set (the refinements leave neighbours)."""
    sets: list[tuple[str, np.ndarray]] = []
    for name, _w, x in points:
        if not any(n == name and np.max(np.abs(x - x0)) < 0.02 for n, x0 in sets):
            sets.append((name, x))
    return sorted(n for n, _x in sets)


def temperature_window(system, within: tuple[float, float] | None = None) -> tuple[float, float]:
    """The temperatures (K) the audit samples: the covered range inside the models' range (else
    the diagram window), narrowed to `within` where given."""
    lo, hi = system.covers_K
    m_lo, m_hi = system.model_range_K
    t_lo, t_hi = system.temperature_range_K
    lo = max(lo, m_lo) if np.isfinite(lo) and lo > 0 else t_lo
    hi = min(hi, m_hi) if np.isfinite(hi) else t_hi
    if within is not None:
        lo, hi = max(lo, within[0]), min(hi, within[1])
    return lo, hi


def compositions(system, rng, k: int, dilute: float = 0.0) -> np.ndarray:
    """k random compositions inside the covered ranges (uniform in the box of the elements after
    the first, the first taking up the rest); a share `dilute` of them log-uniform from 1e-6 (or
    the range's lower end) per element, and as often that element's complement (dilute in the
    first element), where dilute solubilities are decided."""
    r = system.element_ranges
    out = []
    while len(out) < k:
        x = rng.uniform(r[1:, 0], r[1:, 1])
        if rng.uniform() < dilute:
            low = np.maximum(r[1:, 0], 1e-6)
            x = np.exp(rng.uniform(np.log(low), np.log(np.maximum(r[1:, 1], low))))
            if rng.uniform() < 0.5 and len(x) == 1:
                x = 1.0 - x
        z = np.concatenate([[1.0 - x.sum()], x])
        if r[0, 0] - 1e-12 <= z[0] <= r[0, 1] + 1e-12 and z[0] >= 0.0:
            out.append(z)
    return np.array(out)


def named_alloys(system) -> list[tuple[str, np.ndarray]]:
    out = []
    for a in system.alloys or ():
        parts = dict(a.parts)
        v = np.array([parts.get(el, 0.0) for el in system.elements]) / 100.0
        base = [i for i, el in enumerate(system.elements) if el not in parts]
        if len(base) != 1:
            continue
        v[base[0]] = 1.0 - v.sum()
        z = mole_from_mass(v, system.molar_mass) if a.basis == "wt" else v
        if system.covered(z):
            out.append((a.name, z))
    return out


def audit_system(name: str, points: int, rng, verbose: bool, alloy_step: float = 20.0,
                 window: tuple[float, float] | None = None, dilute: float = 0.25) -> Tally:
    system = find_system(name)
    lo, hi = temperature_window(system, window)
    tally = Tally()
    t0 = time.perf_counter()
    cases = [(T, z) for T, z in zip(rng.uniform(lo, hi, points), compositions(system, rng, points, dilute))]
    for _alloy, z in named_alloys(system):
        cases += [(T, z) for T in np.arange(np.ceil(lo / alloy_step) * alloy_step, hi, alloy_step)]
    n_grid = 150 if len(system.elements) == 3 else 4000
    samples = {p: phase_cloud(p, ph.at(lo), n_grid) for p, ph in system.models.items()}
    shortcut = _binary_shortcut(system)
    cases.sort(key=lambda c: c[0])
    refs: dict = {}
    for T, z in cases:
        T = float(T)
        models = {p: ph.at(T) for p, ph in system.models.items()}
        active = z > 0.0
        key = (T, active.tobytes())
        if key not in refs:
            refs.clear()
            refs[key] = Reference(list(samples.values()), models, active)
        try:
            ref = refs[key].minimum(z[active])
        except ReferenceFailed as e:
            tally.reference_failed.append({"system": name, "T_K": T, "x": [float(v) for v in z], "error": str(e)})
            continue
        eq = _engine(system, T, z, tally)
        if eq is None:
            continue
        dG = eq.gibbs_J_per_mol - ref["gibbs"]
        tally.points += 1
        tally.worst_dG = max(tally.worst_dG, dG)
        tally.worst_error = max(tally.worst_error, ref["error"])
        case = {"system": name, "T_K": T, "x": [float(v) for v in z], "dG_J_per_mol": dG,
                "reference_error_J_per_mol": ref["error"], "engine_phases": list(eq.phase_names),
                "reference_phases": composition_sets(ref["phases"]), "converged": eq.converged}
        if dG > MISS_J_PER_MOL:
            tally.misses.append(case)
            if verbose:
                print("MISS", json.dumps(case), file=sys.stderr)
        if not eq.converged:
            tally.unconverged.append(case)
            if verbose:
                print("UNCONVERGED", json.dumps(case), file=sys.stderr)
        if sorted(eq.phase_names) != case["reference_phases"]:
            tally.phase_set_differs += 1
        if shortcut:
            fast = equilibrate(system, T, z)
            tally.shortcut_points += 1
            dGs = abs(fast.gibbs_J_per_mol - eq.gibbs_J_per_mol)
            tally.shortcut_worst_dG = max(tally.shortcut_worst_dG, dGs)
            same = sorted(fast.phase_names) == sorted(eq.phase_names)
            if same:
                xs_f = sorted((p.name, float(p.x[1])) for p in fast.phases)
                xs_g = sorted((p.name, float(p.x[1])) for p in eq.phases)
                dx = max((abs(a[1] - b[1]) for a, b in zip(xs_f, xs_g)), default=0.0)
                tally.shortcut_worst_dx = max(tally.shortcut_worst_dx, dx)
            if not same and dGs > MISS_J_PER_MOL:
                tally.shortcut_differs.append({"T_K": T, "x": [float(v) for v in z], "shortcut": list(fast.phase_names),
                                               "general": list(eq.phase_names), "dG_J_per_mol": dGs})
    if len(system.elements) == 3:
        edges(system, rng, points, tally)
    tally.seconds = time.perf_counter() - t0
    return tally


def _engine(system, T: float, z: np.ndarray, tally: Tally):
    """The engine's answer, or None with the case kept as an error where it raises."""
    try:
        return general_equilibrium(system, T, z)
    except ValueError as e:
        tally.points += 1
        tally.errors.append({"system": system.name, "T_K": T, "x": [float(v) for v in z], "error": str(e)})
        return None


def edges(system, rng, points: int, tally: Tally) -> None:
    """The ternary `system` on its binary edges against the binary shortcut of the shipped binary
    of the same two elements, at random temperatures and compositions both files cover (a third
    of them log-uniform down to 1e-5)."""
    lo, hi = temperature_window(system)
    for entry in list_systems():
        binary = find_system(entry.name)
        if len(binary.elements) != 2 or not set(binary.elements) <= set(system.elements):
            continue
        b_lo, b_hi = temperature_window(binary)
        t_lo, t_hi = max(lo, b_lo), min(hi, b_hi)
        if t_hi <= t_lo or not _binary_shortcut(binary):
            continue
        idx = [system.elements.index(e) for e in binary.elements]
        for _ in range(points):
            T = float(rng.uniform(t_lo, t_hi))
            x_b = float(np.exp(rng.uniform(np.log(1e-5), 0.0))) if rng.uniform() < 1 / 3 else float(rng.uniform())
            z = np.zeros(3)
            z[idx] = (1.0 - x_b, x_b)
            if not (system.covered(z) and binary.covered(z[idx])):
                continue
            ternary = _engine(system, T, z, tally)
            if ternary is None:
                continue
            fast = equilibrate(binary, T, z[idx])
            dG = abs(ternary.gibbs_J_per_mol - fast.gibbs_J_per_mol)
            tally.edge_points += 1
            tally.edge_worst_dG = max(tally.edge_worst_dG, dG)
            if dG > MISS_J_PER_MOL or sorted(ternary.phase_names) != sorted(fast.phase_names) or not ternary.converged:
                tally.edge_differs.append({"binary": binary.name, "T_K": T, "x": [float(v) for v in z],
                                           "ternary": list(ternary.phase_names), "binary_phases": list(fast.phase_names),
                                           "dG_J_per_mol": dG, "converged": ternary.converged})


def screen_system(name: str, temperatures: int, per_T: int, rng, verbose: bool,
                  window: tuple[float, float] | None = None, n_grid: int = 300) -> Tally:
    """A fast screen of many points: at each of `temperatures` random temperatures, `per_T` random
    compositions, each engine answer against the unrefined hull of a finer grid (the facet over
    the alloy: itself a real state, so an engine G above it is a miss); the full reference
    (refined, with scipy's local searches) is computed only where the engine lies above the hull."""
    system = find_system(name)
    lo, hi = temperature_window(system, window)
    tally = Tally()
    t0 = time.perf_counter()
    clouds = [phase_cloud(p, ph.at(lo), n_grid if len(system.elements) == 3 else 4000)
              for p, ph in system.models.items()]
    for T in rng.uniform(lo, hi, temperatures):
        T = float(T)
        models = {p: ph.at(T) for p, ph in system.models.items()}
        zs = compositions(system, rng, per_T)
        ref = Reference(clouds, models, np.ones(len(system.elements), dtype=bool))
        for z in zs:
            mu = ref._facet_at(z)
            if mu is None:
                continue
            eq = _engine(system, T, z, tally)
            if eq is None:
                continue
            dG = eq.gibbs_J_per_mol - float(z @ mu)
            tally.points += 1
            case = {"system": name, "T_K": T, "x": [float(v) for v in z], "converged": eq.converged,
                    "engine_phases": list(eq.phase_names)}
            if not eq.converged:
                tally.unconverged.append(case)
                if verbose:
                    print("UNCONVERGED", json.dumps(case), file=sys.stderr)
            if dG > MISS_J_PER_MOL:
                try:
                    full = ref.minimum(z)
                except ReferenceFailed as e:         # the coarse hull's facet, a real state, shows the miss
                    case.update(dG_J_per_mol=dG, reference_failed=str(e))
                else:
                    case.update(dG_J_per_mol=eq.gibbs_J_per_mol - full["gibbs"], reference_error_J_per_mol=full["error"],
                                reference_phases=composition_sets(full["phases"]))
                tally.misses.append(case)
                tally.worst_dG = max(tally.worst_dG, case["dG_J_per_mol"])
                if verbose:
                    print("MISS", json.dumps(case), file=sys.stderr)
            else:
                tally.worst_dG = max(tally.worst_dG, dG)
    tally.seconds = time.perf_counter() - t0
    return tally


def main(argv: list[str] | None = None) -> int:
    ap = argparse.ArgumentParser(description=__doc__.split("\n\n")[0])
    ap.add_argument("--systems", nargs="*", help="system names (default: the multicomponent and sublattice systems and every binary)")
    ap.add_argument("--points", type=int, default=300, help="random points per system (default 300)")
    ap.add_argument("--seed", type=int, default=1)
    ap.add_argument("--alloy-step", type=float, default=20.0, help="temperature step (K) of the named alloys' scans (default 20)")
    ap.add_argument("--window", nargs=2, type=float, metavar=("LOW_K", "HIGH_K"),
                    help="audit only inside this temperature window (K), cut to each system's")
    ap.add_argument("--screen", nargs=2, type=int, metavar=("TEMPERATURES", "PER_T"),
                    help="fast screen instead: this many random temperatures, this many compositions at each")
    ap.add_argument("--dilute", type=float, default=0.25, help="share of random points with log-uniform (dilute) fractions (default 0.25)")
    ap.add_argument("--json", action="store_true")
    ap.add_argument("--verbose", action="store_true", help="print each miss as it is found (stderr)")
    args = ap.parse_args(argv)
    names = args.systems or list(MULTICOMPONENT) + sorted(
        e.name for e in list_systems() if len(find_system(e.name).elements) == 2 and e.name not in MULTICOMPONENT)
    rng = np.random.default_rng(args.seed)
    report = {"systems": {}}
    for name in names:
        if args.screen:
            t = screen_system(name, args.screen[0], args.screen[1], rng, args.verbose, args.window)
        else:
            t = audit_system(name, args.points, rng, args.verbose, args.alloy_step, args.window, args.dilute)
        report["systems"][name] = {
            "points": t.points, "misses": len(t.misses), "unconverged": len(t.unconverged),
            "worst_dG_J_per_mol": t.worst_dG, "worst_reference_error_J_per_mol": t.worst_error,
            "phase_set_differs": t.phase_set_differs, "shortcut_points": t.shortcut_points,
            "shortcut_worst_dx": t.shortcut_worst_dx, "shortcut_worst_dG_J_per_mol": t.shortcut_worst_dG,
            "shortcut_differs": t.shortcut_differs[:5], "edge_points": t.edge_points,
            "edge_worst_dG_J_per_mol": t.edge_worst_dG, "edge_differs": t.edge_differs[:5],
            "errors": len(t.errors), "error_cases": t.errors[:5],
            "reference_failed": len(t.reference_failed), "reference_failed_cases": t.reference_failed[:5],
            "seconds": round(t.seconds, 1),
            "miss_cases": t.misses[:10], "unconverged_cases": t.unconverged[:10]}
        if not args.json:
            print(f"{name}: {t.points} points, {len(t.misses)} misses, {len(t.unconverged)} unconverged, "
                  f"worst dG {t.worst_dG:.3g} J/mol (reference error <= {t.worst_error:.2g}), "
                  f"phase sets differ at {t.phase_set_differs}; shortcut {t.shortcut_points} points, "
                  f"worst dx {t.shortcut_worst_dx:.2g}, {len(t.shortcut_differs)} differ; binary edges {t.edge_points} points, "
                  f"worst dG {t.edge_worst_dG:.2g} J/mol, {len(t.edge_differs)} differ; {len(t.errors)} errors; "
                  f"reference failed at {len(t.reference_failed)}; {t.seconds:.0f} s", flush=True)
    s = report["systems"].values()
    report["points"] = sum(v["points"] for v in s)
    report["misses"] = sum(v["misses"] + v["unconverged"] + v["errors"] + len(v["shortcut_differs"]) + len(v["edge_differs"])
                           for v in s)
    report["worst_dG_J_per_mol"] = max(v["worst_dG_J_per_mol"] for v in s)
    if args.json:
        print(json.dumps(report, indent=1))
    return 0


if __name__ == "__main__":
    sys.exit(main())
