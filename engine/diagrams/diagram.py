"""Mapping a whole binary phase diagram: every two-phase field as a family of tie-lines, every
three-phase (invariant) reaction, congruent and critical points, and pure-element transitions.

Method: isothermal sections (engine/section.py) on a temperature scan give the ordered list of
tie-lines at each level. Where two neighbouring levels differ, the interval is split until the
change is one recognisable event, which is then solved directly with temperature free
(engine/special.py). Between levels each field is refined by predictor-corrector continuation:
the tie-line at a mid temperature is solved by Newton from the interpolated one, and the interval
is split again where the two differ, so curves are smooth where they bend and cheap where they
are straight. Temperatures in K; compositions as mole fraction of B.
"""

from __future__ import annotations

import difflib
from dataclasses import dataclass, field
from functools import lru_cache

import numpy as np

from ..minimize.equilibrium import equilibrate, section_at
from ..models.phases import CompoundPhase
from ..models.pure import pure_transitions
from ..minimize.section import TieLine
from .mappable import require_mappable
from .special import classify, compound_congruent, critical_point, solution_congruent, three_phase
from ..minimize.newton import newton
from ..minimize.tangent import common_tangent, fractions, logit, tangent_to_point

#: Temperature levels of the initial scan.
SCAN_LEVELS = 48
#: Narrowest temperature interval (K) that is split further to isolate an event.
MIN_INTERVAL_K = 1e-4
#: A traced boundary is refined until linear interpolation between its points is this good (x_B).
CURVE_TOLERANCE = 1.5e-3
_MAX_REFINE_DEPTH = 7
#: A reaction or tie-line must reach this far (mole fraction) into the covered composition range
#: to be kept: one that only touches its edge (a compound at the edge) lies outside it.
_EDGE = 1e-6


@dataclass(frozen=True)
class TwoPhaseField:
    """A two-phase field: `phases` (left phase first), `T` (K, increasing) and `x` (shape (n, 2):
    x_B of the left and the right phase at each temperature)."""

    phases: tuple[str, str]
    T: np.ndarray
    x: np.ndarray


@dataclass(frozen=True)
class Invariant:
    """A three-phase reaction: `kind` (eutectic, peritectic, ...), temperature (K) and the three
    phases with their x_B, ordered by composition."""

    kind: str
    temperature_K: float
    phases: tuple[tuple[str, float], ...]


@dataclass(frozen=True)
class SpecialPoint:
    """A two-phase special point: kind "congruent", "critical", "melting" or "transition"."""

    kind: str
    temperature_K: float
    x_B: float
    phases: tuple[str, ...]


@dataclass
class _Track:
    phases: tuple[str, str]
    points: list[tuple[float, float, float]] = field(default_factory=list)  # (T, xB left, xB right)


@dataclass
class _Event:
    """A solved event: where closing tracks end and opening tracks start, and what it records."""

    starts: list[tuple[float, float, float] | None]
    ends: list[tuple[float, float, float] | None]
    invariants: list[Invariant] = field(default_factory=list)
    special: list[SpecialPoint] = field(default_factory=list)


@dataclass(frozen=True)
class _Level:
    T: float
    ties: tuple[TieLine, ...]

    @property
    def pairs(self) -> list[tuple[str, str]]:
        return [t.phases for t in self.ties]


def _level(system, T: float) -> _Level:
    return _Level(T, tuple(section_at(system, T).tie_lines))


