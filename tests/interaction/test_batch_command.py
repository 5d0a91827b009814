"""`ladle batch` as a user runs it: a heat list with good and bad rows, output files that are
never overwritten unasked, other separators, encodings and units, identifiers that are blank,
repeated or would be spreadsheet formulas, and the shipped demo heat list. (Running at scale:
test_batch_scale.py.)"""

from __future__ import annotations

import csv
import io
import sys
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
        assert float(r["eutectic_scheil_mass%_of_alloy"]) == pytest.approx(100 * eutectic, abs=0.0051)
        assert float(r["pouring_C"]) == pytest.approx(float(r["liquidus_C"]) + 60.0, abs=0.11)
        assert r["note"] == ""
    reasons = {"A2": "no Si wt% value", "A3": "Si wt% 'abc' is not a number", "A4": "Si wt% 150 is outside 0-100 %",
               "A5": "3 values but the header has 2 columns"}
    for r in rows[1:5]:
        assert r["note"] == reasons[r["heat"]]
        assert r["liquidus_C"] == r["solidus_C"] == r["pouring_C"] == ""
    err = captured.err.splitlines()
    assert err[0] == "ladle batch: 2 of 6 heats computed"
    assert err[1] == "ladle batch: 4 row(s) not computed (the note column says why):"
    assert err[2:] == [f"  line {line}: {reasons[h]}" for line, h in ((3, "A2"), (4, "A3"), (5, "A4"), (6, "A5"))]


def test_output_file_is_written_whole_and_never_overwritten_unasked(heat_list, tmp_path, capsys):
    before = heat_list.read_bytes()
    out = tmp_path / "results.csv"
    assert main(["batch", "al-si", str(heat_list), "-o", str(out)]) == 1
    assert len(_rows(out.read_text())) == 6
    assert sorted(p.name for p in tmp_path.iterdir()) == ["heats.csv", "results.csv"]     # no partial, no state
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


def _number(text: str) -> float:
    return float(text.replace(",", "."))


def test_semicolons_decimal_commas_the_other_element_and_units(tmp_path, capsys):
    path = tmp_path / "heats.csv"
    path.write_text("heat;Al (wt%)\nB1;93,0\n")
    assert main(["batch", "al-si", str(path), "--superheat", "108F"]) == 0
    (row,) = _rows(capsys.readouterr().out, ";")
    m = melt_range(find_system("al-si"), _x_si(7.0))
    # the answer is written in the file's convention: decimal commas
    assert "," in row["liquidus_F"] and "." not in row["liquidus_F"]
    assert _number(row["liquidus_F"]) == pytest.approx(kelvin_to(m.liquidus_K, "F"), abs=0.051)
    assert _number(row["pouring_F"]) == pytest.approx(_number(row["liquidus_F"]) + 108.0, abs=1e-9)
    assert _number(row["freezing_range_F"]) == pytest.approx(1.8 * (m.liquidus_K - m.solidus_K), abs=0.051)


def test_semicolons_with_decimal_points_keep_points(tmp_path, capsys):
    path = tmp_path / "heats.csv"
    path.write_text("heat;Si wt%\nB1;7.0\n")
    assert main(["batch", "al-si", str(path)]) == 0
    (row,) = _rows(capsys.readouterr().out, ";")
    assert row["liquidus_C"] == "617.0" or ("." in row["liquidus_C"] and "," not in row["liquidus_C"])


def test_a_windows_1252_export_is_read_and_answered_in_its_encoding(tmp_path, capsys):
    path = tmp_path / "heats.csv"
    path.write_bytes("Nº;Si wt%\nH1;7,0\n".encode("cp1252"))
    out = tmp_path / "out.csv"
    assert main(["batch", "al-si", str(path), "-o", str(out)]) == 0
    text = out.read_bytes()
    assert text.startswith("Nº;Si wt%;liquidus_C".encode("cp1252"))
    (row,) = _rows(text.decode("cp1252"), ";")
    assert row["Nº"] == "H1"
    assert _number(row["liquidus_C"]) == pytest.approx(kelvin_to(melt_range(find_system("al-si"), _x_si(7.0)).liquidus_K, "C"), abs=0.051)


def test_an_undecodable_file_names_the_encoding_option(tmp_path, capsys):
    path = tmp_path / "heats.csv"
    path.write_bytes(b"heat,Si wt%\nH\x81\xc3,7\n")          # 0x81 is undefined in Windows-1252
    with pytest.raises(SystemExit) as e:
        main(["batch", "al-si", str(path)])
    assert e.value.code == 2
    err = capsys.readouterr().err
    assert err.count("\n") == 1 and "--encoding" in err
    out = tmp_path / "out.csv"
    assert main(["batch", "al-si", str(path), "--encoding", "latin-1", "-o", str(out)]) == 0
    # latin-1 reads 0x81 as U+0081, a control character: written escaped; 0xc3 ('Ã') as it was
    assert out.read_bytes().splitlines()[1].startswith(b"H\\x81\xc3,7,")


