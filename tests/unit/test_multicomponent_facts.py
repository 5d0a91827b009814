"""Measured facts of systems of three or more elements (issue 16): the [[check]] list of a ternary
read with compositions by element, and measured by `ladle check` against closed forms.

The ideal eutectic ternary of ideal_ternaries.py (every number invented): an ideal liquid and
three pure solids, so that the liquid saturated with solid i at T holds
x_i = a_i(T) = exp(-dG_fus,i(T) / RT) (Raoult's law with the pure solid; e.g. D.R. Gaskell,
Introduction to the Thermodynamics of Materials, 5th ed. (2008), ch. 9). The ternary eutectic
is where sum_i a_i(T) = 1, and an alloy z first freezes at the highest T with a_i(T) = z_i."""

from __future__ import annotations

import sys
from pathlib import Path

import numpy as np
import pytest
from scipy.optimize import brentq

sys.path.insert(0, str(Path(__file__).resolve().parent))

import ideal_ternaries as it  # noqa: E402

from ladle.engine.checking.enthalpy import mixing_enthalpy as binary_mixing_enthalpy  # noqa: E402
from ladle.engine.checking.measure import evaluate_all  # noqa: E402
from ladle.engine.errors import SystemFileError  # noqa: E402
from ladle.engine.files.loader import load_system, shipped_folder  # noqa: E402


def eutectic_K() -> float:
    return brentq(lambda T: it.saturation(T).sum() - 1.0, 300.0, 999.0, xtol=1e-12)


def liquidus_K(z: np.ndarray) -> float:
    """The highest temperature where some solid i saturates the liquid of composition z."""
    T_E = eutectic_K()
    return max(brentq(lambda T, i=i: it.saturation(T)[i] - z[i], T_E, it.MELTING_K[i] - 1e-9, xtol=1e-12)
               for i in range(3) if z[i] > it.saturation(T_E)[i])


def at_table(x) -> str:
    """'{ Sn = 12.3, Bi = 45.6 }': at% of every element but the first (the balance)."""
    return "{ " + ", ".join(f"Sn = {100 * x[1]:.10f}, Bi = {100 * x[2]:.10f}".split(", ")) + " }"


def with_checks(tmp_path, base: str, checks: str) -> Path:
    path = tmp_path / "with-checks.toml"
    path.write_text(base + "\n" + checks, encoding="utf-8")
    return path


def test_ternary_eutectic_and_liquidus_against_the_closed_form(tmp_path):
    T_E = eutectic_K()
    x_E = it.saturation(T_E)
    z = np.array([0.6, 0.25, 0.15])
    checks = f'''
[[check]]
kind = "invariant"
reaction = "eutectic"
temperature_K = {T_E:.10f}
phases = {{ liquid = {at_table(x_E)}, alpha = {{}}, beta = {{}}, gamma = {{}} }}
tolerance_K = 0.01
tolerance_at = 0.001
source = "closed form of the invented ideal ternary"

[[check]]
kind = "liquidus"
temperature_K = {liquidus_K(z):.10f}
at_percent = {at_table(z)}
tolerance_K = 0.01
source = "closed form of the invented ideal ternary"

[[check]]
kind = "liquidus"
temperature_K = {liquidus_K(z) + 0.5:.10f}
at_percent = {at_table(z)}
tolerance_K = 0.1
source = "closed form plus 0.5 K: a check that must fail"
'''
    system = load_system(with_checks(tmp_path, it.EUTECTIC_FILE, checks))
    eutectic, liquidus, wrong = evaluate_all(system, system.checks)
    assert eutectic.passed, eutectic
    assert abs(eutectic.comparisons[0].model - T_E) < 0.01
    assert [c.quantity for c in eutectic.comparisons] == ["temperature", "x(liquid) Sn", "x(liquid) Bi"]
    assert liquidus.passed and abs(liquidus.comparisons[0].difference) < 0.01
    assert not wrong.passed and abs(wrong.comparisons[0].difference + 0.5) < 0.01


def test_a_eutectic_with_the_wrong_solids_is_a_missing_reaction(tmp_path):
    T_E = eutectic_K()
    checks = f'''
[[check]]
kind = "invariant"
reaction = "eutectic"
temperature_K = {T_E:.6f}
phases = {{ liquid = {at_table(it.saturation(T_E))}, alpha = {{}}, beta = {{}} }}
tolerance_K = 1
tolerance_at = 1
source = "test: two solids named where three freeze together"
'''
    system = load_system(with_checks(tmp_path, it.EUTECTIC_FILE, checks))
    (outcome,) = evaluate_all(system, system.checks)
    assert not outcome.passed and "not the eutectic of alpha + beta" in outcome.problem


def test_ternary_mixing_enthalpy_follows_the_muggianu_extrapolation(tmp_path):
    """Lead-tin with ideal bismuth: with x_Pb = x_Sn only L0 of the Pb-Sn pair counts, so
    H(0.4, 0.4, 0.2) = 0.16 L0_H = 0.64 H_binary(0.5) (Muggianu et al., J. Chim. Phys. 72 (1975) 83)."""
    T = 900.0
    binary = load_system(shipped_folder() / "pb-sn.toml")
    expected = 0.64 * binary_mixing_enthalpy(binary.phases["liquid"], T, 0.5)
    checks = f'''
[[check]]
kind = "mixing_enthalpy"
phase = "liquid"
temperature_K = {T}
at_percent = {{ Sn = 40, Bi = 20 }}
enthalpy_J_per_mol = {expected:.10f}
tolerance_J = 1
source = "Muggianu extrapolation of the shipped Pb-Sn liquid"
'''
    system = load_system(with_checks(tmp_path, it.LEAD_TIN_BISMUTH_FILE, checks))
    (outcome,) = evaluate_all(system, system.checks)
    assert outcome.passed and abs(outcome.comparisons[0].difference) < 1e-6, outcome


