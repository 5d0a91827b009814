"""Whole diagrams of synthetic systems, one per topology (issue 3): simple eutectic, peritectic,
monotectic, eutectoid, compound melting congruently between two eutectics, congruent minimum of
a solution, retrograde solvus (tests/unit/topologies.py).

For each: every invariant is found once and classified as designed; at the reported temperature
and compositions the three phases have equal chemical potentials of both elements to 1e-6 J/mol,
computed here from the phase parameters (not by the engine); and a dense brute-force scan of
point equilibria agrees with the traced two-phase fields everywhere.

Sources of the check values:
- Three-phase condition: equal chemical potential of each element in every phase (J.W. Gibbs;
  D.R. Gaskell and D.E. Laughlin, Introduction to the Thermodynamics of Materials, 6th ed., CRC
  Press (2017), ch. 10), potentials from the Redlich-Kister partial molar form (synthetic.py).
- Critical point of a symmetric regular liquid: Tc = L0 / (2R) (D.A. Porter, K.E. Easterling
  and M.Y. Sherif, Phase Transformations in Metals and Alloys, 3rd ed., CRC Press (2009), ch. 1).
- Retrograde solvus of two ideal solutions: the ideal two-phase closed form x = (1 - k_A) /
  (k_B - k_A), k_i = exp(-dG_i / RT) (Gaskell and Laughlin, 6th ed., ch. 10); its maximum located
  with scipy.optimize.minimize_scalar.
"""

from __future__ import annotations

import numpy as np
import pytest
from scipy.optimize import minimize_scalar

from ladle.engine import equilibrate
from ladle.engine.diagrams.diagram import map_diagram

import topologies
from synthetic import R, Compound, Solution, expression_value, ideal_two_phase

#: Chemical potentials of the three phases agree to this (J/mol), from the issue.
POTENTIAL_TOLERANCE = 1e-6
#: Scan grid: temperature levels and compositions (mole fraction of B).
SCAN_LEVELS = 60
SCAN_X = np.linspace(0.004, 0.996, 125)
#: A scan point counts as inside a traced field only this far (x_B) inside its boundaries, which
#: are drawn by linear interpolation between traced tie-lines (the tracer keeps that
#: interpolation within 1.5e-3 of the true boundary), and this far (K) from the field's ends.
X_MARGIN = 5e-3
T_MARGIN = 1.0

@pytest.fixture(scope="module")
def mapped(tmp_path_factory):
    """name -> (Topology, System, PhaseDiagram)."""
    folder = tmp_path_factory.mktemp("topologies")
    out = {}
    for make in topologies.ALL:
        topo = make()
        system = topo.synthetic.load(folder, topo.name)
        out[topo.name] = (topo, system, map_diagram(system))
    return out


NAMES = [make().name for make in topologies.ALL]


# --- invariants -----------------------------------------------------------------------------------
@pytest.mark.parametrize("name", NAMES)
def test_each_invariant_found_once_and_classified(mapped, name):
    topo, _system, d = mapped[name]
    found = sorted((inv.kind, tuple(n for n, _x in inv.phases)) for inv in d.invariants)
    assert found == sorted(topo.invariants)
    assert not d.warnings


def potentials(topo, name: str, T: float, x_B: float) -> tuple[float, float]:
    p = topo.synthetic.phase(name)
    assert isinstance(p, Solution)
    return p.potentials(T, 1.0 - x_B, x_B)


