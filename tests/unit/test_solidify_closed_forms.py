"""Cooling paths against closed-form results, on synthetic systems built for them.

- An ideal liquid and an ideal solid (complete solubility): liquidus, solidus and tie-lines in
  closed form (D.R. Gaskell and D.E. Laughlin, Introduction to the Thermodynamics of Materials,
  6th ed., CRC Press (2017), ch. 10): with k_i = exp(-dG_i / RT) and dG_i = dH_i (1 - T/Tm_i),
  x_S = (1 - k_A) / (k_B - k_A) and x_L = k_B x_S.
- A solid whose partition coefficient k = x_S / x_L is exactly constant: the Scheil-Gulliver
  equation C_S = k C_0 (1 - f_S)^(k - 1) (W. Kurz and D.J. Fisher, Fundamentals of
  Solidification, 4th ed., Trans Tech (1998), ch. 6 and appendix 5).
"""

from __future__ import annotations

import math

import numpy as np
import pytest
from scipy.optimize import brentq

from synthetic import R, Solution, Synthetic, expression_value, fusion, ideal_two_phase

from ladle.engine.solidify.paths import solidify
from ladle.engine.solidify.liquidus import solve_liquidus_point

# --- an ideal isomorphous system (invented numbers) --------------------------------------------
TM_A, DH_A = 1000.0, 12000.0     # K, J/mol
TM_B, DH_B = 1400.0, 16000.0


def _ideal_ends(T: float) -> tuple[float, float]:
    """(x_S, x_L) of the ideal system at T: synthetic.ideal_two_phase (Gaskell and Laughlin,
    6th ed., ch. 10)."""
    x_s, _xa_s, x_l, _xa_l = ideal_two_phase(expression_value(fusion(DH_A, TM_A), T),
                                             expression_value(fusion(DH_B, TM_B), T), T)
    return x_s, x_l


@pytest.fixture(scope="module")
def ideal(tmp_path_factory):
    phases = [Solution("liquid", fusion(DH_A, TM_A), fusion(DH_B, TM_B)), Solution("fcc", {}, {})]
    return Synthetic(phases, (700.0, 1500.0)).load(tmp_path_factory.mktemp("ideal"), "ideal")


def _y(x: float) -> float:
    return math.log(x) - math.log1p(-x)


@pytest.mark.parametrize("T", [1050.0, 1200.0, 1350.0])
def test_liquidus_point_matches_the_ideal_closed_form(ideal, T):
    x_s, x_l = _ideal_ends(T)
    p = solve_liquidus_point(ideal, "fcc", _y(x_l), T + 20.0, _y(x_s) + 0.3)
    assert p is not None
    assert p.temperature_K == pytest.approx(T, abs=1e-8)
    assert p.solid[1] == pytest.approx(x_s, abs=1e-11)


def test_equilibrium_path_follows_the_lever_rule_between_the_closed_form_curves(ideal):
    x0 = 0.4
    liquidus = brentq(lambda T: _ideal_ends(T)[1] - x0, TM_A + 1e-6, TM_B - 1e-6, xtol=1e-12)
    solidus = brentq(lambda T: _ideal_ends(T)[0] - x0, TM_A + 1e-6, TM_B - 1e-6, xtol=1e-12)
    path = solidify(ideal, x0).equilibrium
    assert path.liquidus_K == pytest.approx(liquidus, abs=1e-6)
    assert path.end == "solidus"
    assert path.end_K == pytest.approx(solidus, abs=1e-6)
    assert path.steps[-1].fraction_solid == pytest.approx(1.0, abs=1e-9)
    for step in path.steps[1:-1]:
        x_s, x_l = _ideal_ends(step.temperature_K)
        assert step.liquid_x_B == pytest.approx(x_l, abs=1e-8)
        # the lever rule on the closed-form tie-line, in moles
        assert step.fraction_solid_mol == pytest.approx((x_l - x0) / (x_l - x_s), abs=1e-7)


