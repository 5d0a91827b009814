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

from dataclasses import dataclass, replace

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
    formula units per mole of alloy atoms)."""

    name: str
    model: object
    y: np.ndarray
    amount: float
    free: np.ndarray            # indices of the site fractions that vary

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


def positive_step(y: np.ndarray, dy: np.ndarray) -> np.ndarray:
    """The updated site fractions, always positive: y exp(dy / y) (Newton's step in ln y) for
    decreasing fractions and for dilute ones (below DILUTE, up to GROWTH_CAP or y + dy), y + dy
    for the others."""
    with np.errstate(over="ignore", under="ignore", invalid="ignore"):
        log_step = y * np.exp(np.clip(dy / y, -700.0, 50.0))
    plain = y + dy
    up = np.where(y < DILUTE, np.minimum(log_step, np.maximum(plain, GROWTH_CAP)), plain)
    return np.where(dy >= 0.0, up, log_step)


def _normalise(y: np.ndarray, model, free: np.ndarray) -> np.ndarray:
    out = np.zeros_like(y)
    mask = np.zeros(len(y), dtype=bool)
    mask[free] = True
    for g in model.groups:
        gi = g[mask[g]]
        out[gi] = y[gi] / y[gi].sum()
    return out


def _layout(states: list[PhaseState], elements: np.ndarray) -> tuple[list[tuple], int]:
    """Per state: its sublattice rows S, element matrix A (free variables x active elements), the
    offset of its unknowns and the Hessian's index arrays; and the size of the Newton system."""
    blocks = []
    size = len(elements)
    for st in states:
        S = sublattice_rows(st.model, st.free)
        A = st.model.element_matrix[np.ix_(st.free, elements)]
        blocks.append((S, A, size - len(elements), st.free[:, None], st.free[None, :]))
        size += len(st.free) + S.shape[0] + 1
    return blocks, size


def solve(states: list[PhaseState], z: np.ndarray, mu: np.ndarray, elements: np.ndarray,
          max_iterations: int = MAX_ITERATIONS) -> tuple[list[PhaseState], np.ndarray, bool]:
    """Refine `states` to the equilibrium at overall composition z (mole fractions of the active
    `elements`, an index array) from chemical potentials mu (J/mol, active elements); `states` are
    not changed. Returns refined copies of the states that remain (amounts >= 0), mu and whether
    the residual met its tolerance."""
    states = [replace(st, y=st.y.copy()) for st in states]
    mu = np.array(mu, dtype=float)
    ne = len(elements)
    extra_step = False
    blocks, size = _layout(states, elements)
    for _ in range(max_iterations):
        J = np.zeros((size, size))
        r = np.zeros(size)
        m0 = size - ne                      # mu occupies the last ne unknowns
        scale = 1.0
        balance = -np.array(z, dtype=float)
        for st, (S, A, o, fr, fc) in zip(states, blocks):
            nf, ns = len(st.free), S.shape[0]
            with np.errstate(all="ignore"):
                G = float(st.model.gibbs(st.y))
                g = st.model.gradient(st.y)[st.free]
                H = st.model.hessian(st.y)[fr, fc]
            yf = st.y[st.free]
            Amu = A @ mu
            lam = S @ (yf * (g - Amu)) / (S @ yf)
            n_el = A.T @ yf
            iy, il, in_ = o, o + nf, o + nf + ns
            r[iy:il] = g - Amu - S.T @ lam
            r[il:in_] = S @ yf - 1.0
            r[in_] = G - n_el @ mu
            J[iy:il, iy:il] = H
            J[iy:il, il:in_] = -S.T
            J[iy:il, m0:] = -A
            J[il:in_, iy:il] = S
            J[in_, iy:il] = g - Amu
            J[in_, m0:] = -n_el
            J[m0:, iy:il] = st.amount * A.T
            J[m0:, in_] = n_el
            balance += st.amount * n_el
            scale = max(scale, abs(G), float(np.max(np.abs(g))))
            st._lam = lam
        r[m0:] = balance
        energy_ok = all(
            np.max(np.abs(r[o:o + len(st.free)]), initial=0.0) <= ENERGY_TOLERANCE * scale
            and abs(r[o + len(st.free) + S.shape[0]]) <= ENERGY_TOLERANCE * scale
            for st, (S, _A, o, _r, _c) in zip(states, blocks))
        balance_ok = np.max(np.abs(r[m0:])) <= BALANCE_TOLERANCE and all(
            np.max(np.abs(r[o + len(st.free):o + len(st.free) + S.shape[0]])) <= BALANCE_TOLERANCE
            for st, (S, _A, o, _r, _c) in zip(states, blocks))
        if energy_ok and balance_ok:
            if extra_step:
                return states, mu, True
            extra_step = True
        if not np.all(np.isfinite(J)) or not np.all(np.isfinite(r)):
            return states, mu, False
        try:
            d = np.linalg.solve(J, -r)
        except np.linalg.LinAlgError:
            d = np.linalg.lstsq(J, -r, rcond=None)[0]
        big = max((float(np.max(np.abs(d[o:o + len(st.free)]), initial=0.0)) for st, (_S, _A, o, _r, _c) in zip(states, blocks)),
                  default=0.0)
        if big > MAX_STEP:                  # a far start: shorter steps keep composition sets apart
            d *= MAX_STEP / big
        mu = mu + d[m0:]
        gone = []
        for k, (st, (S, _A, o, _r, _c)) in enumerate(zip(states, blocks)):
            nf, ns = len(st.free), S.shape[0]
            y = st.y.copy()
            y[st.free] = positive_step(st.y[st.free], d[o:o + nf])
            st.y = _normalise(y, st.model, st.free)
            st.amount = st.amount + float(d[o + nf + ns])
            if st.amount < 0.0:
                gone.append(k)
        if gone:
            worst = min(gone, key=lambda k: states[k].amount * states[k].atoms)
            states.pop(worst)
            extra_step = False
            blocks, size = _layout(states, elements)
            if not states:
                return states, mu, False
    return states, mu, False


def lowest_driving_force(model, y0: np.ndarray, mu: np.ndarray, elements: np.ndarray, free: np.ndarray,
                         steps: int = 8) -> tuple[np.ndarray, float]:
    """A few Newton steps toward the minimum of G(y) - y A mu (J per mole of formula units) over
    the phase's site fractions from y0; returns (y, driving force per mole of atoms, J/mol).
    Negative means the phase lies below the tangent plane mu."""
    S = sublattice_rows(model, free)
    A = model.element_matrix[np.ix_(free, elements)]
    y = np.array(y0, dtype=float)
    nf, ns = len(free), S.shape[0]
    K = np.zeros((nf + ns, nf + ns))
    K[:nf, nf:] = -S.T
    K[nf:, :nf] = S
    Amu = A @ mu
    for _ in range(steps):
        with np.errstate(all="ignore"):
            g = model.gradient(y)[free]
            H = model.hessian(y)[np.ix_(free, free)]
        yf = y[free]
        lam = S @ (yf * (g - Amu)) / (S @ yf)
        r = np.concatenate([g - Amu - S.T @ lam, S @ yf - 1.0])
        K[:nf, :nf] = H
        if not np.all(np.isfinite(K)):
            break
        try:
            d = np.linalg.solve(K, -r)
        except np.linalg.LinAlgError:
            break
        # a non-convex region: Newton may head for a maximum; keep only descent-like steps bounded
        dy = d[:nf]
        big = np.max(np.abs(dy))
        if big > 0.2:
            dy = dy * (0.2 / big)
        y_new = y.copy()
        y_new[free] = positive_step(yf, dy)
        y = _normalise(y_new, model, free)
        if big < 1e-10:
            break
    with np.errstate(all="ignore"):
        n = y @ model.element_matrix
        atoms = float(n.sum())
        df = (float(model.gibbs(y)) - float(n[elements] @ mu)) / atoms
    return y, df
