"""Engine benchmark (run on demand, not collected by pytest):

    python tests/benchmarks/engine_bench.py [--json] [--points 1000] [--compared 60]

Measures, on a four-phase synthetic system (liquid, fcc, bcc and a compound AB):
- point_us: median microseconds per point equilibrium over varied (T, x) points, after warm-up,
  every point at a new temperature (no cached section; the aim is 50);
- the accuracy against a brute-force lower hull over 1e6 uniform grid points per phase (a
  reference at that resolution, not a rival: dense_grid_ms is what it costs per point):
  max_dx_vs_dense_grid, the largest difference of the tie-line ends' compositions, and
  dense_grid_found_lower_G, how often the reference lay lower than the engine by over 1e-6 J/mol;
- a general-purpose minimiser, scipy.optimize SLSQP over phase amounts and compositions from
  several starts (generic_minimizer_starts): how often it missed the global minimum
  (generic_minimizer_missed_global_minimum, by over 1e-3 J/mol) and how often it found a lower
  G than the engine (generic_minimizer_found_lower_G); its time per point, generic_minimizer_ms,
  is that of answers that are often wrong, so no speed ratio is given;
- diagram_ms: median wall time to map the whole diagram of the largest shipped system (cold),
  and diagram_ms_slowest_shipped, the slowest of all shipped systems (one cold run each);
- melt_ms: median time of one melt range on that system (diagram already mapped);
- ternary_point_us / five_element_point_us: median microseconds per point equilibrium of an
  invented ternary (liquid, fcc, bcc, two compounds) and five-element system (liquid, fcc, bcc,
  two compounds) through the general minimiser, every point at a new temperature, and the share
  of points whose Newton solves converged;
- ternary_max_dG_vs_dense_J_per_mol: the largest amount by which the engine's G lies above a
  dense sampled reference (lower convex hull, scipy.spatial.ConvexHull, of 30,000 random points
  per phase plus the phases' own samples) on the ternary; <= 0 means never above. Beside it,
  ternary_min_dG_vs_dense_J_per_mol: how far below (the reference's sampling error);
- ternary_section_ms: median wall time of one isothermal section of that ternary mapped cold at
  a new temperature (engine/diagrams/isothermal.py: every field, tie-line and tie-triangle).
"""

from __future__ import annotations

import argparse
import json
import statistics
import sys
import tempfile
import time
from pathlib import Path

import numpy as np

from ladle.engine import equilibrate, load_system
from ladle.engine.files.catalog import list_systems
from ladle.engine.diagrams.diagram import map_diagram
from ladle.engine.diagrams.mappable import unmapped_phases
from ladle.engine.minimize.equilibrium import SectionCache
from ladle.engine.minimize import equilibrium as equilibrium_module
from ladle.engine.models.polynomials import TemperatureFunction
from ladle.engine.models.sublattice import Interaction, SublatticePhase

sys.path.insert(0, str(Path(__file__).resolve().parents[1] / "unit"))
from multicomponent_models import system_of  # noqa: E402
from ladle.engine.diagrams.melt import melt_range

# An invented four-phase system: two terminal solutions, a liquid and a congruent compound.
BENCH_SYSTEM = """
elements = ["A", "B"]
molar_mass = { A = 60.0, B = 40.0 }
source = "invented for the benchmark"
[phase.liquid]
model = "solution"
G.A = [ { upto = 4000, a = 14000, b = -10.0 } ]
G.B = [ { upto = 4000, a = 11000, b = -10.0 } ]
L = [ { a = -12000, b = 2.0 }, { a = 3000 } ]
[phase.fcc]
model = "solution"
G.A = [ { upto = 4000 } ]
G.B = [ { upto = 4000, a = 5000 } ]
L = [ { a = 18000, b = -3.0 } ]
[phase.bcc]
model = "solution"
G.A = [ { upto = 4000, a = 6000 } ]
G.B = [ { upto = 4000 } ]
L = [ { a = 16000 } ]
[phase.AB]
model = "compound"
formula = "AB"
reference = { A = "fcc", B = "bcc" }
formation = { a = -9000, b = 0.5 }
"""
T_RANGE = (700.0, 1500.0)


