"""The liquidus projection of a ternary system: the primary-phase fields of the liquidus surface,
the valleys (the liquid's composition along each three-phase equilibrium liquid + two solids)
and the invariant reactions of four phases where valleys meet (liquid + three solids).

Method (H.L. Lukas, S.G. Fries, B. Sundman, Computational Thermodynamics: The Calphad Method,
Cambridge 2007, chapters on equilibrium calculation and mapping):

1. Primary fields: on a triangular grid of liquid compositions, the driving force of every solid
   against the liquid's tangent plane (its chemical potentials at that composition), taken at a
   ladder of temperatures over the phases' sample clouds; the solid whose driving force turns
   negative at the highest temperature is the primary phase, and that temperature (interpolated
   between rungs) the liquidus.
2. Valleys: every grid edge whose two ends have different primary phases s1, s2 gives a start
   for the three-phase equilibrium liquid + s1 + s2 at that edge's liquidus temperature, solved
   by Newton's method on equal chemical potentials at fixed T (one degree of freedom: at fixed T
   the three phases' compositions are fixed). The points, ordered along the valley, are its line.
3. Invariants: every grid cell whose corners show three primary phases, and each valley's ends
   with every other solid, start Newton's method on the four-phase equilibrium with the
   temperature free (four phases, three elements: no degree of freedom at fixed pressure).
4. Each solution is kept only where no other phase lies below its tangent plane (driving force
   over the phase's samples, refined by a few Newton steps).
5. The kind of an invariant follows from the signs of its reaction's coefficients: the mass
   balance sum_a c_a x_a = 0 of the four phases' compositions (mole fractions per mole of atoms),
   oriented so that the reaction on cooling gives off heat (sum_a c_a H_a < 0 with c_a > 0 for
   products: at the invariant dG = 0, so dS = dH / T, and the reaction runs below the invariant
   only if dS < 0).

Kinds: `eutectic` (liquid -> three solids), `peritectic` (liquid + two solids -> one solid),
`quasi-peritectic` (liquid + one solid -> two solids; the literature also calls it a transition
reaction or class II reaction: ladle's word keeps "transition" for a pure element's allotropic
change), and for a liquid formed on cooling `liquid-forming`.

Temperatures in K, compositions in mole fractions of the system's three elements, energies in
J/mol. The liquid must be a substitutional solution of the three elements.
"""

from __future__ import annotations

from dataclasses import dataclass, field, replace

import numpy as np

from ..minimize.multiphase_newton import lowest_driving_force, positive_step, sublattice_rows
from ..models.polynomials import TemperatureOutOfRange
from .isothermal import triangle_nodes

LIQUID = "liquid"
DEFAULT_DIVISIONS = 24
#: Rungs of the temperature ladder that locates the liquidus on the grid.
LADDER_RUNGS = 50
#: Grid nodes on the triangle's sides are moved this far inside (mole fraction).
EDGE_OFFSET = 1e-4
#: A phase whose driving force is below minus this (J/mol of atoms) makes a solution metastable.
STABILITY_TOLERANCE = 1e-3
#: Two invariants of the same phases closer than this (K) are one.
SAME_INVARIANT_K = 1e-3
_MAX_ITERATIONS = 80
_MAX_Y_STEP = 0.05
_MAX_T_STEP = 20.0
_T_DIFFERENCE = 1e-2        # K, the central difference of the gradient in T
_SAME_POINT = 1e-7          # mole fraction: valley points closer than this are one
_REFINE_BELOW = 10.0        # J/mol of atoms: a sample this close to the plane is refined by Newton steps
#: A valley is followed to the triangle's side until the liquid holds less than this of the
#: third element (mole fraction), by temperature steps halved where Newton's method fails.
SIDE_REACHED = 1e-5
_SIDE_HALVINGS = 12
#: Points of a valley between two invariants that the grid does not see.
VALLEY_STEPS = 8


@dataclass(frozen=True)
class Valley:
    """The liquid's composition along the three-phase equilibrium liquid + two solids:
    `points` are (T in K, mole fractions of the liquid), ordered along the valley."""

    solids: tuple[str, str]
    points: tuple[tuple[float, tuple[float, float, float]], ...]


