"""Fitting coefficients to measurements (engine/fit.py): a round trip from a known model, a real
case against handbook values, and the guards (undetermined coefficients, lost reactions)."""

from __future__ import annotations

import datetime

import numpy as np
import pytest
from scipy.stats import chi2

from ladle.engine import load_system
from ladle.engine.diagrams.diagram import map_diagram
from ladle.engine.fitting.fit import FitInputError, fit
from ladle.engine.fitting.report import report_table
from ladle.engine.checking.measure import evaluate_all
from ladle.engine.checking.boundaries import boundary_temperature, phase_end, tie_line_between
from measure_systems import EUTECTIC_TRUE, eutectic_text, write

START = {"liquid.L.0.a": -1500.0, "liquid.L.0.b": 0.0, "fcc.L.0.a": 9000.0, "bcc.L.0.a": 16000.0}
FREE = '\n[fit]\nfree = ["liquid.L.0.a", "liquid.L.0.b", "fcc.L.0.a", "bcc.L.0.a"]\n'
#: Standard uncertainties of the invented measurements (K, at%).
U_EUTECTIC_K, U_EUTECTIC_AT, U_LIQUIDUS_K, U_SOLVUS_AT = 0.5, 0.5, 1.0, 0.3
SOLVUS_K = 650.0


def _fact(kind: str, body: str) -> str:
    return f'\n[[measured]]\nkind = "{kind}"\nsource = "generated from the invented true model"\n{body}\n'


def measurements_from_true_model(tmp_path, noise: np.random.Generator | None) -> str:
    """Ten measured values of the true model (eutectic: 4, liquidus: 4, solvus: 2), with
    Gaussian noise of the stated standard uncertainties where `noise` is given."""
    truth = load_system(write(tmp_path, eutectic_text(), "truth.toml"))

    def jitter(v: float, u: float) -> float:
        return v + (u * noise.standard_normal() if noise is not None else 0.0)

    inv = map_diagram(truth).invariants[0]
    phases = ", ".join(f"{n} = {jitter(100 * x, U_EUTECTIC_AT)!r}" for n, x in inv.phases)
    text = _fact("invariant", f"reaction = \"eutectic\"\ntemperature_K = {jitter(inv.temperature_K, U_EUTECTIC_K)!r}\n"
                              f"phases = {{ {phases} }}\nuncertainty_K = {U_EUTECTIC_K}\nuncertainty_at = {U_EUTECTIC_AT}")
    for x in (0.15, 0.3, 0.6, 0.8):
        T = boundary_temperature(truth, x, "liquidus").temperature_K
        text += _fact("liquidus", f"at_percent = {100 * x}\ntemperature_K = {jitter(T, U_LIQUIDUS_K)!r}\nuncertainty_K = {U_LIQUIDUS_K}")
    tie = tie_line_between(truth, SOLVUS_K, "fcc", "bcc", 0.1)
    for phase, partner, near in (("fcc", "bcc", 0.0), ("bcc", "fcc", 1.0)):
        x = phase_end(tie, phase, near)
        text += _fact("boundary", f"phase = \"{phase}\"\npartner = \"{partner}\"\ntemperature_K = {SOLVUS_K}\n"
                                  f"at_percent = {jitter(100 * x, U_SOLVUS_AT)!r}\nuncertainty_at = {U_SOLVUS_AT}")
    return text


def test_round_trip_with_noise_recovers_the_true_coefficients(tmp_path):
    facts = measurements_from_true_model(tmp_path, np.random.default_rng(1))
    system = load_system(write(tmp_path, eutectic_text(START, FREE + facts)))
    result = fit(system)
    assert result.acceptable, result.problems
    assert result.degrees_of_freedom == 6
    # a minimum consistent with the noise: chi-square below its 99.9 % point for 6 degrees of freedom (scipy)
    assert result.chi_square < chi2.ppf(0.999, 6)
    for p in result.parameters:
        # within three standard uncertainties (coverage 99.7 % for a normal distribution)
        assert abs(p.value - EUTECTIC_TRUE[p.path]) < 3 * p.uncertainty, p
        assert p.uncertainty < 0.5 * abs(EUTECTIC_TRUE[p.path]) or p.path == "liquid.L.0.b"
    # a and b of one interaction are strongly (anti)correlated: their pair is reported
    assert ("liquid.L.0.a", "liquid.L.0.b") in [(a, b) for a, b, _r in result.correlations]


