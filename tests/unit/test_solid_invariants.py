"""Invariant reactions of four solids in a ternary (engine/diagrams/solid_invariants.py), found by
the scan of isothermal sections in temperature, against the closed form of the invented system
ideal_ternaries.FOUR_SOLIDS_FILE (two compounds whose exchange reaction changes sign at 500 K)."""

from __future__ import annotations

import pytest

import ideal_ternaries as it
from ladle.engine import load_system
from ladle.engine.diagrams import solid_invariants


@pytest.fixture(scope="module")
def found(tmp_path_factory):
    return solid_invariants.solid_invariants(load_system(it.write_four_solids_file(tmp_path_factory.mktemp("solids"))))


def test_the_exchange_reaction_at_its_closed_form_temperature(found):
    """2 (G_f(PbBi) - G_f(PbSn)) = 2 (2000 - 4 T) = 0 at T = 500 K; on cooling PbBi + Sn (beta)
    give PbSn + Bi (gamma), 2 : 1 -> 2 : 1 in moles of atoms (the mass balance worked by hand)."""
    [reaction] = found
    assert reaction.temperature_K == pytest.approx(500.0, abs=1e-5)
    assert reaction.kind == "quasi-peritectoid"
    assert reaction.equation() == "PbBi + beta -> PbSn + gamma"
    coefficients = {name: c for name, _x, c in reaction.phases}
    assert coefficients == pytest.approx({"PbBi": -2 / 3, "beta": -1 / 3, "PbSn": 2 / 3, "gamma": 1 / 3}, abs=1e-9)
    expected = {"PbBi": (0.5, 0.0, 0.5), "beta": (0.0, 1.0, 0.0), "PbSn": (0.5, 0.5, 0.0), "gamma": (0.0, 0.0, 1.0)}
    for name, x, _c in reaction.phases:
        assert x == pytest.approx(expected[name], abs=1e-9)


def test_fewer_than_four_solids_are_not_scanned(tmp_path, monkeypatch):
    """Three pure solids and a liquid (the ideal eutectic) hold no four-solid reaction: nothing
    is computed."""
    system = load_system(it.write_system_files(tmp_path)["ideal-eutectic"])
    monkeypatch.setattr(solid_invariants, "map_isothermal", lambda *args: pytest.fail("scanned"))
    assert solid_invariants.solid_invariants(system) == []
