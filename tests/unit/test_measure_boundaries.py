"""Liquidus, solidus and tie-line ends solved directly at a stated point (engine/measure_boundaries.py),
against closed-form textbook results computed independently with scipy."""

from __future__ import annotations

import math

import numpy as np
import pytest
from scipy.optimize import brentq

from ladle.engine import load_system
from ladle.engine.diagrams.diagram import map_diagram
from ladle.engine.checking.boundaries import BoundaryNotFound, boundary_temperature, phase_end, tie_line_between
from ladle.engine.checking.point_boundaries import tie_line_end
from ladle.engine.diagrams.melt import melt_range
from ladle.engine.units import GAS_CONSTANT as R
from synthetic import expression_value, fusion, ideal_two_phase
from measure_systems import FUSION_A, FUSION_B, MELT_A_K, MELT_B_K, eutectic_text, ideal_text, write


def ideal_ends(T: float) -> tuple[float, float]:
    """(x_solid, x_liquid) of the ideal-liquid/ideal-solid lens at T (K): the closed form of
    synthetic.ideal_two_phase (Gaskell and Laughlin, 6th ed., ch. 10) with dG_i = dH_i (1 - T/Tm_i)."""
    dg_a = expression_value(fusion(FUSION_A, MELT_A_K), T)
    dg_b = expression_value(fusion(FUSION_B, MELT_B_K), T)
    xs, _xa_s, xl, _xa_l = ideal_two_phase(dg_a, dg_b, T)
    return xs, xl


@pytest.fixture(scope="module")
def ideal(tmp_path_factory):
    return load_system(write(tmp_path_factory.mktemp("ideal"), ideal_text()))


@pytest.fixture(scope="module")
def eutectic(tmp_path_factory):
    return load_system(write(tmp_path_factory.mktemp("eutectic"), eutectic_text()))


@pytest.mark.parametrize("x0", [0.02, 0.25, 0.5, 0.8, 0.995])
def test_ideal_liquidus_and_solidus_match_the_closed_form(ideal, x0):
    # scipy's brentq on the closed form is the independent reference
    T_liq = brentq(lambda T: ideal_ends(T)[1] - x0, MELT_A_K + 1e-9, MELT_B_K - 1e-9, xtol=1e-12)
    T_sol = brentq(lambda T: ideal_ends(T)[0] - x0, MELT_A_K + 1e-9, MELT_B_K - 1e-9, xtol=1e-12)
    liq = boundary_temperature(ideal, x0, "liquidus")
    sol = boundary_temperature(ideal, x0, "solidus")
    assert liq.temperature_K == pytest.approx(T_liq, abs=1e-6)
    assert sol.temperature_K == pytest.approx(T_sol, abs=1e-6)
    assert liq.partner == "fcc" and liq.partner_x_B == pytest.approx(ideal_ends(T_liq)[0], abs=1e-8)
    assert sol.partner == "liquid" and sol.partner_x_B == pytest.approx(ideal_ends(T_sol)[1], abs=1e-8)


def test_a_hint_finds_the_same_liquidus(ideal):
    full = boundary_temperature(ideal, 0.4, "liquidus").temperature_K
    assert boundary_temperature(ideal, 0.4, "liquidus", hint_K=full + 3.0).temperature_K == pytest.approx(full, abs=1e-8)
    # a hint far off still finds it (the search falls back to the scan from the top)
    assert boundary_temperature(ideal, 0.4, "liquidus", hint_K=750.0).temperature_K == pytest.approx(full, abs=1e-8)


@pytest.mark.parametrize("T", [1010.0, 1100.0, 1190.0])
def test_ideal_tie_line_ends_match_the_closed_form(ideal, T):
    xs, xl = ideal_ends(T)
    for stable in (True, False):
        tie = tie_line_between(ideal, T, "fcc", "liquid", near_x=0.5, stable=stable)
        assert phase_end(tie, "fcc", 0.5) == pytest.approx(xs, abs=1e-9)
        assert phase_end(tie, "liquid", 0.5) == pytest.approx(xl, abs=1e-9)


