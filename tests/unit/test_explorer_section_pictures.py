"""Pieces of the explorer's isopleth and triangle views (issues 14 and 15) that need no screen:
the triangle zoomed to the corner a model covers, the trade's names on field labels and on the
lines of Fe-C, the caution line, the key bars, the heat-treatment lines of the status pane."""

from __future__ import annotations

import numpy as np
import pytest

import ideal_ternaries as it
from ladle.engine import find_system
from ladle.engine.diagrams.alloy_transitions import AlloyTransitions, Transition
from ladle.engine.diagrams.heat_treatment import HeatTreatmentWindow
from ladle.tui.explorer.alloy_changes import AlloyChanges, change_lines
from ladle.tui.explorer.cautions import CAUTION_ROOM, caution_line
from ladle.tui.explorer.exploration import crossing_name
from ladle.tui.explorer.screens.section_screen import help_rows, key_bar
from ladle.tui.explorer.plotting import Frame
from ladle.tui.explorer.section_drawing import _triangle_frame, field_name, labelled_fields, triangle_point
from ladle.tui.explorer.section_exploration import SectionExploration


def test_a_model_of_a_corner_is_drawn_zoomed_to_that_corner():
    """ag-cu-sn covers Sn-rich alloys only (Ag 0-5.5, Cu 0-3.7 at%, its file): the frame holds
    that part with a margin, not the whole triangle; a model of every composition keeps it."""
    system = find_system("ag-cu-sn")
    frame, sides, labels, title = _triangle_frame(system, 44, 20)
    corners = np.array([[1.0, 0, 0], [0.945, 0.055, 0], [0.963, 0, 0.037], [0.908, 0.055, 0.037]])
    x, y = triangle_point(corners)
    assert frame.x_low < x.min() and x.max() < frame.x_high and frame.y_low < y.min() and y.max() < frame.y_high
    assert frame.x_high - frame.x_low < 0.1                   # the whole triangle is 1.1 wide
    assert [label.text for label in labels] == ["Ag 5.5", "Cu 3.7", "Sn"] and "covered part" in title
    whole, _, labels, _ = _triangle_frame(it.eutectic_system(), 44, 20)
    assert whole.x_high - whole.x_low == pytest.approx(1.1) and [label.text for label in labels] == ["A", "B", "C"]


def test_field_labels_use_the_files_trade_names():
    """ag-cu-sn.toml: bct = (Sn), Ag3Sn = epsilon, Cu6Sn5 = eta; fe-c.toml: bcc is ferrite below
    1400 K and delta ferrite above; a phase present twice keeps its structure name."""
    sac = find_system("ag-cu-sn")
    assert field_name(sac, ("Ag3Sn", "Cu6Sn5", "bct"), 480.0) == "epsilon + eta + (Sn)"
    iron = find_system("fe-c")
    assert field_name(iron, ("bcc", "fcc"), 1100.0) == "ferrite + austenite"
    assert field_name(iron, ("bcc", "liquid"), 1750.0) == "delta ferrite + liquid"
    assert field_name(iron, ("fcc", "fcc"), 1100.0) == "fcc + fcc"


def test_fe_c_opens_as_a_wt_percent_section_over_the_range_its_file_covers():
    e = SectionExploration(find_system("fe-fe3c"))
    start, end = e.ends()
    assert e.is_binary and e.basis == "wt" and e.element == "C"
    assert start == (1.0, 0.0) and end == pytest.approx((0.75, 0.25))     # covers_at_percent = [0, 25]
    e.cursor = type(e.cursor)(0.5, 1000.0)
    x = e.x_at_cursor()
    w_C = x[1] * 12.011 / (x[0] * 55.845 + x[1] * 12.011)     # molar masses (IUPAC 2013, as elements.toml)
    assert w_C == pytest.approx(0.5 * 0.06689, abs=2e-5)       # half of Fe3C's 6.69 wt% C: straight in wt%
    e.move(1, 0)
    assert e.cursor.u == pytest.approx(0.52) and e.alloy_key() == tuple(round(float(v), 12) for v in e.x_at_cursor())


