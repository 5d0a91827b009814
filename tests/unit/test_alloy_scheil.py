"""Scheil-Gulliver cooling of ternary alloys (engine/solidify/alloy_scheil.py) against closed forms
and an independent integration, on the invented ideal ternaries of tests/unit/ideal_ternaries.py
(whose equilibria are closed forms: see that module for the sources)."""

from __future__ import annotations

import numpy as np
import pytest
from scipy.integrate import solve_ivp
from scipy.optimize import brentq

import ideal_ternaries as it
from ladle.engine.solidify import alloy_scheil

Z = np.array([0.6, 0.25, 0.15])


def scheil(monkeypatch, system, z):
    monkeypatch.setattr(alloy_scheil, "equilibrate", it.equilibrate_for(system))
    return alloy_scheil.alloy_scheil(system, z)


def test_ternary_eutectic_path_matches_the_closed_form(monkeypatch):
    """Pure solids and an ideal liquid: the liquid leaves the A corner on a straight line
    (x_B / x_C fixed) while alpha forms, runs down the alpha + beta valley where
    x_A = a_A(T), x_B = a_B(T), and ends at the ternary eutectic where a_A + a_B + a_C = 1."""
    path = scheil(monkeypatch, it.eutectic_system(), Z)
    a = it.saturation
    T_liquidus = brentq(lambda T: a(T)[0] - Z[0], 600.0, 1300.0, xtol=1e-12)

    def f_primary(T):                       # moles of liquid while alpha forms: B + C stay in it
        return (1.0 - Z[0]) / (1.0 - a(T)[0])

    T_valley = brentq(lambda T: Z[1] / f_primary(T) - a(T)[1], 560.0, T_liquidus - 1e-6, xtol=1e-12)
    T_eutectic = brentq(lambda T: a(T).sum() - 1.0, 400.0, 1000.0, xtol=1e-12)
    f_eutectic = Z[2] / a(T_eutectic)[2]   # C stays in the liquid down the valley

    assert path.liquidus_K == pytest.approx(T_liquidus, abs=1e-6)
    assert path.end == "ternary eutectic" and path.end_K == pytest.approx(T_eutectic, abs=1e-6)
    assert [a.kind for a in path.arrests] == ["liquidus", "new phase", "plateau"]
    assert path.arrests[1].temperature_K == pytest.approx(T_valley, abs=1e-6)
    names = [c.name for c in path.constituents]
    assert names == ["primary alpha", "eutectic alpha + beta", "ternary eutectic alpha + beta + gamma"]
    moles = [c.fraction_mol for c in path.constituents]
    assert moles == pytest.approx([1.0 - f_primary(T_valley), f_primary(T_valley) - f_eutectic, f_eutectic], abs=1e-6)
    assert path.constituents[2].x == pytest.approx(tuple(a(T_eutectic)), abs=1e-6)
    for step in path.steps:                 # down the valley the liquid is saturated with A and B
        if step.liquid_x is not None and T_eutectic + 1e-6 < step.temperature_K < T_valley - 1e-6:
            assert step.liquid_x[:2] == pytest.approx(tuple(a(step.temperature_K)[:2]), abs=1e-9)


def test_scheil_in_an_ideal_lens_follows_an_independent_integration(monkeypatch):
    """d x_L / d ln f_L = x_S - x_L with x_S = K(T) x_L on the liquidus sum x_L K(T) = 1,
    integrated by scipy.integrate.solve_ivp (DOP853, rtol 1e-11) with the liquidus temperature
    from scipy.optimize.brentq."""
    path = scheil(monkeypatch, it.lens_system(), Z)

    def liquidus(x):
        return brentq(lambda T: x @ it.partition(T) - 1.0, 900.0, 1400.0, xtol=1e-13)

    def rate(_u, x):
        return x * (1.0 - it.partition(liquidus(x)))

    steps = [s for s in path.steps if s.liquid_x is not None and s.fraction_solid_mol < 0.95]
    u = [-np.log(1.0 - s.fraction_solid_mol) for s in steps]
    solution = solve_ivp(rate, (0.0, max(u)), Z, method="DOP853", rtol=1e-11, atol=1e-13, dense_output=True)
    assert len(steps) > 10
    for s, ui in zip(steps, u):
        assert s.liquid_x == pytest.approx(tuple(solution.sol(ui)), abs=5e-5)   # measured: 9.7e-6 at most
        assert s.temperature_K == pytest.approx(liquidus(solution.sol(ui)), abs=0.02)
    for a, b in zip(steps, steps[1:]):             # between the steps: the tables' interpolation
        mid = path.state_at(0.5 * (a.temperature_K + b.temperature_K))
        assert sum(mid.liquid_x) == pytest.approx(1.0, abs=1e-12)
        assert mid.liquid_x == pytest.approx(tuple(solution.sol(-np.log(1.0 - mid.fraction_solid_mol))), abs=5e-5)
    assert path.end == "last liquid"


