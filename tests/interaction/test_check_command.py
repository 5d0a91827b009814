"""`ladle check` as a user runs it: a system whose checks pass, one built to fail, the JSON
report, and bad input. The systems are invented (elements A and B)."""

from __future__ import annotations

import json
import math

import pytest

from ladle.tui.cli import main

R = 8.314462618          # J/(mol K), CODATA 2018 exact
L0 = 12000.0             # J/mol: a symmetric regular fcc solution, critical point L0 / 2R = 721.6 K
S = 0.6                  # the gap's half-width 1 - 2x at the checked temperature
GAP_T = L0 / (2 * R) * S / math.atanh(S)

SYSTEM = f'''
elements = ["A", "B"]
molar_mass = {{ A = 50.0, B = 100.0 }}
title = "Invented A-B"
source = "Invented for the tests"
temperature_range_K = [500, 1400]

[phase.liquid]
model = "solution"
G.A = [ {{ upto = 4000, a = 12000.0, b = -12.0 }} ]
G.B = [ {{ upto = 4000, a = 15000.0, b = -12.5 }} ]

[phase.fcc]
model = "solution"
G.A = [ {{ upto = 4000 }} ]
G.B = [ {{ upto = 4000 }} ]
L = [ {{ a = {L0} }} ]

# melting points: the simple-form liquid G = dH (1 - T/Tm) crosses the solid's at Tm exactly
[[check]]
kind = "melting"
element = "A"
temperature_K = 1000.0
tolerance_K = 0.5
source = "closed form: Tm of the invented simple-form liquid"

[[check]]
kind = "melting"
element = "B"
temperature_K = 1200.0
tolerance_K = 0.5
source = "closed form: Tm of the invented simple-form liquid"

# the symmetric regular-solution binodal T = Tc s / artanh(s), x = (1 - s) / 2 (D.A. Porter,
# K.E. Easterling and M.Y. Sherif, Phase Transformations in Metals and Alloys, 3rd ed. (2009), ch. 1)
[[check]]
kind = "boundary"
phase = "fcc"
partner = "fcc"
temperature_K = {GAP_T!r}
at_percent = {100 * (1 - S) / 2!r}
tolerance_at = 0.01
source = "closed form: regular-solution binodal (Porter, Easterling and Sherif, 3rd ed., ch. 1)"
'''

FAILING = '''
[[check]]
kind = "melting"
element = "A"
temperature_K = 1020.0
tolerance_K = 5
source = "built to fail: 20 K above the model"

[[check]]
kind = "invariant"
reaction = "eutectic"
temperature_K = 800
phases = { liquid = 50 }
tolerance_K = 3
source = "built to fail: the model has no eutectic"
'''


@pytest.fixture
def system_file(tmp_path):
    path = tmp_path / "a-b.toml"
    path.write_text(SYSTEM)
    return path


def test_checks_that_pass(system_file, capsys):
    assert main(["check", str(system_file)]) == 0
    out = capsys.readouterr().out
    assert out.startswith("Invented A-B: 3 of 3 checks pass\n")
    assert "PASS  check[2]: fcc next to fcc at" in out
    assert "source: closed form: regular-solution binodal" in out
    assert "FAIL" not in out


def test_checks_built_to_fail_are_reported_with_reasons(system_file, capsys):
    system_file.write_text(SYSTEM + FAILING)
    assert main(["check", str(system_file)]) == 0          # a report: failures are not errors
    out = capsys.readouterr().out
    assert out.startswith("Invented A-B: 3 of 5 checks pass\n")
    block = out.split("FAIL  check[3]: melting of A\n")[1].split("\n\n")[0]
    assert "temperature  726.85 °C  746.85 °C    -20.00 K        5 K  no" in block or \
           "temperature  726.85 C  746.85 C    -20.00 K        5 K  no" in block
    assert "FAIL  check[4]: eutectic of liquid\n      the model has no eutectic of liquid (its diagram has a different topology)" in out


def test_json_report(system_file, capsys):
    system_file.write_text(SYSTEM + FAILING)
    assert main(["check", str(system_file), "--json"]) == 0
    report = json.loads(capsys.readouterr().out)
    assert (report["passed"], report["total"]) == (3, 5)
    gap = report["checks"][2]
    assert gap["passed"] and gap["comparisons"][0]["unit"] == "at%" and gap["comparisons"][0]["tolerance"] == 0.01
    assert gap["comparisons"][0]["model"] == pytest.approx(100 * (1 - S) / 2, abs=1e-6)
    melt = report["checks"][3]
    assert melt["comparisons"][0]["difference"] == pytest.approx(-20.0, abs=1e-5) and not melt["passed"]
    assert report["checks"][4]["comparisons"][0]["model"] is None


def test_bad_input_is_one_line_and_status_2(tmp_path, capsys):
    with pytest.raises(SystemExit) as e:
        main(["check", "no-such-system"])
    assert e.value.code == 2
    err = capsys.readouterr().err
    assert err.startswith("ladle check: unknown system 'no-such-system'") and err.count("\n") == 1
    broken = tmp_path / "broken.toml"
    broken.write_text(SYSTEM.replace('tolerance_K = 0.5\nsource = "closed form: Tm of the invented simple-form liquid"\n', "tolerance_K = 0.5\n", 1))
    with pytest.raises(SystemExit) as e:
        main(["check", str(broken)])
    assert e.value.code == 2
    assert capsys.readouterr().err == ("ladle check: broken.toml: check[0].source: missing: every fact names its "
                                       "source (handbook with edition, or paper)\n")


def test_systems_list_shows_how_many_checks_pass(tmp_path, monkeypatch, capsys):
    folder = tmp_path / "mine"
    folder.mkdir()
    (folder / "a-b.toml").write_text(SYSTEM + FAILING)
    monkeypatch.setenv("LADLE_SYSTEMS", str(folder))
    monkeypatch.setenv("XDG_CACHE_HOME", str(tmp_path / "cache"))
    for _ in range(2):          # evaluated, then remembered: the same line
        assert main(["systems"]) == 0
        out = capsys.readouterr().out
        assert "a-b      Invented A-B (yours)\n         checks: 3 of 5 pass (ladle check a-b)\n" in out
    assert main(["systems", "--json"]) == 0
    row = [r for r in json.loads(capsys.readouterr().out)["systems"] if r["name"] == "a-b"][0]
    assert (row["checks_passed"], row["checks"]) == (3, 5)