@dataclass(frozen=True)
class FourPhaseReaction:
    """An invariant reaction of four phases at `temperature_K` (K): each phase's name, its
    composition (mole fractions) and its coefficient in the reaction on cooling (moles of atoms,
    negative for what reacts, positive for what forms; the reacting side sums to -1)."""

    kind: str
    temperature_K: float
    phases: tuple[tuple[str, tuple[float, float, float], float], ...]

    def equation(self) -> str:
        """'liquid + alpha -> beta + gamma': the reaction on cooling."""
        left = [n for n, _x, c in self.phases if c < 0.0]
        right = [n for n, _x, c in self.phases if c > 0.0]
        return f"{' + '.join(left)} -> {' + '.join(right)}"


@dataclass(frozen=True)
class PrimaryField:
    """A primary-phase field of the liquidus surface: the solid that forms first from liquids of
    these compositions, how many grid nodes it holds and the composition nearest their middle."""

    phase: str
    nodes: int
    middle: tuple[float, float, float]


@dataclass(frozen=True)
class LiquidusProjection:
    """The liquidus projection of a ternary `system`: `invariants` are the liquid's four-phase
    reactions; `solid_invariants`, those of four solids where they were looked for
    (engine/diagrams/solid_invariants.py, added by `with_solid_invariants`)."""

    system: object = field(repr=False)
    fields: tuple[PrimaryField, ...]
    valleys: tuple[Valley, ...]
    invariants: tuple[FourPhaseReaction, ...]
    warnings: tuple[str, ...] = ()
    solid_invariants: tuple[FourPhaseReaction, ...] = ()

    def with_solid_invariants(self, reactions) -> "LiquidusProjection":
        """The same projection with the four-solid reactions `reactions`."""
        return replace(self, solid_invariants=tuple(reactions))

    def to_json(self) -> dict:
        """Plain JSON: the invariant reactions of four phases, the liquid's and the solids',
        hottest first (kind, temperature_K, phases with compositions and reaction coefficients),
        the valleys and the primary fields."""
        els = self.system.elements

        def comp(x) -> dict:
            return {el: float(v) for el, v in zip(els, x)}

        return {
            "system": self.system.name,
            "elements": list(els),
            "invariants": [{"kind": r.kind, "temperature_K": r.temperature_K, "reaction": r.equation(),
                            "phases": [{"name": n, "mole_fraction": comp(x), "reaction_coefficient": c}
                                       for n, x, c in r.phases]}
                           for r in sorted(self.invariants + self.solid_invariants, key=lambda r: -r.temperature_K)],
            "valleys": [{"phases": [LIQUID, *v.solids],
                         "liquid": [{"temperature_K": T, "mole_fraction": comp(x)} for T, x in v.points]}
                        for v in self.valleys],
            "primary_fields": [{"phase": f.phase, "label_at": comp(f.middle)} for f in self.fields],
            "warnings": list(self.warnings),
        }


# --- Newton's method on equal chemical potentials ----------------------------------------------
@dataclass
class _Member:
    name: str
    phase: object          # the temperature-independent model (system.models[name])
    y: np.ndarray


def _liquid_potentials(model, x: np.ndarray) -> np.ndarray:
    """Chemical potentials (J/mol) of the liquid at mole fractions x (..., 3)."""
    _liquid_rows(model)                     # a liquid of another kind is refused in the projection's words
    return model.element_potentials(x)


def _liquid_rows(model) -> np.ndarray:
    """The liquid's site fractions from mole fractions: y = x E^-1 for a one-sublattice liquid
    whose constituents are the three elements."""
    E = np.asarray(model.element_matrix, dtype=float)
    if len(model.groups) != 1 or E.shape != (3, 3) or abs(np.linalg.det(E)) < 1e-12:
        raise ValueError("the liquidus projection needs a substitutional liquid of the three elements")
    return np.linalg.inv(E)


