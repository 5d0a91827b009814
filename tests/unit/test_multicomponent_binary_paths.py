"""One engine: on every shipped binary the general minimiser and the binary shortcut give the same
equilibrium (phases, compositions to 1e-9, amounts, G) at sampled points; and leaving a phase out
of a shipped binary (System.without) changes the answer only where that phase was stable."""

from __future__ import annotations

import numpy as np
import pytest

from ladle.engine import load_system
from ladle.engine.files.catalog import list_systems
from ladle.engine.minimize.equilibrium import equilibrate, general_equilibrium

SHIPPED = [e for e in list_systems() if e.origin == "shipped"]


def _binaries():
    out = []
    for e in SHIPPED:
        system = load_system(e.path, name=e.name)
        if len(system.elements) == 2:
            out.append(system)
    return out


def test_general_minimiser_matches_the_binary_shortcut_on_every_shipped_binary():
    rng = np.random.default_rng(13)
    systems = _binaries()
    assert systems
    for system in systems:
        lo, hi = system.temperature_range_K
        for _ in range(8):
            T = float(rng.uniform(lo, hi))
            x = float(rng.uniform(0.001, 0.999))
            shortcut = equilibrate(system, T, x)
            general = general_equilibrium(system, T, [1.0 - x, x])
            assert general.converged, (system.name, T, x)
            assert sorted(general.phase_names) == sorted(shortcut.phase_names), (system.name, T, x)
            for p in shortcut.phases:
                q = min((q for q in general.phases if q.name == p.name), key=lambda q: abs(q.x[1] - p.x[1]))
                assert abs(q.x[1] - p.x[1]) <= 1e-9, (system.name, T, x, p.name)
                assert q.amount_mol == pytest.approx(p.amount_mol, abs=1e-8)
            assert general.gibbs_J_per_mol == pytest.approx(shortcut.gibbs_J_per_mol, abs=1e-6)
            assert general.gibbs_dT_J_per_mol_K == pytest.approx(shortcut.gibbs_dT_J_per_mol_K, abs=1e-6)


def test_leaving_a_phase_out_of_a_shipped_binary():
    system = next(s for s in _binaries() if s.name == "pb-sn")
    rng = np.random.default_rng(17)
    lo, hi = system.temperature_range_K
    for left_out in system.phases:
        fewer = system.without([left_out])
        for _ in range(6):
            T = float(rng.uniform(lo, hi))
            x = float(rng.uniform(0.01, 0.99))
            a = equilibrate(system, T, x)
            b = equilibrate(fewer, T, x)
            assert left_out not in b.phase_names
            if left_out in a.phase_names:
                assert b.gibbs_J_per_mol > a.gibbs_J_per_mol
            else:
                assert b.phase_names == a.phase_names
                assert b.gibbs_J_per_mol == pytest.approx(a.gibbs_J_per_mol, abs=1e-9)
