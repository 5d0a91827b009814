"""The line-mode commands as a person runs them (issues 2 and 3): `ladle point`, `ladle systems`,
`ladle melt` and `ladle diagram`: human output, --json in the shape the issues give, --csv, and
every bad input answered by one line on stderr with exit status 2 and no traceback.

Answers are checked on synthetic systems with exact solutions (tests/unit/topologies.py):
- ideal liquid + ideal solid: tie-lines from D.R. Gaskell and D.E. Laughlin, Introduction to the
  Thermodynamics of Materials, 6th ed., CRC Press (2017), ch. 10; the alloy's Gibbs energy is then
  G = RT (xA ln xA(solid) + xB ln xB(solid)) (solid pure elements as the zero of energy: each
  chemical potential is that of the solid, mu_i = RT ln x_i(solid));
- amounts by the lever rule, mass fractions from the molar masses (60 and 30 g/mol, invented);
- temperature scales by definition: T(K) = T(C) + 273.15 = (T(F) - 32) 5/9 + 273.15 (NIST
  Special Publication 811 (2008), Guide for the Use of the International System of Units).
"""

from __future__ import annotations

import csv
import io
import json
import math
import re
import subprocess
import sys
from pathlib import Path

import pytest
from scipy.optimize import brentq

sys.path.insert(0, str(Path(__file__).resolve().parents[1] / "unit"))

import topologies  # noqa: E402
from synthetic import MOLAR_MASS, R  # noqa: E402

from ladle.engine.files.loader import shipped_folder  # noqa: E402
from ladle.tui.cli import main  # noqa: E402

POINT_KEYS = {"system", "temperature_K", "mole_fraction", "mass_fraction", "phases", "gibbs_energy_J_per_mol"}
PHASE_KEYS = {"name", "phase_fraction_mol", "phase_fraction_mass", "mole_fraction", "mass_fraction"}


@pytest.fixture(autouse=True)
def own_folders(monkeypatch, tmp_path, shared_check_cache):
    """No user system files, and no cache from outside the run (the run's own cache of check
    counts, shared_check_cache in tests/conftest.py)."""
    (tmp_path / "user-systems").mkdir()
    monkeypatch.setenv("LADLE_SYSTEMS", str(tmp_path / "user-systems"))
    monkeypatch.setenv("XDG_CACHE_HOME", str(shared_check_cache))


@pytest.fixture
def run(capsys):
    """Run `ladle ARGS...` in this process: (exit status, stdout, stderr)."""
    def ladle(*argv: str) -> tuple[int, str, str]:
        try:
            code = main(list(argv))
        except SystemExit as e:
            code = e.code
        out, err = capsys.readouterr()
        return code, out, err
    return ladle


@pytest.fixture
def iso(tmp_path) -> str:
    path = tmp_path / "iso.toml"
    path.write_text(topologies.isomorphous().synthetic.toml(), encoding="utf-8")
    return str(path)


@pytest.fixture
def eut(tmp_path) -> str:
    path = tmp_path / "eut.toml"
    path.write_text(topologies.eutectic().synthetic.toml(), encoding="utf-8")
    return str(path)


def mass_fraction_B(x_B: float) -> float:
    return x_B * MOLAR_MASS["B"] / ((1.0 - x_B) * MOLAR_MASS["A"] + x_B * MOLAR_MASS["B"])


# --- ladle point -------------------------------------------------------------------------------
T_POINT = 1240.0          # K: inside the isomorphous lens at 40 at% B
X_POINT = 0.4


