"""Melt range of one alloy: where it starts and finishes melting, and every phase-boundary
crossing between the top and the bottom of the system's temperature window.

Candidate crossings come from the traced diagram (engine/diagram.py); each boundary crossing is
then solved directly (the temperature at which a tie-line's end has the alloy's composition) and
the phases on both sides come from point equilibria. Temperatures in K, compositions in mole
fraction of B.
"""

from __future__ import annotations

from dataclasses import dataclass

import numpy as np

from .diagram import PhaseDiagram, map_diagram, tie_line_at
from ..minimize.equilibrium import equilibrate
from .special import bracket_root

LIQUID = "liquid"
#: Crossings closer than this (K) are one crossing.
_SAME_K = 1e-6


@dataclass(frozen=True)
class Crossing:
    """At `temperature_K` the stable phases change from `above` to `below` (on cooling); each
    ordered by composition."""

    temperature_K: float
    above: tuple[str, ...]
    below: tuple[str, ...]


@dataclass(frozen=True)
class MeltRange:
    """Liquidus (last solid gone on heating) and solidus (first liquid on heating), in K;
    None where the alloy is not fully liquid (or not fully solid) inside the mapped window."""

    x_B: float
    liquidus_K: float | None
    solidus_K: float | None
    crossings: tuple[Crossing, ...]
    #: Why the answer may be incomplete (the diagram's own warnings, changes of phases that
    #: point equilibria found and the traced boundaries missed); empty when all agree.
    warnings: tuple[str, ...] = ()

    @property
    def freezing_range_K(self) -> float | None:
        if self.liquidus_K is None or self.solidus_K is None:
            return None
        return self.liquidus_K - self.solidus_K


def _boundary_crossings(diagram: PhaseDiagram, x_B: float) -> list[float]:
    """Temperatures (K) where a traced boundary passes through x_B, each solved exactly."""
    system = diagram.system
    temps = []
    for f in diagram.fields:
        for side in (0, 1):
            xs = f.x[:, side] - x_B
            hits = np.flatnonzero(np.sign(xs[:-1]) * np.sign(xs[1:]) <= 0)
            for k in hits:
                a, b = float(f.T[k]), float(f.T[k + 1])
                if xs[k] == 0.0:
                    temps.append(a)
                    continue
                if xs[k + 1] == 0.0:
                    temps.append(b)
                    continue
                guess = {a: f.x[k], b: f.x[k + 1]}

                def h(T: float, side=side, f=f, a=a, b=b) -> float:
                    w = (T - a) / (b - a)
                    gl = (1 - w) * guess[a][0] + w * guess[b][0]
                    gr = (1 - w) * guess[a][1] + w * guess[b][1]
                    tie = tie_line_at(system, f.phases, T, gl, gr)
                    if tie is None:   # an end point of the field: fall back to interpolation
                        return (gl, gr)[side] - x_B
                    return tie[1 + side] - x_B

                T = bracket_root(h, a, b, xtol=1e-9)
                temps.append(float(T) if T is not None else 0.5 * (a + b))
    return temps


def melt_range(system, x_B: float) -> MeltRange:
    """Melt range and phase-boundary crossings of the alloy with mole fraction x_B of B."""
    diagram = map_diagram(system)
    lo, hi = diagram.temperature_range_K
    temps = _boundary_crossings(diagram, x_B)
    for inv in diagram.invariants:
        xs = [x for _, x in inv.phases]
        if min(xs) - 1e-12 <= x_B <= max(xs) + 1e-12:
            temps.append(inv.temperature_K)
    for sp in diagram.special_points:
        if abs(sp.x_B - x_B) < 1e-12:
            temps.append(sp.temperature_K)
    temps = sorted({t for t in temps if lo < t < hi}, reverse=True)
    merged: list[float] = []
    for t in temps:
        if not merged or merged[-1] - t > _SAME_K:
            merged.append(t)
    warnings = list(diagram.warnings)
    missed = _changes_missed(system, x_B, [hi] + merged + [lo])
    if missed:
        warnings += [f"the traced diagram misses a change of phases at {t:.2f} K that point equilibria find "
                     "(placed from point equilibria)" for t in missed]
        merged = sorted(merged + missed, reverse=True)
    edges = [hi] + merged + [lo]
    phases = [_phases_at(system, 0.5 * (a + b), x_B) for a, b in zip(edges[:-1], edges[1:])]
    crossings = [Crossing(t, up, down)
                 for t, up, down in zip(merged, phases[:-1], phases[1:]) if set(up) != set(down) or len(up) != len(down)]
    liquidus = None
    if phases and phases[0] == (LIQUID,):
        liquidus = next((c.temperature_K for c in crossings if c.above == (LIQUID,)), None)
    solidus = None
    if phases and LIQUID not in phases[-1]:
        solidus = next((c.temperature_K for c in reversed(crossings) if LIQUID in c.above and LIQUID not in c.below), None)
    return MeltRange(x_B, liquidus, solidus, tuple(crossings), tuple(warnings))


def _phases_at(system, T: float, x_B: float) -> tuple[str, ...]:
    return equilibrate(system, T, x_B).phase_names


#: How far inside each interval its ends are compared with its middle (K, at most).
_END_PROBE_K = 0.01
#: Changes of phases found by point equilibria are located to this (K).
_LOCATE_K = 1e-6


def _changes_missed(system, x_B: float, edges: list[float]) -> list[float]:
    """Temperatures (K) where the stable phases of the alloy change inside an interval between
    two consecutive crossings (`edges`, descending): each interval's phases near both ends are
    compared with those in its middle by point equilibria, and a difference is located by
    bisection. Empty when the traced boundaries account for every change."""
    found: list[float] = []
    for a, b in zip(edges[:-1], edges[1:]):
        middle_T = 0.5 * (a + b)
        middle = _phases_at(system, middle_T, x_B)
        probe = min(_END_PROBE_K, 0.25 * (a - b))
        for end_T in (a - probe, b + probe):
            if _phases_at(system, end_T, x_B) == middle:
                continue
            inside, outside = middle_T, end_T
            while abs(outside - inside) > _LOCATE_K:
                half = 0.5 * (inside + outside)
                if _phases_at(system, half, x_B) == middle:
                    inside = half
                else:
                    outside = half
            found.append(0.5 * (inside + outside))
    return found
