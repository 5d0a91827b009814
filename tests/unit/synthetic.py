"""Synthetic binary systems for the engine tests: written as TOML text (systems/FORMAT.md),
loaded with ladle.engine.load_system, and evaluated a second time here, independently of the
engine's phase models, so that the tests compare the engine against plain formulas.

Every temperature function here is one expression a + b T + c T ln T (J/mol, T in K) valid from
1 K to 6000 K. Elements are called A and B.
"""

from __future__ import annotations

import math
from dataclasses import dataclass, field
from pathlib import Path

import numpy as np

from ladle.engine import load_system
from ladle.engine.models.system import System

#: Molar gas constant, J/(mol K): CODATA 2018 exact value (E. Tiesinga et al., Rev. Mod. Phys. 93
#: (2021) 025010), written out here rather than taken from the engine.
R = 8.314462618
#: Molar masses used for the synthetic elements (g/mol): invented.
MOLAR_MASS = {"A": 60.0, "B": 30.0}
_TOP_K = 6000.0


def expression_value(coefficients: dict[str, float], T: float) -> float:
    """a + b T + c T ln T (J/mol) at T (K)."""
    unknown = set(coefficients) - {"a", "b", "c"}
    assert not unknown, f"synthetic expressions use only a, b, c; found {unknown}"
    return (coefficients.get("a", 0.0) + coefficients.get("b", 0.0) * T
            + coefficients.get("c", 0.0) * T * math.log(T))


def _toml_table(coefficients: dict[str, float]) -> str:
    return "{ " + ", ".join(f"{k} = {float(v)!r}" for k, v in coefficients.items()) + " }"


def fusion(enthalpy_J: float, melting_K: float) -> dict[str, float]:
    """dG = dH (1 - T / Tm) as {a, b}: the liquid's energy above the solid of a pure element
    (D.R. Gaskell and D.E. Laughlin, Introduction to the Thermodynamics of Materials, 6th ed.,
    CRC Press (2017), ch. 10; the usual approximation with equal heat capacities of liquid and
    solid)."""
    return {"a": enthalpy_J, "b": -enthalpy_J / melting_K}


def ideal_two_phase(dg_a: float, dg_b: float, T: float) -> tuple[float, float, float, float]:
    """Tie-line between two ideal solutions p and q at T (K), where dg_i = G_i(q) - G_i(p) is
    each pure element's energy of q above p (J/mol). Equal chemical potentials give, with
    k_i = exp(-dg_i / RT), x_B(p) = (1 - k_A) / (k_B - k_A) and x_B(q) = k_B x_B(p)
    (D.R. Gaskell and D.E. Laughlin, Introduction to the Thermodynamics of Materials, 6th ed.,
    CRC Press (2017), ch. 10). Written with expm1, and x_A of each phase computed on its own, so
    that it keeps its digits within a fraction of a kelvin of a melting point.

    Returns (x_B of p, x_A of p, x_B of q, x_A of q)."""
    em_a = math.expm1(-dg_a / (R * T))      # k_A - 1
    em_b = math.expm1(-dg_b / (R * T))      # k_B - 1
    width = em_b - em_a                     # k_B - k_A
    xp_b, xp_a = -em_a / width, em_b / width
    return xp_b, xp_a, (1.0 + em_b) * xp_b, (1.0 + em_a) * xp_a


