"""The general minimiser just below the critical point of a miscibility gap.

The 14-carat gold Au 62.5, Ag 22.5, Cu 15 wt% (systems/ag-au-cu.toml) meets the top of the fcc
gap between the silver-rich and copper-rich solids near 933.5 K. Just below it the alloy's own
composition lies next to the gap's silver-rich side: the point the driving-force check finds next
to the composition set (0.006 away) lay inside the spinodal, the split about it and its mirror
image fell back to one set under Newton's method, and after every round the answer was one fcc,
flagged as not converged, at 930.8-932.8 K (`ladle diagram ag-au-cu --comp Cu=15wt%
--vary Ag=0..40wt%` printed four notes); the copper-rich side lies 0.04-0.05 away, on one side
only. Closer to the top (933.5-934.26 K) the answer was one fcc, converged: the other side lay
0.03-0.04 away, within the distance the samples are not searched, and 0.03-0.00001 J/mol below
the plane; the search along the phase's softest direction finds it. The reference is independent of the minimiser: the fcc model's own Gibbs energy on a dense
grid (spacing 5e-4 in mole fraction) around the alloy, none of which may lie below the answer's
tangent plane (its chemical potentials) by more than 1e-4 J/mol.
"""

from __future__ import annotations

import numpy as np
import pytest

from ladle.engine import equilibrate, find_system
from ladle.engine.units import mole_from_mass

#: Au, Ag, Cu mass fractions of the gold (the system's element order).
GOLD_W = np.array([0.625, 0.225, 0.15])


def _lowest_below_plane(model, mu: np.ndarray, z: np.ndarray) -> float:
    """The lowest driving force (J/mol) of the fcc model against mu on a grid of Ag and Cu within
    0.1 of the alloy's (spacing 5e-4)."""
    ag = z[1] + np.arange(-0.1, 0.1, 5e-4)
    cu = z[2] + np.arange(-0.1, 0.1, 5e-4)
    A, C = np.meshgrid(ag, cu, indexing="ij")
    X = np.column_stack([1.0 - A.ravel() - C.ravel(), A.ravel(), C.ravel()])
    X = X[(X > 0.0).all(axis=1)]
    return float(np.min(model.gibbs(X) - X @ mu))


@pytest.mark.parametrize("T", [930.81, 931.05, 932.79, 933.0, 933.31, 933.5, 933.9, 934.1, 934.24])
def test_a_gold_just_below_its_gaps_top_splits_into_two_solids(T):
    system = find_system("ag-au-cu")
    z = mole_from_mass(GOLD_W, system.molar_mass)
    answer = equilibrate(system, T, z)
    assert answer.converged
    assert answer.phase_names == ("fcc", "fcc")
    assert _lowest_below_plane(system.models["fcc"].at(T), answer.chemical_potentials, z) > -1e-4


@pytest.mark.parametrize("T", [934.3, 935.0, 940.0])
def test_above_the_gaps_top_the_gold_is_one_solid(T):
    system = find_system("ag-au-cu")
    z = mole_from_mass(GOLD_W, system.molar_mass)
    answer = equilibrate(system, T, z)
    assert answer.converged and answer.phase_names == ("fcc",)
    assert _lowest_below_plane(system.models["fcc"].at(T), answer.chemical_potentials, z) > -1e-4
