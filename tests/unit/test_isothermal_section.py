"""The ternary isothermal section (engine/diagrams/isothermal.py) on the invented ideal eutectic
ternary of tests/unit/ideal_ternaries.py: tie-lines and the tie-triangle against the closed
form (a liquid saturated with pure solid i holds x_i = a_i(T); sources there)."""

from __future__ import annotations

import numpy as np
import pytest

import ideal_ternaries as it
from ladle.engine.diagrams import isothermal

T = 650.0    # K: below the A-B (732 K) and A-C (694 K) eutectics, above B-C (640 K) and the ternary one (558 K)


@pytest.fixture
def section(monkeypatch):
    system = it.eutectic_system()
    monkeypatch.setattr(isothermal, "equilibrate", it.equilibrate_for(system))
    return isothermal.map_isothermal(system, T, divisions=16)


def test_tie_lines_end_on_the_saturated_liquid(section):
    a = it.saturation(T)
    by_phases = {f.phases: f for f in section.fields}
    for solid, i in (("alpha", 0), ("beta", 1), ("gamma", 2)):
        field = by_phases[(solid, "liquid")]
        assert len(field.tie_lines) >= 3
        for tie in field.tie_lines:
            liquid = tie.ends[tie.phases.index("liquid")]
            assert liquid[i] == pytest.approx(a[i], abs=1e-12)
            assert tie.ends[tie.phases.index(solid)] == pytest.approx(tuple(np.eye(3)[i]))


def test_three_phase_triangles_have_the_doubly_saturated_liquid(section):
    a = it.saturation(T)
    triangle = {f.phases: f for f in section.fields}[("alpha", "beta", "liquid")].triangles
    assert len(triangle) == 1
    alpha, beta, liquid = triangle[0]
    assert liquid == pytest.approx((a[0], a[1], 1.0 - a[0] - a[1]), abs=1e-12)
    assert alpha == pytest.approx((1.0, 0.0, 0.0)) and beta == pytest.approx((0.0, 1.0, 0.0))


def test_every_node_is_in_one_field_and_the_json_names_them(section):
    assert sum(f.nodes for f in section.fields) == len(isothermal.triangle_nodes(16))
    out = section.to_json()
    assert out["temperature_K"] == T
    assert {tuple(f["phases"]) for f in out["fields"]} >= {("liquid",), ("alpha", "liquid"), ("alpha", "beta", "liquid")}


def test_only_ternaries_have_a_triangle():
    system = it.eutectic_system()
    system.elements = ("A", "B")
    with pytest.raises(ValueError, match="needs a ternary system"):
        isothermal.map_isothermal(system, T)


@pytest.mark.parametrize("maker", [it.eutectic_system, it.lens_system])
def test_solving_the_fine_nodes_only_near_changes_finds_every_nodes_phases(monkeypatch, maker):
    """The coarse grid first, the fine nodes only beside a change: every field holds the same
    nodes as when every node is solved (point equilibria at all of them, closed forms of
    ideal_ternaries), at temperatures every 50 K over the window, with fewer point equilibria."""
    system = maker()
    solve = it.equilibrate_for(system)
    calls = []

    def counted(*args, **kwargs):
        calls.append(1)
        return solve(*args, **kwargs)

    monkeypatch.setattr(isothermal, "equilibrate", counted)
    nodes = isothermal.triangle_nodes(16)
    for T_K in np.arange(450.0, 1350.0, 50.0):
        calls.clear()
        section = isothermal.map_isothermal(system, T_K, divisions=16)
        every = {}
        for x in nodes:
            key = tuple(sorted(solve(system, T_K, x).phase_names))
            every[key] = every.get(key, 0) + 1
        assert {f.phases: f.nodes for f in section.fields} == every
        assert len(calls) < len(nodes)
