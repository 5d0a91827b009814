"""The global minimum of the Gibbs energy at one temperature and overall composition, for any
number of elements and any phases given as site-fraction models (the `SublatticeAtT` interface).

The method (H.L. Lukas, S.G. Fries, B. Sundman, Computational Thermodynamics: The Calphad Method,
Cambridge 2007): (1) every phase's sample cloud and the lowest combination of samples at the
overall composition, a linear program (`lowest_combination`) whose basis gives the phases, their
approximate compositions and amounts, and the chemical potentials; samples of one phase that are
separated by a region above the hull's plane (a miscibility gap) start separate composition sets;
(2) Newton's method on the full equilibrium conditions (`multiphase_newton`); (3) the driving
force of every phase against the refined chemical potentials on its samples, a few Newton
steps from the lowest sample of each phase where sampling could hide a minimum, and a search
along the softest direction of a phase nearly flat at a composition set (a miscibility gap near
its critical point, whose other side lies between the samples): a point below the
plane joins the refined phases at zero amount while the phase rule leaves room, else it joins the
linear program as a new column (with small neighbourhoods of the refined points), which restarts
from the refined phases' basis, and adds the lowest points of every phase against its own plane
until none lies below it (column generation); Newton refines again. A Newton solve that ends with
the state it started from below its plane (it dropped a phase the minimum needs) is refused and
the linear program decides. The linear program's basis has at most N points and Newton only
removes phases or adds one below N, so Gibbs' phase rule (at most N phases at fixed T and P)
holds in every answer. Units: J per mole of atoms, mole fractions, K.

Elements absent from the alloy (mole fraction exactly 0) are left out: constituents containing
them are fixed at 0, their chemical potentials are undefined (NaN).
"""

from __future__ import annotations

import threading
from collections import OrderedDict
from dataclasses import dataclass
from functools import cached_property

import numpy as np

from .lowest_combination import LowestCombination
from .multiphase_newton import PhaseState, free_groups, lowest_driving_force, solve, sublattice_rows
from .site_sampling import site_fraction_cloud

#: A phase lying more than this below the equilibrium's tangent plane is missing from the answer
#: (J/mol; scaled up by 1e-4 |G| where |G| exceeds 1e4 J/mol, the digits G carries).
DRIVING_FORCE_TOLERANCE = 1e-6
#: Phases whose lowest sample is within `NEAR_PLANE (h / NEAR_PLANE_SPACING)^2` J/mol of the
#: plane get Newton steps between samples, h = k^(-1/f) being the typical spacing of k samples
#: over f degrees of freedom: the samples miss a minimum between them by about G'' h^2 / 8, about
#: 1 J/mol at h = 1/60 (a few thousand points over a ternary); 25 J/mol there leaves a wide margin,
#: and the margin grows as the cloud thins out in more dimensions.
NEAR_PLANE = 25.0
NEAR_PLANE_SPACING = 1.0 / 60.0
#: Near a dilute corner G'' is about RT / y and the clouds are coarser than h, so a phase's lowest
#: sample (not the far starts of a gap search) gets Newton steps up to this many times the margin:
#: measured misses were 2.0 times it (Fe-Si's bcc at 2.3 at% Si, 1212 K: samples 1/300 apart, not
#: 1/729) and 2.7 times it (Fe-C-Si's fcc at 3.3 at% Si and 0.03 at% C, 1201 K: its lowest sample
#: 95 J/mol above the plane, its minimum between samples 8 J/mol below).
LOWEST_SAMPLE_MARGIN = 10.0
#: Samples of a phase this far (site fractions, max norm) from its composition sets seed a
#: search for a gap.
GAP_DISTANCE = 0.08
#: Separate low regions of a phase, far from its composition sets, given Newton steps toward the
#: lowest driving force.
FAR_STARTS = 3
#: Points sampled on each side of a composition set along the line a split is sought on
#: (`_split_about`).
SPLIT_SAMPLES = 200
#: Relative size of the neighbourhood added around refined points (see `_neighbourhood`).
NEIGHBOURHOOD = 1e-2
_ROUNDS = 8
#: Column-generation passes of the linear program where it decides (`_Search._descend_lp`): each
#: adds the points of lowest driving force against its own plane; measured, the gap to the
#: minimum shrinks about four times per pass.
LP_PASSES = 6
#: A phase with less than this (moles of atoms per mole of alloy) is not reported.
VANISHING_AMOUNT = 1e-14
_SMALLEST_START = 1e-12


@dataclass(frozen=True)
class PhaseResult:
    """One phase (composition set) of the minimum: site fractions y, amount in moles of atoms per
    mole of alloy, composition x (mole fractions of every element)."""

    name: str
    y: np.ndarray
    amount: float
    x: np.ndarray


@dataclass(frozen=True)
class GlobalMinimum:
    """The minimum: phases, chemical potentials mu (J/mol, NaN for absent elements), G and dG/dT
    of the alloy (J/mol, J/(mol K)) and whether every Newton solve met its tolerance."""

    phases: tuple[PhaseResult, ...]
    mu: np.ndarray
    gibbs: float
    gibbs_dT: float
    converged: bool


