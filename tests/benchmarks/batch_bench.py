"""Heat-list benchmark (run on demand, not collected by pytest):

    python tests/benchmarks/batch_bench.py [--json] [--heats 10000] [--repeats 3] [--compared 200]

For each system measured (Al-Si, the demo's casting system; Cu-Zn, a peritectic chain; Cu-Ni,
complete solubility with a magnetic term), with an invented heat list of random compositions over
the model's covered range:
- melt_only_s / with_scheil_s: median wall time of `ladle batch` in a fresh process (start-up,
  reading, tracing the diagram once, every heat, writing), targets 10 s and 60 s for 10,000
  heats on a 2-core machine;
- accuracy against the one-alloy computations on `--compared` random alloys: the largest
  difference (K) of liquidus and solidus from engine/melt.py, of the Scheil end from the Scheil
  path of engine/solidify_scheil.py, and (mass fraction) of the eutectic constituents.
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

from ladle.engine import find_system
from ladle.engine.diagrams.melt import melt_range
from ladle.engine.solidify.paths import solidify
from ladle.engine.solidify.table import composition_table

SYSTEMS = ("al-si", "cu-zn", "cu-ni")


def _heat_list(folder: Path, system, n: int, rng: np.random.Generator) -> Path:
    """An invented heat list: n heats with random at% of the system's second element."""
    lo, hi = system.covers
    b = system.elements[1]
    path = folder / f"{system.name}-heats.csv"
    values = rng.uniform(100 * max(lo, 1e-3), 100 * min(hi, 1 - 1e-3), n)
    path.write_text(f"heat,{b} at%\n" + "".join(f"H{i:06d},{v:.4f}\n" for i, v in enumerate(values)))
    return path


def _wall_time(argv: list[str], repeats: int) -> float:
    times = []
    for _ in range(repeats):
        t = time.perf_counter()
        done = subprocess.run([sys.executable, "-m", "ladle.tui.cli", *argv], capture_output=True, text=True)
        times.append(time.perf_counter() - t)
        if done.returncode != 0:
            raise SystemExit(f"ladle {' '.join(argv)} failed: {done.stderr.strip()}")
    return statistics.median(times)


def _accuracy(system, compared: int, rng: np.random.Generator) -> dict:
    lo, hi = system.covers
    x = rng.uniform(max(lo, 1e-3), min(hi, 1 - 1e-3), compared)
    r = composition_table(system).evaluate(x, scheil=True)
    worst = {"liquidus_K": 0.0, "solidus_K": 0.0, "scheil_end_K": 0.0, "eutectic_equilibrium": 0.0,
             "eutectic_scheil": 0.0}
    for k, xk in enumerate(x):
        m = melt_range(system, float(xk))
        paths = solidify(system, float(xk))
        eutectic = {p.model: sum(c.mass_fraction for c in p.constituents if c.name.startswith("eutectic"))
                    for p in (paths.equilibrium, paths.scheil)}
        pairs = {"liquidus_K": (r.liquidus_K[k], m.liquidus_K), "solidus_K": (r.solidus_K[k], m.solidus_K),
                 "scheil_end_K": (r.scheil_end_K[k], paths.scheil.end_K),
                 "eutectic_equilibrium": (r.eutectic_equilibrium[k], eutectic["equilibrium"]),
                 "eutectic_scheil": (r.eutectic_scheil[k], eutectic["scheil"])}
        for name, (table_value, single) in pairs.items():
            if single is None:
                difference = 0.0 if np.isnan(table_value) else float("inf")
            else:
                difference = abs(float(table_value) - single)
            worst[name] = max(worst[name], difference)
    return worst


def main() -> None:
    parser = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    parser.add_argument("--json", action="store_true")
    parser.add_argument("--heats", type=int, default=10000)
    parser.add_argument("--repeats", type=int, default=3)
    parser.add_argument("--compared", type=int, default=200)
    args = parser.parse_args()
    rng = np.random.default_rng(2024)
    report = {"heats": args.heats, "systems": {}}
    with tempfile.TemporaryDirectory() as folder:
        for name in SYSTEMS:
            system = find_system(name)
            heats = _heat_list(Path(folder), system, args.heats, rng)
            out = Path(folder) / f"{name}-out.csv"
            common = ["batch", name, str(heats), "-o", str(out), "--force", "--superheat", "60C"]
            report["systems"][name] = {
                "melt_only_s": _wall_time(common + ["--melt-only"], args.repeats),
                "with_scheil_s": _wall_time(common, args.repeats),
                "max_difference": _accuracy(system, args.compared, rng),
            }
    if args.json:
        json.dump(report, sys.stdout, indent=2)
        print()
        return
    print(f"ladle batch, {args.heats} heats per list (median of {args.repeats} fresh processes)")
    for name, r in report["systems"].items():
        d = r["max_difference"]
        print(f"  {name:6s} melt ranges {r['melt_only_s']:.2f} s, with Scheil {r['with_scheil_s']:.2f} s; "
              f"largest difference from one-alloy results over {args.compared} alloys: liquidus "
              f"{d['liquidus_K']:.1e} K, solidus {d['solidus_K']:.1e} K, Scheil end {d['scheil_end_K']:.1e} K, "
              f"eutectic {max(d['eutectic_equilibrium'], d['eutectic_scheil']):.1e} (mass fraction)")


if __name__ == "__main__":
    main()