class PhaseDiagram:
    """The mapped diagram of one system; query it with `field_at`. Its invariants and special
    points are those that reach into the composition range the model covers, at temperatures it
    covers. `fields` are whole (the computations need them); `covered_fields()` cuts them to the
    covered ranges for exports and drawings."""

    def __init__(self, system, fields: list[TwoPhaseField], invariants: list[Invariant],
                 special_points: list[SpecialPoint], warnings: list[str]) -> None:
        self.system = system
        self.temperature_range_K = system.temperature_range_K
        self.fields = fields
        self.invariants = invariants
        self.special_points = special_points
        self.warnings = warnings

    @property
    def melting_points(self) -> dict[str, float | None]:
        """Melting temperature (K) of each pure element in this system."""
        return dict(self.system.melting_points)

    def field_at(self, T: float, x_B: float) -> tuple[str, ...]:
        """Names of the stable phases at T (K) and x_B (mole fraction), from a point equilibrium."""
        return equilibrate(self.system, T, x_B).phase_names

    def covers_tie_line(self, T: float, x_left: float, x_right: float) -> bool:
        """Whether a tie-line at T (K) between x_left and x_right (mole fractions of B) reaches
        into the compositions the model covers (one end inside, or spanning the range; touching
        its edge is not enough) at a temperature it covers."""
        lo, hi = self.system.covers
        t_lo, t_hi = self.system.covers_K
        return (min(x_left, x_right) < hi - _EDGE and max(x_left, x_right) > lo + _EDGE
                and t_lo <= T <= t_hi)

    def covered_fields(self) -> list[TwoPhaseField]:
        """The two-phase fields with only the tie-lines that reach into the covered ranges
        (`covers_tie_line`); a field left with no tie-line is left out. Tie-lines wholly outside
        describe what the model is not meant for and are never exported or drawn."""
        out = []
        for f in self.fields:
            T, x = np.asarray(f.T, dtype=float), np.asarray(f.x, dtype=float)
            keep = np.array([self.covers_tie_line(t, a, b) for t, (a, b) in zip(T, x)], dtype=bool)
            if keep.any():
                out.append(TwoPhaseField(f.phases, T[keep], x[keep]))
        return out

    def to_json(self) -> dict:
        """The JSON object of `ladle diagram --json` (the fields cut to the covered ranges)."""
        els = self.system.elements

        def comp(x_b: float) -> dict:
            return {els[0]: 1.0 - x_b, els[1]: x_b}

        return {
            "system": self.system.name,
            "elements": list(els),
            "temperature_range_K": list(self.temperature_range_K),
            "covers_mole_fraction": list(self.system.covers),
            "invariants": [{"kind": i.kind, "temperature_K": i.temperature_K,
                            "phases": [{"name": n, "mole_fraction": comp(x)} for n, x in i.phases]}
                           for i in self.invariants],
            "special_points": [{"kind": s.kind, "temperature_K": s.temperature_K, "x_B": s.x_B,
                                "phases": list(s.phases)} for s in self.special_points],
            "two_phase_fields": [{"phases": list(f.phases),
                                  "tie_lines": [[float(t), float(a), float(b)] for t, (a, b) in zip(f.T, f.x)]}
                                 for f in self.covered_fields()],
            "melting_points": {el: t for el, t in self.melting_points.items()},
        }


@lru_cache(maxsize=32)
def map_diagram(system) -> PhaseDiagram:
    """Trace the whole diagram of `system` over its temperature range (cached per system).
    Raises ValueError for a system it cannot map (engine/diagrams/mappable.py)."""
    require_mappable(system)
    return _Tracer(system).run()