@dataclass
class _Phase:
    """A phase as the minimiser uses it: its model at T, the indices of its free site fractions
    (constituents of absent elements are fixed at 0) and its sample cloud."""

    name: str
    model: object
    free: np.ndarray
    Y: np.ndarray
    X: np.ndarray           # active elements only, per mole of atoms
    G: np.ndarray           # J per mole of atoms

    @cached_property
    def free_groups(self) -> list[np.ndarray]:
        """Per sublattice, the indices of its free site fractions."""
        return free_groups(self.model, self.free)

    @cached_property
    def tangent(self) -> np.ndarray:
        """An orthonormal basis (free site fractions x directions) of the moves that keep every
        sublattice's sum: the space G's curvature is judged on (`_soft_side`)."""
        _u, sv, vt = np.linalg.svd(sublattice_rows(self.model, self.free))
        return vt[len(sv):].T


@dataclass
class _Prepared:
    """The phases' clouds at one temperature and set of present elements, stacked for the linear
    program (`owner`: each sample's phase, `start`: each phase's first sample), and the basis of
    the last answer (a start for the next nearby composition)."""

    models: tuple
    phases: list[_Phase]
    XT: np.ndarray
    G: np.ndarray
    owner: np.ndarray
    start: np.ndarray
    last_basis: np.ndarray | None = None
    pure: list[np.ndarray] | None = None

    @cached_property
    def corners(self) -> np.ndarray | None:
        """Per present element, the lowest sample of it pure (-1 where none is), or None where
        the samples are not those of the shape."""
        if self.pure is None:
            return None
        return np.array([int(k[np.argmin(self.G[k])]) if len(k) else -1 for k in self.pure])


_PREPARED: OrderedDict[tuple, _Prepared] = OrderedDict()
_PREPARED_LOCK = threading.Lock()


@dataclass(frozen=True)
class _Shape:
    """What the clouds of some phases are at any temperature, for one set of present elements:
    per phase (name, free site fractions, sample site fractions Y, mole fractions X of the present
    elements, atoms per formula unit), the stacked X (N, k) of the linear program, and each
    sample's phase and each phase's first sample. `anchors` holds the objects whose ids make the
    cache's key, so that they stay unique while the entry lives."""

    anchors: tuple
    parts: tuple[tuple[str, np.ndarray, np.ndarray, np.ndarray, np.ndarray], ...]
    XT: np.ndarray
    owner: np.ndarray
    start: np.ndarray

    @cached_property
    def pure(self) -> list[np.ndarray]:
        """Per present element, the samples (indices into XT's columns) of it pure."""
        return [np.flatnonzero(row >= 1.0 - 1e-12) for row in self.XT]


def _stacked(X: list[np.ndarray]) -> tuple[np.ndarray, np.ndarray, np.ndarray]:
    """(XT, owner, start): the clouds' mole fractions side by side (N, k), the phase of each
    sample and the index of each phase's first sample."""
    XT = np.ascontiguousarray(np.vstack(X).T)
    owner = np.repeat(np.arange(len(X)), [len(x) for x in X])
    return XT, owner, np.cumsum([0] + [len(x) for x in X])


def _shape_of(models: dict[str, object], active: np.ndarray, anchors: tuple) -> _Shape:
    """The temperature-independent part of the clouds of `models` for the present elements
    `active`: the model's own samples, or the minimiser's over the free site fractions where an
    element is absent; phases that cannot exist without the absent elements are left out."""
    parts = []
    inactive = ~active
    for name, m in models.items():
        E = np.asarray(m.element_matrix)
        ok_var = ~np.any(E[:, inactive] != 0.0, axis=1)
        if not all(ok_var[g].any() for g in m.groups):
            continue
        if inactive.any():
            Y = site_fraction_cloud(m.groups, m.n_vars, ok_var)
            with np.errstate(all="ignore"):
                n = Y @ E
                atoms = n.sum(-1)
                keep = atoms > 1e-12
                Y, n, atoms = Y[keep], n[keep], atoms[keep]
                X = (n / atoms[:, None])[:, active]
        else:
            Y, X, _G = m.samples()
            atoms = None
        parts.append((name, np.flatnonzero(ok_var), Y, X, atoms))
    return _Shape(anchors, tuple(parts), *_stacked([part[3] for part in parts]))


_SHAPES: OrderedDict[tuple, _Shape] = OrderedDict()


def _remembered(cache: OrderedDict, key: tuple, build, size: int = 8):
    """cache[key], built by build() where missing; the cache keeps the `size` latest entries.
    Entries are built outside the lock (threads may build one twice; either is kept)."""
    with _PREPARED_LOCK:
        found = cache.get(key)
        if found is not None:
            cache.move_to_end(key)
            return found
    found = build()
    with _PREPARED_LOCK:
        cache[key] = found
        if len(cache) > size:
            cache.popitem(last=False)
    return found


def _shape(models: dict[str, object], active: np.ndarray) -> _Shape:
    """`_shape_of`, remembered for the last few (phases, present elements). A model at another
    temperature of the same phase shares its element matrix, groups and sample site fractions
    (the engine's models do); models that do not get a shape of their own."""
    anchors = tuple((m.element_matrix, m.groups, m.samples()[0] if active.all() else None) for m in models.values())
    key = (tuple(models), tuple(id(a) for anchor in anchors for a in anchor), active.tobytes())
    return _remembered(_SHAPES, key, lambda: _shape_of(models, active, anchors))


