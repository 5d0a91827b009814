"""Newton's method on the full set of equilibrium conditions of a multiphase state at fixed T
(K), P and overall composition, for phases given as site-fraction models (the `SublatticeAtT`
interface: gibbs, gradient, hessian in J per mole of formula units).

The conditions (H.L. Lukas, S.G. Fries, B. Sundman, Computational Thermodynamics: The Calphad
Method, Cambridge 2007, chapter on equilibrium calculation), from the Lagrangian of
min sum_a n_a G_a(y_a) with mass balance and one site-fraction sum per sublattice:

    dG_a/dy_aj - sum_i A_a,ji mu_i - lambda_a,s(j) = 0     (each phase a, each site fraction j)
    sum_{j in s} y_aj = 1                                  (each sublattice s)
    G_a(y_a) - y_a A_a mu = 0                              (each phase present: on the tangent plane)
    sum_a n_a y_a A_a = z                                  (mass balance, each element)

with A_a the phase's element matrix (moles of element per formula unit per unit site fraction),
n_a in moles of formula units per mole of alloy atoms, mu in J/mol. Site fractions stay positive:
a decreasing y takes the step y exp(dy / y) (Newton's step in ln y, the safe variable for dilute
constituents) and an increasing one the plain step. A phase whose amount turns negative leaves.
"""

from __future__ import annotations

import math
from dataclasses import dataclass, field, replace

import numpy as np

#: Residual tolerances: energies (J/mol, relative to the energy scale) and balances (mol).
ENERGY_TOLERANCE = 1e-10
BALANCE_TOLERANCE = 1e-13
MAX_ITERATIONS = 60
#: The largest change of any site fraction in one step (the whole step is shortened to it).
MAX_STEP = 0.05


@dataclass
class PhaseState:
    """One phase (or one composition set of a phase with a miscibility gap) in a state: its site
    fractions y (full vector; fixed zeros where a constituent is absent), amount n (moles of
    formula units per mole of alloy atoms); `hessian`: d2G/dy2 over the free site fractions (J per
    mole of formula units) where `solve` last evaluated it, one step before its answer (None for a
    state no solve has refined)."""

    name: str
    model: object
    y: np.ndarray
    amount: float
    free: np.ndarray            # indices of the site fractions that vary
    hessian: np.ndarray | None = field(default=None, repr=False, compare=False)

    @property
    def moles_per_formula_unit(self) -> np.ndarray:
        """Moles of each element per mole of formula units."""
        return self.y @ self.model.element_matrix

    @property
    def atoms(self) -> float:
        return float(self.moles_per_formula_unit.sum())


def sublattice_rows(model, free: np.ndarray) -> np.ndarray:
    """The (sublattices x free variables) 0/1 matrix of site-fraction sums."""
    pos = {int(j): k for k, j in enumerate(free)}
    S = np.zeros((len(model.groups), len(free)))
    for s, g in enumerate(model.groups):
        for j in g:
            if int(j) in pos:
                S[s, pos[int(j)]] = 1.0
    return S


#: Below this a site fraction also grows by Newton's step in ln y (capped at GROWTH_CAP).
DILUTE = 1e-4
GROWTH_CAP = 1e-3
#: Vectors up to this length take `positive_step` in Python floats: a dozen numpy calls on a few
#: numbers cost several times more than the arithmetic.
_SHORT = 12


def _positive_step_one(y: float, dy: float) -> float:
    """`positive_step` for one site fraction (Python floats, the same formula)."""
    plain = y + dy
    if dy >= 0.0 and y >= DILUTE:
        return plain
    log_step = y * math.exp(min(max(dy / max(y, 1e-300), -700.0), 50.0))
    if dy < 0.0:
        return log_step
    return min(log_step, max(plain, GROWTH_CAP))


def positive_step(y: np.ndarray, dy: np.ndarray) -> np.ndarray:
    """The updated site fractions, always positive: y exp(dy / y) (Newton's step in ln y) for
    decreasing fractions and for dilute ones (below DILUTE, up to GROWTH_CAP or y + dy), y + dy
    for the others."""
    if len(y) <= _SHORT:
        return np.array([_positive_step_one(a, b) for a, b in zip(y.tolist(), dy.tolist())])
    ratio = np.minimum(np.maximum(dy / np.maximum(y, 1e-300), -700.0), 50.0)   # ufuncs: no clip() overhead
    log_step = y * np.exp(ratio)
    plain = y + dy
    up = np.where(y < DILUTE, np.minimum(log_step, np.maximum(plain, GROWTH_CAP)), plain)
    return np.where(dy >= 0.0, up, log_step)


