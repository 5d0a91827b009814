"""`ladle melt` for alloys of three or more elements: liquidus, solidus, freezing range and every
change of the stable phases on cooling, from the one-alloy transition scan
(ladle.engine.diagrams.alloy_transitions). Binary alloys keep melt.py's answer."""

from __future__ import annotations

import argparse

from .. import quote
from .cast_iron import cast_iron_lines, cast_iron_report
from .common import alloy_both, closing_lines, print_json, read_alloy, system_title, temperature_both


def run_alloy(system, args: argparse.Namespace) -> int:
    """Print the melt range of the --comp alloy of `system` (text, or JSON with --json)."""
    from ladle.engine.diagrams.alloy_transitions import alloy_transitions
    from ladle.engine.units import mass_from_mole

    from ..heatlist import parse_temperature_difference

    x, comp = read_alloy(system, args.comp)
    superheat_K = None if args.superheat is None else parse_temperature_difference(args.superheat, args.unit)[0]
    scan = alloy_transitions(system, x)
    liquidus, solidus = scan.liquidus_K, scan.solidus_K
    freezing = None if liquidus is None or solidus is None else liquidus - solidus
    pouring_K = None if superheat_K is None or liquidus is None else liquidus + superheat_K
    cast_iron = cast_iron_report(system, x)
    if args.json:
        w = mass_from_mole(x, system.molar_mass)
        print_json({
            "system": system.name,
            "mole_fraction": {el: float(v) for el, v in zip(system.elements, x)},
            "mass_fraction": {el: float(v) for el, v in zip(system.elements, w)},
            "liquidus_K": liquidus, "solidus_K": solidus, "freezing_range_K": freezing,
            **({} if superheat_K is None else {"superheat_K": superheat_K, "pouring_K": pouring_K}),
            **({} if cast_iron is None else {"cast_iron": cast_iron}),
            "crossings": [{"temperature_K": c.temperature_K, "above": list(c.above), "below": list(c.below)}
                          for c in scan.transitions],
            "warnings": list(scan.warnings),
        })
        return 0
    unit = args.unit

    def temp(T: float | None) -> str:
        return "not inside the scanned range" if T is None else temperature_both(T, unit)

    lines = [f"{system_title(system)}, alloy {alloy_both(system, x, comp.basis)}",
             f"liquidus        {temp(liquidus)}",
             f"solidus         {temp(solidus)}"]
    if freezing is not None:
        lines.append(f"freezing range  {quote.temperature_difference(freezing, unit)}")
    if superheat_K is not None:
        lines.append(pouring_line(pouring_K, superheat_K, unit))
    lines += cast_iron_lines(cast_iron, unit)
    from .transitions import change_line

    lines.append("on cooling:")
    lines += [f" {change_line(system, c, unit)}" for c in scan.transitions]
    lines += [f"note: {w}" for w in scan.warnings]
    print("\n".join(lines + closing_lines(system)))
    return 0


def pouring_line(pouring_K: float | None, superheat_K: float, unit: str) -> str:
    """'pouring  ...: liquidus + your superheat of 60.0 °C (ladle advises none)' (K, unit "C",
    "K" or "F")."""
    pouring = "no liquidus in the mapped range" if pouring_K is None else temperature_both(pouring_K, unit)
    return (f"pouring         {pouring}: liquidus + your superheat of "
            f"{quote.temperature_difference(superheat_K, unit)} (ladle advises none)")
