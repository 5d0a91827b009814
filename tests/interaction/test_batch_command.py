"""`ladle batch` as a user runs it: a heat list with good and bad rows, output files that are
never overwritten unasked, other separators and units, and the shipped demo heat list."""

from __future__ import annotations

import csv
import io
from pathlib import Path

import numpy as np
import pytest

from ladle.engine import find_system
from ladle.engine.diagrams.melt import melt_range
from ladle.engine.solidify.scheil import ScheilCooling
from ladle.engine.units import kelvin_to, mole_from_mass
from ladle.tui.cli import main

HEATS = """heat,Si wt%
A1,7.0
A2,
A3,abc
A4,150
A5,11.0,extra
A6,2.5
"""


def _x_si(wt: float) -> float:
    system = find_system("al-si")
    return float(mole_from_mass(np.array([1 - wt / 100, wt / 100]), system.molar_mass)[1])


def _rows(text: str, delimiter: str = ",") -> list[dict]:
    return list(csv.DictReader(io.StringIO(text), delimiter=delimiter))


@pytest.fixture
def heat_list(tmp_path) -> Path:
    path = tmp_path / "heats.csv"
    path.write_text(HEATS)
    return path


def test_good_rows_get_their_values_and_every_bad_row_is_named(heat_list, capsys):
    assert main(["batch", "al-si", str(heat_list), "--superheat", "60C"]) == 1
    captured = capsys.readouterr()
    rows = _rows(captured.out)
    assert [r["heat"] for r in rows] == ["A1", "A2", "A3", "A4", "A5", "A6"]
    system = find_system("al-si")
    for r, wt in ((rows[0], 7.0), (rows[5], 2.5)):
        m = melt_range(system, _x_si(wt))
        assert float(r["liquidus_C"]) == pytest.approx(kelvin_to(m.liquidus_K, "C"), abs=0.051)
        assert float(r["solidus_C"]) == pytest.approx(kelvin_to(m.solidus_K, "C"), abs=0.051)
        assert float(r["freezing_range_C"]) == pytest.approx(m.liquidus_K - m.solidus_K, abs=0.051)
        scheil = ScheilCooling(system, _x_si(wt)).path()
        assert float(r["scheil_end_C"]) == pytest.approx(kelvin_to(scheil.end_K, "C"), abs=0.051)
        eutectic = next(c.mass_fraction for c in scheil.constituents if c.name.startswith("eutectic"))
        assert float(r["eutectic_scheil_wt%"]) == pytest.approx(100 * eutectic, abs=0.0051)
        assert float(r["pouring_C"]) == pytest.approx(float(r["liquidus_C"]) + 60.0, abs=0.11)
        assert r["note"] == ""
    reasons = {"A2": "no Si wt% value", "A3": "Si wt% 'abc' is not a number", "A4": "Si wt% 150 is outside 0-100 %",
               "A5": "3 values but the header has 2 columns"}
    for r in rows[1:5]:
        assert r["note"] == reasons[r["heat"]]
        assert r["liquidus_C"] == r["solidus_C"] == r["pouring_C"] == ""
    err = captured.err.splitlines()
    assert err[0] == "ladle batch: 2 of 6 heats computed"
    assert err[2:] == [f"  line {line}: {reasons[h]}" for line, h in ((3, "A2"), (4, "A3"), (5, "A4"), (6, "A5"))]


def test_output_file_is_written_whole_and_never_overwritten_unasked(heat_list, tmp_path, capsys):
    before = heat_list.read_bytes()
    out = tmp_path / "results.csv"
    assert main(["batch", "al-si", str(heat_list), "-o", str(out)]) == 1
    assert len(_rows(out.read_text())) == 6
    assert not [p for p in tmp_path.iterdir() if p.name.endswith(".part")]
    out.write_text("keep me\n")
    with pytest.raises(SystemExit) as e:
        main(["batch", "al-si", str(heat_list), "-o", str(out)])
    assert e.value.code == 2
    assert capsys.readouterr().err.endswith("exists already; choose another name or add --force to replace it\n")
    assert out.read_text() == "keep me\n"
    assert main(["batch", "al-si", str(heat_list), "-o", str(out), "--force"]) == 1
    assert len(_rows(out.read_text())) == 6
    with pytest.raises(SystemExit) as e:
        main(["batch", "al-si", str(heat_list), "-o", str(heat_list), "--force"])
    assert e.value.code == 2
    assert "is the heat list itself" in capsys.readouterr().err
    assert heat_list.read_bytes() == before


