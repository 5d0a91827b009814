"""Small phase models for the minimiser's tests and benchmarks, written independently of the
engine's models but following the same interface (`phase.at(T)` -> an object with n_vars,
groups, element_matrix, gibbs, gradient, hessian, gibbs_dT and samples; see the contract of the
sublattice model): a substitutional Redlich-Kister solution in any number of elements, and a
sublattice phase with multilinear end members (compounds are the one-constituent case).

Energies in J per mole of formula units (per mole of atoms in `samples`), temperatures in K.
"""

from __future__ import annotations

from dataclasses import dataclass, field
from functools import cached_property
from types import SimpleNamespace

import numpy as np

from ladle.engine.minimize.site_sampling import site_fraction_cloud
from ladle.engine.units import GAS_CONSTANT as R


def _xlogx(y: np.ndarray) -> np.ndarray:
    safe = np.where(y > 0.0, y, 1.0)
    return np.where(y > 0.0, y * np.log(safe), 0.0)


class _Sampled:
    """samples() for any of the models below: the engine's generic cloud, per mole of atoms."""

    @cached_property
    def _cloud(self):
        Y = site_fraction_cloud(self.groups, self.n_vars)
        n = Y @ self.element_matrix
        atoms = n.sum(-1)
        keep = atoms > 1e-12
        Y, n, atoms = Y[keep], n[keep], atoms[keep]
        return Y, n / atoms[:, None], self.gibbs(Y) / atoms

    def samples(self):
        return self._cloud


@dataclass(frozen=True)
class Substitutional:
    """One sublattice holding every element: G = sum y_i G_i(T) + RT sum y_i ln y_i
    + sum_{i<j} y_i y_j sum_k L_ijk (y_i - y_j)^k, with G_i(T) = a_i + b_i T and L_ijk = a + b T."""

    name: str
    elements: tuple[str, ...]
    g0: tuple[tuple[float, float], ...]
    L: dict[tuple[int, int], tuple[tuple[float, float], ...]] = field(default_factory=dict)

    def at(self, T: float) -> "SubstitutionalAtT":
        return SubstitutionalAtT(self, T)


class SubstitutionalAtT(_Sampled):
    def __init__(self, phase: Substitutional, T: float) -> None:
        n = len(phase.elements)
        self.T, self.RT, self.n_vars = T, R * T, n
        self.groups = [np.arange(n)]
        self.element_matrix = np.eye(n)
        self.g0 = np.array([a + b * T for a, b in phase.g0])
        self.g0_dT = np.array([b for _a, b in phase.g0])
        self.L = {ij: [a + b * T for a, b in c] for ij, c in phase.L.items()}
        self.L_dT = {ij: [b for _a, b in c] for ij, c in phase.L.items()}

    @staticmethod
    def _poly(c, d):
        p = dp = ddp = 0.0 * d
        for k, ck in enumerate(c):
            p = p + ck * d**k
            if k >= 1:
                dp = dp + k * ck * d ** (k - 1)
            if k >= 2:
                ddp = ddp + k * (k - 1) * ck * d ** (k - 2)
        return p, dp, ddp

    def _excess(self, y, L):
        g = 0.0 * y[..., 0]
        for (i, j), c in L.items():
            p, _, _ = self._poly(c, y[..., i] - y[..., j])
            g = g + y[..., i] * y[..., j] * p
        return g

    def gibbs(self, y):
        y = np.asarray(y, dtype=float)
        return y @ self.g0 + self.RT * _xlogx(y).sum(-1) + self._excess(y, self.L)

    def gibbs_dT(self, y):
        y = np.asarray(y, dtype=float)
        return y @ self.g0_dT + R * _xlogx(y).sum(-1) + self._excess(y, self.L_dT)

    def gradient(self, y):
        y = np.asarray(y, dtype=float)
        g = self.g0 + self.RT * (np.log(y) + 1.0)
        g = np.array(g, dtype=float)
        for (i, j), c in self.L.items():
            yi, yj = y[..., i], y[..., j]
            p, dp, _ = self._poly(c, yi - yj)
            g[..., i] += yj * p + yi * yj * dp
            g[..., j] += yi * p - yi * yj * dp
        return g

    def hessian(self, y):
        y = np.asarray(y, dtype=float)
        h = np.zeros(y.shape + (self.n_vars,))
        idx = np.arange(self.n_vars)
        h[..., idx, idx] = self.RT / y
        for (i, j), c in self.L.items():
            yi, yj = y[..., i], y[..., j]
            p, dp, ddp = self._poly(c, yi - yj)
            h[..., i, i] += 2 * yj * dp + yi * yj * ddp
            h[..., j, j] += -2 * yi * dp + yi * yj * ddp
            cross = p + (yi - yj) * dp - yi * yj * ddp
            h[..., i, j] += cross
            h[..., j, i] += cross
        return h