def test_round_trip_without_noise_is_exact(tmp_path):
    facts = measurements_from_true_model(tmp_path, None)
    system = load_system(write(tmp_path, eutectic_text(START, FREE + facts)))
    result = fit(system)
    assert result.acceptable and result.chi_square < 1e-10
    for p in result.parameters:
        assert p.value == pytest.approx(EUTECTIC_TRUE[p.path], abs=1e-3 * p.uncertainty)
    # the fitted document loads as a system whose stable values match the measurements
    fitted = load_system(write(tmp_path, "", "unused.toml"), document=result.document)
    assert all(abs(c.difference) < 1e-5 for o in evaluate_all(fitted, fitted.measured) for c in o.comparisons)


def test_an_unconstrained_coefficient_is_named(tmp_path):
    facts = measurements_from_true_model(tmp_path, None)
    hcp = '\n[phase.hcp]\nmodel = "solution"\nG.A = [ { upto = 4000, a = 30000.0 } ]\nG.B = [ { upto = 4000, a = 30000.0 } ]\nL = [ { a = 0.0 } ]\n'
    free = '\n[fit]\nfree = ["liquid.L.0.a", "hcp.L.0.a"]\n'
    system = load_system(write(tmp_path, eutectic_text(START, hcp + free + facts)))
    result = fit(system)
    assert not result.acceptable
    assert result.problems[0].startswith("the measurements do not determine hcp.L.0.a")
    assert [p.uncertainty is None for p in result.parameters] == [False, True]


def test_a_reaction_of_the_wrong_kind_makes_the_fit_unacceptable(tmp_path):
    # the measured compositions put the liquid between the solids: whatever the coefficients, the
    # model's reaction is a eutectic, so a "peritectic" cannot be reproduced
    facts = _fact("invariant", "reaction = \"peritectic\"\ntemperature_K = 740\nphases = { fcc = 11, liquid = 41, bcc = 89 }\n"
                               "uncertainty_K = 1\nuncertainty_at = 1")
    facts += _fact("liquidus", "at_percent = 30\ntemperature_K = 800\nuncertainty_K = 2")
    free = '\n[fit]\nfree = ["liquid.L.0.a", "fcc.L.0.a"]\n'
    system = load_system(write(tmp_path, eutectic_text(START, free + facts)))
    result = fit(system)
    assert result.converged and not result.acceptable
    assert any("is a eutectic, not a peritectic" in p for p in result.problems)


@pytest.mark.parametrize("extra, message", [
    ("", "fit.free: missing; name the coefficients to fit"),
    ('\n[fit]\nfree = ["liquid.L.0.a"]\n', "measured: the file holds no [[measured]] facts to fit to"),
    ('\n[fit]\nfree = ["liquid.L.4.a"]\n' + _fact("liquidus", "at_percent = 30\ntemperature_K = 800\nuncertainty_K = 2"),
     "fit.free[0]: 'liquid.L.4.a': phase.liquid.L has 1 entries (0 to 0)"),
    ('\n[fit]\nfree = ["liquid.L.0.a"]\n' + _fact("liquidus", "at_percent = 30\ntemperature_K = 800"),
     "measured[0]: uncertainty_K missing"),
    ('\n[fit]\nfree = ["liquid.L.0.a"]\n' + _fact("mixing_enthalpy", "phase = \"liquid\"\nat_percent = 50\ntemperature_K = 1300\nenthalpy_J_per_mol = -1000"),
     "measured[0]: uncertainty_J missing (the standard uncertainty of the enthalpy, J/mol)"),
    ('\n[fit]\nfree = ["liquid.L.0.a", "liquid.L.0.b"]\n' + _fact("liquidus", "at_percent = 30\ntemperature_K = 800\nuncertainty_K = 2"),
     "2 free coefficients but only 1 measured values"),
    ('\n[fit]\nfree = ["liquid.L.0.a"]\n' + _fact("invariant", "reaction = \"congruent\"\ntemperature_K = 900\nphases = { liquid = 50 }\nuncertainty_K = 1\nuncertainty_at = 1"),
     "measured[0]: the starting model has no congruent point of liquid; change the starting values"),
])
def test_files_that_cannot_be_fitted_say_why(tmp_path, extra, message):
    system = load_system(write(tmp_path, eutectic_text(START, extra)))
    with pytest.raises(FitInputError) as e:
        fit(system)
    assert str(e.value).startswith("a-b.toml: ")
    assert message in str(e.value) and "\n" not in str(e.value)


def test_measurement_outside_the_covered_range(tmp_path):
    extra = '\n[fit]\nfree = ["liquid.L.0.a"]\n' + _fact("liquidus", "at_percent = 60\ntemperature_K = 800\nuncertainty_K = 2")
    system = load_system(write(tmp_path, eutectic_text(START, extra, covers="covers_at_percent = [0, 40]")))
    with pytest.raises(FitInputError, match=r"^a-b.toml: measured\[0\]: 60 at% B lies outside the range this model covers \(0-40 at% B\)$"):
        fit(system)


