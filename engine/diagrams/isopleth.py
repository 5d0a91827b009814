"""Isopleths (vertical sections) of a system of any number of elements: temperature against one
element's content, every other element held as given (the balance element takes up the rest),
mapped as zero-phase-fraction lines: each line is where one phase's amount goes to zero
(J.E. Morral and H. Gupta, Scripta Metall. Mater. 25 (1991) 1393).

Method: point equilibria (`equilibrate`) on a grid over the section (columns of composition,
rows of temperature; every other row and column first, the nodes between them only near a
change: `_Mapper.grid`). Wherever two neighbouring nodes differ in their stable phases, the
change on the edge between them is narrowed to its tolerance, tried first where the same change
lies on the neighbouring parallel edges; each change found is a point of the zero-phase-
fraction line of every phase present on one side only. Within each grid cell the points of one
phase's line are joined (marching squares: W.E. Lorensen and H.E. Cline, Comput. Graph. 21
(1987) 163, in two dimensions), and the pieces chained into lines, split where the phase sets on
the two sides change, so that every line carries one pair of phase sets. A field is a connected
set of nodes with one phase set; an invariant reaction is a change where N + 1 phases meet (N
elements), at one temperature across the section.

The section runs from composition `start` (u = 0) to `end` (u = 1), straight in the chosen
basis ("wt": mass fractions, "at": mole fractions). Temperatures in K, compositions as fractions.
"""

from __future__ import annotations

from collections import defaultdict
from dataclasses import dataclass, field

import numpy as np

from ..minimize.equilibrium import equilibrate
from .phase_change import narrow_change, phase_set
from ..units import mole_from_mass

#: Grid of the section: columns of composition and rows of temperature.
DEFAULT_COLUMNS = 17
DEFAULT_ROWS = 21
#: Each change on an edge is bracketed to this share of the edge.
EDGE_TOLERANCE = 1e-3
#: An edge holding several changes is split at most this many times.
_MAX_SPLITS = 6
#: Changes where N + 1 phases meet within this many K are one invariant reaction.
_SAME_INVARIANT_K = 0.5


@dataclass(frozen=True)
class ZeroFractionLine:
    """Where `phase`'s amount goes to zero: `with_phase` is the phase set on the side that holds
    it, `without_phase` the set on the other side; points are (u, T in K)."""

    phase: str
    with_phase: tuple[str, ...]
    without_phase: tuple[str, ...]
    points: tuple[tuple[float, float], ...]


@dataclass(frozen=True)
class SectionField:
    """A connected region of one phase set: its nodes' (u, T) and the node nearest its middle."""

    phases: tuple[str, ...]
    nodes: tuple[tuple[float, float], ...]
    middle: tuple[float, float]


@dataclass(frozen=True)
class SectionInvariant:
    """An invariant reaction crossed by the section: its temperature (K), the N + 1 phases that
    meet, and the range of u over which the section meets it."""

    temperature_K: float
    phases: tuple[str, ...]
    u_range: tuple[float, float]


@dataclass(frozen=True)
class Isopleth:
    """A mapped isopleth of `system` from `start` to `end` (fractions of every element in
    `basis`), with `element` the one that varies."""

    system: object = field(repr=False)
    start: tuple[float, ...]
    end: tuple[float, ...]
    basis: str
    element: str
    temperature_range_K: tuple[float, float]
    lines: tuple[ZeroFractionLine, ...]
    fields: tuple[SectionField, ...]
    invariants: tuple[SectionInvariant, ...]
    warnings: tuple[str, ...] = ()

    def content(self, u: float) -> float:
        """The varying element's fraction (in `basis`) at u."""
        i = self.system.elements.index(self.element)
        return self.start[i] + u * (self.end[i] - self.start[i])

    def mole_fractions(self, u: float) -> np.ndarray:
        """Mole fractions of every element at u."""
        return section_mole_fractions(self.system, self.start, self.end, self.basis, np.array([u]))[0]

    def to_json(self) -> dict:
        """Plain JSON: the axis, the held contents, every line with the phase sets on both sides,
        the fields and the invariant reactions; compositions as the varying element's fraction in
        the basis."""
        els = self.system.elements

        def point(u: float, T: float) -> list[float]:
            return [float(self.content(u)), float(T)]

        return {
            "system": self.system.name,
            "element": self.element,
            "basis": self.basis,
            "point_order": [f"{self.element} fraction ({'mass' if self.basis == 'wt' else 'mole'})", "temperature_K"],
            "start": {el: float(v) for el, v in zip(els, self.start)},
            "end": {el: float(v) for el, v in zip(els, self.end)},
            "temperature_range_K": list(self.temperature_range_K),
            "lines": [{"phase": ln.phase, "with": list(ln.with_phase), "without": list(ln.without_phase),
                       "points": [point(u, T) for u, T in ln.points]} for ln in self.lines],
            "fields": [{"phases": list(f.phases), "label_at": point(*f.middle)} for f in self.fields],
            "invariants": [{"temperature_K": inv.temperature_K, "phases": list(inv.phases),
                            "from": float(self.content(inv.u_range[0])), "to": float(self.content(inv.u_range[1]))}
                           for inv in self.invariants],
            "warnings": list(self.warnings),
        }


