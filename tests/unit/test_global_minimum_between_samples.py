"""The general minimiser where a phase's lowest point lies between its samples.

Iron with about 2.3 at% Si at 1212 K sits in the narrow two-phase band at the edge of the Fe-Si
gamma loop (systems/fe-si.toml). The bcc samples lie 1/300 apart there, where the margin for
Newton steps between samples was judged from the cloud's size (729 samples: 1/729): the lowest
bcc sample lay 0.34 J/mol above the fcc plane, bcc's minimum between samples 0.027 J/mol below it,
and the answer was fcc alone, where about 2 % bcc is stable. In Fe-C-Si (systems/fe-c-si.toml)
iron with 3.3 at% Si and 0.03 at% C at 1201 K was answered bcc alone: austenite's lowest sample
lay 95 J/mol above the plane (its silicon and carbon grids are coarse in that corner), its
minimum 8 J/mol below it, and about 6 % austenite is stable. Both found by
tests/benchmarks/global_minimum_audit.py.

The reference is independent of the minimiser: every phase's Gibbs energy (the model's own
`gibbs`) on a dense uniform grid of 400,000 compositions, none of which may lie below the
answer's tangent plane (its chemical potentials) by more than 1e-6 J/mol.
"""

from __future__ import annotations

import numpy as np
import pytest

from ladle.engine import equilibrate, find_system

T_K = 1211.6674592413679
#: Dense grid of x_Si, spacing 2.5e-7 over the gamma loop's iron-rich side.
DENSE_X_SI = np.linspace(0.0, 0.1, 400_001)[1:]


def _lowest_driving_force(system, T: float, mu: np.ndarray) -> tuple[str, float, float]:
    """(phase, driving force J/mol, x_Si) of the point lying lowest below the plane mu among
    every solid phase's G on the dense grid (each phase here: [Fe,Si][Va])."""
    worst = ("", np.inf, np.nan)
    x = DENSE_X_SI
    for name in ("fcc", "bcc"):
        model = system.models[name].at(T)
        g = model.gibbs(np.column_stack([1.0 - x, x, np.ones_like(x)]))
        d = g - (np.column_stack([1.0 - x, x]) @ mu)
        k = int(np.argmin(d))
        if d[k] < worst[1]:
            worst = (name, float(d[k]), float(x[k]))
    return worst


@pytest.mark.parametrize("x_si", [0.0226, 0.02282, 0.0232, 0.0238, 0.0242])
def test_no_phase_lies_below_the_answer_at_the_gamma_loops_edge(x_si):
    system = find_system("fe-si")
    answer = equilibrate(system, T_K, np.array([1.0 - x_si, x_si]))
    name, below, at = _lowest_driving_force(system, T_K, answer.chemical_potentials)
    assert below > -1e-6, (answer.phase_names, name, below, at)


def test_a_silicon_iron_with_a_trace_of_carbon_holds_austenite_beside_ferrite():
    """Against a dense grid of both solids' site fractions: silicon on the first sublattice
    (spacing 1e-4), carbon on the interstitial one log-spaced from 1e-8 to 0.1 (fcc one site for
    carbon per iron site, bcc three)."""
    system = find_system("fe-c-si")
    T = 1200.8463700328957
    z = np.array([0.9664728455831868, 0.0002559954367312223, 0.033271158980081934])    # Fe, C, Si
    answer = equilibrate(system, T, z)
    assert set(answer.phase_names) == {"bcc", "fcc"}
    y_si, y_c = np.meshgrid(np.linspace(1e-4, 0.1, 1000), np.logspace(-8.0, -1.0, 400), indexing="ij")
    y_si, y_c = y_si.ravel(), y_c.ravel()
    lowest = np.inf
    for name, carbon_sites in (("fcc", 1.0), ("bcc", 3.0)):
        Y = np.column_stack([1.0 - y_si, y_si, y_c, 1.0 - y_c])        # (Fe, Si) (C, Va)
        atoms = 1.0 + carbon_sites * y_c
        X = np.column_stack([1.0 - y_si, carbon_sites * y_c, y_si]) / atoms[:, None]
        d = system.models[name].at(T).gibbs(Y) / atoms - X @ answer.chemical_potentials
        lowest = min(lowest, float(d.min()))
    assert lowest > -1e-6


def test_the_alloy_in_the_band_holds_both_solids():
    system = find_system("fe-si")
    answer = equilibrate(system, T_K, np.array([0.9771802718110734, 0.02281972818892667]))
    assert set(answer.phase_names) == {"fcc", "bcc"}
