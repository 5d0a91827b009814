"""The reactions table's rows: each invariant reaction of the diagram, and each pure element's
melting point, with where the cursor goes when the row is chosen."""

from __future__ import annotations

from dataclasses import dataclass

from ladle.engine.diagrams.melt import LIQUID
from ladle.tui.phase_names import phase_label
from ladle.tui.quote import percent

from .glyphs import Glyphs
from .readout import format_temperature_value
from .scales import Scales


@dataclass(frozen=True)
class ReactionRow:
    """One row: kind, temperature and phases as shown; the cursor target in K and x_B."""

    kind: str
    temperature: str
    phases: str          # one line per phase: "liquid  61.9" (percent of B, shown unit)
    temperature_K: float
    x_B: float


def reaction_rows(diagram, elements: tuple[str, str], scales: Scales,
                  glyphs: Glyphs) -> list[ReactionRow]:
    """Rows for every invariant reaction, then every special point (melting of a pure element,
    congruent melting, critical point, transition), each group hottest first.

    The cursor target of an invariant is the liquid's composition where a liquid takes part,
    else the middle phase's.
    """
    unit = glyphs.temperature_unit(scales.temperature_unit)
    rows = []
    for invariant in sorted(diagram.invariants, key=lambda inv: -inv.temperature_K):
        phases = sorted(invariant.phases, key=lambda item: item[1])
        liquid = [x for name, x in phases if name == LIQUID]
        target = liquid[0] if liquid else phases[len(phases) // 2][1]
        labels = [phase_label(diagram.system, name, x, invariant.temperature_K, phases)
                  for name, x in phases]
        width = max(9, *(len(label) + 1 for label in labels))
        text = "\n".join(f"{label:<{width}}{percent(scales.shown_fraction(x)):>6}"
                         for label, (_, x) in zip(labels, phases, strict=True))
        rows.append(ReactionRow(invariant.kind, _temperature(invariant.temperature_K, scales, unit),
                                text, invariant.temperature_K, target))
    for point in sorted(diagram.special_points, key=lambda sp: -sp.temperature_K):
        where = (f"pure {elements[int(round(point.x_B))]}" if point.x_B in (0.0, 1.0) else
                 f"at {percent(scales.shown_fraction(point.x_B))}")
        rows.append(ReactionRow(point.kind, _temperature(point.temperature_K, scales, unit),
                                " / ".join(point.phases) + "\n" + where,
                                point.temperature_K, point.x_B))
    return rows


def _temperature(T_K: float, scales: Scales, unit: str) -> str:
    return f"{format_temperature_value(scales.shown_temperature(T_K))} {unit}"
