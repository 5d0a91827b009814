"""`ladle check`: a system's model against the measured facts in its file, in three groups.

- independent checks: the `[[check]]` facts the model was not fitted to; the headline figure is
  how many of them pass;
- fit targets: the `[[measured]]` facts the parameters were fitted to, shown with their weighted
  residuals; agreement with them is not validation and is not counted;
- pure-element data (melting points, solid-state changes, Curie temperatures): built into the element data, neither.

A report: the exit status is 0 whether the checks pass or not, 2 on bad input.
"""

from __future__ import annotations

import argparse

from .common import ESTIMATE_NOTE, add_system_argument, open_system, print_json, system_title
from .fact_table import UNITS_NOTE, fact_blocks, outcome_json

HELP = ("compare a system's model with the facts in its file: independent checks (passed or failed), "
        "fit targets and pure-element data shown apart")


def add_arguments(p: argparse.ArgumentParser) -> None:
    add_system_argument(p)
    p.add_argument("--json", action="store_true", help="print one JSON object (temperatures in K, compositions in at%%)")


def run(args: argparse.Namespace) -> int:
    from ladle.engine.checking.measure import INDEPENDENT, evaluate_all, fact_role
    from ladle.engine.fitting.fit import fitting_view

    system = open_system(args.system, args.without)
    checks = evaluate_all(system, system.checks)
    targets = evaluate_all(fitting_view(system), system.measured)
    if args.json:
        independent = [o for o in checks if fact_role(o.fact, "check") == INDEPENDENT]
        print_json({"system": system.name,
                    "independent_passed": sum(o.passed for o in independent), "independent_total": len(independent),
                    "fit_targets": len(targets),
                    "facts": [outcome_json(system, o, "tolerance", "check") for o in checks]
                             + [outcome_json(system, o, "uncertainty", "measured") for o in targets]})
    else:
        print("\n".join(render(system, checks, targets)))
    return 0


def render(system, checks, targets) -> list[str]:
    """The human-readable report: the headline (independent checks passed), then the three groups,
    each fact with its comparisons and source."""
    from ladle.engine.checking.measure import INDEPENDENT, PURE_ELEMENT, fact_role

    title = system_title(system)
    independent = [o for o in checks if fact_role(o.fact, "check") == INDEPENDENT]
    pure = [o for o in checks if fact_role(o.fact, "check") == PURE_ELEMENT]
    if independent:
        head = f"{title}: {sum(o.passed for o in independent)} of {len(independent)} independent checks passed"
    else:
        head = f"{title}: the file holds no independent checks (no [[check]] fact the model was not fitted to)"
    lines = [head, f"({len(targets)} fit target{'s' if len(targets) != 1 else ''} and {len(pure)} "
                   f"pure-element value{'s' if len(pure) != 1 else ''} shown apart, not counted)", ""]
    if independent:
        lines += ["INDEPENDENT CHECKS: facts the model was not fitted to", ""]
        lines += fact_blocks(system, independent, "check", "tolerance", weighted=False)
    if targets:
        lines += ["FIT TARGETS: facts the parameters were fitted to (agreement here is not validation)", ""]
        lines += fact_blocks(system, targets, "measured", "uncertainty", weighted=True)
    if pure:
        lines += ["PURE-ELEMENT DATA: melting points, solid-state changes, Curie temperatures; built into the "
                  "element data (neither kind)", ""]
        lines += fact_blocks(system, pure, "check", "tolerance", weighted=False)
    lines.append(UNITS_NOTE)
    lines.append(ESTIMATE_NOTE)
    return lines
