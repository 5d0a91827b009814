"""Phase models: substitutional solutions and stoichiometric compounds.

Compositions are mole fractions with the elements on the last axis, shape (..., n_elements). The
mole fractions of the two elements of a binary are always carried as two separately computed
numbers (never 1 - x recomputed from a stored x) so that compositions within 1e-20 of a pure
element keep their digits.

Derivatives "in x" are taken along the binary direction: B replaces A, so dx_B = -dx_A.
All energies in J per mole of atoms, temperatures in K.
"""

from __future__ import annotations

import math
from dataclasses import dataclass, field
from functools import cached_property

import numpy as np

from .magnetic import hillert_jarl, where
from .polynomials import TemperatureFunction
from ..units import GAS_CONSTANT as R


#: The element pair of a binary's interaction parameters (indices into `elements`).
BINARY_PAIR = (0, 1)


def _xlogx(x: np.ndarray) -> np.ndarray:
    if isinstance(x, float):
        return x * math.log(x) if x > 0.0 else 0.0
    safe = np.where(x > 0.0, x, 1.0)
    return np.where(x > 0.0, x * np.log(safe), 0.0)


def _log(x):
    """Natural log of a Python float (fast path for scalar Newton loops) or of an array."""
    return math.log(x) if isinstance(x, float) else np.log(x)


def redlich_kister(L: list[float], xa: np.ndarray, xb: np.ndarray) -> np.ndarray:
    """Excess Gibbs energy xA xB sum_k L[k] (xA - xB)^k (J/mol).

    O. Redlich and A.T. Kister, Ind. Eng. Chem. 40 (1948) 345-348.
    """
    d = xa - xb
    total = 0.0 * d
    for Lk in reversed(L):          # Horner in (xA - xB)
        total = total * d + Lk
    return xa * xb * total


def redlich_kister_derivative(L: list[float], xa: np.ndarray, xb: np.ndarray, order: int) -> np.ndarray:
    """d^n G/dxB^n (n = order, 1 or 2; J/mol) of the Redlich-Kister excess along x_B."""
    p = xa * xb
    d = xa - xb
    out = 0.0 * p
    for k, Lk in enumerate(L):
        if Lk == 0.0:
            continue
        if order == 1:
            term = d ** (k + 1) - (2 * k * p * d ** (k - 1) if k >= 1 else 0.0)
        else:
            term = -2 * (2 * k + 1) * d**k + (4 * k * (k - 1) * p * d ** (k - 2) if k >= 2 else 0.0)
        out = out + Lk * term
    return out


def redlich_kister_potentials(L: list[float], xa: np.ndarray, xb: np.ndarray) -> tuple[np.ndarray, np.ndarray]:
    """Partial molar excess energies (mu_A, mu_B) in closed form (J/mol), without the
    G - x dG/dx subtraction that loses digits."""
    d = xa - xb
    mua = mub = 0.0 * d
    for k, Lk in enumerate(L):
        if Lk == 0.0:
            continue
        if k == 0:
            mua = mua + Lk * xb * xb
            mub = mub + Lk * xa * xa
        else:
            dkm1 = d ** (k - 1)
            mua = mua + Lk * xb * xb * dkm1 * ((2 * k + 1) * xa - xb)
            mub = mub + Lk * xa * xa * dkm1 * (xa - (2 * k + 1) * xb)
    return mua, mub


@dataclass(frozen=True)
class MagneticModel:
    """Composition-dependent Curie temperature (K) and mean moment (Bohr magnetons) of a phase."""

    above_curie_fraction: float
    curie_K: np.ndarray          # per element
    moment: np.ndarray           # per element
    curie_L: dict[tuple[int, int], tuple[TemperatureFunction, ...]] = field(default_factory=dict)
    moment_L: dict[tuple[int, int], tuple[TemperatureFunction, ...]] = field(default_factory=dict)
    antiferro_factor: float = -3.0


