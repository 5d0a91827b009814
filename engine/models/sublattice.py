"""The general phase model: the compound energy formalism.

M. Hillert, J. Alloys Compd. 320 (2001) 161-176; B. Sundman and J. Agren, J. Phys. Chem.
Solids 42 (1981) 297-301; H.L. Lukas, S.G. Fries, B. Sundman, Computational Thermodynamics:
The Calphad Method, Cambridge University Press (2007), chapter 5.

A phase has sublattices s with site ratios a_s (sites per formula unit), each holding
constituents (elements of the system, or "Va", the vacancy) with site fractions y that sum to
one on each sublattice. Per mole of formula units (J/mol f.u.):

    G = sum_em  prod_s y_s,em(s) G_em(T)                       end members
        + R T sum_s a_s sum_j y_sj ln y_sj                      ideal configurational entropy
        + sum_I  prod_(constituents of I) y  * L_I(y, T)        interactions
        + G_mag                                                 magnetic term (optional)

An interaction names one constituent on every sublattice except one (or more, for a reciprocal
term), where it names two or three:
- two constituents i, j: the Redlich-Kister series L_I = sum_k L_k (y_i - y_j)^k (O. Redlich and
  A.T. Kister, Ind. Eng. Chem. 40 (1948) 345). With more constituents on that sublattice this is
  the Muggianu extrapolation of the binary terms (Y.-M. Muggianu, M. Gambino, J.-P. Bros,
  J. Chim. Phys. 72 (1975) 83).
- three constituents i, j, k: one coefficient (composition-independent), or three,
  L_I = L_i v_i + L_j v_j + L_k v_k with v_m = y_m + (1 - y_i - y_j - y_k) / 3 (the symmetric form
  of Lukas et al. 2007, eq. 5.54).
- two or more sublattices with two constituents (a reciprocal term): one coefficient.

A substitutional solution is a phase with one sublattice of site ratio 1 (site fractions are mole
fractions, G is per mole of atoms); a stoichiometric compound has one constituent per sublattice.
The magnetic term is G. Inden's (Physica B 103 (1981) 82) in the form of M. Hillert and M. Jarl
(Calphad 2 (1978) 227): G_mag = R T ln(beta + 1) f(T / Tc) per mole of formula units, with the
Curie temperature Tc (K) and mean moment beta (Bohr magnetons) expanded in site fractions like G.
"""

from __future__ import annotations

import itertools
import math
from dataclasses import dataclass, field
from functools import cached_property

import numpy as np

from .magnetic import hillert_jarl
from .polynomials import TemperatureFunction
from ..units import GAS_CONSTANT as R

#: The vacancy: a constituent that brings no atoms.
VACANCY = "Va"

#: The most sample points `samples()` returns for one phase (a few thousand).
SAMPLE_BUDGET = 4000

#: The smallest site fraction the samples reach near each pure constituent.
SAMPLE_SMALLEST = 1e-6


@dataclass(frozen=True, eq=False)
class Interaction:
    """A term of the excess energy (or of the Curie temperature or moment).

    `constituents` holds, per sublattice, the constituent(s) the term belongs to: one, or the two
    (Redlich-Kister orders 0, 1, 2, ... in `coefficients`) or three (one coefficient, or three for
    i, j, k in the order named) that interact there. A term with one constituent on every
    sublattice and one coefficient is an end-member value (used for Tc and beta).
    Coefficients in J per mole of formula units (K for Tc, Bohr magnetons for beta).
    """

    constituents: tuple[tuple[str, ...], ...]
    coefficients: tuple[TemperatureFunction, ...]


@dataclass(frozen=True, eq=False)
class MagneticTerms:
    """The magnetic contribution: Tc (K) and beta (Bohr magnetons) as sums of terms in site
    fractions (end-member values and interactions, each an `Interaction`).

    `above_curie_fraction` is p, the share of the magnetic enthalpy absorbed above Tc (0.40 for
    bcc, 0.28 otherwise); where Tc or beta come out negative (antiferromagnetic) they are divided
    by `antiferro_factor` (-1 for bcc, -3 for fcc and hcp).
    """

    above_curie_fraction: float
    curie_K: tuple[Interaction, ...]
    moment: tuple[Interaction, ...]
    antiferro_factor: float = -3.0


def _xlogx(y: np.ndarray) -> np.ndarray:
    """y ln y with 0 ln 0 = 0."""
    positive = y > 0.0
    return np.where(positive, y * np.log(np.where(positive, y, 1.0)), 0.0)


