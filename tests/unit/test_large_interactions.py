"""An invented A-B eutectic whose solid's interaction parameter is huge (1e6 J/mol and more):
terminal solubilities far below 1e-70, where the diagram once lost its eutectic silently.

Check values: with practically insoluble solids, the liquidus of an ideal liquid against each
pure solid is ln x_i(liquid) = -dG_i / RT, dG_i = dH_i (1 - T / Tm_i) (D.R. Gaskell and
D.E. Laughlin, Introduction to the Thermodynamics of Materials, 6th ed., CRC Press (2017),
ch. 10), and the eutectic is where the two liquidus curves meet: x_A + x_B = 1, solved here with
scipy.optimize.brentq.
"""

from __future__ import annotations

import math

import pytest
from scipy.optimize import brentq

from ladle.engine import load_system
from ladle.engine.diagrams.diagram import map_diagram
from ladle.engine.diagrams.melt import melt_range
from ladle.engine.minimize.equilibrium import equilibrate

R = 8.314462618          # J/(mol K), CODATA 2018 exact
H_A, TM_A = 12000.0, 1200.0
H_B, TM_B = 10000.0, 1000.0


def _system(tmp_path, solid_L: float):
    text = f"""elements = ["A", "B"]
molar_mass = {{ A = 60.0, B = 30.0 }}
source = "Invented test system: ideal liquid, one fcc solid with a large positive interaction."
temperature_range_K = [400.0, 1400.0]

[phase.liquid]
model = "solution"
G.A = [ {{ upto = 6000.0, a = {H_A}, b = {-H_A / TM_A} }} ]
G.B = [ {{ upto = 6000.0, a = {H_B}, b = {-H_B / TM_B} }} ]

[phase.fcc]
model = "solution"
G.A = [ {{ upto = 6000.0, a = 0.0 }} ]
G.B = [ {{ upto = 6000.0, a = 0.0 }} ]
L = [ {{ a = {solid_L!r} }} ]
"""
    path = tmp_path / f"ab-{solid_L:g}.toml"
    path.write_text(text)
    return load_system(path)


def _liquid_fraction(H: float, Tm: float, T: float) -> float:
    return math.exp(-H * (1.0 - T / Tm) / (R * T))


#: The eutectic temperature (K) of the insoluble-solids limit.
T_EUTECTIC = brentq(lambda T: _liquid_fraction(H_A, TM_A, T) + _liquid_fraction(H_B, TM_B, T) - 1.0, 500.0, 999.0)
#: Liquidus (K) of the alloy with x_B = 0.5 (A-rich side of the eutectic): x_A(liquid) = 0.5.
T_LIQUIDUS_HALF = H_A / (H_A / TM_A - R * math.log(0.5))


@pytest.mark.parametrize("solid_L", [1e6, 3e6])
def test_the_eutectic_is_found_and_agrees_with_the_closed_form(tmp_path, solid_L):
    system = _system(tmp_path, solid_L)
    diagram = map_diagram(system)
    assert diagram.warnings == []
    (eutectic,) = diagram.invariants
    assert eutectic.kind == "eutectic"
    assert eutectic.temperature_K == pytest.approx(T_EUTECTIC, abs=0.01)
    assert eutectic.phases[1][1] == pytest.approx(_liquid_fraction(H_B, TM_B, T_EUTECTIC), abs=1e-4)
    melt = melt_range(system, 0.5)
    assert melt.warnings == ()
    assert melt.liquidus_K == pytest.approx(T_LIQUIDUS_HALF, abs=0.01)
    assert melt.solidus_K == pytest.approx(T_EUTECTIC, abs=0.01)
    assert equilibrate(system, 700.0, 0.5).phase_names == ("fcc", "liquid")


def test_beyond_floating_point_the_melt_range_is_placed_by_point_equilibria_and_flagged(tmp_path):
    system = _system(tmp_path, 1e7)        # solubility e^-1700: 0 in floating point
    melt = melt_range(system, 0.5)
    assert melt.liquidus_K == pytest.approx(T_LIQUIDUS_HALF, abs=0.01)
    assert melt.solidus_K == pytest.approx(T_EUTECTIC, abs=0.01)
    assert any("point equilibria" in w for w in melt.warnings)
    if not map_diagram(system).invariants:          # the diagram says so, never silently
        assert map_diagram(system).warnings