class _Tracer:
    def __init__(self, system) -> None:
        self.system = system
        self.finished: list[_Track] = []
        self.invariants: list[Invariant] = []
        self.special: list[SpecialPoint] = []
        self.warnings: list[str] = []
        lo, hi = system.temperature_range_K
        self.transitions = [t for i, el in enumerate(system.elements)
                            for t in pure_transitions(system.phases, i, el, lo, hi)]

    # --- driver ----------------------------------------------------------------------------------
    def run(self) -> PhaseDiagram:
        lo, hi = self.system.temperature_range_K
        temps = np.linspace(hi, lo, SCAN_LEVELS)
        above = _level(self.system, float(temps[0]))
        tracks = [self._start(t, above.T) for t in above.ties]
        for T in temps[1:]:
            below = _level(self.system, float(T))
            tracks = self._between(above, below, tracks, 0)
            above = below
        self.finished += tracks
        fields = [self._field(t) for t in self.finished if len(t.points) >= 2]
        for t in self.transitions:
            kind = "melting" if t.above == "liquid" else "transition"
            x = 0.0 if t.element == self.system.elements[0] else 1.0
            self.special.append(SpecialPoint(kind, t.temperature_K, x, (t.below, t.above)))
        lo, hi = self.system.covers
        t_lo, t_hi = self.system.covers_K
        covered = [i for i in self.invariants
                   if min(x for _, x in i.phases) < hi - _EDGE and max(x for _, x in i.phases) > lo + _EDGE
                   and t_lo <= i.temperature_K <= t_hi]
        special = [p for p in self.special if lo - 1e-9 <= p.x_B <= hi + 1e-9 and t_lo <= p.temperature_K <= t_hi]
        covered.sort(key=lambda i: -i.temperature_K)
        special.sort(key=lambda s: -s.temperature_K)
        return PhaseDiagram(self.system, fields, covered, special, self.warnings)

    @staticmethod
    def _start(tie: TieLine, T: float) -> _Track:
        return _Track(tie.phases, [(T, *tie.x_B)])

    def _between(self, above: _Level, below: _Level, tracks: list[_Track], depth: int) -> list[_Track]:
        """Carry the open tracks (aligned with above.ties) down to `below`; returns the tracks
        aligned with below.ties. An interval whose changes are not each one solvable event is
        split at its middle temperature."""
        ops = _fold_swallowing(difflib.SequenceMatcher(a=above.pairs, b=below.pairs, autojunk=False).get_opcodes(),
                               above.ties, below.ties)
        events = [op for op in ops if op[0] != "equal"]
        solved = {op: self._solve_event(above, below, list(above.ties[op[1]:op[2]]), list(below.ties[op[3]:op[4]]))
                  for op in events} if depth > 0 else {}
        if events and (depth == 0 or any(v is None for v in solved.values())):
            if above.T - below.T > MIN_INTERVAL_K and depth < 40:
                mid = _level(self.system, 0.5 * (above.T + below.T))
                upper = self._between(above, mid, tracks, depth + 1)
                return self._between(mid, below, upper, depth + 1)
        new: list[_Track] = []
        for op in ops:
            tag, i1, i2, j1, j2 = op
            if tag == "equal":
                for k in range(i2 - i1):
                    tr = tracks[i1 + k]
                    tr.points.append((below.T, *below.ties[j1 + k].x_B))
                    new.append(tr)
            else:
                new += self._commit(above, below, tracks[i1:i2], list(above.ties[i1:i2]), list(below.ties[j1:j2]),
                                    solved.get(op))
        return new

    @staticmethod
    def _simple(up: tuple, down: tuple) -> bool:
        n_up, n_down = len(up), len(down)
        if (n_up, n_down) in ((2, 1), (1, 2)):
            two, one = (up, down[0]) if n_up == 2 else (down, up[0])
            return (two[0].phases[1] == two[1].phases[0] and two[0].phases[0] == one.phases[0]
                    and two[1].phases[1] == one.phases[1])
        if (n_up, n_down) in ((0, 1), (1, 0)):
            return True
        if (n_up, n_down) in ((0, 2), (2, 0)):
            two = up or down
            return two[0].phases[1] == two[1].phases[0] and two[0].phases[0] == two[1].phases[1]
        return False

    # --- events -------------------------------------------------------------------------------------
    def _solve_event(self, above: _Level, below: _Level, up: list[TieLine], down: list[TieLine]) -> "_Event | None":
        """The event that turns the tie-lines `up` into `down` between two levels, solved; None
        if it is not one recognisable event or its solution falls outside the interval."""
        if not self._simple(tuple(up), tuple(down)):
            return None
        ev = _Event([None] * len(down), [None] * len(up))
        if len(up) + len(down) == 3:
            ok = self._invariant(above.T, below.T, up, down, ev)
        elif len(up) + len(down) == 1:
            ok = self._appearing(above.T, below.T, (up or down)[0], ev, bool(down))
        else:
            ok = self._congruent(above.T, below.T, up or down, ev, bool(down))
        return ev if ok else None

    def _commit(self, above: _Level, below: _Level, closing: list[_Track], up: list[TieLine], down: list[TieLine],
                event: "_Event | None") -> list[_Track]:
        """Close the tracks of `up` and open tracks for `down`, joined at the event's points."""
        if event is None:
            event = _Event([None] * len(down), [None] * len(up))
            names = ", ".join("+".join(t.phases) for t in up + down)
            self.warnings.append(f"unresolved change of fields ({names}) between {below.T:.2f} and {above.T:.2f} K: "
                                 "the diagram is not traced there")
        self.invariants += event.invariants
        self.special += event.special
        for tr, end in zip(closing, event.ends):
            if end is not None:
                tr.points.append(end)
            self.finished.append(tr)
        opened = []
        for tie, start in zip(down, event.starts):
            tr = _Track(tie.phases, [start] if start is not None else [])
            tr.points.append((below.T, *tie.x_B))
            opened.append(tr)
        return opened

    def _invariant(self, T_up, T_down, up, down, ev: "_Event") -> bool:
        middle_forms = len(down) == 2
        two = down if middle_forms else up
        (p, q), (_, r) = two[0].phases, two[1].phases
        (left, inner_l), (inner_r, right) = two[0].x, two[1].x
        middle = (0.5 * (inner_l[0] + inner_r[0]), 0.5 * (inner_l[1] + inner_r[1]))
        entries = [(p, left[1]), (q, middle[1]), (r, right[1])]
        line = tuple(0.5 * (a + b) for a, b in zip(two[0].mu, two[1].mu))
        sol = three_phase(self.system, entries, 0.5 * (T_up + T_down), x_A=[left[0], middle[0], right[0]], mu=line)
        if not sol.converged or not (T_down - 1e-6 <= sol.temperature_K <= T_up + 1e-6):
            return False
        T = sol.temperature_K
        xs = [ph[2] for ph in sol.phases]
        if not xs[0] <= xs[1] <= xs[2]:
            return False
        kind = classify(q, (p, r), middle_forms)
        ev.invariants.append(Invariant(kind, T, tuple((ph[0], ph[2]) for ph in sol.phases)))
        pair_points = [(T, xs[0], xs[1]), (T, xs[1], xs[2])]
        single = (T, xs[0], xs[2])
        if middle_forms:
            ev.starts[0], ev.starts[1] = pair_points
            ev.ends[0] = single
        else:
            ev.ends[0], ev.ends[1] = pair_points
            ev.starts[0] = single
        return True

    def _appearing(self, T_up, T_down, tie: TieLine, ev: "_Event", forms_on_cooling: bool) -> bool:
        """One field appears or vanishes: a pure-element transition at an end, or a critical point."""
        xl, xr = tie.x_B
        p, q = tie.phases
        point = None
        for t in self.transitions:
            if {t.below, t.above} == {p, q} and T_down - 1e-6 <= t.temperature_K <= T_up + 1e-6:
                x = 0.0 if t.element == self.system.elements[0] else 1.0
                if abs(x - 0.5 * (xl + xr)) < 0.5:
                    point = (t.temperature_K, x, x)
        if point is None and p == q:
            sol = critical_point(self.system, p, 0.5 * (xl + xr), 0.5 * (T_up + T_down))
            if sol.converged and T_down - 1.0 <= sol.temperature_K <= T_up + 1.0:
                xc = sol.phases[0][2]
                point = (sol.temperature_K, xc, xc)
                ev.special.append(SpecialPoint("critical", sol.temperature_K, xc, (p,)))
        if point is None:
            return False
        if forms_on_cooling:
            ev.starts[0] = point
        else:
            ev.ends[0] = point
        return True

    def _congruent(self, T_up, T_down, pair: list[TieLine], ev: "_Event", forms_on_cooling: bool) -> bool:
        """Two fields meet at one composition: a congruently melting compound or solution."""
        outer, middle = pair[0].phases[0], pair[0].phases[1]
        mid_phase = self.system.phases[middle]
        if isinstance(mid_phase, CompoundPhase):
            sol = compound_congruent(self.system, middle, outer, T_down, T_up)
        elif isinstance(self.system.phases[outer], CompoundPhase):
            sol = compound_congruent(self.system, outer, middle, T_down, T_up)
        else:
            x0 = 0.5 * (pair[0].x_B[1] + pair[1].x_B[0])
            sol = solution_congruent(self.system, outer, middle, x0, 0.5 * (T_up + T_down))
            if not sol.converged or not T_down - 1e-6 <= sol.temperature_K <= T_up + 1e-6:
                return False
        if sol is None:
            return False
        T, x = sol.temperature_K, sol.phases[0][2]
        ev.special.append(SpecialPoint("congruent", T, x, (outer, middle)))
        target = ev.starts if forms_on_cooling else ev.ends
        target[0] = target[1] = (T, x, x)
        return True

    # --- curves ---------------------------------------------------------------------------------------
    def _field(self, track: _Track) -> TwoPhaseField:
        pts = sorted(set(track.points))
        refined = [pts[0]]
        for a, b in zip(pts[:-1], pts[1:]):
            refined += self._refine(track.phases, a, b, 0)
            refined.append(b)
        arr = np.array(refined)
        return TwoPhaseField(track.phases, arr[:, 0], arr[:, 1:])

    def _refine(self, phases: tuple[str, str], a, b, depth: int) -> list[tuple[float, float, float]]:
        """Points strictly between a and b (T, x_left, x_right) needed for a smooth curve.

        The midpoint is solved in temperature where the boundary is steep on the diagram and in
        composition where it is flat (near critical and congruent points), so that the step
        follows the curve either way."""
        if depth >= _MAX_REFINE_DEPTH or (b[0] - a[0] < 1e-6 and max(abs(b[1] - a[1]), abs(b[2] - a[2])) < 1e-9):
            return []
        lo, hi = self.system.temperature_range_K
        t_scale = hi - lo
        dT = (b[0] - a[0]) / t_scale
        side = 0 if abs(b[1] - a[1]) >= abs(b[2] - a[2]) else 1
        dx = abs(b[1 + side] - a[1 + side])
        guess = (0.5 * (a[0] + b[0]), 0.5 * (a[1] + b[1]), 0.5 * (a[2] + b[2]))
        exact = None
        if dx > dT:
            exact = tie_line_at_composition(self.system, phases, side, *guess)
        if exact is None:
            exact = tie_line_at(self.system, phases, *guess)
        if exact is None or not (a[0] - 1e-9 <= exact[0] <= b[0] + 1e-9):
            return []
        deviation = max(abs(exact[0] - guess[0]) / t_scale, abs(exact[1] - guess[1]), abs(exact[2] - guess[2]))
        if deviation <= CURVE_TOLERANCE:
            return [exact] if depth == 0 and dT > 0.05 else []
        return self._refine(phases, a, exact, depth + 1) + [exact] + self._refine(phases, exact, b, depth + 1)


