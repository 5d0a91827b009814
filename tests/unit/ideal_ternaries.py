"""Invented ternary systems with closed-form equilibria, for the multicomponent solidification
tests: an ideal liquid with pure-element solids (a ternary eutectic system), and an ideal liquid
with an ideal solid solution (a ternary lens). Every number here is invented.

Pure elements: the solid is the zero of energy, the liquid's Gibbs energy of fusion is
dG_i(T) = dH_i (1 - T / Tm_i) (constant heat of fusion: D.R. Gaskell and D.E. Laughlin,
Introduction to the Thermodynamics of Materials, 6th ed., CRC Press (2017), ch. 10).

- Eutectic system: a liquid saturated with pure solid i holds x_i = a_i(T) = exp(-dG_i / RT)
  (the ideal freezing-point equation, Gaskell and Laughlin ch. 10 / 13); with the solids of a
  set S present, x_i = a_i for i in S and the liquid amount follows from the other elements'
  mass balance.
- Lens system: K_i = x_i(solid) / x_i(liquid) = exp(dG_i / RT); the solid fraction beta solves
  sum_i z_i (K_i - 1) / (1 + beta (K_i - 1)) = 0 (H.H. Rachford, J.D. Rice, J. Pet. Technol. 4
  (1952) 19), found here by bisection.

`equilibrate(system, T, x)` answers like the engine's, with each phase's site fractions and
models that give G and dG/dT (`system.models[name].at(T)`), for tests that run before the engine
or beside it. `write_system_files` writes the same eutectic system as a system file (Pb, Sn and
Bi stand for A, B and C, with the invented molar masses), and the shipped lead-tin binary with
bismuth added ideally, for tests and benchmarks through the engine itself.
"""

from __future__ import annotations

from itertools import combinations
from types import MethodType, SimpleNamespace

import numpy as np

from ladle.engine.models.system import System

R = 8.314462618            # J/(mol K), CODATA 2018
ELEMENTS = ("A", "B", "C")
MOLAR_MASS = np.array([60.0, 30.0, 45.0])         # g/mol, invented
MELTING_K = np.array([1300.0, 1100.0, 1000.0])    # invented
FUSION_J = np.array([12000.0, 10000.0, 9000.0])   # J/mol, invented
SOLIDS = ("alpha", "beta", "gamma")               # pure A, B, C


def fusion_gibbs(T: float) -> np.ndarray:
    """dG_i = G_liquid - G_solid of each pure element (J/mol) at T (K)."""
    return FUSION_J * (1.0 - T / MELTING_K)


def saturation(T: float) -> np.ndarray:
    """a_i(T): the mole fraction of i in the ideal liquid saturated with pure solid i."""
    return np.exp(-fusion_gibbs(T) / (R * T))


def partition(T: float) -> np.ndarray:
    """K_i(T) = x_i(solid) / x_i(liquid) of the ideal lens."""
    return np.exp(fusion_gibbs(T) / (R * T))


class _IdealAtT:
    """An ideal solution at T: G = sum y_i g_i + RT sum y_i ln y_i (J/mol), dG/dT likewise."""

    def __init__(self, g: np.ndarray, g_dT: np.ndarray, T: float) -> None:
        self.g, self.g_dT, self.T = g, g_dT, T
        self.element_matrix = np.eye(len(g))

    def gibbs(self, y):
        y = np.asarray(y, dtype=float)
        return float(y @ self.g + R * self.T * np.sum(np.where(y > 0, y * np.log(np.where(y > 0, y, 1.0)), 0.0)))

    def gibbs_dT(self, y):
        y = np.asarray(y, dtype=float)
        return float(y @ self.g_dT + R * np.sum(np.where(y > 0, y * np.log(np.where(y > 0, y, 1.0)), 0.0)))


class _PureAtT:
    """A pure-element solid (the zero of energy): one site fraction."""

    def __init__(self, i: int) -> None:
        self.element_matrix = np.eye(3)[i:i + 1]

    def gibbs(self, y):
        return 0.0

    def gibbs_dT(self, y):
        return 0.0


class _Model:
    def __init__(self, make) -> None:
        self.make = make

    def at(self, T: float):
        return self.make(T)


def _liquid_model() -> _Model:
    return _Model(lambda T: _IdealAtT(fusion_gibbs(T), -FUSION_J / MELTING_K, T))


class _StandIn(SimpleNamespace):
    """Hashable by identity, as System is (the trade's names are cached per system)."""

    __hash__ = object.__hash__


