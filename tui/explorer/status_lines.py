"""The status pane's text for one cursor position, as (role, text) lines.

Roles: "heading" (a section title), "value" (a figure), "note" (a remark), "warning" (a caution
or a missing answer). The widget styles them; colour never carries meaning that the text does not also say.
"""

from __future__ import annotations

import textwrap

from ladle.engine.units import TEMPERATURE_UNITS, kelvin_to
from ladle.tui.phase_names import phase_label
from ladle.tui.quote import percent

from .exploration import Reading
from .glyphs import Glyphs
from .readout import format_temperature_value
from .scales import Scales

Line = tuple[str, str]
WIDTH = 30   # characters a status line may use
NARROW_RANGE_K = 10.0   # melt ranges narrower than this are shown to a tenth of a degree


def _temperature(T_K: float, unit: str, glyphs: Glyphs) -> str:
    """ "183.0 °C": a cursor temperature, to a tenth of a degree, in `unit`."""
    return f"{format_temperature_value(kelvin_to(T_K, unit), 1)} {glyphs.temperature_unit(unit)}"


def point_lines(reading: Reading, element_B: str, scales: Scales, glyphs: Glyphs) -> list[Line]:
    """The cursor's temperature (all three units) and the alloy's composition (wt% and at%)."""
    T_K, x_B = reading.cursor.temperature_K, reading.cursor.x_B
    units = [scales.temperature_unit] + [u for u in TEMPERATURE_UNITS
                                         if u != scales.temperature_unit]
    shown = [_temperature(T_K, unit, glyphs) for unit in units]
    temps = "  ".join(shown)
    if len(temps) + 1 > WIDTH:   # never wrap: one space apart, then the others to the degree
        temps = " ".join(shown)
    if len(temps) + 1 > WIDTH:
        temps = " ".join([shown[0]] + [f"{format_temperature_value(kelvin_to(T_K, unit))} "
                                       f"{glyphs.temperature_unit(unit)}" for unit in units[1:]])
    return [("heading", "POINT"), ("value", f" {temps}"), alloy_line(x_B, element_B, scales)]


def alloy_line(x_B: float, element_B: str, scales: Scales) -> Line:
    """The alloy's composition (wt% and at%, the chosen unit first)."""
    return ("value", f" {element_B} {_composition_pair(x_B, scales)}")


def _composition_pair(x_B: float, scales: Scales, room: int = WIDTH) -> str:
    """ "40.0 wt%  (54.0 at%)": the chosen unit first; one space apart where two would take
    more than `room` characters (a near-pure phase: ">99.999 wt% (>99.999 at%)")."""
    first = scales.composition_unit
    second = "at" if first == "wt" else "wt"
    shown = (f"{percent(scales.shown_fraction(x_B, first))} {first}%",
             f"({percent(scales.shown_fraction(x_B, second))} {second}%)")
    pair = "  ".join(shown)
    return pair if len(pair) <= room else " ".join(shown)


def phase_lines(reading: Reading, system, scales: Scales) -> list[Line]:
    """The field's name, then each stable phase (with its trade name, or the element a side of
    a miscibility gap is rich in): amount (mass %, mol % of the alloy) and composition."""
    phases = reading.equilibrium.phases
    T_K, element_B = reading.cursor.temperature_K, system.elements[1]
    among = [(share.name, share.x[1]) for share in phases]
    names = [phase_label(system, share.name, share.x[1], T_K, among) for share in phases]
    lines: list[Line] = [("heading", "FIELD"),
                         ("value", " " + " + ".join(names)),
                         ("heading", f"{'PHASE':<8}{'% of alloy: mass':>16}{'mol':>6}")]
    for name, share in zip(names, phases, strict=True):
        amounts = f"{percent(share.amount_mass):>6}{percent(share.amount_mol):>6}"
        lines.append(("value", f" {name}{' ' * max(WIDTH - 1 - len(name) - len(amounts), 1)}"
                               f"{amounts}"))
        indent = "   "
        pair = _composition_pair(share.x[1], scales, WIDTH - len(indent) - len(element_B) - 1)
        if len(indent) + len(element_B) + 1 + len(pair) > WIDTH:
            indent = "  "     # still under its phase's name, one column less
        lines.append(("note", f"{indent}{element_B} {pair}"))
    return lines