def test_point_json_shape_and_values(run, iso):
    code, out, err = run("point", iso, "--temp", "1240K", "--comp", "B=40at%", "--json")
    assert code == 0 and err == ""
    data = json.loads(out)
    assert POINT_KEYS <= set(data)
    assert data["system"] == "iso"
    assert data["temperature_K"] == pytest.approx(T_POINT, abs=1e-9)
    assert data["mole_fraction"] == pytest.approx({"A": 0.6, "B": 0.4}, abs=1e-12)
    assert data["mass_fraction"] == pytest.approx({"A": 0.75, "B": 0.25}, abs=1e-12)   # 0.4*30 / (0.6*60 + 0.4*30)
    xs_b, xs_a, xl_b, _xl_a = topologies.isomorphous_tie_line(T_POINT)
    assert [p["name"] for p in data["phases"]] == ["solid", "liquid"]
    solid, liquid = data["phases"]
    for p in data["phases"]:
        assert PHASE_KEYS <= set(p)
    assert solid["mole_fraction"]["B"] == pytest.approx(xs_b, abs=1e-7)
    assert liquid["mole_fraction"]["B"] == pytest.approx(xl_b, abs=1e-7)
    assert liquid["mass_fraction"]["B"] == pytest.approx(mass_fraction_B(xl_b), abs=1e-7)
    f_liquid = (X_POINT - xs_b) / (xl_b - xs_b)                       # lever rule
    assert liquid["phase_fraction_mol"] == pytest.approx(f_liquid, abs=1e-6)
    assert solid["phase_fraction_mol"] + liquid["phase_fraction_mol"] == pytest.approx(1.0, abs=1e-12)
    m_liquid = f_liquid * ((1 - xl_b) * 60.0 + xl_b * 30.0) / (0.6 * 60.0 + 0.4 * 30.0)
    assert liquid["phase_fraction_mass"] == pytest.approx(m_liquid, abs=1e-6)
    g = R * T_POINT * (0.6 * math.log(xs_a) + 0.4 * math.log(xs_b))
    assert data["gibbs_energy_J_per_mol"] == pytest.approx(g, abs=1e-5)


def test_point_human_table_in_the_typed_units(run, iso):
    code, out, err = run("point", iso, "--temp", "966.85C", "--comp", "B=40at%")
    assert code == 0 and err == ""
    lines = out.splitlines()
    # The typed unit first, the other beside it: 966.85 C is 1240 K.
    assert re.search(r"at 966\.9 °?C \(1240\.0 K\)", lines[0]), lines[0]
    assert re.search(r"alloy: B 40\.0 at% \(25\.0 wt%\)", out)
    assert "stable: solid + liquid" in out
    xs_b, _, xl_b, _ = topologies.isomorphous_tie_line(T_POINT)
    rows = {line.split()[0]: line for line in lines if line.startswith(("solid ", "liquid "))}
    assert f"B {100 * xs_b:.1f} at% ({100 * mass_fraction_B(xs_b):.1f} wt%)" in rows["solid"]
    assert f"B {100 * xl_b:.1f} at% ({100 * mass_fraction_B(xl_b):.1f} wt%)" in rows["liquid"]
    f_liquid = (X_POINT - xs_b) / (xl_b - xs_b)
    assert f"{100 * f_liquid:.1f} mol %" in rows["liquid"]     # an amount: mol % of the alloy
    assert "Gibbs energy of the alloy:" in out
    assert "defer to the alloy's specification" in out


@pytest.mark.parametrize("temp", ["1240K", "1240 K", "966.85C", "966.85", "1772.33F"])
def test_point_temperature_units(run, iso, temp):
    # 966.85 C = 1240 K = 1772.33 F (NIST SP 811); no unit means Celsius.
    code, out, _err = run("point", iso, "--temp", temp, "--comp", "B=40at%", "--json")
    assert code == 0
    assert json.loads(out)["temperature_K"] == pytest.approx(T_POINT, abs=1e-2 if temp.endswith("F") else 1e-9)


@pytest.mark.parametrize("comp", ["B=40at%", "b=40at%", "A=60at%", "B=25wt%", "A=75wt%", "40at%"])
def test_point_composition_either_element_either_basis(run, iso, comp):
    # 40 at% B = 25 wt% B with molar masses 60 and 30 g/mol; no element named: the second one.
    code, out, _err = run("point", iso, "--temp", "1240K", "--comp", comp, "--json")
    assert code == 0
    assert json.loads(out)["mole_fraction"]["B"] == pytest.approx(0.4, abs=1e-12)


def test_point_system_name_in_any_case(run):
    answers = []
    for name in ("pb-sn", "PB-SN", "Pb-Sn"):
        code, out, _err = run("point", name, "--temp", "250C", "--comp", "Sn=30wt%", "--json")
        assert code == 0
        answers.append(json.loads(out))
    assert answers[0]["system"] == "pb-sn"
    assert answers[0] == answers[1] == answers[2]


