"""A ternary alloy without its third element is a binary alloy: through the general minimiser and
the multicomponent paths it must give what the binary engine gives for the same binary (issue 14).
The ternary is the shipped lead-tin file with bismuth added ideally (tests/unit/ideal_ternaries.py,
invented for tests); the reference is the shipped pb-sn binary through the binary engine."""

from __future__ import annotations

import numpy as np
import pytest

import ideal_ternaries as it
from ladle.engine import equilibrate, find_system, load_system
from ladle.engine.diagrams.alloy_transitions import alloy_transitions
from ladle.engine.diagrams.melt import melt_range
from ladle.engine.solidify.alloy_paths import solidify_alloy
from ladle.engine.solidify.paths import solidify


@pytest.fixture(scope="module")
def systems(tmp_path_factory):
    paths = it.write_system_files(tmp_path_factory.mktemp("ternaries"))
    return find_system("pb-sn"), load_system(paths["pb-sn-bi"])


@pytest.mark.parametrize("T", [450.0, 480.0, 520.0])
@pytest.mark.parametrize("x_b", [0.05, 0.3, 0.75])
def test_point_equilibria_agree(systems, T, x_b):
    binary, ternary = systems
    two = equilibrate(binary, T, x_b)
    three = equilibrate(ternary, T, np.array([1.0 - x_b, x_b, 0.0]))
    assert three.phase_names == two.phase_names
    for p2, p3 in zip(two.phases, three.phases):
        assert p3.x[:2] == pytest.approx(p2.x, abs=1e-9) and p3.x[2] == 0.0
        assert p3.amount_mol == pytest.approx(p2.amount_mol, abs=1e-9)


def test_both_cooling_paths_agree(systems):
    """Temperatures to 1e-6 K; the equilibrium constituents to 1e-6; the Scheil constituents to
    1e-4 (the binary path integrates along the traced liquidus, the multicomponent one in
    temperature steps with the trapezoid rule: measured 1.6e-5 apart)."""
    binary, ternary = systems
    x_b = 0.3
    two, three = solidify(binary, x_b), solidify_alloy(ternary, np.array([1.0 - x_b, x_b, 0.0]))
    for model, tolerance in (("equilibrium", 1e-6), ("scheil", 1e-4)):
        p2, p3 = two.path(model), three.path(model)
        assert p3.liquidus_K == pytest.approx(p2.liquidus_K, abs=1e-6)
        assert p3.end_K == pytest.approx(p2.end_K, abs=1e-6)
        assert p3.end == p2.end == "eutectic"
        assert [c.name for c in p3.constituents] == [c.name for c in p2.constituents]
        for c2, c3 in zip(p2.constituents, p3.constituents):
            assert c3.mass_fraction == pytest.approx(c2.mass_fraction, abs=tolerance)
        assert p3.latent_heat_J_per_g == pytest.approx(p2.latent_heat_J_per_g, rel=1e-3)


def test_melt_range_agrees(systems):
    binary, ternary = systems
    x_b = 0.3
    m = melt_range(binary, x_b)
    scan = alloy_transitions(ternary, np.array([1.0 - x_b, x_b, 0.0]), highest_K=m.liquidus_K + 2.0,
                             lowest_K=m.solidus_K - 2.0)
    assert scan.liquidus_K == pytest.approx(m.liquidus_K, abs=1e-6)
    assert scan.solidus_K == pytest.approx(m.solidus_K, abs=1e-6)
