"""`ladle cool`: how one alloy freezes, at equilibrium and by Scheil-Gulliver, side by side."""

from __future__ import annotations

import argparse

from .. import quote
from ..cooling_text import PATH_NAMES, structure_rows
from .common import (add_composition_argument, add_system_argument, alloy_both, ascii_text, closing_lines,
                     composition_both, open_system, print_json, read_alloy, require_liquid, system_title, terminal_plot)

HELP = "how an alloy freezes: fraction solid, liquid composition and phases on cooling (equilibrium and Scheil)"

#: About this many evenly spaced rows between the liquidus and the end of freezing.
TABLE_ROWS = 12
#: Arrests of the two paths closer than this (K), or shown at the same temperature, share a row.
_SAME_K = 1e-6


def add_arguments(p: argparse.ArgumentParser) -> None:
    add_system_argument(p)
    add_composition_argument(p)
    p.add_argument("--scheil", action="store_true",
                   help="show the Scheil path's liquid and phases (and put it at the top of --json); default: equilibrium")
    p.add_argument("--unit", choices=("C", "K", "F"), default="C", help="temperature unit (default C)")
    out = p.add_mutually_exclusive_group()
    out.add_argument("--json", action="store_true", help="print one JSON object with both paths")
    out.add_argument("--plot", action="store_true", help="draw both paths in the terminal instead of the table")
    p.add_argument("--ascii", action="store_true", help="plain ASCII characters only")


def run(args: argparse.Namespace) -> int:
    from ladle.engine.solidify.alloy_paths import solidify_alloy
    from ladle.engine.solidify.paths import solidify

    system = open_system(args.system, args.without)
    require_liquid(system)
    x, comp = read_alloy(system, args.comp)
    from ladle.engine.diagrams.mappable import unmapped_phases

    binary = len(system.elements) == 2
    # A binary with sublattice phases (Fe-C) has no mapped diagram: the general paths follow it.
    mapped = binary and not unmapped_phases(system)
    result = solidify(system, float(x[1])) if mapped else solidify_alloy(system, x)
    model = "scheil" if args.scheil else "equilibrium"
    constituents = _slow_cooled(system, x, result)
    if args.json:
        print_json(_json(system, result, model, constituents))
        return 0
    element = comp.shown_element
    alloy = composition_both(system, float(x[1]), element, comp.basis) if binary else alloy_both(system, x, comp.basis)
    lines = [f"{system_title(system)}, alloy {alloy}"]
    if args.plot:
        lines.append(render_plot(system, result, args.unit, args.ascii))
    else:
        shown = [element] if binary else [e for e in system.elements if e != comp.balance]
        lines += table(system, result, model, args.unit, shown, comp.basis)
    lines += summary(system, result, args.unit, constituents)
    print("\n".join(ascii_text(lines, args.ascii)))
    return 0


def _slow_cooled(system, x, result) -> tuple:
    """A steel's or white cast iron's constituents after slow cooling through A1 (proeutectoid
    ferrite or cementite and pearlite; primary or secondary cementite, pearlite and transformed
    ledeburite), from the transition scan between just above the end of equilibrium freezing and
    the bottom of the file's diagram window, where the file names austenitizing as its heat
    treatment; else ()."""
    from ladle.engine.files.trade_names import trade_names

    names = trade_names(system)
    end = result.equilibrium.end_K
    if names.heat_treatment != "austenitizing" or end is None:
        return ()
    from ladle.engine.diagrams.alloy_transitions import alloy_transitions
    from ladle.engine.diagrams.heat_treatment import slow_cooled_constituents

    scan = alloy_transitions(system, x, highest_K=end + 2.0, lowest_K=system.temperature_range_K[0])
    return slow_cooled_constituents(scan, names.line, names.phase_name)


def _json(system, result, model: str, constituents) -> dict:
    """The result's JSON with each constituent's trade name (`trade_name`, or null) and a steel's
    slow-cooled constituents (`slow_cooled_constituents`, or null)."""
    from ..phase_names import constituent_trade_name

    data = result.to_json(model)
    for part in (data, data["equilibrium"], data["scheil"]):
        for c in part["constituents"]:
            c["trade_name"] = constituent_trade_name(system, c["name"])
    data["slow_cooled_constituents"] = [{"name": c.name, "mass_fraction": c.mass_fraction} for c in constituents] or None
    return data


# --- text --------------------------------------------------------------------------------------
def _liquid(system, step, elements: list[str], basis: str) -> list[str]:
    """The liquid of a path's step as the contents of `elements` in the person's basis ("wt" or
    "at"): ['10.0'] for a binary's step, one per element for a larger system's; '-' once all is
    solid."""
    import numpy as np

    from ladle.engine.units import mass_from_mole

    x = getattr(step, "liquid_x", None)
    if x is None and getattr(step, "liquid_x_B", None) is not None:
        x = (1.0 - step.liquid_x_B, step.liquid_x_B)
    if x is None:
        return ["-"] * len(elements)
    x = np.asarray(x, dtype=float)
    shares = mass_from_mole(x, system.molar_mass) if basis == "wt" else x
    return [quote.percent(shares[system.elements.index(el)]) for el in elements]


