"""`ladle melt`: where an alloy starts and finishes melting."""

from __future__ import annotations

import argparse

from .. import quote
from .common import (add_composition_argument, add_system_argument, alloy_composition, closing_lines,
                     composition_both, open_system, print_json, system_title, temperature_both)

HELP = "liquidus, solidus, freezing range and every phase change of one alloy"


def add_arguments(p: argparse.ArgumentParser) -> None:
    add_system_argument(p)
    add_composition_argument(p)
    p.add_argument("--unit", choices=("C", "K", "F"), default="C", help="temperature unit of the table (default C)")
    p.add_argument("--json", action="store_true", help="print one JSON object")


def run(args: argparse.Namespace) -> int:
    from ladle.engine.diagrams.melt import melt_range
    from ladle.engine.units import mass_from_mole

    import numpy as np

    system = open_system(args.system)
    if len(system.elements) != 2:
        from .alloy_melt import run_alloy

        return run_alloy(system, args)
    x_b, comp = alloy_composition(system, args.comp)
    m = melt_range(system, x_b)
    x = np.array([1.0 - x_b, x_b])
    w = mass_from_mole(x, system.molar_mass)
    els = system.elements
    if args.json:
        print_json({
            "system": system.name,
            "mole_fraction": {els[0]: float(x[0]), els[1]: float(x[1])},
            "mass_fraction": {els[0]: float(w[0]), els[1]: float(w[1])},
            "liquidus_K": m.liquidus_K, "solidus_K": m.solidus_K, "freezing_range_K": m.freezing_range_K,
            "crossings": [{"temperature_K": c.temperature_K, "above": list(c.above), "below": list(c.below)}
                          for c in m.crossings],
        })
        return 0
    unit = args.unit
    print(f"{system_title(system)}, alloy {composition_both(system, x_b, comp.shown_element, comp.basis)}")

    def temp(T: float | None) -> str:
        return "not inside the mapped range" if T is None else temperature_both(T, unit)

    print(f"liquidus        {temp(m.liquidus_K)}")
    print(f"solidus         {temp(m.solidus_K)}")
    if m.freezing_range_K is not None:
        print(f"freezing range  {m.freezing_range_K * (1.8 if unit == 'F' else 1.0):.1f} {'K' if unit != 'F' else 'F'}")
    print("on cooling:")
    for c in m.crossings:
        print(f"  {quote.temperature(c.temperature_K, unit):>12}  {' + '.join(c.above)}  ->  {' + '.join(c.below)}")
    print("\n".join(closing_lines(system)))
    return 0
