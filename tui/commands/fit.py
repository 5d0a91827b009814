"""`ladle fit`: fit a system's free coefficients to measurements and write a new system file.

Exit status: 0 when the fit is good and written; 1 when it did not converge or its result lacks
a measured feature (nothing is written unless --write-anyway); 2 on bad input.
"""

from __future__ import annotations

import argparse
import math
import sys
import time
from pathlib import Path

from ..errors import CommandError, os_error_text
from .common import print_json
from .fact_table import UNITS_NOTE, fact_blocks, outcome_json

HELP = "fit a system's free coefficients ([fit] free) to its [[measured]] facts and write a new system file"

#: Progress appears on a terminal once a fit has run this long (s), refreshed at most this often.
_PROGRESS_AFTER_S = 1.0
_PROGRESS_EVERY_S = 0.2
_UNITS = {"a": "J/mol", "b": "J/(mol K)", "c": "J/(mol K)", "d": "J/(mol K2)", "e": "J/(mol K3)",
          "f": "J K/mol", "g": "J/(mol K7)", "h": "J K9/mol"}


def add_arguments(p: argparse.ArgumentParser) -> None:
    p.add_argument("measurements", metavar="MEASUREMENTS.toml",
                   help="a system file with [fit] free = [...] and [[measured]] facts (see systems/FORMAT.md)")
    p.add_argument("-o", "--output", required=True, metavar="NEW.toml", help="the system file to write (never the input)")
    p.add_argument("--force", action="store_true", help="replace NEW.toml if it exists")
    p.add_argument("--write-anyway", action="store_true",
                   help="write NEW.toml even when the fit did not converge or lost a measured feature")
    p.add_argument("--max-steps", type=int, metavar="N",
                   help="stop after N trial points of the optimiser (default: 100 per free coefficient)")
    p.add_argument("--json", action="store_true", help="print the fit report as one JSON object")


def _check_output(source: Path, output: Path, force: bool) -> None:
    """Refuse, before any work, an output that is the input, or exists without --force."""
    if output.exists() and source.exists() and output.resolve() == source.resolve():
        raise CommandError(f"{output}: this is the measurements file itself; it is never overwritten, choose another name")
    if output.is_dir():
        raise CommandError(f"{output}: is a folder; expected the name of the system file to write")
    if output.exists() and not force:
        raise CommandError(f"{output}: exists; use --force to replace it")
    folder = output.parent if str(output.parent) else Path(".")
    if not folder.is_dir():
        raise CommandError(f"{output}: the folder {folder} does not exist")
    from ladle.engine.files.atomic_files import check_writable

    check_writable(output)


def _refuse_unless_regular_input(source: Path) -> None:
    """A measurements file that is a FIFO, a device or a folder is refused at once (reading a FIFO
    would wait for a writer); a missing one is left for the loader to name."""
    from ladle.engine.files.regular_files import require_regular

    try:
        require_regular(source)
    except FileNotFoundError:
        pass


def _write_or_keep(source: Path, output: Path, force: bool, text: str) -> None:
    """Write the fitted file to `output`; where that fails after the fit, keep it in the
    temporary folder and raise a CommandError that names both."""
    from ladle.engine.files.atomic_files import keep_elsewhere, write_atomic

    try:
        _check_output(source, output, force)
        write_atomic(output, text)
    except (CommandError, OSError) as error:
        reason = os_error_text(error) if isinstance(error, OSError) else str(error)
        kept = keep_elsewhere(output.stem or "fitted", ".toml", text)
        raise CommandError(f"{reason}; the fitted file was kept as {kept}") from None


class _Progress:
    """Evaluations and chi-square on one line of stderr, for fits that run longer than a second."""

    def __init__(self) -> None:
        self.started = time.monotonic()
        self.last = 0.0
        self.shown = False

    def __call__(self, evaluations: int, chi_square: float) -> None:
        now = time.monotonic()
        if now - self.started < _PROGRESS_AFTER_S or now - self.last < _PROGRESS_EVERY_S:
            return
        self.last = now
        self.shown = True
        sys.stderr.write(f"\rfitting: {evaluations} model evaluations, chi-square {chi_square:.6g}   ")
        sys.stderr.flush()

    def clear(self) -> None:
        if self.shown:
            sys.stderr.write("\r" + " " * 72 + "\r")
            sys.stderr.flush()


def _rounded(value: float, uncertainty: float | None) -> tuple[str, str]:
    """The value to the precision its uncertainty warrants (two significant figures of it)."""
    if uncertainty is None or uncertainty <= 0 or not math.isfinite(uncertainty):
        return f"{value:.6g}", "not determined"
    decimals = max(0, 1 - math.floor(math.log10(uncertainty)))
    return f"{value:.{decimals}f}", f"{uncertainty:.{decimals}f}"


#: Why the least-squares solver stopped (scipy.optimize.least_squares names its tests gtol, ftol and
#: xtol), in the report's words; the solver's own message stays in --json.
_STOPS = (("maximum number of function evaluations", "the step limit (--max-steps) was reached before the fit settled"),
          ("`ftol` and `xtol`", "chi-square and the coefficients both stopped changing"),
          ("`gtol`", "chi-square is flat in every coefficient (a minimum)"),
          ("`ftol`", "chi-square stopped changing"),
          ("`xtol`", "the coefficients stopped changing"))


