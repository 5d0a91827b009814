"""The status pane's lines in the cooling view: where each path's freezing ends, the structure
at the end (mass % of the alloy) and the latent heat by both paths, and the coring of the
primary solid by Scheil. Plain text as (role, text) lines, no screen code."""

from __future__ import annotations

import textwrap

from ladle.engine.solidify.coring import Coring
from ladle.tui.cooling_text import PATH_NAMES, structure_rows
from ladle.tui.phase_names import short_label, with_trade_names
from ladle.tui.quote import percent

from .glyphs import Glyphs
from .readout import format_temperature_value
from .scales import Scales
from .status_lines import WIDTH, Line

NAME_ROOM = 17   # a constituent's name this short shares its line with the amounts


def cooling_lines(result, coring: Coring | None, system, scales: Scales,
                  glyphs: Glyphs) -> list[Line]:
    """`result`: the engine's Solidification of the cursor's alloy, a one-line reason why there
    is none, or None while it is being computed; `coring`: its Scheil primary solid's."""
    lines: list[Line] = [("heading", "FREEZING of this alloy")]
    if result is None:
        return lines + [("note", " computing both paths ...")]
    if isinstance(result, str):
        return lines + [("note", f" no answer: {result}")]
    unit = glyphs.temperature_unit(scales.temperature_unit)
    for model, name in PATH_NAMES.items():
        path = result.path(model)
        if path.end_K is None:
            lines.append(("value", f" {name:<12}{'liquid left':>14}"))
            continue
        T = format_temperature_value(scales.shown_temperature(path.end_K))
        line = f" {name:<12}{T:>5} {unit}"
        if len(f"{line} {path.end}") <= WIDTH:
            lines.append(("value", f"{line} {path.end}"))
        else:        # how it ends on a line of its own, never cut ('last liquid', 'peritectic')
            lines += [("value", line)] + [("value", row) for row in
                                          textwrap.wrap(path.end, WIDTH, initial_indent="   ", subsequent_indent="   ")]
    lines.append(("heading", f"{'STRUCTURE, mass %':<17}{'eq.':>6}{'Sch.':>7}"))
    ends = [p.end_K for p in (result.equilibrium, result.scheil) if p.end_K is not None]
    T_end = min(ends) if ends else result.equilibrium.liquidus_K   # trade names at the end
    primary = None
    for constituent, fractions in structure_rows(result):
        amounts = ["-" if f is None else percent(f) for f in fractions]
        named = with_trade_names(system, constituent, T_end)
        if primary is None and constituent.startswith("primary "):
            primary = named.removeprefix("primary ")
        rows = textwrap.wrap(named, WIDTH - 1, initial_indent=" ", subsequent_indent="   ")
        if len(rows[-1]) > NAME_ROOM:           # the amounts on a line of their own
            rows.append("")
        rows[-1] = f"{rows[-1]:<{NAME_ROOM}}{amounts[0]:>6}{amounts[1]:>7}"
        lines += [("value", row) for row in rows]
    heats = [f"{result.path(model).latent_heat_J_per_g:.0f}" for model in PATH_NAMES]
    lines.append(("value", f" {'latent heat J/g':<16}{heats[0]:>6}{heats[1]:>7}"))
    if coring is not None and abs(scales.shown_composition(coring.x_rim)
                                  - scales.shown_composition(coring.x_core)) >= 0.05:
        comp = scales.composition_unit
        core, rim = (percent(scales.shown_fraction(x)) for x in (coring.x_core, coring.x_rim))
        name = primary if primary and primary.startswith(coring.phase) else coring.phase
        heading = f"CORING (Scheil) {name}"
        if len(heading) > WIDTH:                # the trade's short name: 'rhombohedral (Sb)' -> '(Sb)'
            heading = f"CORING (Scheil) {short_label(system, coring.phase, coring.x_core, coring.rim_K)}"
        lines.append(("heading", heading[:WIDTH]))
        lines.append(("value", f" core {core}  rim {rim} {system.elements[1]} {comp}%"[:WIDTH]))
    return lines
