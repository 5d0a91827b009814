"""Cooling paths of shipped systems: mass balance, where freezing ends, the non-equilibrium
eutectic of cored castings, and the heat released by pure elements against the handbook."""

from __future__ import annotations

import math

import numpy as np
import pytest
from scipy.integrate import quad, solve_ivp

from ladle.engine import find_system
from ladle.engine.diagrams.diagram import map_diagram
from ladle.engine.diagrams.melt import melt_range
from ladle.engine.solidify.paths import solidify
from ladle.engine.solidify.liquidus import solve_liquidus_point
from ladle.engine.solidify.records import mass_fraction_of_B
from ladle.engine.solidify.scheil import ScheilCooling
from ladle.engine.units import mole_from_mass


@pytest.fixture(scope="module")
def pbsn():
    return find_system("pb-sn")


def _x_of_wt(system, wt_percent_B: float) -> float:
    return float(mole_from_mass(np.array([1 - wt_percent_B / 100, wt_percent_B / 100]), system.molar_mass)[1])


def _eutectic(system):
    return next(i for i in map_diagram(system).invariants if i.kind == "eutectic")


def _exact_point(system, branch, y: float):
    """The liquidus point solved at y (independent of the branch's interpolation, which only
    gives the starting values)."""
    p = solve_liquidus_point(system, branch.solid, y, float(branch.temperature(np.array(y))),
                             float(branch.solid_y(np.array(y))))
    assert p is not None
    return p


def test_scheil_solid_averages_back_to_the_alloy(pbsn):
    """Mass balance: the B in all the solid formed along the path (integrated here by scipy's
    adaptive quadrature on exactly solved liquidus points) plus the B of the liquid that freezes
    as eutectic equals the alloy's B, to 1e-6."""
    x0 = _x_of_wt(pbsn, 10.0)
    sc = ScheilCooling(pbsn, x0)
    (seg,) = sc.segments
    b = seg.branch

    def solid_b_per_dy(y: float) -> float:
        p = _exact_point(pbsn, b, y)
        xa, xb = p.liquid
        return p.solid[1] * float(seg.liquid_fraction(np.array(y))) * xa * xb / p.gap   # x_S (-df_L/dy)

    solid_b, _err = quad(solid_b_per_dy, seg.y_from, seg.y_to, epsabs=1e-12, epsrel=1e-11, limit=400)
    f_end = float(seg.liquid_fraction(np.array(seg.y_to)))
    x_end = 1.0 / (1.0 + math.exp(-seg.y_to))
    assert solid_b + f_end * x_end == pytest.approx(x0, abs=1e-6)


def test_scheil_liquid_left_at_the_eutectic_matches_an_independent_integration(pbsn):
    """d ln f_L = -dx_L / (x_L - x_S) integrated by scipy's solve_ivp (rtol 1e-11) on exactly
    solved liquidus points, against the engine's eutectic fraction (1e-6 relative)."""
    x0 = _x_of_wt(pbsn, 10.0)
    sc = ScheilCooling(pbsn, x0)
    (seg,) = sc.segments
    b = seg.branch

    def rate(y, lnf):
        p = _exact_point(pbsn, b, float(y))
        xa, xb = p.liquid
        return [-xa * xb / p.gap]

    sol = solve_ivp(rate, (seg.y_from, seg.y_to), [0.0], method="DOP853", rtol=1e-11, atol=1e-13)
    assert float(seg.liquid_fraction(np.array(seg.y_to))) == pytest.approx(math.exp(sol.y[0, -1]), rel=1e-6)


@pytest.mark.parametrize("wt_sn", [2.0, 10.0, 30.0, 50.0, 70.0, 90.0, 99.0])
def test_scheil_ends_at_the_eutectic(pbsn, wt_sn):
    inv = _eutectic(pbsn)
    path = solidify(pbsn, _x_of_wt(pbsn, wt_sn)).scheil
    assert path.end == "eutectic"
    assert path.end_K == pytest.approx(inv.temperature_K, abs=1e-6)
    # L -> (Pb) + (Sn) at 183 C: T.B. Massalski (ed.), Binary Alloy Phase Diagrams, 2nd ed. (1990)
    assert path.end_K == pytest.approx(183.0 + 273.15, abs=3.0)
    assert path.constituents[-1].name == "eutectic fcc + bct"
    assert sum(c.mass_fraction for c in path.constituents) == pytest.approx(1.0, abs=1e-9)


