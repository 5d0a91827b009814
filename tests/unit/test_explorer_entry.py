"""Typed points in the explorer: read right, or refused with the reason."""

import numpy as np
import pytest

from ladle.tui.explorer.cursor import Window
from ladle.tui.explorer.entry import EntryError, TypedPoint, check_inside, parse_point
from ladle.tui.explorer.glyphs import ASCII, UNICODE
from ladle.tui.explorer.scales import Scales

ELEMENTS = ("Pb", "Sn")
PB_SN = np.array([207.2, 118.71])   # g/mol, IUPAC standard atomic weights


@pytest.mark.parametrize("text, T_K, x_B", [
    ("650C 12wt%", 923.15, 0.192254),
    ("923K 20at%", 923.0, 0.2),
    ("1200F", (1200 - 32) * 5 / 9 + 273.15, None),
    ("Sn=12wt%", None, 0.192254),
    ("pb = 88 wt %", None, 0.192254),       # the first element's share, spaces allowed
    ("183 C, 61.9 wt%", 456.15, 0.739295),
    ("20at% 250", 523.15, 0.2),            # any order; no unit means degrees Celsius
])
def test_good_entries(text, T_K, x_B):
    point = parse_point(text, ELEMENTS, PB_SN)
    assert point.temperature_K == (None if T_K is None else pytest.approx(T_K))
    assert point.x_B == (None if x_B is None else pytest.approx(x_B, abs=1e-6))


@pytest.mark.parametrize("text, reason", [
    ("", "type a temperature"),
    ("abc", "cannot read temperature 'abc'"),
    ("650C 700C", "a second temperature"),
    ("-300C", "absolute zero"),
    ("Cu=3wt%", "element Cu is not in this system (Pb-Sn)"),
    ("120wt%", "outside 0-100 %"),
    ("12%", "with wt% or at%"),
])
def test_bad_entries_say_why(text, reason):
    with pytest.raises(EntryError, match=None) as caught:
        parse_point(text, ELEMENTS, PB_SN)
    assert reason in str(caught.value)
    assert "\n" not in str(caught.value)


def test_points_outside_the_system_are_refused_with_its_range():
    limits = Window(303.15, 673.15, 0.0, 0.4)
    scales = Scales(PB_SN, "C", "at")
    with pytest.raises(EntryError, match="outside this system's range, 30 to 400 °C"):
        check_inside(TypedPoint(1000.0, None), limits, scales, UNICODE)
    with pytest.raises(EntryError, match="range, 30 to 400 C"):
        check_inside(TypedPoint(1000.0, None), limits, scales, ASCII)
    with pytest.raises(EntryError, match="covers 0 to 40.0 at% only"):
        check_inside(TypedPoint(None, 0.5), limits, scales, UNICODE)
    check_inside(TypedPoint(500.0, 0.4), limits, scales, UNICODE)   # inside: no error


SAC = ("Sn", "Ag", "Cu")
SAC_MASS = np.array([118.71, 107.87, 63.546])   # g/mol, IUPAC standard atomic weights


def test_a_multicomponent_alloy_is_typed_as_on_the_command_line():
    point = parse_point("Ag=3wt% Cu=0.5wt% 250C", SAC, SAC_MASS)
    assert point.temperature_K == pytest.approx(523.15)
    assert point.x_B is None
    # x_i = (w_i / M_i) / sum_j (w_j / M_j), the definition of the mole fraction
    n = np.array([0.965, 0.03, 0.005]) / SAC_MASS
    assert point.mole_fractions == pytest.approx(tuple(n / n.sum()), rel=1e-12)


@pytest.mark.parametrize("text, reason", [
    ("Ag=3wt% 250C", "leaves Sn and Cu unnamed"),
    ("Ag=3wt% Cu=0.5at%", "mix wt% and at%"),
    ("Ag=3wt% Zn=1wt%", "element Zn is not in this system (Sn-Ag-Cu)"),
])
def test_multicomponent_mistakes_say_why(text, reason):
    with pytest.raises(EntryError) as caught:
        parse_point(text, SAC, SAC_MASS)
    assert reason in str(caught.value)