def stop_in_words(solver_message: str) -> str:
    """Why the fit stopped, in the report's words (the solver's message where it is not known)."""
    return next((words for test, words in _STOPS if test in solver_message), solver_message)


def render(result, measurements: Path) -> list[str]:
    """The human-readable fit report."""
    m = sum(len(o.comparisons) for o in result.outcomes)
    status = "converged" if result.converged else "DID NOT CONVERGE"
    lines = [f"Fit of {measurements.name}: {len(result.parameters)} coefficients to {m} measured values",
             f"{status}: {stop_in_words(result.solver_message)} ({result.evaluations} model evaluations, "
             f"{result.seconds:.1f} s)"]
    dof = result.degrees_of_freedom
    fit_line = f"chi-square {result.chi_square:.4g} (start {result.start_chi_square:.4g}), {dof} degrees of freedom"
    if result.reduced_chi_square is not None:
        fit_line += f", per degree of freedom {result.reduced_chi_square:.3g}"
    lines.append(fit_line)
    if result.uncertainty_scale > 1.0:
        lines.append(f"the measurements scatter more than their uncertainties: standard uncertainties enlarged "
                     f"x{result.uncertainty_scale:.3g} (Birge ratio)")
    lines.append("")
    rows = [("coefficient", "start", "fitted", "standard uncertainty", "unit")]
    for p in result.parameters:
        value, unc = _rounded(p.value, p.uncertainty)
        rows.append((p.path, f"{p.start:.6g}", value, unc if p.uncertainty is None else f"± {unc}", _UNITS[p.path[-1]]))
    widths = [max(len(r[i]) for r in rows) for i in range(5)]
    lines += ["  ".join(f"{c:<{w}}" if i in (0, 4) else f"{c:>{w}}" for i, (c, w) in enumerate(zip(r, widths))).rstrip()
              for r in rows]
    if result.correlations:
        lines += ["", "high correlations (|r| >= 0.9): the pair is determined together better than each alone"]
        lines += [f"  {a} ~ {b}: {r:+.3f}" for a, b, r in result.correlations]
    lines += ["", "measurements against the fitted model (residual = difference / uncertainty):", ""]
    lines += fact_blocks(result.system, result.outcomes, "measured", "uncertainty", weighted=True)
    lines.append(UNITS_NOTE)
    if result.problems:
        lines += ["", "PROBLEMS: the fitted model should not be used as it is:"]
        lines += [f"  - {p}" for p in result.problems]
    return lines


def report_json(result, measurements: Path, written: Path | None) -> dict:
    return {
        "measurements": str(measurements), "written": None if written is None else str(written),
        "converged": result.converged, "acceptable": result.acceptable, "problems": list(result.problems),
        "solver_message": result.solver_message, "evaluations": result.evaluations, "seconds": result.seconds,
        "chi_square": result.chi_square, "start_chi_square": result.start_chi_square,
        "degrees_of_freedom": result.degrees_of_freedom, "reduced_chi_square": result.reduced_chi_square,
        "uncertainty_scale": result.uncertainty_scale,
        "parameters": [{"path": p.path, "start": p.start, "value": p.value, "uncertainty": p.uncertainty}
                       for p in result.parameters],
        "correlations": [{"first": a, "second": b, "r": r} for a, b, r in result.correlations],
        "measured": [outcome_json(result.system, o, "uncertainty") for o in result.outcomes],
    }


def run(args: argparse.Namespace) -> int:
    from ladle.engine import load_system
    from ladle.engine.fitting.fit import fit
    from ladle.engine.fitting.report import fitted_document
    from ladle.engine.fitting.toml_writer import toml_text

    source, output = Path(args.measurements), Path(args.output)
    _check_output(source, output, args.force)
    if args.max_steps is not None and args.max_steps < 1:
        raise CommandError(f"--max-steps {args.max_steps}: expected a positive number")
    _refuse_unless_regular_input(source)
    system = load_system(source)
    progress = _Progress() if sys.stderr.isatty() else None
    try:
        result = fit(system, progress, args.max_steps)
    finally:
        if progress is not None:
            progress.clear()
    written = None
    if result.acceptable or args.write_anyway:
        header = (f"Written by `ladle fit` from {source.name}; the fit's figures are in [fit_report].\n"
                  f"Comments of the input file are not carried over: its keys (source, notes) are.")
        _write_or_keep(source, output, args.force, toml_text(fitted_document(result, source.name), header))
        written = output
    if args.json:
        print_json(report_json(result, source, written))
    else:
        lines = render(result, source)
        if written is not None:
            lines += ["", f"wrote {written}" + ("" if result.acceptable else " (asked for with --write-anyway)")]
        else:
            why = "the fit did not converge" if not result.converged else "the fitted model has the problems listed above"
            lines += ["", f"nothing written: {why} (--write-anyway writes {output} regardless)"]
        print("\n".join(lines))
    return 0 if result.acceptable else 1
