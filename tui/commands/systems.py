"""`ladle systems`: the shipped and user systems with their sources and how many of their
independent checks pass (checks the model was not fitted to; fit targets and pure-element
melting points are not counted). The text is wrapped to the terminal's width; `--json` gives
every text in full."""

from __future__ import annotations

import argparse
import shutil
import sys

from ..quote import one_line
from .common import print_json

HELP = "list the alloy systems (shipped and your own) with their sources and independent checks passed"

#: Columns of the name, and the indent of the lines under it.
_NAME = 9


def add_arguments(p: argparse.ArgumentParser) -> None:
    p.add_argument("--json", action="store_true", help="print one JSON object (every text in full)")


def run(args: argparse.Namespace) -> int:
    from ladle.engine import SystemFileError
    from ladle.engine.checking.cache import check_counts
    from ladle.engine.files.catalog import catalog, find_system

    entries, conflicts = catalog()
    width = max(shutil.get_terminal_size((80, 24)).columns, 40)
    rows = []
    for e in entries:
        try:
            s = find_system(str(e.path))
        except SystemFileError as err:
            row = {"name": e.name, "origin": e.origin, "path": str(e.path), "error": str(err)}
        else:
            passed, total = check_counts(s)      # measured once per file and cached (seconds when new)
            row = {"name": e.name, "origin": e.origin, "path": str(e.path), "title": s.title,
                   "elements": list(s.elements), "covers_at_percent": _covers_at_percent(s),
                   "source": s.source, "safety": s.safety,
                   "independent_checks": total, "independent_checks_passed": passed,
                   "fit_targets": len(s.measured)}
        rows.append(row)
        if not args.json:                        # each system as soon as it is counted
            print("\n".join(render_row(row, width)), flush=True)
    if args.json:
        print_json({"systems": rows, "conflicts": conflicts})
    for c in conflicts:
        print(f"ladle: note: {one_line(c)}", file=sys.stderr)
    return 0


def _covers_at_percent(system) -> list[float] | dict[str, list[float]]:
    """The covered range as the file writes it (at%): [from, to] of a binary's second element, or
    {element: [from, to]} of a system of three or more elements ({} where it covers all)."""
    if len(system.elements) == 2:
        return [100 * system.covers[0], 100 * system.covers[1]]
    return {el: [round(100 * lo, 9), round(100 * hi, 9)] for el, (lo, hi) in system.covers_elements.items()}


def render_row(row: dict, width: int) -> list[str]:
    """One system's lines, wrapped to `width` columns: name and title, independent checks
    passed (and the fit targets, not counted), source. The name (a file's) and a file's problem
    are shown with their control characters escaped."""
    import textwrap

    row = {**row, "name": one_line(row["name"])} | ({"error": one_line(row["error"])} if "error" in row else {})

    def wrapped(first: str, text: str) -> list[str]:
        return textwrap.wrap(text, width, initial_indent=first, subsequent_indent=" " * _NAME) or [first.rstrip()]

    if "error" in row:
        return wrapped(f"{row['name']:<{_NAME - 1}} ", f"(unreadable) {row['error']}")
    covers = row["covers_at_percent"]
    if isinstance(covers, dict):
        text = ", ".join(f"{el} {lo:g}-{hi:g} at%" for el, (lo, hi) in covers.items())
        span = f" [covers {text}]" if text else ""
    else:
        lo, hi = covers
        span = "" if (lo, hi) == (0, 100) else f" [covers {lo:g}-{hi:g} at% {row['elements'][1]}]"
    mark = " (yours)" if row["origin"] == "user" else ""
    lines = wrapped(f"{row['name']:<{_NAME - 1}} ", f"{row['title'] or '-'.join(row['elements'])}{span}{mark}")
    total, passed = row["independent_checks"], row["independent_checks_passed"]
    checks = (f"independent checks passed: {passed} of {total}" if total else "no independent checks")
    targets = row["fit_targets"]
    if targets:
        checks += f"; {targets} fit target{'s' if targets != 1 else ''} (not counted)"
    lines += wrapped(" " * _NAME, f"{checks} (ladle check {row['name']})")
    lines += wrapped(" " * _NAME, f"source: {row['source']}")
    return lines