def section_mole_fractions(system, start, end, basis: str, u: np.ndarray) -> np.ndarray:
    """Mole fractions (len(u), N) along the section at parameters u (0 at `start`, 1 at `end`)."""
    start, end = np.asarray(start, dtype=float), np.asarray(end, dtype=float)
    f = start[None, :] + np.asarray(u, dtype=float)[:, None] * (end - start)[None, :]
    f = np.clip(f, 0.0, None)
    f /= f.sum(axis=1, keepdims=True)
    return mole_from_mass(f, system.molar_mass) if basis == "wt" else f


def _changed(a: tuple[str, ...], b: tuple[str, ...]) -> set[str]:
    """Phases present on one side only (a phase counted twice on one side, once on the other:
    the second composition set appears)."""
    out = set()
    for name in set(a) | set(b):
        if a.count(name) != b.count(name):
            out.add(name)
    return out


class _Mapper:
    """Point equilibria of one section."""

    def __init__(self, system, start, end, basis: str, span_K: float = 1.0) -> None:
        self.system, self.start, self.end, self.basis = system, start, end, basis
        self.span_K = span_K                   # the temperature range mapped (K)
        self.n = len(system.elements)
        self.calls = 0
        self.warnings: list[str] = []
        self.invariant_K: list[float] = []    # temperatures (K) of invariant reactions found so far
        # changes found so far, per (edge direction, set on one side, set on the other):
        # [(the edge's fixed coordinate, where along it the change lies)], u or T (K)
        self.crossings: dict[tuple, list[tuple[float, float]]] = defaultdict(list)

    def eq_at(self, u: float, T: float, near=None):
        """The point equilibrium at u and T (K); `near`, one at the same T and a nearby u, starts
        the minimiser there (neighbours on a row of the grid, probes on a horizontal edge)."""
        x = section_mole_fractions(self.system, self.start, self.end, self.basis, np.array([u]))[0]
        self.calls += 1
        if self.n == 2:
            eq = equilibrate(self.system, T, float(x[1]))
        elif near is not None and near.temperature_K == T:
            eq = equilibrate(self.system, T, x, near=near)
        else:
            eq = equilibrate(self.system, T, x)
        if not eq.converged:
            self.warnings.append(f"the equilibrium at {T:.2f} K, u = {u:.4f} did not converge")
        return eq

    def changes(self, a: tuple[float, float], b: tuple[float, float], ea, eb, depth: int = 0) -> list:
        """Every change between points a and b ((u, T) each; point equilibria ea, eb):
        [(point, set on a's side, set on b's side)], in order from a to b. The middle is looked
        at once where more than one phase differs; where it holds a third phase set both halves
        are searched, else one change is narrowed to EDGE_TOLERANCE of the edge
        (phase_change.narrow_change). Where that change does not lead from ea's set to eb's (a
        further phase set lies between, such as a thin three-phase field above an invariant),
        the rest of the edge on either side of it is searched the same way. A change on a
        column where N + 1 phases meet (an invariant reaction, flat in temperature) is first
        tried at the temperatures of invariants found on other columns (two point equilibria),
        and the rest of the edge searched on either side where one is found there."""
        ka, kb = phase_set(ea), phase_set(eb)
        if ka == kb:
            return []

        def at(t: float) -> tuple[float, float]:
            return a[0] + t * (b[0] - a[0]), a[1] + t * (b[1] - a[1])

        start = ea if len(ea.phases) >= len(eb.phases) else eb

        def probe(t: float):
            # on a row, the end with more phases starts the minimiser (Newton drops a phase that vanishes)
            return self.eq_at(*at(t), near=start)

        invariant = a[0] == b[0] and len(set(ka) | set(kb)) > self.n
        if invariant:                      # an invariant reaction found on another column: try its temperature
            for T in self.invariant_K:
                t = (T - a[1]) / (b[1] - a[1])
                if EDGE_TOLERANCE < t < 1.0 - EDGE_TOLERANCE:
                    t_above, t_below = t - 0.4 * EDGE_TOLERANCE, t + 0.4 * EDGE_TOLERANCE
                    above, below = self.eq_at(*at(t_above)), self.eq_at(*at(t_below))
                    k_above, k_below = phase_set(above), phase_set(below)
                    if k_above != k_below and len(set(k_above) | set(k_below)) > self.n:
                        found = [(at(t), k_above, k_below)]      # and the rest of the edge on either side
                        if k_above != ka and depth < _MAX_SPLITS:
                            found = self.changes(a, at(t_above), ea, above, depth + 1) + found
                        if k_below != kb and depth < _MAX_SPLITS:
                            found += self.changes(at(t_below), b, below, eb, depth + 1)
                        return found
        lo, hi, lo_eq, hi_eq = 0.0, 1.0, ea, eb
        if len(_changed(ka, kb)) > 1:              # (one phase appears: one zero-phase-fraction line, as a rule)
            mid = probe(0.5)
            km = phase_set(mid)
            if km not in (ka, kb) and depth < _MAX_SPLITS:
                return self.changes(a, at(0.5), ea, mid, depth + 1) + self.changes(at(0.5), b, mid, eb, depth + 1)
            lo, hi, lo_eq, hi_eq = (0.0, 0.5, ea, mid) if km != ka else (0.5, 1.0, mid, eb)
        column = a[0] == b[0]
        predicted = self._predicted(column, a, b, phase_set(lo_eq), phase_set(hi_eq)) if (lo, hi) == (0.0, 1.0) else None
        near, far, near_eq, far_eq = narrow_change(probe, lo, hi, phase_set(lo_eq), lo_eq,
                                                   hi_eq, EDGE_TOLERANCE, self.system, predicted)
        point = at(0.5 * (near + far))
        k_near, k_far = phase_set(near_eq), phase_set(far_eq)
        self.crossings[(column, k_near, k_far)].append((point[0], point[1]) if column else (point[1], point[0]))
        if invariant and k_near == ka and k_far == kb:
            self.invariant_K.append(point[1])
        found = [(point, k_near, k_far)]
        if depth < _MAX_SPLITS:
            if k_near != phase_set(lo_eq):
                found = self.changes(at(lo), at(near), lo_eq, near_eq, depth + 1) + found
            if k_far != phase_set(hi_eq):
                found += self.changes(at(far), at(hi), far_eq, hi_eq, depth + 1)
        return found

    def _predicted(self, column: bool, a: tuple[float, float], b: tuple[float, float], ka, kb) -> float | None:
        """Where along the edge from a to b ((u, T) each, 0 at a, 1 at b) the change from ka to
        kb is expected: the same change on the two nearest parallel edges within a fifth of the
        section (continuation: extrapolated along the line they make, or the nearest's place
        where only one is known); None where none is known."""
        fixed, start, length = (a[0], a[1], b[1] - a[1]) if column else (a[1], a[0], b[0] - a[0])
        reach = 0.2 if column else 0.2 * self.span_K
        known = sorted((abs(f - fixed), f, v) for f, v in self.crossings.get((column, ka, kb), ())
                       if 0 < abs(f - fixed) <= reach)
        if not known:
            return None
        if len(known) == 1 or known[0][1] == known[1][1]:
            value = known[0][2]
        else:
            (_, f1, v1), (_, f2, v2) = known[:2]
            value = v1 + (fixed - f1) * (v2 - v1) / (f2 - f1)
        return (value - start) / length

    def grid(self, us: np.ndarray, Ts: np.ndarray) -> tuple[list[list], list[list[tuple[str, ...]]]]:
        """Point equilibria and phase sets of the grid's nodes (rows of temperature `Ts`,
        columns of parameter `us`): every other row and column first (the coarse grid); a node
        between coarse nodes is solved only where the coarse nodes around it (the two coarse
        cells beside its coarse edge, or its coarse cell with its edges' middles) do not all hold
        one phase set, else it takes that set; then every node whose set differs from a
        neighbour's is solved, until none is left unsolved beside a change (a field smaller than
        the coarse spacing between equal nodes is not seen, as one smaller than the grid's is
        not). Each node starts from a solved node of its row (the same temperature)."""
        rows, columns = len(Ts), len(us)
        eqs: list[list] = [[None] * columns for _ in range(rows)]
        keys: list[list] = [[None] * columns for _ in range(rows)]

        def solve(r: int, c: int) -> None:
            row = [(abs(c - j), j) for j in range(columns) if eqs[r][j] is not None]
            near = eqs[r][min(row)[1]] if row else None
            eqs[r][c] = self.eq_at(float(us[c]), float(Ts[r]), near=near)
            keys[r][c] = phase_set(eqs[r][c])

        def settle(r: int, c: int, around: list[tuple[int, int]]) -> None:
            # solved where a coarse node beyond it is missing (the grid's last row or column is odd)
            beyond = r + (r % 2) < rows and c + (c % 2) < columns
            found = {keys[i][j] for i, j in around if 0 <= i < rows and 0 <= j < columns}
            if beyond and len(found) == 1 and None not in found:
                keys[r][c] = found.pop()
            else:
                solve(r, c)

        for r in range(0, rows, 2):
            for c in range(0, columns, 2):
                solve(r, c)
        for r in range(rows):
            for c in range(columns):
                if r % 2 == 0 and c % 2 == 1:        # the middle of a coarse row edge
                    settle(r, c, [(r + i, c + j) for i in (-2, 0, 2) for j in (-1, 1)])
                elif r % 2 == 1 and c % 2 == 0:      # the middle of a coarse column edge
                    settle(r, c, [(r + i, c + j) for i in (-1, 1) for j in (-2, 0, 2)])
        for r in range(1, rows, 2):
            for c in range(1, columns, 2):          # the middle of a coarse cell
                settle(r, c, [(r + i, c + j) for i in (-1, 0, 1) for j in (-1, 0, 1) if (i, j) != (0, 0)])
        changed = True
        while changed:
            changed = False
            for r in range(rows):
                for c in range(columns):
                    for i, j in ((r, c + 1), (r + 1, c)):
                        if i < rows and j < columns and keys[r][c] != keys[i][j]:
                            for a, b in ((r, c), (i, j)):
                                if eqs[a][b] is None:
                                    solve(a, b)
                                    changed = True
        return eqs, keys


