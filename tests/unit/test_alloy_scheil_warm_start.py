"""The warm start of the general minimiser (engine/minimize/global_minimum.py, `near`) and the Scheil
path that uses it (engine/solidify/alloy_scheil.py: each step starts from the last step's phases):
a start that lacks a phase the answer needs must never end in an answer without it. Reference: the
same minimiser started afresh from its sampled clouds (no start), whose answers the audit
tests/benchmarks/global_minimum_audit.py checks against scipy."""

from __future__ import annotations

import numpy as np
import pytest

from ladle.engine import find_system
from ladle.engine.files.alloys import find_alloy, mole_fractions
from ladle.engine.minimize.equilibrium import PointEquilibrium, equilibrate
from ladle.engine.solidify import alloy_scheil


def _alloy(system_name: str, alloy_name: str):
    system = find_system(system_name)
    alloy = find_alloy(system.alloys, alloy_name)
    return system, np.array(mole_fractions(alloy.parts, alloy.basis, system.elements, system.molar_mass))


#: Two answers whose G differ by less than this (J/mol) are both the minimum: the minimiser's own
#: driving-force tolerance (global_minimum.DRIVING_FORCE_TOLERANCE, 1e-6 J/mol scaled by 1e-4 |G|)
#: with room. Within about 1e-7 K of an invariant temperature two phase sets tie so (their G
#: differ by the entropy difference, ~10 J/(mol K), times the distance in temperature).
TIE_J_PER_MOL = 1e-5


def _same(warm: PointEquilibrium, cold: PointEquilibrium) -> bool:
    """Whether the two answers have the same phases (then compared in detail); either way their
    G agree (neither lies above the other)."""
    assert warm.gibbs_J_per_mol == pytest.approx(cold.gibbs_J_per_mol, abs=TIE_J_PER_MOL)
    if warm.phase_names != cold.phase_names:
        return False
    for a, b in zip(warm.phases, cold.phases):
        assert a.x == pytest.approx(b.x, abs=1e-8)
        assert a.amount_mol == pytest.approx(b.amount_mol, abs=1e-8)
    return True


def test_every_warm_started_equilibrium_of_a_scheil_path_is_the_fresh_minimisers_answer(monkeypatch):
    """A356.0 (Al-7Si-0.35Mg wt%) in the shipped Al-Mg-Si system: primary fcc, then silicon joins
    (a new solid mid-way, which a start from the last step lacks), then the ternary eutectic with
    Mg2Si. Every point equilibrium the path asks for with a start is computed afresh as well: the
    two agree in phases, G, compositions and amounts."""
    system, x = _alloy("al-mg-si", "A356.0")
    compared = []

    def checked(system_, T, composition, x_A=None, near=None):
        answer = equilibrate(system_, T, composition, near=near)
        if near is not None:
            compared.append((T, near.phase_names, answer.phase_names, _same(answer, equilibrate(system_, T, composition))))
        return answer

    monkeypatch.setattr(alloy_scheil, "equilibrate", checked)
    path = alloy_scheil.alloy_scheil(system, x)
    assert [f for f, _T in path.forms] == ["fcc", "diamond", "Mg2Si"]
    assert path.end == "ternary eutectic"
    assert len(compared) > 50
    # the starts lacked a phase of the answer where silicon and Mg2Si appear
    assert any(set(after) - set(before) for _T, before, after, _same_phases in compared)
    # phase sets differ only in ties within 1e-6 K of the invariant reactions
    ties = [T for T, _before, _after, same_phases in compared if not same_phases]
    assert all(min(abs(T - a.temperature_K) for a in path.arrests) < 1e-6 for T in ties)


@pytest.mark.parametrize("system_name, alloy_name, T_start, T", [
    ("al-mg-si", "A356.0", 900.0, 850.0),      # liquid -> fcc + liquid
    ("al-mg-si", "A356.0", 850.0, 800.0),      # fcc + liquid -> diamond + fcc
    ("ag-au-cu", "14ct-1N", 1120.0, 900.0),    # fcc + liquid -> two fcc sets (the Ag-Cu gap)
    ("ag-au-cu", "14ct-1N", 1000.0, 900.0),    # one fcc set -> two
])
def test_a_start_from_another_temperature_gains_the_phases_it_lacks(system_name, alloy_name, T_start, T):
    """The answer at T started from the answer at T_start (other phases) is the fresh answer at T."""
    system, x = _alloy(system_name, alloy_name)
    start = equilibrate(system, T_start, x)
    cold = equilibrate(system, T, x)
    assert start.phase_names != cold.phase_names
    moved = PointEquilibrium(T, start.x, start.w, start.phases, start.gibbs_J_per_mol, start.chemical_potentials,
                             start.converged)
    assert _same(equilibrate(system, T, x, near=moved), cold)
