"""`ladle point`: the phases of one alloy at one temperature."""

from __future__ import annotations

import argparse

from .. import quote
from .common import (add_composition_argument, add_system_argument, alloy_both, closing_lines, open_system, print_json,
                     read_alloy, system_title, temperature_both, temperature_kelvin)

HELP = "phases, their compositions and amounts for one alloy at one temperature"

#: What the alloy's Gibbs energy is measured from, in every table.
GIBBS_REFERENCE = "(relative to the pure elements as their stable solids at this temperature)"


def add_arguments(p: argparse.ArgumentParser) -> None:
    add_system_argument(p)
    p.add_argument("--temp", required=True, metavar="T", help="temperature, e.g. 1250, 1250C, 1523.15K, 2282F (no unit: C)")
    add_composition_argument(p)
    p.add_argument("--json", action="store_true", help="print one JSON object")


def run(args: argparse.Namespace) -> int:
    from ladle.engine import equilibrate

    system = open_system(args.system, args.without)
    t = temperature_kelvin(system, args.temp)
    x, comp = read_alloy(system, args.comp)
    binary = len(system.elements) == 2
    result = equilibrate(system, t.kelvin, float(x[1]) if binary else x)
    if args.json:
        print_json(result.to_json(system))
        return 0
    lines = render(system, result, t.unit, comp.shown_element, comp.basis) if binary else \
        render_every_element(system, result, t.unit, comp.basis)
    print("\n".join(lines))
    return 0


def render_every_element(system, result, unit: str, basis: str) -> list[str]:
    """The table of an alloy of three or more elements: every phase with its amount and the
    content of every element, in the person's basis ("wt" or "at"; --json gives both)."""
    from ..phase_names import equilibrium_labels

    first, amount_name, other_name = ("w", "mass %", "mol %") if basis == "wt" else ("x", "mol %", "mass %")

    def amount(p) -> str:
        a, b = (p.amount_mass, p.amount_mol) if basis == "wt" else (p.amount_mol, p.amount_mass)
        return f"{quote.percent(a)} {amount_name} ({quote.percent(b)} {other_name})"

    labels = equilibrium_labels(system, result.phases, result.temperature_K)
    head = ("phase", "amount, of the alloy") + tuple(f"{el} {basis}%" for el in system.elements)
    rows = [head] + [(label, amount(p)) + tuple(quote.percent(v) for v in getattr(p, first))
                     for label, p in zip(labels, result.phases, strict=True)]
    widths = [max(len(r[i]) for r in rows) for i in range(len(head))]
    lines = [f"{system_title(system)} at {temperature_both(result.temperature_K, unit)}",
             f"alloy: {alloy_both(system, result.x, basis)}",
             f"stable: {' + '.join(labels)}",
             ""]
    lines += ["  ".join(f"{v:<{w}}" if i < 2 else f"{v:>{w}}" for i, (v, w) in enumerate(zip(r, widths))).rstrip()
              for r in rows]
    lines.append("")
    lines.append(f"Gibbs energy of the alloy: {quote.energy(result.gibbs_J_per_mol)} {GIBBS_REFERENCE}")
    if not result.converged:
        lines.append("warning: the equilibrium did not converge to its tolerance; treat this answer with suspicion")
    return lines + closing_lines(system)


def render(system, result, unit: str, element: str, basis: str) -> list[str]:
    """The human-readable table: the person's units first, the other unit beside them."""
    i = system.elements.index(element)
    first, second = ("w", "x") if basis == "wt" else ("x", "w")
    names = {"w": "wt%", "x": "at%"}
    amount_names = {"w": "mass %", "x": "mol %"}   # amounts: shares of the alloy, not compositions

    def comp(share) -> str:
        a, b = getattr(share, first)[i], getattr(share, second)[i]
        return f"{element} {quote.percent(a)} {names[first]} ({quote.percent(b)} {names[second]})"

    def amount(p) -> str:
        a = p.amount_mass if first == "w" else p.amount_mol
        b = p.amount_mol if first == "w" else p.amount_mass
        return f"{quote.percent(a)} {amount_names[first]} ({quote.percent(b)} {amount_names[second]})"

    from ..phase_names import phase_label

    among = [(p.name, p.x[1]) for p in result.phases]
    labels = [phase_label(system, p.name, p.x[1], result.temperature_K, among) for p in result.phases]
    lines = [
        f"{system_title(system)} at {temperature_both(result.temperature_K, unit)}",
        f"alloy: {comp(result)}",
        f"stable: {' + '.join(labels)}",
        "",
    ]
    rows = [("phase", "amount, of the alloy", "composition")] + [
        (label, amount(p), comp(p)) for label, p in zip(labels, result.phases, strict=True)]
    w0 = max(len(r[0]) for r in rows)
    w1 = max(len(r[1]) for r in rows)
    lines += [f"{r[0]:<{w0}}  {r[1]:<{w1}}  {r[2]}" for r in rows]
    lines.append("")
    lines.append(f"Gibbs energy of the alloy: {quote.energy(result.gibbs_J_per_mol)} {GIBBS_REFERENCE}")
    if not result.converged:
        lines.append("warning: a tie-line did not converge to its tolerance; treat this answer with suspicion")
    return lines + closing_lines(system)