def _prepare(models: dict[str, object], active: np.ndarray) -> _Prepared:
    """The phases that can exist with the present elements `active`, with their clouds' G at the
    models' temperature (J per mole of atoms), stacked for the linear program. Samples where a
    phase's G is not finite are left out."""
    shape = _shape(models, active)
    phases = []
    finite = True
    for name, free, Y, X, atoms in shape.parts:
        m = models[name]
        if active.all():
            G = m.samples()[2]
        else:
            with np.errstate(all="ignore"):
                G = m.gibbs(Y) / atoms
        keep = np.isfinite(G)
        if not keep.all():
            finite = False
            Y, X, G = Y[keep], X[keep], G[keep]
            if len(G) == 0:
                continue
        phases.append(_Phase(name, m, free, Y, X, G))
    if not phases:
        raise ValueError("no phase can hold this composition")
    XT, owner, start = (shape.XT, shape.owner, shape.start) if finite else _stacked([p.X for p in phases])
    return _Prepared(tuple(models.values()), phases, XT, np.concatenate([p.G for p in phases]), owner, start,
                     pure=shape.pure if finite else None)


def _prepared(models: dict[str, object], active: np.ndarray) -> _Prepared:
    """The stacked clouds of `models` for the present elements `active`, remembered for the last
    few (models, elements) pairs: points of one section or one path at one temperature share
    them. The entry holds the models, so their ids in the key stay unique while it lives."""
    key = (tuple((name, id(m)) for name, m in models.items()), active.tobytes())
    return _remembered(_PREPARED, key, lambda: _prepare(models, active))


class _Cloud:
    """Every sample and refined point given to the linear program, with its phase and site
    fractions; `XT` and `G` are the samples' stacked mole fractions and G (J/mol)."""

    def __init__(self, prepared: _Prepared) -> None:
        self.owner = prepared.owner
        self.start = prepared.start
        self.phases = prepared.phases
        self.XT = prepared.XT
        self.G = prepared.G
        self.extra_y: list[np.ndarray] = []
        self.extra_owner: list[int] = []

    def point(self, k: int) -> tuple[int, np.ndarray]:
        n0 = int(self.start[-1])
        if k >= n0:
            return self.extra_owner[k - n0], self.extra_y[k - n0]
        p = int(self.owner[k])
        return p, self.phases[p].Y[k - int(self.start[p])]

    def add(self, owner: int, y: np.ndarray) -> None:
        self.extra_owner.append(owner)
        self.extra_y.append(y)


def _per_atom(model, y: np.ndarray, active: np.ndarray) -> tuple[np.ndarray, float]:
    """(mole fractions of the present elements, G in J per mole of atoms) at site fractions y."""
    with np.errstate(all="ignore"):
        n = y @ model.element_matrix
        atoms = float(n.sum())
        return n[active] / atoms, float(model.gibbs(y)) / atoms


def _start_states(lp: LowestCombination, cloud: _Cloud, active: np.ndarray) -> list[PhaseState]:
    """Composition sets from the basis: points of one phase merge unless the phase rises above the
    plane between them (a miscibility gap)."""
    pts = []
    for k, w in zip(lp.basis, lp.weights):
        if k < 0 or w <= 1e-14:
            continue
        owner, y = cloud.point(int(k))
        pts.append([owner, np.array(y, dtype=float), float(w)])
    merged: list[list] = []
    for owner, y, w in pts:
        ph = cloud.phases[owner]
        for m in merged:
            if m[0] != owner:
                continue
            x_mid, g_mid = _per_atom(ph.model, 0.5 * (m[1] + y), active)
            if g_mid - x_mid @ lp.mu <= 0.0:          # convex between: one composition set
                m[1] = (m[2] * m[1] + w * y) / (m[2] + w)
                m[2] += w
                break
        else:
            merged.append([owner, y, w])
    states = []
    for owner, y, w in merged:
        ph = cloud.phases[owner]
        y0 = _start_fractions(ph, y)
        atoms = float((y0 @ ph.model.element_matrix).sum())
        states.append(PhaseState(ph.name, ph.model, y0, w / atoms, ph.free))
    return states


def _start_fractions(ph: _Phase, y: np.ndarray) -> np.ndarray:
    """Site fractions y made a start for Newton: free ones at least _SMALLEST_START, the others
    0, each sublattice's free fractions summing to 1."""
    y0 = np.zeros(len(y))
    y0[ph.free] = np.maximum(y[ph.free], _SMALLEST_START)
    for gi in ph.free_groups:
        y0[gi] /= y0[gi].sum()
    return y0


