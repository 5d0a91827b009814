"""The binary path's fast evaluations against slower, independent ones, on every shipped binary:

- `SolutionAtT.potentials_and_curvature` (one pass for a Newton step) against `potentials` and
  `scaled_curvature` (the same numbers exactly on Python floats, and to 1e-12 from the array
  path), and its curvature against a central difference of the slope dG/dx_B (step 1e-6: the
  truncation error is of order h^2 times the fourth derivative, far below the tolerance);
- G and the scaled curvature on the section's grid and each compound's G (one matrix product for
  every phase, the magnetic term's Tc and beta tabulated once per phase) against each phase's
  own `gibbs` and `scaled_curvature`;
- a section's driving-force scan (`violations`, which looks only at the grid points close to the
  line) against a dense evaluation of every phase on 20,001 compositions: every phase that lies
  below a line somewhere is reported, and every reported point lies below it;
- point equilibria (the fast path: one hull edge, one tie-line, one check) against the whole
  section's tie-lines;
- every phase's temperature functions evaluated together (`FunctionStack`, one matrix product
  per temperature) against each function's own value and dG/dT, at every piece limit too.
"""

from __future__ import annotations

import math

import numpy as np
import pytest

from ladle.engine import equilibrate, find_system
from ladle.engine.files.loader import shipped_folder
from ladle.engine.minimize.equilibrium import _binary_shortcut, section_at
from ladle.engine.minimize.grid import composition_grid, scaled_curvature_on_grid
from ladle.engine.minimize.section import DRIVING_FORCE_TOLERANCE, Section, binary_phases
from ladle.engine.models.phases import SolutionPhase
from ladle.engine.models.polynomials import TemperatureOutOfRange

BINARIES = sorted(p.stem for p in shipped_folder().glob("*.toml")
                  if p.name != "elements.toml" and _binary_shortcut(find_system(p.stem)))
COMPOSITIONS = (1e-9, 1e-4, 0.013, 0.2, 0.5, 0.77, 0.99, 1.0 - 1e-7)


def _temperatures(system, count: int) -> list[float]:
    lo, hi = system.model_range_K
    return [float(T) for T in np.linspace(max(lo, 300.0) + 1.0, min(hi, 2500.0) - 1.0, count)]


def _solutions(system) -> list[tuple[str, SolutionPhase]]:
    return [(n, p) for n, p in system.phases.items() if isinstance(p, SolutionPhase)]


def test_every_shipped_binary_is_covered():
    assert len(BINARIES) >= 15 and "cu-ni" in BINARIES      # cu-ni: the magnetic fcc


@pytest.mark.parametrize("name", BINARIES)
def test_fused_potentials_and_curvature_equal_the_separate_ones(name):
    system = find_system(name)
    for phase_name, phase in _solutions(system):
        for T in _temperatures(system, 4):
            at = phase.at(T)
            xb = np.array(COMPOSITIONS)
            xa = np.array([1.0 - x for x in COMPOSITIONS])
            mu_a_arr, mu_b_arr = at.potentials(xa, xb)
            s_arr = at.scaled_curvature(xa, xb)
            for k, (x_a, x_b) in enumerate(zip(xa.tolist(), xb.tolist())):
                mu_a, mu_b, s = at.potentials_and_curvature(x_a, x_b)
                separate = at.potentials(x_a, x_b)
                assert (mu_a, mu_b) == (separate[0], separate[1]), (name, phase_name, T, x_b)
                assert s == at.scaled_curvature(x_a, x_b), (name, phase_name, T, x_b)
                assert mu_a == pytest.approx(float(mu_a_arr[k]), rel=1e-12, abs=1e-9)
                assert mu_b == pytest.approx(float(mu_b_arr[k]), rel=1e-12, abs=1e-9)
                assert s == pytest.approx(float(s_arr[k]), rel=1e-12, abs=1e-9)
                if 1e-3 < x_b < 1.0 - 1e-3:
                    h = 1e-6
                    up, down = at.slope(x_a - h, x_b + h), at.slope(x_a + h, x_b - h)
                    central = x_a * x_b * (float(up) - float(down)) / (2 * h)
                    # slopes of ~1e4 J/mol differenced over 2e-6 carry ~1e-5 J/mol of rounding
                    assert s == pytest.approx(central, rel=1e-5, abs=1e-3 * at.RT), (name, phase_name, T, x_b)