@pytest.mark.parametrize("name", NAMES)
def test_invariants_satisfy_three_phase_conditions(mapped, name):
    topo, _system, d = mapped[name]
    for inv in d.invariants:
        T = inv.temperature_K
        solutions = [(n, x) for n, x in inv.phases if isinstance(topo.synthetic.phase(n), Solution)]
        mus = [potentials(topo, n, T, x) for n, x in solutions]
        for mu in mus[1:]:
            assert mu[0] == pytest.approx(mus[0][0], abs=POTENTIAL_TOLERANCE), f"mu_A, {inv}"
            assert mu[1] == pytest.approx(mus[0][1], abs=POTENTIAL_TOLERANCE), f"mu_B, {inv}"
        for n, x in inv.phases:
            c = topo.synthetic.phase(n)
            if isinstance(c, Compound):
                # The common tangent line passes through the compound's G.
                line = mus[0][0] * (1.0 - c.x_B) + mus[0][1] * c.x_B
                assert line == pytest.approx(topo.synthetic.compound_gibbs(c, T), abs=POTENTIAL_TOLERANCE), f"{inv}"
        xs = [x for _n, x in inv.phases]
        assert xs == sorted(xs)


# --- special points -------------------------------------------------------------------------------
def test_compound_melts_congruently_above_both_eutectics(mapped):
    topo, _system, d = mapped["compound"]
    (cong,) = [p for p in d.special_points if p.kind == "congruent"]
    ab = topo.synthetic.phase("AB")
    assert cong.x_B == pytest.approx(0.5, abs=1e-12)
    # Liquid of the compound's composition has the compound's G at the congruent temperature.
    g_liquid = topo.synthetic.phase_gibbs("liquid", cong.temperature_K, 0.5)
    assert g_liquid == pytest.approx(topo.synthetic.compound_gibbs(ab, cong.temperature_K), abs=POTENTIAL_TOLERANCE)
    assert all(cong.temperature_K > inv.temperature_K for inv in d.invariants)


def test_solution_congruent_minimum(mapped):
    topo, system, d = mapped["minimum"]
    (cong,) = [p for p in d.special_points if p.kind == "congruent"]
    T, x = cong.temperature_K, cong.x_B
    # Liquid and solid of one composition with equal potentials of both elements.
    mu_l, mu_s = potentials(topo, "liquid", T, x), potentials(topo, "fcc", T, x)
    assert mu_l[0] == pytest.approx(mu_s[0], abs=POTENTIAL_TOLERANCE)
    assert mu_l[1] == pytest.approx(mu_s[1], abs=POTENTIAL_TOLERANCE)
    # A minimum: well below both melting points (the design puts it about 170 K below the
    # lower one), and the two fields meet there from both sides.
    assert T < min(system.melting_points.values()) - 50.0
    assert sorted(f.phases for f in d.fields) == [("fcc", "liquid"), ("liquid", "fcc")]
    for f in d.fields:
        assert f.T[0] == pytest.approx(T, abs=1e-6)


def test_monotectic_liquid_gap_critical_point(mapped):
    topo, _system, d = mapped["monotectic"]
    (crit,) = [p for p in d.special_points if p.kind == "critical"]
    L0 = topo.synthetic.phase("liquid").L[0]["a"]
    assert crit.temperature_K == pytest.approx(L0 / (2.0 * R), abs=0.01)   # Porter et al., ch. 1
    assert crit.x_B == pytest.approx(0.5, abs=1e-6)


def _retrograde_solvus(T: float) -> float:
    """x_B of fcc on the fcc/hcp solvus of the retrograde system (ideal closed form)."""
    dg_a = topologies.RETRO_HCP_A                    # G_A(hcp) - G_A(fcc)
    dg_b = -expression_value({"a": topologies.RETRO_A, "b": topologies.RETRO_B, "c": topologies.RETRO_C}, T)
    return ideal_two_phase(dg_a, dg_b, T)[0]


