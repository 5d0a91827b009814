"""Line commands on a system of three or more elements with a covered range (covers_at_percent as
a table of at% per element): point, melt, cool and transitions refuse an alloy outside it in the
words binaries use, exit status 2; batch gives that row the note; an isopleth stops at the edge,
an isothermal section is mapped inside it, the liquidus projection is refused. The system is the
invented ideal ternary eutectic of tests/unit/ideal_ternaries.py with an invented covered range
(Sn 0-30 at%, Bi 5-20 at%); the shipped Sn-Ag-Cu file is tried through the same paths.
"""

from __future__ import annotations

import csv
import io
import json
import sys
from pathlib import Path

import pytest

from ladle.tui.cli import main

sys.path.insert(0, str(Path(__file__).resolve().parents[1] / "unit"))
import ideal_ternaries as it  # noqa: E402

WORDS = "lies outside the range this model covers (Sn 0-30 at%, Bi 5-20 at%); no answer is given there"


@pytest.fixture
def system(tmp_path) -> str:
    return str(it.write_covered_file(tmp_path))


@pytest.fixture
def closed_form(monkeypatch):
    """The engine's diagrams answered by the ideal ternary's closed-form equilibria, for speed."""
    from ladle.engine.diagrams import isopleth, isothermal

    solve = it.equilibrate_for(it.eutectic_system())
    for module in (isopleth, isothermal):
        monkeypatch.setattr(module, "equilibrate", solve)


@pytest.mark.parametrize("command", [
    ["point", "--temp", "900", "--comp", "Sn=40at%,Bi=10at%"],
    ["melt", "--comp", "Sn=10at%,Bi=2at%"],
    ["cool", "--comp", "Sn=10at%,Bi=25at%"],
    ["transitions", "--comp", "Sn=10wt%,Bi=60wt%"],
])
def test_an_alloy_outside_is_refused_in_one_line(system, capsys, command):
    comp = command[command.index("--comp") + 1]
    with pytest.raises(SystemExit) as e:
        main([command[0], system] + command[1:])
    assert e.value.code == 2
    err = capsys.readouterr().err
    assert err == f"ladle {command[0]}: {comp} {WORDS}\n"


def test_an_alloy_inside_is_answered(system, capsys):
    assert main(["point", system, "--temp", "1200", "--comp", "Sn=20at%,Bi=10at%"]) == 0
    assert "stable: liquid" in capsys.readouterr().out


def test_batch_notes_the_rows_outside(system, tmp_path, capsys, monkeypatch):
    from ladle.engine.diagrams import alloy_transitions
    from ladle.engine.solidify import alloy_scheil

    solve = it.equilibrate_for(it.eutectic_system())   # the closed form, for speed
    for module in (alloy_transitions, alloy_scheil):
        monkeypatch.setattr(module, "equilibrate", solve)
    heats = tmp_path / "heats.csv"
    heats.write_text("heat,Sn at%,Bi at%\nT1,20,10\nT2,40,10\nT3,20,2\n")
    out = tmp_path / "out.csv"
    assert main(["batch", system, str(heats), "-o", str(out)]) == 1
    rows = list(csv.DictReader(io.StringIO(out.read_text())))
    # T1 lies inside; its Scheil liquid leaves the range before freezing ends (every liquid of
    # this system ends at the ternary eutectic, 42.5 at% Bi), which the batch notes as such
    assert rows[0]["note"] == "Scheil: not followed where the liquid leaves the range this model covers"
    assert rows[0]["liquidus_C"] != "" and rows[0]["solidus_C"] != ""
    assert rows[1]["note"] == "Sn at% 40, Bi at% 10 lies outside the range this model covers (Sn 0-30 at%, Bi 5-20 at%)"
    assert rows[2]["note"] == "Sn at% 20, Bi at% 2 lies outside the range this model covers (Sn 0-30 at%, Bi 5-20 at%)"
    assert rows[1]["liquidus_C"] == rows[2]["liquidus_C"] == ""
    assert "1 of 3 heats computed" in capsys.readouterr().err