def _overlap(a: TieLine, b: TieLine) -> bool:
    return max(a.x_B[0], b.x_B[0]) < min(a.x_B[1], b.x_B[1])


def _fold_swallowing(ops: list, up: tuple[TieLine, ...], down: tuple[TieLine, ...]) -> list:
    """Matching tie-lines of two levels by phase pair alone takes a field that swallows a
    vanishing one (or is split by an appearing one) for an unchanged field: at a monotectic,
    fcc+liquid(L1) and liquid+liquid above become fcc+liquid(L2) below. Fold such a neighbour
    into the change, so that the change is one event (opcodes as difflib gives them)."""
    ops = [list(op) for op in ops]
    for k, op in enumerate(ops):
        if op[0] == "equal":
            continue
        for n in (k - 1, k + 1):
            if not 0 <= n < len(ops) or ops[n][0] != "equal" or ops[n][1] == ops[n][2]:
                continue
            before = n < k
            i, j = (ops[n][2] - 1, ops[n][4] - 1) if before else (ops[n][1], ops[n][3])
            if any(_overlap(down[j], t) for t in up[op[1]:op[2]]) or any(_overlap(up[i], t) for t in down[op[3]:op[4]]):
                if before:
                    ops[n][2], ops[n][4] = i, j
                    op[1], op[3] = i, j
                else:
                    ops[n][1], ops[n][3] = i + 1, j + 1
                    op[2], op[4] = i + 1, j + 1
                op[0] = "replace"
    return [tuple(op) for op in ops if op[2] > op[1] or op[4] > op[3]]


