"""An isopleth's basis in the explorer: a cast iron's section holds silicon's mass fraction (the
foundry's Fe-C-Si sections are drawn at constant wt% Si), other systems of three or more elements
hold mole fractions, and `u` switches between the two without moving the cursor's alloy. Plain
model tests: nothing is mapped."""

from __future__ import annotations

import numpy as np
import pytest

from ladle.engine import find_system
from ladle.engine.units import mass_from_mole, mole_from_mass
from ladle.tui.explorer.entry import TypedPoint
from ladle.tui.explorer.section_exploration import SectionCursor, SectionExploration


def _alloy(system, **wt_percent: float) -> np.ndarray:
    w = np.array([wt_percent.get(el, 0.0) / 100.0 for el in system.elements])
    w[0] = 1.0 - w.sum()
    return mole_from_mass(w, system.molar_mass)


def _along(e: SectionExploration, u: float) -> np.ndarray:
    e.cursor = SectionCursor(u, e.cursor.temperature_K)
    return e.x_at_cursor()


def test_a_cast_iron_section_holds_silicon_by_mass_and_stays_covered():
    system = find_system("fe-c-si")
    e = SectionExploration(system, _alloy(system, C=3.4, Si=2.5))
    assert e.basis == "wt" and e.element == "C"
    w_at = [mass_from_mole(_along(e, u), system.molar_mass) for u in (0.0, 0.3, 0.7, 1.0)]
    assert all(w[2] == pytest.approx(0.025, abs=1e-12) for w in w_at)          # Si held at 2.5 wt%
    assert w_at[0][1] == pytest.approx(0.0, abs=1e-12)                            # from no carbon ...
    assert all(system.covered(_along(e, u)) for u in np.linspace(0.0, 1.0, 11))  # ... to the covered edge
    covered_top = system.element_ranges[1, 1]
    assert _along(e, 1.0)[1] == pytest.approx(covered_top, abs=1e-9)              # the edge is the model's


def test_the_cursor_keeps_its_alloy_when_the_basis_switches():
    system = find_system("fe-c-si")
    alloy = _alloy(system, C=3.4, Si=2.5)
    e = SectionExploration(system, alloy, temperature_K=1500.0)
    assert e.x_at_cursor() == pytest.approx(alloy, abs=1e-12)
    e.toggle_basis()
    assert e.basis == "at" and e.x_at_cursor() == pytest.approx(alloy, abs=1e-12)
    start, end = (np.array(x) for x in e.ends())
    assert start[2] == pytest.approx(end[2], abs=1e-15) == pytest.approx(alloy[2], abs=1e-15)   # Si held by moles
    e.toggle_basis()
    assert e.basis == "wt" and e.x_at_cursor() == pytest.approx(alloy, abs=1e-12)
    assert e.cursor.temperature_K == 1500.0


def test_other_ternaries_open_in_at_percent_and_a_typed_alloy_sets_the_held_content():
    assert SectionExploration(find_system("ag-cu-sn")).basis == "at"
    system = find_system("fe-c-si")
    e = SectionExploration(system, _alloy(system, C=3.4, Si=2.5))
    typed = _alloy(system, C=4.0, Si=1.8)
    e.jump(TypedPoint(1400.0, None, tuple(typed)))
    assert e.x_at_cursor() == pytest.approx(typed, abs=1e-12)
    held = [mass_from_mole(np.array(x), system.molar_mass)[2] for x in e.ends()]
    assert held == pytest.approx([0.018, 0.018], abs=1e-12)                        # the new section: 1.8 wt% Si
    with pytest.raises(ValueError, match="outside the range this model covers"):
        e.jump(TypedPoint(None, None, tuple(_alloy(system, C=6.0, Si=1.8))))
    assert e.x_at_cursor() == pytest.approx(typed, abs=1e-12)                      # a refused entry moves nothing