@pytest.mark.parametrize("make", [it.eutectic_system, it.lens_system])
def test_mass_balance_and_latent_heat(monkeypatch, make):
    """What froze holds every atom of the alloy (to 1e-6), and the heat released is the heat of
    fusion of the alloy: ideal phases with constant heats of fusion have H_liquid = sum x_i dH_i
    at any temperature and H_solid = 0."""
    path = scheil(monkeypatch, make(), Z)
    held = sum(c.fraction_mol * np.array(c.x) for c in path.constituents)
    assert held == pytest.approx(Z, abs=1e-6)
    assert sum(c.mass_fraction for c in path.constituents) == pytest.approx(1.0, abs=1e-6)
    assert path.latent_heat_J_per_g == pytest.approx((Z @ it.FUSION_J) / (Z @ it.MOLAR_MASS), rel=1e-6)
    solid = [s.fraction_solid for s in path.steps]
    assert all(b >= a - 1e-12 for a, b in zip(solid, solid[1:]))
    assert solid[-1] == 1.0


def test_a_ternary_alloy_without_its_third_element_freezes_as_the_binary(monkeypatch):
    """x_C = 0: the A-B binary eutectic (a_A + a_B = 1) ends freezing; the liquid never holds C."""
    z = np.array([0.7, 0.3, 0.0])
    path = scheil(monkeypatch, it.eutectic_system(), z)
    a = it.saturation
    T_eutectic = brentq(lambda T: a(T)[0] + a(T)[1] - 1.0, 400.0, 1000.0, xtol=1e-12)
    assert path.end == "eutectic" and path.end_K == pytest.approx(T_eutectic, abs=1e-6)
    assert [c.name for c in path.constituents] == ["primary alpha", "eutectic alpha + beta"]
    assert all(s.liquid_x is None or s.liquid_x[2] == 0.0 for s in path.steps)
    assert path.constituents[1].x[:2] == pytest.approx(tuple(a(T_eutectic)[:2]), abs=1e-9)


def test_bad_compositions_are_refused():
    with pytest.raises(ValueError, match="3 non-negative mole fractions summing to 1"):
        alloy_scheil.alloy_scheil(it.eutectic_system(), [0.5, 0.6, -0.1])


def test_through_the_engine_the_ternary_eutectic_path_is_the_closed_form(tmp_path):
    """The same invented system as a system file, through the general minimiser."""
    from ladle.engine import load_system

    system = load_system(it.write_system_files(tmp_path)["ideal-eutectic"])
    path = alloy_scheil.alloy_scheil(system, Z)
    a = it.saturation
    T_liquidus = brentq(lambda T: a(T)[0] - Z[0], 600.0, 1300.0, xtol=1e-12)
    T_eutectic = brentq(lambda T: a(T).sum() - 1.0, 400.0, 1000.0, xtol=1e-12)

    def f_primary(T):
        return (1.0 - Z[0]) / (1.0 - a(T)[0])

    T_valley = brentq(lambda T: Z[1] / f_primary(T) - a(T)[1], 560.0, T_liquidus - 1e-6, xtol=1e-12)
    assert path.liquidus_K == pytest.approx(T_liquidus, abs=1e-6)
    assert path.arrests[1].temperature_K == pytest.approx(T_valley, abs=1e-6)
    assert path.end == "ternary eutectic" and path.end_K == pytest.approx(T_eutectic, abs=1e-6)
    f_eutectic = Z[2] / a(T_eutectic)[2]
    assert [c.fraction_mol for c in path.constituents] == pytest.approx(
        [1.0 - f_primary(T_valley), f_primary(T_valley) - f_eutectic, f_eutectic], abs=1e-6)
    assert path.notes == ()