@pytest.mark.parametrize("name", BINARIES)
def test_grid_gibbs_and_curvature_equal_each_phases_own(name):
    """A section's G on its grid (one matrix product for every phase and compound at a new
    temperature, the magnetic term from Tc and beta tabulated once per phase, as Cu-Ni's fcc has
    it) and the scaled curvature against each phase's own `gibbs` and `scaled_curvature` at the
    same compositions."""
    system = find_system(name)
    xa, xb = composition_grid()
    inner = slice(1, -1)            # the scaled curvature is RT at both pure ends
    for T in _temperatures(system, 3):
        section = Section(system, T)
        solutions = section.solutions
        assert [s.phase for s in solutions] == [p for _n, p in _solutions(system)]
        G, C = section.G, scaled_curvature_on_grid(solutions)
        for k, sol in enumerate(solutions):
            assert np.allclose(G[k], sol.gibbs(xa, xb), rtol=1e-12, atol=1e-9), (name, k, T)
            expected = sol.scaled_curvature(xa[inner], xb[inner])
            assert np.allclose(C[k, inner], expected, rtol=1e-9, atol=1e-9 * sol.RT), (name, k, T)
        for name_c, compound in zip(section.names[section.n_sol:], section.compounds):
            g = section.comp_g[section.names.index(name_c) - section.n_sol]
            assert g == pytest.approx(compound.gibbs(T), rel=1e-12, abs=1e-9), (name, name_c, T)


def _dense_lowest(section: Section, mu: tuple[float, float], points: int = 20001) -> list[float]:
    """Each solution's lowest G minus the line mu_A x_A + mu_B x_B (J/mol) over a dense grid."""
    u = np.linspace(0.0, 1.0, points)[1:-1]
    xb = np.sin(0.5 * np.pi * u) ** 2
    xa = np.cos(0.5 * np.pi * u) ** 2
    return [float(np.min(s.gibbs(xa, xb) - (mu[0] * xa + mu[1] * xb))) for s in section.solutions]


@pytest.mark.parametrize("name", BINARIES)
def test_driving_force_scan_finds_every_phase_below_a_line(name):
    system = find_system(name)
    rng = np.random.default_rng(23)
    lines = 0
    for T in _temperatures(system, 3):
        section = Section(system, T)
        for _ in range(6):
            x0 = float(rng.uniform(0.02, 0.98))
            state = section.state_at(1.0 - x0, x0)
            if state.mu[0] is None:
                continue
            # the equilibrium line itself, raised a little, raised more, and tilted
            for lift, tilt in ((0.0, 0.0), (1e-3, 0.0), (25.0, 0.0), (5.0, 40.0)):
                mu = (state.mu[0] + lift - tilt, state.mu[1] + lift + tilt)
                found = section.violations(mu)
                dense = _dense_lowest(section, mu)
                lines += 1
                for s, d in enumerate(dense):
                    if d < -1e-6:
                        assert any(p[0] == s for p in found), (name, T, x0, lift, tilt, section.names[s], d)
                for s, xa_, xb_, g in found:
                    assert g - (mu[0] * xa_ + mu[1] * xb_) < -DRIVING_FORCE_TOLERANCE
    assert lines > 0


@pytest.mark.parametrize("name", BINARIES)
def test_point_equilibria_match_the_whole_section(name):
    system = find_system(name)
    rng = np.random.default_rng(29)
    for T in _temperatures(system, 4):
        T += float(rng.uniform(0.0, 0.5))
        ties = section_at(system, T).tie_lines
        for x0 in rng.uniform(0.001, 0.999, 25).tolist():
            got = equilibrate(system, T, x0)
            tie = next((t for t in ties if t.x_B[0] <= x0 <= t.x_B[1]), None)
            if tie is None:
                assert len(got.phases) == 1, (name, T, x0, got.phase_names)
                continue
            assert got.phase_names == tie.phases, (name, T, x0)
            for share, (_xa, xb) in zip(got.phases, tie.x):
                assert abs(float(share.x[1]) - xb) <= 1e-9, (name, T, x0, share.name)


