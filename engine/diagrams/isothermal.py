"""The isothermal section of a ternary system: the stable phases over the composition triangle
at one temperature, with tie-lines in the two-phase fields and the tie-triangles of the
three-phase fields.

Method: point equilibria (`equilibrate`) at the nodes of a triangular grid (each mole fraction a
multiple of 1/divisions), first on every other node (the grid of twice the spacing), each
started from its neighbour's answer; every other node is the middle of an edge of that coarse
grid and is solved only where the two coarse triangles beside the edge do not hold one phase
set at all their corners (there it takes that set: a field smaller than the coarse spacing
between equal corners is not seen, as one smaller than the fine spacing is not). Nodes are
grouped by their phase set; a two-phase node gives the tie-line through it (the compositions of
its two phases), a three-phase node the tie-triangle (its three phases' compositions, the same
for every node of the field up to the solver's tolerance). Temperatures in K, compositions in
mole fractions of the three elements.
"""

from __future__ import annotations

from dataclasses import dataclass, field

import numpy as np

from ..minimize.equilibrium import equilibrate

DEFAULT_DIVISIONS = 24
#: Tie-lines kept per two-phase field (spread over it).
TIE_LINES_PER_FIELD = 7
#: Triangle corners closer than this (mole fraction) are one corner.
_SAME_CORNER = 1e-3


@dataclass(frozen=True)
class TieLine:
    """A tie-line: its two phases and their compositions (mole fractions)."""

    phases: tuple[str, str]
    ends: tuple[tuple[float, ...], tuple[float, ...]]


@dataclass(frozen=True)
class SectionRegion:
    """The nodes of one phase set: how many, the composition nearest their middle, and the
    tie-lines (two phases) or tie-triangles (three phases: the phases' compositions) found."""

    phases: tuple[str, ...]
    nodes: int
    middle: tuple[float, ...]
    tie_lines: tuple[TieLine, ...] = ()
    triangles: tuple[tuple[tuple[float, ...], ...], ...] = ()


@dataclass(frozen=True)
class IsothermalSection:
    """The isothermal section of a ternary `system` at `temperature_K` (K)."""

    system: object = field(repr=False)
    temperature_K: float
    fields: tuple[SectionRegion, ...]
    warnings: tuple[str, ...] = ()

    def to_json(self) -> dict:
        """Plain JSON: every field with its phases, a point inside it, its tie-lines and
        tie-triangles; compositions as objects of mole fractions per element."""
        els = self.system.elements

        def comp(x) -> dict:
            return {el: float(v) for el, v in zip(els, x)}

        return {
            "system": self.system.name,
            "temperature_K": self.temperature_K,
            "fields": [{"phases": list(r.phases), "label_at": comp(r.middle),
                        "tie_lines": [{"phases": list(t.phases), "ends": [comp(t.ends[0]), comp(t.ends[1])]}
                                      for t in r.tie_lines],
                        "triangles": [[comp(c) for c in tri] for tri in r.triangles]} for r in self.fields],
            "warnings": list(self.warnings),
        }


def triangle_nodes(divisions: int) -> np.ndarray:
    """Every (x1, x2, x3) with each a multiple of 1/divisions, summing to 1: shape (k, 3)."""
    pts = [(divisions - j - k, j, k) for k in range(divisions + 1) for j in range(divisions + 1 - k)]
    return np.array(pts, dtype=float) / divisions


def _spread(points: np.ndarray, count: int) -> list[int]:
    """Indices of up to `count` points spread over the set (farthest-point order)."""
    chosen = [0]
    distance = np.linalg.norm(points - points[0], axis=1)
    while len(chosen) < min(count, len(points)):
        k = int(np.argmax(distance))
        if distance[k] <= 0.0:
            break
        chosen.append(k)
        distance = np.minimum(distance, np.linalg.norm(points - points[k], axis=1))
    return chosen


def covered_nodes(system, divisions: int) -> np.ndarray:
    """The grid nodes (mole fractions, shape (k, 3)) of the part of the triangle the model
    covers: the whole triangle's `divisions` steps per side, or a finer grid, about as many nodes,
    over a smaller covered range (System.element_ranges; a triangle of n steps holds n^2 / 2 nodes, a
    box of widths w1, w2 about w1 w2 n^2)."""
    return covered_grid(system, divisions)[1]


def covered_grid(system, divisions: int) -> tuple[int, np.ndarray]:
    """(steps per side, the nodes of `covered_nodes`)."""
    ranges = system.element_ranges
    widths = np.sort(ranges[:, 1] - ranges[:, 0])
    steps = max(divisions, int(np.ceil(divisions / np.sqrt(2.0 * widths[0] * widths[1]))))
    nodes = triangle_nodes(divisions) if steps == divisions else _nodes_within(ranges, steps)
    return steps, nodes[system.covered(nodes)]


