"""Heat-list benchmark (run on demand, not collected by pytest):

    python tests/benchmarks/batch_bench.py [--json] [--heats 1000000] [--ternary 2] [--compared 200]

Side by side in one run, on an invented list of `--heats` Al-Si heats (random Si wt%):
- `ladle batch` in a fresh process with --workers 1, --workers 2 and --cluster on a two-worker
  Dask LocalCluster on 127.0.0.1 (started here; its start is not timed): wall time, CPU time of
  the process and its worker processes, and peak memory of the process tree (the largest sum
  of the processes' proportional set size, Pss, sampled every 20 ms from /proc: shared pages
  counted once); the three outputs are compared byte for byte. Targets for 1,000,000 heats on
  a 2-core machine: 10 s and 200 MB. The machine's load average is printed beside them: other
  work on the machine slows the wall time, not the CPU time.
- the per-heat cost of a ternary heat with a Scheil path and its melt range through the
  engine (lead-tin with bismuth added ideally, the invented test system of
  tests/unit/ideal_ternaries.py), `--ternary` heats;
- accuracy of the heat-list table against the one-alloy computations on `--compared` random
  alloys of Al-Si, Cu-Zn and Cu-Ni: the largest difference (K) of liquidus and solidus from
  engine/diagrams/melt.py, of the Scheil end from engine/solidify/paths.py, and (mass
  fraction) of the eutectic constituents.
"""

from __future__ import annotations

import argparse
import json
import os
import subprocess
import sys
import tempfile
import threading
import time
from pathlib import Path

import numpy as np

from ladle.engine import find_system
from ladle.engine.diagrams.melt import melt_range
from ladle.engine.solidify.paths import solidify
from ladle.engine.solidify.table import composition_table

SYSTEMS = ("al-si", "cu-zn", "cu-ni")


def _heat_list(path: Path, n: int, rng: np.random.Generator) -> Path:
    """An invented heat list: n Al-Si heats with random Si wt%, written in pieces."""
    with path.open("w") as f:
        f.write("heat,Si wt%\n")
        for start in range(0, n, 100_000):
            values = rng.uniform(0.5, 25.0, min(100_000, n - start))
            f.writelines(f"H{start + i:07d},{v:.3f}\n" for i, v in enumerate(values))
    return path


def _tree(pid: int) -> list[int]:
    """`pid` and all its descendants."""
    pids, k = [pid], 0
    while k < len(pids):
        try:
            for task in os.listdir(f"/proc/{pids[k]}/task"):
                with open(f"/proc/{pids[k]}/task/{task}/children") as f:
                    pids += [int(c) for c in f.read().split()]
        except OSError:
            pass
        k += 1
    return pids


def _pss_mb(pids: list[int]) -> float:
    total = 0
    for pid in pids:
        try:
            with open(f"/proc/{pid}/smaps_rollup") as f:
                total += next(int(line.split()[1]) for line in f if line.startswith("Pss:"))
        except (OSError, StopIteration):
            pass
    return total / 1024


def _measure(argv: list[str]) -> dict:
    """Wall time (s), CPU time (s, the process and its waited-for children) and peak memory
    (MB, Pss of the process tree) of `ladle ARGV` in a fresh process."""
    before = os.times()
    started = time.perf_counter()
    process = subprocess.Popen([sys.executable, "-m", "ladle.tui.cli", *argv], stdout=subprocess.DEVNULL,
                               stderr=subprocess.PIPE, text=True)
    peak = [0.0]

    def sample() -> None:
        while process.poll() is None:
            peak[0] = max(peak[0], _pss_mb(_tree(process.pid)))
            time.sleep(0.02)

    sampler = threading.Thread(target=sample)
    sampler.start()
    _out, err = process.communicate()
    wall = time.perf_counter() - started
    sampler.join()
    after = os.times()
    if process.returncode not in (0, 1):
        raise SystemExit(f"ladle {' '.join(argv)} failed: {err.strip()}")
    cpu = (after.children_user - before.children_user) + (after.children_system - before.children_system)
    return {"wall_s": wall, "cpu_s": cpu, "peak_mb": peak[0]}


def _process_cpu() -> float:
    times = os.times()
    return times.user + times.system


def _workers_cpu(client) -> float:
    """CPU time (s) of the cluster's worker processes so far."""
    return sum(client.run(_process_cpu).values())


