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

For every shipped system of three or more elements, built from binary files, over its covered
compositions and temperatures (point equilibria on a coarse grid):

- a solid solution phase of the binaries is stable only with the composition of a binary that
  has it: where the phase's own two most abundant elements are A and B, the A-B binary it is
  built on has that phase (where the second element is below 2 at%, any binary of the main
  element). A ternary solution extends from its binary edges; a structure that no binary of its
  main elements forms, stable in the middle of the triangle or near an edge that lacks it, is an
  artefact of the energies of elements in structures they never take (lattice stabilities) and
  of pairs no binary file has fitted (F.N. Rhines, Phase Diagrams in Metallurgy, McGraw-Hill
  (1956), the chapters on ternary systems, recalled from memory: each solid solution of a
  ternary without ternary phases is the continuation of a binary's terminal or intermediate
  solution).
"""

from __future__ import annotations

import itertools
from functools import lru_cache
from pathlib import Path

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


#: Systems of three or more elements built from binary files (those with sublattice phases, such
#: as Fe-C-Si, whose binaries' melting points are not mapped, are checked in tests/unit/test_fe_c_si.py).
SHIPPED_MULTICOMPONENT = sorted(p.stem for p in shipped_folder().glob("*.toml") if p.name != "elements.toml"
                                and len(find_system(p.stem).elements) >= 3
                                and find_system(p.stem).document.get("builds_on")
                                and not unmapped_phases(find_system(p.stem)))
#: Grid of the multicomponent sweep: values of each gridded element over its covered range,
#: temperature step (K), and the least mole fraction of any element on the grid.
GRID_VALUES, MULTI_STEP_K, GRID_FLOOR = 8, 25.0, 0.005
#: Below this mole fraction the second element of a phase is a trace: any binary of the main element will do.
TRACE = 0.02


def _multicomponent_grid(system) -> list[np.ndarray]:
    """Compositions (mole fractions, the system's order) over the covered range: every element
    but the one with the widest covered range on a grid, that one the balance; where the grid's
    values leave the balance less than GRID_FLOOR, they are scaled down to leave it that much
    (points along the edge where the balance is a trace)."""
    ranges = system.element_ranges
    balance = int(np.argmax(ranges[:, 1] - ranges[:, 0]))
    gridded = [i for i in range(len(system.elements)) if i != balance]
    axes = [np.linspace(max(ranges[i, 0], GRID_FLOOR), min(ranges[i, 1], 1.0 - GRID_FLOOR), GRID_VALUES)
            for i in gridded]
    points = []
    for values in itertools.product(*axes):
        x = np.zeros(len(system.elements))
        x[gridded] = values
        x[gridded] *= min(1.0, (1.0 - GRID_FLOOR) / x.sum())
        x[balance] = 1.0 - x.sum()
        if system.covered(x):
            points.append(x)
    return points


def _at_percent(system, x: np.ndarray) -> str:
    """'Bi 0.5, Pb 42.7, Sn 56.8 at%'."""
    return ", ".join(f"{el} {100 * v:.1f}" for el, v in zip(system.elements, x)) + " at%"


def _edge(system, x: np.ndarray) -> set[str]:
    """The elements of the binary a phase of composition `x` continues: its two most abundant,
    or its main element alone where the second is a trace."""
    order = np.argsort(x)[::-1]
    return {system.elements[i] for i in (order[:1] if x[order[1]] < TRACE else order[:2])}


@pytest.mark.parametrize("name", SHIPPED_MULTICOMPONENT)
def test_binary_solid_solutions_stay_where_their_binaries_have_them(name):
    system = find_system(name)
    binaries = [find_system(Path(f).stem) for f in system.document["builds_on"]]
    solutions = {n for b in binaries for n in b.solutions if n != LIQUID}
    top = min(max(t for t in system.melting_points.values() if t is not None), system.covers_K[1])
    wrong = []
    for T in np.arange(max(300.0, system.covers_K[0]), top, MULTI_STEP_K):
        state = None
        for x in _multicomponent_grid(system):
            state = equilibrate(system, float(T), x, near=state)
            for share in state.phases:
                edge = _edge(system, share.x)
                holders = [b for b in binaries if edge <= set(b.elements)]
                if share.name in solutions and not any(share.name in b.phases for b in holders):
                    wrong.append(f"{share.name} ({_at_percent(system, share.x)}) stable at {T:.0f} K in the alloy "
                                 f"{_at_percent(system, x)}: no binary of {'-'.join(sorted(edge))} has it")
    assert not wrong, f"{name}: {len(wrong)} points, e.g. " + "; ".join(wrong[:4])