def _solve(members: list[_Member], T: float, mu: np.ndarray, free_T: bool,
           plane: tuple[np.ndarray, float] | None = None) -> tuple[float, np.ndarray, bool]:
    """Newton's method on the equilibrium of `members` with equal chemical potentials mu (J/mol):
    for each phase dG/dy - A mu - S^T lambda = 0, S y = 1 and G - y A mu = 0 (J per mole of
    formula units; Lukas, Fries and Sundman 2007). With `free_T` the temperature is an unknown
    (four phases in three elements, or three phases with a `plane` (d, c): the first member's
    composition per formula unit n holds d . n = c), else it stays T (three phases). Updates the
    members' site fractions; returns (T, mu, converged)."""
    mu = np.array(mu, dtype=float)
    layout, rows, cols = [], 0, 0
    for m in members:
        S = sublattice_rows(m.phase, np.arange(m.phase.n_vars))
        layout.append((S, rows, cols, m.phase.n_vars, S.shape[0]))
        rows += m.phase.n_vars + S.shape[0] + 1
        cols += m.phase.n_vars + S.shape[0]
    c_mu = cols
    n_unknowns = cols + 3 + (1 if free_T else 0)
    if plane is not None:
        rows += 1
    if rows != n_unknowns:
        raise ValueError(f"{len(members)} phases with the temperature {'free' if free_T else 'fixed'}: not a square system")
    y_cols = np.concatenate([np.arange(c, c + nf) for _S, _r, c, nf, _ns in layout])
    polish = False
    at_T: dict[str, object] = {}
    with np.errstate(all="ignore"):
        for _ in range(_MAX_ITERATIONS):
            J = np.zeros((n_unknowns, n_unknowns))
            r = np.zeros(n_unknowns)
            scale = 1.0
            for m, (S, o, c, nf, ns) in zip(members, layout):
                try:
                    model = None if free_T else at_T.get(m.name)
                    if model is None:
                        model = at_T[m.name] = m.phase.at(T)
                    G, g, H = model.derivatives(m.y)
                    if free_T:
                        up, down = m.phase.at(T + _T_DIFFERENCE), m.phase.at(T - _T_DIFFERENCE)
                        g_T = (up.gradient(m.y) - down.gradient(m.y)) / (2.0 * _T_DIFFERENCE)
                        G_T = float(model.gibbs_dT(m.y))
                except TemperatureOutOfRange:
                    return T, mu, False
                A = np.asarray(model.element_matrix, dtype=float)
                Amu = A @ mu
                lam = S @ (m.y * (g - Amu)) / (S @ m.y)
                n_el = m.y @ A
                r[o:o + nf] = g - Amu - lam @ S
                r[o + nf:o + nf + ns] = S @ m.y - 1.0
                r[o + nf + ns] = float(G) - n_el @ mu
                J[o:o + nf, c:c + nf] = H
                J[o:o + nf, c + nf:c + nf + ns] = -S.T
                J[o:o + nf, c_mu:c_mu + 3] = -A
                J[o + nf:o + nf + ns, c:c + nf] = S
                J[o + nf + ns, c:c + nf] = g - Amu
                J[o + nf + ns, c_mu:c_mu + 3] = -n_el
                if free_T:
                    J[o:o + nf, c_mu + 3] = g_T
                    J[o + nf + ns, c_mu + 3] = G_T
                scale = max(scale, abs(float(G)), float(np.abs(g).max()))
            if plane is not None:
                E = np.asarray(members[0].phase.element_matrix, dtype=float)
                r[-1] = float(plane[0] @ (members[0].y @ E)) - plane[1]
                J[-1, layout[0][2]:layout[0][2] + layout[0][3]] = E @ plane[0]
            if not (np.isfinite(J).all() and np.isfinite(r).all()):
                return T, mu, False
            if np.abs(r).max() <= 1e-10 * scale:
                if polish:
                    return T, mu, True
                polish = True
            try:
                d = np.linalg.solve(J, -r)
            except np.linalg.LinAlgError:
                return T, mu, False
            shrink = 1.0
            big = float(np.abs(d[y_cols]).max())
            if big > _MAX_Y_STEP:
                shrink = _MAX_Y_STEP / big
            if free_T and abs(d[c_mu + 3]) * shrink > _MAX_T_STEP:
                shrink = _MAX_T_STEP / abs(d[c_mu + 3])
            d *= shrink
            for m, (_S, _o, c, nf, _ns) in zip(members, layout):
                y = positive_step(m.y, d[c:c + nf])
                for gr in m.phase.groups:
                    y[gr] = y[gr] / y[gr].sum()
                m.y = y
            mu = mu + d[c_mu:c_mu + 3]
            if free_T:
                T = T + float(d[c_mu + 3])
    return T, mu, False


