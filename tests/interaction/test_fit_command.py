"""`ladle fit` as a user runs it: writing the fitted file, never overwriting, refusing a fit that
did not converge or lost a measured reaction, and one clear line for bad input. The system is
invented (elements A and B, a simple eutectic); its measurements come from known coefficients."""

from __future__ import annotations

import json
import tomllib

import pytest

from ladle.tui.cli import main

PHASES = '''
elements = ["A", "B"]
molar_mass = {{ A = 50.0, B = 100.0 }}
title = "Invented A-B eutectic"
source = "Invented for the tests"
temperature_range_K = [500, 1400]

[phase.liquid]
model = "solution"
G.A = [ {{ upto = 4000, a = 12000.0, b = -12.0 }} ]
G.B = [ {{ upto = 4000, a = 15000.0, b = -12.5 }} ]
L = [ {{ a = {liquid}, b = 1.5 }} ]

[phase.fcc]
model = "solution"
G.A = [ {{ upto = 4000 }} ]
G.B = [ {{ upto = 4000, a = 4000.0, b = -1.0 }} ]
L = [ {{ a = {fcc} }} ]

[phase.bcc]
model = "solution"
G.A = [ {{ upto = 4000, a = 3000.0, b = -0.5 }} ]
G.B = [ {{ upto = 4000 }} ]
L = [ {{ a = 13000.0 }} ]

[fit]
free = ["liquid.L.0.a", "fcc.L.0.a"]
'''


def _fact(kind: str, body: str, source: str = "from the invented model with liquid L0 = -4000 + 1.5 T, fcc L0 = 12000") -> str:
    return f'\n[[measured]]\nkind = "{kind}"\nsource = "{source}"\n{body}\n'


@pytest.fixture(scope="module")
def truth_values(tmp_path_factory):
    """Eutectic and liquidus values of the invented model with the true coefficients (K, at%)."""
    from ladle.engine import load_system
    from ladle.engine.diagrams.diagram import map_diagram
    from ladle.engine.checking.boundaries import boundary_temperature

    path = tmp_path_factory.mktemp("truth") / "truth.toml"
    path.write_text(PHASES.format(liquid=-4000.0, fcc=12000.0))
    truth = load_system(path)
    inv = map_diagram(truth).invariants[0]
    liquidus = {x: boundary_temperature(truth, x / 100, "liquidus").temperature_K for x in (15.0, 30.0, 70.0)}
    return inv.temperature_K, 100 * inv.phases[1][1], liquidus


def measurements(truth_values, **start) -> str:
    T_e, x_l, liquidus = truth_values
    text = PHASES.format(liquid=start.get("liquid", -2000.0), fcc=start.get("fcc", 10000.0))
    text += _fact("invariant", f"reaction = \"eutectic\"\ntemperature_K = {T_e!r}\nphases = {{ liquid = {x_l!r} }}\n"
                               "uncertainty_K = 0.5\nuncertainty_at = 0.5")
    for x, T in liquidus.items():
        text += _fact("liquidus", f"at_percent = {x}\ntemperature_K = {T!r}\nuncertainty_K = 1.0")
    return text


@pytest.fixture
def measured(tmp_path, truth_values):
    path = tmp_path / "measured.toml"
    path.write_text(measurements(truth_values))
    return path