def test_point_shipped_system_answers(run):
    code, out, err = run("point", "cu-ni", "--temp", "1250C", "--comp", "Ni=40wt%", "--json")
    assert code == 0 and err == ""
    data = json.loads(out)
    assert POINT_KEYS <= set(data) and data["system"] == "cu-ni"
    assert sum(p["phase_fraction_mol"] for p in data["phases"]) == pytest.approx(1.0, abs=1e-12)
    # Mass balance of nickel over the phases (lever rule).
    ni = sum(p["phase_fraction_mass"] * p["mass_fraction"]["Ni"] for p in data["phases"])
    assert ni == pytest.approx(0.40, abs=1e-12)


# --- ladle systems -------------------------------------------------------------------------------
def shipped_names() -> set[str]:
    return {p.stem for p in shipped_folder().glob("*.toml") if p.name != "elements.toml"}


def test_systems_lists_every_shipped_system_with_its_source(run):
    code, out, err = run("systems", "--json")
    assert code == 0
    data = json.loads(out)
    rows = {r["name"]: r for r in data["systems"]}
    assert shipped_names() <= set(rows)
    assert {"cu-ni", "pb-sn"} <= set(rows)
    for name in shipped_names():
        assert "error" not in rows[name], rows[name]
        assert len(rows[name]["source"]) > 20
    code, out, _err = run("systems")
    assert code == 0
    for name in shipped_names():
        assert re.search(rf"^{re.escape(name)}\s", out, re.MULTILINE), name
    assert out.count("source: ") >= len(shipped_names())


# --- ladle melt -------------------------------------------------------------------------------------
def iso_liquidus_solidus(x0: float) -> tuple[float, float]:
    lo, hi = topologies.TM_B + 1e-9, topologies.TM_A - 1e-9
    return (brentq(lambda T: topologies.isomorphous_tie_line(T)[2] - x0, lo, hi, xtol=1e-12),
            brentq(lambda T: topologies.isomorphous_tie_line(T)[0] - x0, lo, hi, xtol=1e-12))


def test_melt_json(run, iso):
    code, out, err = run("melt", iso, "--comp", "B=40at%", "--json")
    assert code == 0 and err == ""
    data = json.loads(out)
    assert {"liquidus_K", "solidus_K", "freezing_range_K", "crossings"} <= set(data)
    liquidus, solidus = iso_liquidus_solidus(0.4)
    assert data["liquidus_K"] == pytest.approx(liquidus, abs=1e-6)
    assert data["solidus_K"] == pytest.approx(solidus, abs=1e-6)
    assert data["freezing_range_K"] == pytest.approx(liquidus - solidus, abs=2e-6)
    assert [(c["above"], c["below"]) for c in data["crossings"]] == [(["liquid"], ["solid", "liquid"]),
                                                                    (["solid", "liquid"], ["solid"])]
    assert all(set(c) >= {"temperature_K", "above", "below"} for c in data["crossings"])


def test_melt_human(run, eut):
    code, out, err = run("melt", eut, "--comp", "B=20at%", "--unit", "K")
    assert code == 0 and err == ""
    _code, out_json, _err = run("melt", eut, "--comp", "B=20at%", "--json")
    data = json.loads(out_json)
    assert re.search(rf"liquidus\s+{data['liquidus_K']:.1f} K", out)
    assert re.search(rf"solidus\s+{data['solidus_K']:.1f} K", out)
    assert re.search(rf"freezing range\s+{data['freezing_range_K']:.1f} K", out)
    assert "on cooling:" in out and "fcc + liquid  ->  fcc + hcp" in out


# --- ladle diagram ----------------------------------------------------------------------------------
def test_diagram_json(run, eut, iso):
    code, out, err = run("diagram", eut, "--json")
    assert code == 0 and err == ""
    data = json.loads(out)
    assert {"invariants", "two_phase_fields", "melting_points"} <= set(data)
    (inv,) = data["invariants"]
    assert inv["kind"] == "eutectic"
    assert [p["name"] for p in inv["phases"]] == ["fcc", "liquid", "hcp"]
    for p in inv["phases"]:
        assert set(p["mole_fraction"]) == {"A", "B"}
        assert sum(p["mole_fraction"].values()) == pytest.approx(1.0, abs=1e-12)
    assert {tuple(f["phases"]) for f in data["two_phase_fields"]} == {("fcc", "liquid"), ("liquid", "hcp"), ("fcc", "hcp")}
    # Melting points as designed (the liquid's dG = dH (1 - T/Tm) is zero at Tm).
    assert data["melting_points"] == pytest.approx({"A": 1200.0, "B": 1000.0}, abs=1e-6)
    code, out, _ = run("diagram", iso, "--json")
    (field,) = json.loads(out)["two_phase_fields"]
    assert field["phases"] == ["solid", "liquid"]
    for T, x_solid, x_liquid in field["tie_lines"]:
        xs_b, _, xl_b, _ = topologies.isomorphous_tie_line(T)
        assert (x_solid, x_liquid) == pytest.approx((xs_b, xl_b), abs=1e-6)


