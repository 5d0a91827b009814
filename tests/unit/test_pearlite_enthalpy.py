"""The heat of the pearlite reaction of iron-cementite (systems/fe-fe3c.toml) against calorimetry.

W.C. Hagel, G.M. Pound and R.F. Mehl, 'Calorimetric study of the austenite:pearlite
transformation', Acta Metallurgica 4 (1956) 37 (read in its abstract; volume and page recalled
from memory): a continuously recording constant-heat-flow calorimeter gave 19.6 cal/g for the
enthalpy of the austenite-to-pearlite transformation of a plain-carbon eutectoid steel at the
eutectoid temperature, 727 C, with a precision estimated at 5 per cent (20.0 cal/g from Darken's
thermodynamic tables). Nothing in fe-c.toml was fitted to it (P. Gustafson's assessment, used
unchanged), so it is an independent check of the model's austenite, ferrite and cementite.
The calorie is the thermochemical one, 4.184 J.
"""

from __future__ import annotations

import numpy as np
import pytest

from ladle.engine import equilibrate, find_system
from ladle.engine.units import mole_from_mass

CALORIE_J = 4.184
MEASURED_J_PER_G = 19.6 * CALORIE_J
PRECISION = 0.05                      # the calorimeter's stated precision
EUTECTOID_WT_C = 0.77                 # H. Okamoto, J. Phase Equilib. 13 (1992) 543 (fe-fe3c.toml's check)


def _phases(system, T: float, x) -> set[str]:
    return {p.name for p in equilibrate(system, T, x).phases}


def _eutectoid_K(system, x, low: float = 990.0, high: float = 1010.0) -> float:
    """The model's eutectoid temperature (K) for the alloy x, bisected to 1e-4 K between a
    temperature with ferrite and one without."""
    assert "bcc" in _phases(system, low, x) and "bcc" not in _phases(system, high, x)
    while high - low > 1e-4:
        mid = 0.5 * (low + high)
        low, high = (mid, high) if "bcc" in _phases(system, mid, x) else (low, mid)
    return 0.5 * (low + high)


def test_pearlite_reaction_heat_matches_calorimetry() -> None:
    system = find_system("fe-fe3c")
    x = mole_from_mass(np.array([1.0 - EUTECTOID_WT_C / 100.0, EUTECTOID_WT_C / 100.0]), system.molar_mass)
    grams_per_mol = float(x @ system.molar_mass)
    T = _eutectoid_K(system, x)
    above, below = equilibrate(system, T + 0.01, x), equilibrate(system, T - 0.01, x)
    assert {p.name for p in above.phases} >= {"fcc"} and {p.name for p in below.phases} == {"bcc", "Fe3C"}
    heat = (above.enthalpy_J_per_mol - below.enthalpy_J_per_mol) / grams_per_mol
    assert heat == pytest.approx(MEASURED_J_PER_G, rel=PRECISION), (
        f"model {heat:.1f} J/g against {MEASURED_J_PER_G:.1f} J/g (Hagel, Pound and Mehl 1956)")