@dataclass(frozen=True)
class SolutionPhase:
    """Substitutional solution: ideal mixing, Redlich-Kister excess, optional magnetic term.

    `endmembers[i]` is the Gibbs energy of pure element i in this structure (J/mol);
    `interactions[(i, j)]` is the Redlich-Kister series L[0], L[1], ... (J/mol) of the element
    pair (i, j), i < j (indices into `elements`): one pair in a binary, three in a ternary.
    The evaluation below is the binary's (pair (0, 1)); a ternary adds its pairs here.
    """

    name: str
    elements: tuple[str, ...]
    endmembers: tuple[TemperatureFunction, ...]
    interactions: dict[tuple[int, int], tuple[TemperatureFunction, ...]] = field(default_factory=dict)
    magnetic: MagneticModel | None = None
    kind: str = field(default="solution", init=False)

    def at(self, T: float) -> "SolutionAtT":
        """The phase with all temperature-dependent coefficients evaluated at T (K)."""
        return SolutionAtT(self, T)

    @cached_property
    def temperature_functions(self) -> tuple[TemperatureFunction, ...]:
        """Every function of T that `at` evaluates, in the order `SolutionAtT` takes their values:
        the two end members, the binary's Redlich-Kister series, then the magnetic term's Tc and
        beta series where there is one."""
        mag = self.magnetic
        magnetic = () if mag is None else mag.curie_L.get(BINARY_PAIR, ()) + mag.moment_L.get(BINARY_PAIR, ())
        return self.endmembers[:2] + self.binary_terms + magnetic

    @cached_property
    def binary_terms(self) -> tuple[TemperatureFunction, ...]:
        """The Redlich-Kister series L[0], L[1], ... of the binary's element pair."""
        return self.interactions.get(BINARY_PAIR, ())

    @cached_property
    def magnetic_parameters_constant(self) -> bool:
        """Whether the magnetic term's Tc and beta (K, Bohr magnetons) do not depend on
        temperature (every composition term of theirs a constant): then they can be tabulated
        once over a composition grid (`SolutionAtT.magnetic_shape`)."""
        mag = self.magnetic
        return mag is not None and all(f.is_constant for terms in (*mag.curie_L.values(), *mag.moment_L.values())
                                       for f in terms)

    def valid_range_K(self) -> tuple[float, float]:
        funcs = self.endmembers + sum(self.interactions.values(), ())
        if self.magnetic:
            funcs = funcs + sum(self.magnetic.curie_L.values(), ()) + sum(self.magnetic.moment_L.values(), ())
        return max(f.lower_K for f in funcs), min(f.upper_K for f in funcs)


