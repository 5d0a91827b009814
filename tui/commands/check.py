"""`ladle check`: every [[check]] fact of a system against the model, with its source.

A report: the exit status is 0 whether the checks pass or not, 2 on bad input.
"""

from __future__ import annotations

import argparse

from .. import quote
from .common import add_system_argument, open_system, print_json

HELP = "compare a system's model with the measured facts in its file ([[check]]): model, reference, difference, tolerance, source"


def add_arguments(p: argparse.ArgumentParser) -> None:
    add_system_argument(p)
    p.add_argument("--json", action="store_true", help="print one JSON object")


def run(args: argparse.Namespace) -> int:
    from ladle.engine.measure import evaluate_all

    system = open_system(args.system)
    outcomes = evaluate_all(system, system.checks)
    if args.json:
        print_json(report_json(system, outcomes))
    else:
        print("\n".join(render(system, outcomes)))
    return 0


def outcome_json(system, outcome) -> dict:
    """One fact's outcome as JSON (temperatures in K, compositions in at%); shared with `ladle fit`."""
    from ladle.engine.measure import describe

    f = outcome.fact
    return {
        "index": f.index, "kind": f.kind, "label": describe(f, system), "passed": outcome.passed,
        "problem": outcome.problem, "model_reaction": outcome.model_reaction, "source": f.source,
        "comparisons": [{"quantity": c.quantity, "unit": c.unit, "model": c.model, "reference": c.reference,
                         "difference": c.difference, "spread": c.spread, "within": c.within}
                        for c in outcome.comparisons],
    }


def report_json(system, outcomes) -> dict:
    return {"system": system.name, "passed": sum(o.passed for o in outcomes), "total": len(outcomes),
            "checks": [outcome_json(system, o) for o in outcomes]}


def _value(value: float | None, unit: str) -> str:
    if value is None:
        return "none"
    if unit == "K":
        return quote.temperature(value, "C", 2)
    return f"{value:.2f} at%"


def _signed(value: float | None, unit: str) -> str:
    if value is None:
        return "-"
    return f"{value:+.2f} {'K' if unit == 'K' else 'at%'}"


def _spread(value: float | None, unit: str) -> str:
    if value is None:
        return "none given"
    return f"{value:g} {'K' if unit == 'K' else 'at%'}"


def comparison_rows(outcome, spread_name: str) -> list[str]:
    """The aligned rows of one fact's comparisons (shared with `ladle fit`)."""
    rows = [("quantity", "model", "reference", "difference", spread_name, "")]
    for c in outcome.comparisons:
        mark = "ok" if c.within else ("no" if c.model is not None else "")
        rows.append((c.quantity, _value(c.model, c.unit), _value(c.reference, c.unit),
                     _signed(c.difference, c.unit), _spread(c.spread, c.unit), mark))
    widths = [max(len(r[i]) for r in rows) for i in range(6)]
    return ["  ".join(f"{cell:<{w}}" if i == 0 else f"{cell:>{w}}" for i, (cell, w) in enumerate(zip(r, widths))).rstrip()
            for r in rows]


def render(system, outcomes) -> list[str]:
    """The human-readable report: one block per fact, sources beside them."""
    title = system.title or "-".join(system.elements)
    passed = sum(o.passed for o in outcomes)
    if not outcomes:
        return [f"{title}: the file holds no [[check]] facts"]
    lines = [f"{title}: {passed} of {len(outcomes)} checks pass", ""]
    from ladle.engine.measure import describe

    for o in outcomes:
        verdict = "PASS" if o.passed else "FAIL"
        kind = f" (model: {o.model_reaction})" if o.model_reaction and o.model_reaction != o.fact.reaction else ""
        lines.append(f"{verdict}  check {o.fact.index + 1}: {describe(o.fact, system)}{kind}")
        if o.problem:
            lines.append(f"      {o.problem}")
        if o.comparisons:
            lines += ["      " + r for r in comparison_rows(o, "tolerance")]
        lines.append(f"      source: {o.fact.source}")
        lines.append("")
    lines.append("Temperatures in C; differences and tolerances in K (1 K = 1 C of difference).")
    lines.append("Computed estimates: defer to the alloy's specification and certified data.")
    return lines
