"""The general minimiser on invented ternary and quaternary systems at random points, against two
independent references (more points in tests/benchmarks/engine_bench.py):

- a dense sampled reference: the lower convex hull of tens of thousands of points per phase
  (scipy.spatial.ConvexHull for ternaries; for quaternaries the equivalent tangent-plane check
  over the same kind of cloud). It lies above the true minimum by its sampling error, so the
  engine's G must never lie above it (beyond rounding), and the engine's answer must be a real
  state (mass balance, G equal to the sum over its phases) so that it cannot lie below the true
  minimum;
- scipy's SLSQP over every phase's amount and site fractions from many random starts, which must
  never find a lower G.

Every answer also obeys Gibbs' phase rule (at most N phases at fixed T and P), and leaving a phase
out changes the answer only where that phase was stable.
"""

from __future__ import annotations

import numpy as np
import pytest
from scipy.optimize import minimize
from scipy.spatial import ConvexHull

from ladle.engine.minimize.equilibrium import general_equilibrium

from multicomponent_models import random_system, system_of

#: Rounding allowance (J/mol) for "not above the reference" and "SLSQP not lower".
ROUNDING_J = 1e-6


def _dense_cloud(models: dict, n: int, rng: np.random.Generator) -> tuple[np.ndarray, np.ndarray]:
    """(X, G per mole of atoms) of n random site-fraction points per phase (Dirichlet, denser
    toward the corners and edges) plus each phase's own samples."""
    Xs, Gs = [], []
    for m in models.values():
        Y = np.hstack([rng.dirichlet(np.full(len(g), 0.5), size=n) if len(g) > 1 else np.ones((n, 1))
                       for g in m.groups])
        Y = np.vstack([Y, m.samples()[0]])
        moles = Y @ m.element_matrix
        atoms = moles.sum(-1)
        keep = atoms > 1e-12
        Xs.append(moles[keep] / atoms[keep, None])
        Gs.append(m.gibbs(Y[keep]) / atoms[keep])
    return np.vstack(Xs), np.concatenate(Gs)


def _lower_hull_planes(X: np.ndarray, G: np.ndarray) -> np.ndarray:
    """The lower facets of the hull of (x_2..x_N, G) as rows (normal, offset) of qhull's equations."""
    hull = ConvexHull(np.column_stack([X[:, 1:], G]), qhull_options="Qx Qt")
    return hull.equations[hull.equations[:, -2] < -1e-12]


def _hull_at(planes: np.ndarray, z: np.ndarray) -> float:
    """The lower hull's G at z: the highest of its supporting planes there."""
    return float(np.max(-(planes[:, :-2] @ z[1:] + planes[:, -1]) / planes[:, -2]))


def _check_state(eq, system, z: np.ndarray) -> None:
    """A real state: amounts sum to 1, mass balance, G = sum over the phases, phase rule."""
    n = len(z)
    assert len(eq.phases) <= n
    amounts = np.array([p.amount_mol for p in eq.phases])
    assert np.all(amounts >= 0.0) and amounts.sum() == pytest.approx(1.0, abs=1e-12)
    np.testing.assert_allclose(sum(p.amount_mol * p.x for p in eq.phases), z, atol=1e-12, rtol=0)
    models = {k: m.at(eq.temperature_K) for k, m in system.models.items()}
    total = 0.0
    for p in eq.phases:
        m = models[p.name]
        y = np.concatenate(p.site_fractions)
        total += p.amount_mol * float(m.gibbs(y)) / float((y @ m.element_matrix).sum())
    assert eq.gibbs_J_per_mol == pytest.approx(total, abs=1e-8 * (1 + abs(total)))