@dataclass(frozen=True)
class Sublattices:
    """Several sublattices (site ratios `sites`), constituents given as element indices or None
    for the vacancy; G = sum over end members of prod_s y_s,c(s) G_c (a + b T, array of shape
    (m_1, ..., m_S)) + RT sum_s a_s sum y ln y + y_p y_q L (a regular term between the first two
    constituents of the first sublattice, if `L` is not zero)."""

    name: str
    n_elements: int
    sites: tuple[float, ...]
    constituents: tuple[tuple[int | None, ...], ...]
    end_a: np.ndarray
    end_b: np.ndarray
    L: float = 0.0

    def at(self, T: float) -> "SublatticesAtT":
        return SublatticesAtT(self, T)


class SublatticesAtT(_Sampled):
    def __init__(self, phase: Sublattices, T: float) -> None:
        self.T, self.RT = T, R * T
        sizes = [len(c) for c in phase.constituents]
        starts = np.cumsum([0] + sizes)
        self.groups = [np.arange(starts[s], starts[s + 1]) for s in range(len(sizes))]
        self.n_vars = int(starts[-1])
        self.element_matrix = np.zeros((self.n_vars, phase.n_elements))
        self.site_weight = np.zeros(self.n_vars)
        for s, cons in enumerate(phase.constituents):
            for k, el in enumerate(cons):
                self.site_weight[starts[s] + k] = phase.sites[s]
                if el is not None:
                    self.element_matrix[starts[s] + k, el] = phase.sites[s]
        self.E = np.asarray(phase.end_a, dtype=float) + T * np.asarray(phase.end_b, dtype=float)
        self.E_dT = np.asarray(phase.end_b, dtype=float) * np.ones_like(self.E)
        self.L = phase.L

    def _ref(self, E, y):
        """E contracted with every sublattice's site fractions (vectorised over leading axes)."""
        lead = y.shape[:-1]
        out = np.broadcast_to(E, lead + E.shape)
        for s in reversed(range(len(self.groups))):
            p = y[..., self.groups[s]].reshape(lead + (1,) * s + (len(self.groups[s]),))
            out = (out * p).sum(-1)
        return out

    def gibbs(self, y):
        y = np.asarray(y, dtype=float)
        g = self._ref(self.E, y) + self.RT * (_xlogx(y) * self.site_weight).sum(-1)
        if self.L:
            g = g + self.L * y[..., 0] * y[..., 1]
        return g

    def gibbs_dT(self, y):
        y = np.asarray(y, dtype=float)
        return self._ref(self.E_dT, y) + R * (_xlogx(y) * self.site_weight).sum(-1)

    def _without(self, y, skip):
        """E contracted with every sublattice's y except those in `skip` (1-D y only)."""
        out = self.E
        for s in reversed(range(len(self.groups))):
            if s in skip:
                continue
            out = np.tensordot(out, y[self.groups[s]], axes=([s], [0]))
        return out

    def gradient(self, y):
        y = np.asarray(y, dtype=float)
        g = self.RT * self.site_weight * (np.log(y) + 1.0)
        for s, grp in enumerate(self.groups):
            g[grp] += self._without(y, {s})
        if self.L:
            g[0] += self.L * y[1]
            g[1] += self.L * y[0]
        return g

    def hessian(self, y):
        y = np.asarray(y, dtype=float)
        h = np.diag(self.RT * self.site_weight / y)
        S = len(self.groups)
        for s in range(S):
            for t in range(s + 1, S):
                block = self._without(y, {s, t})          # axes (s, t) in order
                h[np.ix_(self.groups[s], self.groups[t])] += block
                h[np.ix_(self.groups[t], self.groups[s])] += block.T
        if self.L:
            h[0, 1] += self.L
            h[1, 0] += self.L
        return h