def _system(name: str, models: dict) -> SimpleNamespace:
    """A stand-in System covering every composition (its coverage tests are System's own), with an
    empty file document (no trade names)."""
    system = _StandIn(name=name, elements=ELEMENTS, molar_mass=MOLAR_MASS, models=models, title="",
                      safety="", temperature_range_K=(400.0, 1400.0), model_range_K=(1.0, 6000.0),
                      covers_K=(0.0, float("inf")), kind=name, alloys=(), covers_elements={},
                      element_ranges=np.array([[0.0, 1.0]] * len(ELEMENTS)), document={})
    system.covered = MethodType(System.covered, system)
    system.covered_range_text = MethodType(System.covered_range_text, system)
    return system


def eutectic_system() -> SimpleNamespace:
    models = {"liquid": _liquid_model()}
    models.update({s: _Model(lambda T, i=i: _PureAtT(i)) for i, s in enumerate(SOLIDS)})
    return _system("ideal-eutectic", models)


def lens_system() -> SimpleNamespace:
    models = {"liquid": _liquid_model(),
              "fcc": _Model(lambda T: _IdealAtT(np.zeros(3), np.zeros(3), T))}
    return _system("ideal-lens", models)


def _share(name: str, x: np.ndarray, amount: float, y: np.ndarray, z_mass: float) -> SimpleNamespace:
    w = x * MOLAR_MASS / (x @ MOLAR_MASS)
    return SimpleNamespace(name=name, x=x, w=w, amount_mol=amount, amount_mass=amount * (x @ MOLAR_MASS) / z_mass,
                           site_fractions=(y,))


def _result(T: float, z: np.ndarray, phases: list) -> SimpleNamespace:
    return SimpleNamespace(temperature_K=T, x=z, phases=tuple(phases), converged=True,
                           phase_names=tuple(p.name for p in phases))


def eutectic_equilibrium(T: float, z: np.ndarray) -> SimpleNamespace:
    """The stable phases of the eutectic system at T (K) for mole fractions z."""
    z = np.asarray(z, dtype=float)
    a = saturation(T)
    mass = float(z @ MOLAR_MASS)
    for k in range(0, 3):
        for S in combinations(range(3), k):
            rest = [j for j in range(3) if j not in S]
            denominator = 1.0 - sum(a[i] for i in S)
            f_L = sum(z[j] for j in rest) / denominator if denominator > 0 else -1.0
            if not 0.0 < f_L <= 1.0 + 1e-15:
                continue
            x_L = np.array([a[i] if i in S else z[i] / f_L for i in range(3)])
            solids = {i: z[i] - f_L * a[i] for i in S}
            if any(v < 0.0 for v in solids.values()) or any(x_L[j] > a[j] for j in rest):
                continue
            phases = [_share("liquid", x_L, min(f_L, 1.0), x_L, mass)]
            phases += [_share(SOLIDS[i], np.eye(3)[i], solids[i], np.ones(1), mass) for i in S]
            return _result(T, z, phases)
    return _result(T, z, [_share(SOLIDS[i], np.eye(3)[i], float(z[i]), np.ones(1), mass)
                          for i in range(3) if z[i] > 0.0])


def lens_equilibrium(T: float, z: np.ndarray) -> SimpleNamespace:
    """The stable phases of the lens system at T (K) for mole fractions z."""
    z = np.asarray(z, dtype=float)
    K = partition(T)
    mass = float(z @ MOLAR_MASS)
    if z @ K <= 1.0:
        return _result(T, z, [_share("liquid", z, 1.0, z, mass)])
    if z @ (1.0 / K) <= 1.0:
        return _result(T, z, [_share("fcc", z, 1.0, z, mass)])
    lo, hi = 0.0, 1.0            # Rachford-Rice: g(beta) decreases from sum z(K-1) > 0 to sum z(1-1/K) < 0
    for _ in range(200):
        beta = 0.5 * (lo + hi)
        if np.sum(z * (K - 1.0) / (1.0 + beta * (K - 1.0))) > 0.0:
            lo = beta
        else:
            hi = beta
        if hi - lo < 1e-16:
            break
    beta = 0.5 * (lo + hi)
    x_L = z / (1.0 + beta * (K - 1.0))
    x_S = K * x_L
    x_L, x_S = x_L / x_L.sum(), x_S / x_S.sum()
    return _result(T, z, [_share("liquid", x_L, 1.0 - beta, x_L, mass), _share("fcc", x_S, beta, x_S, mass)])


def equilibrate_for(system):
    """A stand-in for ladle.engine.equilibrate answering for `system` (one of the two above)."""
    solve = eutectic_equilibrium if system.name == "ideal-eutectic" else lens_equilibrium

    def equilibrate(_system, T: float, x, near=None) -> SimpleNamespace:
        return solve(float(T), np.asarray(x, dtype=float))     # `near` (a start) changes nothing here

    return equilibrate