def map_isopleth(system, start, end, basis: str, element: str, temperature_range_K: tuple[float, float] | None = None,
                 columns: int = DEFAULT_COLUMNS, rows: int = DEFAULT_ROWS) -> Isopleth:
    """The isopleth of `system` from `start` to `end` (fractions of every element in `basis`,
    "wt" or "at", each summing to 1) with `element` varying, between the temperatures of
    `temperature_range_K` (default: the system's diagram window). Raises ValueError with one
    line for a bad section."""
    start, end = tuple(float(v) for v in start), tuple(float(v) for v in end)
    if len(start) != len(system.elements) or len(end) != len(system.elements):
        raise ValueError(f"a section needs {len(system.elements)} fractions at each end")
    if min(start + end) < 0.0 or abs(sum(start) - 1.0) > 1e-9 or abs(sum(end) - 1.0) > 1e-9:
        raise ValueError("a section's ends must hold non-negative fractions summing to 1")
    T_lo, T_hi = temperature_range_K or system.temperature_range_K
    start, end, clipped = covered_part(system, start, end, basis)
    mapper = _Mapper(system, start, end, basis, float(T_hi - T_lo))
    us = np.linspace(0.0, 1.0, columns)
    Ts = np.linspace(T_hi, T_lo, rows)
    eqs, keys = mapper.grid(us, Ts)

    # edge points: per grid edge, the changes found on it
    edges: dict[tuple, list] = {}
    for r in range(rows):
        for c in range(columns):
            here = (float(us[c]), float(Ts[r]))
            if c + 1 < columns:
                edges[("h", r, c)] = [] if keys[r][c] == keys[r][c + 1] else \
                    mapper.changes(here, (float(us[c + 1]), float(Ts[r])), eqs[r][c], eqs[r][c + 1])
            if r + 1 < rows:
                edges[("v", r, c)] = [] if keys[r][c] == keys[r + 1][c] else \
                    mapper.changes(here, (float(us[c]), float(Ts[r + 1])), eqs[r][c], eqs[r + 1][c])

    lines = _lines(edges, rows, columns)
    fields = _fields(keys, us, Ts)
    invariants = _invariants(edges, len(system.elements))
    return Isopleth(system, start, end, basis, element, (float(T_lo), float(T_hi)), tuple(lines), tuple(fields),
                    tuple(invariants), tuple(dict.fromkeys(clipped + mapper.warnings)))