def tie_line_at(system, phases: tuple[str, str], T: float, xl: float, xr: float) -> tuple[float, float, float] | None:
    """The tie-line (T, x_B left, x_B right) of two phases at T (K), by Newton from the guessed
    compositions xl, xr; None where it does not converge (or the field does not exist there)."""
    P, Q = (system.phases[n] for n in phases)
    if isinstance(P, CompoundPhase) and isinstance(Q, CompoundPhase):
        return (T, float(P.x[1]), float(Q.x[1]))
    if isinstance(P, CompoundPhase) or isinstance(Q, CompoundPhase):
        sol, comp, start = (Q, P, xr) if isinstance(P, CompoundPhase) else (P, Q, xl)
        start = min(max(start, 1e-15), 1.0 - 1e-15)
        r = tangent_to_point(sol.at(T), (float(comp.x[0]), float(comp.x[1])), comp.gibbs(T), (1.0 - start, start))
        if not r.converged:
            return None
        xs = r.x[0][1]
        return (T, float(comp.x[1]), xs) if isinstance(P, CompoundPhase) else (T, xs, float(comp.x[1]))
    xl = min(max(xl, 1e-15), 1.0 - 1e-15)
    xr = min(max(xr, 1e-15), 1.0 - 1e-15)
    Pt = P.at(T)
    Qt = Pt if P is Q else Q.at(T)
    r = common_tangent(Pt, Qt, (1.0 - xl, xl), (1.0 - xr, xr))
    if not r.converged or r.x[0][1] >= r.x[1][1]:
        return None
    return (T, r.x[0][1], r.x[1][1])