def test_diagram_csv(run, iso):
    code, out, err = run("diagram", iso, "--csv")
    assert code == 0 and err == ""
    rows = list(csv.reader(io.StringIO(out)))
    header, body = rows[0], rows[1:]
    assert header[:3] == ["field", "T_K", "T_C"]
    assert len(header) == 7 and "x_B_left" in header and "wt%_B_right" in header
    _code, json_out, _err = run("diagram", iso, "--json")
    (field,) = json.loads(json_out)["two_phase_fields"]
    # every traced tie-line, and solved ones between them: no gap wider than --every (2 K)
    assert len(body) >= len(field["tie_lines"])
    assert max(b - a for a, b in zip(*[[float(r[1]) for r in body][i:] for i in (0, 1)])) <= 2.0 + 1e-9
    col = {name: i for i, name in enumerate(header)}
    for row in body:
        assert row[0] == "solid+liquid"
        T_K, T_C = float(row[col["T_K"]]), float(row[col["T_C"]])
        assert T_C == pytest.approx(T_K - 273.15, abs=1e-3)
        for side in ("left", "right"):
            x, w = float(row[col[f"x_B_{side}"]]), float(row[col[f"wt%_B_{side}"]])
            assert w == pytest.approx(100 * mass_fraction_B(x), abs=1e-3)
        xs_b, _, xl_b, _ = topologies.isomorphous_tie_line(T_K)
        assert float(row[col["x_B_left"]]) == pytest.approx(xs_b, abs=1e-6)
        assert float(row[col["x_B_right"]]) == pytest.approx(xl_b, abs=1e-6)


def test_diagram_csv_in_fahrenheit_with_more_rows(run, iso):
    code, out, _err = run("diagram", iso, "--csv", "--unit", "F", "--every", "1")
    rows = list(csv.reader(io.StringIO(out)))
    header, body = rows[0], rows[1:]
    assert code == 0 and header[:3] == ["field", "T_K", "T_F"] and "T_C" not in header
    for row in body:
        # F = (K - 273.15) * 9/5 + 32 (NIST Special Publication 811 (2008))
        assert float(row[2]) == pytest.approx((float(row[1]) - 273.15) * 1.8 + 32.0, abs=1e-3)
    temperatures = [float(row[1]) for row in body]
    assert max(b - a for a, b in zip(temperatures, temperatures[1:])) <= 1.0 / 1.8 + 1e-9


def test_diagram_plot_lists_the_reactions(run, eut):
    _code, out_json, _err = run("diagram", eut, "--json")
    T_eutectic = json.loads(out_json)["invariants"][0]["temperature_K"]
    code, out, err = run("diagram", eut)
    assert code == 0 and err == ""
    lines = out.splitlines()
    assert len(lines) >= 24                          # at least 80 x 24, from the issue
    assert max(len(line) for line in lines) >= 80
    assert "fcc+hcp" in out                          # fields labelled with their phases
    assert "reactions:" in out
    assert re.search(rf"eutectic\s+{T_eutectic - 273.15:.1f} °?C", out)   # Celsius by default
    code, out, _ = run("diagram", eut, "--unit", "K", "--at")
    assert code == 0
    assert re.search(rf"eutectic\s+{T_eutectic:.1f} K", out)
    assert "B at%" in out


def test_diagram_ascii_is_ascii_throughout(run, eut):
    code, out, err = run("diagram", eut, "--ascii")
    assert code == 0 and err == ""
    assert out.isascii(), sorted({ch for ch in out if not ch.isascii()})
    assert re.search(r"eutectic\s+\d+\.\d C ", out)          # the degree sign left off, not the unit