def compound(name: str, n_elements: int, counts: dict[int, float], g_per_atom: tuple[float, float]) -> Sublattices:
    """A stoichiometric compound: one sublattice per element (site ratio = atoms per formula
    unit), G = (a + b T) per mole of atoms."""
    els = sorted(counts)
    atoms = sum(counts.values())
    shape = (1,) * len(els)
    return Sublattices(name, n_elements, tuple(counts[e] for e in els), tuple((e,) for e in els),
                       np.full(shape, g_per_atom[0] * atoms), np.full(shape, g_per_atom[1] * atoms))


def system_of(elements: tuple[str, ...], phases: list, molar_mass: np.ndarray | None = None):
    """A minimal system object for the general minimiser: elements, molar masses (g/mol) and
    `models` (name -> phase), covering every composition (`element_ranges`, `covered`, `covers_elements`: the
    section mappers ask for them)."""
    mm = np.full(len(elements), 50.0) if molar_mass is None else np.asarray(molar_mass, dtype=float)
    ranges = np.tile([0.0, 1.0], (len(elements), 1))
    return SimpleNamespace(name="test", elements=tuple(elements), molar_mass=mm,
                           models={p.name: p for p in phases}, phases={}, element_ranges=ranges, covers_elements={},
                           covered=lambda x: True if np.ndim(x) == 1 else np.ones(len(x), dtype=bool))


def random_system(rng: np.random.Generator, n_elements: int, n_solutions: int = 3, n_compounds: int = 2,
                  sublattice_phase: bool = False):
    """An invented system for randomised checks: `n_solutions` Redlich-Kister solutions with
    random end members and pair terms (orders 0 and 1, strong enough for miscibility gaps),
    `n_compounds` binary compounds, and optionally a two-sublattice phase (A,B)1(C,Va)1.
    Returns (elements, phases)."""
    els = tuple("ABCDEF"[:n_elements])
    phases: list = []
    for p in range(n_solutions):
        g0 = tuple((float(rng.uniform(-3000, 6000)), float(rng.uniform(-4, 0))) for _ in els)
        L = {(i, j): ((float(rng.uniform(-20000, 30000)), 0.0), (float(rng.uniform(-5000, 5000)), 0.0))
             for i in range(n_elements) for j in range(i + 1, n_elements)}
        phases.append(Substitutional(f"s{p}", els, g0, L))
    for c in range(n_compounds):
        i, j = rng.choice(n_elements, size=2, replace=False)
        counts = {int(i): float(rng.integers(1, 4)), int(j): float(rng.integers(1, 4))}
        phases.append(compound(f"c{c}", n_elements, counts, (float(rng.uniform(-12000, -2000)), 0.0)))
    if sublattice_phase:
        end_a = rng.uniform(-8000, 4000, (2, 2))
        end_a[:, 1] = rng.uniform(-2000, 3000, 2)            # C on the second sublattice vs. a vacancy
        phases.append(Sublattices("interstitial", n_elements, (1.0, 1.0), ((0, 1), (2, None)),
                                  end_a, np.zeros((2, 2)), L=float(rng.uniform(-10000, 20000))))
    return els, phases
