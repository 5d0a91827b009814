"""`ladle transitions`: every temperature at which one alloy's stable phases change, from above the
liquidus down to room temperature, with the trade's names of the lines and the heat-treatment
window where the system names one."""

from __future__ import annotations

import argparse

from .. import quote
from ..errors import CommandError
from .common import (add_composition_argument, add_system_argument, closing_lines, open_system, print_json,
                     read_alloy, system_title, temperature_both)

HELP = "every temperature where one alloy's stable phases change, hot to cold, with the trade's names of the lines"

SPECIFICATION_NOTE = ("Heat-treatment temperatures here are equilibrium estimates from the model: the alloy's "
                      "specification and the user's qualified procedure govern.")
COOLING_NOTE = ("Real cooling rates change these constituents (faster cooling gives finer pearlite, bainite or "
                "martensite); they are no prediction of a part's structure or hardness.")


def add_arguments(p: argparse.ArgumentParser) -> None:
    add_system_argument(p)
    add_composition_argument(p)
    p.add_argument("--unit", choices=("C", "K", "F"), default="C", help="temperature unit of the table (default C)")
    p.add_argument("--step", type=float, default=None, metavar="K",
                   help="scan step in K (default 1): a field narrower than the step with the same phases on both sides is missed")
    p.add_argument("--json", action="store_true", help="print one JSON object")


def run(args: argparse.Namespace) -> int:
    from ladle.engine.diagrams.alloy_transitions import alloy_transitions
    from ladle.engine.diagrams.heat_treatment import line_labels
    from ladle.engine.files.trade_names import trade_names
    from ladle.engine.units import mass_from_mole

    from ..treatment_window import treatment_window

    system = open_system(args.system, args.without)
    x, alloy = read_alloy(system, args.comp)
    if args.step is not None and not (0.01 <= args.step <= 100.0):
        raise CommandError(f"--step {args.step:g}: expected a scan step between 0.01 and 100 K")
    result = alloy_transitions(system, x, **({} if args.step is None else {"step_K": args.step}))
    names = trade_names(system)
    labels = line_labels(result, names.line)
    window = treatment_window(system, result, labels, names.heat_treatment)
    constituents = ()
    if names.heat_treatment == "austenitizing":
        from ladle.engine.diagrams.heat_treatment import slow_cooled_constituents

        constituents = slow_cooled_constituents(result, names.line, names.phase_name)
    w = mass_from_mole(x, system.molar_mass)
    if args.json:
        print_json(_json(system, result, labels, window, constituents, x, w))
        return 0
    print("\n".join(_render(system, result, labels, names, window, constituents, alloy, x, w, args.unit)))
    return 0


def _json(system, result, labels: dict[int, str], window, constituents, x, w) -> dict:
    els = system.elements
    return {
        "system": system.name,
        "mole_fraction": {el: float(x[i]) for i, el in enumerate(els)},
        "mass_fraction": {el: float(w[i]) for i, el in enumerate(els)},
        "scan_K": [result.highest_K, result.lowest_K],
        "step_K": result.step_K,
        "tolerance_K": result.tolerance_K,
        "transitions": [
            {"temperature_K": t.temperature_K, "above": list(t.above), "below": list(t.below),
             "label": labels.get(i),
             "phases_below": [{"name": p.name, "phase_fraction_mol": p.amount_mol, "phase_fraction_mass": p.amount_mass,
                               "mole_fraction": {el: float(p.x[k]) for k, el in enumerate(els)}}
                              for p in t.amounts_below]}
            for i, t in enumerate(result.transitions)],
        "heat_treatment_window": None if window is None else {
            "kind": window.kind, "low_K": window.low_K, "high_K": window.high_K, "low_is": window.low_is,
            "high_is": window.high_is, "phases": list(window.phases), "notes": list(window.notes)},
        "slow_cooled_constituents": [{"name": c.name, "mass_fraction": c.mass_fraction} for c in constituents] or None,
        "warnings": list(result.warnings),
    }


