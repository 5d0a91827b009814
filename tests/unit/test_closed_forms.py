"""The engine against closed-form textbook results: an ideal isomorphous system and the
symmetric regular solution's miscibility gap, point equilibria (issue 2) and traced diagrams
(issue 3).

Sources of the check values:
- Ideal liquid and ideal solid with dG_i = dH_i (1 - T / Tm_i) (tests/unit/topologies.py,
  isomorphous): equal chemical potentials of both elements give, with k_i = exp(-dG_i / RT), the
  solidus x_S = (1 - k_A) / (k_B - k_A) and the liquidus x_L = k_B x_S (mole fraction of B).
  D.R. Gaskell and D.E. Laughlin, Introduction to the Thermodynamics of Materials, 6th ed., CRC
  Press (2017), ch. 10 (Gibbs free energy-composition and phase diagrams of binary systems);
  written with expm1 (synthetic.ideal_two_phase) so that it keeps its digits within a fraction
  of a kelvin of each melting point.
- Symmetric regular solution G = RT(xA ln xA + xB ln xB) + L0 xA xB: binodal
  ln(x / (1 - x)) = L0 (2x - 1) / (RT), i.e. T = Tc s / artanh(s) with s = 1 - 2x, and critical
  point Tc = L0 / (2R) at x = 1/2. D.A. Porter, K.E. Easterling and M.Y. Sherif, Phase
  Transformations in Metals and Alloys, 3rd ed., CRC Press (2009), ch. 1.
- Inverting T(s) for a traced temperature: scipy.optimize.brentq (an independent root finder).
"""

from __future__ import annotations

import math

import numpy as np
import pytest
from scipy.optimize import brentq

from ladle.engine import equilibrate
from ladle.engine.diagrams.diagram import map_diagram

from synthetic import R, Solution, Synthetic
from topologies import TM_A, TM_B, isomorphous, isomorphous_tie_line

#: Composition tolerance of the closed-form checks (mole fraction), from the issues.
X_TOL = 1e-7


def two_phase_temperatures() -> list[float]:
    """Across the whole two-phase range, closing in to within 0.001 K of each melting point."""
    near = [1e-3, 0.01, 0.05, 0.1]
    return [TM_B + d for d in near] + list(np.linspace(TM_B + 0.5, TM_A - 0.5, 41)) + [TM_A - d for d in near]


@pytest.fixture(scope="module")
def ideal(tmp_path_factory):
    return isomorphous().synthetic.load(tmp_path_factory.mktemp("ideal"), "ideal")


def test_ideal_pure_melting_points_are_the_given_ones(ideal):
    # Pure element: liquid and solid have equal G where dH (1 - T/Tm) = 0, i.e. at Tm exactly.
    assert ideal.melting_points["A"] == pytest.approx(TM_A, abs=1e-6)
    assert ideal.melting_points["B"] == pytest.approx(TM_B, abs=1e-6)


@pytest.mark.parametrize("T", two_phase_temperatures())
def test_ideal_point_equilibrium_matches_solidus_and_liquidus(ideal, T):
    xs_b, xs_a, xl_b, xl_a = isomorphous_tie_line(T)
    x0 = 0.5 * (xs_b + xl_b)
    eq = equilibrate(ideal, T, x0)
    assert eq.phase_names == ("solid", "liquid")
    solid, liquid = eq.phases
    for got, want in ((solid.x[1], xs_b), (solid.x[0], xs_a), (liquid.x[1], xl_b), (liquid.x[0], xl_a)):
        assert got == pytest.approx(want, abs=X_TOL)
        # Near a melting point the fractions are tiny: they must also hold their relative digits.
        assert got == pytest.approx(want, rel=1e-6)


def test_ideal_single_phase_outside_the_lens(ideal):
    # Above the liquidus the alloy is liquid, below the solidus solid (same closed form).
    T = 0.5 * (TM_A + TM_B)
    xs_b, _, xl_b, _ = isomorphous_tie_line(T)
    assert equilibrate(ideal, T, 0.5 * xs_b).phase_names == ("solid",)
    assert equilibrate(ideal, T, 0.5 * (1.0 + xl_b)).phase_names == ("liquid",)