def free_groups(model, free: np.ndarray) -> list[np.ndarray]:
    """Per sublattice, the indices of its free site fractions (`free`)."""
    mask = np.zeros(model.n_vars, dtype=bool)
    mask[free] = True
    return [g[mask[g]] for g in model.groups]


def _normalise(y: np.ndarray, groups: list[np.ndarray]) -> np.ndarray:
    """y with each sublattice's free fractions (`groups`, see `free_groups`) scaled to sum to 1
    and the others 0."""
    if len(groups) == 1 and len(groups[0]) == len(y):
        return y / y.sum()
    out = np.zeros_like(y)
    for gi in groups:
        out[gi] = y[gi] / y[gi].sum()
    return out


def _derivatives(model, y: np.ndarray) -> tuple:
    """(G, gradient, Hessian) of a phase at y, in one pass where the model offers it."""
    both = getattr(model, "derivatives", None)
    if both is not None:
        return both(y)
    return model.gibbs(y), model.gradient(y), model.hessian(y)


class _Pieces:
    """What Newton's method needs of one phase's structure with free site fractions `free` and
    present `elements` (index arrays): the sublattice sums S, the free fractions per sublattice,
    the element matrices of the free fractions (A) and of all (E), the constant part of a lone
    phase's Newton matrix (K0), index grids of the free fractions and whether all are free. The
    same at every temperature; `anchors` are the model's arrays the cache's key names by id."""

    def __init__(self, model, free: np.ndarray, elements: np.ndarray) -> None:
        self.anchors = (model.element_matrix, model.groups)
        self.S = sublattice_rows(model, free)
        self.groups = free_groups(model, free)
        self.A = model.element_matrix[np.ix_(free, elements)]
        self.E = model.element_matrix[:, elements]
        nf, ns = len(free), self.S.shape[0]
        self.K0 = np.zeros((nf + ns, nf + ns))
        self.K0[:nf, nf:] = -self.S.T
        self.K0[nf:, :nf] = self.S
        self.fr, self.fc = free[:, None], free[None, :]
        self.whole = nf == model.n_vars                   # every site fraction free: no indexing


_PIECES: dict[tuple, _Pieces] = {}


def _pieces(model, free: np.ndarray, elements: np.ndarray) -> _Pieces:
    """`_Pieces` of a phase, remembered for up to a few hundred (structure, free, elements): a
    phase at another temperature shares its element matrix and groups (the engine's models do)."""
    free, elements = np.asarray(free, dtype=np.intp), np.asarray(elements, dtype=np.intp)
    key = (id(model.element_matrix), id(model.groups), free.tobytes(), elements.tobytes())
    found = _PIECES.get(key)
    if found is None or found.anchors[0] is not model.element_matrix or found.anchors[1] is not model.groups:
        found = _Pieces(model, free, elements)
        if len(_PIECES) >= 256:           # rarely reached: start afresh (no iteration, safe in threads)
            _PIECES.clear()
        _PIECES[key] = found
    return found


class _Layout:
    """Where each state's unknowns sit in the Newton system (its site fractions, sublattice
    multipliers and amount; the chemical potentials last), the constant blocks of the Jacobian,
    and index arrays of the residual's energy and balance rows."""

    def __init__(self, pieces: tuple[_Pieces, ...], ne: int) -> None:
        self.pieces = pieces
        self.blocks = []
        size = 0
        for pc in pieces:
            S = pc.S
            nf = S.shape[1]
            self.blocks.append((S, pc.A, size, nf, S.shape[0], pc.fr, pc.fc, pc.whole, pc.groups))
            size += nf + S.shape[0] + 1
        self.m0 = size
        self.size = size + ne
        J0 = np.zeros((self.size, self.size))
        energy, balance, ys = [], [np.arange(size, size + ne)], []
        for S, A, o, nf, ns, *_rest in self.blocks:
            J0[o:o + nf, o + nf:o + nf + ns] = -S.T
            J0[o:o + nf, size:] = -A
            J0[o + nf:o + nf + ns, o:o + nf] = S
            ys.append(np.arange(o, o + nf))
            energy += [np.arange(o, o + nf), [o + nf + ns]]
            balance.append(np.arange(o + nf, o + nf + ns))
        self.J0 = J0
        self.energy_rows = np.concatenate(energy).astype(np.intp) if energy else np.zeros(0, np.intp)
        self.balance_rows = np.concatenate(balance).astype(np.intp)
        self.y_rows = np.concatenate(ys).astype(np.intp) if ys else np.zeros(0, np.intp)