# --- stability -----------------------------------------------------------------------------------
def _lowest_sample(model, mu: np.ndarray) -> tuple[np.ndarray, float]:
    """The sample of a phase (model at T) lowest below the plane mu: (site fractions, driving force
    in J per mole of atoms)."""
    Y, X, G = model.samples()
    df = G - X @ mu
    k = int(np.argmin(df))
    return Y[k], float(df[k])


def _stable(system, T: float, mu: np.ndarray, present: set[str]) -> bool:
    """Whether no phase outside `present` lies below the tangent plane mu (J/mol) at T (K)."""
    elements = np.arange(3)
    for name, phase in system.models.items():
        if name in present:
            continue
        try:
            model = phase.at(T)
        except TemperatureOutOfRange:
            continue
        y, df = _lowest_sample(model, mu)
        if df < _REFINE_BELOW:
            df = min(df, lowest_driving_force(model, y, mu, elements, np.arange(model.n_vars))[1])
        if df < -STABILITY_TOLERANCE:
            return False
    return True


def _atoms_composition(phase, y: np.ndarray) -> np.ndarray:
    n = y @ np.asarray(phase.element_matrix, dtype=float)
    return n / n.sum()


# --- the grid of primary phases ------------------------------------------------------------------
@dataclass
class _Grid:
    x: np.ndarray                 # (n, 3) liquid compositions
    index: dict                   # integer coordinates -> node
    primary: list                 # solid name or None per node
    liquidus: np.ndarray          # K, NaN where no solid forms in range
    y: list                       # the primary solid's site fractions at the liquidus, per node


def _primary_grid(system, solids: list[str], divisions: int) -> _Grid:
    """Each node's primary solid and liquidus temperature (K) by the temperature ladder."""
    ints = np.rint(triangle_nodes(divisions) * divisions).astype(int)
    x = (triangle_nodes(divisions) + EDGE_OFFSET) / (1.0 + 3.0 * EDGE_OFFSET)
    T_low, T_high = (float(t) for t in system.temperature_range_K)
    ladder = np.linspace(T_high, T_low, LADDER_RUNGS)
    n = len(x)
    chosen = np.full(n, -1)                       # index into solids, -1 while the node is liquid
    liquidus = np.full(n, np.nan)
    ys: list = [None] * n
    previous: dict[int, tuple[np.ndarray, float]] = {}
    for T in ladder:
        open_nodes = np.flatnonzero(chosen < 0)
        if open_nodes.size == 0:
            break
        try:
            mu = _liquid_potentials(system.models[LIQUID].at(T), x[open_nodes])
        except TemperatureOutOfRange:
            previous = {}
            continue
        crossing = np.full((len(solids), open_nodes.size), -np.inf)
        lowest, now = {}, {}
        for k, s in enumerate(solids):
            try:
                Y, X, G = system.models[s].at(T).samples()
            except TemperatureOutOfRange:
                continue
            df = G[None, :] - mu[:, 0:1] * X[:, 0] - mu[:, 1:2] * X[:, 1] - mu[:, 2:3] * X[:, 2]
            best = np.argmin(df, axis=1)
            d_now = df[np.arange(open_nodes.size), best]
            lowest[k] = Y[best]
            full = np.full(n, np.nan)
            full[open_nodes] = d_now
            now[k] = (full, T)
            below = d_now < 0.0
            d_before = previous[k][0][open_nodes] if k in previous else np.full(open_nodes.size, np.nan)
            T_before = previous[k][1] if k in previous else T
            bracketed = below & (d_before > 0.0)
            t = np.where(bracketed, T_before + (T - T_before) * d_before / np.where(bracketed, d_before - d_now, 1.0), T)
            crossing[k] = np.where(below, t, -np.inf)
        first = np.argmax(crossing, axis=0)
        hit = np.isfinite(crossing[first, np.arange(open_nodes.size)])
        for j in np.flatnonzero(hit):
            i = open_nodes[j]
            chosen[i], liquidus[i], ys[i] = first[j], crossing[first[j], j], lowest[first[j]][j]
        previous = now
    primary = [solids[k] if k >= 0 else None for k in chosen]
    return _Grid(x, {tuple(p): i for i, p in enumerate(ints)}, primary, liquidus, ys)


