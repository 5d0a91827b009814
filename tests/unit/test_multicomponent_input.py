"""equilibrate's composition argument: mole fractions of every element, checked with one clear
line (ValueError) before any work; a float stays the binary's x_B."""

from __future__ import annotations

import math

import numpy as np
import pytest

from ladle.engine.minimize.equilibrium import equilibrate
from ladle.engine.models.polynomials import TemperatureFunction
from ladle.engine.models.sublattice import SublatticePhase

from multicomponent_models import system_of

ELEMENTS = ("A", "B", "C")


@pytest.fixture(scope="module")
def ternary():
    ends = {(e,): TemperatureFunction.constant_terms({"a": 0.0}) for e in ELEMENTS}
    return system_of(ELEMENTS, [SublatticePhase(name="fcc", elements=ELEMENTS, site_ratios=(1.0,),
                                                constituents=(ELEMENTS,), end_members=ends)])


@pytest.mark.parametrize("composition, words", [
    ([0.5, 0.5], "expected 3 mole fractions"),
    ([0.5, 0.6, -0.1], "not negative"),
    ([0.5, 0.5, math.nan], "finite"),
    ([0.3, 0.3, 0.3], "sum to 0.9"),
    (0.4, "give a mole fraction for each of A, B, C"),
])
def test_bad_compositions_are_one_line(ternary, composition, words):
    with pytest.raises(ValueError) as err:
        equilibrate(ternary, 900.0, composition)
    assert words in str(err.value) and "\n" not in str(err.value)


def test_an_ideal_ternary_is_one_phase_with_ideal_potentials(ternary):
    """One ideal phase with zero end members: mu_i = RT ln x_i (the ideal solution, any
    textbook, e.g. Hillert 2008, chapter on ideal solutions), G = RT sum x ln x, H = 0."""
    z = np.array([0.2, 0.3, 0.5])
    eq = equilibrate(ternary, 900.0, z)
    RT = 8.314462618 * 900.0
    assert eq.phase_names == ("fcc",) and eq.converged
    np.testing.assert_allclose(eq.chemical_potentials, RT * np.log(z), rtol=0, atol=1e-7)
    assert eq.gibbs_J_per_mol == pytest.approx(RT * float(z @ np.log(z)), abs=1e-8)
    assert eq.enthalpy_J_per_mol == pytest.approx(0.0, abs=1e-8)
    np.testing.assert_allclose(eq.phases[0].site_fractions[0], z, rtol=0, atol=1e-14)