def bench_system():
    folder = Path(tempfile.mkdtemp())
    path = folder / "bench.toml"
    path.write_text(BENCH_SYSTEM)
    return load_system(path)


def points(n: int, seed: int = 7) -> list[tuple[float, float]]:
    rng = np.random.default_rng(seed)
    return [(float(rng.uniform(*T_RANGE)), float(rng.uniform(0.001, 0.999))) for _ in range(n)]


def fresh_sections() -> None:
    equilibrium_module._sections = SectionCache()


def time_engine(system, pts) -> tuple[list[float], list]:
    times, results = [], []
    for T, x in pts[:50]:           # warm-up
        equilibrate(system, T + 0.123, x)
    for T, x in pts:
        t0 = time.perf_counter()
        r = equilibrate(system, T, x)
        times.append(time.perf_counter() - t0)
        results.append(r)
    return times, results


def dense_hull_point(system, T: float, x0: float, n: int = 1_000_000):
    """Brute force: lower hull of every phase sampled on n uniform points, evaluated at x0 by
    maximising the Legendre transform min_i(g_i - m x_i) + m x0 over the slope m (golden
    section). Returns (G at x0 in J/mol, x_B of the hull vertices bounding x0)."""
    xb = np.linspace(0.0, 1.0, n)
    xa = 1.0 - xb
    xa[-1] = 0.0
    mixing = np.zeros(n)
    mixing[1:-1] = xa[1:-1] * np.log(xa[1:-1]) + xb[1:-1] * np.log(xb[1:-1])
    g = np.min([p.at(T).gibbs(xa, xb, mixing) for p in system.solutions.values()], axis=0)
    cx = np.array([c.x[1] for c in system.compounds.values()])
    cg = np.array([c.gibbs(T) for c in system.compounds.values()])
    X = np.concatenate([xb, cx])
    G = np.concatenate([g, cg])
    slopes = np.diff(g) / np.diff(xb)
    lo, hi = float(slopes.min()) - 1.0, float(slopes.max()) + 1.0

    def phi(m: float) -> float:
        return float(np.min(G - m * X)) + m * x0

    ratio = (np.sqrt(5) - 1) / 2
    a, b = lo, hi
    c, d = b - ratio * (b - a), a + ratio * (b - a)
    fc, fd = phi(c), phi(d)
    for _ in range(90):
        if fc > fd:
            b, d, fd = d, c, fc
            c = b - ratio * (b - a)
            fc = phi(c)
        else:
            a, c, fc = c, d, fd
            d = a + ratio * (b - a)
            fd = phi(d)
    m = 0.5 * (a + b)
    # just below and above the optimal slope the minimiser is the left and the right vertex
    left = X[int(np.argmin(G - (m - 1e-3) * X))]
    right = X[int(np.argmin(G - (m + 1e-3) * X))]
    return phi(m), (float(min(left, right)), float(max(left, right)))


def generic_minimizer(system, T: float, x0: float, starts: int, rng) -> float:
    """Lowest G (J/mol) SLSQP finds over amounts and compositions of every phase."""
    from scipy.optimize import minimize

    sols = [p.at(T) for p in system.solutions.values()]
    comps = list(system.compounds.values())
    cg = np.array([c.gibbs(T) for c in comps])
    cx = np.array([c.x[1] for c in comps])
    ns, nc = len(sols), len(comps)

    def total(v):
        n, x = v[:ns], v[ns:2 * ns]
        g = sum(n[i] * float(sols[i].gibbs(1.0 - x[i], x[i])) for i in range(ns))
        return g + float(v[2 * ns:] @ cg)

    cons = [{"type": "eq", "fun": lambda v: np.sum(v[:ns]) + np.sum(v[2 * ns:]) - 1.0},
            {"type": "eq", "fun": lambda v: v[:ns] @ v[ns:2 * ns] + v[2 * ns:] @ cx - x0}]
    bounds = [(0, 1)] * ns + [(1e-12, 1 - 1e-12)] * ns + [(0, 1)] * nc
    best = np.inf
    for _ in range(starts):
        n0 = rng.dirichlet(np.ones(ns + nc))
        v0 = np.concatenate([n0[:ns], rng.uniform(0.01, 0.99, ns), n0[ns:]])
        r = minimize(total, v0, method="SLSQP", bounds=bounds, constraints=cons, options={"maxiter": 300, "ftol": 1e-12})
        if r.success:
            best = min(best, r.fun)
    return best