def _exchange(states: list[PhaseState], entering: PhaseState, elements: np.ndarray) -> list[PhaseState] | None:
    """One exact exchange (simplex) step: the phase `entering` joins the state's phases at the
    largest amount that keeps every amount non-negative under the mass balance (the ratio test),
    and the phases whose amount reaches zero leave. None where the state's compositions are
    singular or nothing limits the step. Amounts in moles of atoms per mole of alloy, mass
    balance over the present elements `elements`."""
    X = np.array([st.moles_per_formula_unit[elements] / st.atoms for st in states]).T
    atoms = np.array([st.amount * st.atoms for st in states])
    x_in = entering.moles_per_formula_unit[elements] / entering.atoms
    try:
        lam = np.linalg.solve(X, x_in)
    except np.linalg.LinAlgError:
        return None
    limiting = lam > 1e-12
    if not limiting.any():
        return None
    t = float(np.min(atoms[limiting] / lam[limiting]))
    left = atoms - t * lam
    kept = [PhaseState(st.name, st.model, st.y, float(a) / st.atoms, st.free)
            for st, a in zip(states, left) if a > 1e-12 * max(1.0, t)]
    entering.amount = t / entering.atoms
    return kept + [entering]


def _along_line(ph: _Phase, y_s: np.ndarray, step: np.ndarray, mu: np.ndarray, elements: np.ndarray,
                span: float = 1.0) -> tuple[np.ndarray, np.ndarray, np.ndarray]:
    """The phase sampled densely along the line y_s + t step (step of max norm 1 in the free site
    fractions; `elements`: the indices of the present elements): y_s itself (t = 0) and
    SPLIT_SAMPLES points each side, as far as every free site fraction stays positive, |t| at
    most `span`. Returns (t ascending, site fractions, driving force against mu in J per mole of
    atoms)."""
    free = ph.free

    def reach(direction: np.ndarray) -> float:
        falling = direction[free] < 0.0
        room = float(np.min(y_s[free][falling] / -direction[free][falling])) if falling.any() else 1.0
        return min(span, (1.0 - 1e-9) * room)

    t = np.concatenate([-np.linspace(0.0, reach(-step), SPLIT_SAMPLES + 1)[:0:-1],
                        np.linspace(0.0, reach(step), SPLIT_SAMPLES + 1)])
    Y = np.clip(y_s + t[:, None] * step, 0.0, None)
    return t, Y, _driving_forces(ph.model, Y, mu, elements)


def _driving_forces(model, Y: np.ndarray, mu: np.ndarray, elements: np.ndarray) -> np.ndarray:
    """The phase's G against the plane mu at the site fractions Y (rows), in J per mole of atoms
    (`elements`: the indices of the present elements); NaN or inf where G is not finite."""
    moles = Y @ model.element_matrix
    atoms = moles.sum(axis=1)
    with np.errstate(all="ignore"):
        return model.gibbs(Y) / atoms - (moles[:, elements] / atoms[:, None]) @ mu


def _split_about(states: list[PhaseState], ph: _Phase, y: np.ndarray, mu: np.ndarray,
                 elements: np.ndarray) -> list[PhaseState] | None:
    """The state with its largest composition set of phase `ph` split in two along the line from
    the set's site fractions y_s through `y` (a point below the plane mu next to it): the phase is
    sampled densely along the line (`_along_line`) and the two points whose chord lies lowest over
    y_s (the lower convex hull of the driving force along the line) are the new sets, their
    amounts by the lever rule. A start for Newton where a set lies inside or next to a
    miscibility gap's spinodal, from which a zero-amount second set is dropped again: near the
    gap's critical point its sides lie far beyond the point next to the set, and on one side
    only. None where the phase has no set or no chord lies below the set."""
    mine = [k for k, st in enumerate(states) if st.name == ph.name]
    if not mine:
        return None
    k = max(mine, key=lambda i: states[i].amount)
    st = states[k]
    step = y - st.y
    size = float(np.max(np.abs(step[ph.free])))
    if size <= 0.0:
        return None
    t, Y, d = _along_line(ph, st.y, step / size, mu, elements)
    left, right = t < 0.0, t > 0.0
    ta, tb, da, db = t[left][:, None], t[right][None, :], d[left][:, None], d[right][None, :]
    chord = (da * tb - db * ta) / (tb - ta)                     # each chord's height over y_s
    if not np.isfinite(chord).any() or np.nanmin(chord) >= 0.0:
        return None
    a, b = np.unravel_index(np.nanargmin(chord), chord.shape)
    t_a, t_b = float(t[left][a]), float(t[right][b])
    one = PhaseState(st.name, st.model, _start_fractions(ph, Y[left][a]), st.amount * t_b / (t_b - t_a), st.free)
    two = PhaseState(st.name, st.model, _start_fractions(ph, Y[right][b]), st.amount * -t_a / (t_b - t_a), st.free)
    return states[:k] + [one, two] + states[k + 1:]