def _scaling(folder: Path, heats: int, rng: np.random.Generator) -> dict:
    source = _heat_list(folder / "heats.csv", heats, rng)
    common = ["batch", "al-si", str(source), "--superheat", "60C", "--force"]
    runs, outputs = {}, {}
    for name, extra in (("workers 1", ["--workers", "1"]), ("workers 2", ["--workers", "2"])):
        out = folder / f"{name.replace(' ', '')}.csv"
        runs[name] = _measure(common + ["-o", str(out)] + extra)
        outputs[name] = out
    try:
        from distributed import LocalCluster
    except ImportError:
        runs["cluster of 2"] = None
    else:
        from distributed import Client

        with LocalCluster(n_workers=2, threads_per_worker=1, processes=True, host="127.0.0.1",
                          dashboard_address=None, silence_logs=50) as cluster, \
                Client(cluster.scheduler_address, set_as_default=False) as client:
            out = folder / "cluster.csv"
            before = _workers_cpu(client)
            runs["cluster of 2"] = _measure(common + ["-o", str(out), "--cluster", cluster.scheduler_address])
            runs["cluster of 2"]["workers_cpu_s"] = _workers_cpu(client) - before
            outputs["cluster of 2"] = out
    first = outputs["workers 1"].read_bytes()
    same = all(path.read_bytes() == first for path in outputs.values())
    return {"heats": heats, "runs": runs, "identical_outputs": same, "load_average": os.getloadavg()}


def _ternary(count: int) -> dict:
    """Seconds per ternary heat: the Scheil path and the melt range (transition scan)."""
    sys.path.insert(0, str(Path(__file__).resolve().parents[1] / "unit"))
    import ideal_ternaries

    from ladle.engine.diagrams.alloy_transitions import alloy_transitions
    from ladle.engine.files.loader import load_system
    from ladle.engine.solidify.alloy_scheil import alloy_scheil

    with tempfile.TemporaryDirectory() as folder:
        system = load_system(ideal_ternaries.write_system_files(folder)["pb-sn-bi"])
    alloys = np.random.default_rng(5).dirichlet([14.0, 4.0, 2.0], count)
    scheil, melt = [], []
    for x in alloys:
        t = time.perf_counter()
        alloy_scheil(system, x)
        scheil.append(time.perf_counter() - t)
        t = time.perf_counter()
        alloy_transitions(system, x)
        melt.append(time.perf_counter() - t)
    return {"heats": count, "scheil_s_per_heat": float(np.median(scheil)), "melt_range_s_per_heat": float(np.median(melt))}


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
    parser.add_argument("--heats", type=int, default=1_000_000)
    parser.add_argument("--ternary", type=int, default=2, help="ternary heats timed (0: none)")
    parser.add_argument("--compared", type=int, default=200)
    args = parser.parse_args()
    rng = np.random.default_rng(2024)
    with tempfile.TemporaryDirectory() as folder:
        report = {"scaling": _scaling(Path(folder), args.heats, rng)}
    report["ternary"] = _ternary(args.ternary) if args.ternary else None
    report["accuracy"] = {name: _accuracy(find_system(name), args.compared, rng) for name in SYSTEMS}
    if args.json:
        json.dump(report, sys.stdout, indent=2)
        print()
        return
    s = report["scaling"]
    print(f"ladle batch al-si, {s['heats']:,} heats with Scheil ends and pouring temperatures "
          f"(load average before: {s['load_average'][0]:.1f}):")
    for name, r in s["runs"].items():
        if r is None:
            print(f"  {name:13s} not measured (install the 'cluster' extra)")
            continue
        workers = f" + {r['workers_cpu_s']:.2f} s in the cluster's workers" if "workers_cpu_s" in r else ""
        print(f"  {name:13s} {r['wall_s']:6.2f} s wall, {r['cpu_s']:6.2f} s CPU{workers}, peak {r['peak_mb']:6.1f} MB"
              f"{' (this process only)' if workers else ''}")
    print(f"  outputs identical byte for byte: {s['identical_outputs']}")
    if report["ternary"]:
        t = report["ternary"]
        print(f"ternary heat (Pb-Sn-Bi, invented ideal Bi), median of {t['heats']}: Scheil path "
              f"{t['scheil_s_per_heat']:.2f} s, melt range {t['melt_range_s_per_heat']:.2f} s")
    print(f"largest difference from one-alloy results over {args.compared} alloys:")
    for name, d in report["accuracy"].items():
        print(f"  {name:6s} liquidus {d['liquidus_K']:.1e} K, solidus {d['solidus_K']:.1e} K, Scheil end "
              f"{d['scheil_end_K']:.1e} K, eutectic {max(d['eutectic_equilibrium'], d['eutectic_scheil']):.1e} "
              f"(mass fraction)")


if __name__ == "__main__":
    main()