def covered_part(system, start: tuple[float, ...], end: tuple[float, ...],
                 basis: str) -> tuple[tuple[float, ...], tuple[float, ...], list[str]]:
    """(start, end, warnings): the part of the section from `start` to `end` (fractions in
    `basis`) that lies in the range the model covers (System.element_ranges), with a warning
    where that cut it short. Each element's mole fraction is a ratio of two linear functions of
    the section's parameter, so each bound is one linear inequality in it. Raises ValueError with
    one line where no part of the section is covered."""
    a, b = np.asarray(start), np.asarray(end) - np.asarray(start)
    per_mole = 1.0 / np.asarray(system.molar_mass) if basis == "wt" else np.ones(len(a))
    na, nb = a * per_mole, b * per_mole            # amounts (per unit of the basis) at u: na + u nb
    u_lo, u_hi = 0.0, 1.0
    for (x_lo, x_hi), ca, cb in zip(system.element_ranges, na, nb):
        # x_lo * total(u) <= amount(u) <= x_hi * total(u), each as c0 + c1 u >= 0
        for c0, c1 in ((ca - x_lo * na.sum(), cb - x_lo * nb.sum()), (x_hi * na.sum() - ca, x_hi * nb.sum() - cb)):
            c0 += 1e-12 * na.sum()
            if abs(c1) < 1e-15:
                if c0 < 0.0:
                    u_lo, u_hi = 1.0, 0.0
            elif c1 > 0.0:
                u_lo = max(u_lo, -c0 / c1)
            else:
                u_hi = min(u_hi, -c0 / c1)
    if u_hi - u_lo <= 1e-9:
        raise ValueError(f"the section lies outside the range this model covers ({covered_range_words(system)})")
    if u_lo <= 1e-12 and u_hi >= 1.0 - 1e-12:
        return start, end, []
    ends = tuple(tuple(float(v) for v in a + u * b) for u in (u_lo, u_hi))
    return ends[0], ends[1], [f"drawn only over the range this model covers ({covered_range_words(system)})"]


