"""Typed alloys of any number of elements: `--comp Ag=3wt%,Cu=0.5wt%`, the balance implied, and
one clear line for every kind of mistake."""

import numpy as np
import pytest

from ladle.tui.parsing import SUM_TOLERANCE, parse_alloy, parse_range, resolve_alloy, resolve_percentages, section_ends

SAC = ("Sn", "Ag", "Cu")
#: g/mol, IUPAC standard atomic weights (abridged, 2021)
SAC_MASS = np.array([118.71, 107.87, 63.546])


def sac(*texts):
    return resolve_alloy(parse_alloy(list(texts)), SAC)


def test_named_contents_and_the_balance():
    alloy = sac("Ag=3wt%,Cu=0.5wt%")
    assert alloy.fractions == pytest.approx((0.965, 0.03, 0.005), abs=1e-15)
    assert alloy.balance == "Sn" and alloy.named == ("Ag", "Cu") and alloy.basis == "wt"
    assert alloy.shown_element == "Ag"


def test_repeated_comp_and_spaces_read_as_one_alloy():
    assert sac("Ag=3wt%", "Cu=0.5wt%") == sac("Ag=3wt%,Cu=0.5wt%") == sac("ag = 3 wt%, cu=0.5wt%")


def test_mass_to_mole_fractions_follow_the_definition():
    # x_i = (w_i / M_i) / sum_j (w_j / M_j): the definition of the mole fraction (IUPAC Gold Book)
    x = sac("Ag=3wt%,Cu=0.5wt%").mole_fractions(SAC_MASS)
    n = np.array([0.965 / 118.71, 0.03 / 107.87, 0.005 / 63.546])
    assert x == pytest.approx(n / n.sum(), rel=1e-12)
    assert sac("Ag=3at%,Cu=1at%").mole_fractions(SAC_MASS) == pytest.approx([0.96, 0.03, 0.01], abs=1e-15)


def test_every_element_named_must_sum_to_100():
    alloy = sac("Sn=96.5wt%,Ag=3wt%,Cu=0.5wt%")
    assert alloy.balance is None and sum(alloy.fractions) == pytest.approx(1.0, abs=1e-15)
    slightly = sac(f"Sn={96.5 + 0.5 * SUM_TOLERANCE * 100}wt%,Ag=3wt%,Cu=0.5wt%")
    assert sum(slightly.fractions) == pytest.approx(1.0, abs=1e-15)
    with pytest.raises(ValueError, match="sums to 99.5 %, not 100 %"):
        sac("Sn=96wt%,Ag=3wt%,Cu=0.5wt%")


def test_binaries_keep_the_short_form():
    pb_sn = ("Pb", "Sn")
    assert resolve_alloy(parse_alloy("12wt%"), pb_sn).fractions == pytest.approx((0.88, 0.12))
    assert resolve_alloy(parse_alloy("Pb=88wt%"), pb_sn).fractions == pytest.approx((0.88, 0.12))
    assert resolve_alloy(parse_alloy("Pb=88wt%"), pb_sn).shown_element == "Pb"
    assert resolve_alloy(parse_alloy("12wt%"), pb_sn).shown_element == "Sn"


@pytest.mark.parametrize("texts, message", [
    (["Ag=3wt%,Cu=0.5at%"], "Ag=3wt% and Cu=0.5at% mix wt% and at% in one alloy"),
    (["Ag=3wt%", "Cu=0.5at%"], "mix wt% and at%"),
    (["Zn=3wt%,Cu=0.5wt%"], "element Zn is not in this system (Sn-Ag-Cu)"),
    (["Ag=80wt%,Cu=30wt%"], "Ag=80wt%,Cu=30wt% sums to 110 %, over 100 %"),
    (["Ag=3wt%"], "leaves Sn and Cu unnamed: name all but one (the balance)"),
    (["Ag=-3wt%,Cu=0.5wt%"], "composition Ag=-3wt% is outside 0-100 %"),
    (["Ag=3wt%,Ag=1wt%"], "element Ag is given twice"),
    (["3wt%"], "name the element"),
    (["Ag=3wt%,0.5wt%"], "name the element of every content"),
    (["Ag=1,5wt%"], "cannot read composition 'Ag=1,5wt%' (at 'Ag=1')"),
])
def test_mistakes_get_one_line_naming_them(texts, message):
    with pytest.raises(ValueError) as caught:
        sac(*texts)
    assert message in str(caught.value)
    assert "\n" not in str(caught.value)


def test_heat_list_rows_resolve_with_the_same_rules():
    alloy = resolve_percentages([("Ag", 3.0), ("Cu", 0.5)], "wt", SAC, "line 4")
    assert alloy == sac("Ag=3wt%,Cu=0.5wt%")
    with pytest.raises(ValueError, match="line 4 sums to 110 %"):
        resolve_percentages([("Ag", 80.0), ("Cu", 30.0)], "wt", SAC, "line 4")


def test_a_section_holds_the_named_elements_and_the_balance_takes_up_the_change():
    low, high = section_ends(parse_alloy("Ag=3wt%"), parse_range("Cu=0..2wt%"), SAC)
    assert low.fractions == pytest.approx((0.97, 0.03, 0.0)) and high.fractions == pytest.approx((0.95, 0.03, 0.02))
    low, high = section_ends(parse_alloy("Ag=3wt%,Cu=0.5wt%"), parse_range("cu = 0 .. 2"), SAC)
    assert high.fractions == pytest.approx((0.95, 0.03, 0.02)) and low.balance == "Sn"


@pytest.mark.parametrize("comp, vary, message", [
    ("Ag=3wt%", "Cu=0..2at%", "--vary Cu is in at% but the alloy is in wt%"),
    ("Ag=3wt%,Cu=0.5wt%,Sn=96.5wt%", "Cu=0..2wt%", "name every element: leave one unnamed as the balance"),
    ("Ag=3wt%", "Cu=2..1wt%", "must rise from low to high within 0-100 %"),
    ("Ag=90wt%", "Cu=0..20wt%", "sums to 110 %, over 100 %"),
    ("Ag=3wt%", "Cu=0-2wt%", "cannot read range 'Cu=0-2wt%'"),
])
def test_bad_sections_get_one_line(comp, vary, message):
    with pytest.raises(ValueError) as caught:
        section_ends(parse_alloy(comp), parse_range(vary), SAC)
    assert message in str(caught.value) and "\n" not in str(caught.value)