EUTECTIC_FILE = """# Invented for tests: an ideal liquid and three pure-element solids (a ternary eutectic system).
elements = ["Pb", "Sn", "Bi"]
molar_mass = { Pb = 60.0, Sn = 30.0, Bi = 45.0 }
title = "Invented ideal ternary eutectic"
source = "Invented for tests; every number is made up: dG_fus = dH (1 - T/Tm), Tm 1300, 1100, 1000 K, dH 12, 10, 9 kJ/mol."
temperature_range_K = [400, 1400]

[phase.liquid]
model = "solution"
G.Pb = [ { upto = 6000, a = 12000.0, b = -9.230769230769231 } ]
G.Sn = [ { upto = 6000, a = 10000.0, b = -9.090909090909092 } ]
G.Bi = [ { upto = 6000, a = 9000.0, b = -9.0 } ]

[phase.alpha]
model = "compound"
formula = "Pb"
reference = { Pb = "fcc" }
formation = { a = 0.0 }

[phase.beta]
model = "compound"
formula = "Sn"
reference = { Sn = "bct" }
formation = { a = 0.0 }

[phase.gamma]
model = "compound"
formula = "Bi"
reference = { Bi = "rhombohedral" }
formation = { a = 0.0 }
"""

LEAD_TIN_BISMUTH_FILE = """# Invented for tests: the shipped lead-tin binary with bismuth added ideally (no Bi interaction
# terms), so that a ternary alloy without Bi must give the binary's answers.
elements = ["Pb", "Sn", "Bi"]
title = "Lead-tin with ideal bismuth (invented for tests)"
source = "pb-sn.toml as shipped; bismuth's energies from the element library, no interaction terms (invented for tests)."
builds_on = ["pb-sn.toml"]
molar_mass = { Bi = 208.98 }

[phase.liquid]
model = "solution"
G.Bi = "liquid"

[phase.fcc]
model = "solution"
G.Bi = "fcc"

[phase.bct]
model = "solution"
G.Bi = "bct"

[phase.rhombohedral]
model = "compound"
formula = "Bi"
reference = { Bi = "rhombohedral" }
formation = { a = 0.0 }
"""


#: The invented ideal eutectic with two compounds added, PbSn and PbBi (A0.5B0.5 and A0.5C0.5),
#: between 400 and 540 K (the liquid is nowhere stable there). In moles of atoms the four solids
#: PbSn, Bi, PbBi and Sn react as 2 PbBi + Sn = 2 PbSn + Bi, whose Gibbs energy of reaction is
#: 2 (G_f(PbBi) - G_f(PbSn)) = 2 (2000 - 4 T) J (the pure elements' energies cancel): a
#: four-solid invariant at exactly 500 K, PbBi + Sn -> PbSn + Bi on cooling (it gives off 4000 J).
FOUR_SOLIDS_FILE = EUTECTIC_FILE.replace("temperature_range_K = [400, 1400]", "temperature_range_K = [400, 540]") + """
[phase.PbSn]
model = "compound"
formula = "PbSn"
reference = { Pb = "fcc", Sn = "bct" }
formation = { a = -8000.0 }

[phase.PbBi]
model = "compound"
formula = "PbBi"
reference = { Pb = "fcc", Bi = "rhombohedral" }
formation = { a = -6000.0, b = -4.0 }
"""


def write_four_solids_file(folder):
    """FOUR_SOLIDS_FILE written as four-solids.toml into `folder`; returns its path."""
    from pathlib import Path

    path = Path(folder) / "four-solids.toml"
    path.write_text(FOUR_SOLIDS_FILE)
    return path


def write_system_files(folder) -> dict[str, object]:
    """Write the two system files into `folder`: {"ideal-eutectic": path, "pb-sn-bi": path}."""
    from pathlib import Path

    folder = Path(folder)
    paths = {"ideal-eutectic": folder / "ideal-eutectic.toml", "pb-sn-bi": folder / "pb-sn-bi.toml"}
    paths["ideal-eutectic"].write_text(EUTECTIC_FILE)
    paths["pb-sn-bi"].write_text(LEAD_TIN_BISMUTH_FILE)
    return paths


#: An invented covered range for the ideal eutectic (Pb the balance).
COVERS = "covers_at_percent = { Sn = [0, 30], Bi = [5, 20] }"


def write_covered_file(folder, covers: str = COVERS):
    """The invented ideal ternary eutectic with the covered range `covers` (a covers_at_percent
    line), written as ideal-covered.toml into `folder`; returns its path."""
    from pathlib import Path

    text = EUTECTIC_FILE.replace("temperature_range_K = [400, 1400]\n",
                                 f"temperature_range_K = [400, 1400]\n{covers}\n")
    path = Path(folder) / "ideal-covered.toml"
    path.write_text(text)
    return path