def test_blank_and_repeated_identifiers_are_warned_about_and_kept(tmp_path, capsys):
    path = tmp_path / "heats.csv"
    path.write_text("heat,Si wt%\nA,7\n,8\nB,9\nA,10\n  ,11\nB,12\n")
    assert main(["batch", "al-si", str(path)]) == 0
    captured = capsys.readouterr()
    assert [r["Si wt%"] for r in _rows(captured.out)] == ["7", "8", "9", "10", "11", "12"]
    err = captured.err.splitlines()
    assert "ladle batch: warning: 2 heat(s) without an identifier (kept): line 3, line 6" in err
    assert "ladle batch: warning: 2 heat(s) repeat an earlier identifier (kept): line 5 (as line 2), line 7 (as line 4)" in err


def test_rounded_columns_agree_with_each_other(tmp_path, capsys):
    # rounded once: liquidus - solidus is the range column and pouring - liquidus the superheat
    values = np.random.default_rng(11).uniform(0.5, 30.0, 3000)
    path = tmp_path / "heats.csv"
    path.write_text("heat,Si wt%\n" + "".join(f"R{i},{v:.4f}\n" for i, v in enumerate(values)))
    for unit in ("C", "F", "K"):
        assert main(["batch", "al-si", str(path), "--superheat", "57.3C", "--unit", unit]) == 0
        rows = _rows(capsys.readouterr().out)
        tenths = {k: np.array([round(float(r[f"{k}_{unit}"]) * 10) for r in rows])
                  for k in ("liquidus", "solidus", "freezing_range", "pouring")}
        assert np.array_equal(tenths["liquidus"] - tenths["solidus"], tenths["freezing_range"])
        superheat = round(57.3 * (1.8 if unit == "F" else 1.0) * 10)
        assert np.array_equal(tenths["pouring"] - tenths["liquidus"], np.full(len(rows), superheat))


def test_identifiers_a_spreadsheet_would_evaluate_are_neutralised(tmp_path, capsys):
    path = tmp_path / "heats.csv"
    path.write_text("heat,Si wt%\n=1+1,7\n\"+cmd|' /C calc'!A0\",7\n@SUM(1+1),7\n-2+3,7\n-5,7\nD-1,7\n")
    assert main(["batch", "al-si", str(path)]) == 0
    heats = [r["heat"] for r in _rows(capsys.readouterr().out)]
    assert heats == ["'=1+1", "'+cmd|' /C calc'!A0", "'@SUM(1+1)", "'-2+3", "-5", "D-1"]


def test_melt_only_and_compositions_outside_the_model(tmp_path, capsys):
    path = tmp_path / "brass.csv"
    path.write_text("heat,Zn at%\nC1,30\nC2,70\n")
    assert main(["batch", "cu-zn", str(path), "--melt-only", "--unit", "K"]) == 1
    captured = capsys.readouterr()
    rows = _rows(captured.out)
    assert "scheil_end_K" not in rows[0] and float(rows[0]["liquidus_K"]) > 1000.0
    assert rows[1]["note"] == "Zn at% 70 lies outside the range this model covers (0-45 at% Zn)"
    assert "line 3: Zn at% 70 lies outside" in captured.err


def test_a_heat_lists_own_note_and_result_columns_are_not_repeated(tmp_path, capsys):
    """A shop's list with its own `note` column, or an earlier output fed back, keeps its columns;
    ladle's results with the same names come after them as ladle_..., so every header is unique."""
    path = tmp_path / "own.csv"
    path.write_text("heat,Zn at%,note,liquidus_C\nC1,30,poured twice,917\n")
    assert main(["batch", "cu-zn", str(path), "--melt-only"]) == 0
    header = capsys.readouterr().out.splitlines()[0].split(",")
    assert len(header) == len(set(header))
    assert header[:4] == ["heat", "Zn at%", "note", "liquidus_C"]
    assert header[4] == "ladle_liquidus_C" and header[-1] == "ladle_note"


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
        assert "cannot read superheat" in capsys.readouterr().err
    # bounded to something physical: 500 K above the liquidus at most
    for bad in ("--superheat=1000000000C", "--superheat=501K", "--superheat=901F", "--superheat=" + "9" * 400):
        with pytest.raises(SystemExit) as e:
            main(["batch", "al-si", str(tmp_path / "h.csv"), bad])
        assert e.value.code == 2
        err = capsys.readouterr().err
        assert "more than 500 K (900 F) above the liquidus" in err and err.count("\n") == 1
    assert main(["batch", "al-si", str(tmp_path / "h.csv"), "--superheat=900F"]) == 1