def melt_lines(reading: Reading, scales: Scales, glyphs: Glyphs,
               compact: bool = False) -> list[Line]:
    """The alloy's liquidus, solidus and freezing range at the cursor's composition (compact:
    all three on one line, where the pane is short of room)."""
    lines: list[Line] = [("heading", "MELT RANGE of this alloy")]
    melt = reading.melt
    if melt is None:
        return lines + [("note", f" {reading.melt_problem or 'no answer'}")]
    unit = glyphs.temperature_unit(scales.temperature_unit)
    rows = (("liquidus", melt.liquidus_K, scales.shown_temperature),
            ("solidus", melt.solidus_K, scales.shown_temperature),
            ("freezing range", melt.freezing_range_K, scales.shown_temperature_difference))
    narrow = melt.freezing_range_K is not None and melt.freezing_range_K < NARROW_RANGE_K
    decimals = 1 if narrow else 0
    if compact and all(value is not None for _, value, _ in rows):
        liquidus, solidus, span = (format_temperature_value(convert(value), decimals)
                                   for _, value, convert in rows)
        return [("heading", "MELT RANGE liquidus, solidus"),
                ("value", f" {liquidus}, {solidus} {unit}; range {span}")]
    return lines + [("value", f" {label:<15}"
                              f"{format_temperature_value(convert(value), decimals):>7} {unit}")
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
             "right": glyphs.right, "here": "="}[nearest.direction]
    if nearest.temperature_K is not None:
        unit = glyphs.temperature_unit(scales.temperature_unit)
        gap = abs(scales.shown_temperature_difference(
            nearest.temperature_K - reading.cursor.temperature_K))
        decimals = 1 if gap < 10 else 0
        where = (f"{format_temperature_value(scales.shown_temperature(nearest.temperature_K), decimals)}"
                 f" {unit}")
        how_far = ("the cursor is on it" if nearest.direction == "here" else
                   f"{format_temperature_value(gap, decimals)} {unit} {nearest.direction}")
    else:
        comp = scales.composition_unit
        shown = scales.shown_composition(nearest.x_B)
        gap = abs(shown - scales.shown_composition(reading.cursor.x_B))
        where = f"{element_B} {percent(shown / 100.0)} {comp}%"
        how_far = f"{percent(gap / 100.0)} {comp}% {nearest.direction}"
    line = f" {arrow} {nearest.name} {where}"
    if len(line) + len(how_far) + 2 <= WIDTH:     # one line where it fits
        return lines + [("value", f"{line}, {how_far}")]
    return lines + [("value", line), ("note", f"   {how_far}")]


def energy_lines(reading: Reading) -> list[Line]:
    """What the energies of the free-energy view are measured from."""
    gibbs = reading.equilibrium.gibbs_J_per_mol
    text = (f"alloy {gibbs:.0f} J/mol, from the pure elements as solids at this temperature. "
            "Curves: kJ/mol above the straight line joining the lowest G at the window's edges.")
    return [("heading", "GIBBS ENERGY G")] + [("note", f" {line}")
                                             for line in textwrap.wrap(text, WIDTH - 1)]


def status_lines(reading: Reading, system, scales: Scales, glyphs: Glyphs,
                 compact: bool = False) -> list[Line]:
    """Every line of the diagram view's status pane, top to bottom (compact: the melt range on
    one line)."""
    element_B = system.elements[1]
    return (point_lines(reading, element_B, scales, glyphs)
            + phase_lines(reading, system, scales)
            + melt_lines(reading, scales, glyphs, compact)
            + boundary_lines(reading, element_B, scales, glyphs))


def without_heading(lines: list[Line], heading: str, covered: int = 0) -> list[Line]:
    """The lines without the heading `heading` and the `covered` lines under it, for a status
    pane short of room: FIELD with its line (the phase rows name the same phases), or ALLOY
    alone (its composition line says what it is)."""
    at = next((i for i, line in enumerate(lines) if line == ("heading", heading)), None)
    return lines if at is None else lines[:at] + lines[at + 1 + covered:]