def test_the_caution_line_keeps_its_main_statement_in_two_lines():
    iron = caution_line(find_system("fe-c").safety)
    assert iron == "! Molten iron and steel explode on contact with water (? more)"
    assert caution_line("Lead is toxic: wash hands.") == "! Lead is toxic (? more)"
    long_list = "Magnesium melts, chips and fines burn fiercely and water makes it worse (hydrogen): never water."
    assert caution_line(long_list) == "! Magnesium melts, chips and fines burn fiercely and water makes it worse (? more)"
    assert len(caution_line("Short, and plain")) <= CAUTION_ROOM


@pytest.mark.parametrize("system", ["fe-fe3c", "ag-cu-sn"])
def test_the_key_bar_fits_80_columns_and_names_only_the_keys_this_system_has(system):
    e = SectionExploration(find_system(system))
    bar = key_bar(e)
    assert len(bar) <= 80 and "s system" in bar and "+-0 zoom" in bar
    assert ("v vary" in bar) == ("i triangle" in bar) == (not e.is_binary)
    keys = [key for key, _ in help_rows(e)]
    assert ("v" in keys) == (not e.is_binary) and "s" in keys


def _window(kind: str, low: float, high: float | None, low_is: str, high_is: str, phases) -> AlloyChanges:
    transitions = AlloyTransitions(np.array([0.98, 0.02]), 1800.0, 298.15, 2.0, 0.01, ("liquid",), ("bcc", "Fe3C"), ())
    return AlloyChanges(transitions, {}, HeatTreatmentWindow(kind, low, high, low_is, high_is, tuple(phases)))


def test_the_heat_treatment_window_says_what_bounds_it_and_that_the_specification_governs():
    """Values invented for the layout; 1000 K is 726.85 C (NIST SP 811 (2008))."""
    iron = find_system("fe-fe3c")
    lines = change_lines(iron, _window("austenitizing", 1000.0, 1100.0, "A1", "Acm", ("fcc", "Fe3C")), "C", "°C")
    assert ("heading", "AUSTENITIZING, A1 to Acm") in lines and ("value", " 726.9-826.9 °C") in lines
    assert ("note", " austenite + cementite") in lines and lines[-1] == ("warning", " your specification governs")
    open_top = change_lines(iron, _window("austenitizing", 1000.0, None, "A3", "top of the scan", ("fcc",)), "K", "K")
    assert ("value", " above 1000.0 K") in open_top
    assert change_lines(iron, None, "C", "°C")[-1] == ("note", " computing ...")
    assert change_lines(iron, "no transitions: bad", "C", "°C")[-1] == ("warning", " no transitions: bad")
    assert all(len(text) <= 30 for _, text in lines)          # the status pane's width at 80x24


def test_freezing_constituents_are_named_as_the_trade_names_them():
    """fe-c.toml names the cementite eutectic's constituent ledeburite; bcc above 1400 K is
    delta ferrite; ag-cu-sn.toml: bct = (Sn), Ag3Sn = epsilon, Cu6Sn5 = eta."""
    iron = SectionExploration(find_system("fe-fe3c"))
    assert iron.constituent_name("eutectic fcc + Fe3C", 1500.0) == "eutectic austenite + cementite (ledeburite)"
    assert iron.constituent_name("primary bcc", 1700.0) == "primary delta ferrite"
    sac = SectionExploration(find_system("ag-cu-sn"))
    assert sac.constituent_name("ternary eutectic bct + Ag3Sn + Cu6Sn5", 490.0) == "ternary eutectic (Sn) + epsilon + eta"
    assert sac.constituent_name("primary fcc (Ag-rich)", 490.0) == "primary fcc (Ag-rich)"


def test_numbered_fields_run_without_a_gap_where_one_is_too_small_to_mark():
    # Three fields whose names are wider than the picture; the second sits on the first's cell,
    # so its number cannot be written: the picture shows 1 and 2 (it showed 1 and 3, and the
    # pane's key went '1 ...; 3 ...'), and the key names the unmarked field without a number.
    frame = Frame(0.0, 10.0, 0.0, 10.0, 20, 10)
    wide = "a field name wider than the whole picture"
    wanted = [(f"{wide} A", 5.0, 5.0), (f"{wide} B", 5.0, 5.0), (f"{wide} C", 5.0, 1.0)]
    labels, key = labelled_fields(wanted, frame)
    assert sorted(label.text for label in labels) == ["1", "2"]
    assert key == [f"1: {wide} A", f"2: {wide} C", f"too small: {wide} B"]