BAD = [
    ('kind = "boundary"\nphase = "liquid"\npartner = "alpha"\ntemperature_K = 900\nat_percent = { Sn = 10, Bi = 10 }\n'
     'tolerance_at = 1\nsource = "s"\n', "a boundary fact is read for two-element systems only so far"),
    ('kind = "liquidus"\ntemperature_K = 900\nat_percent = 10\ntolerance_K = 1\nsource = "s"\n',
     "check[0].at_percent: expected a table such as"),
    ('kind = "liquidus"\ntemperature_K = 900\nwt_percent = { Sn = 10 }\ntolerance_K = 1\nsource = "s"\n',
     "give every element but one, the balance"),
    ('kind = "invariant"\nreaction = "eutectic"\ntemperature_K = 900\nphases = { liquid = { Sn = 10, Zn = 1 } }\n'
     'tolerance_K = 1\nsource = "s"\n', "check[0].phases.liquid.Zn: expected an element of this system"),
]


@pytest.mark.parametrize("body,expected", BAD, ids=[e for _, e in BAD])
def test_bad_ternary_facts_are_one_line(tmp_path, body, expected):
    with pytest.raises(SystemFileError) as e:
        load_system(with_checks(tmp_path, it.EUTECTIC_FILE, "[[check]]\n" + body))
    assert expected in str(e.value) and "\n" not in str(e.value)


# --- a ternary liquid term: the eutectic from the chemical potentials, and a fit of the term ---------
# With G_ex = L xA xB xC (a ternary term that does not depend on composition), the excess chemical
# potential of A is L xB xC (1 - 2 xA) (differentiate n G_ex by n_A), so at the ternary eutectic
# ln x_i + L x_j x_k (1 - 2 x_i) / RT = -dG_fus,i(T) / RT for each i, with sum x_i = 1.
L_TRUE = -6000.0      # J/mol, invented


def regular_eutectic(L: float) -> tuple[float, np.ndarray]:
    from scipy.optimize import fsolve

    def equations(v):
        x, T = v[:3], v[3]
        others = np.array([x[1] * x[2], x[0] * x[2], x[0] * x[1]])
        return list(np.log(x) + L * others * (1 - 2 * x) / (it.R * T) + it.fusion_gibbs(T) / (it.R * T)) + [x.sum() - 1]

    T0 = eutectic_K()
    v = fsolve(equations, list(it.saturation(T0)) + [T0], xtol=1e-13)
    assert np.max(np.abs(equations(v))) < 1e-10
    return float(v[3]), v[:3]


def with_ternary_term(L: float) -> str:
    return it.EUTECTIC_FILE.replace('G.Bi = [ { upto = 6000, a = 9000.0, b = -9.0 } ]',
                                    'G.Bi = [ { upto = 6000, a = 9000.0, b = -9.0 } ]\n'
                                    f'L.Pb-Sn-Bi = [ {{ a = {L} }} ]')


def test_a_ternary_term_moves_the_eutectic_as_the_chemical_potentials_say(tmp_path):
    T_E, x_E = regular_eutectic(L_TRUE)
    assert abs(T_E - eutectic_K()) > 5.0          # the term matters
    checks = f'''
[[check]]
kind = "invariant"
reaction = "eutectic"
temperature_K = {T_E:.10f}
phases = {{ liquid = {at_table(x_E)}, alpha = {{}}, beta = {{}}, gamma = {{}} }}
tolerance_K = 0.01
tolerance_at = 0.001
source = "closed form of the invented ternary with a ternary term"
'''
    system = load_system(with_checks(tmp_path, with_ternary_term(L_TRUE), checks))
    (outcome,) = evaluate_all(system, system.checks)
    assert outcome.passed, outcome


def test_ladle_fit_finds_a_ternary_term_from_the_eutectic(tmp_path):
    from ladle.engine.fitting.fit import fit

    T_E, x_E = regular_eutectic(L_TRUE)
    measured = f'''
[fit]
free = ["liquid.L.Pb-Sn-Bi.0.a"]

[[measured]]
kind = "invariant"
reaction = "eutectic"
temperature_K = {T_E:.10f}
phases = {{ liquid = {at_table(x_E)}, alpha = {{}}, beta = {{}}, gamma = {{}} }}
uncertainty_K = 0.2
uncertainty_at = 0.05
source = "closed form of the invented ternary with a ternary term of -6000 J/mol"
'''
    system = load_system(with_checks(tmp_path, with_ternary_term(0.0), measured))
    result = fit(system)
    (param,) = result.parameters
    assert result.acceptable, result.problems
    assert abs(param.value - L_TRUE) < 30.0 and param.uncertainty is not None and param.uncertainty < 500.0
    assert result.chi_square < 1e-2
