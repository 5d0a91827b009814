"""`ladle cool` as a user runs it: the table, the plot, the JSON object and bad input."""

from __future__ import annotations

import json
import re

import pytest

from ladle.engine import find_system
from ladle.engine.diagrams.melt import melt_range
from ladle.tui.cli import main
from ladle.tui.parsing import parse_alloy, resolve_alloy


def _run(capsys, *argv: str) -> str:
    assert main(["cool", *argv]) == 0
    return capsys.readouterr().out


def _scheil_end_C(out: str) -> float:
    """The temperature (C) of the summary line 'freezing ends, Scheil: T C (eutectic)'."""
    match = re.search(r"freezing ends, Scheil: ([\d.]+) °?C \(eutectic\)", out)
    assert match, "no eutectic end of Scheil freezing in the output"
    return float(match.group(1))


def test_json_has_both_paths_and_the_documented_keys(capsys):
    report = json.loads(_run(capsys, "pb-sn", "--comp", "Sn=10wt%", "--json", "--scheil"))
    system = find_system("pb-sn")
    x_b = float(resolve_alloy(parse_alloy("Sn=10wt%"), system.elements).mole_fractions(system.molar_mass)[1])
    assert report["model"] == "scheil"
    assert report["mole_fraction"]["Sn"] == pytest.approx(x_b, abs=1e-15)
    assert report["liquidus_K"] == pytest.approx(melt_range(system, x_b).liquidus_K, abs=1e-6)
    assert report["end"] == "eutectic"
    assert [c["name"] for c in report["constituents"]] == ["primary fcc", "eutectic fcc + bct"]
    assert sum(c["mass_fraction"] for c in report["constituents"]) == pytest.approx(1.0, abs=1e-9)
    step = report["path"][0]
    assert set(step) >= {"temperature_K", "fraction_solid", "liquid_mole_fraction", "phases"}
    assert step["fraction_solid"] == 0.0 and step["phases"] == ["liquid"]
    assert step["liquid_mole_fraction"]["Sn"] == pytest.approx(x_b)
    temps = [s["temperature_K"] for s in report["path"]]
    assert temps == sorted(temps, reverse=True)
    assert report["path"][-1]["liquid_mole_fraction"] is None
    eq = report["equilibrium"]
    assert eq["model"] == "equilibrium" and eq["end"] == "solidus"
    assert eq["end_K"] == pytest.approx(melt_range(system, x_b).solidus_K, abs=1e-6)
    assert report["scheil"]["end_K"] == report["end_K"]


def test_table_shows_both_fractions_and_the_chosen_paths_liquid(capsys):
    out = _run(capsys, "pb-sn", "--comp", "Sn=10wt%")
    lines = out.splitlines()
    # 10 wt% Sn is 16.2 at% with the IUPAC standard atomic weights Pb 207.2, Sn 118.71 g/mol:
    # (10 / 118.71) / (10 / 118.71 + 90 / 207.2) = 0.1624.
    assert lines[0] == "Lead-tin (soft solders), alloy Sn 10.0 wt% (16.2 at%)"
    assert "phases (equilibrium path)" in out
    header = next(i for i, line in enumerate(lines) if line.lstrip().startswith("temperature"))
    first = lines[header + 1].split()
    assert first[2:5] == ["0.0", "0.0", "10.0"] and first[-1] == "liquid"
    # Eutectic L = (Pb) + (Sn) at 183 C: T.B. Massalski (ed.), Binary Alloy Phase Diagrams, 2nd ed. (1990);
    # the fitted model within the fit's 0.5 K standard uncertainty of it.
    assert abs(_scheil_end_C(out) - 183.0) <= 0.5
    assert "eutectic fcc (Pb) + bct (Sn)" in out      # the trade's names beside the structure names
    assert "latent heat released: equilibrium" in out
    assert out.rstrip().endswith("Computed estimate: defer to the alloy's specification and certified data.")
    assert "safety: Lead is toxic" in out


def test_scheil_table_follows_the_scheil_liquid(capsys):
    out = _run(capsys, "pb-sn", "--comp", "Sn=10wt%", "--scheil", "--unit", "K")
    assert "phases (Scheil path)" in out
    rows = [line.split() for line in out.splitlines() if line.strip().endswith("liquid + fcc") and " K " in line]
    liquid_sn = [float(r[4]) for r in rows]
    # The liquid runs to the eutectic liquid, 61.9 wt% Sn (T.B. Massalski (ed.), Binary Alloy Phase
    # Diagrams, 2nd ed. (1990)); the bound leaves room for the fitted model's own eutectic liquid.
    assert liquid_sn == sorted(liquid_sn) and liquid_sn[-1] > 55.0


def test_plot_draws_both_paths(capsys, monkeypatch):
    monkeypatch.setenv("NO_COLOR", "1")
    out = _run(capsys, "pb-sn", "--comp", "Sn=10wt%", "--plot", "--ascii")
    assert "solid, mass % of the alloy" in out and "equilibrium" in out and "Scheil" in out
    plot = out.split("freezing ends")[0]
    assert plot.isascii()
    # the table and summary too; the eutectic at 183 C as above (Massalski, 2nd ed. (1990))
    assert out.isascii() and abs(_scheil_end_C(out) - 183.0) <= 0.5


@pytest.mark.parametrize("argv, message", [
    (["pb-sn", "--comp", "Sn=120wt%"], "ladle cool: composition Sn=120wt% is outside 0-100 %\n"),
    (["pb-sn", "--comp", "Cu=5wt%"], "ladle cool: element Cu is not in this system (Pb-Sn)\n"),
    (["no-such", "--comp", "Sn=5wt%"], None),
])
def test_bad_input_is_one_line_and_status_2(capsys, argv, message):
    with pytest.raises(SystemExit) as e:
        main(["cool", *argv])
    assert e.value.code == 2
    err = capsys.readouterr().err
    assert err.count("\n") == 1 and err.startswith("ladle cool: ")
    if message:
        assert err == message
