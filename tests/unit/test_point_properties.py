"""Property-based checks of point equilibrium (issue 2) on random valid systems.

Random systems: a liquid plus one to three more phases (solutions with random lattice
stabilities and Redlich-Kister terms, or stoichiometric compounds with random formation
energies), at random temperatures and compositions. For every answer:
- phase amounts (mole and mass) lie in [0, 1] and sum to 1; mass balance holds to 1e-12;
- at most two phases (Gibbs phase rule for a binary at fixed T and pressure);
- the reported Gibbs energy is the amounts times the phases' energies, evaluated here
  independently of the engine (tests/unit/synthetic.py);
- it is never above the lower convex hull of a dense brute-force grid (1e5 points per phase,
  hull by scipy.spatial.ConvexHull, independent of engine/hull.py) by more than 1e-6 J/mol.
"""

from __future__ import annotations

import itertools

import numpy as np
import pytest
from hypothesis import HealthCheck, given, settings
from hypothesis import strategies as st
from scipy.spatial import ConvexHull

from ladle.engine import equilibrate

from synthetic import MOLAR_MASS, Compound, Solution, Synthetic, fusion

#: Brute-force grid per solution phase: uniform in x_B, plus geometric points near both ends
#: (where RT x ln x is steep); 1e5 points in all.
_N_UNIFORM = 99_000
_N_END = 500
GIBBS_TOLERANCE = 1e-6      # J/mol, from the issue
BALANCE_TOLERANCE = 1e-12   # mole (and mass) fraction, from the issue

_names = itertools.count()
#: Besides the drawn compositions, every example sweeps this grid (x_B), so that each two-phase
#: field present at the drawn temperature is crossed.
SWEEP = np.linspace(0.0125, 0.9875, 40)


def brute_force_grid() -> tuple[np.ndarray, np.ndarray]:
    """(x_A, x_B) on about 1e5 points, sorted by x_B; next to each pure element the small
    fraction is the geometric one and the other is 1 minus it (no digits lost). Next to pure B
    the geometric points start at 1e-13, where 1 - x_A still differs from point to point."""
    near_a = np.geomspace(1e-15, 1e-2, _N_END)
    near_b = np.geomspace(1e-13, 1e-2, _N_END)
    middle = np.linspace(1e-2, 1.0 - 1e-2, _N_UNIFORM + 2)[1:-1]
    xb = np.concatenate([[0.0], near_a, middle, (1.0 - near_b)[::-1], [1.0]])
    xa = np.concatenate([[1.0], 1.0 - near_a, 1.0 - middle, near_b[::-1], [0.0]])
    assert np.all(np.diff(xb) > 0)
    return xa, xb


GRID_XA, GRID_XB = brute_force_grid()


def lower_envelope(syn: Synthetic, T: float) -> tuple[np.ndarray, np.ndarray]:
    """Vertices (x_B, G in J/mol) of the lower convex hull of every phase at T: each solution
    on the grid, each compound as a point, hull by scipy.spatial.ConvexHull. Only the
    pointwise lowest solution is kept at each grid point (the hull is the same)."""
    sols = [p for p in syn.phases if isinstance(p, Solution)]
    G = np.min([s.gibbs(T, GRID_XA, GRID_XB) for s in sols], axis=0)
    pts = [np.column_stack([GRID_XB, G])]
    for c in syn.phases:
        if isinstance(c, Compound):
            pts.append(np.array([[c.x_B, syn.compound_gibbs(c, T)]]))
    points = np.vstack(pts)
    hull = ConvexHull(points)
    lower = np.unique(hull.simplices[hull.equations[:, 1] < 0])   # outward normal points down
    vx, vg = points[lower, 0], points[lower, 1]
    order = np.argsort(vx)
    assert vx[order][0] == 0.0 and vx[order][-1] == 1.0
    return vx[order], vg[order]


# --- random systems -----------------------------------------------------------------------------
def _coeffs(draw, a: tuple[float, float], b: tuple[float, float]) -> dict[str, float]:
    return {"a": draw(st.floats(*a)), "b": draw(st.floats(*b))}


