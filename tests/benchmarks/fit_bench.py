"""Fitting benchmark (run on demand, not collected by pytest):

    python tests/benchmarks/fit_bench.py [--json] [--seeds 20] [--no-shipped]

Measures:
- round_trip: the invented simple eutectic of tests/unit/measure_systems.py (4 free coefficients,
  10 measured values: eutectic temperature and three compositions, four liquidus temperatures,
  two solvus compositions) generated from known coefficients with Gaussian noise of the stated
  uncertainties, one fit per seed from the same perturbed start. Reports the median and largest
  wall time, the median number of model evaluations, and the pulls (fitted - true) / reported
  uncertainty: for honest uncertainties their mean is near 0, their standard deviation near 1,
  and about 68 % lie within 1 (99.7 % within 3).
- shipped: every shipped system with a [fit] table, fitted again from its own values and from a
  start moved by 1 kJ/mol (at the middle of its temperature window) on every free coefficient:
  wall time, evaluations, and whether the result is acceptable.
"""

from __future__ import annotations

import argparse
import copy
import json
import statistics
import sys
import tempfile
import time
from pathlib import Path

import numpy as np

HERE = Path(__file__).resolve().parent
sys.path.insert(0, str(HERE.parent / "unit"))

from ladle.engine import load_system  # noqa: E402
from ladle.engine.files.catalog import find_system, list_systems  # noqa: E402
from ladle.engine.fitting.fit import fit  # noqa: E402
from ladle.engine.fitting.parameters import parse_free  # noqa: E402
from test_fit import FREE, START, measurements_from_true_model  # noqa: E402
from measure_systems import EUTECTIC_TRUE, eutectic_text, write  # noqa: E402


def round_trip(seeds: int) -> dict:
    folder = Path(tempfile.mkdtemp())
    pulls, seconds, evaluations, acceptable = [], [], [], 0
    for seed in range(seeds):
        facts = measurements_from_true_model(folder, np.random.default_rng(seed))
        system = load_system(write(folder, eutectic_text(START, FREE + facts)))
        started = time.perf_counter()
        result = fit(system)
        seconds.append(time.perf_counter() - started)
        evaluations.append(result.evaluations)
        acceptable += result.acceptable
        pulls.append([(p.value - EUTECTIC_TRUE[p.path]) / p.uncertainty for p in result.parameters])
    p = np.array(pulls)
    return {
        "fits": seeds, "acceptable": acceptable,
        "median_s": statistics.median(seconds), "max_s": max(seconds),
        "median_evaluations": statistics.median(evaluations),
        "pull_mean": float(p.mean()), "pull_std": float(p.std()),
        "within_1": float(np.mean(np.abs(p) <= 1.0)), "within_3": float(np.mean(np.abs(p) <= 3.0)),
    }


def shipped() -> list[dict]:
    rows = []
    for entry in list_systems():
        if entry.origin != "shipped":
            continue
        system = find_system(str(entry.path))
        if not system.fit_free or not system.measured:
            continue
        row = {"system": entry.name, "free": len(system.fit_free),
               "measured_values": None}
        for label, shift in (("from_file", 0.0), ("moved_1kJ", 1.0)):
            doc = copy.deepcopy(system.document)
            T_ref = 0.5 * sum(system.temperature_range_K)
            for p in parse_free(system.fit_free, doc):
                p.set(doc, p.get(doc) + shift * p.scale(T_ref))
            try:
                start = load_system(system.path, name=system.name, document=doc)
                started = time.perf_counter()
                result = fit(start)
                row[label] = {"s": round(time.perf_counter() - started, 2), "evaluations": result.evaluations,
                              "acceptable": result.acceptable, "chi_square": round(result.chi_square, 3)}
                row["measured_values"] = sum(len(o.comparisons) for o in result.outcomes)
            except ValueError as e:
                row[label] = {"error": str(e)}
        rows.append(row)
    return rows


def main() -> None:
    ap = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    ap.add_argument("--json", action="store_true")
    ap.add_argument("--seeds", type=int, default=20)
    ap.add_argument("--no-shipped", action="store_true")
    args = ap.parse_args()
    out = {"round_trip": round_trip(args.seeds)}
    if not args.no_shipped:
        out["shipped"] = shipped()
    if args.json:
        print(json.dumps(out, indent=1))
        return
    rt = out["round_trip"]
    print(f"round trip, {rt['fits']} fits ({rt['acceptable']} acceptable): median {rt['median_s']:.2f} s, "
          f"max {rt['max_s']:.2f} s, median {rt['median_evaluations']:.0f} evaluations")
    print(f"  pulls (fitted - true) / uncertainty: mean {rt['pull_mean']:+.2f}, std {rt['pull_std']:.2f}, "
          f"within 1: {100 * rt['within_1']:.0f} %, within 3: {100 * rt['within_3']:.0f} %")
    for row in out.get("shipped", []):
        print(f"{row['system']:<7} {row['free']} coefficients, {row['measured_values']} values: "
              + "; ".join(f"{k} {v}" for k, v in row.items() if k in ("from_file", "moved_1kJ")))


if __name__ == "__main__":
    main()