def _alloy_line(system, alloy, x, w) -> str:
    """'C 0.400 wt% (1.84 at%)' for each element the person named (the binary's second element
    where none was named)."""
    shown = alloy.named or (alloy.shown_element,)
    first, second = (w, x) if alloy.basis == "wt" else (x, w)
    other = "at" if alloy.basis == "wt" else "wt"
    parts = []
    for el in shown:
        i = system.elements.index(el)
        parts.append(f"{el} {quote.percent(first[i])} {alloy.basis}% ({quote.percent(second[i])} {other}%)")
    return ", ".join(parts)


def _phases(names, phases, T: float) -> str:
    """'fcc (austenite) + Fe3C (cementite)': each phase with the trade's name at T (K) beside it."""
    from ..phase_names import beside

    return " + ".join(beside(p, names.phase_name(p, T)) for p in phases)


def change_line(system, change, unit: str) -> str:
    """'   749.8 °C  fcc  ->  fcc (Ag-rich) + fcc (Cu-rich)': one change of an alloy's transition
    scan (engine/diagrams/alloy_transitions.py), its phases named from the point equilibria on
    both sides of it, for `ladle transitions` and `ladle melt`."""
    from ..phase_names import change_side

    T = change.temperature_K
    above = change_side(system, change.above, T + 1e-3, lambda _: change.above_equilibrium)
    below = change_side(system, change.below, T - 1e-3, lambda _: change.below_equilibrium)
    return f"  {quote.temperature(T, unit):>11}  {above}  ->  {below}"


def _render(system, result, labels, names, window, constituents, alloy, x, w, unit: str) -> list[str]:
    from ..phase_names import equilibrium_labels

    lines = [f"{system_title(system)}, alloy {_alloy_line(system, alloy, x, w)}",
             f"equilibrium phase changes on cooling from {temperature_both(result.highest_K, unit)} "
             f"to {temperature_both(result.lowest_K, unit)} (each within {result.tolerance_K:g} K):"]
    if not result.transitions:
        lines.append(f"  none: {_phases(names, result.top, result.highest_K)} throughout")
    used = []
    for i, t in enumerate(result.transitions):
        T = t.temperature_K
        label = labels.get(i)
        if label and label not in used:
            used.append(label)
        lines.append(change_line(system, t, unit) + (f"   [{label}]" if label else ""))
        shown = equilibrium_labels(system, t.amounts_below, T)
        amounts = ", ".join(f"{name} {quote.percent(p.amount_mass)} mass %" for name, p in zip(shown, t.amounts_below))
        lines.append(f"  {'':>11}  just below: {amounts} of the alloy")
    for label in used:
        note = next((ln.note for ln in names.lines if ln.name == label and ln.note), "")
        if note:
            lines.append(f"{label}: {note}")
    if used and names.lines_note:
        lines.append(names.lines_note)
    if window is not None:
        lines.append("")
        lines += _window_lines(window, names, unit)
        lines.append(SPECIFICATION_NOTE)
    lines += slow_cooled_lines(constituents)
    for warning in result.warnings:
        lines.append(f"warning: {warning}")
    return lines + closing_lines(system)


def slow_cooled_lines(constituents) -> list[str]:
    """A steel's constituents after slow cooling through A1 (mass fractions) with the caution that
    real cooling rates change them; nothing where there are none."""
    if not constituents:
        return []
    parts = ", ".join(f"{c.name} {quote.percent(c.mass_fraction)} mass %" for c in constituents)
    return ["", f"after slow cooling through A1 (lever rule, equilibrium): {parts}", COOLING_NOTE]


def _window_lines(window, names, unit: str) -> list[str]:
    what = {"austenitizing": "austenitizing window", "solution": "solution-treatment window"}[window.kind]
    T_mid = window.low_K + 1e-3
    phases = _phases(names, window.phases, T_mid)
    low = f"{quote.temperature(window.low_K, unit)} ({window.low_is})"
    if window.high_K is None:
        lines = [f"{what} (equilibrium): {phases} above {low}"]
    elif window.high_K <= window.low_K:
        lines = [f"{what} (equilibrium): none: the {window.high_is} "
                 f"({quote.temperature(window.high_K, unit)}) lies at or below the {window.low_is} ({low})"]
    else:
        lines = [f"{what} (equilibrium): {phases} from {low} to "
                 f"{quote.temperature(window.high_K, unit)} ({window.high_is})"]
    return lines + [f"  note: {n}" for n in window.notes]
