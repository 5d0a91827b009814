"""Alloys of any number of elements in the line commands (issue 14): `--comp` with the balance
implied, repeated or comma-separated, and one line with exit status 2 for every mistake."""

from __future__ import annotations

import json
import sys
from pathlib import Path

import numpy as np
import pytest

sys.path.insert(0, str(Path(__file__).resolve().parent))

from test_line_commands import _one_line_error, own_folders, run  # noqa: E402,F401  (shared fixtures)


def test_binary_alloy_named_both_ways_gives_one_answer(run):
    answers = [json.loads(run("point", "pb-sn", "--temp", "250C", *argv, "--json")[1])
               for argv in (("--comp", "Sn=10wt%"), ("--comp", "Sn=10wt%", "--comp", "Pb=90wt%"),
                            ("--comp", "Pb=90wt%,Sn=10wt%"))]
    assert answers[0] == answers[1] == answers[2]


BAD = [
    (("point", "pb-sn", "--temp", "250C", "--comp", "Sn=10wt%,Pb=80wt%"), "sums to 90 %, not 100 %"),
    (("point", "pb-sn", "--temp", "250C", "--comp", "Sn=10wt%", "--comp", "Pb=90at%"), "mix wt% and at%"),
    (("melt", "pb-sn", "--comp", "Sn=60wt%,Pb=50wt%"), "sums to 110 %, over 100 %"),
    (("cool", "pb-sn", "--comp", "Sn=10wt%,Sn=5wt%"), "element Sn is given twice"),
    (("point", "pb-sn", "--temp", "250C", "--comp", "Sn=10wt%,Ag=1wt%"), "element Ag is not in this system"),
    # two alloy names: refused, not the last one taken silently
    (("melt", "ag-cu-sn", "--alloy", "Sn96.5Ag3.0Cu0.5", "--alloy", "Sn99.3Cu0.7"),
     "--alloy is given twice ('Sn96.5Ag3.0Cu0.5' and 'Sn99.3Cu0.7'); name one alloy"),
]


@pytest.mark.parametrize("argv,expected", BAD, ids=[" ".join(a) for a, _ in BAD])
def test_bad_alloys_are_one_line_and_status_2(run, argv, expected):
    _one_line_error(*run(*argv), argv[0], expected)


# --- sections of a ternary (the invented ideal eutectic ternary of tests/unit/ideal_ternaries.py) ----------
sys.path.insert(0, str(Path(__file__).resolve().parents[1] / "unit"))

import ideal_ternaries as it  # noqa: E402

from ladle.engine.diagrams import alloy_transitions, isopleth, isothermal  # noqa: E402
from ladle.engine.solidify import alloy_equilibrium, alloy_scheil  # noqa: E402
from ladle.tui.commands import cool, diagram, melt  # noqa: E402


@pytest.fixture
def ternary(monkeypatch):
    """`ladle diagram|cool|melt ideal-eutectic ...` answered by the invented ternary and its
    closed-form equilibria."""
    system = it.eutectic_system()
    system.phases = system.models
    solve = it.equilibrate_for(system)
    for module in (isopleth, isothermal, alloy_transitions, alloy_scheil, alloy_equilibrium):
        monkeypatch.setattr(module, "equilibrate", solve)
    for command in (diagram, cool, melt):
        monkeypatch.setattr(command, "open_system", lambda name, without=(): system)
    return system


def test_isopleth_labels_every_field(run, ternary):
    code, out, err = run("diagram", "ideal-eutectic", "--comp", "C=15at%", "--vary", "B=0..85at%", "--ascii")
    assert code == 0 and err == ""
    assert out.isascii()
    code, js, _ = run("diagram", "ideal-eutectic", "--comp", "C=15at%", "--vary", "B=0..85at%", "--json")
    section = json.loads(js)
    for field in section["fields"]:
        assert " + ".join(field["phases"]) in out
    assert section["invariants"][0]["phases"] == ["alpha", "beta", "gamma", "liquid"]
    assert "invariant reactions crossed:" in out and "alpha + beta + gamma + liquid" in out
    assert section["start"] == {"A": 0.85, "B": 0.0, "C": 0.15}


def test_isothermal_section_on_the_triangle(run, ternary):
    code, out, err = run("diagram", "ideal-eutectic", "--temp", "650K", "--ascii")
    assert code == 0 and err == ""
    code, js, _ = run("diagram", "ideal-eutectic", "--temp", "650K", "--json")
    section = json.loads(js)
    assert section["temperature_K"] == 650.0
    three = next(f for f in section["fields"] if f["phases"] == ["alpha", "beta", "liquid"])
    assert len(three["triangles"]) == 1
    for field in section["fields"]:
        assert " + ".join(field["phases"]) in out


