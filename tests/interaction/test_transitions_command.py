"""`ladle transitions` as a person runs it: the list from hot to cold, the JSON keys, the trade's
labels of the lines and the solution-treatment window of an age-hardening alloy."""

from __future__ import annotations

import json
from types import SimpleNamespace

import pytest

from ladle.engine import find_system
from ladle.engine.diagrams.alloy_transitions import alloy_transitions
from ladle.engine.diagrams.heat_treatment import austenitizing_window, solution_window
from ladle.engine.files.trade_names import read_trade_names
from ladle.tui.cli import main


@pytest.fixture
def ladle(capsys):
    """Run `ladle ARGS...` in this process: returncode, stdout, stderr."""
    def run(*argv: str) -> SimpleNamespace:
        try:
            code = main(list(argv))
        except SystemExit as e:
            code = e.code
        out, err = capsys.readouterr()
        return SimpleNamespace(returncode=code, stdout=out, stderr=err)
    return run


def test_json_lists_the_changes_from_hot_to_cold(ladle) -> None:
    out = ladle("transitions", "pb-sn", "--comp", "Sn=10wt%", "--json")
    assert out.returncode == 0, out.stderr
    doc = json.loads(out.stdout)
    assert doc["system"] == "pb-sn"
    assert doc["mass_fraction"]["Sn"] == pytest.approx(0.10)
    temps = [t["temperature_K"] for t in doc["transitions"]]
    assert temps == sorted(temps, reverse=True) and len(temps) == 3
    for t in doc["transitions"]:
        assert {"temperature_K", "above", "below", "label"} <= set(t)
        assert t["label"] is None
        assert sum(p["phase_fraction_mol"] for p in t["phases_below"]) == pytest.approx(1.0)
    assert doc["transitions"][0]["above"] == ["liquid"]
    assert doc["heat_treatment_window"] is None and doc["slow_cooled_constituents"] is None


def test_solution_window_of_an_aluminium_copper_alloy(ladle) -> None:
    """Al-4.5 wt% Cu: the window runs from the (Al) solvus up to the Al-Al2Cu eutectic, where
    Scheil-Gulliver freezing ends (548.2 C, J.L. Murray, Int. Met. Rev. 30 (1985) 211, the file's
    fit target; the solvus the model places at 514.9 C, the window's bottom)."""
    out = ladle("transitions", "al-cu", "--comp", "Cu=4.5wt%", "--json")
    assert out.returncode == 0, out.stderr
    w = json.loads(out.stdout)["heat_treatment_window"]
    assert w["kind"] == "solution" and w["phases"] == ["fcc"]
    assert (w["low_is"], w["high_is"]) == ("solvus", "Scheil end")
    assert w["high_K"] == pytest.approx(548.2 + 273.15, abs=1.0)
    assert w["low_K"] < w["high_K"]
    text = ladle("transitions", "al-cu", "--comp", "Cu=4.5wt%")
    assert "solution-treatment window" in text.stdout and "specification" in text.stdout


def test_text_names_every_change(ladle) -> None:
    out = ladle("transitions", "cu-ni", "--comp", "Ni=30wt%", "--unit", "K")
    assert out.returncode == 0, out.stderr
    changes = [tuple(frozenset(p.split(" (")[0] for p in side.split(" + ")) for side in line.split("K  ", 1)[1].split("  ->  "))
               for line in out.stdout.splitlines() if "  ->  " in line]
    assert changes[:2] == [({"liquid"}, {"liquid", "fcc"}), ({"liquid", "fcc"}, {"fcc"})]


def _labels(doc: dict, system, x_b: float) -> tuple[list, dict]:
    def fail(key: str, what: str) -> Exception:
        return ValueError(f"{key}: {what}")

    names = read_trade_names(doc, system.phases, fail)
    result = alloy_transitions(system, x_b)
    return result, {i: ln.name for i, t in enumerate(result.transitions) if (ln := names.line(t.above, t.below))}