_LAYOUTS: dict[tuple, _Layout] = {}


def _layout(states: list[PhaseState], elements: np.ndarray) -> _Layout:
    """The `_Layout` of `states`, remembered for up to a few hundred sequences of phase pieces
    (a layout holds no values, only where they go)."""
    pieces = tuple(_pieces(st.model, st.free, elements) for st in states)
    key = tuple(map(id, pieces))
    found = _LAYOUTS.get(key)
    if found is None or any(a is not b for a, b in zip(found.pieces, pieces)):
        found = _Layout(pieces, len(elements))
        if len(_LAYOUTS) >= 256:          # rarely reached: start afresh (no iteration, safe in threads)
            _LAYOUTS.clear()
        _LAYOUTS[key] = found
    return found


def solve(states: list[PhaseState], z: np.ndarray, mu: np.ndarray, elements: np.ndarray,
          max_iterations: int = MAX_ITERATIONS) -> tuple[list[PhaseState], np.ndarray, bool]:
    """Refine `states` to the equilibrium at overall composition z (mole fractions of the active
    `elements`, an index array) from chemical potentials mu (J/mol, active elements); `states` are
    not changed. Returns refined copies of the states that remain (amounts >= 0), mu and whether
    the residual met its tolerance."""
    states = [replace(st, y=st.y.copy()) for st in states]
    mu = np.array(mu, dtype=float)
    extra_step = False
    lay = _layout(states, elements)
    minus_z = -np.asarray(z, dtype=float)
    with np.errstate(all="ignore"):
        for _ in range(max_iterations):
            m0 = lay.m0
            J = lay.J0.copy()
            r = np.empty(lay.size)
            scale = 1.0
            balance = minus_z.copy()
            for st, (S, A, o, nf, ns, fr, fc, whole, _groups) in zip(states, lay.blocks):
                y = st.y
                G, g, H = _derivatives(st.model, y)
                G = float(G)
                if whole:
                    yf = y
                else:
                    g, H, yf = g[st.free], H[fr, fc], y[st.free]
                gA = g - A @ mu
                sums = S @ yf
                lam = S @ (yf * gA) / sums
                n_el = yf @ A
                r[o:o + nf] = gA - lam @ S
                r[o + nf:o + nf + ns] = sums - 1.0
                r[o + nf + ns] = G - n_el @ mu
                J[o:o + nf, o:o + nf] = H
                st.hessian = H
                J[o + nf + ns, o:o + nf] = gA
                J[o + nf + ns, m0:] = -n_el
                J[m0:, o:o + nf] = st.amount * A.T
                J[m0:, o + nf + ns] = n_el
                balance += st.amount * n_el
                scale = max(scale, abs(G), float(np.abs(g).max()))
            r[m0:] = balance
            if (np.abs(r[lay.energy_rows]).max() <= ENERGY_TOLERANCE * scale
                    and np.abs(r[lay.balance_rows]).max() <= BALANCE_TOLERANCE):
                extra_step = True           # converged: one more step polishes the last digits
            if not np.isfinite(r).all():
                return states, mu, False
            try:
                d = np.linalg.solve(J, -r)
            except np.linalg.LinAlgError:
                d = np.linalg.lstsq(J, -r, rcond=None)[0]
            if not np.isfinite(d).all():     # a non-finite Jacobian (its entries are not checked)
                return states, mu, False
            big = float(np.abs(d[lay.y_rows]).max()) if len(lay.y_rows) else 0.0
            if big > MAX_STEP:              # a far start: shorter steps keep composition sets apart
                d *= MAX_STEP / big
            mu = mu + d[m0:]
            gone = []
            for k, (st, (_S, _A, o, nf, ns, _r, _c, whole, groups)) in enumerate(zip(states, lay.blocks)):
                if whole:
                    y = positive_step(st.y, d[o:o + nf])
                else:
                    y = st.y.copy()
                    y[st.free] = positive_step(st.y[st.free], d[o:o + nf])
                st.y = _normalise(y, groups)
                st.amount = st.amount + float(d[o + nf + ns])
                if st.amount < 0.0:
                    gone.append(k)
            if gone:
                states.pop(min(gone, key=lambda k: states[k].amount * states[k].atoms))
                extra_step = False
                if not states:
                    return states, mu, False
                lay = _layout(states, elements)
            elif extra_step:
                return states, mu, True
    return states, mu, False


