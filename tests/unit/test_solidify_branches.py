"""The traced liquidus branches: interpolation between traced points against exact solves, ends
that meet the diagram's reactions, and how reactions and constituents are named."""

from __future__ import annotations

import numpy as np
import pytest

from ladle.engine import find_system
from ladle.engine.diagrams.diagram import Invariant, map_diagram
from ladle.engine.solidify.branches import continuation, liquidus_branches
from ladle.engine.solidify.liquidus import solve_liquidus_point
from ladle.engine.solidify.records import describe_reaction, reaction_products, solid_label


@pytest.mark.parametrize("name", ["pb-sn", "al-si", "cu-zn"])
def test_interpolated_branch_matches_exact_solves_between_its_points(name):
    system = find_system(name)
    rng = np.random.default_rng(7)
    for b in liquidus_branches(system):
        i = rng.integers(0, len(b.y) - 1, size=25)
        y = b.y[i] + rng.random(25) * (b.y[i + 1] - b.y[i])
        T = b.temperature(y)
        ys = b.solid_y(y)
        for yk, Tk, ysk in zip(y, T, ys):
            p = solve_liquidus_point(system, b.solid, float(yk), float(Tk) + 0.5, None if b.is_compound else float(ysk) + 0.01)
            assert p is not None
            assert p.temperature_K == pytest.approx(float(Tk), abs=1e-3)
            if not b.is_compound:
                assert p.y_solid == pytest.approx(float(ysk), abs=1e-5)


def test_branches_end_on_the_diagrams_reactions():
    system = find_system("pb-sn")
    inv = next(i for i in map_diagram(system).invariants if i.kind == "eutectic")
    branches = liquidus_branches(system)
    assert {b.solid for b in branches} == {"fcc", "bct"}
    for b in branches:
        assert b.top.kind == "melting"
        assert b.bottom.invariant == inv
        assert b.T[-1] == pytest.approx(inv.temperature_K, abs=1e-6)
        assert continuation(branches, b) is None          # the liquid cannot pass a eutectic
        assert np.all(np.diff(b.phi) > 0)                   # the Scheil integral grows along the path


def test_peritectic_branches_continue():
    system = find_system("cu-zn")
    branches = liquidus_branches(system)
    fcc = next(b for b in branches if b.solid == "fcc")
    nxt = continuation(branches, fcc)
    assert nxt is not None and nxt.solid == "bcc" and nxt.top.kind == "peritectic"


def test_reaction_names(tmp_path):
    system = find_system("pb-sn")
    eutectic = Invariant("eutectic", 456.0, (("fcc", 0.28), ("liquid", 0.74), ("bct", 0.98)))
    assert describe_reaction(system, eutectic) == "liquid -> fcc + bct"
    peritectic = Invariant("peritectic", 500.0, (("fcc", 0.1), ("bct", 0.2), ("liquid", 0.5)))
    assert describe_reaction(system, peritectic) == "fcc + liquid -> bct"
    # the two sides of one phase's miscibility gap are told apart by the element they are rich in
    assert reaction_products(system, [("fcc", 0.05), ("fcc", 0.9)]) == "fcc (Pb-rich) + fcc (Sn-rich)"
    assert solid_label(system, "fcc", 0.05, [("fcc", 0.02), ("bct", 0.98)]) == "fcc"
    assert solid_label(system, "fcc", 0.05, [("fcc", 0.02), ("liquid", 0.5), ("fcc", 0.98)]) == "fcc (Pb-rich)"