def _soft_side(ph: _Phase, st: PhaseState, mu: np.ndarray, elements: np.ndarray) -> np.ndarray | None:
    """Where a second minimum of the phase may hide next to its composition set `st` (site
    fractions y_s; its Hessian from Newton's method where it has one): the lowest other dip
    (local minimum of the driving force) along the phase's softest direction at y_s, sampled to
    2 GAP_DISTANCE each side; None where the phase is not flat there or has no other
    dip within NEAR_PLANE (J/mol) of the plane. Flat means that the smallest eigenvalue of G's
    Hessian over the free site fractions (on the sublattice sums' tangent space, J/mol per unit
    site fraction squared) lets G rise by less than NEAR_PLANE over GAP_DISTANCE, so that a
    minimum could lie between the set and the samples searched beyond GAP_DISTANCE. Near a
    miscibility gap's critical point the gap's sides lie close to that direction (a 14-carat
    Au-Ag-Cu gold at 933.5-934.1 K: the other side 0.03-0.04 away, 0.03-0.005 J/mol below the
    plane, and slightly off the line: Newton's steps from the dip find it)."""
    free, Z, y_s, H = ph.free, ph.tangent, st.y, st.hessian
    if Z.shape[1] == 0:
        return None
    if H is None:
        with np.errstate(all="ignore"):
            H = ph.model.hessian(y_s)
        if len(free) < len(y_s):
            H = H[np.ix_(free, free)]
    H = Z.T @ H @ Z
    if not np.isfinite(H).all():
        return None
    lam, vec = np.linalg.eigh(H)
    if 0.5 * lam[0] * GAP_DISTANCE ** 2 >= NEAR_PLANE:
        return None
    step = np.zeros(ph.model.n_vars)
    step[free] = Z @ vec[:, 0]
    step /= float(np.max(np.abs(step)))
    t, Y, d = _along_line(ph, y_s, step, mu, elements, span=2.0 * GAP_DISTANCE)
    if Z.shape[1] > 1:
        # each point relaxed across the line by one Newton step in the stiff directions (their
        # curvature taken from y_s): the gap's other side lies a little off the line, where the
        # stiff curvature (5e4 J/mol for the gold) lifts the line's points above a shallow side
        # (only points that end lower are kept: a stiff direction of low or negative curvature
        # gives a wild step, dropped here)
        Zs = Z @ vec[:, 1:]
        relaxed = Y.copy()
        with np.errstate(all="ignore"):
            g = ph.model.gradient(Y)[:, free] - (mu @ ph.model.element_matrix[:, elements].T)[free]
            relaxed[:, free] -= ((g @ Zs) / lam[1:]) @ Zs.T
            ok = np.isfinite(relaxed).all(axis=1) & (relaxed[:, free] > 0.0).all(axis=1)
        d_relaxed = _driving_forces(ph.model, relaxed[ok], mu, elements)
        lower = np.zeros(len(d), dtype=bool)
        lower[ok] = d_relaxed < d[ok]
        Y[lower], d[lower] = relaxed[ok][lower[ok]], d_relaxed[lower[ok]]
    inner = d[1:-1]
    dips = np.flatnonzero((inner < d[:-2]) & (inner <= d[2:]) & (t[1:-1] != 0.0) & (inner < NEAR_PLANE)) + 1
    if len(dips) == 0:
        return None
    return Y[dips[np.argmin(d[dips])]]


def _merge_duplicates(states: list[PhaseState]) -> list[PhaseState]:
    """Composition sets of one phase that Newton brought to the same site fractions, merged."""
    out: list[PhaseState] = []
    for st in states:
        for o in out:
            if o.name == st.name and np.max(np.abs(o.y - st.y)) < 1e-7:
                o.amount += st.amount
                break
        else:
            out.append(st)
    return out


def _neighbourhood(ph: _Phase, y: np.ndarray, relative: float = NEIGHBOURHOOD) -> list[np.ndarray]:
    """y and its neighbours: each free site fraction scaled by 1 +- `relative`, the sublattice
    renormalised. Added to the linear program around refined points so that its lowest
    combination can follow the exact tangent plane there."""
    out = [y.copy()]
    for j in ph.free:
        for f in (1.0 + relative, 1.0 - relative):
            v = y.copy()
            v[j] *= f
            g = next(g for g in ph.model.groups if j in g)
            v[g] /= v[g].sum()
            out.append(v)
    return out


def _candidates(cloud: _Cloud, states: list[PhaseState], mu: np.ndarray, elements: np.ndarray,
                tol: float) -> list[tuple[int, np.ndarray, float]]:
    """Points of any phase below the plane mu by more than tol (J/mol): (phase, y, driving force)."""
    found = []
    d_all = cloud.G - mu @ cloud.XT             # every sample of every phase in one product
    for p, ph in enumerate(cloud.phases):
        d = d_all[cloud.start[p]:cloud.start[p + 1]]
        mine = [st.y for st in states if st.name == ph.name]
        lowest = int(np.argmin(d))
        starts = [lowest]
        freedom = len(ph.free) - len(ph.model.groups)
        near = NEAR_PLANE * (len(d) ** (-1.0 / max(freedom, 1)) / NEAR_PLANE_SPACING) ** 2
        if mine:                             # look farther from the composition sets as well
            close = np.flatnonzero(d <= near)
            far = np.ones(len(close), dtype=bool)
            for y in mine:
                far &= np.max(np.abs(ph.Y[close] - y), axis=1) > GAP_DISTANCE
            far_start = _spread_lowest(ph.Y, d, close[far])
            # the lowest sample at a set is no candidate; one just below the plane next to a set
            # (inside a shallow gap's spinodal) is, but the gap's other side may lie far away
            starts = far_start if d[lowest] >= -tol else [lowest] + [k for k in far_start if k != lowest]
        if freedom == 0:                      # a compound: its one sample is exact
            starts = [k for k in starts if d[k] < -tol]
        elif mine and d[lowest] >= -tol:       # nothing below next to the sets: are they flat?
            for st in states:
                side = _soft_side(ph, st, mu, elements) if st.name == ph.name else None
                if side is not None:
                    y1, df = lowest_driving_force(ph.model, _start_fractions(ph, side), mu, elements, ph.free,
                                                  sets=mine, tolerance=tol)
                    if np.isfinite(df) and df < -tol:
                        found.append((p, y1, df))
        for k in starts:
            if d[k] > (LOWEST_SAMPLE_MARGIN * near if k == lowest else near):
                continue
            if freedom == 0:
                found.append((p, ph.Y[k].copy(), float(d[k])))
                continue
            y0 = np.zeros(ph.model.n_vars)
            y0[ph.free] = np.maximum(ph.Y[k][ph.free], _SMALLEST_START)
            y, df = lowest_driving_force(ph.model, y0, mu, elements, ph.free, sets=mine, tolerance=tol)
            if not np.isfinite(df) or df > d[k]:
                y, df = ph.Y[k], float(d[k])
            if df < -tol:
                found.append((p, y, df))
    return found


