"""Alloys of any number of elements in the line commands (issue 14): `--comp` with the balance
implied, repeated or comma-separated, and one line with exit status 2 for every mistake."""

from __future__ import annotations

import json
import sys
from pathlib import Path

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
]


@pytest.mark.parametrize("argv,expected", BAD, ids=[" ".join(a) for a, _ in BAD])
def test_bad_alloys_are_one_line_and_status_2(run, argv, expected):
    _one_line_error(*run(*argv), argv[0], expected)


# --- sections of a ternary (the invented ideal eutectic ternary of tests/unit/ideal_ternaries.py) ----------
sys.path.insert(0, str(Path(__file__).resolve().parents[1] / "unit"))

import ideal_ternaries as it  # noqa: E402

from ladle.engine.diagrams import isopleth, isothermal  # noqa: E402
from ladle.tui.commands import diagram  # noqa: E402


@pytest.fixture
def ternary(monkeypatch):
    """`ladle diagram ideal-eutectic ...` answered by the invented ternary and its closed-form
    equilibria."""
    system = it.eutectic_system()
    solve = it.equilibrate_for(system)
    for module in (isopleth, isothermal):
        monkeypatch.setattr(module, "equilibrate", solve)
    monkeypatch.setattr(diagram, "open_system", lambda name, without=(): system)
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
