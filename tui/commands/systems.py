"""`ladle systems`: the shipped and user systems with their sources."""

from __future__ import annotations

import argparse
import sys

from .common import print_json

HELP = "list the alloy systems (shipped and your own) with their sources"


def add_arguments(p: argparse.ArgumentParser) -> None:
    p.add_argument("--json", action="store_true", help="print one JSON object")


def run(args: argparse.Namespace) -> int:
    from ladle.engine import SystemFileError
    from ladle.engine.catalog import catalog, find_system
    from ladle.engine.measure_cache import check_counts

    entries, conflicts = catalog()
    rows = []
    for e in entries:
        try:
            s = find_system(str(e.path))
        except SystemFileError as err:
            rows.append({"name": e.name, "origin": e.origin, "path": str(e.path), "error": str(err)})
            continue
        rows.append({"name": e.name, "origin": e.origin, "path": str(e.path), "title": s.title,
                     "elements": list(s.elements), "covers_at_percent": [100 * s.covers[0], 100 * s.covers[1]],
                     "source": s.source, "safety": s.safety, "checks": len(s.checks),
                     "checks_passed": check_counts(s)[0]})
    if args.json:
        print_json({"systems": rows, "conflicts": conflicts})
        return 0
    for r in rows:
        if "error" in r:
            print(f"{r['name']:<8} (unreadable) {r['error']}")
            continue
        lo, hi = r["covers_at_percent"]
        span = "" if (lo, hi) == (0, 100) else f" [covers {lo:g}-{hi:g} at% {r['elements'][1]}]"
        mark = " (yours)" if r["origin"] == "user" else ""
        print(f"{r['name']:<8} {r['title'] or '-'.join(r['elements'])}{span}{mark}")
        if r["checks"]:
            print(f"         checks: {r['checks_passed']} of {r['checks']} pass (ladle check {r['name']})")
        print(f"         source: {r['source']}")
    for c in conflicts:
        print(f"ladle: note: {c}", file=sys.stderr)
    return 0