class _Expansion:
    """A sum of terms  prod_(v in S_t) y_v * sum_k C_tk s_t^k  with s_t = A_t . y + a0_t, evaluated
    with its gradient and Hessian in y, vectorised over leading axes and over terms.

    Every end member and interaction becomes one term (a three-coefficient ternary becomes three);
    `functions[t][k]` is the TemperatureFunction of C_tk (None for zero).
    """

    def __init__(self, n_vars: int, terms: list[tuple[list[int], np.ndarray, float, list]]) -> None:
        self.n_vars = n_vars
        self.n_terms = len(terms)
        width = max((len(t[0]) for t in terms), default=1)
        order = max((len(t[3]) for t in terms), default=1)
        self.members = np.full((self.n_terms, width), n_vars, dtype=np.intp)  # n_vars: the padding "1"
        self.slopes = np.zeros((self.n_terms, n_vars))
        self.offsets = np.zeros(self.n_terms)
        self.functions: list[list[TemperatureFunction | None]] = []
        for t, (members, slope, offset, funcs) in enumerate(terms):
            self.members[t, :len(members)] = members
            self.slopes[t] = slope
            self.offsets[t] = offset
            self.functions.append(list(funcs) + [None] * (order - len(funcs)))
        self.order = order
        width = self.members.shape[1]
        # 0/1 maps from (term, position[, position]) to variables, the padding positions dropped
        one_hot = np.zeros((self.n_terms, width, n_vars + 1))
        for t in range(self.n_terms):
            one_hot[t, np.arange(width), self.members[t]] = 1.0
        one_hot = one_hot[..., :n_vars]
        self.to_gradient = one_hot.reshape(self.n_terms * width, n_vars)
        self.to_hessian = np.einsum("tpu,tqw->tpquw", one_hot, one_hot).reshape(self.n_terms * width * width, n_vars * n_vars)
        # the same for the terms whose factor depends on y: (term, position) -> (u, w) of
        # d monomial/dy_u * slope_w, and term -> slope_u * slope_w
        self.to_cross = np.einsum("tpu,tw->tpuw", one_hot, self.slopes).reshape(self.n_terms * width, n_vars * n_vars)
        self.slope_pairs = np.einsum("tu,tw->tuw", self.slopes, self.slopes).reshape(self.n_terms, n_vars * n_vars)
        # for each position p, the other positions; for each pair (p, q), the others but those two
        # (the diagonal p == q is masked out)
        self.others_one = np.array([[r for r in range(width) if r != p] for p in range(width)], dtype=np.intp).reshape(width, width - 1)
        self.others = np.array([[[r for r in range(width) if r not in (p, q)][: max(width - 2, 0)]
                                 for q in range(width)] for p in range(width)], dtype=np.intp).reshape(width, width, max(width - 2, 0))
        self.off_diagonal = 1.0 - np.eye(width)
        self.linear = bool(np.any(self.slopes))
        self._terms = terms

    @cached_property
    def monomials(self) -> tuple[np.ndarray, np.ndarray]:
        """The sum expanded into monomials: (E, Q) with E (monomials, n_vars) the exponents and Q
        (monomials, n_terms * order) the map from the coefficients C.ravel() to the monomials'
        coefficients. The point form of `evaluate_at` uses it."""
        found: dict[tuple[int, ...], int] = {}
        entries: list[tuple[int, int, float]] = []
        n = self.n_vars
        for t, (members, slope, offset, _funcs) in enumerate(self._terms):
            base = [0] * n
            for v in members:
                base[v] += 1
            linear = [(v, float(a)) for v, a in enumerate(slope) if a != 0.0]
            power: dict[tuple[int, ...], float] = {tuple(base): 1.0}     # the prefactor times s^k
            for k in range(self.order):
                for e, q in power.items():
                    if q != 0.0:
                        entries.append((found.setdefault(e, len(found)), t * self.order + k, q))
                grown: dict[tuple[int, ...], float] = {}
                for e, q in power.items():
                    if offset != 0.0:
                        grown[e] = grown.get(e, 0.0) + q * offset
                    for v, a in linear:
                        e2 = e[:v] + (e[v] + 1,) + e[v + 1:]
                        grown[e2] = grown.get(e2, 0.0) + q * a
                power = grown
        E = np.zeros((len(found), n))
        for e, i in found.items():
            E[i] = e
        Q = np.zeros((len(found), self.n_terms * self.order))
        for i, col, q in entries:
            Q[i, col] += q
        return E, Q

    @staticmethod
    def evaluate_at(y: np.ndarray, E: np.ndarray, c: np.ndarray, order: int, log_y: np.ndarray | None = None):
        """(value, gradient, Hessian) at one point y (n_vars,) with every y > 0, from the monomial
        form (exponents E, coefficients c = Q @ C.ravel()): G = sum_p c_p prod_v y_v^E_pv,
        dG/dy_v = sum_p c_p E_pv m_p / y_v, d2G/dy_u dy_v = sum_p c_p E_pu (E_pv - [u = v]) m_p / (y_u y_v).
        Derivatives only up to `order` (None beyond). `log_y`, ln y where the caller has it,
        gives the monomials as exp(E ln y) (one product and one exponential for all)."""
        w = c * (np.exp(E @ log_y) if log_y is not None else np.multiply.reduce(y ** E, axis=1))
        value = w.sum()
        if order == 0:
            return value, None, None
        wE = w @ E
        grad = wE / y
        if order == 1:
            return value, grad, None
        hess = (E.T * w) @ E
        hess.flat[::len(y) + 1] -= wE
        return value, grad, hess / (y[:, None] * y)

    @cached_property
    def _slots(self) -> tuple[np.ndarray, list[TemperatureFunction]]:
        """The flat positions in C of the coefficients that are given, and their functions."""
        given = [(t * self.order + k, f) for t, row in enumerate(self.functions) for k, f in enumerate(row) if f is not None]
        return np.array([i for i, _f in given], dtype=np.intp), [f for _i, f in given]

    def coefficients(self, T: float, derivative: bool = False) -> np.ndarray:
        """C (n_terms, order) at T (K), or dC/dT."""
        where, functions = self._slots
        out = np.zeros(self.n_terms * self.order)
        out[where] = [f.derivative(T) for f in functions] if derivative else [f.value(T) for f in functions]
        return out.reshape(self.n_terms, self.order)

    def _factors(self, y: np.ndarray, C: np.ndarray, order: int):
        """The polynomial factor F(s) of each term and its first two derivatives in s."""
        s = y @ self.slopes.T + self.offsets
        F = s * 0.0 + C[:, -1]
        if order == 0:
            for k in range(self.order - 2, -1, -1):
                F = F * s + C[:, k]
            return F, None, None
        F1 = np.zeros_like(s)
        F2 = np.zeros_like(s)
        for k in range(self.order - 2, -1, -1):
            if order >= 2:
                F2 = F2 * s + 2.0 * F1
            if order >= 1:
                F1 = F1 * s + F
            F = F * s + C[:, k]
        return F, F1, F2

    def evaluate(self, y: np.ndarray, C: np.ndarray, order: int = 0):
        """(value, gradient, Hessian) of the sum at site fractions y (..., n_vars); the
        derivatives only up to `order` (None beyond)."""
        lead = y.shape[:-1]
        padded = np.concatenate([y, np.ones(lead + (1,))], axis=-1)
        chosen = padded[..., self.members]                                    # (..., terms, width)
        monomial = chosen.prod(axis=-1)
        F, F1, F2 = self._factors(y, C, order)
        value = (monomial * F).sum(axis=-1)
        if order == 0:
            return value, None, None
        n = self.n_vars
        leave_one = chosen[..., self.others_one].prod(axis=-1)               # d monomial / d y at each position
        grad = (leave_one * F[..., None]).reshape(lead + (-1,)) @ self.to_gradient
        if self.linear:
            grad = grad + (monomial * F1) @ self.slopes
        if order == 1:
            return value, grad, None
        leave_two = chosen[..., self.others].prod(axis=-1) * self.off_diagonal   # (..., terms, width, width)
        hess = ((leave_two * F[..., None, None]).reshape(lead + (-1,)) @ self.to_hessian).reshape(lead + (n, n))
        if self.linear:
            cross = ((leave_one * F1[..., None]).reshape(lead + (-1,)) @ self.to_cross).reshape(lead + (n, n))
            hess = hess + cross + np.swapaxes(cross, -1, -2)
            hess = hess + ((monomial * F2) @ self.slope_pairs).reshape(lead + (n, n))
        return value, grad, hess