# --- bad input: one line on stderr, exit status 2 -----------------------------------------------------
BAD = [
    (("point", "nosuch", "--temp", "100", "--comp", "Sn=10wt%"), "unknown system 'nosuch'"),
    (("melt", "nosuch", "--comp", "Sn=10wt%"), "unknown system 'nosuch'"),
    (("diagram", "nosuch"), "unknown system 'nosuch'"),
    (("point", "pb-sn", "--temp", "100", "--comp", "Zn=10wt%"), "element Zn is not in this system"),
    (("melt", "pb-sn", "--comp", "Zn=10wt%"), "element Zn is not in this system"),
    (("point", "pb-sn", "--temp", "100", "--comp", "Sn=120wt%"), "outside 0-100 %"),
    (("point", "pb-sn", "--temp", "100", "--comp", "Sn=100.5at%"), "outside 0-100 %"),
    (("melt", "pb-sn", "--comp", "Sn=-5at%"), "outside 0-100 %"),
    (("point", "pb-sn", "--temp", "0K", "--comp", "Sn=10wt%"), "at or below absolute zero"),
    (("point", "pb-sn", "--temp", "-273.15", "--comp", "Sn=10wt%"), "at or below absolute zero"),
    (("point", "pb-sn", "--temp=-300C", "--comp", "Sn=10wt%"), "at or below absolute zero"),
    (("point", "pb-sn", "--temp=-460F", "--comp", "Sn=10wt%"), "at or below absolute zero"),
    (("point", "pb-sn", "--temp", "25O", "--comp", "Sn=10wt%"), "cannot read temperature '25O'"),
    (("point", "pb-sn", "--temp", "12..5C", "--comp", "Sn=10wt%"), "cannot read temperature"),
    (("point", "pb-sn", "--temp", "nan", "--comp", "Sn=10wt%"), "cannot read temperature"),
    (("point", "pb-sn", "--temp", "100", "--comp", "Sn=1,5wt%"), "cannot read composition 'Sn=1,5wt%'"),
    (("point", "pb-sn", "--temp", "100", "--comp", "Sn=tenwt%"), "cannot read composition"),
    (("melt", "pb-sn", "--comp", "Sn=10"), "cannot read composition"),
    (("point", "al-cu", "--temp", "500", "--comp", "Cu=50at%"), "outside the range this model covers"),
    (("point", "pb-sn", "--temp", "1e9K", "--comp", "Sn=10wt%"), "outside the range of this system's models"),
    (("point", "pb-sn", "--comp", "Sn=10wt%"), "required: --temp"),
    # the range in the unit typed, then in K (the shipped ag-cu-sn covers 100-450 C)
    (("point", "pb-sn", "--temp", "1e9F", "--comp", "Sn=10wt%"), "(-457.87 to 10340.33 F, 1 to 6000 K)"),
    (("diagram", "ag-cu-sn", "--temp", "25C"), "covers (100 to 450 C, 373.15 to 723.15 K); no answer is given"),
    (("diagram", "ag-cu-sn", "--temp", "300K"), "covers (373.15 to 723.15 K); no answer is given"),
    # an option another command takes: named by this command, as its other errors (it said
    # 'ladle: unrecognized arguments: ... (see ladle --help)')
    (("transitions", "al-cu", "--comp", "Cu=4.5wt%", "--temp", "500"),
     "unrecognized arguments: --temp 500 (see ladle transitions --help)"),
]


def _one_line_error(code, out, err, command: str, expected: str) -> None:
    assert code == 2
    assert out == ""
    assert err.endswith("\n") and err.count("\n") == 1, err
    assert err.startswith(f"ladle {command}: "), err
    assert expected in err, err
    assert "Traceback" not in err


@pytest.mark.parametrize("argv,expected", BAD, ids=[" ".join(a) for a, _ in BAD])
def test_bad_input_is_one_line_and_status_2(run, argv, expected):
    _one_line_error(*run(*argv), argv[0], expected)


def test_negative_temperature_with_unit_after_a_space(run):
    _one_line_error(*run("point", "pb-sn", "--temp", "-300C", "--comp", "Sn=10wt%"), "point", "at or below absolute zero")
    status, out, err = run("point", "pb-sn", "--temp", "-40C", "--comp", "Sn=10wt%")
    assert status == 0 and " at -40.0 " in out and not err