def test_an_isopleth_stops_at_the_edge_and_one_wholly_outside_is_refused(system, capsys, closed_form):
    assert main(["diagram", system, "--comp", "Sn=20at%", "--vary", "Bi=0..60at%", "--json"]) == 0
    data = json.loads(capsys.readouterr().out)
    assert data["start"]["Bi"] == pytest.approx(0.05) and data["end"]["Bi"] == pytest.approx(0.20)
    assert all(0.05 - 1e-9 <= p[0] <= 0.20 + 1e-9 for line in data["lines"] for p in line["points"])
    assert data["warnings"][0] == "drawn only over the range this model covers (Sn 0-30 at%, Bi 5-20 at%)"
    with pytest.raises(SystemExit) as e:
        main(["diagram", system, "--comp", "Sn=50at%", "--vary", "Bi=0..40at%"])
    assert e.value.code == 2
    assert "the section lies outside the range this model covers (Sn 0-30 at%, Bi 5-20 at%)" in capsys.readouterr().err


def test_the_isothermal_section_keeps_inside_and_the_projection_is_refused(system, capsys, closed_form):
    assert main(["diagram", system, "--temp", "900K", "--json"]) == 0
    data = json.loads(capsys.readouterr().out)
    for f in data["fields"]:
        at = f["label_at"]
        assert at["Sn"] <= 0.30 + 1e-9 and 0.05 - 1e-9 <= at["Bi"] <= 0.20 + 1e-9, f
    with pytest.raises(SystemExit) as e:
        main(["diagram", system])
    assert e.value.code == 2
    assert "covers only part of the triangle (Sn 0-30 at%, Bi 5-20 at%)" in capsys.readouterr().err


def test_the_shipped_solder_system_refuses_outside_its_tin_rich_corner(capsys):
    with pytest.raises(SystemExit) as e:
        main(["melt", "ag-cu-sn", "--comp", "Ag=3wt%,Cu=5wt%"])
    assert e.value.code == 2
    assert capsys.readouterr().err == ("ladle melt: Ag=3wt%,Cu=5wt% lies outside the range this model covers "
                                       "(Ag 0-5.5 at%, Cu 0-3.7 at%); no answer is given there\n")


def test_the_systems_list_shows_a_ternarys_covered_range(capsys):
    assert main(["systems", "--json"]) == 0
    row = next(r for r in json.loads(capsys.readouterr().out)["systems"] if r["name"] == "ag-cu-sn")
    assert row["covers_at_percent"] == {"Ag": [0.0, 5.5], "Cu": [0.0, 3.7]}
    assert main(["systems"]) == 0
    assert "[covers Ag 0-5.5 at%, Cu 0-3.7 at%]" in " ".join(capsys.readouterr().out.split())


def test_cool_says_where_the_scheil_liquid_leaves_the_covered_range(system, capsys):
    """Sn 5, Bi 15 at%: inside the range, but its Scheil liquid (pure Pb forming first) gains Bi
    past 20 at% before freezing ends (tests/unit/test_alloy_scheil.py has the closed form): the
    text and the JSON say so, and the path is not followed outside the range."""
    assert main(["cool", system, "--comp", "Sn=5at%,Bi=15at%", "--scheil"]) == 0
    text = capsys.readouterr().out
    assert "freezing ends, Scheil: not followed below" in text
    assert "where the remaining liquid leaves the range this model covers" in text
    assert "note: the remaining liquid (73.3 mass % of the alloy) leaves the range this model covers " \
           "(Sn 0-30 at%, Bi 5-20 at%)" in text
    assert main(["cool", system, "--comp", "Sn=5at%,Bi=15at%", "--json"]) == 0
    scheil = json.loads(capsys.readouterr().out)["scheil"]
    assert scheil["end"] == "outside covered range" and scheil["end_K"] is None
    assert any("leaves the range this model covers" in n for n in scheil["notes"])
    assert all(step["liquid_mole_fraction"]["Bi"] <= 0.2 + 1e-12 for step in scheil["path"]
               if step["liquid_mole_fraction"] is not None)