@st.composite
def random_systems(draw) -> Synthetic:
    """A liquid (melting points 800-1800 K) plus one to three solutions or compounds, with
    parameters in the ranges of real metallic systems (invented values)."""
    liquid = Solution("liquid", fusion(draw(st.floats(8e3, 2e4)), draw(st.floats(800.0, 1800.0))),
                      fusion(draw(st.floats(8e3, 2e4)), draw(st.floats(800.0, 1800.0))),
                      tuple(_coeffs(draw, (-2e4, 2e4), (-8.0, 8.0)) for _ in range(draw(st.integers(0, 2)))))
    phases: list[Solution | Compound] = [liquid]
    n_more = draw(st.integers(1, 3))
    n_compounds = draw(st.integers(0, min(2, n_more - 1)))
    for k in range(n_more - n_compounds):
        phases.append(Solution(f"sol{k}", _coeffs(draw, (-3e3, 8e3), (-3.0, 3.0)), _coeffs(draw, (-3e3, 8e3), (-3.0, 3.0)),
                               tuple(_coeffs(draw, (-2e4, 3e4), (-8.0, 8.0)) for _ in range(draw(st.integers(0, 3))))))
    sols = [p.name for p in phases]
    counts = draw(st.lists(st.sampled_from([(1, 1), (1, 2), (2, 1), (1, 3), (3, 1)]),
                           min_size=n_compounds, max_size=n_compounds, unique=True))
    for k, c in enumerate(counts):
        phases.append(Compound(f"C{k}", c, (draw(st.sampled_from(sols)), draw(st.sampled_from(sols))),
                               _coeffs(draw, (-1.2e4, -1e3), (-3.0, 3.0))))
    return Synthetic(phases)


compositions = st.one_of(st.floats(0.0, 1.0), st.sampled_from([0.0, 1.0, 1e-9, 1.0 - 1e-9, 0.25, 0.5, 2.0 / 3.0]))


@pytest.fixture(scope="module")
def folder(tmp_path_factory):
    return tmp_path_factory.mktemp("random_systems")


@settings(max_examples=30, deadline=None, suppress_health_check=[HealthCheck.too_slow])
@given(syn=random_systems(), T=st.floats(300.0, 1900.0), xs=st.lists(compositions, min_size=1, max_size=8))
def test_point_equilibrium_properties(folder, syn, T, xs):
    system = syn.load(folder, f"random{next(_names)}")
    hull = lower_envelope(syn, T)   # (x_B, G) vertices
    M = np.array([MOLAR_MASS["A"], MOLAR_MASS["B"]])
    for x0 in list(xs) + list(SWEEP):
        eq = equilibrate(system, T, x0)
        where = f"T={T!r} K, x_B={x0!r}, phases {eq.phase_names}"
        assert 1 <= len(eq.phases) <= 2, where
        amounts = np.array([p.amount_mol for p in eq.phases])
        masses = np.array([p.amount_mass for p in eq.phases])
        assert np.all((amounts >= 0) & (amounts <= 1)), where
        assert np.all((masses >= 0) & (masses <= 1)), where
        assert amounts.sum() == pytest.approx(1.0, abs=BALANCE_TOLERANCE), where
        assert masses.sum() == pytest.approx(1.0, abs=BALANCE_TOLERANCE), where
        balance = sum(p.amount_mol * p.x for p in eq.phases)
        assert balance == pytest.approx(np.array([1.0 - x0, x0]), abs=BALANCE_TOLERANCE), where
        mass_balance = sum(p.amount_mass * p.w for p in eq.phases)
        w0 = np.array([1.0 - x0, x0]) * M / ((1.0 - x0) * M[0] + x0 * M[1])
        assert mass_balance == pytest.approx(w0, abs=BALANCE_TOLERANCE), where
        # The reported energy is the energy of the reported state (evaluated here, not by the engine).
        g_state = sum(p.amount_mol * syn.phase_gibbs(p.name, T, float(p.x[1])) for p in eq.phases)
        assert eq.gibbs_J_per_mol == pytest.approx(g_state, abs=GIBBS_TOLERANCE), where
        # ... and no higher than the brute-force lower hull.
        g_hull = float(np.interp(x0, *hull))
        assert eq.gibbs_J_per_mol <= g_hull + GIBBS_TOLERANCE, f"{where}: G {eq.gibbs_J_per_mol!r} above hull {g_hull!r}"