def test_bad_system_file_is_one_line_naming_file_and_key(run, tmp_path):
    bad = tmp_path / "bad.toml"
    bad.write_text(topologies.eutectic().synthetic.toml().replace('G.B = [ { upto = 6000.0, a = 6000.0 } ]', ""),
                   encoding="utf-8")
    for argv in (("point", str(bad), "--temp", "700K", "--comp", "B=10at%"), ("melt", str(bad), "--comp", "B=10at%"),
                 ("diagram", str(bad))):
        _one_line_error(*run(*argv), argv[0], "bad.toml: phase.fcc.G.B: missing")


def test_missing_system_file_is_one_line(run, tmp_path):
    _one_line_error(*run("diagram", str(tmp_path / "absent.toml")), "diagram", "absent.toml: no such system file")


@pytest.mark.parametrize("argv,expected", [
    (("point", "nosuch", "--temp", "100", "--comp", "Sn=10wt%"), "unknown system 'nosuch'"),
    (("point", "pb-sn", "--temp", "0K", "--comp", "Sn=10wt%"), "at or below absolute zero"),
])
def test_bad_input_as_a_separate_process(argv, expected, tmp_path):
    """The real process: exit status 2 and one line, nothing on stdout."""
    env = {"LADLE_SYSTEMS": str(tmp_path), "XDG_CACHE_HOME": str(tmp_path / "cache"), "PATH": "/usr/bin:/bin",
           "HOME": str(tmp_path)}
    p = subprocess.run([sys.executable, "-m", "ladle.tui.cli", *argv], capture_output=True, text=True, env=env,
                       timeout=120)
    _one_line_error(p.returncode, p.stdout, p.stderr, argv[0], expected)


def test_the_plot_keeps_its_80_by_24_on_a_smaller_terminal(run, eut, monkeypatch):
    """A terminal narrower or shorter than 80x24 (COLUMNS, LINES) gets the plot at 80 columns
    and 24 rows all the same (plotext would shrink it to the terminal: 20 columns and a row or
    two, unreadable), as the line commands promise."""
    monkeypatch.setenv("COLUMNS", "20")
    monkeypatch.setenv("LINES", "5")
    code, out, err = run("diagram", eut, "--ascii")
    assert (code, err) == (0, "")
    picture = out.split("\nreactions:")[0].splitlines()
    assert max(len(line) for line in picture) == 80
    assert len(picture) >= 24


def test_steel_lines_are_read_at_the_reactions_not_on_the_grid(run):
    """`ladle diagram fe-fe3c` (the whole diagram drawn as an isopleth on a grid of 0.209 wt% C):
    A1 lists its three phases' carbon, not the grid column next to ferrite's end (it said
    'C 0.209-6.48 wt%', ten times ferrite's carbon), and A3 and Acm run down to A1 at the
    eutectoid's austenite (they stopped a grid row above it, at 746 C and 757 C). Check values:
    the eutectoid at 727 C, austenite 0.77 wt% C, ferrite 0.022 wt% C (ASM Handbook Vol. 3, Alloy
    Phase Diagrams (1992), Fe-C; recalled from memory), and the engine's own point equilibria of
    steels just below and above the model's A1."""
    import numpy as np

    from ladle.engine import equilibrate, find_system
    from ladle.engine.units import mole_from_mass

    code, out, err = run("diagram", "fe-fe3c", "--ascii")
    assert (code, err) == (0, "")
    rows = {ln.split()[0]: ln for ln in out.split("lines the trade names:\n")[1].splitlines() if ln.startswith("  ")}
    a1 = re.fullmatch(r"\s+A1\s+at ([\d.]+) C: bcc \(ferrite\) ([\d.]+), fcc \(austenite\) ([\d.]+), "
                      r"Fe3C \(cementite\) ([\d.]+) wt% C", rows["A1"])
    assert a1, rows["A1"]
    t_a1, ferrite, austenite, cementite = map(float, a1.groups())
    assert t_a1 == pytest.approx(727.0, abs=3.0) and austenite == pytest.approx(0.77, abs=0.03)
    assert ferrite == pytest.approx(0.022, abs=0.005) and cementite == pytest.approx(6.69, abs=0.01)
    system = find_system("fe-fe3c")

    def carbon(T_C: float, wt: float, phase: str) -> float:
        x = mole_from_mass(np.array([1.0 - wt / 100.0, wt / 100.0]), system.molar_mass)
        share = next(p for p in equilibrate(system, T_C + 273.15, x).phases if p.name == phase)
        return 100.0 * float(share.w[1])

    assert ferrite == pytest.approx(carbon(t_a1 - 0.1, 0.4, "bcc"), rel=5e-3)
    assert austenite == pytest.approx(carbon(t_a1 + 0.1, 1.2, "fcc"), rel=5e-3)
    assert rows["A3"].endswith(f"to {a1.group(1)} C, C 0-{a1.group(3)} wt%"), rows["A3"]
    assert f"to {a1.group(1)} C, C {a1.group(3)}-" in rows["Acm"], rows["Acm"]