class SolutionAtT:
    """A solution phase at one temperature; vectorised over compositions."""

    __slots__ = ("phase", "T", "RT", "g0a", "g0b", "L", "curie_L", "moment_L", "_pure_curie", "_pure_moment", "_dT")

    def __init__(self, phase: SolutionPhase, T: float, values: list[float] | None = None,
                 derivatives: list[float] | None = None) -> None:
        """`values` and `derivatives`: the phase's `temperature_functions` and their dG/dT at T,
        in their order, where they were evaluated together with other phases' (`FunctionStack`);
        else each is evaluated here (the derivatives on first use)."""
        self.phase = phase
        self.T = T
        self.RT = R * T
        if values is None:
            values = [f.value(T) for f in phase.temperature_functions]
        self.g0a, self.g0b = values[0], values[1]
        n = 2 + len(phase.binary_terms)
        self.L = values[2:n]
        mag = phase.magnetic
        if mag is not None:
            m = n + len(mag.curie_L.get(BINARY_PAIR, ()))
            self.curie_L = values[n:m]
            self.moment_L = values[m:]
            # the pure elements' Tc and beta as Python floats: scalar Newton steps stay in floats
            self._pure_curie = tuple(float(v) for v in mag.curie_K[:2])
            self._pure_moment = tuple(float(v) for v in mag.moment[:2])
        self._dT: tuple[tuple[float, float], list[float]] | None = (
            None if derivatives is None else ((derivatives[0], derivatives[1]), derivatives[2:n]))

    @property
    def _temperature_derivatives(self) -> tuple[tuple[float, float], list[float]]:
        """(dG_A/dT, dG_B/dT) of the pure elements and dL[k]/dT, J/(mol K), computed on first use
        (a plain attribute: most phases of a section never need them)."""
        if self._dT is None:
            T = self.T
            end_a, end_b = self.phase.endmembers[:2]
            self._dT = ((end_a.derivative(T), end_b.derivative(T)), [f.derivative(T) for f in self.phase.binary_terms])
        return self._dT

    # --- magnetic part -------------------------------------------------------------------
    def _curie_and_moment(self, xa: np.ndarray, xb: np.ndarray, order: int):
        """Tc and beta with their derivatives along x_B up to `order` (0, 1 or 2; zeros beyond
        it), antiferromagnetic values divided by the factor, and where the term is active, the
        safe Tc and tau = T/Tc."""
        mag = self.phase.magnetic
        tc, tc1, tc2 = self._linear_plus_excess(self._pure_curie, self.curie_L, xa, xb, order)
        be, be1, be2 = self._linear_plus_excess(self._pure_moment, self.moment_L, xa, xb, order)
        sign_tc = where(tc < 0.0, 1.0 / mag.antiferro_factor, 1.0)
        sign_be = where(be < 0.0, 1.0 / mag.antiferro_factor, 1.0)
        tc, be = tc * sign_tc, be * sign_be
        if order:
            tc1, tc2 = tc1 * sign_tc, tc2 * sign_tc
            be1, be2 = be1 * sign_be, be2 * sign_be
        active = tc > 1e-9
        tc_safe = where(active, tc, 1.0)
        tau = where(active, self.T / tc_safe, 1e9)
        return (tc1, tc2), (be, be1, be2), active, tc_safe, tau

    def magnetic_parameters(self, xa: np.ndarray, xb: np.ndarray) -> tuple[np.ndarray, np.ndarray, np.ndarray]:
        """(active, Tc, ln(1 + beta)) of the magnetic term at the compositions: where Tc > 0 (K),
        Tc there (1 elsewhere), and the moment's logarithm. They depend on temperature only
        where the phase's `magnetic_parameters_constant` is False."""
        _tc, (be, _b1, _b2), active, tc_safe, _tau = self._curie_and_moment(xa, xb, 0)
        return active, tc_safe, _log(1.0 + be)

    def magnetic_gibbs(self, xa: np.ndarray, xb: np.ndarray) -> np.ndarray:
        """G of the magnetic term alone (J/mol): the value-only path of `gibbs`."""
        active, tc_safe, u = self.magnetic_parameters(xa, xb)
        tau = where(active, self.T / tc_safe, 1e9)
        g = self.RT * u * hillert_jarl(tau, self.phase.magnetic.above_curie_fraction, 0)[0]
        return where(active, g, 0.0 * g)

    def magnetic_scaled_curvature(self, xa: np.ndarray, xb: np.ndarray) -> np.ndarray:
        """xA xB d2G/dx_B2 of the magnetic term alone (J/mol)."""
        active, _u, _u1, _f, _f1, _tau1, g2 = self._magnetic_pieces(xa, xb)
        return xa * xb * where(active, g2, 0.0 * g2)

    def magnetic_shape(self, xa: np.ndarray, xb: np.ndarray, order: int = 2) -> tuple:
        """(active, Tc, dTc/dx_B, d2Tc/dx_B2, ln(1 + beta), and its first two derivatives along
        x_B) of the magnetic term at the compositions (K and Bohr magnetons; Tc is 1 where the
        term is not active): all that its value and composition derivatives take besides the
        temperature; with `order` 1 the second derivatives are 0 (not computed). They depend on
        temperature only where the phase's `magnetic_parameters_constant` is False."""
        (tc1, tc2), (be, be1, be2), active, tc_safe, _tau = self._curie_and_moment(xa, xb, order)
        u1 = be1 / (1.0 + be)
        u2 = be2 / (1.0 + be) - u1 * u1 if order == 2 else 0.0
        return active, tc_safe, tc1, tc2, _log(1.0 + be), u1, u2

    def _magnetic_pieces(self, xa: np.ndarray, xb: np.ndarray, order: int = 2) -> tuple:
        """(active, ln(1 + beta), its x_B derivative, f(tau), f'(tau), dtau/dx_B, d2G/dx_B2 where
        active) of the magnetic term: what its value and derivatives are formed from; with
        `order` 1 the second derivative is None (not computed)."""
        active, tc_safe, tc1, tc2, u, u1, u2 = self.magnetic_shape(xa, xb, order)
        tau = where(active, self.T / tc_safe, 1e9)
        f, f1, f2 = hillert_jarl(tau, self.phase.magnetic.above_curie_fraction, order)
        tau1 = -tau * tc1 / tc_safe
        g2 = None
        if order == 2:
            tau2 = -tau * tc2 / tc_safe + 2.0 * tau * (tc1 / tc_safe) ** 2
            g2 = self.RT * (u2 * f + 2.0 * u1 * f1 * tau1 + u * (f2 * tau1 * tau1 + f1 * tau2))
        return active, u, u1, f, f1, tau1, g2

    def _magnetic(self, xa: np.ndarray, xb: np.ndarray, order: int = 2) -> tuple[np.ndarray, ...]:
        """(G, dG/dx, d2G/dx2) of the magnetic term along x_B (J/mol; arrays, or floats): what
        chemical potentials and curvatures need, without the temperature derivatives; with
        `order` 1 (chemical potentials and slopes) d2G/dx2 is None and not computed."""
        active, u, u1, f, f1, tau1, g2 = self._magnetic_pieces(xa, xb, order)
        RT = self.RT
        g = RT * u * f
        g1 = RT * (u1 * f + u * f1 * tau1)
        return tuple(None if v is None else where(active, v, 0.0 * v) for v in (g, g1, g2))

    def _magnetic_dT(self, xa: np.ndarray, xb: np.ndarray, order: int = 2) -> tuple[np.ndarray, np.ndarray]:
        """(dG/dT, d2G/dx dT) of the magnetic term (J/(mol K)); with order 0 the second is 0.
        Tc and beta are taken as independent of T (tau = T/Tc, so d tau/dT = tau/T)."""
        (tc1, _tc2), (be, be1, _be2), active, tc_safe, tau = self._curie_and_moment(xa, xb, min(order, 1))
        f, f1, f2 = hillert_jarl(tau, self.phase.magnetic.above_curie_fraction, 1 if order == 0 else 2)
        u = _log(1.0 + be)
        g_dT = R * u * (f + tau * f1)
        if order == 0:
            return where(active, g_dT, 0.0 * g_dT), 0.0
        u1 = be1 / (1.0 + be)
        tau1 = -tau * tc1 / tc_safe
        g1_dT = R * (u1 * (f + tau * f1) + u * tau1 * (2.0 * f1 + tau * f2))
        return tuple(where(active, v, 0.0 * v) for v in (g_dT, g1_dT))

    @staticmethod
    def _linear_plus_excess(pure: tuple[float, float], L: list[float], xa: np.ndarray, xb: np.ndarray, order: int):
        """The composition-dependent Tc or beta and its derivatives along x_B up to `order` (0, 1
        or 2; zeros beyond it)."""
        value = xa * pure[0] + xb * pure[1] + redlich_kister(L, xa, xb)
        if order == 0:
            return value, 0.0, 0.0
        first = pure[1] - pure[0] + redlich_kister_derivative(L, xa, xb, 1)
        return value, first, redlich_kister_derivative(L, xa, xb, 2) if order == 2 else 0.0

    # --- public ------------------------------------------------------------------------
    def gibbs(self, xa: np.ndarray, xb: np.ndarray, mixing: np.ndarray | None = None) -> np.ndarray:
        """Molar Gibbs energy G (J/mol) at mole fractions (xa, xb).

        `mixing` may hold xa ln xa + xb ln xb already computed for these compositions."""
        g_ex = redlich_kister(self.L, xa, xb)
        if mixing is None:
            mixing = _xlogx(xa) + _xlogx(xb)
        g = xa * self.g0a + xb * self.g0b + self.RT * mixing + g_ex
        if self.phase.magnetic is not None:
            g = g + self.magnetic_gibbs(xa, xb)
        return g

    def curvature_coefficients(self, order: int) -> list[float]:
        """xA xB d2G/dx_B2 without its magnetic term as coefficients of 1 and of xA xB times the
        second derivative of (x_A - x_B)^k x_A x_B, k < order (J/mol; `order` at least len(L))."""
        return [self.RT] + self.L + [0.0] * (order - len(self.L))

    def potentials(self, xa: np.ndarray, xb: np.ndarray) -> tuple[np.ndarray, np.ndarray]:
        """Chemical potentials (mu_A, mu_B), J/mol, computed term by term."""
        mua, mub = redlich_kister_potentials(self.L, xa, xb)
        mua = self.g0a + self.RT * _log(xa) + mua
        mub = self.g0b + self.RT * _log(xb) + mub
        if self.phase.magnetic is not None:
            gm, gm1, _gm2 = self._magnetic(xa, xb, 1)
            mua = mua + gm - xb * gm1
            mub = mub + gm + xa * gm1
        return mua, mub

    def potentials_and_curvature(self, xa: float, xb: float) -> tuple[float, float, float]:
        """(mu_A, mu_B, xA xB d2G/dx_B2) in J/mol at one composition given as two Python floats:
        what each step of a tangent Newton solve needs, in one pass over the Redlich-Kister
        terms and one evaluation of the magnetic term. The same arithmetic, term by term, as
        `potentials` and `scaled_curvature`, without their array dispatch."""
        d = xa - xb
        p = xa * xb
        mua = mub = 0.0 * d
        g2 = 0.0 * p
        for k, Lk in enumerate(self.L):
            if Lk == 0.0:
                continue
            if k == 0:
                mua = mua + Lk * xb * xb
                mub = mub + Lk * xa * xa
                g2 = g2 + Lk * -2.0
                continue
            dkm1 = d ** (k - 1)
            mua = mua + Lk * xb * xb * dkm1 * ((2 * k + 1) * xa - xb)
            mub = mub + Lk * xa * xa * dkm1 * (xa - (2 * k + 1) * xb)
            g2 = g2 + Lk * (-2 * (2 * k + 1) * d**k + (4 * k * (k - 1) * p * d ** (k - 2) if k >= 2 else 0.0))
        RT = self.RT
        mua = self.g0a + RT * math.log(xa) + mua
        mub = self.g0b + RT * math.log(xb) + mub
        if self.phase.magnetic is not None:
            gm, gm1, gm2 = self._magnetic(xa, xb)
            mua = mua + gm - xb * gm1
            mub = mub + gm + xa * gm1
            g2 = g2 + gm2
        return mua, mub, RT + xa * xb * g2

    def potentials_dT(self, xa: np.ndarray, xb: np.ndarray) -> tuple[np.ndarray, np.ndarray]:
        """Temperature derivatives of the chemical potentials at fixed composition, d mu_A/dT and
        d mu_B/dT = -S_A, -S_B (J/(mol K)), term by term as `potentials` (Newton's methods that
        solve for temperature need them; no phase is rebuilt at neighbouring temperatures). The
        magnetic term's Tc and beta are taken as independent of T, as in `gibbs_dT`."""
        (da, db), L_dT = self._temperature_derivatives
        sa, sb = redlich_kister_potentials(L_dT, xa, xb)
        sa = da + R * _log(xa) + sa
        sb = db + R * _log(xb) + sb
        if self.phase.magnetic is not None:
            gm_dT, gm1_dT = self._magnetic_dT(xa, xb)
            sa = sa + gm_dT - xb * gm1_dT
            sb = sb + gm_dT + xa * gm1_dT
        return sa, sb

    def slope(self, xa: np.ndarray, xb: np.ndarray) -> np.ndarray:
        """dG/dx_B = mu_B - mu_A (J/mol), computed without subtracting two large numbers."""
        g1 = redlich_kister_derivative(self.L, xa, xb, 1)
        s = self.g0b - self.g0a + self.RT * (_log(xb) - _log(xa)) + g1
        if self.phase.magnetic is not None:
            s = s + self._magnetic(xa, xb, 1)[1]
        return s

    def scaled_curvature(self, xa: np.ndarray, xb: np.ndarray) -> np.ndarray:
        """xA xB d2G/dx_B2 (J/mol): the curvature in the variable y = ln(xB/xA)."""
        g2 = redlich_kister_derivative(self.L, xa, xb, 2)
        if self.phase.magnetic is not None:
            g2 = g2 + self._magnetic(xa, xb)[2]
        return self.RT + xa * xb * g2

    def curvature(self, xa: np.ndarray, xb: np.ndarray) -> np.ndarray:
        """d2G/dx_B2 (J/mol); negative inside a spinodal."""
        return self.scaled_curvature(xa, xb) / (xa * xb)

    def gibbs_dT(self, xa: np.ndarray, xb: np.ndarray) -> np.ndarray:
        """dG/dT = -S (J/(mol K)) at fixed composition."""
        (da, db), L_dT = self._temperature_derivatives
        g_ex_dT = redlich_kister(L_dT, xa, xb)
        s = xa * da + xb * db + R * (_xlogx(xa) + _xlogx(xb)) + g_ex_dT
        if self.phase.magnetic is not None:
            s = s + self._magnetic_dT(xa, xb, 0)[0]
        return s


