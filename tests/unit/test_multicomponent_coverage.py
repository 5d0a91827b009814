"""The covered range of a system of three or more elements (`covers_at_percent` as a table of at%
ranges per element, systems/FORMAT.md): read by the loader, kept on System, and respected by the
isopleth (mapped only over its covered part) and the isothermal section (mapped only over the
covered part of the triangle).

The system is the invented ideal ternary eutectic of ideal_ternaries.py (Pb, Sn and Bi stand for
A, B and C; invented molar masses 60, 30 and 45 g/mol) with an invented covered range. The check
values are hand conversions between wt% and at% (x_i = (w_i / M_i) / sum_j w_j / M_j), solved
for the section's edge with scipy's brentq, independently of the linear form the engine uses.
"""

from __future__ import annotations

import numpy as np
import pytest

import ideal_ternaries as it
from ladle.engine import SystemFileError
from ladle.engine.diagrams.isopleth import covered_part, map_isopleth
from ladle.engine.diagrams.isothermal import covered_nodes, map_isothermal
from ladle.engine.files.loader import load_system

@pytest.fixture
def system(tmp_path):
    return load_system(it.write_covered_file(tmp_path))


def test_the_loader_keeps_the_ranges_as_mole_fractions_in_the_systems_order(system):
    assert system.covers_elements == {"Sn": (0.0, 0.3), "Bi": (0.05, 0.2)}
    assert system.element_ranges.tolist() == [[0.0, 1.0], [0.0, 0.3], [0.05, 0.2]]
    assert system.covered_range_text() == "Sn 0-30 at%, Bi 5-20 at%"


def test_covered_compositions_edges_included(system):
    x = np.array([[0.7, 0.2, 0.1], [0.5, 0.3, 0.2], [0.6, 0.35, 0.05], [0.85, 0.12, 0.03], [0.2, 0.3, 0.5]])
    assert system.covered(x).tolist() == [True, True, False, False, False]
    assert system.covered(np.array([0.7, 0.2, 0.1])) is True


@pytest.mark.parametrize("covers, key, expected", [
    ("covers_at_percent = [0, 50]", "covers_at_percent", "expected a table of [from, to] at% per element"),
    ("covers_at_percent = { Cu = [0, 5] }", "covers_at_percent.Cu", "not an element of this system"),
    ("covers_at_percent = { Sn = [0, 120] }", "covers_at_percent.Sn", "expected 0 <= from < to <= 100 (at%)"),
    ("covers_at_percent = { Sn = [10, 5] }", "covers_at_percent.Sn", "expected 0 <= from < to <= 100 (at%)"),
    ("covers_at_percent = { Sn = [0, \"5\"] }", "covers_at_percent.Sn", "expected [from, to] in at% of Sn"),
    ("covers_at_percent = { Sn = [60, 100], Bi = [50, 100] }", "covers_at_percent", "leave no composition"),
])
def test_a_bad_range_is_one_line_naming_the_key(tmp_path, covers, key, expected):
    with pytest.raises(SystemFileError) as err:
        load_system(it.write_covered_file(tmp_path, covers))
    message = str(err.value)
    assert message.startswith(f"ideal-covered.toml: {key}: ") and expected in message and "\n" not in message


def _bi_at_edge_wt(sn_wt: float, bi_at: float) -> float:
    """The Bi wt% at which an alloy of `sn_wt` wt% Sn (Pb the balance) holds `bi_at` mole
    fraction of Bi, by brentq on the hand conversion."""
    from scipy.optimize import brentq

    def x_bi(w_bi: float) -> float:
        n = np.array([1.0 - sn_wt - w_bi, sn_wt, w_bi]) / it.MOLAR_MASS
        return n[2] / n.sum()

    return brentq(lambda w: x_bi(w) - bi_at, 0.0, 1.0 - sn_wt, xtol=1e-14)


