"""The status pane's text for one cursor position, as (role, text) lines.

Roles: "heading" (a section title), "value" (a figure), "note" (a remark), "warning" (a caution
or a missing answer). The widget styles them; colour never carries meaning that the text does not also say.
"""

from __future__ import annotations

from ladle.engine.units import TEMPERATURE_UNITS, kelvin_to
from ladle.tui.quote import percent

from .exploration import Reading
from .glyphs import Glyphs
from .readout import format_temperature_value
from .scales import Scales

Line = tuple[str, str]
WIDTH = 30   # characters a status line may use


def _temperature(T_K: float, unit: str, glyphs: Glyphs) -> str:
    """ "183.0 °C": a cursor temperature, to a tenth of a degree, in `unit`."""
    return f"{format_temperature_value(kelvin_to(T_K, unit), 1)} {glyphs.temperature_unit(unit)}"


def point_lines(reading: Reading, element_B: str, scales: Scales, glyphs: Glyphs) -> list[Line]:
    """The cursor's temperature (all three units) and the alloy's composition (wt% and at%)."""
    T_K, x_B = reading.cursor.temperature_K, reading.cursor.x_B
    units = [scales.temperature_unit] + [u for u in TEMPERATURE_UNITS
                                         if u != scales.temperature_unit]
    temps = "  ".join(_temperature(T_K, unit, glyphs) for unit in units)
    return [
        ("heading", "POINT"),
        ("value", f" {temps}"),
        ("value", f" {element_B} {_composition_pair(x_B, scales)}"),
    ]


def _composition_pair(x_B: float, scales: Scales) -> str:
    """ "40.0 wt%  (54.0 at%)": the chosen unit first."""
    first = scales.composition_unit
    second = "at" if first == "wt" else "wt"
    return (f"{percent(scales.shown_fraction(x_B, first))} {first}%  "
            f"({percent(scales.shown_fraction(x_B, second))} {second}%)")


def phase_lines(reading: Reading, element_B: str, scales: Scales) -> list[Line]:
    """The field's name, then each stable phase: amount (mass %, mol %) and composition."""
    phases = reading.equilibrium.phases
    lines: list[Line] = [("heading", "FIELD"),
                         ("value", " " + " + ".join(share.name for share in phases)),
                         ("heading", f"{'PHASE':<15}{'mass%':>7}{'mol%':>7}")]
    for share in phases:
        lines.append(("value", f" {share.name:<14}{percent(share.amount_mass):>7}"
                               f"{percent(share.amount_mol):>7}"))
        lines.append(("note", f"   {element_B} {_composition_pair(share.x[1], scales)}"))
    return lines


def melt_lines(reading: Reading, scales: Scales, glyphs: Glyphs) -> list[Line]:
    """The alloy's liquidus, solidus and freezing range at the cursor's composition."""
    lines: list[Line] = [("heading", "MELT RANGE of this alloy")]
    melt = reading.melt
    if melt is None:
        return lines + [("note", f" {reading.melt_problem or 'no answer'}")]
    unit = glyphs.temperature_unit(scales.temperature_unit)
    rows = (("liquidus", melt.liquidus_K, scales.shown_temperature),
            ("solidus", melt.solidus_K, scales.shown_temperature),
            ("freezing range", melt.freezing_range_K, scales.shown_temperature_difference))
    return lines + [("value", f" {label:<15}{format_temperature_value(convert(value)):>6} {unit}")
                    if value is not None else ("note", f" {label:<15}{'not in range':>12}")
                    for label, value, convert in rows]


def boundary_lines(reading: Reading, element_B: str, scales: Scales,
                   glyphs: Glyphs) -> list[Line]:
    """The boundary nearest the cursor on screen, with its distance and direction."""
    nearest = reading.nearest
    lines: list[Line] = [("heading", "NEAREST BOUNDARY")]
    if nearest is None:
        return lines + [("note", " none in this window")]
    arrow = {"up": glyphs.up, "down": glyphs.down, "left": glyphs.left,
             "right": glyphs.right}[nearest.direction]
    if nearest.temperature_K is not None:
        unit = glyphs.temperature_unit(scales.temperature_unit)
        gap = abs(scales.shown_temperature_difference(
            nearest.temperature_K - reading.cursor.temperature_K))
        where = (f"{format_temperature_value(scales.shown_temperature(nearest.temperature_K))}"
                 f" {unit}")
        decimals = 1 if gap < 10 else 0
        how_far = f"{format_temperature_value(gap, decimals)} {unit} {nearest.direction}"
    else:
        comp = scales.composition_unit
        shown = scales.shown_composition(nearest.x_B)
        gap = abs(shown - scales.shown_composition(reading.cursor.x_B))
        where = f"{element_B} {percent(shown / 100.0)} {comp}%"
        how_far = f"{percent(gap / 100.0)} {comp}% {nearest.direction}"
    return lines + [("value", f" {arrow} {nearest.name} at {where}"),
                    ("note", f"   {how_far}")]


def status_lines(reading: Reading, element_B: str, scales: Scales,
                 glyphs: Glyphs) -> list[Line]:
    """Every line of the status pane, top to bottom."""
    return (point_lines(reading, element_B, scales, glyphs)
            + phase_lines(reading, element_B, scales)
            + melt_lines(reading, scales, glyphs)
            + boundary_lines(reading, element_B, scales, glyphs))
