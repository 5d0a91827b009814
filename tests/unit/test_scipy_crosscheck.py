"""Cross-check of point equilibrium against a general-purpose minimiser (issue 2).

scipy.optimize.minimize (SLSQP) minimises the total Gibbs energy over phase amounts and phase
compositions, subject to the amounts summing to one and to the alloy's mass balance, from many
random starts. Each solution phase may appear twice (so that a miscibility gap is reachable);
each compound once. Energies come from the phase parameters, evaluated in tests/unit/synthetic.py
(not by the engine). The minimiser must never find a lower Gibbs energy than the engine; and
its best start must reach the engine's value (so that the check has teeth).
"""

from __future__ import annotations

import numpy as np
import pytest
from scipy.optimize import minimize

from ladle.engine import equilibrate

import topologies
from synthetic import R, Compound, Solution, Synthetic

STARTS = 10
#: The minimiser may not go below the engine by more than this (J/mol), from the issue.
GIBBS_TOLERANCE = 1e-6
#: ... and its best start must come within this (J/mol) of the engine.
REACH_TOLERANCE = 1e-3
#: Largest violation of the two equality constraints accepted from a minimiser run.
FEASIBLE = 1e-11
_X_EDGE = 1e-12


class TotalGibbs:
    """Total Gibbs energy of a set of phase instances at T (K) and overall x_B."""

    def __init__(self, syn: Synthetic, T: float, x0: float) -> None:
        self.syn, self.T, self.x0 = syn, T, x0
        sols = [p for p in syn.phases if isinstance(p, Solution)]
        self.solutions = sols + sols                     # each solution twice
        self.compounds = [p for p in syn.phases if isinstance(p, Compound)]
        self.ns, self.nc = len(self.solutions), len(self.compounds)
        self.g_compounds = np.array([syn.compound_gibbs(c, T) for c in self.compounds])
        self.x_compounds = np.array([c.x_B for c in self.compounds])
        self.scale = R * T

    def split(self, v: np.ndarray) -> tuple[np.ndarray, np.ndarray]:
        return v[:self.ns + self.nc], v[self.ns + self.nc:]

    def _solutions(self, x: np.ndarray) -> tuple[np.ndarray, np.ndarray]:
        """G and dG/dx_B (J/mol) of each solution instance, from its chemical potentials
        (G = xA mu_A + xB mu_B, dG/dx_B = mu_B - mu_A)."""
        g, slope = [], []
        for s, xb in zip(self.solutions, x.tolist()):
            mua, mub = s.potentials(self.T, 1.0 - xb, xb)
            g.append((1.0 - xb) * mua + xb * mub)
            slope.append(mub - mua)
        return np.array(g), np.array(slope)

    def gibbs(self, v: np.ndarray) -> float:
        """J/mol of alloy."""
        n, x = self.split(v)
        g, _slope = self._solutions(x)
        return float(n[:self.ns] @ g + n[self.ns:] @ self.g_compounds)

    def gradient(self, v: np.ndarray) -> np.ndarray:
        n, x = self.split(v)
        g, slope = self._solutions(x)
        return np.concatenate([g, self.g_compounds, n[:self.ns] * slope])

    def balance(self, v: np.ndarray) -> np.ndarray:
        n, x = self.split(v)
        return np.array([n.sum() - 1.0, n[:self.ns] @ x + n[self.ns:] @ self.x_compounds - self.x0])

    def balance_jacobian(self, v: np.ndarray) -> np.ndarray:
        n, x = self.split(v)
        return np.vstack([np.concatenate([np.ones(self.ns + self.nc), np.zeros(self.ns)]),
                          np.concatenate([x, self.x_compounds, n[:self.ns]])])

    def minimise(self, rng: np.random.Generator) -> list[float]:
        """G (J/mol) reached from each feasible random start."""
        bounds = [(0.0, 1.0)] * (self.ns + self.nc) + [(_X_EDGE, 1.0 - _X_EDGE)] * self.ns
        out = []
        for _ in range(STARTS):
            v0 = np.concatenate([rng.dirichlet(np.ones(self.ns + self.nc)), rng.uniform(0.0, 1.0, self.ns)])
            r = minimize(lambda v: self.gibbs(v) / self.scale, v0, jac=lambda v: self.gradient(v) / self.scale,
                         method="SLSQP", bounds=bounds,
                         constraints=[{"type": "eq", "fun": self.balance, "jac": self.balance_jacobian}],
                         options={"ftol": 1e-15, "maxiter": 500})
            if np.max(np.abs(self.balance(r.x))) <= FEASIBLE:
                out.append(self.gibbs(r.x))
        return out


CASES = {
    "eutectic": topologies.eutectic,
    "peritectic": topologies.peritectic,
    "monotectic": topologies.monotectic,
    "compound": topologies.compound,
}


@pytest.mark.parametrize("name", list(CASES))
def test_minimiser_never_beats_the_engine(tmp_path, name):
    topo = CASES[name]()
    system = topo.synthetic.load(tmp_path, name)
    lo, hi = system.temperature_range_K
    rng = np.random.default_rng(20240611)
    reached = 0
    total = 0
    for T in np.linspace(lo + 25.0, hi - 25.0, 3):
        for x0 in (0.03, 0.2, 0.45, 0.62, 0.9):
            engine = equilibrate(system, float(T), x0).gibbs_J_per_mol
            found = TotalGibbs(topo.synthetic, float(T), x0).minimise(rng)
            assert len(found) >= STARTS // 2, f"most minimiser runs should end feasible at {T} K, x_B={x0}"
            best = min(found)
            assert best >= engine - GIBBS_TOLERANCE, f"SLSQP found {best!r} J/mol below the engine's {engine!r} at {T} K, x_B={x0}"
            total += 1
            reached += best <= engine + REACH_TOLERANCE
    assert reached == total