@dataclass(frozen=True, eq=False)
class SublatticePhase:
    """A phase of the compound energy formalism (see the module docstring).

    `elements` are the system's elements (the composition axis); `site_ratios` the sites per
    formula unit of each sublattice; `constituents` the species each sublattice holds (elements of
    the system or "Va"); `end_members` maps one constituent per sublattice to its Gibbs energy
    (J per mole of formula units), every combination given; `interactions` the excess terms.
    """

    name: str
    elements: tuple[str, ...]
    site_ratios: tuple[float, ...]
    constituents: tuple[tuple[str, ...], ...]
    end_members: dict[tuple[str, ...], TemperatureFunction]
    interactions: tuple[Interaction, ...] = ()
    magnetic: MagneticTerms | None = None
    kind: str = field(default="sublattice", init=False)

    def __post_init__(self) -> None:
        problem = self._problem()
        if problem:
            raise ValueError(f"phase {self.name}: {problem}")
        object.__setattr__(self, "_at_cache", {})

    # --- validation -------------------------------------------------------------------------
    def _problem(self) -> str | None:
        """The first thing wrong with the definition, as a phrase, or None."""
        if not self.site_ratios or len(self.site_ratios) != len(self.constituents):
            return "expected one site ratio per sublattice"
        if any(not (a > 0 and math.isfinite(a)) for a in self.site_ratios):
            return "site ratios must be positive numbers"
        for s, held in enumerate(self.constituents):
            if not held:
                return f"sublattice {s + 1} holds nothing"
            if len(set(held)) != len(held):
                return f"sublattice {s + 1} names a constituent twice"
            for c in held:
                if c != VACANCY and c not in self.elements:
                    return f"sublattice {s + 1} holds {c}, which is neither an element of the system nor {VACANCY}"
        for combo in itertools.product(*self.constituents):
            if combo not in self.end_members:
                return f"end member {':'.join(combo)} has no Gibbs energy"
        for combo in self.end_members:
            if len(combo) != len(self.constituents) or any(c not in held for c, held in zip(combo, self.constituents)):
                return f"end member {combo} does not match the sublattices"
        for term in self.interactions + (self.magnetic.curie_K + self.magnetic.moment if self.magnetic else ()):
            problem = self._term_problem(term)
            if problem:
                return problem
        return None

    def _term_problem(self, term: Interaction) -> str | None:
        if len(term.constituents) != len(self.constituents):
            return f"interaction {term.constituents} names {len(term.constituents)} sublattices, the phase has {len(self.constituents)}"
        for s, (named, held) in enumerate(zip(term.constituents, self.constituents)):
            if not named or len(set(named)) != len(named) or any(c not in held for c in named):
                return f"interaction {term.constituents}: sublattice {s + 1} must name distinct constituents it holds"
        if not term.coefficients:
            return f"interaction {term.constituents} has no coefficient"
        mixed = [len(named) for named in term.constituents if len(named) > 1]
        n = len(term.coefficients)
        if len(mixed) == 1 and mixed[0] == 2:
            return None
        if len(mixed) == 1 and mixed[0] == 3 and n in (1, 3):
            return None
        if n != 1:
            return f"interaction {term.constituents} allows one coefficient, found {n}"
        return None

    # --- structure --------------------------------------------------------------------------
    @cached_property
    def _variables(self) -> list[tuple[int, str]]:
        return [(s, c) for s, held in enumerate(self.constituents) for c in held]

    @cached_property
    def _index(self) -> dict[tuple[int, str], int]:
        return {v: i for i, v in enumerate(self._variables)}

    @property
    def n_vars(self) -> int:
        """Number of site fractions (every constituent of every sublattice)."""
        return len(self._variables)

    @cached_property
    def groups(self) -> list[np.ndarray]:
        """Per sublattice, the indices of its site fractions in y."""
        out, start = [], 0
        for held in self.constituents:
            out.append(np.arange(start, start + len(held)))
            start += len(held)
        return out

    @cached_property
    def element_matrix(self) -> np.ndarray:
        """(n_vars, n_elements): moles of each element per formula unit a unit site fraction brings."""
        m = np.zeros((self.n_vars, len(self.elements)))
        for i, (s, c) in enumerate(self._variables):
            if c != VACANCY:
                m[i, self.elements.index(c)] = self.site_ratios[s]
        return m

    @cached_property
    def _site_weights(self) -> np.ndarray:
        """The site ratio of each site fraction's sublattice (the entropy's weights)."""
        return np.array([self.site_ratios[s] for s, _c in self._variables])

    @property
    def is_substitutional(self) -> bool:
        """One sublattice of site ratio 1: site fractions are mole fractions."""
        return len(self.site_ratios) == 1 and self.site_ratios[0] == 1.0

    def _terms(self, terms: list[Interaction]) -> _Expansion:
        n = self.n_vars
        rows = []
        for term in terms:
            members = [self._index[(s, c)] for s, named in enumerate(term.constituents) for c in named]
            mixed = [(s, named) for s, named in enumerate(term.constituents) if len(named) > 1]
            funcs = list(term.coefficients)
            if len(mixed) == 1 and len(mixed[0][1]) == 2:
                s, (i, j) = mixed[0]
                slope = np.zeros(n)
                slope[self._index[(s, i)]], slope[self._index[(s, j)]] = 1.0, -1.0
                rows.append((members, slope, 0.0, funcs))
            elif len(mixed) == 1 and len(funcs) == 3:
                s, named = mixed[0]
                for c, f in zip(named, funcs):
                    slope = np.zeros(n)
                    for other in named:
                        slope[self._index[(s, other)]] -= 1.0 / 3.0
                    slope[self._index[(s, c)]] += 1.0
                    rows.append((members, slope, 1.0 / 3.0, [None, f]))
            else:
                rows.append((members, np.zeros(n), 0.0, funcs[:1]))
        return _Expansion(n, rows)

    @cached_property
    def _energy(self) -> _Expansion:
        ends = [Interaction(tuple((c,) for c in combo), (f,)) for combo, f in self.end_members.items()]
        return self._terms(ends + list(self.interactions))

    @cached_property
    def _curie(self) -> _Expansion:
        return self._terms(list(self.magnetic.curie_K))

    @cached_property
    def _moment(self) -> _Expansion:
        return self._terms(list(self.magnetic.moment))

    def _functions(self) -> list[TemperatureFunction]:
        out = list(self.end_members.values())
        terms = self.interactions + (self.magnetic.curie_K + self.magnetic.moment if self.magnetic else ())
        for term in terms:
            out.extend(term.coefficients)
        return out

    def valid_range_K(self) -> tuple[float, float]:
        """Temperatures (K) where every function of the phase is defined."""
        funcs = self._functions()
        return max(f.lower_K for f in funcs), min(f.upper_K for f in funcs)

    # --- evaluation -------------------------------------------------------------------------
    def at(self, T: float) -> "SublatticeAtT":
        """The phase at temperature T (K); the last few temperatures are remembered."""
        cache = self._at_cache
        found = cache.get(T)
        if found is None:
            if len(cache) >= 16:
                cache.pop(next(iter(cache)))
            found = cache[T] = SublatticeAtT(self, T)
        return found

    @cached_property
    def sample_sites(self) -> tuple[np.ndarray, np.ndarray, np.ndarray]:
        """(Y, X, atoms): the sample site fractions (k, n_vars), their mole fractions (k,
        n_elements) and atoms per formula unit (k,); the same at every temperature (see
        `SublatticeAtT.samples`)."""
        dims = [len(held) - 1 for held in self.constituents]
        total = sum(dims)
        per_lattice = [_simplex_points(len(held), SAMPLE_BUDGET ** (d / total) if total else 1)
                       for held, d in zip(self.constituents, dims)]
        counts = [len(p) for p in per_lattice]
        if math.prod(counts) <= 4 * SAMPLE_BUDGET:
            index = np.array(list(itertools.product(*[range(c) for c in counts])), dtype=np.intp)
        else:   # a phase of many sublattices: a fixed pseudo-random choice among the combinations
            rng = np.random.default_rng(0)
            index = np.stack([rng.integers(0, c, 4 * SAMPLE_BUDGET) for c in counts], axis=1)
        Y = np.concatenate([p[index[:, s]] for s, p in enumerate(per_lattice)], axis=1)
        moles = Y @ self.element_matrix
        atoms = moles.sum(axis=1)
        keep = atoms > 1e-9
        return Y[keep], moles[keep] / atoms[keep, None], atoms[keep]

    @cached_property
    def _sample_basis(self) -> tuple[np.ndarray, tuple[np.ndarray, np.ndarray] | None] | None:
        """The samples' G without its temperature: (B, magnetic) with G per mole of atoms (but the
        magnetic term) B @ [C(T).ravel(), R T]: B[k, (t, j)] = monomial_t(y_k) s_t(y_k)^j / atoms_k,
        the last column the entropy sum / atoms_k (one product at each temperature); the bases of
        Tc and beta (per formula unit, without the division) where the phase is magnetic; None
        where a basis would be large (then G is evaluated afresh)."""
        Y, _X, atoms = self.sample_sites
        expansions = [self._energy] + ([self._curie, self._moment] if self.magnetic is not None else [])
        if any(len(Y) * e.n_terms * e.order > 4_000_000 for e in expansions):
            return None
        padded = np.concatenate([Y, np.ones((len(Y), 1))], axis=1)

        def basis(e: _Expansion) -> np.ndarray:
            monomial = padded[:, e.members].prod(axis=-1)
            s = Y @ e.slopes.T + e.offsets
            return (monomial[..., None] * s[..., None] ** np.arange(e.order)).reshape(len(Y), -1)

        magnetic = (basis(self._curie), basis(self._moment)) if self.magnetic is not None else None
        energy = np.column_stack([basis(self._energy), _xlogx(Y) @ self._site_weights]) / atoms[:, None]
        return np.asfortranarray(energy), magnetic