def test_a_tiny_content_is_never_shown_as_nothing(run):
    """1e-9 wt% of silver and copper in tin (shipped ag-cu-sn): each shown '<0.001' in wt% as in
    at%, never '0' beside a non-zero at% (it said 'Ag 0 wt% (<0.001 at%)')."""
    code, out, err = run("point", "ag-cu-sn", "--temp", "250C", "--comp", "Ag=1e-9wt%,Cu=1e-9wt%")
    assert (code, err) == (0, "")
    alloy = next(line for line in out.splitlines() if line.startswith("alloy: "))
    assert alloy == "alloy: Sn >99.999 wt% (>99.999 at%), Ag <0.001 wt% (<0.001 at%), Cu <0.001 wt% (<0.001 at%)"


def test_melt_names_the_phases_of_each_change_as_point_and_transitions_do(run):
    """`ladle melt` listed its changes by bare structure names ('fcc  ->  fcc + fcc' for
    sterling silver's solvus): now with the trade's names and the two sides of a gap told apart,
    the same for a binary (pb-sn) and for the ternary holding it (bi-pb-sn without bismuth)."""
    def changes(out: str) -> list[str]:
        block = out.split("on cooling:\n")[1].split("\nsafety:")[0]
        return [line.split("C  ", 1)[1] for line in block.splitlines()]

    code, out, err = run("melt", "ag-cu", "--comp", "Cu=7.5wt%")
    assert (code, err) == (0, "")
    assert changes(out)[-1] == "fcc  ->  fcc (Ag-rich) + fcc (Cu-rich)"
    code, binary, _ = run("melt", "pb-sn", "--comp", "Sn=40wt%")
    code3, ternary, err = run("melt", "bi-pb-sn", "--comp", "Bi=0wt%,Sn=40wt%")
    assert (code, code3, err) == (0, 0, "")
    assert changes(binary) == ["liquid  ->  fcc (Pb) + liquid", "fcc (Pb) + liquid  ->  fcc (Pb) + bct (Sn)"]
    def phase_sets(out: str) -> list[list[list[str]]]:
        return [[sorted(side.split(" + ")) for side in change.split("  ->  ")] for change in changes(out)]

    assert phase_sets(ternary) == phase_sets(binary)


def test_steel_diagram_json_has_the_kind_and_compositions_of_each_reaction(run):
    """`ladle diagram fe-fe3c --json` (drawn as an isopleth) gives each invariant reaction the
    `kind` a mapped binary's JSON has, and its phases' compositions at the reaction. Check values
    (ASM Handbook Vol. 3, Alloy Phase Diagrams (1992), Fe-C, recalled from memory): the peritectic
    at 1495 C (delta ferrite 0.09, austenite 0.17, liquid 0.53 wt% C), the ledeburite eutectic at
    1147 C (austenite 2.11, liquid 4.30 wt% C), the eutectoid at 727 C (ferrite 0.022, austenite
    0.77 wt% C); cementite is Fe3C (25 at% C)."""
    code, out, err = run("diagram", "fe-fe3c", "--json")
    assert (code, err) == (0, "")
    reactions = {r["kind"]: r for r in json.loads(out)["invariants"]}
    assert set(reactions) == {"peritectic", "eutectic", "eutectoid"}
    expected = {"peritectic": (1495.0, {"bcc": 0.09, "fcc": 0.17, "liquid": 0.53}),
                "eutectic": (1147.0, {"fcc": 2.11, "liquid": 4.30}),
                "eutectoid": (727.0, {"bcc": 0.022, "fcc": 0.77})}
    for kind, (T_C, carbon) in expected.items():
        r = reactions[kind]
        assert r["temperature_K"] - 273.15 == pytest.approx(T_C, abs=3.0)
        found = {c["name"]: 100.0 * c["mass_fraction"]["C"] for c in r["compositions"]}
        assert [c["name"] for c in r["compositions"]] == sorted(found, key=found.get)
        for phase, wt in carbon.items():
            assert found[phase] == pytest.approx(wt, rel=0.15, abs=0.01), (kind, phase)
        if "Fe3C" in found:
            assert {c["name"]: c for c in r["compositions"]}["Fe3C"]["mole_fraction"]["C"] == pytest.approx(0.25)