def covered_range_words(system) -> str:
    """The range of compositions the model covers, in words (at%): 'Ag 0-5.5 at%, Cu 0-3.7 at%'."""
    if len(system.elements) == 2:
        lo, hi = system.covers
        return f"{100 * lo:g}-{100 * hi:g} at% {system.elements[1]}"
    return system.covered_range_text()


def _sides(phase: str, ka, kb) -> tuple[tuple[str, ...], tuple[str, ...]]:
    """(the set holding `phase`, the set without it) of a change between ka and kb."""
    return (ka, kb) if ka.count(phase) > kb.count(phase) else (kb, ka)


def _lines(edges: dict, rows: int, columns: int) -> list[ZeroFractionLine]:
    """Join the edge points of each phase cell by cell, chain the pieces, split where the sides
    change."""
    segments: dict[str, list[tuple[tuple, tuple]]] = defaultdict(list)   # phase -> [(point id, point id)]
    points: dict[tuple, tuple] = {}                                       # point id -> ((u, T), ka, kb)
    for edge, found in edges.items():
        for k, (p, ka, kb) in enumerate(found):
            points[(edge, k)] = (p, ka, kb)
    for r in range(rows - 1):
        for c in range(columns - 1):
            cell = [("h", r, c), ("h", r + 1, c), ("v", r, c), ("v", r, c + 1)]
            by_phase: dict[str, list[tuple]] = defaultdict(list)
            for edge in cell:
                for k, (_p, ka, kb) in enumerate(edges.get(edge, [])):
                    for phase in _changed(ka, kb):
                        by_phase[phase].append((edge, k))
            for phase, ids in by_phase.items():
                ids = list(dict.fromkeys(ids))
                while len(ids) >= 2:
                    first = ids.pop(0)
                    p0 = np.array(points[first][0])
                    nearest = min(ids, key=lambda i: float(np.sum((np.array(points[i][0]) - p0) ** 2)))
                    ids.remove(nearest)
                    segments[phase].append((first, nearest))
    out: list[ZeroFractionLine] = []
    for phase, segs in segments.items():
        for chain in _chains(segs):
            current: list[tuple[float, float]] = []
            sides = None
            for pid in chain:
                p, ka, kb = points[pid]
                these = _sides(phase, ka, kb)
                if sides is not None and these != sides and len(current) >= 2:
                    out.append(ZeroFractionLine(phase, sides[0], sides[1], tuple(current)))
                    current = [current[-1]]
                if sides is None or these != sides:
                    sides = these
                current.append(p)
            if len(current) >= 2:
                out.append(ZeroFractionLine(phase, sides[0], sides[1], tuple(current)))
    return out


