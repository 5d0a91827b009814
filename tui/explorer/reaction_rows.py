"""The reactions table's rows: each invariant reaction of the diagram, and each pure element's
melting point, with where the cursor goes when the row is chosen."""

from __future__ import annotations

from dataclasses import dataclass

from ladle.tui.quote import percent

from .glyphs import Glyphs
from .readout import format_temperature_value
from .scales import Scales

LIQUID = "liquid"


@dataclass(frozen=True)
class ReactionRow:
    """One row: kind, temperature and phases as shown; the cursor target in K and x_B."""

    kind: str
    temperature: str
    phases: str          # one line per phase: "liquid  61.9"
    temperature_K: float
    x_B: float


def reaction_rows(diagram, elements: tuple[str, str], scales: Scales,
                  glyphs: Glyphs) -> list[ReactionRow]:
    """Rows for every invariant (hottest first), then the pure elements' melting points.

    The cursor target of an invariant is the liquid's composition where a liquid takes part,
    else the middle phase's.
    """
    unit = glyphs.temperature_unit(scales.temperature_unit)
    comp = f"{scales.composition_unit}%"
    rows = []
    for invariant in sorted(diagram.invariants, key=lambda inv: -inv.temperature_K):
        phases = sorted(invariant.phases, key=lambda item: item[1])
        liquid = [x for name, x in phases if name == LIQUID]
        target = liquid[0] if liquid else phases[len(phases) // 2][1]
        text = "\n".join(f"{name:<10}{percent(scales.shown_fraction(x)):>7} {comp}"
                         for name, x in phases)
        rows.append(ReactionRow(invariant.kind, _temperature(invariant.temperature_K, scales, unit),
                                text, invariant.temperature_K, target))
    for index, element in enumerate(elements):
        T_K = diagram.melting_points.get(element)
        if T_K:
            x_B = float(index)
            rows.append(ReactionRow(f"melting {element}", _temperature(T_K, scales, unit),
                                    f"pure {element}", T_K, x_B))
    return rows


def _temperature(T_K: float, scales: Scales, unit: str) -> str:
    return f"{format_temperature_value(scales.shown_temperature(T_K))} {unit}"