def test_lead_rich_solid_solution_alloy_gets_a_scheil_eutectic_but_none_at_equilibrium(pbsn):
    """Pb-10 wt% Sn lies inside the (Pb) solid solution: below the maximum solubility of about
    19 wt% Sn at 183 C (Massalski, 2nd ed. (1990)). At equilibrium it freezes to (Pb) alone; with
    no diffusion in the solid the cored dendrites leave some liquid to freeze as eutectic (the
    non-equilibrium eutectic: D.A. Porter, K.E. Easterling and M.Y. Sherif, Phase Transformations
    in Metals and Alloys, 3rd ed., CRC Press (2009), ch. 4)."""
    inv = _eutectic(pbsn)
    fcc_limit = mass_fraction_of_B(pbsn, dict(inv.phases)["fcc"])
    assert 0.10 < fcc_limit
    result = solidify(pbsn, _x_of_wt(pbsn, 10.0))
    assert [c.name for c in result.equilibrium.constituents] == ["primary fcc"]
    assert result.equilibrium.end == "solidus"
    eutectic = next(c for c in result.scheil.constituents if c.name.startswith("eutectic"))
    assert eutectic.mass_fraction > 1e-3          # some eutectic, more than rounding


def test_equilibrium_ends_at_the_diagrams_solidus(pbsn):
    x0 = _x_of_wt(pbsn, 10.0)
    path = solidify(pbsn, x0).equilibrium
    mr = melt_range(pbsn, x0)
    assert path.liquidus_K == pytest.approx(mr.liquidus_K, abs=1e-9)
    assert path.end_K == pytest.approx(mr.solidus_K, abs=1e-9)
    assert path.steps[-1].fraction_solid == 1.0
    above = path.steps[-2]
    assert above.temperature_K > path.end_K and above.fraction_solid < 1.0


def test_hypoeutectic_equilibrium_eutectic_is_the_lever_rule_above_the_eutectic(pbsn):
    """At the eutectic temperature the liquid left is given by the lever rule between (Pb) and
    the eutectic liquid: f_L = (x0 - x_fcc) / (x_L - x_fcc) in moles."""
    inv = _eutectic(pbsn)
    ends = dict(inv.phases)
    x0 = _x_of_wt(pbsn, 40.0)
    path = solidify(pbsn, x0).equilibrium
    assert path.end == "eutectic" and path.end_K == pytest.approx(inv.temperature_K, abs=1e-9)
    f_mol = (x0 - ends["fcc"]) / (ends["liquid"] - ends["fcc"])
    M = pbsn.molar_mass
    f_mass = f_mol * ((1 - ends["liquid"]) * M[0] + ends["liquid"] * M[1]) / ((1 - x0) * M[0] + x0 * M[1])
    eutectic = next(c for c in path.constituents if c.name == "eutectic fcc + bct")
    assert eutectic.mass_fraction == pytest.approx(f_mass, abs=1e-6)
    plateau = next(a for a in path.arrests if a.kind == "plateau")
    assert plateau.temperature_K == path.end_K and plateau.heat_J_per_g > 0


# Enthalpies of fusion: CRC Handbook of Chemistry and Physics, 97th ed. (2016), "Enthalpy of
# fusion" table (kJ/mol); molar masses: IUPAC 2013 standard atomic weights (g/mol).
HANDBOOK_FUSION = [
    ("pb-sn", 0.0, 4.774, 207.2),      # Pb
    ("pb-sn", 1.0, 7.173, 118.71),     # Sn
    ("al-si", 0.0, 10.71, 26.9815385), # Al
    ("al-si", 1.0, 50.21, 28.085),     # Si
]


@pytest.mark.parametrize("system_name, x_B, kJ_per_mol, g_per_mol", HANDBOOK_FUSION)
def test_latent_heat_of_a_pure_element_is_its_enthalpy_of_fusion(system_name, x_B, kJ_per_mol, g_per_mol):
    expected = 1000.0 * kJ_per_mol / g_per_mol
    result = solidify(find_system(system_name), x_B)
    for path in (result.equilibrium, result.scheil):
        assert path.latent_heat_J_per_g == pytest.approx(expected, rel=0.01)
        (plateau,) = [a for a in path.arrests if a.kind == "plateau"]
        assert plateau.heat_J_per_g == pytest.approx(expected, rel=0.01)
        assert path.end_K == pytest.approx(path.liquidus_K, abs=1e-9)


def test_the_two_sides_of_a_miscibility_gap_are_named_apart():
    """Ag-Cu: one fcc phase with a miscibility gap; its eutectic L -> (Ag) + (Cu) at 779 C
    (T.B. Massalski (ed.), Binary Alloy Phase Diagrams, 2nd ed. (1990))."""
    system = find_system("ag-cu")
    result = solidify(system, _x_of_wt(system, 20.0))
    for path in (result.equilibrium, result.scheil):
        assert [c.name for c in path.constituents] == ["primary fcc (Ag-rich)", "eutectic fcc (Ag-rich) + fcc (Cu-rich)"]
        assert path.end_K == pytest.approx(779.0 + 273.15, abs=3.0)