def tie_line_at_composition(system, phases: tuple[str, str], side: int, T: float, xl: float, xr: float
                            ) -> tuple[float, float, float] | None:
    """The tie-line (T, x_B left, x_B right) of two phases whose `side` end (0 left, 1 right) has
    the composition given in (xl, xr), with the temperature free: for boundaries that are flat
    in temperature. T, xl, xr are the starting values (K, mole fractions)."""
    names = list(phases)
    fixed_phase, other_phase = (system.phases[names[side]], system.phases[names[1 - side]])
    x_fixed, x_other = (xl, xr) if side == 0 else (xr, xl)
    if isinstance(fixed_phase, CompoundPhase) or not 0.0 < x_fixed < 1.0:
        return None

    def mu(phase, x: float, temp: float) -> tuple[float, float]:
        a, b = phase.at(temp).potentials(1.0 - x, x)
        return float(a), float(b)

    if isinstance(other_phase, CompoundPhase):
        cx = other_phase.x

        def residual(u: np.ndarray) -> np.ndarray:
            ma, mb = mu(fixed_phase, x_fixed, u[0])
            return np.array([cx[0] * ma + cx[1] * mb - other_phase.gibbs(u[0])])

        r = newton(residual, np.array([T]), np.array([1e-3]), 1e-7, np.array([20.0]))
        if not r.converged:
            return None
        x_other = float(cx[1])
        T = float(r.x[0])
    else:
        if not 0.0 < x_other < 1.0:
            return None

        def residual(u: np.ndarray) -> np.ndarray:
            xo = fractions(u[1])[1]
            a1, b1 = mu(fixed_phase, x_fixed, u[0])
            a2, b2 = mu(other_phase, xo, u[0])
            return np.array([a1 - a2, b1 - b2])

        r = newton(residual, np.array([T, logit(1.0 - x_other, x_other)]), np.array([1e-3, 1e-6]), 1e-7,
                   np.array([20.0, 2.0]))
        if not r.converged:
            return None
        T, x_other = float(r.x[0]), fractions(float(r.x[1]))[1]
        if fixed_phase is other_phase and abs(x_other - x_fixed) < 1e-9:
            return None
    out = (T, x_fixed, x_other) if side == 0 else (T, x_other, x_fixed)
    return out if out[1] < out[2] else None