@dataclass(frozen=True)
class Solution:
    """A substitutional solution: pure-element energies GA, GB and Redlich-Kister L[k],
    each {a, b, c} in J/mol."""

    name: str
    GA: dict[str, float]
    GB: dict[str, float]
    L: tuple[dict[str, float], ...] = ()

    def toml(self) -> str:
        lines = [f"[phase.{self.name}]", 'model = "solution"',
                 f"G.A = [ {_toml_table({'upto': _TOP_K, **self.GA})} ]",
                 f"G.B = [ {_toml_table({'upto': _TOP_K, **self.GB})} ]"]
        if self.L:
            lines.append("L = [ " + ", ".join(_toml_table(l or {"a": 0.0}) for l in self.L) + " ]")
        return "\n".join(lines)

    def gibbs(self, T: float, xa: np.ndarray, xb: np.ndarray) -> np.ndarray:
        """G (J/mol): ideal mixing plus the Redlich-Kister excess (O. Redlich and A.T. Kister,
        Ind. Eng. Chem. 40 (1948) 345)."""
        xa, xb = np.asarray(xa, dtype=float), np.asarray(xb, dtype=float)
        with np.errstate(divide="ignore", invalid="ignore"):
            mix = np.where(xa > 0, xa * np.log(np.where(xa > 0, xa, 1.0)), 0.0) \
                + np.where(xb > 0, xb * np.log(np.where(xb > 0, xb, 1.0)), 0.0)
        excess = sum(expression_value(l, T) * xa * xb * (xa - xb) ** k for k, l in enumerate(self.L))
        return xa * expression_value(self.GA, T) + xb * expression_value(self.GB, T) + R * T * mix + excess

    def potentials(self, T: float, xa: float, xb: float) -> tuple[float, float]:
        """Chemical potentials (mu_A, mu_B) in J/mol, from the partial molar form of the
        Redlich-Kister series up to L[2] (H.L. Lukas, S.G. Fries and B. Sundman, Computational
        Thermodynamics: The Calphad Method, Cambridge University Press (2007), ch. 5):
        mu_A = GA + RT ln xA + xB^2 [L0 + L1 (3xA - xB) + L2 (xA - xB)(5xA - xB)],
        mu_B = GB + RT ln xB + xA^2 [L0 - L1 (3xB - xA) + L2 (xA - xB)(xA - 5xB)]."""
        assert len(self.L) <= 3, "the partial molar form here goes up to L[2]"
        L = [expression_value(l, T) for l in self.L] + [0.0] * (3 - len(self.L))
        d = xa - xb
        mua = (expression_value(self.GA, T) + R * T * math.log(xa)
               + xb * xb * (L[0] + L[1] * (3 * xa - xb) + L[2] * d * (5 * xa - xb)))
        mub = (expression_value(self.GB, T) + R * T * math.log(xb)
               + xa * xa * (L[0] - L[1] * (3 * xb - xa) + L[2] * d * (xa - 5 * xb)))
        return mua, mub


@dataclass(frozen=True)
class Compound:
    """A stoichiometric compound A_m B_n; `references` names the solution of each element's
    reference energy; `formation` {a, b, c} J per mole of atoms."""

    name: str
    counts: tuple[int, int]
    references: tuple[str, str]
    formation: dict[str, float]

    @property
    def x_B(self) -> float:
        return self.counts[1] / (self.counts[0] + self.counts[1])

    def toml(self) -> str:
        m, n = self.counts
        formula = ("A" if m == 1 else f"A{m}") + ("B" if n == 1 else f"B{n}")
        return "\n".join([f"[phase.{self.name}]", 'model = "compound"', f'formula = "{formula}"',
                          f'reference = {{ A = "{self.references[0]}", B = "{self.references[1]}" }}',
                          f"formation = {_toml_table(self.formation)}"])


@dataclass
class Synthetic:
    """A synthetic system: its phases, the TOML text and (after `load`) the engine's System."""

    phases: list[Solution | Compound]
    temperature_range_K: tuple[float, float] | None = None
    system: System | None = field(default=None, repr=False)

    def toml(self) -> str:
        lines = ['elements = ["A", "B"]', f"molar_mass = {{ A = {MOLAR_MASS['A']}, B = {MOLAR_MASS['B']} }}",
                 'source = "Synthetic test system: invented parameters."']
        if self.temperature_range_K:
            lo, hi = self.temperature_range_K
            lines.append(f"temperature_range_K = [{float(lo)!r}, {float(hi)!r}]")
        return "\n".join(lines) + "\n\n" + "\n\n".join(p.toml() for p in self.phases) + "\n"

    def load(self, folder: Path, name: str) -> System:
        """Write the TOML text to folder/name.toml and load it with the engine's loader."""
        path = Path(folder) / f"{name}.toml"
        path.write_text(self.toml(), encoding="utf-8")
        self.system = load_system(path)
        return self.system

    def phase(self, name: str) -> Solution | Compound:
        return next(p for p in self.phases if p.name == name)

    def compound_gibbs(self, c: Compound, T: float) -> float:
        """G of a compound (J per mole of atoms): its references' pure-element energies plus
        the formation energy."""
        ga = expression_value(self.phase(c.references[0]).GA, T)
        gb = expression_value(self.phase(c.references[1]).GB, T)
        return (1.0 - c.x_B) * ga + c.x_B * gb + expression_value(c.formation, T)

    def phase_gibbs(self, name: str, T: float, x_B: float) -> float:
        """G (J/mol) of phase `name` at mole fraction x_B, evaluated here (not by the engine)."""
        p = self.phase(name)
        if isinstance(p, Compound):
            return self.compound_gibbs(p, T)
        return float(p.gibbs(T, 1.0 - x_B, x_B))