@dataclass(frozen=True)
class CompoundPhase:
    """A stoichiometric compound: fixed composition, G = sum_i x_i G_i(reference) + formation (J/mol)."""

    name: str
    elements: tuple[str, ...]
    x: np.ndarray                              # mole fractions (sums to 1)
    references: tuple[TemperatureFunction, ...]  # pure-element G of each element's reference phase
    formation: TemperatureFunction
    kind: str = field(default="compound", init=False)

    @cached_property
    def temperature_functions(self) -> tuple[TemperatureFunction, ...]:
        """The formation energy and each element's reference, in the order `gibbs_from_values` takes their values."""
        return (self.formation, *self.references)

    @cached_property
    def _fractions(self) -> tuple[float, ...]:
        return tuple(np.asarray(self.x, dtype=float).tolist())

    def gibbs_from_values(self, values) -> float:
        """G (J per mole of atoms), or dG/dT, from the values (or temperature derivatives) of
        `temperature_functions` at one temperature, in their order."""
        g = values[0]
        for xi, v in zip(self._fractions, values[1:]):
            g += xi * v
        return g

    def gibbs(self, T: float) -> float:
        """Molar Gibbs energy (J per mole of atoms) at T (K)."""
        return self.gibbs_from_values([f.value(T) for f in self.temperature_functions])

    def gibbs_dT(self, T: float) -> float:
        """dG/dT (J/(mol K)) at T (K)."""
        return self.gibbs_from_values([f.derivative(T) for f in self.temperature_functions])

    def valid_range_K(self) -> tuple[float, float]:
        funcs = self.references + (self.formation,)
        return max(f.lower_K for f in funcs), min(f.upper_K for f in funcs)


Phase = SolutionPhase | CompoundPhase
