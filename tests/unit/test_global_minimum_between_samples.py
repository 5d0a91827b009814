"""The general minimiser where a phase's lowest point lies between its samples.

Iron with about 2.3 at% Si at 1212 K sits in the narrow two-phase band at the edge of the Fe-Si
gamma loop (systems/fe-si.toml). The bcc samples lie 1/300 apart there, where the margin for
Newton steps between samples was judged from the cloud's size (729 samples: 1/729): the lowest
bcc sample lay 0.34 J/mol above the fcc plane, bcc's minimum between samples 0.027 J/mol below it,
and the answer was fcc alone, where about 2 % bcc is stable (found by
tests/benchmarks/global_minimum_audit.py).

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


def test_the_alloy_in_the_band_holds_both_solids():
    system = find_system("fe-si")
    answer = equilibrate(system, T_K, np.array([0.9771802718110734, 0.02281972818892667]))
    assert set(answer.phase_names) == {"fcc", "bcc"}
