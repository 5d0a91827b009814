"""`ladle batch`: melt ranges, Scheil ends and pouring temperatures of every heat of a heat list."""

from __future__ import annotations

import argparse
import sys
from pathlib import Path

from ..errors import CommandError
from ..heatlist import HeatList, parse_temperature_difference, read_heat_list, write_csv_atomically
from .common import add_system_argument, coverage_problem, open_system

HELP = ("liquidus, solidus, freezing range, Scheil end, eutectic and pouring temperature of every heat "
        "in a CSV heat list (exit status 1 when some rows could not be computed)")

#: Heats evaluated between two updates of the progress bar.
CHUNK = 2000
#: Bad rows listed one by one in the summary on stderr.
LISTED_PROBLEMS = 20


def add_arguments(p: argparse.ArgumentParser) -> None:
    add_system_argument(p)
    p.add_argument("file", metavar="FILE.csv",
                   help="the heats: an identifier column and one composition column such as 'Si wt%%' (only read)")
    p.add_argument("--superheat", metavar="DT",
                   help="adds pouring = liquidus + DT, e.g. 60C or 100F: your shop's rule, not ladle's advice")
    p.add_argument("--melt-only", action="store_true", help="melt ranges only, without the Scheil columns")
    p.add_argument("--unit", choices=("C", "K", "F"),
                   help="temperature unit of the results (default: the superheat's unit, else C)")
    p.add_argument("-o", "--output", metavar="OUT.csv", help="write the results here (atomically) instead of to standard output")
    p.add_argument("--force", action="store_true", help="replace OUT.csv if it exists")


class _Progress:
    """A one-line bar on stderr, drawn only when stderr is a terminal."""

    WIDTH = 30

    def __init__(self, total: int) -> None:
        self.total = max(total, 1)
        self.enabled = sys.stderr.isatty()

    def show(self, done: int, what: str) -> None:
        if self.enabled:
            filled = self.WIDTH * done // self.total
            sys.stderr.write(f"\rladle batch: [{'#' * filled}{'.' * (self.WIDTH - filled)}] {done}/{self.total} {what}  ")
            sys.stderr.flush()

    def close(self) -> None:
        if self.enabled:
            sys.stderr.write("\r" + " " * (self.WIDTH + 60) + "\r")
            sys.stderr.flush()


def run(args: argparse.Namespace) -> int:
    system = open_system(args.system)
    source = Path(args.file)
    output = Path(args.output) if args.output else None
    superheat = parse_temperature_difference(args.superheat, args.unit or "C") if args.superheat else None
    unit = args.unit or (superheat[1] if superheat else "C")
    if output is not None and output.exists() and not args.force:
        raise CommandError(f"{output}: exists already; choose another name or add --force to replace it")
    heats = read_heat_list(source, system.elements)
    rows, problems = compute(system, heats, unit, superheat[0] if superheat else None, not args.melt_only)
    if output is None:
        import csv

        csv.writer(sys.stdout, delimiter=heats.delimiter, lineterminator="\n").writerows(rows)
    else:
        write_csv_atomically(output, rows, heats.delimiter, args.force, source)
    report(len(heats.heats), problems, output)
    return 1 if problems else 0


def compute(system, heats: HeatList, unit: str, superheat_K: float | None, scheil: bool) -> tuple[list[list[str]], list[tuple[int, str]]]:
    """The output rows (header first: the heat list's own columns, then the results) and the
    (line, reason) of every heat that could not be computed."""
    import numpy as np

    from ladle.engine.solidify_table import composition_table
    from ladle.engine.units import kelvin_to

    from ..parsing import fractions_of_B

    progress = _Progress(len(heats.heats))
    elements = system.elements
    percent = np.array([h.percent if h.problem is None else np.nan for h in heats.heats])
    x_b = fractions_of_B(percent, heats.element, heats.basis, elements, system.molar_mass)
    problems = {h.line: h.problem for h in heats.heats if h.problem is not None}
    for h, x in zip(heats.heats, x_b):
        problem = None if h.problem else coverage_problem(
            system, float(x), f"{heats.header[heats.column]} {h.cells[heats.column].strip()}")
        if problem:
            problems[h.line] = problem
    ok = np.array([h.line not in problems for h in heats.heats], dtype=bool)
    progress.show(0, "tracing the diagram")
    table = composition_table(system)
    n = len(heats.heats)
    results = {name: np.full(n, np.nan) for name in ("liquidus", "solidus", "eu_eq", "end", "eu_scheil")}
    index = np.flatnonzero(ok)
    for start in range(0, len(index), CHUNK):
        part = index[start:start + CHUNK]
        r = table.evaluate(x_b[part], scheil)
        for name, values in zip(results, (r.liquidus_K, r.solidus_K, r.eutectic_equilibrium, r.scheil_end_K,
                                          r.eutectic_scheil)):
            results[name][part] = values
        progress.show(start + len(part), "heats")
    progress.close()

    offset, scale = kelvin_to(0.0, unit), kelvin_to(1.0, unit) - kelvin_to(0.0, unit)

    def degrees(T: float) -> str:
        return "" if np.isnan(T) else f"{offset + scale * T:.1f}"

    def wt_percent(f: float) -> str:
        return "" if np.isnan(f) else f"{100.0 * f:.2f}"

    header = list(heats.header) + [f"liquidus_{unit}", f"solidus_{unit}", f"freezing_range_{unit}"]
    if scheil:
        header += [f"scheil_end_{unit}", "eutectic_scheil_wt%"]
    header += ["eutectic_equilibrium_wt%"] + ([f"pouring_{unit}"] if superheat_K is not None else []) + ["note"]
    rows = [header]
    for k, h in enumerate(heats.heats):
        liquidus, solidus = results["liquidus"][k], results["solidus"][k]
        cells = list(h.cells[:len(heats.header)])
        note = problems.get(h.line, "")
        if not note:
            notes = []
            if np.isnan(liquidus):
                notes.append("not fully liquid at the top of the mapped window")
            if np.isnan(solidus):
                notes.append("not fully solid at the bottom of the mapped window")
            if scheil and np.isnan(results["end"][k]):
                notes.append("Scheil: liquid left at the bottom of the mapped window")
            note = "; ".join(notes)
        cells += [degrees(liquidus), degrees(solidus), "" if np.isnan(liquidus - solidus) else f"{scale * (liquidus - solidus):.1f}"]
        if scheil:
            cells += [degrees(results["end"][k]), wt_percent(results["eu_scheil"][k])]
        cells.append(wt_percent(results["eu_eq"][k]))
        if superheat_K is not None:
            cells.append(degrees(liquidus + superheat_K))
        cells.append(note)
        rows.append(cells)
    return rows, sorted(problems.items())


def report(total: int, problems: list[tuple[int, str]], output: Path | None) -> None:
    """The summary on stderr: how many heats were computed, and why the others were not."""
    done = total - len(problems)
    where = f"; written to {output}" if output is not None else ""
    print(f"ladle batch: {done} of {total} heats computed{where}", file=sys.stderr)
    if problems:
        print(f"ladle batch: {len(problems)} row(s) skipped (the note column says why):", file=sys.stderr)
        for line, reason in problems[:LISTED_PROBLEMS]:
            print(f"  line {line}: {reason}", file=sys.stderr)
        if len(problems) > LISTED_PROBLEMS:
            print(f"  ... and {len(problems) - LISTED_PROBLEMS} more", file=sys.stderr)