def _tf(a: float, b: float = 0.0) -> TemperatureFunction:
    return TemperatureFunction.constant_terms({"a": a, "b": b})


def invented_system(n: int, seed: int = 5):
    """An invented n-element system of the engine's general phases: a liquid, an fcc and a bcc
    solution (Redlich-Kister pair terms of orders 0 and 1, a ternary term on the liquid) and two
    stoichiometric compounds. Every number is invented."""
    rng = np.random.default_rng(seed)
    els = tuple("ABCDEFGH"[:n])
    phases = []
    for name, (a_lo, a_hi), (b_lo, b_hi) in (("liquid", (9000, 15000), (-10, -8)), ("fcc", (-500, 3000), (0, 1)),
                                             ("bcc", (0, 4000), (-1, 0))):
        ends = {(e,): _tf(float(rng.uniform(a_lo, a_hi)), float(rng.uniform(b_lo, b_hi))) for e in els}
        terms = [Interaction(((els[i], els[j]),), (_tf(float(rng.uniform(-15000, 25000))), _tf(float(rng.uniform(-4000, 4000)))))
                 for i in range(n) for j in range(i + 1, n)]
        if name == "liquid":
            terms.append(Interaction((els[:3],), (_tf(float(rng.uniform(-20000, 20000))),)))
        phases.append(SublatticePhase(name=name, elements=els, site_ratios=(1.0,), constituents=(els,),
                                      end_members=ends, interactions=tuple(terms)))
    for k, (i, j, p, q) in enumerate(((0, 1, 1, 2), (1, n - 1, 3, 1))):
        phases.append(SublatticePhase(name=f"{els[i]}{p}{els[j]}{q}", elements=els, site_ratios=(float(p), float(q)),
                                      constituents=((els[i],), (els[j],)),
                                      end_members={(els[i], els[j]): _tf(-(p + q) * float(rng.uniform(6000, 9000)), (p + q) * 0.5)}))
    return system_of(els, phases, molar_mass=rng.uniform(20.0, 200.0, n))


def time_general(system, count: int, T_range: tuple[float, float], seed: int = 3) -> tuple[float, float, list]:
    """(median us per point at a new temperature, converged share, results with their (T, z))."""
    rng = np.random.default_rng(seed)
    n = len(system.elements)
    for _ in range(5):                                 # warm-up (imports, caches of shapes)
        equilibrate(system, float(rng.uniform(*T_range)), rng.dirichlet(np.ones(n)))
    times, out = [], []
    for i in range(count):
        T = T_range[0] + (T_range[1] - T_range[0]) * (i + 0.5) / count + 1e-3 * rng.random()
        z = rng.dirichlet(np.ones(n))
        t0 = time.perf_counter()
        r = equilibrate(system, T, z)
        times.append(time.perf_counter() - t0)
        out.append((T, z, r))
    return 1e6 * statistics.median(times), sum(r.converged for _t, _z, r in out) / len(out), out


