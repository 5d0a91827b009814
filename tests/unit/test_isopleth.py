"""Isopleths as zero-phase-fraction lines (engine/diagrams/isopleth.py): every line's two sides
are what point equilibria find there, on the invented ideal ternaries of
tests/unit/ideal_ternaries.py (closed-form equilibria: sources there)."""

from __future__ import annotations

import numpy as np
import pytest
from scipy.optimize import brentq

import ideal_ternaries as it
from ladle.engine.diagrams import isopleth

#: The A-B section at 15 at% C (u = 0: 85 A, 15 C; u = 1: 85 B, 15 C).
START, END = (0.85, 0.0, 0.15), (0.0, 0.85, 0.15)
WINDOW_K = (450.0, 1350.0)


@pytest.fixture
def section(monkeypatch):
    def make(system_maker):
        system = system_maker()
        solve = it.equilibrate_for(system)
        monkeypatch.setattr(isopleth, "equilibrate", solve)
        return system, isopleth.map_isopleth(system, START, END, "at", "B", WINDOW_K, columns=17, rows=21), solve
    return make


def _normal_steps(points: np.ndarray, k: int, span: np.ndarray, distance: float) -> tuple[np.ndarray, np.ndarray]:
    """Two points `distance` (in units of the window) either side of points[k], across the line."""
    scaled = points / span
    tangent = scaled[min(k + 1, len(points) - 1)] - scaled[max(k - 1, 0)]
    normal = np.array([-tangent[1], tangent[0]]) / np.linalg.norm(tangent)
    return (scaled[k] + distance * normal) * span, (scaled[k] - distance * normal) * span


def _both_sides_checked(system, iso, solve) -> int:
    """Step across every line at each of its inner points (away from the ends, where lines
    meet) and assert that the point equilibria there (`solve`) have the line's two phase sets;
    the number of points checked."""
    span = np.array([1.0, WINDOW_K[1] - WINDOW_K[0]])
    checked = 0
    for line in iso.lines:
        pts = np.array(line.points)
        for k in range(1, len(pts) - 1):
            for p in _normal_steps(pts, k, span, 1e-3):
                if not (0.0 < p[0] < 1.0 and WINDOW_K[0] < p[1] < WINDOW_K[1]):
                    continue
                x = isopleth.section_mole_fractions(system, START, END, "at", np.array([p[0]]))[0]
                found = tuple(sorted(solve(system, p[1], x).phase_names))
                assert found in (line.with_phase, line.without_phase), (line.phase, p, found)
                checked += 1
    return checked


@pytest.mark.parametrize("maker", [it.eutectic_system, it.lens_system])
def test_both_sides_of_every_line_are_what_point_equilibria_find(section, maker):
    system, iso, solve = section(maker)
    assert iso.lines
    assert _both_sides_checked(system, iso, solve) > 30


def test_liquidus_of_the_primary_phase_is_the_closed_form(section):
    """Where alpha (pure A) first forms from the ideal liquid, x_A = a_A(T) (ideal_ternaries)."""
    _system, iso, _solve = section(it.eutectic_system)
    line = next(ln for ln in iso.lines if ln.phase == "alpha" and ln.without_phase == ("liquid",))
    for u, T in line.points:
        x_A = START[0] * (1.0 - u)
        assert T == pytest.approx(brentq(lambda t: it.saturation(t)[0] - x_A, 400.0, 1400.0), abs=0.05)


def test_the_ternary_eutectic_is_the_one_invariant(section):
    _system, iso, _solve = section(it.eutectic_system)
    T_eutectic = brentq(lambda T: it.saturation(T).sum() - 1.0, 400.0, 1000.0)
    assert len(iso.invariants) == 1
    inv = iso.invariants[0]
    assert inv.phases == ("alpha", "beta", "gamma", "liquid")
    assert inv.temperature_K == pytest.approx(T_eutectic, abs=0.05)
    fields = {f.phases for f in iso.fields}
    assert {("liquid",), ("alpha", "liquid"), ("beta", "liquid"), ("alpha", "beta", "liquid"),
            ("alpha", "beta", "gamma")} <= fields
    out = iso.to_json()
    assert out["invariants"][0]["phases"] == ["alpha", "beta", "gamma", "liquid"]
    assert all({"phase", "with", "without", "points"} <= set(line) for line in out["lines"])