def test_a_change_inside_the_freezing_range_is_named_by_the_solid_that_forms():
    # ladle transitions fe-c-si --comp C=5at%,Si=5at%: at 1300.1 C bcc (delta ferrite) + liquid
    # -> fcc (austenite) + liquid; the pane called that a solvus, a solid-solubility line.
    iron = find_system("fe-c-si")
    def change(T_K, above, below):
        return Transition(T_K, above, below, 0.01, None, None)
    transitions = AlloyTransitions(np.array([0.9, 0.05, 0.05]), 1900.0, 298.15, 2.0, 0.01, ("liquid",), ("bcc", "graphite"),
                                   (change(1681.8, ("liquid",), ("bcc", "liquid")),
                                    change(1573.2, ("bcc", "liquid"), ("fcc", "liquid")),
                                    change(1440.75, ("fcc", "liquid"), ("fcc", "graphite"))))
    lines = change_lines(iron, AlloyChanges(transitions, {}, None), "C", "°C")
    assert [text for _, text in lines[1:]] == [" 1408.7 °C liquidus", " 1300.1 °C austenite forms",
                                               " 1167.6 °C solidus"]
    assert crossing_name(("fcc", "liquid"), ("liquid",)) == "fcc used up"
    assert crossing_name(("fcc", "graphite"), ("bcc", "fcc", "graphite")) == "solvus"


def test_the_structure_keeps_each_constituents_amounts_together():
    # A 1.12 wt% C iron (amounts invented for the layout): the long eutectic name wrapped at
    # the pane's edge, leaving '>99.999 /' on one line and '90.1' on the next.
    from types import SimpleNamespace as Fake
    iron = SectionExploration(find_system("fe-fe3c"))
    def path(end_K, constituents):
        return Fake(end_K=end_K, end="eutectic", constituents=[Fake(name=n, mass_fraction=f) for n, f in constituents])
    paths = {"equilibrium": path(1599.5, [("primary fcc", 0.9999999)]),
             "scheil": path(1421.5, [("primary fcc", 0.901), ("eutectic fcc + Fe3C", 0.0993)])}
    result = Fake(equilibrium=Fake(liquidus_K=1726.4), path=paths.__getitem__)
    iron.freezing[iron.alloy_key()] = result
    texts = [text for _, text in iron.freezing_lines("C", "°C")]
    assert all(len(text) <= 30 for text in texts), texts
    primary = texts.index(" primary austenite")
    assert texts[primary + 1] == "   >99.999 / 90.1"
    eutectic = texts.index(" eutectic austenite +")
    assert texts[eutectic + 1:eutectic + 3] == ["   cementite (ledeburite)", "   - / 9.93"]
    # Where the pane is short (A356.0 in al-mg-si: its ternary eutectic's amounts fell under the
    # caution), the screen's second choice names the paths in the heading: one line less.
    compact = iron.freezing_lines("C", "°C", compact=True)
    assert len(compact) == len(texts) - 1 and ("heading", "STRUCTURE mass %: eq. / Scheil") in compact
    assert all(len(text) <= 30 for _, text in compact)


def test_a_long_change_name_wraps_under_its_temperature():
    # ladle transitions fe-c-si --comp C=5at%,Si=5at%: 829.7 C, the stable eutectoid range
    # begins; 'eutectoid (graphite) begins' is the file's trade name of that line.
    iron = find_system("fe-c-si")
    change = Transition(1102.85, ("fcc", "graphite"), ("bcc", "fcc", "graphite"), 0.01, None, None)
    transitions = AlloyTransitions(np.array([0.9, 0.05, 0.05]), 1900.0, 298.15, 2.0, 0.01, ("liquid",),
                                   ("bcc", "graphite"), (change,))
    lines = change_lines(iron, AlloyChanges(transitions, {0: "eutectoid (graphite) begins"}, None), "C", "°C")
    assert lines[1:] == [("value", " 829.7 °C eutectoid (graphite)"), ("value", "   begins")]
