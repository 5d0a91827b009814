"""Enthalpies of mixing and of formation (engine/measure_enthalpy.py) against closed forms, as
facts of a file, and fitted."""

from __future__ import annotations

import pytest

from ladle.engine import load_system
from ladle.engine.errors import SystemFileError
from ladle.engine.fitting.fit import fit
from ladle.engine.checking.measure import evaluate_all
from ladle.engine.checking.enthalpy import formation_enthalpy, mixing_enthalpy
from measure_systems import EUTECTIC_TRUE, FUSION_A, eutectic_text, write

COMPOUND = '''
[phase.AB]
model = "compound"
formula = "AB"
reference = {{ A = "{ref_a}", B = "bcc" }}
formation = {{ a = -9000.0, b = 2.0 }}
'''


@pytest.fixture
def system(tmp_path):
    return load_system(write(tmp_path, eutectic_text(extra=COMPOUND.format(ref_a="fcc"))))


@pytest.mark.parametrize("x", [0.1, 0.5, 0.8])
@pytest.mark.parametrize("T", [600.0, 1300.0])
def test_regular_solution_mixing_enthalpy_is_x_a_x_b_times_a(system, x, T):
    # regular solution: H_mix = x_A x_B L0 with L0 = a + bT contributing its a only; ideal mixing
    # adds no enthalpy (D.A. Porter, K.E. Easterling and M.Y. Sherif, Phase Transformations in
    # Metals and Alloys, 3rd ed. (2009), chapter 1)
    assert mixing_enthalpy(system.phases["liquid"], T, x) == pytest.approx(x * (1 - x) * EUTECTIC_TRUE["liquid.L.0.a"], abs=1e-6)
    assert mixing_enthalpy(system.phases["fcc"], T, x) == pytest.approx(x * (1 - x) * EUTECTIC_TRUE["fcc.L.0.a"], abs=1e-6)


def test_formation_enthalpy_from_the_stable_elements(system, tmp_path):
    # at 700 K pure A is fcc and pure B bcc, the compound's own references: H_f = a of formation
    assert formation_enthalpy(system, system.phases["AB"], 700.0) == pytest.approx(-9000.0, abs=1e-6)
    # referred to liquid A instead, the compound's enthalpy carries half A's enthalpy of fusion
    # (the simple form G_liq - G_fcc = dH (1 - T / Tm) has enthalpy difference dH)
    other = load_system(write(tmp_path, eutectic_text(extra=COMPOUND.format(ref_a="liquid")), "liq.toml"))
    assert formation_enthalpy(other, other.phases["AB"], 700.0) == pytest.approx(-9000.0 + 0.5 * FUSION_A, abs=1e-6)


def test_enthalpy_facts_checked_and_fitted(tmp_path):
    facts = '''
[fit]
free = ["liquid.L.0.a"]

[[measured]]
kind = "mixing_enthalpy"
phase = "liquid"
at_percent = 50
temperature_K = 1300
enthalpy_J_per_mol = -1250.0
uncertainty_J = 10.0
source = "invented: x_A x_B a with a = -5000 J/mol"

[[check]]
kind = "mixing_enthalpy"
phase = "liquid"
at_percent = 25
temperature_K = 1300
enthalpy_J_per_mol = -750.0
tolerance_J = 5
source = "invented: x_A x_B a with a = -4000 J/mol (at another composition: a fit target is never also a check)"
'''
    system = load_system(write(tmp_path, eutectic_text(extra=facts)))
    (check,) = evaluate_all(system, system.checks)
    assert check.passed and check.comparisons[0].unit == "J/mol"
    result = fit(system)
    (a,) = result.parameters
    # linear in a: a = H / (x_A x_B) = -5000 exactly, with uncertainty u_H / (x_A x_B) = 40 J/mol
    assert a.value == pytest.approx(-5000.0, abs=1e-3) and a.uncertainty == pytest.approx(40.0, rel=1e-4)


@pytest.mark.parametrize("body, message", [
    ('kind = "mixing_enthalpy"\nphase = "AB"\nat_percent = 50\ntemperature_K = 900\nenthalpy_J_per_mol = -1',
     "measured[0].phase: expected a solution phase of this system (liquid, fcc, bcc), found 'AB'"),
    ('kind = "formation_enthalpy"\nphase = "AB"\ntemperature_K = 900',
     "measured[0].enthalpy_J_per_mol: expected the measured enthalpy in J per mole of atoms, found None"),
    ('kind = "formation_enthalpy"\nphase = "AB"\ntemperature_K = 900\nenthalpy_J_per_mol = -1\nuncertainty_J = 0',
     "measured[0].uncertainty_J: expected a positive number of J/mol"),
])
def test_bad_enthalpy_facts(tmp_path, body, message):
    text = eutectic_text(extra=COMPOUND.format(ref_a="fcc") + f'\n[[measured]]\nsource = "invented"\n{body}\n')
    with pytest.raises(SystemFileError) as e:
        load_system(write(tmp_path, text))
    assert str(e.value) == f"a-b.toml: {message}"