def test_through_the_engine_both_sides_of_every_line_agree(tmp_path):
    """The same section of the same invented ternary, as a system file through the general
    minimiser, on a coarse grid (the engine's point equilibria are the reference here)."""
    from ladle.engine import equilibrate, load_system

    system = load_system(it.write_system_files(tmp_path)["ideal-eutectic"])
    iso = isopleth.map_isopleth(system, START, END, "at", "Sn", WINDOW_K, columns=7, rows=9)
    assert _both_sides_checked(system, iso, equilibrate) > 20
    assert [inv.phases for inv in iso.invariants] == [("alpha", "beta", "gamma", "liquid")]


@pytest.mark.parametrize("rows", [3, 4, 6])
def test_every_column_through_the_ternary_eutectic_crosses_it_on_a_coarse_grid(monkeypatch, rows):
    """Every alloy holding all three elements ends freezing in the ternary eutectic of the
    invented eutectic system (three pure solids). On a grid whose rows are far apart, an edge of
    a column runs from the liquid's fields through the thin liquid + alpha + beta field to
    alpha + beta + gamma: each change on it is found, so the invariant is crossed on every inner
    column (u = 1/8 .. 7/8) at the closed-form temperature (sum_i a_i(T) = 1, brentq), and the
    liquid's line below the three-phase field is there."""
    system = it.eutectic_system()
    monkeypatch.setattr(isopleth, "equilibrate", it.equilibrate_for(system))
    iso = isopleth.map_isopleth(system, START, END, "at", "B", WINDOW_K, columns=9, rows=rows)
    T_eutectic = brentq(lambda T: it.saturation(T).sum() - 1.0, 400.0, 1000.0)
    spacing = (WINDOW_K[1] - WINDOW_K[0]) / (rows - 1)
    [inv] = iso.invariants
    assert inv.phases == ("alpha", "beta", "gamma", "liquid")
    assert inv.u_range == (0.125, 0.875)
    assert inv.temperature_K == pytest.approx(T_eutectic, abs=isopleth.EDGE_TOLERANCE * spacing)
    on_liquid_line = {float(u) for ln in iso.lines if ln.phase == "liquid" and ln.without_phase == ("alpha", "beta", "gamma")
                      for u, T in ln.points if abs(T - T_eutectic) <= isopleth.EDGE_TOLERANCE * spacing}
    assert {k / 8 for k in range(1, 8)} <= on_liquid_line


@pytest.mark.parametrize("maker", [it.eutectic_system, it.lens_system])
@pytest.mark.parametrize("ends", [(START, END), ((0.6, 0.4, 0.0), (0.2, 0.2, 0.6)), ((0.95, 0.05, 0.0), (0.0, 0.05, 0.95))])
@pytest.mark.parametrize("size", [(isopleth.DEFAULT_COLUMNS, isopleth.DEFAULT_ROWS), (8, 10)])
def test_the_coarse_grid_first_finds_every_nodes_phases(monkeypatch, maker, ends, size):
    """Solving every other row and column first and the nodes between only beside a change
    gives every node of the grid (the default one, and one whose last row and column have no
    coarse node beyond them) the phase set a point equilibrium there has (the closed forms of
    ideal_ternaries at every node), with fewer point equilibria."""
    system = maker()
    solve = it.equilibrate_for(system)
    monkeypatch.setattr(isopleth, "equilibrate", solve)
    mapper = isopleth._Mapper(system, *ends, "at")
    us = np.linspace(0.0, 1.0, size[0])
    Ts = np.linspace(WINDOW_K[1], WINDOW_K[0], size[1])
    _eqs, keys = mapper.grid(us, Ts)
    x = isopleth.section_mole_fractions(system, *ends, "at", us)
    assert keys == [[tuple(sorted(solve(system, T, xi).phase_names)) for xi in x] for T in Ts]
    assert mapper.calls < 0.9 * len(us) * len(Ts)
