"""A coarse physical-plausibility sweep over every shipped system, inside the range its model
covers, from 300 K to 300 K above its highest melting point (point equilibria on a coarse grid,
a few seconds in all):

- no liquid below the lowest reaction (or melting point) the diagram has with a liquid: a melt
  cannot be stable below every reaction it takes part in;
- nothing but liquid above the highest such temperature (common sense of a binary diagram: above
  the highest melting point, congruent point and liquid reaction everything has melted);
- no miscibility gap (a tie-line between two compositions of the same phase) that the file does
  not declare in its notes;
- no solution phase (stable somewhere in the sweep) whose excess Gibbs energy of mixing changes sign between 300 K and the top
  of the sweep, unless the file declares it: with L = a + b T the enthalpy of mixing is the a
  part alone, so a sign change of the excess energy means a temperature term large enough to
  turn an attraction into a repulsion (or back) inside the range, the usual mark of a term
  fitted to a phase diagram without calorimetry.

Declared exceptions below name the file's own words; each is a known limit, not a pass.
"""

from __future__ import annotations

from functools import lru_cache

import numpy as np
import pytest

from ladle.engine import find_system
from ladle.engine.diagrams.diagram import map_diagram
from ladle.engine.diagrams.mappable import unmapped_phases
from ladle.engine.files.loader import shipped_folder
from ladle.engine.minimize.equilibrium import equilibrate

#: The shipped systems whose whole diagram can be mapped (systems with sublattice phases, such as
#: Fe-C, are checked point by point in tests/unit/test_fe_c.py).
SHIPPED = sorted(p.stem for p in shipped_folder().glob("*.toml")
                 if p.name != "elements.toml" and not unmapped_phases(find_system(p.stem)))
LIQUID = "liquid"
#: Grid of the sweep: compositions across the covered range, temperature step (K).
COMPOSITIONS, STEP_K = 9, 20.0
#: Margin (K) around reaction temperatures, for the grid and the solver's precision.
MARGIN_K = 2.0

#: Miscibility gaps the files declare (system -> phase, and words of its notes that say so).
DECLARED_GAPS = {
    "ag-cu": ("fcc", "miscibility gap"),
    "cu-ni": ("fcc", "miscibility gap"),
    "ge-si": ("diamond", "miscibility gap"),
}
#: Phases whose excess Gibbs energy changes sign with temperature, as the files declare
#: (system -> phase, and words of that phase's notes that say so).
DECLARED_SIGN_CHANGES = {
    "al-si": ("diamond", "changes sign"),
    "pb-sb": ("fcc", "changes sign"),
}


def _temperatures(system) -> np.ndarray:
    top = max(t for t in system.melting_points.values() if t is not None) + 300.0
    return np.arange(300.0, top, STEP_K)


def _compositions(system) -> np.ndarray:
    lo, hi = system.covers
    return np.linspace(max(lo, 1e-3), min(hi, 1 - 1e-3), COMPOSITIONS)


@lru_cache(maxsize=None)
def _sweep(name: str) -> tuple[tuple[float, float, tuple[str, ...]], ...]:
    """(T in K, x_B, stable phase names) over the sweep's grid, once per system."""
    system = find_system(name)
    return tuple((float(T), float(x), equilibrate(system, float(T), float(x)).phase_names)
                 for T in _temperatures(system) for x in _compositions(system))


def _liquid_limits(system) -> tuple[float, float]:
    """The lowest and highest temperature (K) of a reaction, congruent point or melting point
    with a liquid, in the covered range."""
    diagram = map_diagram(system)
    temps = [i.temperature_K for i in diagram.invariants if any(n == LIQUID for n, _x in i.phases)]
    temps += [s.temperature_K for s in diagram.special_points if LIQUID in s.phases]
    temps += [t for t in system.melting_points.values() if t is not None]
    return min(temps), max(temps)


@pytest.mark.parametrize("name", SHIPPED)
def test_liquid_only_where_it_belongs(name):
    system = find_system(name)
    low, high = _liquid_limits(system)
    wrong = []
    for T, x, phases in _sweep(name):
        if LIQUID in phases and T < low - MARGIN_K:
            wrong.append(f"liquid at {T:.0f} K, {100 * x:.1f} at%, below the lowest liquid reaction {low:.1f} K")
        if phases != (LIQUID,) and T > high + MARGIN_K:
            wrong.append(f"{'+'.join(phases)} at {T:.0f} K, {100 * x:.1f} at%, above {high:.1f} K")
    assert not wrong, f"{name}: " + "; ".join(wrong[:5])


@pytest.mark.parametrize("name", SHIPPED)
def test_no_undeclared_miscibility_gap(name):
    system = find_system(name)
    declared = DECLARED_GAPS.get(name)
    if declared:
        texts = [system.notes] + [str(t.get("notes", "")) for t in system.document["phase"].values()]
        assert declared[1] in " ".join(texts).lower(), f"{name}: the file does not declare its {declared[0]} gap"
    gaps = {n for _T, _x, names in _sweep(name) for n in names if names.count(n) > 1}
    allowed = {declared[0]} if declared else set()
    assert gaps <= allowed, f"{name}: undeclared miscibility gap in {sorted(gaps - allowed)}"


R = 8.314462618      # J/(mol K), CODATA 2018 (exact)


def _excess_gibbs(phase, T: float, x_B: float) -> float:
    """Excess Gibbs energy of mixing (J/mol): G(x) - x_A G(A) - x_B G(B) - ideal mixing."""
    at = phase.at(T)
    xa, xb = 1.0 - x_B, x_B
    ideal = R * T * (xa * np.log(xa) + xb * np.log(xb))
    return float(at.gibbs(xa, xb) - xa * at.gibbs(1.0, 0.0) - xb * at.gibbs(0.0, 1.0) - ideal)


@pytest.mark.parametrize("name", SHIPPED)
def test_excess_energy_keeps_its_sign(name):
    system = find_system(name)
    T_low, T_high = 300.0, float(_temperatures(system)[-1])
    declared = DECLARED_SIGN_CHANGES.get(name)
    stable = {n for _T, _x, names in _sweep(name) for n in names}
    for pname, phase in system.phases.items():
        if phase.kind != "solution" or pname not in stable:     # a phase never stable in the range is not read
            continue
        if declared and declared[0] == pname:
            assert declared[1] in str(system.document["phase"][pname].get("notes", "")).lower(), name
            continue
        for x in _compositions(system):
            g1, g2 = _excess_gibbs(phase, T_low, float(x)), _excess_gibbs(phase, T_high, float(x))
            if min(abs(g1), abs(g2)) > 50.0:
                assert np.sign(g1) == np.sign(g2), (f"{name} {pname} at {100 * x:.0f} at%: excess Gibbs energy "
                                                    f"{g1:.0f} J/mol at {T_low:.0f} K, {g2:.0f} J/mol at {T_high:.0f} K")
