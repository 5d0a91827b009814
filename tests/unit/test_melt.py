"""Melt ranges (issue 3) and the pure melting points of the shipped copper-nickel (issue 2).

Sources of the check values:
- Isomorphous alloy: the ideal liquidus and solidus in closed form (D.R. Gaskell and D.E.
  Laughlin, Introduction to the Thermodynamics of Materials, 6th ed., CRC Press (2017), ch. 10;
  synthetic.ideal_two_phase), inverted for the alloy's composition with scipy.optimize.brentq;
  and the traced boundary itself (its tie-lines are exact at their temperatures).
- Hypoeutectic alloy in a two-phase solid field: first liquid appears at the eutectic
  temperature, and an alloy of the eutectic composition melts at one temperature (the
  definition of a eutectic reaction; Gaskell and Laughlin, 6th ed., ch. 10).
- Copper and nickel melting points: CRC Handbook of Chemistry and Physics, 97th ed. (2016):
  Cu 1084.62 C, Ni 1455 C (recalled from memory).
"""

from __future__ import annotations

import numpy as np
import pytest
from scipy.optimize import brentq

from ladle.engine import equilibrate, find_system
from ladle.engine.diagrams.diagram import map_diagram
from ladle.engine.diagrams.melt import melt_range

from topologies import TM_A, TM_B, eutectic, isomorphous, isomorphous_tie_line


@pytest.fixture(scope="module")
def iso(tmp_path_factory):
    return isomorphous().synthetic.load(tmp_path_factory.mktemp("iso"), "isomorphous")


@pytest.fixture(scope="module")
def eut(tmp_path_factory):
    return eutectic().synthetic.load(tmp_path_factory.mktemp("eut"), "eutectic")


def closed_form_liquidus_solidus(x0: float) -> tuple[float, float]:
    """(liquidus, solidus) in K of the isomorphous alloy x_B = x0, from the closed form."""
    lo, hi = TM_B + 1e-9, TM_A - 1e-9
    liquidus = brentq(lambda T: isomorphous_tie_line(T)[2] - x0, lo, hi, xtol=1e-12)
    solidus = brentq(lambda T: isomorphous_tie_line(T)[0] - x0, lo, hi, xtol=1e-12)
    return liquidus, solidus


@pytest.mark.parametrize("x0", [0.001, 0.05, 0.25, 0.5, 0.75, 0.95, 0.999])
def test_isomorphous_melt_range_matches_closed_form(iso, x0):
    m = melt_range(iso, x0)
    liquidus, solidus = closed_form_liquidus_solidus(x0)
    assert m.liquidus_K == pytest.approx(liquidus, abs=1e-6)
    assert m.solidus_K == pytest.approx(solidus, abs=1e-6)
    assert m.freezing_range_K == pytest.approx(liquidus - solidus, abs=2e-6)
    assert [(c.above, c.below) for c in m.crossings] == [(("liquid",), ("solid", "liquid")),
                                                        (("solid", "liquid"), ("solid",))]
    assert [c.temperature_K for c in m.crossings] == [m.liquidus_K, m.solidus_K]


def test_isomorphous_melt_range_equals_traced_curves(iso):
    (f,) = map_diagram(iso).fields
    assert f.phases == ("solid", "liquid")
    inner = [k for k in range(len(f.T)) if TM_B + 1.0 < f.T[k] < TM_A - 1.0]
    assert len(inner) >= 5
    for k in inner:
        T, (x_solid, x_liquid) = float(f.T[k]), f.x[k]
        # The alloy whose composition is the traced liquid at T has its liquidus at T, and the
        # alloy of the traced solid its solidus.
        assert melt_range(iso, float(x_liquid)).liquidus_K == pytest.approx(T, abs=1e-6)
        assert melt_range(iso, float(x_solid)).solidus_K == pytest.approx(T, abs=1e-6)


def test_hypoeutectic_alloy_solidus_is_the_eutectic(eut):
    (inv,) = map_diagram(eut).invariants
    assert inv.kind == "eutectic"
    (_, x_fcc), (_, x_liquid), (_, _x_hcp) = inv.phases
    x0 = 0.5 * (x_fcc + x_liquid)          # between the fcc end of the eutectic line and the eutectic point
    m = melt_range(eut, x0)
    assert m.solidus_K == pytest.approx(inv.temperature_K, abs=1e-6)
    # Below the solidus the alloy lies in the two-phase solid field.
    assert equilibrate(eut, inv.temperature_K - 1.0, x0).phase_names == ("fcc", "hcp")
    assert m.liquidus_K > inv.temperature_K + 10.0
    assert [(c.above, c.below) for c in m.crossings] == [(("liquid",), ("fcc", "liquid")),
                                                        (("fcc", "liquid"), ("fcc", "hcp"))]
    # At the liquidus the traced fcc + liquid boundary passes through the alloy.
    eq = equilibrate(eut, m.liquidus_K - 1e-3, x0)
    assert eq.phase_names == ("fcc", "liquid")
    assert eq.phases[1].x[1] == pytest.approx(x0, abs=1e-4)


def test_eutectic_alloy_has_no_freezing_range(eut):
    (inv,) = map_diagram(eut).invariants
    x_eutectic = inv.phases[1][1]
    m = melt_range(eut, x_eutectic)
    assert m.freezing_range_K == pytest.approx(0.0, abs=0.01)
    assert m.solidus_K == pytest.approx(inv.temperature_K, abs=0.01)


# --- copper-nickel (systems/cu-ni.toml) ------------------------------------------------------------
# CRC Handbook of Chemistry and Physics, 97th ed. (2016), recalled from memory.
CU_MELTING_K = 1084.62 + 273.15
NI_MELTING_K = 1455.0 + 273.15
HANDBOOK_TOLERANCE_K = 0.5          # from the issue


def test_cu_ni_pure_melting_points_match_handbook():
    system = find_system("cu-ni")
    assert system.elements == ("Cu", "Ni")
    tm = system.melting_points
    assert tm["Cu"] == pytest.approx(CU_MELTING_K, abs=HANDBOOK_TOLERANCE_K)
    assert tm["Ni"] == pytest.approx(NI_MELTING_K, abs=HANDBOOK_TOLERANCE_K)
    # The point equilibria agree: solid just below, liquid just above each handbook value.
    for x_B, T in ((0.0, CU_MELTING_K), (1.0, NI_MELTING_K)):
        below = equilibrate(system, T - HANDBOOK_TOLERANCE_K, x_B).phase_names
        above = equilibrate(system, T + HANDBOOK_TOLERANCE_K, x_B).phase_names
        assert below != ("liquid",) and above == ("liquid",)
    # An alloy melts over a range between the two: Cu-Ni is isomorphous.
    m = melt_range(system, 0.5)
    assert CU_MELTING_K < m.solidus_K < m.liquidus_K < NI_MELTING_K
    assert np.isfinite(m.freezing_range_K)