def _chains(segments: list[tuple]) -> list[list]:
    """Chain segments (pairs of point ids) into polylines."""
    neighbours: dict = defaultdict(list)
    for a, b in segments:
        neighbours[a].append(b)
        neighbours[b].append(a)
    seen_edges: set = set()
    chains = []
    starts = [p for p, n in neighbours.items() if len(n) != 2] + list(neighbours)
    for start in starts:
        for nxt in list(neighbours[start]):
            if frozenset((start, nxt)) in seen_edges:
                continue
            chain = [start]
            prev, cur = start, nxt
            seen_edges.add(frozenset((prev, cur)))
            while True:
                chain.append(cur)
                onward = [q for q in neighbours[cur] if frozenset((cur, q)) not in seen_edges]
                if not onward:
                    break
                prev, cur = cur, onward[0]
                seen_edges.add(frozenset((prev, cur)))
            chains.append(chain)
    return chains


def _fields(keys, us, Ts) -> list[SectionField]:
    """Connected regions of grid nodes with one phase set."""
    rows, columns = len(keys), len(keys[0])
    seen = [[False] * columns for _ in range(rows)]
    out = []
    for r in range(rows):
        for c in range(columns):
            if seen[r][c]:
                continue
            key, stack, nodes = keys[r][c], [(r, c)], []
            seen[r][c] = True
            while stack:
                i, j = stack.pop()
                nodes.append((i, j))
                for di, dj in ((1, 0), (-1, 0), (0, 1), (0, -1)):
                    a, b = i + di, j + dj
                    if 0 <= a < rows and 0 <= b < columns and not seen[a][b] and keys[a][b] == key:
                        seen[a][b] = True
                        stack.append((a, b))
            pts = np.array([(us[j], Ts[i]) for i, j in nodes])
            span = np.array([1.0, max(Ts[0] - Ts[-1], 1e-9)])
            centre = pts.mean(axis=0)
            middle = pts[int(np.argmin(np.sum(((pts - centre) / span) ** 2, axis=1)))]
            out.append(SectionField(key, tuple((float(u), float(T)) for u, T in pts), (float(middle[0]), float(middle[1]))))
    return out


def _invariants(edges: dict, n_elements: int) -> list[SectionInvariant]:
    """Changes where N + 1 phases meet, grouped by temperature."""
    found: list[tuple[float, tuple[str, ...], float]] = []
    for edge, changes in edges.items():
        for (u, T), ka, kb in changes:
            together = tuple(sorted(set(ka) | set(kb)))
            if edge[0] == "v" and len(set(ka) | set(kb)) >= n_elements + 1:
                found.append((T, together, u))
    found.sort()
    groups: list[list] = []
    for T, phases, u in found:
        if groups and groups[-1][1] == phases and abs(groups[-1][0][-1] - T) <= _SAME_INVARIANT_K:
            groups[-1][0].append(T)
            groups[-1][2].append(u)
        else:
            groups.append([[T], phases, [u]])
    return [SectionInvariant(float(np.median(Ts)), phases, (float(min(u)), float(max(u)))) for Ts, phases, u in groups]


def trade_labels(iso: Isopleth, names) -> list[str | None]:
    """The trade's name of each line of `iso` (None where none fits): `names` is the system's
    TradeNames (engine/files/trade_names.py), whose lines name a change on cooling from the set
    `above` to the set `below`. A line whose two phase sets a name fits in either order is checked
    by one equilibrium 3 K above its middle point, which must hold the name's `above` set."""
    labels: list[str | None] = []
    for line in iso.lines:
        found = [(ln, hot) for hot, cold in ((line.with_phase, line.without_phase), (line.without_phase, line.with_phase))
                 if (ln := names.line(hot, cold)) is not None]
        label = None
        if found:
            u, T = line.points[len(line.points) // 2]
            above = phase_set(equilibrate(iso.system, T + 3.0, iso.mole_fractions(u)))
            label = next((ln.name for ln, hot in found if tuple(sorted(hot)) == above), None)
        labels.append(label)
    return labels