def _axis_levels(n_log: int, n_mid: int) -> np.ndarray:
    """Values in [0, 1]: n_mid + 1 evenly spaced, and n_log log-spaced from SAMPLE_SMALLEST to 0.05
    near both ends."""
    low = np.logspace(math.log10(SAMPLE_SMALLEST), math.log10(0.05), n_log) if n_log else np.zeros(0)
    mid = np.linspace(0.0, 1.0, n_mid + 1) if n_mid > 1 else np.array([0.5])
    return np.unique(np.concatenate([[0.0, 1.0], low, mid, 1.0 - low]))


#: Level sets tried, finest first, until a simplex's points fit its budget.
_LEVEL_CHOICES = ((40, 300), (24, 120), (12, 60), (10, 40), (8, 30), (7, 20), (6, 14), (5, 10), (4, 7), (3, 5), (2, 3),
                  (1, 1), (0, 1))


def _simplex_points(n: int, budget: float) -> np.ndarray:
    """Points of the (n-1)-simplex (rows sum to 1), dense near its corners and edges, about
    `budget` of them at most: every coordinate but one from the level set (log-spaced near 0 and
    1), the remaining one closing the sum, for each choice of the remaining one. Where only a
    coarse level set fits the budget (many constituents), every edge is sampled on a fine level set
    instead and the interior at fixed pseudo-random points."""
    if n == 1:
        return np.ones((1, 1))
    points = np.vstack([np.eye(n), np.full((1, n), 1.0 / n)])    # the corners and the centre, at least
    fine = False
    for n_log, n_mid in _LEVEL_CHOICES:
        levels = _axis_levels(n_log, n_mid)
        rows = len(levels) ** (n - 1)
        if rows > 250 * budget or n * rows / math.factorial(n - 1) > 6 * budget:   # too many, before and
            continue                                                                # after the sum <= 1
        grid = np.stack(np.meshgrid(*[levels] * (n - 1), indexing="ij"), axis=-1).reshape(-1, n - 1)
        grid = grid[grid.sum(axis=1) <= 1.0]
        if n * len(grid) > 3 * budget:      # too many even after removing duplicates
            continue
        rest = 1.0 - grid.sum(axis=1)
        rest[rest < 1e-12] = 0.0
        candidate = np.unique(np.concatenate([np.insert(grid, d, rest, axis=1) for d in range(n)]), axis=0)
        if len(candidate) <= budget:
            points, fine = candidate, len(levels) >= 12
            break
    if not fine:
        t = _axis_levels(6, 9)[1:-1]
        edges = []
        for i, j in itertools.combinations(range(n), 2):
            e = np.zeros((len(t), n))
            e[:, i], e[:, j] = t, 1.0 - t
            edges.append(e)
        interior = np.random.default_rng(n).dirichlet(np.full(n, 0.7), size=max(int(budget) - len(points), 0))
        points = np.unique(np.concatenate([points] + edges + [interior]), axis=0)[: max(int(budget), n + 1)]
        points = np.concatenate([np.eye(n), points])
    return points / points.sum(axis=1, keepdims=True)