def test_a_wt_percent_isopleth_is_cut_where_the_mole_fractions_reach_the_edge(system):
    start, end, warnings = covered_part(system, (0.9, 0.1, 0.0), (0.3, 0.1, 0.6), "wt")
    assert start[2] == pytest.approx(_bi_at_edge_wt(0.1, 0.05), abs=1e-12)
    assert end[2] == pytest.approx(_bi_at_edge_wt(0.1, 0.20), abs=1e-12)
    assert start[1] == end[1] == pytest.approx(0.1)
    assert warnings == ["drawn only over the range this model covers (Sn 0-30 at%, Bi 5-20 at%)"]


def test_a_covered_isopleth_is_left_whole_and_an_uncovered_one_refused(system):
    inside = ((0.75, 0.15, 0.10), (0.70, 0.15, 0.15))
    assert covered_part(system, *inside, "at") == (*inside, [])
    with pytest.raises(ValueError, match=r"^the section lies outside the range this model covers "
                                         r"\(Sn 0-30 at%, Bi 5-20 at%\)$"):
        covered_part(system, (0.5, 0.45, 0.05), (0.4, 0.45, 0.15), "at")


def test_no_line_field_or_invariant_of_an_isopleth_lies_outside(system, monkeypatch):
    from ladle.engine.diagrams import isopleth

    monkeypatch.setattr(isopleth, "equilibrate", it.equilibrate_for(it.eutectic_system()))   # closed form: fast
    iso = map_isopleth(system, (0.8, 0.2, 0.0), (0.2, 0.2, 0.6), "at", "Bi")
    assert iso.start[2] == pytest.approx(0.05) and iso.end[2] == pytest.approx(0.20)
    assert iso.warnings[0].startswith("drawn only over the range this model covers")
    us = [u for line in iso.lines for u, _T in line.points] + [f.middle[0] for f in iso.fields]
    us += [u for inv in iso.invariants for u in inv.u_range]
    assert us and system.covered(np.array([iso.mole_fractions(u) for u in us])).all()


def test_the_isothermal_section_is_mapped_over_the_covered_corner_only(system):
    nodes = covered_nodes(system, 24)
    assert system.covered(nodes).all() and 150 <= len(nodes) <= 400   # about the 325 of a whole triangle
    assert nodes[:, 2].min() == pytest.approx(0.05) and nodes[:, 2].max() == pytest.approx(0.20, abs=0.01)
    section = map_isothermal(system, 700.0, divisions=8)
    assert section.warnings == ("mapped only over the range this model covers (Sn 0-30 at%, Bi 5-20 at%)",)
    assert system.covered(np.array([f.middle for f in section.fields])).all()


def test_a_system_covering_everything_keeps_the_whole_triangle(tmp_path):
    whole = load_system(it.write_system_files(tmp_path)["ideal-eutectic"])
    assert whole.covers_elements == {} and len(covered_nodes(whole, 24)) == 325   # (24 + 1)(24 + 2) / 2


def test_the_explorers_section_opens_and_stays_inside(system):
    from ladle.tui.explorer.entry import TypedPoint
    from ladle.tui.explorer.section_exploration import SectionExploration

    section = SectionExploration(system)
    start, end = section.ends()
    assert system.covered(np.array([start, end])).all()
    assert start[1] == 0.0 and end[1] == pytest.approx(0.30)   # Sn varies over its range, Pb the balance
    section.vary_next()
    start, end = section.ends()
    assert system.covered(np.array([start, end])).all()
    assert start[2] == pytest.approx(0.05) and end[2] == pytest.approx(0.20)   # Bi varies over its range
    with pytest.raises(ValueError, match="outside the range this model covers"):
        section.jump(TypedPoint(None, None, (0.5, 0.4, 0.1)))


def test_a_check_outside_the_covered_range_is_not_measured(tmp_path):
    from ladle.engine.checking.measure import evaluate_all

    path = it.write_covered_file(tmp_path)
    path.write_text(path.read_text() + """
[[check]]
kind = "liquidus"
temperature_K = 1000.0
at_percent = { Sn = 40, Bi = 10 }
tolerance_K = 5.0
source = "Invented for tests."
note = "tolerance: invented"
""")
    system = load_system(path)
    (outcome,) = evaluate_all(system, system.checks)
    assert not outcome.passed
    assert outcome.problem == "Sn 40, Bi 10 at% lies outside the range this model covers (Sn 0-30 at%, Bi 5-20 at%)"
