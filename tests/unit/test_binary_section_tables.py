"""A binary section at a new temperature is one matrix product of the ten temperature terms with a
table made once per system (`BinaryPhases.at`): checked on every shipped binary against
independent evaluations.

- At every limit between temperature pieces of any of the system's functions (where the table
  changes) and next to it: every solution's G on the grid against the phase's own `gibbs`, each
  compound's G against its own `gibbs`, and the hull's candidates (every solution's coarse grid
  points, magnetic term included, then the compounds) against those values.
- The hull edge the point queries walk to (`Section._bridge`) against the lower convex hull of
  the same candidate points computed by scipy.spatial.ConvexHull (Qhull): the edge's chord at
  the composition equals the hull's lower envelope there (the largest of its lower facets'
  lines).
"""

from __future__ import annotations

import math

import numpy as np
import pytest
from scipy.spatial import ConvexHull

from ladle.engine import find_system
from ladle.engine.files.loader import shipped_folder
from ladle.engine.minimize.equilibrium import _binary_shortcut
from ladle.engine.minimize.grid import composition_grid
from ladle.engine.minimize.section import HULL_STRIDE, Section, binary_phases
from ladle.engine.models.phases import CompoundPhase, SolutionAtT

BINARIES = sorted(p.stem for p in shipped_folder().glob("*.toml")
                  if p.name != "elements.toml" and _binary_shortcut(find_system(p.stem)))


def _piece_limits(system) -> list[float]:
    """Every limit between pieces of the system's functions inside its range (K), and a
    temperature 1e-6 K above each."""
    stack = binary_phases(system).functions
    lo, hi = system.model_range_K
    limits = sorted({b for f in stack.functions for b in f.bounds[1:-1] if lo < b < hi and math.isfinite(b)})
    return [T for b in limits for T in (b, b + 1e-6) if T < hi]


def _candidates(section: Section) -> tuple[np.ndarray, np.ndarray]:
    """x_B and G (J/mol) of the hull's candidates, in the order of `Section._seed`."""
    xb = np.array([section._seed(k)[3] for k in range(len(section._hull_g))])
    return xb, np.asarray(section._hull_g)


def test_every_shipped_binary_is_covered():
    assert len(BINARIES) >= 15 and "cu-ni" in BINARIES


@pytest.mark.parametrize("name", BINARIES)
def test_section_tables_at_every_piece_limit(name):
    system = find_system(name)
    xa, xb = composition_grid()
    temperatures = _piece_limits(system) or [float(np.mean(system.model_range_K))]
    for T in temperatures:
        section = Section(system, T)
        for k, sol in enumerate(section.solutions):
            own = sol.phase.at(T).gibbs(xa, xb)
            assert np.allclose(section.G[k], own, rtol=1e-12, atol=1e-9), (name, T, section.names[k])
        coarse = section.G[:, ::HULL_STRIDE].ravel()
        compounds = [section.phase_at(n) for n in section.names[section.n_sol:]]
        own_compounds = [c.gibbs(T) for c in compounds]
        assert np.allclose(section.comp_g, own_compounds, rtol=1e-12, atol=1e-9), (name, T)
        assert np.array_equal(section._hull_g, np.concatenate([coarse, section.comp_g])), (name, T)


@pytest.mark.parametrize("name", BINARIES)
def test_phase_at_gives_each_phase_at_the_section_temperature(name):
    system = find_system(name)
    T = float(np.mean(system.model_range_K))
    section = Section(system, T)
    for k, phase_name in enumerate(section.names):
        phase = section.phase_at(phase_name)
        if k < section.n_sol:
            assert isinstance(phase, SolutionAtT) and phase.T == T and phase.phase is system.phases[phase_name]
        else:
            assert isinstance(phase, CompoundPhase) and phase is system.phases[phase_name]


def _lower_envelope(points: np.ndarray, x: float) -> float:
    """The lower convex hull of `points` (x, G) at x: the largest value there of the lines of
    its lower facets (scipy.spatial.ConvexHull; a facet is lower where its outward normal points
    down in G)."""
    hull = ConvexHull(points)
    lower = hull.equations[hull.equations[:, 1] < -1e-12]
    return float(np.max(-(lower[:, 0] * x + lower[:, 2]) / lower[:, 1]))


@pytest.mark.parametrize("name", BINARIES)
def test_hull_edge_is_the_lower_convex_hull(name):
    system = find_system(name)
    rng = np.random.default_rng(41)
    lo, hi = system.temperature_range_K
    for T in rng.uniform(lo + 1.0, hi - 1.0, 4).tolist():
        section = Section(system, T)
        xb, g = _candidates(section)
        points = np.column_stack([xb, g])
        for x0 in rng.uniform(0.002, 0.998, 12).tolist():
            i, j = section._bridge(x0)
            assert xb[i] < x0 <= xb[j], (name, T, x0)
            chord = g[i] + (g[j] - g[i]) * (x0 - xb[i]) / (xb[j] - xb[i])
            reference = _lower_envelope(points, x0)
            assert chord == pytest.approx(reference, rel=1e-10, abs=1e-7), (name, T, x0)