def _neighbours(grid: _Grid) -> tuple[list[tuple[int, int]], list[tuple[int, int, int]]]:
    """The grid's edges (node pairs) and triangular cells (node triples)."""
    edges, cells = [], []
    steps = [np.array(s) for s in ((-1, 1, 0), (-1, 0, 1), (0, -1, 1))]
    for p, i in grid.index.items():
        near = [grid.index.get(tuple(np.array(p) + s)) for s in steps]
        edges += [(i, j) for j in near if j is not None]
        for a, b in ((0, 1), (1, 2)):
            if near[a] is not None and near[b] is not None:
                cells.append((i, near[a], near[b]))
    return edges, cells


# --- valleys and invariants ------------------------------------------------------------------
def _three_phase(system, solids: tuple[str, str], T: float, x_liquid: np.ndarray, y_solids) -> tuple | None:
    """The valley point liquid + solids at T (K) from a start, or None: (T, x_liquid, mu, the
    solids' site fractions)."""
    liquid = system.models[LIQUID]
    try:
        mu0 = _liquid_potentials(liquid.at(T), x_liquid)
    except TemperatureOutOfRange:
        return None
    members = [_Member(LIQUID, liquid, x_liquid @ _liquid_rows(liquid))]
    members += [_Member(s, system.models[s], np.maximum(np.asarray(y, dtype=float), 1e-12)) for s, y in zip(solids, y_solids)]
    _T, mu, ok = _solve(members, T, mu0, free_T=False)
    if not ok or not _stable(system, T, mu, {LIQUID, *solids}):
        return None
    return T, _atoms_composition(liquid, members[0].y), mu, [m.y for m in members[1:]]


def _four_phase(system, solids: tuple[str, ...], T: float, x_liquid: np.ndarray, y_solids) -> FourPhaseReaction | None:
    """The invariant liquid + three solids from a start (T in K), or None."""
    liquid = system.models[LIQUID]
    try:
        start = liquid.at(T)
    except TemperatureOutOfRange:
        return None
    members = [_Member(LIQUID, liquid, x_liquid @ _liquid_rows(start))]
    members += [_Member(s, system.models[s], np.maximum(np.asarray(y, dtype=float), 1e-12)) for s, y in zip(solids, y_solids)]
    T, mu, ok = _solve(members, T, _liquid_potentials(start, x_liquid), free_T=True)
    T_low, T_high = system.model_range_K
    if not ok or not T_low <= T <= T_high:
        return None
    xs = [_atoms_composition(m.phase, m.y) for m in members]
    if any(np.linalg.norm(xs[a] - xs[b]) < 1e-6 for a in range(4) for b in range(a)):
        return None             # two members converged to one phase
    if not _stable(system, T, mu, {LIQUID, *solids}):
        return None
    return four_phase_reaction(T, [(m.name, m.phase, m.y) for m in members])


def four_phase_reaction(T: float, members) -> FourPhaseReaction:
    """The invariant reaction at T (K) among four phases given as (name, the phase's
    temperature-independent model, site fractions): their compositions, the reaction on cooling
    (`reaction_coefficients`, with H = G - T dG/dT per mole of atoms from each model) and its
    kind (`classify`)."""
    xs, H = [], []
    for _name, phase, y in members:
        model = phase.at(T)
        n = y @ np.asarray(model.element_matrix, dtype=float)
        atoms = float(n.sum())
        xs.append(n / atoms)
        H.append((float(model.gibbs(y)) - T * float(model.gibbs_dT(y))) / atoms)
    c = reaction_coefficients(np.array(xs), np.array(H))
    phases = tuple((name, tuple(float(v) for v in x), float(k)) for (name, _p, _y), x, k in zip(members, xs, c))
    return FourPhaseReaction(classify(phases), float(T), phases)


def reaction_coefficients(x: np.ndarray, H: np.ndarray) -> np.ndarray:
    """The reaction among four phases of compositions x (4, 3) (mole fractions) on cooling:
    coefficients c (moles of atoms) with sum_a c_a x_a = 0, signed so that sum_a c_a H_a < 0
    (H in J per mole of atoms: the reaction gives off heat) and scaled so the reacting side
    (negative coefficients) sums to -1."""
    c = np.linalg.svd(x.T)[2][-1]
    if c @ H > 0.0:
        c = -c
    return c / -c[c < 0.0].sum()