def _spread_lowest(Y: np.ndarray, d: np.ndarray, among: np.ndarray) -> list[int]:
    """Up to FAR_STARTS samples of `among`, lowest `d` first, each more than GAP_DISTANCE (site
    fractions, max norm) from those taken: one start per separate low region (the two sides of a
    gap next to a composition set can both lie near the plane, only one of them below it)."""
    taken: list[int] = []
    left = np.asarray(among)
    while len(left) and len(taken) < FAR_STARTS:   # the lowest left, then those far from it
        k = int(left[np.argmin(d[left])])
        taken.append(k)
        left = left[np.max(np.abs(Y[left] - Y[k]), axis=1) > GAP_DISTANCE]
    return taken


def global_minimum(models: dict[str, object], z: np.ndarray,
                   near: tuple[list[tuple[str, np.ndarray]], np.ndarray] | None = None) -> GlobalMinimum:
    """The global minimum of G over `models` (name -> SublatticeAtT at one temperature) at
    overall composition z (mole fractions of every element, summing to 1).

    `near` may give the answer at a nearby composition (or temperature): its phases (name, site
    fractions) and chemical potentials (J/mol). Newton starts from it; where that converges, the
    linear program is skipped: the driving-force check runs on the result, and a phase found below
    it is added as from any other refined state. Where that does not end in a converged answer,
    the minimiser starts afresh from the linear program (the answer passes the same check either
    way)."""
    z = np.asarray(z, dtype=float)
    active = z > 0.0
    elements = np.flatnonzero(active)
    za = z[active] / z[active].sum()
    prepared = _prepared(models, active)
    if near is not None:
        warm = _from_nearby(near, prepared.phases, z, active, elements)
        if warm is not None:
            found = _Search(prepared, za, active, elements).run(*warm)
            if found is not None:
                return _result(*found, z, active, elements, True)
    search = _Search(prepared, za, active, elements)
    states, mu, converged = search.run_from_samples()
    return _result(states, mu, z, active, elements, converged)