def test_retrograde_solvus(mapped):
    _topo, _system, d = mapped["retrograde"]
    (f,) = d.fields
    assert f.phases == ("fcc", "hcp")
    for T, x in zip(f.T, f.x[:, 0]):
        assert x == pytest.approx(_retrograde_solvus(float(T)), abs=1e-6), f"solvus at {T} K"
    peak = minimize_scalar(lambda T: -_retrograde_solvus(T), bounds=(600.0, 1400.0), method="bounded",
                           options={"xatol": 1e-6})
    T_peak, x_peak = peak.x, -peak.fun
    lo, hi = f.T[0], f.T[-1]
    assert lo + 100.0 < T_peak < hi - 100.0
    # Retrograde: the traced solubility rises to the peak and falls after it; the highest
    # traced point is the traced tie-line next to the peak.
    i = int(np.argmax(f.x[:, 0]))
    assert abs(f.T[i] - T_peak) <= np.max(np.diff(f.T))
    assert f.x[0, 0] < x_peak - 5e-3 and f.x[-1, 0] < x_peak - 5e-3
    assert equilibrate(_system, T_peak, x_peak - 1e-3).phase_names == ("fcc",)
    assert equilibrate(_system, hi - 1.0, x_peak - 1e-3).phase_names == ("fcc", "hcp")


# --- brute-force scan -------------------------------------------------------------------------------
def _range_at(f, T: float) -> tuple[float, float] | None:
    if not f.T[0] <= T <= f.T[-1]:
        return None
    return float(np.interp(T, f.T, f.x[:, 0])), float(np.interp(T, f.T, f.x[:, 1]))


def _scan_levels(system, d) -> np.ndarray:
    """Scan temperatures across the window, none within T_MARGIN of a reaction or special point."""
    lo, hi = d.temperature_range_K
    levels = np.linspace(lo + 0.5 * T_MARGIN, hi - 0.5 * T_MARGIN, SCAN_LEVELS) + 0.123
    marks = [i.temperature_K for i in d.invariants] + [p.temperature_K for p in d.special_points]
    return np.array([T for T in levels if T < hi and all(abs(T - m) > T_MARGIN for m in marks)])


@pytest.mark.parametrize("name", NAMES)
def test_brute_force_scan_agrees_with_traced_fields(mapped, name):
    _topo, system, d = mapped[name]
    missing, phantom = [], []
    seen_pairs, checked_fields = set(), set()
    for T in _scan_levels(system, d):
        ranges = [(f.phases, _range_at(f, float(T)), k) for k, f in enumerate(d.fields)]
        ranges = [(p, r, k) for p, r, k in ranges if r is not None]
        for x in SCAN_X:
            got = equilibrate(system, float(T), float(x)).phase_names
            if len(got) == 2:
                seen_pairs.add(got)
                # A two-phase answer lies in a traced field of that pair (at the boundary's accuracy).
                if not any(p == got and r[0] - X_MARGIN <= x <= r[1] + X_MARGIN for p, r, _k in ranges):
                    missing.append((float(T), float(x), got))
            for p, r, k in ranges:
                f = d.fields[k]
                inside = r[0] + X_MARGIN < x < r[1] - X_MARGIN and f.T[0] + T_MARGIN < T < f.T[-1] - T_MARGIN
                if inside:
                    checked_fields.add(k)
                    if got != p:
                        phantom.append((float(T), float(x), p, got))
    assert not missing, f"scan finds two-phase states outside every traced field: {missing[:5]}"
    assert not phantom, f"traced fields where the scan finds other phases: {phantom[:5]}"
    assert seen_pairs == {d.fields[k].phases for k in checked_fields}
    # Every field the scan could not look inside is thin: in composition, or in temperature
    # (spanning less than two scan levels).
    lo, hi = d.temperature_range_K
    spacing = (hi - lo) / SCAN_LEVELS
    for k, f in enumerate(d.fields):
        if k not in checked_fields:
            width = float(np.max(f.x[:, 1] - f.x[:, 0]))
            assert width < 4 * X_MARGIN or f.T[-1] - f.T[0] < 2 * (spacing + T_MARGIN), \
                f"field {f.phases} ({f.T[0]:.1f}-{f.T[-1]:.1f} K, up to {width:.3f} wide) was never checked"
