"""The general minimiser where Newton's method drops a phase the minimum needs.

Newton's method on the equilibrium conditions removes a phase whose amount turns negative. From a
poor start (the samples' lowest combination, or a phase added at zero amount) it can remove the
wrong one and end, converged, on fewer phases above the state it started from. In Fe-C-Si
(systems/fe-c-si.toml) at 1487 K, iron with 4.1 at% C and 6.8 at% Si: the samples' lowest
combination was bcc + fcc, Newton went from it to bcc alone (254 J/mol higher), and the repairs
then went round bcc + graphite, liquid alone and bcc alone; the answer, flagged not converged, lay
74 J/mol above the stable fcc + liquid. At 1013 K, iron with 0.24 at% C and 0.036 at% Si: the
repairs went round bcc + graphite, fcc alone and bcc alone and ended 0.35 J/mol above the stable
bcc + fcc. Both found by tests/benchmarks/global_minimum_audit.py (seed 31).

The reference is independent of the minimiser: every phase's Gibbs energy (the model's own
`gibbs`) on a dense grid of its site fractions, and the lowest combination of those states at the
alloy's composition by scipy's HiGHS linear program, a state the alloy can take (so an upper
bound of the minimum, above it by the grid's sampling error). The answer may not lie above it.
"""

from __future__ import annotations

import numpy as np
import pytest
from scipy.optimize import linprog

from ladle.engine import equilibrate, find_system
from ladle.engine.minimize import global_minimum
from ladle.engine.minimize.multiphase_newton import PhaseState


def _dense_reference(system, T: float, z: np.ndarray, c_top: float, si_top: float) -> float:
    """G (J/mol) of the lowest combination at z (Fe, C, Si) of every phase's states on grids:
    the liquid over x_C in [0, c_top] and x_Si in [0, si_top] (160 x 160 points); fcc and bcc,
    [Fe,Si][C,Va] with one and three interstitial sites, over y_Si in [0, si_top] (121 points)
    and y_C log-spaced from 1e-8 to 0.3 (160 points); graphite and Fe3C as they are."""
    X, G = [np.array([[0.0, 1.0, 0.0]]), np.array([[0.75, 0.25, 0.0]])], [
        system.models["graphite"].at(T).gibbs(np.ones((1, 1))),
        system.models["Fe3C"].at(T).gibbs(np.ones((1, 2))) / 4.0]
    x_c, x_si = np.meshgrid(np.linspace(0.0, c_top, 160), np.linspace(0.0, si_top, 160), indexing="ij")
    liquid = np.column_stack([1.0 - x_c.ravel() - x_si.ravel(), x_c.ravel(), x_si.ravel()])
    X.append(liquid)
    G.append(system.models["liquid"].at(T).gibbs(liquid))
    y_si, y_c = np.meshgrid(np.linspace(0.0, si_top, 121), np.logspace(-8.0, np.log10(0.3), 160), indexing="ij")
    y_si, y_c = y_si.ravel(), y_c.ravel()
    for name, carbon_sites in (("fcc", 1.0), ("bcc", 3.0)):
        atoms = 1.0 + carbon_sites * y_c
        X.append(np.column_stack([1.0 - y_si, carbon_sites * y_c, y_si]) / atoms[:, None])
        G.append(system.models[name].at(T).gibbs(np.column_stack([1.0 - y_si, y_si, y_c, 1.0 - y_c])) / atoms)
    reference = linprog(np.concatenate(G), A_eq=np.vstack(X).T, b_eq=z, bounds=(0, None), method="highs")
    assert reference.status == 0
    return float(reference.fun)


@pytest.mark.parametrize("T, z, phases, c_top, si_top", [
    (1486.797237420969, [0.8917213802499088, 0.04077438973508435, 0.0675042300150069],
     {"fcc", "liquid"}, 0.25, 0.15),
    (1012.9430396013536, [0.9972267281236412, 0.002413980294746672, 0.00035929158161215706],
     {"bcc", "fcc"}, 0.05, 0.01),
])
def test_the_answer_lies_on_or_below_the_dense_reference(T, z, phases, c_top, si_top):
    system = find_system("fe-c-si")
    z = np.array(z)
    answer = equilibrate(system, T, z)
    reference = _dense_reference(system, T, z, c_top, si_top)
    assert answer.converged
    assert set(answer.phase_names) == phases
    assert answer.gibbs_J_per_mol <= reference + 1e-6, (answer.phase_names, answer.gibbs_J_per_mol, reference)


def test_when_the_rounds_run_out_the_answer_is_the_lowest_state_they_held():
    """`_lower` keeps the state of lower G = sum of amounts times G, whichever came first."""
    fcc = find_system("fe-c-si").models["fcc"].at(1200.0)
    free = np.arange(4)
    y_a, y_b = np.array([0.99, 0.01, 0.01, 0.99]), np.array([0.9, 0.1, 0.01, 0.99])
    low, high = sorted((y_a, y_b), key=lambda y: float(fcc.gibbs(y)))
    assert float(fcc.gibbs(low)) < float(fcc.gibbs(high)) - 1.0
    states = {"low": [PhaseState("fcc", fcc, low, 1.0, free)], "high": [PhaseState("fcc", fcc, high, 1.0, free)]}
    planes = {"low": np.zeros(3), "high": np.ones(3)}
    for first, second in (("low", "high"), ("high", "low")):
        best = global_minimum._lower(None, states[first], planes[first])
        g, kept, mu = global_minimum._lower(best, states[second], planes[second])
        assert np.array_equal(kept[0].y, low) and np.array_equal(mu, planes["low"])
        assert g == pytest.approx(float(fcc.gibbs(low)), rel=1e-15)