PB_SN = '''
elements = ["Pb", "Sn"]
molar_mass = { Pb = 207.2, Sn = 118.71 }
source = "Test measurements: handbook values recalled from memory (see each fact)"

[phase.liquid]
model = "solution"
G.Pb = "liquid"
G.Sn = "liquid"
L = [ { a = 0.0, b = 0.0 }, { a = 0.0 } ]

[phase.fcc]
model = "solution"
G.Pb = "fcc"
G.Sn = "fcc"
L = [ { a = 5000.0 } ]

[phase.bct]
model = "solution"
G.Pb = "bct"
G.Sn = "bct"
L = [ { a = 15000.0 } ]

[fit]
free = ["liquid.L.0.a", "liquid.L.1.a", "fcc.L.0.a", "bct.L.0.a"]

[[measured]]
kind = "invariant"
reaction = "eutectic"
temperature_C = 183.0
phases = { liquid = 73.9, fcc = 28.5, bct = 98.5 }
uncertainty_K = 0.5
uncertainty_at = { liquid = 0.5, fcc = 1.0, bct = 0.5 }
source = "T.B. Massalski (ed.), Binary Alloy Phase Diagrams, 2nd ed., ASM International (1990), Pb-Sn: eutectic 183 C, liquid 73.9 at% Sn, (Pb) 28.1-29 at% Sn, (Sn) about 98.5 at% Sn; recalled from memory"

[[measured]]
kind = "liquidus"
wt_percent = 10.0
temperature_C = 302.0
uncertainty_K = 2.0
source = "ASTM B32 (solder metal), grade Sn10: liquidus 302 C; recalled from memory"

[[measured]]
kind = "liquidus"
wt_percent = 40.0
temperature_C = 238.0
uncertainty_K = 2.0
source = "ASTM B32 (solder metal), grade Sn40: liquidus 238 C; recalled from memory"

[[measured]]
kind = "liquidus"
wt_percent = 70.0
temperature_C = 192.0
uncertainty_K = 2.0
source = "ASTM B32 (solder metal), grade Sn70: liquidus 192 C; recalled from memory"
'''

#: Liquidus temperatures (C) of ASTM B32 solder grades not used in the fit (wt% Sn: C), recalled
#: from memory; the issue's accuracy target for liquidus temperatures is 5 K.
PB_SN_HELD_OUT = {5.0: 312.0, 20.0: 277.0, 30.0: 255.0, 50.0: 216.0, 60.0: 191.0}


def test_real_case_lead_tin_predicts_handbook_values_not_fitted(tmp_path):
    system = load_system(write(tmp_path, PB_SN, "pb-sn-measured.toml"))
    result = fit(system)
    assert result.acceptable, result.problems
    for o in result.outcomes:
        for c in o.comparisons:
            assert abs(c.difference) <= 2.5 * c.spread, (o.fact.index, c)
    checks = [{"kind": "liquidus", "wt_percent": w, "temperature_C": t, "tolerance_K": 5.0,
               "source": f"ASTM B32 grade Sn{w:g}, recalled from memory"} for w, t in PB_SN_HELD_OUT.items()]
    fitted = load_system(system.path, document={**result.document, "check": checks})
    outcomes = evaluate_all(fitted, fitted.checks)
    assert len(outcomes) == 5
    assert [(o.fact.index, round(o.comparisons[0].difference, 1)) for o in outcomes if not o.passed] == []


def test_a_temperature_term_the_measurements_cannot_separate_is_not_determined(tmp_path):
    """The same Pb-Sn facts with the liquid's L[0] free as a + b T: the facts lie within 130 K of
    each other, so a and b are correlated beyond 0.99 and the fit says they are not determined
    (it is refused), instead of reporting two large, cancelling coefficients as a result."""
    text = PB_SN.replace('free = ["liquid.L.0.a", "liquid.L.1.a",', 'free = ["liquid.L.0.a", "liquid.L.0.b", "liquid.L.1.a",')
    result = fit(load_system(write(tmp_path, text, "pb-sn-measured.toml")))
    assert not result.acceptable
    undetermined = {p.path for p in result.parameters if not p.determined}
    assert {"liquid.L.0.a", "liquid.L.0.b"} <= undetermined
    assert any(p.startswith("not determined:") for p in result.problems)
    table = report_table(result, "pb-sn-measured.toml", datetime.date(2026, 1, 1))
    assert table["parameters"]["liquid.L.0.b"]["determined"] is False