def row_temperatures(result, unit: str) -> list[tuple[float, bool]]:
    """(T in K, after-the-plateau) for the table: the liquidus, evenly spaced round values in
    the person's unit, and every arrest of both paths (a plateau twice: before and after)."""
    from ladle.engine.units import kelvin_from, kelvin_to

    from ..explorer.cursor import nice_step

    paths = (result.equilibrium, result.scheil)
    top = result.equilibrium.liquidus_K
    bottom = min(s.temperature_K for p in paths for s in p.steps)

    def same(T1: float, T2: float) -> bool:
        """Within _SAME_K, or shown as the same temperature (one row, not two that read alike)."""
        return abs(T1 - T2) <= _SAME_K or quote.temperature(T1, unit) == quote.temperature(T2, unit)

    events: list[list] = []     # [highest T, lowest T, plateau?]: arrests of either path at the `same` T
    for a in sorted((a for p in paths for a in p.arrests), key=lambda a: -a.temperature_K):
        if events and same(events[-1][1], a.temperature_K):
            events[-1][1:] = [a.temperature_K, events[-1][2] or a.kind == "plateau"]
        else:
            events.append([a.temperature_K, a.temperature_K, a.kind == "plateau"])
    rows = {(top, False)}
    # the row before a shared arrest at its highest temperature, the row after it at its lowest:
    # each path then stands before, or after, its own arrest
    for high, low, plateau in events:
        if not same(high, top):
            rows.add((high, False))
        if plateau:
            rows.add((low, True))
    hi, lo = kelvin_to(top, unit), kelvin_to(bottom, unit)
    if hi - lo > 0.0:
        step = max(nice_step(hi - lo, TABLE_ROWS), 1.0)     # the table shows tenths of a degree
        k = int(hi // step)
        while k * step > lo:
            if k * step < hi:
                rows.add((kelvin_from(k * step, unit), False))
            k -= 1
    return sorted(rows, key=lambda r: (-r[0], r[1]))


def _solid(fraction: float) -> str:
    """Fraction solid as a percentage to a tenth, as a casting engineer reads it."""
    return f"{100.0 * fraction:.1f}"


def table(system, result, model: str, unit: str, elements: list[str], basis: str) -> list[str]:
    """Temperature, fraction solid of both paths, and the chosen path's liquid (the contents of
    `elements`) and phases."""
    k = len(elements)
    head = [("", "solid, mass %", "", "liquid") + ("",) * k,
            ("temperature", "equilibrium", "Scheil") + tuple(f"{el} {basis}%" for el in elements)
            + (f"phases ({PATH_NAMES[model]} path)",)]
    rows = []
    for T, after in row_temperatures(result, unit):
        eq, sc = result.states_at(T, below=after)
        shown = sc if model == "scheil" else eq
        rows.append((quote.temperature(T, unit), _solid(eq.fraction_solid), _solid(sc.fraction_solid),
                     *_liquid(system, shown, elements, basis), " + ".join(shown.phases)))
    widths = [max(len(r[i]) for r in head + rows) for i in range(3 + k)]
    out = [""]
    for r in head + rows:
        out.append("  ".join(f"{v:>{w}}" for v, w in zip(r[:3 + k], widths)) + "  " + r[3 + k])
    return out


def summary(system, result, unit: str, constituents=()) -> list[str]:
    """Ends of freezing, the structure at the end (with the trade's names), latent heat and arrests
    of both paths, and a steel's `constituents` after slow cooling (see _slow_cooled)."""
    from ladle.engine.solidify.alloy_scheil import OUTSIDE_RANGE

    from ..phase_names import constituent_label
    from .transitions import slow_cooled_lines

    paths = [result.path(model) for model in PATH_NAMES]
    out = [""]
    for p in paths:
        end = f"{quote.temperature(p.end_K, unit)} ({p.end})" if p.end_K is not None else \
            (f"not followed below {quote.temperature(p.steps[-1].temperature_K, unit)}, where the remaining liquid "
             "leaves the range this model covers (see the note)") if p.end == OUTSIDE_RANGE else \
            "liquid remains in the mapped window"
        out.append(f"freezing ends, {PATH_NAMES[p.model]}: {end}")
    named_at = result.equilibrium.end_K or result.equilibrium.liquidus_K
    structure = [(constituent_label(system, name, named_at), f) for name, f in structure_rows(result)]
    width = max([34] + [len(name) + 2 for name, _ in structure])
    out += ["", f"{'structure at the end, mass %':<{width + 2}}{'equilibrium':>12}{'Scheil':>10}"]
    for name, fractions in structure:
        amounts = ["-" if f is None else quote.percent(f) for f in fractions]
        out.append(f"  {name:<{width}}{amounts[0]:>12}{amounts[1]:>10}")
    out.append("")
    out.append("latent heat released: " + ", ".join(f"{PATH_NAMES[p.model]} {p.latent_heat_J_per_g:.1f} J/g" for p in paths))
    for p in paths:
        out.append(f"cooling-curve arrests, {PATH_NAMES[p.model]}:")
        for a in p.arrests:
            heat = f", {a.heat_J_per_g:.1f} J/g" if a.heat_J_per_g is not None else ""
            out.append(f"  {quote.temperature(a.temperature_K, unit):>12}  {a.description}{heat}")
        out += [f"  note: {n}" for n in p.notes]
    out.append("Scheil takes no diffusion in the solid and a fully mixed liquid; a real casting lies between the paths.")
    out += slow_cooled_lines(constituents)
    out += closing_lines(system)
    return out


# --- plot ---------------------------------------------------------------------------------------
def render_plot(system, result, unit: str, ascii_only: bool) -> str:
    """Both paths drawn by plotext at the terminal's size (at least 80x20)."""
    from ..explorer.cooling_drawing import cooling_scene, draw_cooling
    from ..explorer.glyphs import glyphs_for
    from ..explorer.scales import Scales

    glyphs = glyphs_for(ascii_only)

    def draw(plt, width: int, height: int) -> None:
        draw_cooling(plt, cooling_scene(result, Scales(system.molar_mass, unit), glyphs, width, height), glyphs)

    return terminal_plot("fraction solid on cooling: equilibrium and Scheil", glyphs, 20, draw)