class _Search:
    """One search for the minimum at overall composition za (mole fractions of the present
    `elements`) over the prepared clouds: Newton's method, the driving-force check and the repairs
    it calls for (a phase added, an exchange step, a composition set split, the linear program
    over the clouds with the refined points added). The linear program is built when first
    needed."""

    def __init__(self, prepared: _Prepared, za: np.ndarray, active: np.ndarray, elements: np.ndarray) -> None:
        self.prepared = prepared
        self.phases = prepared.phases
        self.za = za
        self.active = active
        self.elements = elements
        self.cloud = _Cloud(prepared)
        self._lp: LowestCombination | None = None

    @property
    def lp(self) -> LowestCombination:
        """The linear program over the clouds at za (from the last basis at this temperature)."""
        if self._lp is None:
            prepared = self.prepared
            lp = LowestCombination(prepared.XT, prepared.G, self.za, start=prepared.last_basis, transposed=True,
                                   corners=prepared.corners)
            if lp.uses_artificial:
                raise ValueError("no combination of the phases reaches this composition")
            prepared.last_basis = lp.basis.copy() if np.all(lp.basis >= 0) else None
            self._lp = lp
        return self._lp

    def run_from_samples(self) -> tuple[list[PhaseState], np.ndarray, bool]:
        """(states, mu, converged) from the linear program's lowest combination."""
        lp = self.lp
        return self._rounds(_start_states(lp, self.cloud, self.active), lp.mu, abs(lp.gibbs) + 1.0, refined=False)

    def run(self, states: list[PhaseState], mu: np.ndarray) -> tuple[list[PhaseState], np.ndarray] | None:
        """(states, mu) from refined states (Newton converged on them), or None where the rounds
        end without a converged answer."""
        states, mu, converged = self._rounds(states, mu, abs(float(mu @ self.za)) + 1.0, refined=True)
        return (states, mu) if converged else None

    def _rounds(self, states: list[PhaseState], mu: np.ndarray, scale: float,
                refined: bool) -> tuple[list[PhaseState], np.ndarray, bool]:
        """Newton, the check and one repair per round, at most _ROUNDS rounds. `refined`: the
        states are a converged Newton solve already. Returns (states, mu, converged)."""
        phases, za, elements, active, cloud = self.phases, self.za, self.elements, self.active, self.cloud
        n_active = len(elements)
        good = refined                          # whether `states` and `mu` are a converged solve
        converged = False
        tol = DRIVING_FORCE_TOLERANCE * max(1.0, 1e-4 * scale)
        added_to = None                         # the number of phases a zero-amount phase was added to
        exchanged = False                       # whether this round's states come from an exchange step
        best: tuple[float, list[PhaseState], np.ndarray] | None = None    # the lowest state seen
        settled = False                         # whether the linear program's plane has no point below it
        for _ in range(_ROUNDS):
            if refined:
                ok, refined = True, False
            else:
                solved, mu_new, ok = solve(states, za, mu, elements)
                # Newton may end on fewer phases with the state it started from below their plane:
                # a phase dropped on the way was needed (Fe-C-Si at 1487 K went from bcc + fcc of
                # the samples, 0.2 + 0.8, to bcc alone, 254 J/mol higher); the linear program
                # decides, with the state's points among its columns
                if ok and _above_plane(states, mu_new, elements) >= -tol:
                    states, mu, good = _merge_duplicates(solved), mu_new, True
                else:
                    ok = False
            # the check needs a converged plane; without one the linear program decides below
            found = _candidates(cloud, states, mu, elements, tol) if ok else []
            converged = ok and not found
            if converged or (not ok and settled):
                break
            best = _lower(best, states, mu)
            if ok and len(states) >= n_active and not exchanged:
                # no room: the lowest point enters by one exact exchange step (a phase just below
                # the plane, within the linear program's tolerance, at a temperature next to an
                # invariant)
                p, y, _df = min(found, key=lambda c: c[2])
                swapped = _exchange(states, PhaseState(phases[p].name, phases[p].model, y, 0.0, phases[p].free), elements)
                if swapped is not None:
                    states, exchanged = swapped, True
                    continue
            exchanged = False
            # room for one more phase: add the lowest at amount 0, unless Newton just dropped such
            # a phase again (a start inside a miscibility gap's spinodal, say): then the linear
            # program decides below, with the phase's point among its columns
            if ok and len(states) < n_active and added_to != len(states):
                p, y, _df = min(found, key=lambda c: c[2])
                added_to = len(states)
                states = states + [PhaseState(phases[p].name, phases[p].model, y, 0.0, phases[p].free)]
                continue
            if ok and len(states) < n_active:   # dropped again: split a set of that phase about its point
                p, y, _df = min(found, key=lambda c: c[2])
                split = _split_about(states, phases[p], y, mu, elements)
                if split is not None:
                    solved, mu_split, ok_split = solve(split, za, mu, elements)
                    solved = _merge_duplicates(solved) if ok_split else []
                    if len(solved) > len(states):
                        states, mu, added_to = solved, mu_split, None
                        continue
            added_to = None
            # no room (or no converged state): the linear program decides, from the refined plane
            lp = self.lp
            first = len(lp.G)
            seeds = [(_phase_index(phases, st.name), st.y) for st in states] + [(p, y) for p, y, _df in found]
            add_X, add_G, centres = self._columns(seeds)
            restart = first + np.array(centres[:len(states)]) if good and len(states) == n_active else None
            lp.add(add_X, add_G, restart)
            settled = self._descend_lp(tol)
            states, mu, good = _start_states(lp, cloud, active), lp.mu, False
        if not converged:
            # the rounds ran out: the lowest state they reached, not the last one (before Newton's
            # end states were checked against their starts, Fe-C-Si at 1013 K went round bcc +
            # graphite, fcc alone and bcc alone, and ended on fcc alone, 222 J/mol higher)
            _g, states, mu = _lower(best, states, mu)
        return states, mu, converged

    def _descend_lp(self, tol: float) -> bool:
        """Column generation on the linear program, up to LP_PASSES passes: against its own plane,
        the points of lowest driving force of every phase (Newton steps from the lowest samples
        and the far starts, as in the check, and from each basis point, which the plane touches
        only where the samples fall) join as columns, and it is solved again; until no point lies
        below the plane by more than tol (J/mol). Where the samples resolve a phase coarsely, the
        plane of the samples alone can be far from the minimum's (Fe-C-Si at 1487 K: fcc 106 J/mol
        below it between samples next to a basis point), and Newton from its basis far from the
        answer. Returns whether the first pass found no point below the plane (nothing left to
        add)."""
        lp, cloud, phases, elements = self.lp, self.cloud, self.phases, self.elements
        for passes in range(LP_PASSES):
            states = _start_states(lp, cloud, self.active)
            found = _candidates(cloud, states, lp.mu, elements, tol)
            for k in lp.basis[lp.basis >= 0]:
                p, y = cloud.point(int(k))
                ph = phases[p]
                if len(ph.free) > len(ph.model.groups):
                    y, df = lowest_driving_force(ph.model, _start_fractions(ph, y), lp.mu, elements, ph.free,
                                                 tolerance=tol)
                    if df < -tol:
                        found.append((p, y, df))
            if not found:
                return passes == 0
            add_X, add_G, _centres = self._columns([(p, y) for p, y, _df in found])
            lp.add(add_X, add_G)
        return False

    def _columns(self, seeds: list[tuple[int, np.ndarray]]) -> tuple[np.ndarray, np.ndarray, list[int]]:
        """New columns of the linear program: each seed (phase index, site fractions) and its
        neighbourhood (`_neighbourhood`), added to the cloud as well. Returns their mole fractions
        (rows), G (J per mole of atoms) and the row of each seed's own point."""
        add_X, add_G, centres = [], [], []
        for p, y0 in seeds:
            centres.append(len(add_G))
            for y in _neighbourhood(self.phases[p], y0):
                x, g = _per_atom(self.phases[p].model, y, self.active)
                self.cloud.add(p, y)
                add_X.append(x)
                add_G.append(g)
        return np.array(add_X), np.array(add_G), centres