def test_a_row_that_could_not_be_computed_counts_as_bad(tmp_path, capsys, monkeypatch):
    # a system whose mapped window ends before the alloy is solid: the solidus is missing
    from ladle.engine.solidify.table import CompositionTable

    evaluate = CompositionTable.evaluate

    def window_too_short(self, x_B, scheil):
        r = evaluate(self, x_B, scheil)
        return type(r)(r.liquidus_K, np.where(x_B > 0.1, np.nan, r.solidus_K), r.eutectic_equilibrium,
                       r.scheil_end_K, r.eutectic_scheil)

    monkeypatch.setattr(CompositionTable, "evaluate", window_too_short)
    path = tmp_path / "heats.csv"
    path.write_text("heat,Si at%\nL,5\nH,20\n")
    assert main(["batch", "al-si", str(path)]) == 1
    captured = capsys.readouterr()
    rows = _rows(captured.out)
    assert rows[0]["note"] == "" and rows[1]["note"] == "not fully solid at the bottom of the mapped window"
    assert rows[1]["solidus_C"] == rows[1]["freezing_range_C"] == "" and rows[1]["liquidus_C"] != ""
    assert "line 3: not fully solid at the bottom of the mapped window" in captured.err


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


def test_a_scheil_path_that_leaves_the_model_keeps_the_melt_range(tmp_path, capsys):
    # the Cu-Zn model covers 0-45 at% Zn; the Scheil liquid of a brass grows richer in Zn than that
    path = tmp_path / "brass.csv"
    path.write_text("heat,Zn at%\nC1,30\n")
    assert main(["batch", "cu-zn", str(path)]) == 0
    (row,) = _rows(capsys.readouterr().out)
    assert row["note"] == "Scheil: liquid left at the bottom of the mapped window"
    assert row["scheil_end_C"] == "" and float(row["liquidus_C"]) > float(row["solidus_C"]) > 800.0


def test_a_binary_without_a_mapped_diagram_is_computed_heat_by_heat(tmp_path, capsys):
    # fe-c has sublattice phases: no whole diagram, so no table; its heats go one by one (a bad
    # row here keeps the test fast: nothing is computed)
    path = tmp_path / "steel.csv"
    path.write_text("heat,C wt%\nS1,x\n")
    assert main(["batch", "fe-c", str(path)]) == 1
    captured = capsys.readouterr()
    assert captured.out.splitlines()[0] == ("heat,C wt%,liquidus_C,solidus_C,freezing_range_C,scheil_end_C,"
                                             "eutectic_scheil_mass%_of_alloy,note")
    assert "line 2: C wt% 'x' is not a number" in captured.err


def test_outputs_that_are_not_regular_files_are_refused(tmp_path, capsys):
    (tmp_path / "h.csv").write_text(HEATS)
    with pytest.raises(SystemExit) as e:
        main(["batch", "al-si", str(tmp_path / "h.csv"), "-o", "/dev/null", "--force"])
    assert e.value.code == 2
    assert "/dev/null: not a regular file" in capsys.readouterr().err


# --- alloys of three or more elements: one column per element but the balance ---------------------------
sys.path.insert(0, str(Path(__file__).resolve().parents[1] / "unit"))

import ideal_ternaries as it  # noqa: E402


@pytest.fixture
def ideal_ternary(tmp_path, monkeypatch) -> Path:
    """The invented ideal ternary eutectic (Pb, Sn, Bi standing for A, B, C) as a system file,
    answered by its closed-form equilibria (tests/unit/ideal_ternaries.py) for speed."""
    from ladle.engine.diagrams import alloy_transitions
    from ladle.engine.solidify import alloy_scheil

    solve = it.equilibrate_for(it.eutectic_system())
    for module in (alloy_transitions, alloy_scheil):
        monkeypatch.setattr(module, "equilibrate", solve)
    return it.write_system_files(tmp_path)["ideal-eutectic"]


def _ideal_liquidus_K(z: np.ndarray) -> float:
    """The liquidus of an ideal liquid over pure solids: the highest T at which some z_i equals
    the saturation x_i = exp(-dH_i (1 - T/Tm_i) / RT), i.e. 1/T = 1/Tm_i - R ln(z_i) / dH_i (the
    ideal freezing-point equation: Gaskell and Laughlin, Introduction to the Thermodynamics of
    Materials, 6th ed. (2017), ch. 10)."""
    return float(np.max(1.0 / (1.0 / it.MELTING_K - it.R * np.log(z) / it.FUSION_J)))


