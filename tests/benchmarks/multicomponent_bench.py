"""Benchmark of the multicomponent commands (run on demand, not collected by pytest):

    python tests/benchmarks/multicomponent_bench.py [--json] [--repeats 5]

On the invented ternaries of tests/unit/ideal_ternaries.py (an ideal ternary eutectic, and the
shipped lead-tin binary with bismuth added ideally) and on the shipped Sn-Ag-Cu (its tin corner):
- scheil: one ternary Scheil path (engine/solidify/alloy_scheil.py; target 0.2 s);
- isopleth: one ternary isopleth mapped (engine/diagrams/isopleth.py, default grid; target 2 s);
- isothermal: one ternary isothermal section (engine/diagrams/isothermal.py; target 0.5 s);
- projection: one ternary liquidus projection (engine/diagrams/liquidus_projection.py, default
  grid: valleys and four-phase invariants; no target in the issue; not for Sn-Ag-Cu, whose file
  covers only the tin corner);
- point_binary_s / point_ternary_s: `ladle point` in a fresh process for a binary alloy and for a
  ternary one (target: the ternary within 0.1 s of the binary);
- scheil_named: the Scheil path of one named alloy of each other shipped ternary (`[[alloy]]` of
  its file: the 14-carat gold 14ct-1N of Ag-Au-Cu, A356.0 of Al-Mg-Si, Rose's metal Bi50Pb28Sn22
  of Bi-Pb-Sn; target 0.2 s each).
Each computation is given as the median wall-clock time (time.perf_counter), the median CPU
time of this process (time.process_time, less disturbed by other work on a loaded machine) and
the number of point equilibria it took (each module's `equilibrate` counted; the projection
solves its own equilibria and has no count). To compare two
versions side by side, run this file once against each (PYTHONPATH pointing at a folder whose
`ladle` holds the other version's engine, tui and systems) in turns, and give the load average.
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

from ladle.engine import find_system, load_system  # noqa: E402
from ladle.engine.diagrams import isopleth, isothermal, liquidus_projection  # noqa: E402
from ladle.engine.files.alloys import find_alloy, mole_fractions  # noqa: E402
from ladle.engine.solidify import alloy_scheil  # noqa: E402
from ladle.engine.units import mole_from_mass  # noqa: E402

#: (system, Scheil alloy in mole fractions or None for the mass fractions of `SAC305`, isopleth
#: (start, end, basis, element), isothermal section temperature in K or None for the window's middle)
SAC305_WT = {"Sn": 0.965, "Ag": 0.03, "Cu": 0.005}   # Sn-3.0Ag-0.5Cu, wt%: the solder trade's designation
CASES = (
    ("ideal-eutectic", [0.6, 0.25, 0.15], ((0.85, 0.0, 0.15), (0.0, 0.85, 0.15), "at", "Sn"), None),
    ("pb-sn-bi", [0.6, 0.35, 0.05], ((0.95, 0.0, 0.05), (0.35, 0.6, 0.05), "at", "Sn"), None),
    ("ag-cu-sn", None, ((0.97, 0.03, 0.0), (0.95, 0.03, 0.02), "wt", "Cu"), 498.15),
)

#: (system, named alloy of its file) whose Scheil paths are timed beside the cases above
NAMED_SCHEIL = (("ag-au-cu", "14ct-1N"), ("al-mg-si", "A356.0"), ("bi-pb-sn", "Bi50Pb28Sn22"))


class _Counted:
    """Counts the point equilibria of the modules that call `equilibrate`, while it is active."""

    modules = (isopleth, isothermal, alloy_scheil)

    def __init__(self) -> None:
        self.calls = 0
        self.real = {m: m.equilibrate for m in self.modules}

    def __enter__(self) -> "_Counted":
        for module, real in self.real.items():
            def counted(*args, _real=real, **kwargs):
                self.calls += 1
                return _real(*args, **kwargs)
            module.equilibrate = counted
        return self

    def __exit__(self, *exc) -> None:
        for module, real in self.real.items():
            module.equilibrate = real


def _measured(work, repeats: int) -> dict:
    """Median wall-clock and CPU seconds of `work()` over `repeats` runs, and the point
    equilibria of the last run."""
    walls, cpus, calls = [], [], 0
    for _ in range(repeats):
        with _Counted() as counter:
            w, c = time.perf_counter(), time.process_time()
            work()
            walls.append(time.perf_counter() - w)
            cpus.append(time.process_time() - c)
        calls = counter.calls
    return {"wall_s": statistics.median(walls), "cpu_s": statistics.median(cpus), "point_equilibria": calls}


def _command_time(argv: list[str], repeats: int) -> float:
    def run() -> None:
        done = subprocess.run([sys.executable, "-m", "ladle.tui.cli", *argv], capture_output=True, text=True)
        if done.returncode != 0:
            raise SystemExit(f"ladle {' '.join(argv)} failed: {done.stderr.strip()}")
    times = []
    for _ in range(repeats):
        t = time.perf_counter()
        run()
        times.append(time.perf_counter() - t)
    return statistics.median(times)


def main() -> None:
    parser = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    parser.add_argument("--json", action="store_true")
    parser.add_argument("--repeats", type=int, default=5)
    args = parser.parse_args()
    report: dict = {}
    few = max(1, args.repeats // 2)
    with tempfile.TemporaryDirectory() as folder:
        paths = ideal_ternaries.write_system_files(folder)
        for name, x, section, section_T in CASES:
            system = load_system(paths[name]) if name in paths else find_system(name)
            if x is None:
                x = mole_from_mass(np.array([[SAC305_WT[el] for el in system.elements]]), system.molar_mass)[0]
            row = {"scheil": _measured(lambda: alloy_scheil.alloy_scheil(system, np.array(x)), args.repeats),
                   "isopleth": _measured(lambda: isopleth.map_isopleth(system, *section), few)}
            T = section_T if section_T is not None else 0.5 * sum(system.temperature_range_K)
            row["isothermal"] = _measured(lambda: isothermal.map_isothermal(system, T), few)
            row["isothermal"]["temperature_K"] = T
            if not system.covers_elements:
                row["projection"] = _measured(lambda: liquidus_projection.map_liquidus_projection(system), few)
            report[name] = row
        report["scheil_named"] = {}
        for name, alloy_name in NAMED_SCHEIL:
            system = find_system(name)
            alloy = find_alloy(system.alloys, alloy_name)
            x = np.array(mole_fractions(alloy.parts, alloy.basis, system.elements, system.molar_mass))
            report["scheil_named"][f"{name} {alloy_name}"] = _measured(lambda: alloy_scheil.alloy_scheil(system, x),
                                                                       args.repeats)
        report["point_binary_s"] = _command_time(["point", "pb-sn", "--temp", "250C", "--comp", "Sn=30wt%"],
                                                 args.repeats)
        report["point_ternary_s"] = _command_time(["point", str(paths["pb-sn-bi"]), "--temp", "250C", "--comp",
                                                   "Sn=30wt%,Bi=2wt%"], args.repeats)
    if args.json:
        json.dump(report, sys.stdout, indent=2)
        print()
        return
    print(f"multicomponent benchmark (median of {args.repeats} runs; wall clock, CPU of this process, "
          "point equilibria)")
    for name, *_ in CASES:
        for what, m in report[name].items():
            count = f"{m['point_equilibria']:6d} point equilibria" if what != "projection" else ""
            print(f"  {name:15s} {what:11s} {m['wall_s']:7.3f} s wall {m['cpu_s']:7.3f} s CPU {count}")
    for name, m in report["scheil_named"].items():
        print(f"  {name:27s} scheil {m['wall_s']:7.3f} s wall {m['cpu_s']:7.3f} s CPU "
              f"{m['point_equilibria']:6d} point equilibria")
    print(f"  ladle point: binary {report['point_binary_s']:.3f} s, ternary {report['point_ternary_s']:.3f} s "
          f"(difference {report['point_ternary_s'] - report['point_binary_s']:+.3f} s)")


if __name__ == "__main__":
    main()