def dense_hull_gap(system, results: list, temperatures: int = 4, per_phase: int = 30000) -> tuple[float, float]:
    """(max, min) of the engine's G minus the dense lower hull's G (J/mol) over results at
    `temperatures` of the temperatures, each hull built once."""
    from scipy.spatial import ConvexHull

    rng = np.random.default_rng(9)
    by_T: dict[float, list] = {}
    for T, z, r in results[:: max(1, len(results) // (temperatures * 10))][: temperatures * 10]:
        by_T.setdefault(round(T, -2), []).append((T, z, r))
    worst_above, worst_below = -np.inf, 0.0
    for group in by_T.values():
        T = group[0][0]
        group = [(t, z, equilibrate(system, T, z)) for t, z, _r in group]
        X, G = [], []
        for m in (p.at(T) for p in system.models.values()):
            Y = np.hstack([rng.dirichlet(np.full(len(g), 0.5), size=per_phase) if len(g) > 1 else np.ones((per_phase, 1))
                           for g in m.groups])
            Y = np.vstack([Y, m.samples()[0]])
            moles = Y @ m.element_matrix
            atoms = moles.sum(-1)
            X.append(moles / atoms[:, None])
            G.append(m.gibbs(Y) / atoms)
        X, G = np.vstack(X), np.concatenate(G)
        hull = ConvexHull(np.column_stack([X[:, 1:], G]), qhull_options="Qx Qt")
        planes = hull.equations[hull.equations[:, -2] < -1e-12]
        for _t, z, r in group:
            dense = float(np.max(-(planes[:, :-2] @ z[1:] + planes[:, -1]) / planes[:, -2]))
            worst_above = max(worst_above, r.gibbs_J_per_mol - dense)
            worst_below = min(worst_below, r.gibbs_J_per_mol - dense)
    return worst_above, worst_below


def time_section(system, T_range: tuple[float, float], repeats: int = 3) -> float:
    """Median ms of one isothermal section mapped cold at a new temperature."""
    from ladle.engine.diagrams.isothermal import map_isothermal

    runs = []
    for k in range(repeats):
        T = 0.5 * (T_range[0] + T_range[1]) + 7.31 * (k + 1)
        t0 = time.perf_counter()
        map_isothermal(system, T)
        runs.append(time.perf_counter() - t0)
    return 1e3 * statistics.median(runs)


def largest_shipped():
    from ladle.engine import find_system

    entries = [e for e in list_systems() if e.origin == "shipped"]
    systems = []
    for e in entries:
        try:
            systems.append(find_system(str(e.path)))
        except Exception:   # an unreadable file is reported by `ladle systems`, not here
            continue
    systems = [s for s in systems if len(s.elements) == 2 and not unmapped_phases(s)]
    return max(systems, key=lambda s: (len(s.phases), len(s.compounds))) if systems else None


def main() -> int:
    ap = argparse.ArgumentParser()
    ap.add_argument("--json", action="store_true")
    ap.add_argument("--points", type=int, default=1000)
    ap.add_argument("--compared", type=int, default=60, help="points compared with the slow methods")
    ap.add_argument("--starts", type=int, default=5, help="SLSQP starts per point")
    ap.add_argument("--general-points", type=int, default=200, help="points of the ternary and five-element timings")
    args = ap.parse_args()

    ternary = invented_system(3)
    ternary_us, ternary_converged, ternary_results = time_general(ternary, args.general_points, (900.0, 1500.0))
    five = invented_system(5)
    five_us, five_converged, _ = time_general(five, max(20, args.general_points // 2), (900.0, 1500.0))
    dG_above, dG_below = dense_hull_gap(ternary, ternary_results)
    section_ms = time_section(ternary, (900.0, 1500.0))

    system = bench_system()
    pts = points(args.points)
    fresh_sections()
    times, results = time_engine(system, pts)
    point_us = 1e6 * statistics.median(times)

    sub = pts[:args.compared]
    dense_times, max_dx, dense_misses = [], 0.0, 0
    for (T, x), r in zip(sub, results):
        t0 = time.perf_counter()
        g_dense, bounds = dense_hull_point(system, T, x)
        dense_times.append(time.perf_counter() - t0)
        if r.gibbs_J_per_mol > g_dense + 1e-6:
            dense_misses += 1
        engine_x = sorted(float(p.x[1]) for p in r.phases)
        if len(engine_x) == 2:
            max_dx = max(max_dx, abs(engine_x[0] - bounds[0]), abs(engine_x[1] - bounds[1]))

    rng = np.random.default_rng(11)
    slsqp_times, missed, lower = [], 0, 0
    for (T, x), r in zip(sub, results):
        t0 = time.perf_counter()
        g = generic_minimizer(system, T, x, args.starts, rng)
        slsqp_times.append(time.perf_counter() - t0)
        if g > r.gibbs_J_per_mol + 1e-3:
            missed += 1
        if g < r.gibbs_J_per_mol - 1e-6:
            lower += 1

    shipped = largest_shipped()
    diagram_ms = melt_ms = None
    name = None
    if shipped is not None:
        name = shipped.name
        runs = []
        for _ in range(5):
            fresh_sections()
            map_diagram.cache_clear()
            s = load_system(shipped.path, name=shipped.name)
            t0 = time.perf_counter()
            map_diagram(s)
            runs.append(time.perf_counter() - t0)
        diagram_ms = 1e3 * statistics.median(runs)
        lo, hi = s.covers
        melts = []
        for x in np.linspace(lo + 0.02 * (hi - lo), hi - 0.02 * (hi - lo), 15):
            t0 = time.perf_counter()
            melt_range(s, float(x))
            melts.append(time.perf_counter() - t0)
        melt_ms = 1e3 * statistics.median(melts)

    slowest_name, slowest_ms = None, 0.0
    for e in (e for e in list_systems() if e.origin == "shipped"):
        fresh_sections()
        map_diagram.cache_clear()
        s = load_system(e.path, name=e.name)
        if unmapped_phases(s) or len(s.elements) != 2:    # whole diagrams are binaries of solutions and compounds
            continue
        t0 = time.perf_counter()
        map_diagram(s)
        ms = 1e3 * (time.perf_counter() - t0)
        if ms > slowest_ms:
            slowest_name, slowest_ms = e.name, ms

    out = {
        "point_us": round(point_us, 1),
        "points": len(pts),
        "dense_grid_points_per_phase": 1_000_000,
        "dense_grid_ms": round(1e3 * statistics.median(dense_times), 1),
        "max_dx_vs_dense_grid": max_dx,
        "dense_grid_found_lower_G": dense_misses,
        "generic_minimizer_starts": args.starts,
        "generic_minimizer_ms": round(1e3 * statistics.median(slsqp_times), 1),
        "generic_minimizer_missed_global_minimum": f"{missed}/{len(sub)}",
        "generic_minimizer_found_lower_G": lower,
        "points_compared": len(sub),
        "diagram_system": name,
        "diagram_ms": None if diagram_ms is None else round(diagram_ms, 1),
        "melt_ms": None if melt_ms is None else round(melt_ms, 2),
        "diagram_ms_slowest_shipped": round(slowest_ms, 1),
        "diagram_slowest_system": slowest_name,
        "ternary_point_us": round(ternary_us, 1),
        "ternary_converged_share": ternary_converged,
        "five_element_point_us": round(five_us, 1),
        "five_element_converged_share": five_converged,
        "ternary_max_dG_vs_dense_J_per_mol": dG_above,
        "ternary_min_dG_vs_dense_J_per_mol": dG_below,
        "ternary_section_ms": round(section_ms, 1),
        "targets": {"point_us": 50, "max_dx_vs_dense_grid": 1e-6, "diagram_ms": 300, "melt_ms": 20,
                    "ternary_point_us": 1000, "five_element_point_us": 5000, "ternary_section_ms": 500,
                    "ternary_max_dG_vs_dense_J_per_mol": 0.0},
    }
    if args.json:
        print(json.dumps(out))
    else:
        for k, v in out.items():
            print(f"{k:40} {v}")
    return 0


if __name__ == "__main__":
    sys.exit(main())