def _ternary_eutectic_K() -> float:
    """Where the liquid is saturated with all three solids: sum_i x_i(T) = 1 (scipy's brentq)."""
    from scipy.optimize import brentq

    return brentq(lambda T: it.saturation(T).sum() - 1.0, 300.0, 1000.0, xtol=1e-10)


def test_a_ternary_heat_list_names_all_but_the_balance(ideal_ternary, tmp_path, capsys, monkeypatch):
    import ladle.tui.heatlist_runs as runs

    monkeypatch.setattr(runs, "ALLOY_BLOCK_BYTES", 16)           # a block per heat: both workers busy
    path = tmp_path / "heats.csv"
    path.write_text("heat,Sn at%,Bi at%\nT1,20,10\nT2,30,30\nT3,abc,5\nT4,60,50\n")
    outputs = []
    for workers in ("1", "2"):
        out = tmp_path / f"out{workers}.csv"
        assert main(["batch", str(ideal_ternary), str(path), "--unit", "K", "--workers", workers, "-o", str(out)]) == 1
        outputs.append(out.read_bytes())
    assert outputs[0] == outputs[1]
    rows = _rows(outputs[0].decode())
    assert "eutectic_equilibrium_mass%_of_alloy" not in rows[0]
    eutectic_K = _ternary_eutectic_K()
    for row, z in ((rows[0], [0.7, 0.2, 0.1]), (rows[1], [0.4, 0.3, 0.3])):
        assert float(row["liquidus_K"]) == pytest.approx(_ideal_liquidus_K(np.array(z)), abs=0.051)
        assert float(row["solidus_K"]) == pytest.approx(eutectic_K, abs=0.051)
        assert float(row["scheil_end_K"]) == pytest.approx(eutectic_K, abs=0.051)
        assert 0.0 < float(row["eutectic_scheil_mass%_of_alloy"]) < 100.0 and row["note"] == ""
    assert rows[2]["note"] == "Sn at% 'abc' is not a number"
    assert rows[3]["note"] == "Sn at% + Bi at% = 110 %, over 100 %"
    assert "2 of 4 heats computed" in capsys.readouterr().err


@pytest.mark.parametrize("header, message", [
    ("heat,Sn at%", "name every element but the balance in a column of its own: columns for Sn leave Pb, Bi"),
    ("heat,Sn at%,Bi wt%", "the composition columns mix wt% and at%"),
    ("heat,Sn at%,Sn wt%", "two columns name the same element"),
    ("heat,Pb at%,Sn at%,Bi at%", "a column for every element ('Pb at%', 'Sn at%', 'Bi at%'); leave out one"),
])
def test_ternary_headers_that_do_not_make_an_alloy(ideal_ternary, tmp_path, capsys, header, message):
    path = tmp_path / "bad.csv"
    path.write_text(f"{header}\nX,1,1,1\n")
    with pytest.raises(SystemExit) as e:
        main(["batch", str(ideal_ternary), str(path)])
    assert e.value.code == 2
    err = capsys.readouterr().err
    assert message in err and err.count("\n") == 1


def test_control_characters_from_the_file_never_reach_the_terminal(tmp_path, capsys):
    # found by fuzzing: an identifier's escape sequences were written to stdout as they were
    path = tmp_path / "h.csv"
    path.write_bytes(b'heat,furnace,Si wt%\n\x1b]0;pwn\x07\x1b[2J id,F1,7.05\n"B\tx",F\xc2\x9b2,7\n')  # U+009B, a C1 control in UTF-8
    out = tmp_path / "out.csv"
    for argv in ([], ["-o", str(out)]):
        assert main(["batch", "al-si", str(path), "--melt-only", *argv]) == 0
        captured = capsys.readouterr()
        text = out.read_text() if argv else captured.out
        assert not any(ord(ch) < 32 and ch != "\n" or 0x7f <= ord(ch) <= 0x9f for ch in text + captured.err)
        rows = _rows(text)
        assert [r["heat"] for r in rows] == [r"\x1b]0;pwn\x07\x1b[2J id", r"B\tx"]
        assert rows[1]["furnace"] == r"F\x9b2" and float(rows[0]["liquidus_C"]) > 600


def test_a_quote_never_closed_is_named_by_its_line(tmp_path, capsys):
    # found by fuzzing: the rows after an open quote vanished into one identifier, and the
    # message spoke of a missing value four lines further down
    path = tmp_path / "h.csv"
    path.write_text('heat,furnace,Si wt%\nD-2400,F1,7\n"D-2401,F1,7.05\nD-2402,F2,7\nD-2403,F2,7\n')
    assert main(["batch", "al-si", str(path), "--melt-only"]) == 1
    captured = capsys.readouterr()
    assert "1 of 2 heats computed" in captured.err
    assert "line 3: a quote opens a cell on this line that is never closed" in captured.err
    assert "no Si wt% value" not in captured.err + captured.out