def test_fit_writes_a_system_file_ladle_loads(measured, tmp_path, capsys):
    before = measured.read_bytes()
    out = tmp_path / "fitted.toml"
    assert main(["fit", str(measured), "-o", str(out)]) == 0
    text = capsys.readouterr()
    assert text.err == ""                                  # progress only on a terminal
    assert text.out.startswith("Fit of measured.toml: 2 coefficients to 5 measured values\nconverged: ")
    rows = {line.split()[0]: line.split()[1:] for line in text.out.splitlines() if line.startswith(("liquid.L", "fcc.L"))}
    # coefficient, start, fitted (to the precision of its uncertainty), uncertainty, unit
    assert rows["liquid.L.0.a"][:3] == ["-2000", "-4000", "±"] and rows["liquid.L.0.a"][4] == "J/mol"
    assert rows["fcc.L.0.a"][:3] == ["10000", "12000", "±"]
    assert text.out.rstrip().endswith(f"wrote {out}")
    assert measured.read_bytes() == before                 # the input is never touched
    doc = tomllib.loads(out.read_text())
    assert doc["phase"]["liquid"]["L"][0]["a"] == pytest.approx(-4000.0, abs=0.01)
    assert doc["phase"]["fcc"]["L"][0]["a"] == pytest.approx(12000.0, abs=0.01)
    report = doc["fit_report"]
    assert report["converged"] and report["acceptable"] and report["input"] == "measured.toml"
    assert report["parameters"]["fcc.L.0.a"]["start"] == 10000.0 and report["parameters"]["fcc.L.0.a"]["uncertainty"] > 0
    assert report["residuals"]["measured[0] temperature"]["residual"] == pytest.approx(0.0, abs=1e-3)
    assert len(doc["measured"]) == 4 and doc["source"].startswith("Invented for the tests Coefficients liquid.L.0.a, fcc.L.0.a fitted")
    # the written file is a system the other commands use directly, and can be fitted again
    assert main(["point", str(out), "--temp", "1300K", "--comp", "B=50at%"]) == 0
    assert "stable: liquid" in capsys.readouterr().out
    again = tmp_path / "again.toml"
    assert main(["fit", str(out), "-o", str(again)]) == 0


def test_existing_output_and_the_input_itself_are_never_overwritten(measured, tmp_path, capsys):
    out = tmp_path / "fitted.toml"
    out.write_text("mine = true\n")
    with pytest.raises(SystemExit) as e:
        main(["fit", str(measured), "-o", str(out)])
    assert e.value.code == 2
    assert capsys.readouterr().err == f"ladle fit: {out}: exists; use --force to replace it\n"
    assert out.read_text() == "mine = true\n"
    with pytest.raises(SystemExit) as e:
        main(["fit", str(measured), "-o", str(measured), "--force"])
    assert e.value.code == 2
    assert "this is the measurements file itself; it is never overwritten" in capsys.readouterr().err
    assert main(["fit", str(measured), "-o", str(out), "--force"]) == 0
    assert "fit_report" in tomllib.loads(out.read_text())


def test_a_fit_that_does_not_converge_writes_nothing_unless_asked(measured, tmp_path, capsys):
    out = tmp_path / "fitted.toml"
    assert main(["fit", str(measured), "-o", str(out), "--max-steps", "1"]) == 1
    text = capsys.readouterr().out
    assert "\nDID NOT CONVERGE: " in text
    assert text.rstrip().endswith(f"nothing written: the fit did not converge (--write-anyway writes {out} regardless)")
    assert not out.exists()
    assert main(["fit", str(measured), "-o", str(out), "--max-steps", "1", "--write-anyway"]) == 1
    assert capsys.readouterr().out.rstrip().endswith(f"wrote {out} (asked for with --write-anyway)")
    report = tomllib.loads(out.read_text())["fit_report"]
    assert report["converged"] is False and report["acceptable"] is False


def test_a_lost_reaction_is_said_plainly_and_nothing_written(tmp_path, truth_values, capsys):
    T_e, _x_l, _liq = truth_values
    text = measurements(truth_values).replace('reaction = "eutectic"', 'reaction = "peritectic"')
    text = text.replace("phases = { liquid = ", "phases = { fcc = 11.5, bcc = 89.1, liquid = ")
    path = tmp_path / "m.toml"
    path.write_text(text)
    out = tmp_path / "fitted.toml"
    assert main(["fit", str(path), "-o", str(out)]) == 1
    report = capsys.readouterr().out
    assert "WRONG  measured[0]: peritectic of fcc + bcc + liquid (model: eutectic)" in report
    assert "PROBLEMS: the fitted model should not be used as it is:" in report
    assert "is a eutectic, not a peritectic" in report
    assert not out.exists()


