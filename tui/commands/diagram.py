"""`ladle diagram`: the whole phase diagram, as a plot in the terminal, JSON or CSV."""

from __future__ import annotations

import argparse
import csv
import sys

from .. import quote
from ..errors import CommandError
from .common import (add_system_argument, ascii_text, closing_lines, coverage_note, open_system, print_json, system_title,
                     terminal_plot)
from .section_diagram import add_section_arguments, run_section, wants_section, whole_binary

HELP = "the phase diagram: an ASCII plot with the reactions listed, or --json / --csv"


def add_arguments(p: argparse.ArgumentParser) -> None:
    add_system_argument(p)
    out = p.add_mutually_exclusive_group()
    out.add_argument("--json", action="store_true", help="print one JSON object: invariants, two-phase fields, melting points")
    out.add_argument("--csv", action="store_true", help="print the tie-lines of every two-phase field as CSV rows "
                     "(at least one every --every degrees)")
    p.add_argument("--every", type=float, default=2.0, metavar="DT",
                   help="--csv: a tie-line at least every DT degrees of --unit (default 2; smaller for more rows)")
    p.add_argument("--at", action="store_true", help="composition axis in at%% (default wt%%)")
    p.add_argument("--unit", choices=("C", "K", "F"), default="C", help="temperature unit (default C)")
    p.add_argument("--ascii", action="store_true", help="plain ASCII characters only")
    add_section_arguments(p)


def run(args: argparse.Namespace) -> int:
    from ladle.engine.diagrams.diagram import map_diagram
    from ladle.engine.diagrams.mappable import unmapped_phases

    system = open_system(args.system, args.without)
    if wants_section(args) or len(system.elements) != 2:
        return run_section(system, args)
    if unmapped_phases(system):
        return whole_binary(system, args)
    diagram = map_diagram(system)
    if args.json:
        print_json(diagram.to_json())
        return 0
    if args.csv:
        if not 0.01 <= args.every <= 1000.0:
            raise CommandError(f"--every {args.every:g}: expected a temperature step of 0.01 to 1000 degrees")
        write_csv(system, diagram, sys.stdout, args.unit, args.every / (1.8 if args.unit == "F" else 1.0))
        return 0
    basis = "at" if args.at else "wt"
    lines = reaction_lines(system, diagram, args.unit, basis) + [f"note: {w}" for w in diagram.warnings]
    print(render_plot(system, args.unit, basis, args.ascii))
    print("\n".join(ascii_text(lines + closing_lines(system), args.ascii)))
    return 0


def write_csv(system, diagram, stream, unit: str, every_K: float) -> None:
    """One row per tie-line that reaches into the range the model covers, at least one every
    `every_K` kelvin of each field: field, T in K (and in `unit` unless that is K), x_B and wt% B of
    each phase."""
    import numpy as np

    from ladle.engine.diagrams.dense_fields import dense_tie_lines
    from ladle.engine.units import kelvin_to, mass_from_mole

    b = system.elements[1]
    out = csv.writer(stream, lineterminator="\n")
    shown = [] if unit == "K" else [f"T_{unit}"]
    out.writerow(["field", "T_K", *shown, f"x_{b}_left", f"wt%_{b}_left", f"x_{b}_right", f"wt%_{b}_right"])
    for f in diagram.fields:
        name = "+".join(f.phases)
        for T, (xl, xr) in zip(*dense_tie_lines(system, f, every_K)):
            if not diagram.covers_tie_line(T, xl, xr):
                continue
            wl, wr = (float(mass_from_mole(np.array([1 - v, v]), system.molar_mass)[1]) for v in (xl, xr))
            in_unit = [] if unit == "K" else [f"{kelvin_to(T, unit):.4f}"]
            out.writerow([name, f"{T:.4f}", *in_unit, f"{xl:.8g}", f"{100 * wl:.6g}", f"{xr:.8g}", f"{100 * wr:.6g}"])


def render_plot(system, unit: str, basis: str, ascii_only: bool) -> str:
    """The diagram drawn by plotext at the terminal's size (at least 80x24)."""
    from ..explorer.diagram_drawing import diagram_scene, draw_diagram
    from ..explorer.exploration import Exploration
    from ..explorer.glyphs import glyphs_for
    from ..explorer.scales import Scales

    glyphs = glyphs_for(ascii_only)
    exploration = Exploration(system, Scales(system.molar_mass, unit, basis))
    title = " ".join(filter(None, (system_title(system), coverage_note(system))))

    def draw(plt, width: int, height: int) -> None:
        draw_diagram(plt, diagram_scene(exploration, glyphs, width, height), glyphs)

    return terminal_plot(title, glyphs, 24, draw)


def reaction_lines(system, diagram, unit: str, basis: str) -> list[str]:
    """The invariant reactions and special points, one line each, hottest first."""
    import numpy as np

    from ladle.engine.units import mass_from_mole

    from ..phase_names import phase_label

    b = system.elements[1]

    def comp(x_b: float) -> str:
        v = x_b if basis == "at" else float(mass_from_mole(np.array([1 - x_b, x_b]), system.molar_mass)[1])
        return f"{quote.percent(v)} {basis}% {b}"

    lines = ["reactions:" if diagram.invariants or diagram.special_points else "reactions: none in range"]
    for inv in diagram.invariants:
        phases = ", ".join(f"{phase_label(system, n, x, inv.temperature_K, inv.phases)} {comp(x)}" for n, x in inv.phases)
        lines.append(f"  {inv.kind:<12} {quote.temperature(inv.temperature_K, unit):>12}  {phases}")
    for sp in diagram.special_points:
        lines.append(f"  {sp.kind:<12} {quote.temperature(sp.temperature_K, unit):>12}  {' / '.join(sp.phases)} at {comp(sp.x_B)}")
    return lines
