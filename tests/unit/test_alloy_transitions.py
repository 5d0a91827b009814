"""One alloy through temperature (engine/diagrams/alloy_transitions.py) against the mapped diagram.

The check values are independent of the scan: `melt_range` solves each crossing of the alloy's
composition with a traced boundary of the mapped diagram (tie-line Newton with temperature free)
and each invariant with the three-phase conditions, while the scan only bisects point equilibria.
The two must agree to 1e-3 K on every shipped binary.
"""

from __future__ import annotations

import numpy as np
import pytest

from ladle.engine import find_system, list_systems
from ladle.engine.diagrams.alloy_transitions import alloy_transitions
from ladle.engine.diagrams.mappable import unmapped_phases
from ladle.engine.diagrams.melt import melt_range

#: Every shipped system whose whole diagram can be mapped (binaries of solutions and compounds).
BINARIES = [e.name for e in list_systems()
            if len(find_system(e.name).elements) == 2 and not unmapped_phases(find_system(e.name))]
#: Two alloys per system, at these shares of the composition range the model covers (chosen off
#: any special composition).
SHARES = (0.137, 0.618)


@pytest.mark.parametrize("name", BINARIES)
def test_transitions_agree_with_the_mapped_diagram(name: str) -> None:
    system = find_system(name)
    lo_x, hi_x = system.covers
    lo_T, hi_T = system.temperature_range_K
    for share in SHARES:
        x_b = lo_x + share * (hi_x - lo_x)
        scan = alloy_transitions(system, x_b, highest_K=hi_T, lowest_K=lo_T)
        mapped = melt_range(system, x_b).crossings
        assert len(scan.transitions) == len(mapped), (x_b, scan.transitions, mapped)
        for t, c in zip(scan.transitions, mapped):
            assert abs(t.temperature_K - c.temperature_K) < 1e-3, (x_b, t, c)
            assert sorted(t.above) == sorted(c.above) and sorted(t.below) == sorted(c.below)
            assert t.uncertainty_K <= scan.tolerance_K


def test_amounts_just_below_are_those_of_the_lever_rule() -> None:
    """Below the Pb-Sn eutectic, a hypoeutectic alloy's amounts follow the lever rule between the
    two solid ends of the tie-line (D.R. Gaskell, Introduction to the Thermodynamics of
    Materials, 5th ed., the lever rule): checked with the phases' own compositions."""
    system = find_system("pb-sn")
    result = alloy_transitions(system, 0.4)
    eutectic = next(t for t in result.transitions if "liquid" in t.above and "liquid" not in t.below)
    fcc, bct = eutectic.amounts_below
    x_b = 0.4
    lever = (bct.x[1] - x_b) / (bct.x[1] - fcc.x[1])
    assert fcc.amount_mol == pytest.approx(lever, abs=1e-9)
    assert fcc.amount_mol + bct.amount_mol == pytest.approx(1.0, abs=1e-12)


def test_scan_starts_above_the_liquidus_and_ends_at_room_temperature() -> None:
    system = find_system("pb-sn")
    result = alloy_transitions(system, 0.05)
    assert result.top == ("liquid",)
    assert result.lowest_K == pytest.approx(298.15)
    assert result.liquidus_K is not None and result.solidus_K is not None
    assert result.highest_K > result.liquidus_K > result.solidus_K


def test_a_field_narrower_than_the_step_is_found_when_its_sides_differ() -> None:
    """Two changes inside one scan step are both found: the interval's middle differs from both ends."""
    system = find_system("pb-sn")
    fine = alloy_transitions(system, 0.1)
    coarse = alloy_transitions(system, 0.1, step_K=50.0)
    assert [t.above for t in coarse.transitions] == [t.above for t in fine.transitions]
    assert np.allclose([t.temperature_K for t in coarse.transitions], [t.temperature_K for t in fine.transitions],
                       atol=1e-5)


def test_bad_compositions_are_refused() -> None:
    system = find_system("pb-sn")
    with pytest.raises(ValueError):
        alloy_transitions(system, 1.5)
    with pytest.raises(ValueError):
        alloy_transitions(system, [0.2, 0.2, 0.6])
    with pytest.raises(ValueError):
        alloy_transitions(system, 0.2, step_K=0.0)


def test_a_ternary_of_two_ideal_solutions_melts_where_the_closed_form_says() -> None:
    """Any number of elements: an ideal liquid and an ideal solid in A-B-C (invented melting points
    and enthalpies of fusion, G(liquid) - G(solid) = dH (1 - T/Tm) per element). With
    k_i = x_i(solid) / x_i(liquid) = exp(dG_i / RT) from equal chemical potentials, the liquidus
    of alloy z is where sum_i z_i k_i = 1 and the solidus where sum_i z_i / k_i = 1 (the
    two-phase split of H.H. Rachford and J.D. Rice, J. Pet. Technol. 4 (1952) 19, at its ends),
    solved with scipy's brentq."""
    import sys
    from pathlib import Path

    from scipy.optimize import brentq

    from ladle.engine.models.polynomials import TemperatureFunction
    from ladle.engine.models.sublattice import SublatticePhase
    from ladle.engine.units import GAS_CONSTANT as R

    sys.path.insert(0, str(Path(__file__).parent))
    from multicomponent_models import system_of

    els = ("A", "B", "C")
    Tm, dH = np.array([1000.0, 1200.0, 1400.0]), np.array([10000.0, 12000.0, 14000.0])

    def solution(name: str, coefficients: list[dict]) -> SublatticePhase:
        ends = {(el,): TemperatureFunction.constant_terms(c) for el, c in zip(els, coefficients)}
        return SublatticePhase(name=name, elements=els, site_ratios=(1.0,), constituents=(els,), end_members=ends)

    system = system_of(els, [solution("liquid", [{"a": h, "b": -h / t} for h, t in zip(dH, Tm)]),
                             solution("solid", [{"a": 0.0}] * 3)])
    system.model_range_K, system.covers_K, system.temperature_range_K = (1.0, 6000.0), (0.0, np.inf), (900.0, 1500.0)
    z = np.array([0.3, 0.3, 0.4])

    def k(T: float) -> np.ndarray:
        return np.exp(dH * (1.0 - T / Tm) / (R * T))

    liquidus = brentq(lambda T: np.sum(z * k(T)) - 1.0, 900.0, 1500.0, xtol=1e-12)
    solidus = brentq(lambda T: np.sum(z / k(T)) - 1.0, 900.0, 1500.0, xtol=1e-12)
    result = alloy_transitions(system, z, highest_K=1400.0, lowest_K=1000.0)
    assert [(set(t.above), set(t.below)) for t in result.transitions] == [
        ({"liquid"}, {"liquid", "solid"}), ({"liquid", "solid"}, {"solid"})]
    assert result.transitions[0].temperature_K == pytest.approx(liquidus, abs=1e-5)
    assert result.transitions[1].temperature_K == pytest.approx(solidus, abs=1e-5)
    assert (result.liquidus_K, result.solidus_K) == (result.transitions[0].temperature_K, result.transitions[1].temperature_K)