def test_a_single_phase_is_the_whole_alloy_in_both_units(run):
    """SAC305 at 250 C is all liquid (shipped ag-cu-sn; its liquidus is near 220 C): the liquid is
    100.0 mass % and 100.0 mol % of the alloy. Its mass share summed to 0.9999999999999999 and was
    shown '>99.999 mass % (100.0 mol %)', as if another phase held the rest."""
    code, out, err = run("point", "ag-cu-sn", "--temp", "250C", "--alloy", "SAC305")
    assert (code, err) == (0, "")
    liquid = next(line for line in out.splitlines() if line.startswith("liquid "))
    assert "100.0 mass % (100.0 mol %)" in liquid, liquid


def test_cool_table_ends_with_both_paths_frozen_at_a_shared_plateau(run):
    """SAC305 (shipped ag-cu-sn) ends freezing by the ternary eutectic on both paths, their
    plateaus some 1e-8 K apart: the table's last row is all solid on both (a ternary eutectic
    plateau leaves no liquid). It showed equilibrium 38.9 beside Scheil 100.0, the equilibrium
    state taken a hair above its own plateau."""
    code, out, err = run("cool", "ag-cu-sn", "--alloy", "SAC305")
    assert (code, err) == (0, "")
    table = out.split("\n\n")[1].splitlines()
    assert "freezing ends, equilibrium" in out.split("\n\n")[2]
    last = table[-1].split()
    assert last[2:4] == ["100.0", "100.0"], table[-1]
    assert [row.split()[0] for row in table[-2:]] == [last[0], last[0]]     # before and after the plateau
    assert table[-2].split()[2] != "100.0", table[-2]
    # Ag3Sn starts to form 3e-4 K apart on the two paths: one row at 218.6 C, not two that read alike
    shown = [row.split()[0] for row in table[2:]]
    assert len(set(shown)) == len(shown) - 1, table


def test_isothermal_section_labels_are_drawn_whole(run, monkeypatch):
    """Every field label the triangle's scene places is printed whole at 80x24 (shipped ag-cu-sn
    at 220 C). The scene judged labels apart on a grid of the size of a plot with ticks, while
    the triangle has none: two labels a row apart there fell on one screen row, and the picture
    read 'epsiloepsilon + (Sn) + liquid'."""
    from ladle.engine import find_system
    from ladle.engine.diagrams.isothermal import map_isothermal
    from ladle.tui.explorer.glyphs import glyphs_for
    from ladle.tui.explorer.section_drawing import triangle_scene

    monkeypatch.setenv("COLUMNS", "80")
    monkeypatch.setenv("LINES", "24")
    code, out, err = run("diagram", "ag-cu-sn", "--temp", "220C")
    assert (code, err) == (0, "")
    # terminal_plot's size: 80 columns, and the section's least height, 24 rows (more than 24 - 6)
    scene = triangle_scene(map_isothermal(find_system("ag-cu-sn"), 493.15), glyphs_for(False), 80, 24)
    assert len(scene.labels) >= 5
    picture = out.split("┌", 1)[1].split("└", 1)[0]
    for text in sorted((label.text for label in scene.labels), key=len, reverse=True):   # 'epsilon + (Sn)'
        assert text in picture, text                      # after 'epsilon + (Sn) + liquid' is taken out
        picture = picture.replace(text, " " * len(text), 1)


def test_the_sides_of_a_gap_are_named_on_a_ternary_picture(run, monkeypatch):
    """The carat golds' fcc gap (shipped ag-au-cu at 600 C): the field is named by what each side
    is rich in, 'fcc (Cu-rich) + fcc (Ag-rich)' (from the point equilibrium in the field), as the
    status pane and ladle point name them; the picture said 'fcc + fcc'."""
    monkeypatch.setenv("COLUMNS", "80")
    monkeypatch.setenv("LINES", "24")
    code, out, err = run("diagram", "ag-au-cu", "--temp", "600C")
    assert (code, err) == (0, "")
    assert "fcc (Cu-rich) + fcc (Ag-rich)" in out and "fcc + fcc" not in out
