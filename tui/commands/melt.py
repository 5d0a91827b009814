"""`ladle melt`: where an alloy starts and finishes melting."""

from __future__ import annotations

import argparse

from .. import quote
from .common import (add_composition_argument, add_system_argument, alloy_composition, closing_lines,
                     composition_both, open_system, print_json, require_liquid, system_title, temperature_both)

HELP = "liquidus, solidus, freezing range and every phase change of one alloy"


def add_arguments(p: argparse.ArgumentParser) -> None:
    add_system_argument(p)
    add_composition_argument(p)
    p.add_argument("--unit", choices=("C", "K", "F"), default="C", help="temperature unit of the table (default C)")
    p.add_argument("--superheat", metavar="DT", help="also print the pouring temperature: liquidus + this superheat "
                   "(your shop's rule, e.g. 60C; ladle advises none)")
    p.add_argument("--json", action="store_true", help="print one JSON object")


NEAR_EUTECTIC_K = 10.0   # rule of thumb (common practice): an alloy that freezes over less than this is
                         # "near-eutectic" when it lies on either side of a eutectic


def _eutectic(system, x_b: float):
    """(the eutectic position of the alloy, the eutectic's and the alloy's wt% of B) or None."""
    from ladle.engine.diagrams.diagram import map_diagram
    from ladle.engine.diagrams.eutectic_position import eutectic_position
    from ladle.engine.solidify.records import mass_fraction_of_B

    position = eutectic_position(map_diagram(system), x_b)
    if position is None:
        return None
    return position, 100.0 * mass_fraction_of_B(system, position.x_eutectic), 100.0 * mass_fraction_of_B(system, x_b)


def eutectic_lines(system, x_b: float, freezing_range_K: float | None, unit: str) -> list[str]:
    """'eutectic alloy', 'near-eutectic, hypoeutectic (less Sn than ...)' or 'hypereutectic ...';
    nothing for an alloy that freezes through no eutectic."""
    found = _eutectic(system, x_b)
    if found is None:
        return []
    position, w_e, w = found
    b = system.elements[1]
    where = f"the eutectic is {quote.percent(w_e / 100.0)} wt% {b} at {quote.temperature(position.temperature_K, unit)}"
    if abs(w - w_e) < 0.05:      # the same to the tenth of a percent shown
        return [f"eutectic alloy: {where}"]
    side = "hypoeutectic" if w < w_e else "hypereutectic"
    more = "less" if w < w_e else "more"
    near = "near-eutectic, " if freezing_range_K is not None and freezing_range_K < NEAR_EUTECTIC_K else ""
    return [f"{near}{side}: {more} {b} than the eutectic ({where})"]


def eutectic_json(system, x_b: float) -> dict | None:
    """The eutectic the alloy freezes through, for --json (None: none)."""
    found = _eutectic(system, x_b)
    if found is None:
        return None
    position, _, _ = found
    return {"temperature_K": position.temperature_K, "x_eutectic": position.x_eutectic, "side": position.side}


def run(args: argparse.Namespace) -> int:
    from ladle.engine.diagrams.melt import melt_range
    from ladle.engine.units import mass_from_mole

    import numpy as np

    from ..heatlist import parse_temperature_difference

    system = open_system(args.system, args.without)
    require_liquid(system)
    from ladle.engine.diagrams.mappable import unmapped_phases

    if len(system.elements) != 2 or unmapped_phases(system):     # no mapped diagram: point equilibria
        from .alloy_melt import run_alloy

        return run_alloy(system, args)
    x_b, comp = alloy_composition(system, args.comp)
    superheat_K = None if args.superheat is None else parse_temperature_difference(args.superheat, args.unit)[0]
    m = melt_range(system, x_b)
    pouring_K = None if superheat_K is None or m.liquidus_K is None else m.liquidus_K + superheat_K
    x = np.array([1.0 - x_b, x_b])
    w = mass_from_mole(x, system.molar_mass)
    els = system.elements
    if args.json:
        print_json({
            "system": system.name,
            "mole_fraction": {els[0]: float(x[0]), els[1]: float(x[1])},
            "mass_fraction": {els[0]: float(w[0]), els[1]: float(w[1])},
            "liquidus_K": m.liquidus_K, "solidus_K": m.solidus_K, "freezing_range_K": m.freezing_range_K,
            "eutectic": eutectic_json(system, x_b),
            **({} if superheat_K is None else {"superheat_K": superheat_K, "pouring_K": pouring_K}),
            "crossings": [{"temperature_K": c.temperature_K, "above": list(c.above), "below": list(c.below)}
                          for c in m.crossings],
            "warnings": list(m.warnings),
        })
        return 0
    unit = args.unit
    print(f"{system_title(system)}, alloy {composition_both(system, x_b, comp.shown_element, comp.basis)}")

    def temp(T: float | None) -> str:
        return "not inside the mapped range" if T is None else temperature_both(T, unit)

    print(f"liquidus        {temp(m.liquidus_K)}")
    print(f"solidus         {temp(m.solidus_K)}")
    if m.freezing_range_K is not None:
        print(f"freezing range  {quote.temperature_difference(m.freezing_range_K, unit)}")
    for line in eutectic_lines(system, x_b, m.freezing_range_K, unit):
        print(line)
    if superheat_K is not None:
        from .alloy_melt import pouring_line

        print(pouring_line(pouring_K, superheat_K, unit))
    from ladle.engine import equilibrate

    from ..phase_names import change_side

    print("on cooling:")
    for c in m.crossings:
        T = c.temperature_K
        sides = (change_side(system, phases, T + d, lambda at: equilibrate(system, at, x_b))
                 for phases, d in ((c.above, 1e-3), (c.below, -1e-3)))
        print(f"  {quote.temperature(T, unit):>12}  {'  ->  '.join(sides)}")
    for warning in m.warnings:
        print(f"note: {warning}")
    print("\n".join(closing_lines(system)))
    return 0
