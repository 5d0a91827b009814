"""The general minimiser at dilute compositions of a shipped ternary, against scipy.

A tin solder with Ag and Cu in parts per million (Sn with 68 ppm Ag and 6 ppm Cu, mole fractions,
at 440 K) once raised "no combination of the phases reaches this composition": the simplex over
the sample clouds starts from artificial pure-element columns, whose large cost makes the chemical
potentials about 1e11 J/mol, and the rounding of mu.x let a point already in the basis enter again
on every iteration until the iteration limit (found by tests/benchmarks/global_minimum_audit.py).
The reference is the lowest combination of samples at the alloy's composition, a linear program
solved by scipy's HiGHS (scipy.optimize.linprog) over every phase of the file sampled on a grid
log-spaced toward the tin corner: a state the alloy can take, so the engine's G may not lie above it.
"""

from __future__ import annotations

import numpy as np
import pytest
from scipy.optimize import linprog

from ladle.engine import find_system
from ladle.engine.minimize.equilibrium import general_equilibrium


def _tin_corner_reference(system, T: float, z: np.ndarray) -> float:
    """The lowest combination (J/mol) of samples of every phase near the tin corner (Ag and Cu
    fractions log-spaced from 1e-9 to 0.05) and the phases' exact compositions (compounds)."""
    tail = np.concatenate([[0.0], np.logspace(-9.0, np.log10(0.05), 60)])
    a, c = np.meshgrid(tail, tail, indexing="ij")
    corner = np.column_stack([1.0 - a.ravel() - c.ravel(), a.ravel(), c.ravel()])
    X, G = [], []
    for name, phase in system.models.items():
        at = phase.at(T)
        E = np.asarray(at.element_matrix)
        Y = corner if at.n_vars == 3 and len(at.groups) == 1 else np.ones((1, at.n_vars))
        n = Y @ E
        atoms = n.sum(axis=1)
        X.append(n / atoms[:, None])
        G.append(at.gibbs(Y) / atoms)
    res = linprog(np.concatenate(G), A_eq=np.vstack(X).T, b_eq=z, bounds=(0, None), method="highs")
    assert res.status == 0
    return float(res.fun)


@pytest.mark.parametrize("T, z", [
    (440.2156906570473, [0.9999256588477565, 6.848478879507078e-05, 5.856363448364772e-06]),
    (458.27541250721447, [0.9999803818087435, 7.4102506340358535e-06, 1.2207940622488731e-05]),
])
def test_a_tin_solder_with_ppm_silver_and_copper_has_an_answer_not_above_scipys(T, z):
    system = find_system("ag-cu-sn")
    assert system.elements == ("Sn", "Ag", "Cu")
    z = np.array(z) / sum(z)
    eq = general_equilibrium(system, T, z)
    assert eq.converged
    assert eq.gibbs_J_per_mol <= _tin_corner_reference(system, T, z) + 1e-6