@pytest.mark.parametrize("name", BINARIES)
def test_stacked_temperature_functions_equal_each_ones_own(name):
    """A section's functions of T evaluated together (end members, Redlich-Kister and magnetic
    terms, compounds) against each function's own `value` and `derivative`: the same numbers to
    rounding (the terms are summed in another order), at 40 temperatures and at every piece
    limit inside the range; below the range, the function's own error."""
    stack = binary_phases(find_system(name)).functions
    lo, hi = stack.lower_K, min(stack.upper_K, 6000.0)
    limits = sorted({b for f in stack.functions for b in f.bounds if lo <= b <= hi and math.isfinite(b)})
    for T in [float(T) for T in np.linspace(max(lo, 1.0), hi, 40)] + limits:
        if T <= 0.0:
            continue
        values, derivatives = stack.values_and_derivatives(T)
        for f, v, d in zip(stack.functions, values.tolist(), derivatives.tolist()):
            assert v == pytest.approx(f.value(T), rel=1e-12, abs=1e-9), (name, T)
            assert d == pytest.approx(f.derivative(T), rel=1e-12, abs=1e-12), (name, T)
    if lo > 1.0:
        with pytest.raises(TemperatureOutOfRange):
            stack.values_and_derivatives(lo - 1.0)



@pytest.mark.parametrize("name", BINARIES)
def test_deferred_answer_fields(name):
    """The binary shortcut's answer computes its phases, mass fractions, dG/dT and H on first
    access: they agree with independent figures. dG/dT at fixed overall composition against a
    central difference of the equilibrium G in T (the envelope theorem: the phases' amounts and
    compositions minimise G, so their change with T does not enter to first order; step 1e-3 K,
    skipped where the stable phases change within it), H = G - T dG/dT, mass fractions from the
    molar masses (sum to 1, the phases' mass shares balance the alloy's), and the answer is
    read-only."""
    system = find_system(name)
    rng = np.random.default_rng(31)
    lo, hi = system.temperature_range_K
    M = system.molar_mass
    compared = 0
    for _ in range(12):
        T, x = float(rng.uniform(lo + 1.0, hi - 1.0)), float(rng.uniform(0.01, 0.99))
        r = equilibrate(system, T, x)
        names = r.phase_names
        assert names == tuple(p.name for p in r.phases)
        w = np.array((1.0 - x, x)) * M / float(np.array((1.0 - x, x)) @ M)
        assert np.allclose(r.w, w, rtol=1e-14, atol=0.0)
        assert sum(p.amount_mass for p in r.phases) == pytest.approx(1.0, abs=1e-12)
        assert np.allclose(sum(p.amount_mass * p.w for p in r.phases), r.w, rtol=0.0, atol=1e-12)
        assert r.enthalpy_J_per_mol == pytest.approx(r.gibbs_J_per_mol - T * r.gibbs_dT_J_per_mol_K, rel=1e-14, abs=1e-9)
        with pytest.raises(AttributeError):
            r.gibbs_J_per_mol = 0.0
        h = 1e-3
        up, down = equilibrate(system, T + h, x), equilibrate(system, T - h, x)
        if up.phase_names != names or down.phase_names != names:
            continue
        central = (up.gibbs_J_per_mol - down.gibbs_J_per_mol) / (2 * h)
        # G of ~1e5 J/mol differenced over 2e-3 K carries ~1e-8 J/(mol K) of rounding per 1e-13 relative
        assert r.gibbs_dT_J_per_mol_K == pytest.approx(central, abs=2e-5), (name, T, x, names)
        compared += 1
    assert compared >= 6
