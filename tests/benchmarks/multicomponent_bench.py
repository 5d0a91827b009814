"""Benchmark of the multicomponent commands (run on demand, not collected by pytest):

    python tests/benchmarks/multicomponent_bench.py [--json] [--repeats 5]

Side by side, on the invented ternaries of tests/unit/ideal_ternaries.py (an ideal ternary
eutectic, and the shipped lead-tin binary with bismuth added ideally):
- scheil_s: one ternary Scheil path (engine/solidify/alloy_scheil.py), with the number of point
  equilibria it took (target 0.2 s);
- isopleth_s: one ternary isopleth mapped (engine/diagrams/isopleth.py, default grid; target 2 s);
- isothermal_s: one ternary isothermal section (engine/diagrams/isothermal.py; target 0.5 s);
- projection_s: one ternary liquidus projection (engine/diagrams/liquidus_projection.py, default
  grid: valleys and four-phase invariants; no target in the issue);
- point_binary_s / point_ternary_s: `ladle point` in a fresh process for a binary alloy and for a
  ternary one (target: the ternary within 0.1 s of the binary).
Times are medians of --repeats runs (wall clock, time.perf_counter).
"""

from __future__ import annotations

import argparse
import json
import statistics
import subprocess
import sys
import tempfile
import time
from pathlib import Path

import numpy as np

sys.path.insert(0, str(Path(__file__).resolve().parents[1] / "unit"))

import ideal_ternaries  # noqa: E402

from ladle.engine import load_system  # noqa: E402
from ladle.engine.diagrams.isopleth import map_isopleth  # noqa: E402
from ladle.engine.diagrams.isothermal import map_isothermal  # noqa: E402
from ladle.engine.diagrams.liquidus_projection import map_liquidus_projection  # noqa: E402
from ladle.engine.solidify.alloy_scheil import AlloyScheil  # noqa: E402


def _median_time(work, repeats: int) -> tuple[float, object]:
    times, result = [], None
    for _ in range(repeats):
        t = time.perf_counter()
        result = work()
        times.append(time.perf_counter() - t)
    return statistics.median(times), result


def _command_time(argv: list[str], repeats: int) -> float:
    def run() -> None:
        done = subprocess.run([sys.executable, "-m", "ladle.tui.cli", *argv], capture_output=True, text=True)
        if done.returncode != 0:
            raise SystemExit(f"ladle {' '.join(argv)} failed: {done.stderr.strip()}")
    return _median_time(run, repeats)[0]


def main() -> None:
    parser = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    parser.add_argument("--json", action="store_true")
    parser.add_argument("--repeats", type=int, default=5)
    args = parser.parse_args()
    report: dict = {}
    with tempfile.TemporaryDirectory() as folder:
        paths = ideal_ternaries.write_system_files(folder)
        for name, x, section in (("ideal-eutectic", [0.6, 0.25, 0.15], ((0.85, 0.0, 0.15), (0.0, 0.85, 0.15), "at", "Sn")),
                                 ("pb-sn-bi", [0.6, 0.35, 0.05], ((0.95, 0.0, 0.05), (0.35, 0.6, 0.05), "at", "Sn"))):
            system = load_system(paths[name])
            scheil_s, scheil = _median_time(lambda: _scheil(system, x), args.repeats)
            iso_s, iso = _median_time(lambda: map_isopleth(system, *section), max(1, args.repeats // 2))
            section_T = 0.5 * sum(system.temperature_range_K)
            iso_T_s, _ = _median_time(lambda: map_isothermal(system, section_T), max(1, args.repeats // 2))
            projection_s, projection = _median_time(lambda: map_liquidus_projection(system), max(1, args.repeats // 2))
            report[name] = {"scheil_s": scheil_s, "scheil_point_equilibria": scheil[0], "scheil_end": scheil[1],
                            "isopleth_s": iso_s, "isopleth_lines": len(iso.lines), "isothermal_s": iso_T_s,
                            "isothermal_K": section_T, "projection_s": projection_s,
                            "projection_invariants": len(projection.invariants)}
        report["point_binary_s"] = _command_time(["point", "pb-sn", "--temp", "250C", "--comp", "Sn=30wt%"],
                                                 args.repeats)
        report["point_ternary_s"] = _command_time(["point", str(paths["pb-sn-bi"]), "--temp", "250C", "--comp",
                                                   "Sn=30wt%,Bi=2wt%"], args.repeats)
    if args.json:
        json.dump(report, sys.stdout, indent=2)
        print()
        return
    print(f"multicomponent benchmark (median of {args.repeats} runs; wall clock)")
    for name in ("ideal-eutectic", "pb-sn-bi"):
        r = report[name]
        print(f"  {name:15s} Scheil path {r['scheil_s']:.3f} s ({r['scheil_point_equilibria']} point equilibria, "
              f"ends: {r['scheil_end']}); isopleth {r['isopleth_s']:.2f} s ({r['isopleth_lines']} lines); "
              f"isothermal section at {r['isothermal_K']:.0f} K {r['isothermal_s']:.2f} s; liquidus projection "
              f"{r['projection_s']:.2f} s ({r['projection_invariants']} invariants)")
    print(f"  ladle point: binary {report['point_binary_s']:.3f} s, ternary {report['point_ternary_s']:.3f} s "
          f"(difference {report['point_ternary_s'] - report['point_binary_s']:+.3f} s)")


def _scheil(system, x) -> tuple[int, str]:
    """(point equilibria taken, how freezing ended) of one Scheil path."""
    scheil = AlloyScheil(system, np.array(x))
    end = scheil.path().end
    return scheil.calls, end


if __name__ == "__main__":
    main()