def test_semicolons_decimal_commas_the_other_element_and_units(tmp_path, capsys):
    path = tmp_path / "heats.csv"
    path.write_text("heat;Al (wt%)\nB1;93,0\n")
    assert main(["batch", "al-si", str(path), "--superheat", "108F"]) == 0
    (row,) = _rows(capsys.readouterr().out, ";")
    m = melt_range(find_system("al-si"), _x_si(7.0))
    assert float(row["liquidus_F"]) == pytest.approx(kelvin_to(m.liquidus_K, "F"), abs=0.051)
    assert float(row["pouring_F"]) == pytest.approx(float(row["liquidus_F"]) + 108.0, abs=0.11)
    assert float(row["freezing_range_F"]) == pytest.approx(1.8 * (m.liquidus_K - m.solidus_K), abs=0.051)


def test_melt_only_and_compositions_outside_the_model(tmp_path, capsys):
    path = tmp_path / "brass.csv"
    path.write_text("heat,Zn at%\nC1,30\nC2,70\n")
    assert main(["batch", "cu-zn", str(path), "--melt-only", "--unit", "K"]) == 1
    captured = capsys.readouterr()
    rows = _rows(captured.out)
    assert "scheil_end_K" not in rows[0] and float(rows[0]["liquidus_K"]) > 1000.0
    assert rows[1]["note"] == "Zn at% 70 lies outside the range this model covers (0-45 at% Zn)"
    assert "line 3: Zn at% 70 lies outside" in captured.err


@pytest.mark.parametrize("text, message", [
    ("heat,Fe wt%\nX,1\n", "no composition column; expected a header such as 'Si wt%' or 'Al at%'"),
    ("heat,Si wt%,Al wt%\nX,1,99\n", "several composition columns ('Si wt%', 'Al wt%'); keep one"),
    ("", "empty file"),
    ("heat,Si wt%\n", "a header but no heats"),
])
def test_bad_files_are_one_line_and_status_2(tmp_path, capsys, text, message):
    path = tmp_path / "bad.csv"
    path.write_text(text)
    with pytest.raises(SystemExit) as e:
        main(["batch", "al-si", str(path)])
    assert e.value.code == 2
    err = capsys.readouterr().err
    assert err.startswith(f"ladle batch: bad.csv: {message}") and err.count("\n") == 1


def test_bad_superheat_and_missing_file(tmp_path, capsys):
    with pytest.raises(SystemExit) as e:
        main(["batch", "al-si", str(tmp_path / "none.csv")])
    assert e.value.code == 2 and capsys.readouterr().err.endswith("none.csv: no such file\n")
    (tmp_path / "h.csv").write_text(HEATS)
    for bad in ("--superheat=-20C", "--superheat=hot"):
        with pytest.raises(SystemExit) as e:
            main(["batch", "al-si", str(tmp_path / "h.csv"), bad])
        assert e.value.code == 2
        assert f"cannot read superheat '{bad.split('=')[1]}'" in capsys.readouterr().err


def test_the_shipped_demo_heat_list(capsys):
    import ladle.systems

    demo = Path(ladle.systems.__file__).parent / "demo" / "al-si-heats.csv"
    assert demo.read_text().startswith("# Invented demo heat list")
    assert main(["batch", "al-si", str(demo), "--superheat", "60C"]) == 1
    captured = capsys.readouterr()
    rows = _rows("\n".join(line for line in captured.out.splitlines()))
    assert len(rows) == 12 and [r["heat"] for r in rows if r["note"]] == ["D-2410"]
    assert captured.err.splitlines()[-1] == "  line 13: no Si wt% value"
    # Al-Si eutectic at 577 C: T.B. Massalski (ed.), Binary Alloy Phase Diagrams, 2nd ed. (1990)
    assert all(abs(float(r["scheil_end_C"]) - 577.0) < 3.0 for r in rows if not r["note"])