SECTION_MISTAKES = [
    (("diagram", "ideal-eutectic", "--vary", "B=0..85at%"), "an isopleth needs both --comp SPEC and --vary"),
    (("diagram", "ideal-eutectic", "--comp", "C=15at%", "--vary", "B=0..85wt%"), "--vary B is in wt% but the alloy is in at%"),
    (("diagram", "ideal-eutectic", "--comp", "C=15at%", "--vary", "B=0..85at%", "--temp", "650K"), "not both"),
    (("diagram", "ideal-eutectic", "--comp", "C=15at%", "--vary", "Q=0..85at%"), "element Q is not in this system"),
]


@pytest.mark.parametrize("argv,expected", SECTION_MISTAKES, ids=[" ".join(a) for a, _ in SECTION_MISTAKES])
def test_bad_sections_are_one_line_and_status_2(run, ternary, argv, expected):
    _one_line_error(*run(*argv), argv[0], expected)


def test_cool_a_ternary_alloy(run, ternary):
    """Both paths of A-25B-15C (at%): primary alpha, the alpha + beta valley, the ternary
    eutectic at a_A + a_B + a_C = 1 (558.39 K, ideal_ternaries' closed form)."""
    code, out, err = run("cool", "ideal-eutectic", "--comp", "B=25at%,C=15at%", "--unit", "K")
    assert code == 0 and err == "", err
    assert "A 60.0 at%" in out and "B 25.0 at%" in out and "C 15.0 at%" in out
    assert "B at%" in out and "C at%" in out                     # the liquid's named elements, column by column
    for name in ("primary alpha", "eutectic alpha + beta", "ternary eutectic alpha + beta + gamma"):
        assert name in out
    assert "558.4 K (ternary eutectic)" in out
    code, js, _ = run("cool", "ideal-eutectic", "--comp", "B=25at%,C=15at%", "--scheil", "--json")
    data = json.loads(js)
    assert data["model"] == "scheil" and data["end"] == "ternary eutectic"
    assert data["end_K"] == pytest.approx(558.3908803, abs=1e-6)
    assert set(data["path"][1]["liquid_mole_fraction"]) == {"A", "B", "C"}


def test_melt_a_ternary_alloy(run, ternary):
    """Liquidus where x_A = a_A(T) (alpha first) and the ternary eutectic ends freezing."""
    from scipy.optimize import brentq

    code, js, err = run("melt", "ideal-eutectic", "--comp", "B=25at%,C=15at%", "--json")
    assert code == 0 and err == "", err
    data = json.loads(js)
    assert data["liquidus_K"] == pytest.approx(brentq(lambda T: it.saturation(T)[0] - 0.6, 500, 1300), abs=1e-5)
    assert data["solidus_K"] == pytest.approx(brentq(lambda T: it.saturation(T).sum() - 1.0, 400, 1000), abs=1e-5)
    assert data["crossings"][0]["above"] == ["liquid"] and set(data["mole_fraction"]) == {"A", "B", "C"}
    code, out, _ = run("melt", "ideal-eutectic", "--comp", "B=25at%,C=15at%", "--superheat", "60C")
    assert "liquidus" in out and "freezing range" in out and "alpha + beta + gamma" in out
    assert "liquidus + your superheat of 60.0" in out and "(ladle advises none)" in out
    code, js, _ = run("melt", "ideal-eutectic", "--comp", "B=25at%,C=15at%", "--superheat", "60C", "--json")
    assert json.loads(js)["pouring_K"] == pytest.approx(data["liquidus_K"] + 60.0, abs=1e-9)


# --- through the engine itself: a ternary system file (tests/unit/ideal_ternaries.py) -------------------
@pytest.fixture
def lead_tin_bismuth(tmp_path) -> str:
    return str(it.write_system_files(tmp_path)["pb-sn-bi"])


def test_point_for_a_ternary_alloy_lists_every_phase_and_element(run, lead_tin_bismuth):
    code, out, err = run("point", lead_tin_bismuth, "--temp", "200C", "--comp", "Sn=30wt%,Bi=2wt%")
    assert code == 0 and err == "", err
    assert "alloy: Pb 68.0 wt%" in out and "Sn 30.0 wt%" in out and "Bi 2.00 wt%" in out
    header = next(line for line in out.splitlines() if line.startswith("phase"))
    assert header.split()[1:] == ["amount,", "of", "the", "alloy", "Pb", "wt%", "Sn", "wt%", "Bi", "wt%"]
    code, js, _ = run("point", lead_tin_bismuth, "--temp", "200C", "--comp", "Sn=30wt%", "--comp", "Bi=2wt%", "--json")
    data = json.loads(js)
    assert set(data["mole_fraction"]) == set(data["mass_fraction"]) == {"Pb", "Sn", "Bi"}
    assert data["mass_fraction"]["Bi"] == pytest.approx(0.02, abs=1e-12)
    assert sum(p["phase_fraction_mol"] for p in data["phases"]) == pytest.approx(1.0, abs=1e-9)
    for p in data["phases"]:
        assert set(p["mole_fraction"]) == set(p["mass_fraction"]) == {"Pb", "Sn", "Bi"}
        assert p["name"] in out
    # the lever rule in every element: the phases hold the alloy
    held = {el: sum(p["phase_fraction_mol"] * p["mole_fraction"][el] for p in data["phases"]) for el in ("Pb", "Sn", "Bi")}
    assert held == pytest.approx(data["mole_fraction"], abs=1e-9)


