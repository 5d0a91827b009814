"""The model against measured facts (engine/measure.py): values, tolerances, and a missing or
wrong reaction reported as such."""

from __future__ import annotations

import math

import pytest
from scipy.optimize import brentq

from ladle.engine import load_system
from ladle.engine.diagrams.diagram import map_diagram
from ladle.engine.checking.measure import evaluate, evaluate_all
from ladle.engine.units import GAS_CONSTANT as R
from measure_systems import FUSION_A, FUSION_B, MELT_A_K, MELT_B_K, eutectic_text, ideal_text, write


def ideal_liquidus_K(x0: float) -> float:
    """Closed-form liquidus of the ideal lens (D.R. Gaskell, Introduction to the Thermodynamics of
    Materials, 5th ed. (2008): x_L = k_B (1 - k_A) / (k_B - k_A), k_i = exp(-dG_i / RT)), solved
    with scipy's brentq."""
    def x_liquid(T):
        kA = math.exp(-FUSION_A * (1 - T / MELT_A_K) / (R * T))
        kB = math.exp(-FUSION_B * (1 - T / MELT_B_K) / (R * T))
        return kB * (1 - kA) / (kB - kA)
    return brentq(lambda T: x_liquid(T) - x0, MELT_A_K + 1e-9, MELT_B_K - 1e-9, xtol=1e-12)


def _check(kind: str, body: str) -> str:
    return f'\n[[check]]\nkind = "{kind}"\nsource = "invented for the test"\n{body}\n'


def test_melting_and_liquidus_checks(tmp_path):
    T_liq = ideal_liquidus_K(0.3)
    extra = (_check("melting", f"element = \"A\"\ntemperature_K = {MELT_A_K}\ntolerance_K = 0.5")
             + _check("liquidus", f"at_percent = 30\ntemperature_K = {T_liq + 4.0!r}\ntolerance_K = 5")
             + _check("liquidus", f"at_percent = 30\ntemperature_K = {T_liq + 6.0!r}\ntolerance_K = 5"))
    system = load_system(write(tmp_path, ideal_text(extra)))
    melting, near, far = evaluate_all(system, system.checks)
    assert melting.passed and melting.comparisons[0].model == pytest.approx(MELT_A_K, abs=1e-6)
    assert near.passed and near.comparisons[0].difference == pytest.approx(-4.0, abs=1e-6)
    assert not far.passed and far.problem is None
    assert far.comparisons[0].difference == pytest.approx(-6.0, abs=1e-6)


@pytest.fixture(scope="module")
def eutectic_case(tmp_path_factory):
    folder = tmp_path_factory.mktemp("eutectic")
    system = load_system(write(folder, eutectic_text()))
    inv = map_diagram(system).invariants[0]
    return folder, inv


def test_invariant_matched_by_kind_and_phases(eutectic_case):
    folder, inv = eutectic_case
    (_f, x_f), (_l, x_l), (_b, _x_b) = inv.phases
    body = (f"reaction = \"eutectic\"\ntemperature_K = {inv.temperature_K - 1.0!r}\n"
            f"phases = {{ liquid = {100 * x_l + 0.5!r}, fcc = {100 * x_f!r} }}\ntolerance_K = 3\ntolerance_at = 1")
    system = load_system(write(folder, eutectic_text(extra=_check("invariant", body)), "m.toml"))
    out = evaluate(system, system.checks[0])
    assert out.passed and out.model_reaction == "eutectic"
    T, liq, fcc = out.comparisons
    assert T.difference == pytest.approx(1.0, abs=1e-9)
    assert liq.quantity == "x(liquid)" and liq.difference == pytest.approx(-0.5, abs=1e-9)
    assert fcc.quantity == "x(fcc)" and fcc.difference == pytest.approx(0.0, abs=1e-9)


def test_wrong_reaction_kind_fails_with_a_plain_reason(eutectic_case):
    folder, inv = eutectic_case
    body = f"reaction = \"peritectic\"\ntemperature_K = {inv.temperature_K!r}\nphases = {{ liquid = 41 }}\ntolerance_K = 3"
    system = load_system(write(folder, eutectic_text(extra=_check("invariant", body)), "p.toml"))
    out = evaluate(system, system.checks[0])
    assert not out.passed
    assert out.problem == f"the model's reaction of liquid at {inv.temperature_K:.2f} K is a eutectic, not a peritectic"


def test_missing_reaction_is_reported_not_measured(eutectic_case):
    folder, _inv = eutectic_case
    body = "reaction = \"congruent\"\ntemperature_K = 900\nphases = { liquid = 50, bcc = 50 }\ntolerance_K = 3"
    system = load_system(write(folder, eutectic_text(extra=_check("invariant", body)), "q.toml"))
    out = evaluate(system, system.checks[0])
    assert not out.passed and out.comparisons[0].model is None
    assert out.problem.startswith("the model has no congruent point of liquid + bcc")


def test_boundary_check_and_missing_tie_line(eutectic_case):
    folder, inv = eutectic_case
    T = inv.temperature_K - 50.0
    extra = (_check("boundary", f"phase = \"fcc\"\npartner = \"bcc\"\ntemperature_K = {T!r}\nat_percent = 10\ntolerance_at = 5")
             + _check("boundary", f"phase = \"fcc\"\npartner = \"liquid\"\ntemperature_K = {T!r}\nat_percent = 10\ntolerance_at = 5"))
    system = load_system(write(folder, eutectic_text(extra=extra), "b.toml"))
    ok, missing = evaluate_all(system, system.checks)
    assert ok.problem is None and 0 < ok.comparisons[0].model < 100 * inv.phases[0][1]   # solvus narrows on cooling
    assert missing.problem == f"the model has no fcc + liquid tie-line at {T:.2f} K"