def _coarse_then_fine(system, temperature_K: float, steps: int, nodes: np.ndarray) -> list:
    """The point equilibrium of every node (None where a node takes the phase set of the coarse
    corners around it) and each node's phase set: see the module's docstring."""
    jk = [tuple(v) for v in np.rint(nodes[:, 1:] * steps).astype(int)]
    index = {v: i for i, v in enumerate(jk)}
    eqs: list = [None] * len(nodes)
    keys: list = [None] * len(nodes)

    def solve(i: int, start) -> None:
        x = nodes[i]
        eqs[i] = equilibrate(system, temperature_K, x) if start is None else \
            equilibrate(system, temperature_K, x, near=start)
        keys[i] = tuple(sorted(eqs[i].phase_names))

    last = None
    for i, (j, k) in enumerate(jk):
        if j % 2 == 0 and k % 2 == 0:
            solve(i, last)            # the coarse nodes in the grid's order: each beside the one before
            last = eqs[i]
    for i, (j, k) in enumerate(jk):
        if keys[i] is not None:
            continue
        if k % 2 == 0:          # the middle of an edge along j; the coarse triangles' third corners
            ends, thirds = ((j - 1, k), (j + 1, k)), ((j - 1, k + 2), (j + 1, k - 2))
        elif j % 2 == 0:        # along k
            ends, thirds = ((j, k - 1), (j, k + 1)), ((j + 2, k - 1), (j - 2, k + 1))
        else:                   # along the third direction (first mole fraction constant)
            ends, thirds = ((j - 1, k + 1), (j + 1, k - 1)), ((j - 1, k - 1), (j + 1, k + 1))
        around = {keys[index[v]] for v in ends + thirds if v in index}
        if all(v in index for v in ends) and len(around) == 1:
            keys[i] = around.pop()
        else:                   # started from the end with more phases (Newton drops one that vanishes)
            starts = [eqs[index[v]] for v in ends if v in index and eqs[index[v]] is not None]
            solve(i, max(starts, key=lambda eq: len(eq.phases)) if starts else last)
    return list(zip(eqs, keys))


def _nodes_within(ranges: np.ndarray, steps: int) -> np.ndarray:
    """The nodes of a grid of `steps` steps per side whose second and third mole fractions lie
    in their `ranges` ((3, 2) mole fractions)."""
    j, k = (np.arange(int(np.ceil(lo * steps - 1e-9)), int(np.floor(hi * steps + 1e-9)) + 1) for lo, hi in ranges[1:])
    jj, kk = np.meshgrid(j, k, indexing="ij")
    jj, kk = jj.ravel(), kk.ravel()
    keep = jj + kk <= steps
    return np.column_stack([steps - jj[keep] - kk[keep], jj[keep], kk[keep]]).astype(float) / steps


def map_isothermal(system, temperature_K: float, divisions: int = DEFAULT_DIVISIONS) -> IsothermalSection:
    """The isothermal section of the ternary `system` at temperature_K (K) on a grid of
    `divisions` steps per side. Raises ValueError for a system of other than three elements."""
    if len(system.elements) != 3:
        raise ValueError(f"an isothermal section on a triangle needs a ternary system; {system.name} has "
                         f"{len(system.elements)} elements")
    steps, nodes = covered_grid(system, divisions)
    groups: dict[tuple[str, ...], list] = {}
    warnings = []
    for x, (eq, key) in zip(nodes, _coarse_then_fine(system, temperature_K, steps, nodes)):
        if eq is not None and not eq.converged:
            warnings.append(f"the equilibrium at {', '.join(f'{v:.3f}' for v in x)} did not converge")
        groups.setdefault(key, []).append((x, eq))
    fields = []
    for phases, members in sorted(groups.items(), key=lambda item: -len(item[1])):
        xs = np.array([x for x, _ in members])
        middle = xs[int(np.argmin(np.linalg.norm(xs - xs.mean(axis=0), axis=1)))]
        ties, triangles = [], []
        solved = [(x, eq) for x, eq in members if eq is not None]
        if len(phases) == 2:
            for k in _spread(np.array([x for x, _ in solved]), TIE_LINES_PER_FIELD):
                eq = solved[k][1]
                a, b = eq.phases
                ties.append(TieLine((a.name, b.name), (tuple(float(v) for v in a.x), tuple(float(v) for v in b.x))))
        elif len(phases) == 3:
            for _x, eq in solved:
                corners = tuple(tuple(float(v) for v in p.x) for p in sorted(eq.phases, key=lambda p: p.name))
                if not any(max(np.max(np.abs(np.array(c) - np.array(d))) for c, d in zip(corners, t)) < _SAME_CORNER
                           for t in triangles):
                    triangles.append(corners)
        fields.append(SectionRegion(phases, len(members), tuple(float(v) for v in middle), tuple(ties),
                                     tuple(triangles)))
    if system.covers_elements:
        warnings.append(f"mapped only over the range this model covers ({system.covered_range_text()})")
    return IsothermalSection(system, float(temperature_K), tuple(fields), tuple(dict.fromkeys(warnings)))