def classify(phases) -> str:
    """The trade's name of a four-phase reaction from its phases' coefficients (see the module)."""
    reacting = [n for n, _x, c in phases if c < 0.0]
    forming = [n for n, _x, c in phases if c > 0.0]
    if LIQUID in forming:
        return "liquid-forming"
    if LIQUID in reacting:
        return {1: "eutectic", 2: "quasi-peritectic", 3: "peritectic"}[len(reacting)]
    return {1: "eutectoid", 2: "quasi-peritectoid", 3: "peritectoid"}[len(reacting)]


def _to_side(system, pair: tuple[str, str], points: list, chain: list) -> tuple | None:
    """Where the valley of `pair` meets a side of the triangle (the binary reaction it comes from
    or goes to), followed from its end nearest a side by fixed-temperature solves in steps of the
    last two points' temperature difference, halved where a solve fails: (T, x_liquid), or None
    where the valley ends nowhere near a side."""
    if len(chain) < 2:
        return None
    end, before = (chain[0], chain[1]) if chain[0][1].min() < chain[-1][1].min() else (chain[-1], chain[-2])
    if end[1].min() > 0.2:
        return None
    start = next((p for p in points if p[0] == end[0] and np.array_equal(p[1], end[1])), None)
    if start is None:
        return None
    T, x, _mu, ys = start
    step = end[0] - before[0]
    halvings = 0
    while x.min() > SIDE_REACHED and halvings < _SIDE_HALVINGS and step != 0.0:
        point = _three_phase(system, pair, T + step, x, ys)
        if point is None or point[1].min() >= x.min():
            step *= 0.5
            halvings += 1
            continue
        T, x, _mu, ys = point
    return (T, x) if x.min() < end[1].min() else None


def _between_invariants(system, invariants: list[FourPhaseReaction], found: dict) -> dict:
    """Valleys too short for the grid to see: a pair of solids that two invariants share with the
    liquid but no grid edge found, followed from one invariant's liquid to the other's by
    solves with the temperature free and the liquid on a plane across the chord between them
    (VALLEY_STEPS planes): the valley may rise between them (a saddle) or fall."""
    out: dict = {}
    for k, hot in enumerate(invariants):
        for cold in invariants[k + 1:]:
            shared = {n for n, _x, _c in hot.phases} & {n for n, _x, _c in cold.phases} - {LIQUID}
            pair = tuple(sorted(shared))
            if len(pair) != 2 or pair in found or pair in out:
                continue
            x_hot, x_cold = np.array(hot.phases[0][1]), np.array(cold.phases[0][1])
            d = x_cold - x_hot
            members = [_Member(LIQUID, system.models[LIQUID], x_hot @ _liquid_rows(system.models[LIQUID]))]
            members += [_member_of(system, hot, name) for name in pair]
            T, mu, points = hot.temperature_K, _liquid_potentials(system.models[LIQUID].at(hot.temperature_K), x_hot), []
            for t in np.linspace(0.0, 1.0, VALLEY_STEPS + 2)[1:-1]:
                T, mu, ok = _solve(members, T, mu, free_T=True, plane=(d, float(d @ (x_hot + t * d))))
                if not ok or not _stable(system, T, mu, {LIQUID, *pair}):
                    break
                points.append((T, _atoms_composition(members[0].phase, members[0].y), mu, [m.y for m in members[1:]]))
            if len(points) == VALLEY_STEPS:
                out[pair] = points
    return out


def _member_of(system, reaction: FourPhaseReaction, name: str) -> _Member:
    """A member of a Newton solve started at a solid's composition in an invariant: the sample
    of that solid nearest to it (a compound's only one)."""
    x = next(np.array(xs) for n, xs, _c in reaction.phases if n == name)
    Y, X, _G = system.models[name].at(reaction.temperature_K).samples()
    return _Member(name, system.models[name], Y[int(np.argmin(np.abs(X - x).sum(axis=1)))])


