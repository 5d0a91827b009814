"""`ladle check` as a user runs it: a system whose checks pass, one built to fail, the JSON
report, fit targets and melting points kept apart from the independent checks, a relative
tolerance, and bad input. The systems are invented (elements A and B)."""

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
    assert out.startswith("Invented A-B: 1 of 1 independent checks passed\n"
                          "(0 fit targets and 2 pure-element values shown apart, not counted)\n")
    assert "PASS  check[2]: fcc next to fcc at" in out
    # the melting points come last, under their own heading
    assert out.index("PASS  check[2]") < out.index("PURE-ELEMENT DATA") < out.index("PASS  check[0]")
    assert "source: closed form: regular-solution binodal" in out
    assert "FAIL" not in out


def test_checks_built_to_fail_are_reported_with_reasons(system_file, capsys):
    system_file.write_text(SYSTEM + FAILING)
    assert main(["check", str(system_file)]) == 0          # a report: failures are not errors
    out = capsys.readouterr().out
    assert out.startswith("Invented A-B: 1 of 2 independent checks passed\n")
    block = out.split("FAIL  check[3]: melting of A\n")[1].split("\n\n")[0]
    assert "temperature  726.85 °C  746.85 °C    -20.00 K        5 K  no" in block or \
           "temperature  726.85 C  746.85 C    -20.00 K        5 K  no" in block
    assert "FAIL  check[4]: eutectic of liquid\n      the model has no eutectic of liquid (its diagram has a different topology)" in out


def test_json_report(system_file, capsys):
    system_file.write_text(SYSTEM + FAILING)
    assert main(["check", str(system_file), "--json"]) == 0
    report = json.loads(capsys.readouterr().out)
    assert (report["independent_passed"], report["independent_total"], report["fit_targets"]) == (1, 2, 0)
    facts = report["facts"]
    assert [(f["index"], f["independent"], f["role"]) for f in facts] == [
        (0, False, "pure-element data"), (1, False, "pure-element data"), (2, True, "independent check"),
        (3, False, "pure-element data"), (4, True, "independent check")]
    gap = facts[2]
    assert gap["passed"] and gap["comparisons"][0]["unit"] == "at%" and gap["comparisons"][0]["tolerance"] == 0.01
    assert gap["comparisons"][0]["model"] == pytest.approx(100 * (1 - S) / 2, abs=1e-6)
    melt = facts[3]
    assert melt["comparisons"][0]["difference"] == pytest.approx(-20.0, abs=1e-5) and not melt["passed"]
    assert facts[4]["comparisons"][0]["model"] is None


MEASURED = f'''
[[measured]]
kind = "boundary"
phase = "fcc"
partner = "fcc"
temperature_K = {GAP_T!r}
at_percent = {100 * (1 - S) / 2 + 0.5!r}
uncertainty_at = 0.25
source = "invented fit target, 0.5 at% off the closed form"
'''


def test_fit_targets_are_shown_apart_and_not_counted(system_file, capsys):
    system_file.write_text(SYSTEM.replace("[[check]]\nkind = \"boundary\"", "[[check]]\nkind = \"boundary\"", 1)
                           .split("# the symmetric")[0] + MEASURED)
    assert main(["check", str(system_file), "--json"]) == 0
    report = json.loads(capsys.readouterr().out)
    assert (report["independent_passed"], report["independent_total"], report["fit_targets"]) == (0, 0, 1)
    target = report["facts"][-1]
    assert (target["list"], target["role"], target["independent"]) == ("measured", "fit target", False)
    assert target["comparisons"][0]["residual"] == pytest.approx(-2.0, abs=1e-4)
    assert main(["check", str(system_file)]) == 0
    out = capsys.readouterr().out
    assert out.startswith("Invented A-B: the file holds no independent checks")
    assert "FIT TARGETS: facts the parameters were fitted to (agreement here is not validation)" in out


def test_a_fit_target_cannot_also_be_a_check(system_file, capsys):
    repeated = MEASURED.replace("[[measured]]", "[[check]]").replace("uncertainty_at", "tolerance_at")
    system_file.write_text(SYSTEM.split("# the symmetric")[0] + repeated + MEASURED)
    with pytest.raises(SystemExit) as e:
        main(["check", str(system_file)])
    assert e.value.code == 2
    assert "check[2]: repeats measured[0], a fact the parameters are fitted to" in capsys.readouterr().err


@pytest.mark.parametrize("ratio, passes", [(0.6, False), (0.8, True), (1.4, True), (1.6, False)])
def test_a_relative_tolerance_fails_outside_the_factor(system_file, capsys, ratio, passes):
    """The model's gap edge lies at 20 at% B; a reference placed so that model / reference is
    `ratio` passes within a factor of 1.5 (0.667 to 1.5) or fails; no absolute tolerance is given."""
    factor = 1.5
    edge = 100 * (1 - S) / 2
    check = SYSTEM.split("# the symmetric")[1].replace(f"at_percent = {edge!r}", f"at_percent = {edge / ratio!r}")
    check = check.replace("tolerance_at = 0.01", f"tolerance_factor = {factor}")
    system_file.write_text(SYSTEM.split("# the symmetric")[0] + "#" + check)
    assert main(["check", str(system_file), "--json"]) == 0
    row = json.loads(capsys.readouterr().out)["facts"][2]
    assert row["passed"] is passes and row["comparisons"][0]["tolerance_factor"] == factor


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
    for _ in range(2):          # evaluated, then remembered: the same line
        assert main(["systems"]) == 0
        out = capsys.readouterr().out
        assert ("a-b      Invented A-B (yours)\n         independent checks passed: 1 of 2 (ladle check a-b)\n"
                in out)
    assert main(["systems", "--json"]) == 0
    row = [r for r in json.loads(capsys.readouterr().out)["systems"] if r["name"] == "a-b"][0]
    assert (row["independent_checks_passed"], row["independent_checks"], row["fit_targets"]) == (1, 2, 0)


def test_systems_list_wraps_to_the_terminal_and_json_keeps_every_text(tmp_path, monkeypatch, capsys):
    monkeypatch.setenv("LADLE_SYSTEMS", str(tmp_path / "none"))
    monkeypatch.setenv("COLUMNS", "60")
    assert main(["systems"]) == 0
    lines = capsys.readouterr().out.splitlines()
    assert lines and max(len(line) for line in lines) <= 60
    assert any(line.startswith("         independent checks passed: ") for line in lines)
    assert main(["systems", "--json"]) == 0
    rows = json.loads(capsys.readouterr().out)["systems"]
    assert all(len(r["source"]) > 60 for r in rows if "source" in r)   # whole, not cut
