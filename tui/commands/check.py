"""`ladle check`: every [[check]] fact of a system against the model, with its source.

A report: the exit status is 0 whether the checks pass or not, 2 on bad input.
"""

from __future__ import annotations

import argparse

from .common import ESTIMATE_NOTE, add_system_argument, open_system, print_json, system_title
from .fact_table import UNITS_NOTE, fact_blocks, outcome_json

HELP = "compare a system's model with the measured facts in its file ([[check]]): model, reference, difference, tolerance, source"


def add_arguments(p: argparse.ArgumentParser) -> None:
    add_system_argument(p)
    p.add_argument("--json", action="store_true", help="print one JSON object (temperatures in K, compositions in at%%)")


def run(args: argparse.Namespace) -> int:
    from ladle.engine.measure import evaluate_all

    system = open_system(args.system)
    outcomes = evaluate_all(system, system.checks)
    if args.json:
        print_json({"system": system.name, "passed": sum(o.passed for o in outcomes), "total": len(outcomes),
                    "checks": [outcome_json(system, o, "tolerance") for o in outcomes]})
    else:
        print("\n".join(render(system, outcomes)))
    return 0


def render(system, outcomes) -> list[str]:
    """The human-readable report: a summary line, then one block per check with its source."""
    title = system_title(system)
    if not outcomes:
        return [f"{title}: the file holds no [[check]] facts"]
    passed = sum(o.passed for o in outcomes)
    lines = [f"{title}: {passed} of {len(outcomes)} checks pass", ""]
    lines += fact_blocks(system, outcomes, "check", "tolerance", weighted=False)
    lines.append(UNITS_NOTE)
    lines.append(ESTIMATE_NOTE)
    return lines