def test_trade_lines_label_matching_changes_and_give_the_window() -> None:
    """Lines named in a file label the changes whose phase sets match, in either order; an
    austenitizing window reads A3 (a steel-like test file on Pb-Sn's phases: the logic, not iron)."""
    system = find_system("pb-sn")
    doc = {"trade_line": [{"name": "A3", "above": ["fcc"], "below": ["bct", "fcc"]},
                          {"name": "X", "above": ["liquid"], "below": ["liquid", "fcc"]}]}
    result, labels = _labels(doc, system, 0.1)
    assert labels == {0: "X", 2: "A3"}
    window = austenitizing_window(result, labels)
    assert window.low_K == result.transitions[2].temperature_K
    assert window.high_K == result.transitions[1].temperature_K and window.phases == ("fcc",)
    assert (window.low_is, window.high_is) == ("A3", "solidus")
    assert solution_window(result, None).notes


@pytest.mark.parametrize("doc, key", [
    ({"trade_line": [{"name": "A1", "above": ["fcc"], "below": ["austenite"]}]}, "trade_line[0].below"),
    ({"trade_line": [{"name": "A1", "above": ["fcc"]}]}, "trade_line[0].below"),
    ({"trade_names": {"gamma": "austenite"}}, "trade_names.gamma"),
    ({"trade_names": {"fcc": [{"name": "x", "from_K": 900, "upto_K": 800}]}}, "trade_names.fcc[0]"),
    ({"heat_treatment": "quench"}, "heat_treatment"),
    ({"trade_line": [{"name": "E", "above": ["liquid"], "below": ["fcc", "bct"], "constituent": 3}]},
     "trade_line[0].constituent"),
])
def test_bad_trade_names_name_the_key(doc: dict, key: str) -> None:
    def fail(k: str, what: str) -> Exception:
        return ValueError(f"{k}: {what}")

    with pytest.raises(ValueError, match=key.replace("[", r"\[").replace("]", r"\]")):
        read_trade_names(doc, ("liquid", "fcc", "bct"), fail)


@pytest.mark.parametrize("command", [
    ["point", "pb-sn", "--temp", "200", "--comp", "30wt%"],
    ["melt", "pb-sn", "--comp", "30wt%"],
    ["transitions", "pb-sn", "--comp", "30wt%"],
    ["diagram", "pb-sn"],
    ["cool", "pb-sn", "--comp", "30wt%"],
    ["check", "pb-sn"],
])
def test_without_a_phase_the_system_lacks_is_one_line(ladle, command: list[str]) -> None:
    out = ladle(*command, "--without", "gamma")
    assert out.returncode == 2 and out.stdout == ""
    assert out.stderr.count("\n") == 1 and "'gamma'" in out.stderr
    out = ladle(*command, "--without", "liquid", "--without", "fcc", "--without", "bct")
    assert out.returncode == 2 and out.stderr.count("\n") == 1 and "no phase" in out.stderr


def test_without_leaves_the_phase_out_of_the_answer(ladle) -> None:
    out = ladle("transitions", "pb-sn", "--comp", "30wt%", "--without", "bct", "--json")
    assert out.returncode == 0, out.stderr
    doc = json.loads(out.stdout)
    assert all("bct" not in t["above"] + t["below"] for t in doc["transitions"])


def test_the_sides_of_a_miscibility_gap_are_named_and_amounts_are_mass_percent(ladle) -> None:
    """Sterling silver (Ag-7.5 wt% Cu) meets the solvus of the Ag-Cu solid solutions on cooling
    (P.R. Subramanian and J.H. Perepezko, J. Phase Equilib. 14 (1993) 62: copper-rich (Cu)
    precipitates from the silver-rich (Ag)): the two fcc phases below it are told apart by what
    they are rich in, as `ladle point` names them, and the amounts of phases are mass % of the
    alloy (compositions alone are wt%)."""
    out = ladle("transitions", "ag-cu", "--comp", "Cu=7.5wt%")
    assert out.returncode == 0, out.stderr
    lines = out.stdout.splitlines()
    solvus = next(i for i, ln in enumerate(lines) if "->" in ln and ln.count("fcc") == 3)
    assert lines[solvus].endswith("fcc  ->  fcc (Ag-rich) + fcc (Cu-rich)")
    below = lines[solvus + 1].split("just below: ")[1]
    assert below.startswith("fcc (Ag-rich) >99.999 mass %, fcc (Cu-rich) <0.001 mass %")
    assert not any("just below" in ln and " wt%" in ln for ln in lines)