def _ordered(points: list[tuple[float, np.ndarray]]) -> list[tuple[float, np.ndarray]]:
    """Valley points in order along the valley: from the point farthest along the first principal
    axis of their compositions, each next point the nearest of those left."""
    if len(points) < 3:
        return sorted(points, key=lambda p: -p[0])
    X = np.array([p[1] for p in points])
    axis = np.linalg.svd(X - X.mean(axis=0))[2][0]
    left = list(range(len(points)))
    chain = [min(left, key=lambda k: float(X[k] @ axis))]
    left.remove(chain[0])
    while left:
        nxt = min(left, key=lambda k: float(np.linalg.norm(X[k] - X[chain[-1]])))
        chain.append(nxt)
        left.remove(nxt)
    return [points[k] for k in chain]


def map_liquidus_projection(system, divisions: int = DEFAULT_DIVISIONS) -> LiquidusProjection:
    """The liquidus projection of a ternary `system` (see the module for the method)."""
    if len(system.elements) != 3:
        raise ValueError(f"a liquidus projection needs three elements, {system.name} has {len(system.elements)}")
    if LIQUID not in system.models:
        return LiquidusProjection(system, (), (), (), (f"{system.name} has no phase named {LIQUID!r}",))
    solids = [n for n in system.models if n != LIQUID]
    grid = _primary_grid(system, solids, divisions)
    edges, cells = _neighbours(grid)
    found: dict[tuple[str, str], list[tuple[float, np.ndarray]]] = {}
    for i, j in edges:
        a, b = grid.primary[i], grid.primary[j]
        if a is None or b is None or a == b:
            continue
        pair, ys = (a, b), (grid.y[i], grid.y[j])
        if pair[0] > pair[1]:
            pair, ys = (b, a), ys[::-1]
        point = _three_phase(system, pair, 0.5 * (grid.liquidus[i] + grid.liquidus[j]),
                             0.5 * (grid.x[i] + grid.x[j]), ys)
        if point is not None and not any(np.abs(point[1] - q[1]).max() < _SAME_POINT for q in found.get(pair, [])):
            found.setdefault(pair, []).append(point)
    starts = []
    for i, j, k in cells:
        names = [grid.primary[n] for n in (i, j, k)]
        if None in names or len(set(names)) != 3:
            continue
        starts.append((tuple(names), float(np.mean(grid.liquidus[[i, j, k]])), grid.x[[i, j, k]].mean(axis=0),
                       [grid.y[n] for n in (i, j, k)]))
    for pair, points in found.items():
        for T, x, mu, ys in (max(points, key=lambda p: p[0]), min(points, key=lambda p: p[0])):
            for s in solids:
                if s not in pair:
                    starts.append(((*pair, s), T, x, [*ys, _lowest_sample(system.models[s].at(T), mu)[0]]))
    invariants: list[FourPhaseReaction] = []
    for names, T, x, ys in starts:
        r = _four_phase(system, names, T, x, ys)
        if r is None or any(set(n for n, _x, _c in r.phases) == set(n for n, _x, _c in q.phases)
                            and abs(q.temperature_K - r.temperature_K) < SAME_INVARIANT_K for q in invariants):
            continue
        invariants.append(r)
    invariants.sort(key=lambda r: -r.temperature_K)
    for pair, points in _between_invariants(system, invariants, found).items():
        found[pair] = points
    valleys = []
    for pair, points in sorted(found.items()):
        ends = [(r.temperature_K, np.array(r.phases[0][1])) for r in invariants
                if set(pair) <= {n for n, _x, _c in r.phases}]
        chain = _ordered([p[:2] for p in points] + ends)
        side = _to_side(system, pair, points, chain)
        if side is not None:
            chain = [side, *chain] if chain[0][1].min() < chain[-1][1].min() else [*chain, side]
        valleys.append(Valley(pair, tuple((float(T), tuple(float(v) for v in x)) for T, x in chain)))
    fields = []
    for s in solids:
        members = [i for i in range(len(grid.x)) if grid.primary[i] == s]
        if members:
            centre = grid.x[members].mean(axis=0)
            nearest = min(members, key=lambda i: float(np.linalg.norm(grid.x[i] - centre)))
            fields.append(PrimaryField(s, len(members), tuple(float(v) for v in grid.x[nearest])))
    warnings = []
    if any(p is None for p in grid.primary):
        warnings.append("some liquids stay liquid down to the bottom of the system's temperature range")
    return LiquidusProjection(system, tuple(sorted(fields, key=lambda f: -f.nodes)), tuple(valleys),
                              tuple(invariants), tuple(warnings))