def test_heat_of_a_scheil_path_is_the_heat_of_the_same_constituents_at_equilibrium():
    """Sn-4.0Ag-0.5Cu (wt%) in the shipped Sn-Ag-Cu system: both paths start as the same liquid at
    the same liquidus and end in the same constituents (primary Ag3Sn, eutectic, ternary eutectic:
    the solids are compounds or nearly pure tin) at the same ternary eutectic, so by the first law
    they release the same heat, to within the little the paths differ in the tin's solubility.
    The Scheil path once weighted each step's solids by their amounts in the liquid's point
    equilibrium instead of by the step's own solid composition and released 11 % too much."""
    from ladle.engine.files.catalog import find_system
    from ladle.engine.solidify.alloy_paths import solidify_alloy
    from ladle.engine.units import mole_from_mass

    system = find_system("ag-cu-sn")
    mass = {"Sn": 0.955, "Ag": 0.040, "Cu": 0.005}
    x = mole_from_mass(np.array([mass[e] for e in system.elements]), system.molar_mass)
    paths = solidify_alloy(system, x)
    eq, sch = paths.equilibrium, paths.scheil
    assert [c.name for c in eq.constituents] == [c.name for c in sch.constituents]
    assert sch.latent_heat_J_per_g == pytest.approx(eq.latent_heat_J_per_g, rel=0.01)


def test_the_path_stops_where_the_liquid_leaves_the_covered_range(tmp_path):
    """The invented ideal eutectic covering Bi (C) 5-20 at% only (ideal_ternaries.COVERS):
    alloy 80 A, 5 B, 15 C at% forms pure alpha first, so its liquid keeps x_B / x_C = 1/3 and
    reaches x_C = 0.20 at x_A = 1 - 0.20 * 4/3, where a_A(T) = x_A (the ideal freezing-point
    equation, ideal_ternaries), before any valley. The path ends there, within RANGE_STEP_K above,
    with no step outside the range, the rest named as liquid left there and a note saying so;
    mass balance holds."""
    from ladle.engine import load_system

    system = load_system(it.write_covered_file(tmp_path))
    z = np.array([0.80, 0.05, 0.15])
    path = alloy_scheil.alloy_scheil(system, z)
    x_A = 1.0 - 0.20 * (z[1] + z[2]) / z[2]
    T_leaves = brentq(lambda T: it.saturation(T)[0] - x_A, 600.0, 1300.0, xtol=1e-12)
    assert path.end == alloy_scheil.OUTSIDE_RANGE and path.end_K is None
    last = path.steps[-1]
    assert T_leaves <= last.temperature_K <= T_leaves + alloy_scheil.RANGE_STEP_K
    assert all(system.covered(np.array(s.liquid_x)) for s in path.steps if s.liquid_x is not None)
    assert [c.name for c in path.constituents] == ["primary alpha", "liquid left where it leaves the covered range"]
    assert path.constituents[1].fraction_mol == pytest.approx(z[2] / 0.20, abs=1e-3)   # C stays in the liquid
    assert len(path.notes) == 1 and "leaves the range this model covers (Sn 0-30 at%, Bi 5-20 at%)" in path.notes[0]
    moles = sum(c.fraction_mol * np.array(c.x) for c in path.constituents)
    assert np.abs(moles - z).max() < 1e-6
    assert sum(c.mass_fraction for c in path.constituents) == pytest.approx(1.0, abs=1e-9)


def test_the_equilibrium_path_goes_on_where_the_scheil_liquid_leaves_the_range(tmp_path):
    """The same alloy: its Scheil liquid leaves the covered range, but the alloy itself stays
    inside it, so its equilibrium freezing is followed to its own end, the solidus of the one-alloy
    transition scan (the same engine path `ladle melt` takes)."""
    from ladle.engine import load_system
    from ladle.engine.diagrams.alloy_transitions import alloy_transitions
    from ladle.engine.solidify.alloy_paths import solidify_alloy

    system = load_system(it.write_covered_file(tmp_path))
    z = np.array([0.80, 0.05, 0.15])
    both = solidify_alloy(system, z)
    assert both.scheil.end == alloy_scheil.OUTSIDE_RANGE
    assert both.equilibrium.end != "window"
    assert both.equilibrium.end_K == pytest.approx(alloy_transitions(system, z).solidus_K, abs=0.01)