def _slsqp_lowest(models: dict, z: np.ndarray, starts: int, rng: np.random.Generator) -> float:
    """The lowest G (J/mol) SLSQP finds over amounts (mol formula units) and site fractions of
    every phase, from `starts` random starts."""
    ms = list(models.values())
    sizes = [m.n_vars for m in ms]
    offs = np.cumsum([0] + [1 + s for s in sizes])

    def parts(v):
        return [(v[o], v[o + 1:o + 1 + s]) for o, s in zip(offs[:-1], sizes)]

    def total(v):
        return sum(n * float(m.gibbs(y)) for m, (n, y) in zip(ms, parts(v)))

    cons = [{"type": "eq", "fun": lambda v: sum(n * (y @ m.element_matrix) for m, (n, y) in zip(ms, parts(v))) - z}]
    for m, o in zip(ms, offs[:-1]):
        for g in m.groups:
            cons.append({"type": "eq", "fun": lambda v, o=o, g=g: v[o + 1 + g].sum() - 1.0})
    bounds = []
    for s in sizes:
        bounds += [(0.0, 2.0)] + [(1e-12, 1.0)] * s
    best = np.inf
    for _ in range(starts):
        v0 = []
        for m, share in zip(ms, rng.dirichlet(np.ones(len(ms)))):
            v0.append([share])
            y = np.zeros(m.n_vars)
            for g in m.groups:
                y[g] = rng.dirichlet(np.ones(len(g)))
            v0.append(y)
        r = minimize(total, np.concatenate(v0), method="SLSQP", bounds=bounds, constraints=cons,
                     options={"maxiter": 400, "ftol": 1e-13})
        if r.success and max(abs(c["fun"](r.x)).max() for c in cons) < 1e-9:
            best = min(best, float(r.fun))
    return best


@pytest.mark.parametrize("seed", [1, 2, 3])
def test_ternary_never_above_the_dense_hull(seed):
    rng = np.random.default_rng(seed)
    els, phases = random_system(rng, 3, sublattice_phase=(seed == 2))
    system = system_of(els, phases)
    T = float(rng.uniform(600.0, 1400.0))
    models = {p.name: p.at(T) for p in phases}
    planes = _lower_hull_planes(*_dense_cloud(models, 20000, rng))
    for _ in range(40):
        z = rng.dirichlet(np.ones(3))
        eq = general_equilibrium(system, T, z)
        assert eq.converged
        _check_state(eq, system, z)
        reference = _hull_at(planes, z)
        assert eq.gibbs_J_per_mol <= reference + ROUNDING_J


@pytest.mark.parametrize("seed", [11, 12])
def test_quaternary_never_above_the_dense_reference(seed):
    """In four elements the hull itself is slow to build; weak duality gives the same check: if no
    point of the dense cloud lies below the engine's tangent plane mu and G = mu . z, then G lies
    at or below every combination of cloud points at z, the dense hull's value included."""
    rng = np.random.default_rng(seed)
    els, phases = random_system(rng, 4, n_solutions=3, n_compounds=3)
    system = system_of(els, phases)
    T = float(rng.uniform(600.0, 1400.0))
    models = {p.name: p.at(T) for p in phases}
    X, G = _dense_cloud(models, 30000, rng)
    for _ in range(25):
        z = rng.dirichlet(np.ones(4))
        eq = general_equilibrium(system, T, z)
        assert eq.converged
        _check_state(eq, system, z)
        mu = eq.chemical_potentials
        assert float(mu @ z) == pytest.approx(eq.gibbs_J_per_mol, abs=1e-8 * abs(eq.gibbs_J_per_mol))
        assert float(np.min(G - X @ mu)) >= -ROUNDING_J


def test_generic_minimiser_from_many_starts_never_lower():
    rng = np.random.default_rng(21)
    for n in (3, 4):
        els, phases = random_system(rng, n, n_solutions=2, n_compounds=1)
        system = system_of(els, phases)
        T = float(rng.uniform(600.0, 1400.0))
        models = {p.name: p.at(T) for p in phases}
        for _ in range(3):
            z = rng.dirichlet(np.ones(n))
            engine = general_equilibrium(system, T, z).gibbs_J_per_mol
            assert _slsqp_lowest(models, z, 6, rng) >= engine - 1e-4   # SLSQP's constraint tolerance