def test_pure_ends_give_the_melting_points(ideal):
    assert boundary_temperature(ideal, 0.0, "liquidus").temperature_K == pytest.approx(MELT_A_K, abs=1e-6)
    assert boundary_temperature(ideal, 1.0, "solidus").temperature_K == pytest.approx(MELT_B_K, abs=1e-6)


def test_eutectic_alloys_finish_freezing_at_the_eutectic(eutectic):
    inv = map_diagram(eutectic).invariants
    assert [i.kind for i in inv] == ["eutectic"]
    T_e = inv[0].temperature_K
    (_, x_fcc), (_, x_liq), (_, x_bcc) = inv[0].phases
    for x0 in (0.5 * (x_fcc + x_liq), x_liq, 0.5 * (x_liq + x_bcc)):
        assert boundary_temperature(eutectic, x0, "solidus").temperature_K == pytest.approx(T_e, abs=1e-6)
    # inside the fcc solubility range the solidus lies above the eutectic
    assert boundary_temperature(eutectic, 0.5 * x_fcc, "solidus").temperature_K > T_e + 1.0


@pytest.mark.parametrize("x0", [0.05, 0.3, 0.6, 0.95])
def test_liquidus_and_solidus_agree_with_the_melt_range(eutectic, x0):
    # a second, independent route inside the engine: crossings of the traced diagram
    mr = melt_range(eutectic, x0)
    assert boundary_temperature(eutectic, x0, "liquidus").temperature_K == pytest.approx(mr.liquidus_K, abs=1e-5)
    assert boundary_temperature(eutectic, x0, "solidus").temperature_K == pytest.approx(mr.solidus_K, abs=1e-5)


def test_regular_solution_gap_matches_the_binodal(tmp_path):
    # symmetric regular solution, L0 = 20000 J/mol: binodal T = Tc s / artanh(s), s = 1 - 2x,
    # Tc = L0 / 2R (D.A. Porter, K.E. Easterling and M.Y. Sherif, Phase Transformations in Metals
    # and Alloys, 3rd ed. (2009), chapter 1)
    text = ideal_text().replace('[phase.fcc]\nmodel = "solution"', '[phase.fcc]\nmodel = "solution"\nL = [ { a = 20000.0 } ]')
    system = load_system(write(tmp_path, text))
    Tc = 20000.0 / (2 * R)
    for s in (0.3, 0.6, 0.9):
        T = Tc * s / math.atanh(s)
        tie = tie_line_between(system, T, "fcc", "fcc", near_x=0.1, stable=False)
        assert phase_end(tie, "fcc", 0.0) == pytest.approx((1 - s) / 2, abs=1e-9)
        assert phase_end(tie, "fcc", 1.0) == pytest.approx((1 + s) / 2, abs=1e-9)


def test_no_liquidus_inside_the_window_is_reported(tmp_path):
    text = ideal_text().replace("temperature_range_K = [700, 1400]", "temperature_range_K = [1250, 1400]")
    system = load_system(write(tmp_path, text))
    with pytest.raises(BoundaryNotFound, match="no liquidus at 50 at% B between 1250.0 and 1400.0 K"):
        boundary_temperature(system, 0.5, "liquidus")
    assert np.isfinite(boundary_temperature(system, 1.0, "liquidus").temperature_K)


@pytest.mark.parametrize("T", [1010.0, 1190.0])
def test_tie_line_ends_from_point_equilibria_match_the_closed_form(ideal, T):
    # the scan of point equilibria that measures tie-line facts of binaries the tracer cannot map
    # (sublattice phases); the closed form as above is the reference
    xs, xl = ideal_ends(T)
    assert tie_line_end(ideal, T, "fcc", "liquid", near_x=0.5) == pytest.approx(xs, abs=1e-7)
    assert tie_line_end(ideal, T, "liquid", "fcc", near_x=0.5) == pytest.approx(xl, abs=1e-7)
    assert tie_line_end(ideal, T, "fcc", "bcc", near_x=0.5) is None    # no such phase pair: no answer