def test_a_ternary_needs_every_element_but_one(run, lead_tin_bismuth):
    _one_line_error(*run("point", lead_tin_bismuth, "--temp", "200C", "--comp", "Sn=30wt%"), "point",
                    "leaves Pb and Bi unnamed: name all but one (the balance)")


def test_tin_silver_copper_isopleth_crosses_the_ternary_eutectic(run):
    """Sn-3Ag with 0-2 wt% Cu (shipped ag-cu-sn): every alloy with copper ends freezing in the
    ternary eutectic liquid -> bct + Ag3Sn + Cu6Sn5 (measured at 217.2 +- 0.2 C by K.-W. Moon and
    W.J. Boettinger, JOM 56(4) (2004) 22, the file's check); the section crosses it below the
    thin liquid + bct + Ag3Sn field (once reported as none). Point equilibria of Sn-3Ag-0.5Cu
    0.05 K either side of the reported temperature (three times the edge tolerance of a grid row)
    hold the liquid above and the three solids below."""
    from ladle.engine import equilibrate, find_system
    from ladle.engine.units import mole_from_mass

    code, js, err = run("diagram", "ag-cu-sn", "--comp", "Ag=3wt%,Cu=0.5wt%", "--vary", "Cu=0..2wt%", "--json")
    assert code == 0 and err == ""
    [reaction] = json.loads(js)["invariants"]
    assert reaction["phases"] == ["Ag3Sn", "Cu6Sn5", "bct", "liquid"]
    assert reaction["temperature_K"] - 273.15 == pytest.approx(217.2, abs=2.0)
    assert reaction["from"] < 0.002 and reaction["to"] == pytest.approx(0.02)
    system = find_system("ag-cu-sn")
    x = mole_from_mass(np.array([[{"Sn": 0.965, "Ag": 0.03, "Cu": 0.005}[el] for el in system.elements]]),
                       system.molar_mass)[0]
    above = equilibrate(system, reaction["temperature_K"] + 0.05, x)
    below = equilibrate(system, reaction["temperature_K"] - 0.05, x)
    assert "liquid" in above.phase_names and tuple(sorted(below.phase_names)) == ("Ag3Sn", "Cu6Sn5", "bct")
    code, out, _ = run("diagram", "ag-cu-sn", "--comp", "Ag=3wt%,Cu=0.5wt%", "--vary", "Cu=0..2wt%", "--ascii")
    assert code == 0 and "invariant reactions crossed: none" not in out
    # listed with the trade's names, as the fields on the plot are labelled (epsilon, eta, (Sn))
    assert "Ag3Sn (epsilon) + Cu6Sn5 (eta) + bct (Sn) + liquid" in out


def test_point_names_a_ternarys_phases_as_a_binarys_and_the_sides_of_a_gap(run):
    """The trade's names beside the structure names, amounts as mass % of the alloy and G with
    its reference, as the binary's table has them (shipped bi-pb-sn with no bismuth against
    shipped pb-sn); the two fcc phases of a 14-carat gold aged at 500 C (the silver-rich and the
    copper-rich one of the ageing study of M. Nakagawa and K. Yasuda, J. Mater. Sci. 23 (1988)
    2975, the file's test) each named by the element it holds more of, not 'fcc + fcc'."""
    def stable(out: str) -> set[str]:
        return set(next(ln for ln in out.splitlines() if ln.startswith("stable: "))[8:].split(" + "))

    code, binary, _ = run("point", "pb-sn", "--temp", "150C", "--comp", "Sn=61.9wt%")
    code3, ternary, err = run("point", "bi-pb-sn", "--temp", "150C", "--comp", "Bi=0wt%,Sn=61.9wt%")
    assert (code, code3, err) == (0, 0, "")
    assert stable(ternary) == stable(binary) == {"fcc (Pb)", "bct (Sn)"}
    assert "58.5 mass % (69.3 mol %)" in ternary and " wt% (" not in ternary.split("stable:")[1]
    assert "J/mol (relative to the pure elements as their stable solids at this temperature)" in ternary
    code, gold, err = run("point", "ag-au-cu", "--temp", "500C", "--alloy", "14ct-1N")
    assert (code, err) == (0, "")
    assert stable(gold) == {"fcc (Ag-rich)", "fcc (Cu-rich)"}
    rows = {ln.split("  ")[0]: ln.split()[-3:] for ln in gold.splitlines() if ln.startswith("fcc (")}
    silver_rich, copper_rich = (list(map(float, rows[name])) for name in ("fcc (Ag-rich)", "fcc (Cu-rich)"))
    assert silver_rich[1] > copper_rich[1] and copper_rich[2] > silver_rich[2]   # Ag and Cu wt%