def test_ideal_traced_field_matches_closed_form(ideal):
    d = map_diagram(ideal)
    assert [f.phases for f in d.fields] == [("solid", "liquid")]
    assert d.invariants == []
    f = d.fields[0]
    # The field spans the two melting points.
    assert f.T[0] == pytest.approx(TM_B, abs=1e-6) and f.T[-1] == pytest.approx(TM_A, abs=1e-6)
    assert len(f.T) >= 10
    for T, (x_solid, x_liquid) in zip(f.T, f.x):
        xs_b, _, xl_b, _ = isomorphous_tie_line(float(T))
        assert x_solid == pytest.approx(xs_b, abs=X_TOL), f"solidus at {T} K"
        assert x_liquid == pytest.approx(xl_b, abs=X_TOL), f"liquidus at {T} K"


# --- the symmetric regular solution (invented L0) -------------------------------------------------
L0 = 20000.0                      # J/mol
TC = L0 / (2.0 * R)               # Porter, Easterling and Sherif, 3rd ed., ch. 1: about 1202.72 K


def binodal_T(s: float) -> float:
    """T (K) of the binodal at s = 1 - 2x (Porter, Easterling and Sherif, 3rd ed., ch. 1)."""
    return TC * s / math.atanh(s)


def binodal_s(T: float) -> float:
    """s = 1 - 2x of the binodal at T < Tc, by scipy's brentq on T(s) - T."""
    return brentq(lambda s: binodal_T(s) - T, 1e-9, 1.0 - 1e-16, xtol=1e-16, rtol=4 * np.finfo(float).eps)


@pytest.fixture(scope="module")
def regular(tmp_path_factory):
    syn = Synthetic([Solution("fcc", {}, {}, ({"a": L0},))], (500.0, 1500.0))
    syn.load(tmp_path_factory.mktemp("regular"), "regular")
    return syn.system


# s from 0.999 (about 418 K, below the mapped window: used for points only) down to 0.05
# (about 1 K below Tc, where double precision still gives 1e-7 in composition).
@pytest.mark.parametrize("s", [0.999, 0.99, 0.95, 0.9, 0.8, 0.6, 0.4, 0.2, 0.1, 0.05])
def test_regular_binodal_point_equilibrium(regular, s):
    T = binodal_T(s)
    eq = equilibrate(regular, T, 0.5)
    assert eq.phase_names == ("fcc", "fcc")
    left, right = eq.phases
    assert left.x[1] == pytest.approx(0.5 * (1.0 - s), abs=X_TOL)
    assert right.x[1] == pytest.approx(0.5 * (1.0 + s), abs=X_TOL)
    # Symmetric gap: at x = 1/2 the lever rule gives half of each.
    assert left.amount_mol == pytest.approx(0.5, abs=1e-9)


def test_regular_gap_closes_at_the_critical_temperature(regular):
    assert equilibrate(regular, TC + 0.01, 0.5).phase_names == ("fcc",)
    # 0.01 K below Tc the gap is open but only s = sqrt(3 * 0.01 / Tc) ~ 0.005 wide.
    below = equilibrate(regular, TC - 0.01, 0.5)
    assert below.phase_names == ("fcc", "fcc")
    s = binodal_s(TC - 0.01)
    assert below.phases[1].x[1] - below.phases[0].x[1] == pytest.approx(s, rel=1e-3)


def test_regular_traced_gap_matches_binodal_and_critical_point(regular):
    d = map_diagram(regular)
    assert [f.phases for f in d.fields] == [("fcc", "fcc")]
    critical = [p for p in d.special_points if p.kind == "critical"]
    assert len(critical) == 1
    assert critical[0].temperature_K == pytest.approx(TC, abs=0.01)
    assert critical[0].x_B == pytest.approx(0.5, abs=1e-6)
    f = d.fields[0]
    assert f.T[-1] == pytest.approx(TC, abs=0.01)
    checked = 0
    for T, (x_left, x_right) in zip(f.T, f.x):
        if T > TC - 1e-3:
            continue   # the critical point itself, checked above (engine notes: composition is
            #            only defined to ~eps / s^3 within 1e-3 K of Tc)
        s = binodal_s(float(T))
        assert x_left == pytest.approx(0.5 * (1.0 - s), abs=X_TOL), f"left binodal at {T} K"
        assert x_right == pytest.approx(0.5 * (1.0 + s), abs=X_TOL), f"right binodal at {T} K"
        checked += 1
    assert checked >= 10