def test_leaving_a_phase_out_changes_only_where_it_was_stable():
    rng = np.random.default_rng(31)
    els, phases = random_system(rng, 3)
    T = 900.0
    full = system_of(els, phases)
    for left_out in (phases[0].name, phases[-1].name):
        fewer = system_of(els, [p for p in phases if p.name != left_out])
        for _ in range(25):
            z = rng.dirichlet(np.ones(3))
            a = general_equilibrium(full, T, z)
            b = general_equilibrium(fewer, T, z)
            assert left_out not in b.phase_names
            if left_out in a.phase_names:
                assert b.gibbs_J_per_mol > a.gibbs_J_per_mol
            else:
                assert sorted(b.phase_names) == sorted(a.phase_names)
                assert b.gibbs_J_per_mol == pytest.approx(a.gibbs_J_per_mol, abs=1e-7)


def test_an_absent_element_is_the_limit_of_a_trace_of_it():
    """z with an element exactly 0 (its constituents fixed at 0, its mu undefined) against the
    same alloy with 1e-10 of it: the same phases, G to 1e-4 J/mol (RT times 1e-10 times a log)."""
    rng = np.random.default_rng(41)
    els, phases = random_system(rng, 3, sublattice_phase=True)
    system = system_of(els, phases)
    for _ in range(12):
        T = float(rng.uniform(600.0, 1400.0))
        z = np.zeros(3)
        keep = rng.choice(3, size=2, replace=False)
        z[keep] = rng.dirichlet(np.ones(2))
        trace = np.where(z == 0.0, 1e-10, z * (1.0 - 1e-10))
        a = general_equilibrium(system, T, z)
        b = general_equilibrium(system, T, trace)
        assert a.converged and b.converged
        assert sorted(a.phase_names) == sorted(b.phase_names)
        assert a.gibbs_J_per_mol == pytest.approx(b.gibbs_J_per_mol, abs=1e-4)
        assert np.isnan(a.chemical_potentials[z == 0.0]).all()
        assert np.isfinite(a.chemical_potentials[z > 0.0]).all() or len(a.phases) == 1


def test_a_start_from_a_nearby_answer_gives_the_same_answer():
    """equilibrate(..., near=previous) along a line of compositions at one temperature: the same
    phases and G as the cold start (the warm start passes the same driving-force check)."""
    rng = np.random.default_rng(51)
    els, phases = random_system(rng, 3)
    system = system_of(els, phases)
    T = 1000.0
    previous = None
    for t in np.linspace(0.02, 0.98, 40):
        z = np.array([t, (1.0 - t) * 0.6, (1.0 - t) * 0.4])
        warm = general_equilibrium(system, T, z, near=previous)
        cold = general_equilibrium(system, T, z)
        assert warm.converged
        assert sorted(warm.phase_names) == sorted(cold.phase_names)
        assert warm.gibbs_J_per_mol == pytest.approx(cold.gibbs_J_per_mol, abs=1e-7)
        previous = warm


def test_temperature_derivative_and_enthalpy_of_the_alloy():
    """dG/dT of the equilibrium at fixed overall composition against a central difference of the
    equilibrium's G (h = 1e-3 K; at a minimum the phases' own changes do not contribute to first
    order, so the difference of the minima is the derivative), and H against the Gibbs-Helmholtz
    relation H = -T^2 d(G/T)/dT by the same difference."""
    rng = np.random.default_rng(61)
    els, phases = random_system(rng, 3, sublattice_phase=True)
    system = system_of(els, phases)
    h = 1e-3
    for _ in range(8):
        T = float(rng.uniform(700.0, 1300.0))
        z = rng.dirichlet(np.ones(3))
        eq = general_equilibrium(system, T, z)
        above = general_equilibrium(system, T + h, z).gibbs_J_per_mol
        below = general_equilibrium(system, T - h, z).gibbs_J_per_mol
        if sorted(general_equilibrium(system, T + h, z).phase_names) != sorted(eq.phase_names):
            continue                                   # a phase boundary within h: no derivative
        assert eq.gibbs_dT_J_per_mol_K == pytest.approx((above - below) / (2 * h), abs=1e-4)
        gibbs_helmholtz = -T * T * (above / (T + h) - below / (T - h)) / (2 * h)   # H = -T^2 d(G/T)/dT
        assert eq.enthalpy_J_per_mol == pytest.approx(gibbs_helmholtz, abs=0.2)