#: Relative closeness (in every free site fraction) at which a descent has reached a stationary
#: point given to `lowest_driving_force`.
REACHED = 1e-3


def lowest_driving_force(model, y0: np.ndarray, mu: np.ndarray, elements: np.ndarray, free: np.ndarray,
                         steps: int = 8, margin: float = 0.0, sets: tuple | list = (),
                         tolerance: float = 0.0) -> tuple[np.ndarray, float]:
    """A few Newton steps toward the minimum of G(y) - y A mu (J per mole of formula units) over
    the phase's site fractions from y0; returns (y, driving force per mole of atoms, J/mol).
    Negative means the phase lies below the tangent plane mu. The steps stop early where the
    local quadratic model puts the minimum above `margin` (J/mol) with room to spare.

    `sets` may hold stationary points of the same function (the phase's composition sets on the
    plane mu, from Newton's method on the equilibrium): the steps also stop where they come within
    a relative REACHED of one of them in every free site fraction with the driving force above
    -`tolerance` (J/mol): from there Newton's steps end at that point, on the plane, so the
    answer "not below -tolerance" is the same, a few steps sooner."""
    pieces = _pieces(model, free, elements)
    S, groups, A, E, fr, fc, whole = (pieces.S, pieces.groups, pieces.A, pieces.E, pieces.fr, pieces.fc,
                                      pieces.whole)
    y = np.array(y0, dtype=float)
    nf = len(free)
    K = pieces.K0.copy()
    Amu = A @ mu
    targets = [st[free] for st in sets]
    df_at_y = None                              # the driving force at y where the loop has it
    with np.errstate(all="ignore"):
        for _ in range(steps):
            G, g, H = _derivatives(model, y)
            if whole:
                yf = y
            else:
                g, H, yf = g[free], H[fr, fc], y[free]
            moles = y @ E
            atoms = float(moles.sum()) if len(elements) else 1.0
            df_now = (float(G) - float(moles @ mu)) / atoms
            df_at_y = df_now if len(elements) else None
            if df_now > -tolerance and any(np.all(np.abs(yf - t) <= REACHED * t) for t in targets):
                break                                               # at a given stationary point
            gA = g - Amu
            lam = S @ (yf * gA) / (S @ yf)
            stationary = gA - lam @ S
            r = np.concatenate([stationary, S @ yf - 1.0])
            K[:nf, :nf] = H
            if not np.isfinite(K).all():
                break
            try:
                d = np.linalg.solve(K, -r)
            except np.linalg.LinAlgError:
                break
            dy = d[:nf]
            predicted = 0.5 * float(stationary @ dy)                # the quadratic model's change
            if predicted <= 0.0 and df_now + 2.0 * predicted / atoms > margin + 10.0 * abs(predicted) / atoms:
                break                                               # its minimum is well above the plane
            big = float(np.abs(dy).max())
            if big > 0.2:                                           # a non-convex region: bounded steps
                dy = dy * (0.2 / big)
            if whole:
                y_new = positive_step(yf, dy)
            else:
                y_new = y.copy()
                y_new[free] = positive_step(yf, dy)
            y, df_at_y = _normalise(y_new, groups), None
            if big < 1e-10:
                break
        if df_at_y is not None:                 # stopped before a step: y is where G was evaluated
            return y, df_at_y
        n = y @ model.element_matrix
        atoms = float(n.sum())
        df = (float(model.gibbs(y)) - float(n[elements] @ mu)) / atoms
    return y, df