def test_json_report(measured, tmp_path, capsys):
    out = tmp_path / "fitted.toml"
    assert main(["fit", str(measured), "-o", str(out), "--json"]) == 0
    report = json.loads(capsys.readouterr().out)
    assert report["acceptable"] and report["written"] == str(out)
    assert [p["path"] for p in report["parameters"]] == ["liquid.L.0.a", "fcc.L.0.a"]
    assert report["degrees_of_freedom"] == 3
    assert len(report["measured"]) == 4 and report["measured"][0]["comparisons"][1]["quantity"] == "x(liquid)"
    liquidus = report["measured"][1]["comparisons"][0]
    assert liquidus["uncertainty"] == 1.0 and liquidus["residual"] == pytest.approx(liquidus["difference"] / 1.0)


@pytest.mark.parametrize("change, message", [
    # a missing field (every fact names its source)
    (lambda t: t.replace('source = "from the invented model', 'note = "from the invented model', 1),
     "measured.toml: measured[0].source: missing: every fact names its source (handbook with edition, or paper)"),
    # an uncertainty missing
    (lambda t: t.replace("uncertainty_K = 1.0", "", 1),
     "measured.toml: measured[1]: uncertainty_K missing (the standard uncertainty of the temperature, K)"),
    # a parameter that is not in the model
    (lambda t: t.replace('free = ["liquid.L.0.a", "fcc.L.0.a"]', 'free = ["liquid.L.0.a", "hcp.L.0.a"]'),
     "measured.toml: fit.free[1]: 'hcp.L.0.a': no phase 'hcp' in this file (phases: liquid, fcc, bcc)"),
    (lambda t: t.replace('free = ["liquid.L.0.a", "fcc.L.0.a"]', 'free = ["liquid.L.1.a"]'),
     "measured.toml: fit.free[0]: 'liquid.L.1.a': phase.liquid.L has 1 entries (0 to 0); add the entry (for example { a = 0 }) to fit it"),
    # a measurement outside the system
    (lambda t: t.replace("at_percent = 70.0", "at_percent = 70.0\nwt_percent = 10", 1),
     "measured.toml: measured[3]: give the composition once, as at_percent or wt_percent of B"),
    (lambda t: t.replace('title = "Invented A-B eutectic"', 'title = "Invented A-B eutectic"\ncovers_at_percent = [0, 50]'),
     "measured.toml: measured[3]: 70 at% B lies outside the range this model covers (0-50 at% B)"),
    (lambda t: t.replace('kind = "liquidus"\n', 'kind = "melting"\nelement = "C"\n', 1).replace("at_percent = 15.0\n", ""),
     "measured.toml: measured[1].element: expected one of A, B, found 'C'"),
    (lambda t: t.replace("phases = { liquid = ", "phases = { hcp = 3, liquid = "),
     "measured.toml: measured[0].phases.hcp: not a phase of this system (liquid, fcc, bcc)"),
])
def test_bad_input_is_one_clear_line(measured, tmp_path, capsys, change, message):
    measured.write_text(change(measured.read_text()))
    out = tmp_path / "fitted.toml"
    with pytest.raises(SystemExit) as e:
        main(["fit", str(measured), "-o", str(out)])
    assert e.value.code == 2
    assert capsys.readouterr().err == f"ladle fit: {message}\n"
    assert not out.exists()


def test_progress_appears_on_a_terminal_after_a_second(measured, tmp_path, capsys, monkeypatch):
    import ladle.tui.commands.fit as fit_command

    clock = iter(range(0, 10_000))                         # every reading 1 s later than the last
    monkeypatch.setattr(fit_command.time, "monotonic", lambda: float(next(clock)))
    monkeypatch.setattr(fit_command.sys.stderr, "isatty", lambda: True)
    assert main(["fit", str(measured), "-o", str(tmp_path / "fitted.toml")]) == 0
    err = capsys.readouterr().err
    assert err.startswith("\rfitting: 1 model evaluations, chi-square ")
    assert err.endswith("\r" + " " * 72 + "\r")            # the line is cleared before the report
