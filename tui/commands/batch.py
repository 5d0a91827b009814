"""`ladle batch`: melt ranges, Scheil ends and pouring temperatures of every heat of a heat list,
in bounded memory, on every core or on a Dask cluster, resumable after an interruption."""

from __future__ import annotations

import argparse
import os
import signal
import sys
from pathlib import Path

from ..errors import CommandError
from ..quote import one_line, quoted_path
from .common import add_system_argument

HELP = ("liquidus, solidus, freezing range, Scheil end, eutectic and pouring temperature of every heat "
        "in a CSV heat list (exit status 1 when some rows could not be computed)")


def _workers(text: str) -> int:
    try:
        value = int(text)
    except ValueError:
        raise argparse.ArgumentTypeError(f"expected a whole number of worker processes, not {text!r}") from None
    if value <= 0:
        raise argparse.ArgumentTypeError(f"expected 1 or more worker processes, not {value}")
    return value


def _cores() -> int:
    try:
        return len(os.sched_getaffinity(0))
    except AttributeError:
        return os.cpu_count() or 1


def add_arguments(p: argparse.ArgumentParser) -> None:
    add_system_argument(p)
    p.add_argument("file", metavar="FILE.csv",
                   help="the heats: an identifier column and a composition column such as 'Si wt%%' (for three or "
                        "more elements one per element but the balance, e.g. 'Sn wt%%' and 'Bi wt%%'; only read)")
    p.add_argument("--superheat", metavar="DT",
                   help="adds pouring = liquidus + DT, e.g. 60C or 100F (at most 500 K): your shop's rule, not ladle's advice")
    p.add_argument("--melt-only", action="store_true", help="melt ranges only, without the Scheil columns")
    p.add_argument("--unit", choices=("C", "K", "F"),
                   help="temperature unit of the results (default: the superheat's unit, else C)")
    p.add_argument("-o", "--output", metavar="OUT.csv", help="write the results here (whole, at the end) instead of to standard output")
    p.add_argument("--force", action="store_true", help="replace OUT.csv if it exists")
    p.add_argument("--encoding", metavar="NAME",
                   help="the heat list's encoding (default: UTF-8, else Windows-1252); the results use the same")
    p.add_argument("--workers", type=_workers, default=None, metavar="N",
                   help=f"worker processes on this machine (default: its cores, {_cores()} here)")
    p.add_argument("--cluster", metavar="ADDRESS",
                   help="compute on a Dask cluster instead, e.g. tcp://10.0.0.5:8786 (needs the 'cluster' extra)")
    p.add_argument("--resume", action="store_true",
                   help="continue a run to OUT.csv that was interrupted (Ctrl-C, SIGTERM, a dropped session)")


def run(args: argparse.Namespace) -> int:
    from ..heat_results import BlockJob
    from ..heatlist import foreign_composition_columns, parse_temperature_difference, read_layout, scan_heat_list
    from ..heatlist_runs import Interrupted, Plan
    from ..heatlist_runs import run as run_plan
    from .common import open_system, require_liquid

    source = Path(args.file)
    output = Path(args.output) if args.output else None
    superheat = parse_temperature_difference(args.superheat, args.unit or "C") if args.superheat else None
    unit = args.unit or (superheat[1] if superheat else "C")
    if args.cluster is not None and args.workers is not None:
        raise CommandError("--workers and --cluster exclude each other (the cluster's workers compute)")
    if args.resume and output is None:
        raise CommandError("--resume continues a run that writes a file: give its -o OUT.csv")
    _check_output(output, args.force, source)
    system = open_system(args.system, args.without)
    require_liquid(system)
    scan = scan_heat_list(source, args.encoding)
    layout = read_layout(source, scan, system.elements)
    for cell, element in foreign_composition_columns(layout.header, system.elements):
        _note(f"note: {source.name}: column {cell!r}: {element} is not in {system.name} ({'-'.join(system.elements)}), "
              f"so every alloy is computed without it")

    from ladle.engine.diagrams.mappable import unmapped_phases
    from ladle.engine.solidify.table import composition_table

    # the table needs the whole diagram; other systems' heats are computed one by one
    table = composition_table(system) if len(system.elements) == 2 and not unmapped_phases(system) else None
    job = BlockJob(layout, system, table, unit, superheat[0] if superheat else None, not args.melt_only)
    options = {"system": system.name, "without": sorted(args.without), "unit": unit,
               "superheat_K": job.superheat_K, "scheil": job.scheil, "encoding": layout.encoding}
    plan = Plan(source, scan, job, output, args.force, args.resume, args.workers or _cores(), args.cluster, options)
    try:
        totals = run_plan(plan, _note)
    except Interrupted as stop:
        name = signal.Signals(stop.args[0]).name
        _note(f"stopped by {name}; the same command with --resume continues it" if output is not None
              else f"stopped by {name}")
        return 128 + stop.args[0]
    report(totals, output)
    return 1 if totals.problems else 0


def _check_output(output: Path | None, force: bool, source: Path) -> None:
    """Refuse an output that is the heat list, that exists (without --force) or that is not a
    regular file (a device, a FIFO, a folder)."""
    if output is None:
        return
    from ladle.engine.files.atomic_files import refuse_unless_regular

    if not os.path.lexists(output):
        return
    if source.exists() and output.resolve() == source.resolve():
        raise CommandError(f"{quoted_path(output)}: is the heat list itself; write the results to another file")
    refuse_unless_regular(output)
    if not force:
        raise CommandError(f"{quoted_path(output)}: exists already; choose another name or add --force to replace it")


def _note(text: str) -> None:
    try:
        print(f"ladle batch: {one_line(text)}", file=sys.stderr)
    except OSError:           # no terminal any more (a dropped session)
        pass


def report(totals, output: Path | None) -> None:
    """The summary on stderr: how many heats were computed, why the others were not, and the
    heats without an identifier or with one that repeats."""
    done = totals.heats - totals.problems
    where = f"; written to {quoted_path(output)}" if output is not None else ""
    lines = [f"ladle batch: {done} of {totals.heats} heats computed{where}"]
    if totals.problems:
        lines.append(f"ladle batch: {totals.problems} row(s) not computed (the note column says why):")
        lines += [f"  line {line}: {one_line(reason)}" for line, reason in totals.listed]
        if totals.problems > len(totals.listed):
            lines.append(f"  ... and {totals.problems - len(totals.listed)} more")
    if totals.blank_ids:
        lines.append(f"ladle batch: warning: {totals.blank_ids} heat(s) without an identifier (kept): "
                     + ", ".join(f"line {n}" for n in totals.blank_listed)
                     + (" ..." if totals.blank_ids > len(totals.blank_listed) else ""))
    if totals.duplicates:
        lines.append(f"ladle batch: warning: {totals.duplicates} heat(s) repeat an earlier identifier (kept): "
                     + ", ".join(f"line {n} (as line {m})" for n, m in totals.duplicate_listed)
                     + (" ..." if totals.duplicates > len(totals.duplicate_listed) else ""))
    if totals.duplicate_check_full:
        from ..heatlist_runs import DUPLICATE_CHECK_LIMIT

        lines.append(f"ladle batch: note: identifiers were checked for repeats among the first "
                     f"{DUPLICATE_CHECK_LIMIT:,} heats only")
    try:
        print("\n".join(lines), file=sys.stderr)
    except OSError:
        pass