class SublatticeAtT:
    """A SublatticePhase at one temperature, vectorised over the leading axes of y.

    G is in J per mole of formula units; y holds every site fraction in the order of `groups`.
    The logarithms are safe at y = 0 in `gibbs` (0 ln 0 = 0); the gradient and Hessian are finite
    for y >= 1e-300.
    """

    def __init__(self, phase: SublatticePhase, T: float) -> None:
        self.phase = phase
        self.T = float(T)
        self.RT = R * self.T
        self.n_vars = phase.n_vars
        self.groups = phase.groups
        self.element_matrix = phase.element_matrix
        self._C = phase._energy.coefficients(self.T)
        self._weights = phase._site_weights
        mag = phase.magnetic
        if mag is not None:
            self._C_curie = phase._curie.coefficients(self.T)
            self._C_moment = phase._moment.coefficients(self.T)

    @cached_property
    def _eye(self) -> np.ndarray:
        """The identity of the site fractions (the entropy's Hessian over many points)."""
        return np.eye(self.n_vars)

    # --- magnetic part ----------------------------------------------------------------------
    def _magnetic(self, y: np.ndarray, order: int, values: tuple[np.ndarray, np.ndarray] | None = None):
        """(G, gradient, Hessian) of the magnetic term (J/mol f.u.) up to `order`; `values` may
        hold Tc and beta at y already (order 0)."""
        mag = self.phase.magnetic
        if values is not None:
            (tc, be), gtc, htc, gbe, hbe = values, None, None, None, None
        else:
            tc, gtc, htc = self.phase._curie.evaluate(y, self._C_curie, order)
            be, gbe, hbe = self.phase._moment.evaluate(y, self._C_moment, order)
        k_tc = np.where(tc < 0.0, 1.0 / mag.antiferro_factor, 1.0)
        k_be = np.where(be < 0.0, 1.0 / mag.antiferro_factor, 1.0)
        tc, be = tc * k_tc, be * k_be
        active = tc > 1e-9
        tc_safe = np.where(active, tc, 1.0)
        tau = np.where(active, self.T / tc_safe, 1e9)
        f, f1, f2 = hillert_jarl(tau, mag.above_curie_fraction, order)
        u = np.log1p(be)
        g = np.where(active, self.RT * u * f, 0.0)
        if order == 0:
            return g, None, None
        gtc, gbe = gtc * k_tc[..., None], gbe * k_be[..., None]
        u1 = 1.0 / (1.0 + be)
        dtau = -(tau / tc_safe)[..., None] * gtc
        grad = self.RT * ((u1 * f)[..., None] * gbe + (u * f1)[..., None] * dtau)
        grad = np.where(active[..., None], grad, 0.0)
        if order == 1:
            return g, grad, None
        htc, hbe = htc * k_tc[..., None, None], hbe * k_be[..., None, None]
        outer = lambda a, b: a[..., :, None] * b[..., None, :]  # noqa: E731
        d2tau = (-(tau / tc_safe)[..., None, None] * htc
                 + (2.0 * tau / tc_safe**2)[..., None, None] * outer(gtc, gtc))
        cross = outer(gbe, dtau)
        hess = self.RT * ((-u1 * u1 * f)[..., None, None] * outer(gbe, gbe)
                          + (u1 * f)[..., None, None] * hbe
                          + (u1 * f1)[..., None, None] * (cross + np.swapaxes(cross, -1, -2))
                          + (u * f2)[..., None, None] * outer(dtau, dtau)
                          + (u * f1)[..., None, None] * d2tau)
        return g, grad, np.where(active[..., None, None], hess, 0.0)

    @cached_property
    def _magnetic_C_dT(self) -> tuple[np.ndarray, np.ndarray]:
        """dC/dT of the Curie temperature's and the moment's coefficients at this temperature."""
        return (self.phase._curie.coefficients(self.T, derivative=True),
                self.phase._moment.coefficients(self.T, derivative=True))

    def _magnetic_dT(self, y: np.ndarray) -> np.ndarray:
        """d G_mag / dT (J/(mol f.u. K)) at fixed y, including the temperature dependence of the
        Tc and beta coefficients."""
        mag = self.phase.magnetic
        ph = self.phase
        tc = ph._curie.evaluate(y, self._C_curie)[0]
        be = ph._moment.evaluate(y, self._C_moment)[0]
        tc_T = ph._curie.evaluate(y, self._magnetic_C_dT[0])[0]
        be_T = ph._moment.evaluate(y, self._magnetic_C_dT[1])[0]
        k_tc = np.where(tc < 0.0, 1.0 / mag.antiferro_factor, 1.0)
        k_be = np.where(be < 0.0, 1.0 / mag.antiferro_factor, 1.0)
        tc, tc_T, be, be_T = tc * k_tc, tc_T * k_tc, be * k_be, be_T * k_be
        active = tc > 1e-9
        tc_safe = np.where(active, tc, 1.0)
        tau = np.where(active, self.T / tc_safe, 1e9)
        f, f1, _f2 = hillert_jarl(tau, mag.above_curie_fraction, 1)
        u = np.log1p(be)
        tau_T = tau * (1.0 / self.T - tc_T / tc_safe)
        d = R * u * f + self.RT * (be_T / (1.0 + be) * f + u * f1 * tau_T)
        return np.where(active, d, 0.0)

    # --- public -----------------------------------------------------------------------------
    def gibbs(self, y: np.ndarray) -> np.ndarray:
        """G (J per mole of formula units), shape y.shape[:-1]."""
        return self._up_to(y, 0)[0]

    def gradient(self, y: np.ndarray) -> np.ndarray:
        """dG/dy (J/mol f.u.), shape (..., n_vars)."""
        return self._up_to(y, 1)[1]

    def element_potentials(self, x: np.ndarray) -> np.ndarray:
        """Chemical potentials (J/mol) of the elements at mole fractions x (..., n elements) of a
        phase of one sublattice whose constituents are the elements (a substitutional solution
        such as a liquid): mu_i = G + dG/dx_i - sum_j x_j dG/dx_j; NaN for an element of x = 0.
        Raises ValueError for another kind of phase."""
        E = np.asarray(self.element_matrix, dtype=float)
        if len(self.groups) != 1 or E.shape[0] != E.shape[1] or abs(np.linalg.det(E)) < 1e-12:
            raise ValueError(f"phase {self.phase.name} is not a substitutional solution of the elements")
        rows = np.linalg.inv(E)
        x = np.asarray(x, dtype=float)
        present = x > 0.0
        with np.errstate(divide="ignore", invalid="ignore"):
            y = x @ rows
            G = self.gibbs(y)
            g = np.where(y > 0.0, self.gradient(y), 0.0) @ rows.T    # an absent constituent's -inf left out
            mean = np.sum(np.where(present, x * g, 0.0), axis=-1)
        return np.where(present, G[..., None] + g - mean[..., None], np.nan)

    def hessian(self, y: np.ndarray) -> np.ndarray:
        """d2G/dy2 (J/mol f.u.), shape (..., n_vars, n_vars)."""
        return self._up_to(y, 2)[2]

    def derivatives(self, y: np.ndarray) -> tuple[np.ndarray, np.ndarray, np.ndarray]:
        """(G, gradient, Hessian) in one pass (cheaper than the three calls in a Newton step)."""
        return self._up_to(y, 2)

    @cached_property
    def _rt_weights(self) -> np.ndarray:
        """RT times each site fraction's site ratio (J/mol): the entropy term's weights at T."""
        return self.RT * self._weights

    @cached_property
    def _energy_monomials(self) -> tuple[np.ndarray, np.ndarray]:
        """(E, c): the energy's monomial exponents and their coefficients at this temperature."""
        E, Q = self.phase._energy.monomials
        return E, Q @ self._C.ravel()

    def _up_to(self, y: np.ndarray, order: int):
        """G and its derivatives in y up to `order` (None beyond). One point with every site
        fraction positive (Newton's iterates) takes the monomial form."""
        y = np.asarray(y, dtype=float)
        if y.ndim == 1 and y.min() > 0.0:
            E, c = self._energy_monomials
            log_y = np.log(y)
            g, grad, hess = _Expansion.evaluate_at(y, E, c, order, log_y)
            rt_w = self._rt_weights
            g = g + rt_w @ (y * log_y)
            if order >= 1:
                grad = grad + rt_w * (log_y + 1.0)
            if order >= 2:
                hess.flat[::len(y) + 1] += rt_w / y
        else:
            g, grad, hess = self.phase._energy.evaluate(y, self._C, order)
            g = g + self.RT * (_xlogx(y) @ self._weights)
            if order >= 1:
                grad = grad + self.RT * self._weights * (np.log(y) + 1.0)
            if order >= 2:
                hess = hess + (self.RT * self._weights / y)[..., :, None] * self._eye
        if self.phase.magnetic is not None:
            mg, mgrad, mhess = self._magnetic(y, order)
            g = g + mg
            grad = grad + mgrad if order >= 1 else grad
            hess = hess + mhess if order >= 2 else hess
        return g, grad, hess

    @cached_property
    def _C_dT(self) -> np.ndarray:
        """dC/dT of the energy's coefficients at this temperature (J/(mol f.u. K))."""
        return self.phase._energy.coefficients(self.T, derivative=True)

    @cached_property
    def _energy_monomials_dT(self) -> np.ndarray:
        """The coefficients of the energy's monomials' temperature derivative at this temperature."""
        return self.phase._energy.monomials[1] @ self._C_dT.ravel()

    def gibbs_dT(self, y: np.ndarray) -> np.ndarray:
        """dG/dT at fixed y (J/(mol f.u. K)); the enthalpy is H = G - T dG/dT."""
        y = np.asarray(y, dtype=float)
        if y.ndim == 1 and y.min() > 0.0:       # one point inside the simplex: the monomial form
            log_y = np.log(y)
            d = _Expansion.evaluate_at(y, self.phase._energy.monomials[0], self._energy_monomials_dT, 0, log_y)[0]
            d = d + R * (self._weights @ (y * log_y))
        else:
            d = self.phase._energy.evaluate(y, self._C_dT)[0] + R * (_xlogx(y) @ self._weights)
        if self.phase.magnetic is not None:
            d = d + self._magnetic_dT(y)
        return d

    @cached_property
    def _samples(self) -> tuple[np.ndarray, np.ndarray, np.ndarray]:
        Y, X, atoms = self.phase.sample_sites
        basis = self.phase._sample_basis
        if basis is None:
            return Y, X, self.gibbs(Y) / atoms
        B, magnetic = basis
        g = B @ np.append(self._C.ravel(), self.RT)
        if magnetic is not None:
            values = (magnetic[0] @ self._C_curie.ravel(), magnetic[1] @ self._C_moment.ravel())
            g = g + self._magnetic(Y, 0, values)[0] / atoms
        return Y, X, g

    def samples(self) -> tuple[np.ndarray, np.ndarray, np.ndarray]:
        """(Y, X, G): site fractions (k, n_vars), mole fractions per mole of atoms (k, n_elements)
        and G per mole of atoms (k,), dense near the corners and edges of every sublattice's
        simplex (down to about 1e-6 from each pure constituent); computed once per temperature."""
        return self._samples