def test_fact_outside_the_covered_range(tmp_path):
    extra = _check("liquidus", "at_percent = 60\ntemperature_K = 900\ntolerance_K = 5")
    system = load_system(write(tmp_path, eutectic_text(extra=extra, covers="covers_at_percent = [0, 40]")))
    out = evaluate(system, system.checks[0])
    assert not out.passed and out.problem == "60 at% B lies outside the range this model covers (0-40 at% B)"


def test_check_without_tolerance_cannot_pass(tmp_path):
    system = load_system(write(tmp_path, ideal_text(_check("melting", f"element = \"B\"\ntemperature_K = {MELT_B_K}"))))
    out = evaluate(system, system.checks[0])
    assert out.comparisons[0].spread is None and not out.passed


def test_invariant_outside_the_mapped_window(tmp_path):
    extra = _check("invariant", "reaction = \"eutectic\"\ntemperature_K = 450\nphases = { liquid = 41 }\ntolerance_K = 3")
    system = load_system(write(tmp_path, eutectic_text(extra=extra)))
    out = evaluate(system, system.checks[0])
    assert out.problem == "450.00 K lies outside the window the diagram is mapped over (500.0-1400.0 K; see temperature_range_K)"


def _ideal_distribution_coefficient(solute_fusion_J: float, solute_melting_K: float, host_melting_K: float) -> float:
    """k0 of a dilute solute between ideal solid and ideal liquid solutions at the host's melting
    point: x_solid / x_liquid = exp((G_liquid - G_solid of the solute) / RT) with G_liquid - G_solid =
    dH_f (1 - T / T_m) (D.R. Gaskell, Introduction to the Thermodynamics of Materials, 5th ed. (2008),
    the ideal lens: k_i = exp(-dG_i / RT) there is the inverse ratio)."""
    T = host_melting_K
    return math.exp(solute_fusion_J * (1.0 - T / solute_melting_K) / (R * T))


def test_distribution_coefficient_against_the_ideal_lens(tmp_path):
    k_B_in_A = _ideal_distribution_coefficient(FUSION_B, MELT_B_K, MELT_A_K)     # about 1.2: B raises A's melting point
    k_A_in_B = _ideal_distribution_coefficient(FUSION_A, MELT_A_K, MELT_B_K)     # about 0.82
    extra = (_check("distribution_coefficient", f'element = "B"\nphase = "fcc"\nk = {k_B_in_A!r}\n'
                                                f"temperature_K = {MELT_A_K}\ntolerance_factor = 1.01")
             + _check("distribution_coefficient", f'element = "A"\nphase = "fcc"\nk = {k_A_in_B!r}\n'
                                                  f"temperature_K = {MELT_B_K}\ntolerance_factor = 1.01")
             + _check("distribution_coefficient", f'element = "A"\nphase = "fcc"\nk = {1.05 * k_A_in_B!r}\n'
                                                  f"temperature_K = {MELT_B_K}\ntolerance_factor = 1.01"))
    system = load_system(write(tmp_path, ideal_text(extra)))
    b_in_a, a_in_b, off = evaluate_all(system, system.checks)
    # the tie-line lies 0.5 K from the melting point, where the solute is about 0.1 at%: the dilute
    # limit holds to a few parts in a thousand there
    assert b_in_a.passed and b_in_a.comparisons[0].model == pytest.approx(k_B_in_A, rel=5e-3)
    assert a_in_b.passed and a_in_b.comparisons[0].model == pytest.approx(k_A_in_B, rel=5e-3)
    assert not off.passed and off.problem is None


def test_distribution_coefficient_is_a_check_only(tmp_path):
    from ladle.engine.errors import SystemFileError

    fact = ('\n[[measured]]\nkind = "distribution_coefficient"\nsource = "invented for the test"\n'
            'element = "B"\nphase = "fcc"\nk = 1.2\ntemperature_K = 1000\n')
    with pytest.raises(SystemFileError, match="distribution coefficient is an independent check"):
        load_system(write(tmp_path, ideal_text(fact)))


def test_an_upper_limit_passes_at_or_below_it_and_fails_above(eutectic_case):
    folder, inv = eutectic_case
    T = inv.temperature_K - 50.0
    probe = _check("boundary", f'phase = "fcc"\npartner = "bcc"\ntemperature_K = {T!r}\nat_percent = 10\ntolerance_at = 5')
    probed = load_system(write(folder, eutectic_text(extra=probe), "c.toml"))
    model = evaluate(probed, probed.checks[0]).comparisons[0].model
    limits = "".join(_check("boundary", f'phase = "fcc"\npartner = "bcc"\ntemperature_K = {T!r}\n'
                                        f"at_percent = {bound!r}\nat_most = true")
                     for bound in (1.01 * model, 0.99 * model))
    system = load_system(write(folder, eutectic_text(extra=limits), "d.toml"))
    above, below = evaluate_all(system, system.checks)
    assert above.passed and not below.passed and below.problem is None


def test_an_upper_limit_takes_no_other_tolerance(eutectic_case):
    from ladle.engine.errors import SystemFileError

    folder, _inv = eutectic_case
    bad = _check("boundary", 'phase = "fcc"\npartner = "bcc"\ntemperature_K = 800\nat_percent = 1\nat_most = true\n'
                             "tolerance_factor = 2")
    with pytest.raises(SystemFileError, match="at_most: expected true"):
        load_system(write(folder, eutectic_text(extra=bad), "e.toml"))
