"""Analytic temperature derivatives of a binary solution's chemical potentials (`potentials_dT`,
used where Newton's method solves for temperature, as on the liquidus) against the outside world:

- a central difference of `potentials` in temperature (step 1e-3 K; its truncation error is of
  order h^2 times the third derivative, far below the tolerance), for every solution phase of
  every shipped binary, the magnetic fcc of Cu-Ni included;
- the partial molar sum x_A dmu_A/dT + x_B dmu_B/dT = dG/dT at fixed composition, an identity of
  partial molar quantities (D.R. Gaskell, Introduction to the Thermodynamics of Materials, 5th
  ed., Taylor & Francis 2008, chapter 9: a molar quantity is the mole-fraction-weighted sum of
  its partial molar quantities).
"""

from __future__ import annotations

import numpy as np
import pytest

from ladle.engine import find_system
from ladle.engine.files.loader import shipped_folder
from ladle.engine.models.phases import SolutionPhase

BINARIES = sorted(p.stem for p in shipped_folder().glob("*.toml")
                  if p.name != "elements.toml" and len(find_system(p.stem).elements) == 2)
STEP_K = 1e-3
COMPOSITIONS = (1e-6, 0.013, 0.2, 0.5, 0.77, 0.99, 1.0 - 1e-7)


def _solutions(name: str) -> list[tuple[str, SolutionPhase]]:
    return [(n, p) for n, p in find_system(name).phases.items() if isinstance(p, SolutionPhase)]


@pytest.mark.parametrize("name", BINARIES)
def test_potentials_dT_match_central_differences(name):
    system = find_system(name)
    lo, hi = system.model_range_K
    temperatures = np.linspace(max(lo, 300.0) + 1.0, min(hi, 3000.0) - 1.0, 5)
    for phase_name, phase in _solutions(name):
        for T in temperatures:
            at = phase.at(float(T))
            up, down = phase.at(float(T) + STEP_K), phase.at(float(T) - STEP_K)
            for x_b in COMPOSITIONS:
                x_a = 1.0 - x_b
                got = at.potentials_dT(x_a, x_b)
                for i in range(2):
                    central = (float(up.potentials(x_a, x_b)[i]) - float(down.potentials(x_a, x_b)[i])) / (2 * STEP_K)
                    # the difference of two potentials of ~1e5 J/mol over 2e-3 K carries ~1e-8 J/(mol K) of rounding
                    assert float(got[i]) == pytest.approx(central, rel=1e-6, abs=1e-5), (name, phase_name, T, x_b, i)


@pytest.mark.parametrize("name", BINARIES)
def test_partial_molar_entropies_sum_to_dG_dT(name):
    system = find_system(name)
    lo, hi = system.model_range_K
    for _phase_name, phase in _solutions(name):
        for T in np.linspace(max(lo, 300.0) + 1.0, min(hi, 3000.0) - 1.0, 4):
            at = phase.at(float(T))
            x_b = np.array(COMPOSITIONS)
            x_a = 1.0 - x_b
            s_a, s_b = at.potentials_dT(x_a, x_b)
            assert np.allclose(x_a * s_a + x_b * s_b, at.gibbs_dT(x_a, x_b), rtol=1e-11, atol=1e-9)
