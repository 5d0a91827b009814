"""Equilibrium cooling of ternary alloys and both paths together (engine/solidify/
alloy_equilibrium.py, alloy_paths.py) on the invented ideal ternaries of
tests/unit/ideal_ternaries.py, whose equilibria are closed forms (sources there)."""

from __future__ import annotations

import numpy as np
import pytest
from scipy.optimize import brentq

import ideal_ternaries as it
from ladle.engine.diagrams import alloy_transitions
from ladle.engine.solidify import alloy_equilibrium, alloy_scheil
from ladle.engine.solidify.alloy_paths import solidify_alloy

Z = np.array([0.6, 0.25, 0.15])


@pytest.fixture
def cool(monkeypatch):
    def run(make, z=Z):
        system = make()
        system.phases = system.models
        for module in (alloy_scheil, alloy_equilibrium, alloy_transitions):
            monkeypatch.setattr(module, "equilibrate", it.equilibrate_for(system))
        return solidify_alloy(system, z)
    return run


def test_lens_liquidus_and_solidus_are_the_ideal_closed_forms(cool):
    """Ideal liquid and solid: the liquidus of z is where sum z_i K_i = 1 and the solidus where
    sum z_i / K_i = 1 (Gaskell and Laughlin, ch. 10; K_i as in ideal_ternaries)."""
    result = cool(it.lens_system)
    liquidus = brentq(lambda T: Z @ it.partition(T) - 1.0, 900.0, 1400.0, xtol=1e-12)
    solidus = brentq(lambda T: Z @ (1.0 / it.partition(T)) - 1.0, 900.0, 1400.0, xtol=1e-12)
    eq = result.equilibrium
    assert eq.liquidus_K == pytest.approx(liquidus, abs=1e-6)
    assert result.scheil.liquidus_K == pytest.approx(liquidus, abs=1e-6)
    assert eq.end == "solidus" and eq.end_K == pytest.approx(solidus, abs=1e-6)
    assert [c.name for c in eq.constituents] == ["primary fcc"]
    assert result.scheil.end_K < solidus              # Scheil freezing ends lower


def test_equilibrium_path_through_a_ternary_eutectic(cool):
    result = cool(it.eutectic_system)
    eq = result.equilibrium
    T_eutectic = brentq(lambda T: it.saturation(T).sum() - 1.0, 400.0, 1000.0, xtol=1e-12)
    assert eq.end == "ternary eutectic" and eq.end_K == pytest.approx(T_eutectic, abs=1e-6)
    assert [a.kind for a in eq.arrests] == ["liquidus", "new phase", "plateau"]
    names = [c.name for c in eq.constituents]
    assert names == ["primary alpha", "eutectic alpha + beta", "ternary eutectic alpha + beta + gamma"]
    # pure solids keep no memory: every constituent is the Scheil path's
    for c_eq, c_scheil in zip(eq.constituents, result.scheil.constituents):
        assert c_eq.fraction_mol == pytest.approx(c_scheil.fraction_mol, abs=1e-6)
        assert c_eq.x == pytest.approx(c_scheil.x, abs=1e-6)


@pytest.mark.parametrize("make", [it.eutectic_system, it.lens_system])
def test_equilibrium_mass_balance_heat_and_states(cool, make):
    result = cool(make)
    eq = result.equilibrium
    held = sum(c.fraction_mol * np.array(c.x) for c in eq.constituents)
    assert held == pytest.approx(Z, abs=1e-6)
    assert eq.latent_heat_J_per_g == pytest.approx((Z @ it.FUSION_J) / (Z @ it.MOLAR_MASS), rel=1e-6)
    above, _ = result.states_at(eq.liquidus_K + 1.0)
    assert above.fraction_solid == 0.0 and above.liquid_x == pytest.approx(tuple(Z))
    done, scheil_done = result.states_at(min(eq.end_K, result.scheil.end_K) - 1.0)
    assert done.fraction_solid == 1.0 and scheil_done.fraction_solid == 1.0 and done.liquid_x is None


def test_json_has_one_entry_per_element_in_every_composition(cool):
    out = cool(it.eutectic_system).to_json("scheil")
    assert out["model"] == "scheil" and set(out["mole_fraction"]) == {"A", "B", "C"}
    assert set(out["equilibrium"]["path"][0]["liquid_mole_fraction"]) == {"A", "B", "C"}
    assert all(set(c["mole_fraction"]) == {"A", "B", "C"} for c in out["scheil"]["constituents"])
    assert out["scheil"]["path"][-1]["liquid_mole_fraction"] is None