def _above_plane(states: list[PhaseState], mu: np.ndarray, elements: np.ndarray) -> float:
    """How far a state lies above the plane mu (J per mole of alloy atoms): the sum of its phases'
    amounts times their driving forces. Negative where some of its phases lie below the plane, so
    that the plane is no minimum's (at the minimum every point of every phase lies on or above it);
    exact whether or not the state keeps the mass balance."""
    return float(sum(st.amount * (float(st.model.gibbs(st.y)) - float(st.moles_per_formula_unit[elements] @ mu))
                     for st in states))


def _lower(best: tuple[float, list[PhaseState], np.ndarray] | None, states: list[PhaseState],
           mu: np.ndarray) -> tuple[float, list[PhaseState], np.ndarray]:
    """`best` (G in J per mole of alloy atoms, states, mu) or `states` with `mu` (copied), whichever
    has the lower G = sum of the phases' amounts times their G: every state the rounds hold keeps
    the mass balance, so each is one the alloy can take."""
    g = float(sum(st.amount * float(st.model.gibbs(st.y)) for st in states))
    if best is not None and not g < best[0]:
        return best
    return g, [PhaseState(st.name, st.model, st.y.copy(), st.amount, st.free) for st in states], mu.copy()


def _from_nearby(near, phases: list[_Phase], z: np.ndarray, active: np.ndarray,
                 elements: np.ndarray) -> tuple[list[PhaseState], np.ndarray] | None:
    """(states, mu) refined by Newton from a nearby answer, or None where its phases do not fit
    these models or Newton fails from there."""
    previous, mu0 = near
    mu0 = np.asarray(mu0, dtype=float)
    if len(mu0) != len(z) or not np.all(np.isfinite(mu0[active])):
        return None
    by_name = {ph.name: ph for ph in phases}
    states, columns = [], []
    for name, y in previous:
        ph = by_name.get(name)
        if ph is None or len(y) != ph.model.n_vars:
            return None
        y0 = _start_fractions(ph, np.asarray(y, dtype=float))
        x, _g = _per_atom(ph.model, y0, active)
        states.append(PhaseState(name, ph.model, y0, 0.0, ph.free))
        columns.append(x)
    if not states:
        return None
    za = z[active] / z[active].sum()
    w = np.clip(np.linalg.lstsq(np.array(columns).T, za, rcond=None)[0], 0.0, None)
    if w.sum() <= 0.0:
        return None
    for st, wi in zip(states, w / w.sum()):
        st.amount = float(wi) / st.atoms
    refined, mu, ok = solve(states, za, mu0[active], elements)
    if not ok:
        return None
    return _merge_duplicates(refined), mu


def _phase_index(phases: list[_Phase], name: str) -> int:
    """The index of the phase called `name`."""
    return next(i for i, ph in enumerate(phases) if ph.name == name)


def _result(states: list[PhaseState], mu_active: np.ndarray, z: np.ndarray, active: np.ndarray,
            elements: np.ndarray, converged: bool) -> GlobalMinimum:
    """The answer: per phase its site fractions, amount (moles of atoms) and composition; mu of
    every element (NaN where absent or undetermined); G and dG/dT per mole of atoms. The phases
    come in the order of their mole fractions of the second element, then the third, ... (a
    binary's from A-rich to B-rich, as the binary path gives them), so that an answer reads the
    same however it was found."""
    out = []
    gibbs = gibbs_dT = 0.0
    states = [st for st in states if st.amount * st.atoms > VANISHING_AMOUNT] or states
    states = sorted(states, key=lambda st: (tuple(st.moles_per_formula_unit[1:] / st.atoms), st.name))
    for st in states:
        with np.errstate(all="ignore"):
            n = st.y @ st.model.element_matrix
            atoms = float(n.sum())
            gibbs += st.amount * float(st.model.gibbs(st.y))
            gibbs_dT += st.amount * float(st.model.gibbs_dT(st.y))
        out.append(PhaseResult(st.name, st.y.copy(), st.amount * atoms, n / atoms))
    mu = np.full(len(z), np.nan)
    fixed = len(states) == 1 and len(states[0].free) == len(states[0].model.groups)
    if not fixed or len(elements) == 1:     # one fixed composition in 2+ elements: no unique plane
        mu[elements] = mu_active
    total = sum(p.amount for p in out)
    return GlobalMinimum(tuple(out), mu, gibbs / total, gibbs_dT / total, converged)