def test_latent_heat_of_an_ideal_alloy_is_the_weighted_enthalpy_of_fusion(ideal):
    """Ideal solutions have no enthalpy of mixing and here dH_fus does not depend on T, so the
    heat of freezing the whole alloy is (1 - x0) dH_A + x0 dH_B, whatever the path."""
    x0 = 0.4
    M = (1 - x0) * 60.0 + x0 * 30.0          # the synthetic molar masses, g/mol
    expected = ((1 - x0) * DH_A + x0 * DH_B) / M
    result = solidify(ideal, x0)
    assert result.equilibrium.latent_heat_J_per_g == pytest.approx(expected, rel=1e-3)
    # the Scheil path stops when 1e-6 of the alloy is still liquid
    assert result.scheil.latent_heat_J_per_g == pytest.approx(expected, rel=1e-3)


def test_scheil_liquid_runs_to_the_lower_melting_element(ideal):
    path = solidify(ideal, 0.4).scheil
    assert path.end == "last liquid"
    assert path.steps[-1].fraction_solid_mol == pytest.approx(1.0 - 1e-6, abs=1e-9)
    # the last liquid is nearly pure A, so it freezes just above A's melting point
    assert TM_A < path.end_K < TM_A + 5.0


# --- constant partition coefficient -----------------------------------------------------------
K = 0.2
TM, DH = 1000.0, 10000.0
X0 = 0.02


@pytest.fixture(scope="module")
def constant_k(tmp_path_factory):
    """Ideal liquid; ideal solid whose B end-member lies R T |ln k| above the liquid's, so that
    equal chemical potentials of B give x_S = k x_L exactly at every temperature."""
    liquid = Solution("liquid", fusion(DH, TM), {})
    solid = Solution("fcc", {}, {"b": -R * math.log(K)})
    return Synthetic([liquid, solid], (300.0, 1100.0)).load(tmp_path_factory.mktemp("k"), "constant_k")


def _liquidus_T(x: float) -> float:
    """Exact liquidus of the constant-k system: from equal chemical potentials of A,
    ln((1 - x) / (1 - k x)) = -(DH / R)(1/T - 1/TM)."""
    return 1.0 / (1.0 / TM - (R / DH) * math.log((1.0 - x) / (1.0 - K * x)))


def test_scheil_follows_the_scheil_gulliver_equation(constant_k):
    path = solidify(constant_k, X0).scheil
    steps = [s for s in path.steps if s.fraction_solid_mol < 0.99]
    assert len(steps) > 20
    for s in steps:
        fs = s.fraction_solid_mol
        # C_L = C_0 (1 - f_S)^(k - 1) (Kurz and Fisher, 4th ed.): exact here, so only the
        # integration error of the engine is allowed (1e-6 relative)
        assert s.liquid_x_B == pytest.approx(X0 * (1.0 - fs) ** (K - 1.0), rel=1e-6)
        assert s.temperature_K == pytest.approx(_liquidus_T(s.liquid_x_B), abs=1e-4)


def test_scheil_temperatures_follow_kurz_and_fisher_with_a_linear_liquidus(constant_k):
    """Kurz and Fisher's form T = Tm + m C_0 (1 - f_S)^(k - 1) takes the liquidus straight, with
    slope m = -R Tm^2 (1 - k) / DH at x = 0 (the dilute limit of the exact liquidus). The
    tolerance is how far the exact liquidus departs from that straight line over the liquid
    compositions compared (x_L up to 0.06), computed here from the closed form."""
    m = -R * TM * TM * (1.0 - K) / DH
    grid = np.linspace(0.0, 0.06, 601)
    bound = max(abs(_liquidus_T(x) - (TM + m * x)) for x in grid)
    assert bound < 2.0       # the comparison is meaningful: the curvature is small here
    path = solidify(constant_k, X0).scheil
    compared = 0
    for s in path.steps:
        x_l = X0 * (1.0 - s.fraction_solid_mol) ** (K - 1.0)
        if x_l > 0.06:
            break
        assert s.temperature_K == pytest.approx(TM + m * x_l, abs=bound + 1e-4)
        compared += 1
    assert compared > 10


def test_constant_k_alloy_keeps_liquid_below_the_window(constant_k):
    """Solid B is never stable in this system: the liquid is still there at the window's
    bottom, and the path says so instead of inventing an end."""
    path = solidify(constant_k, X0).scheil
    assert path.end == "window" and path.end_K is None
    assert path.constituents[-1].name.startswith("liquid left")
