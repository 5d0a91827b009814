"""Pieces several commands share: opening a system, reading the alloy, printing JSON."""

from __future__ import annotations

import argparse
import json
import os
import shutil
import sys
import textwrap
from collections.abc import Callable

from .. import quote
from ..errors import CommandError
from ..parsing import Alloy, parse_alloy, parse_temperature, resolve_alloy


def add_system_argument(p: argparse.ArgumentParser) -> None:
    p.add_argument("system", metavar="SYSTEM", help="a system name such as cu-ni (elements joined by '-'), or a path to a system file")
    p.add_argument("--without", action="append", default=[], metavar="PHASE",
                   help="leave this phase out (repeatable), for a metastable equilibrium such as iron-cementite: --without graphite")


class AlloyName(str):
    """An --alloy value: the name of one of the system's alloy shorthands (its [[alloy]] list),
    kept where the --comp values go and turned into its composition by `read_alloy`."""


class _StoreAlloyName(argparse.Action):
    """--alloy NAME, once: a second name is refused (the last one would silently win)."""

    def __call__(self, parser, namespace, value, option_string=None):
        given = getattr(namespace, self.dest, None)
        if given:
            parser.error(f"--alloy is given twice ({quote.one_line(repr(str(given[0])))} and "
                         f"{quote.one_line(repr(value))}); name one alloy")
        setattr(namespace, self.dest, [AlloyName(value)])


def add_composition_argument(p: argparse.ArgumentParser, required: bool = True) -> None:
    """--comp SPEC (repeatable) or --alloy NAME, one of them `required`; both land in args.comp."""
    group = p.add_mutually_exclusive_group(required=required)
    group.add_argument("--comp", action="append", metavar="SPEC",
                       help="alloy composition, e.g. Ni=40wt%% or Ni=40at%%; for three or more elements name all but "
                            "the balance, e.g. Ag=3wt%%,Cu=0.5wt%% (or repeat --comp)")
    group.add_argument("--alloy", dest="comp", action=_StoreAlloyName, metavar="NAME",
                       help="a common alloy by its designation, as the system file lists them ([[alloy]]; "
                            "an unknown name lists them), e.g. Sn96.5Ag3.0Cu0.5")


def composition_specs(system, specs: str | list[str]) -> str | list[str]:
    """The --comp values, with an --alloy name replaced by its composition; an unknown name is a
    CommandError of one line listing the system's alloys."""
    from ladle.engine.files.alloys import find_alloy

    if not (isinstance(specs, list) and len(specs) == 1 and isinstance(specs[0], AlloyName)):
        return specs
    name = specs[0]
    found = find_alloy(system.alloys, name)
    if found is not None:
        return [found.spec]
    known = ", ".join(a.shown_name for a in system.alloys)
    raise CommandError(f"unknown alloy {quote.one_line(repr(str(name)))} for {system.name}; "
                       + (f"its alloys: {known}" if known else "its file lists no alloys: give --comp"))


def open_system(name: str, without: list[str] | tuple[str, ...] = ()):
    """The System named on the command line, less the phases `without` (--without); conflicts in
    the user's folder go to stderr. A phase the system lacks, or leaving out every phase, is a
    ValueError of one line."""
    from ladle.engine import find_system
    from ladle.engine.files.catalog import catalog

    system = find_system(name)
    for line in catalog()[1]:
        print(f"ladle: note: {quote.one_line(line)}", file=sys.stderr)
    return system.without(tuple(without)) if without else system


def require_liquid(system) -> None:
    """A CommandError of one line where `system` has no phase called liquid (left out with
    --without, or a file of solids only): there is nothing to melt or freeze."""
    if "liquid" not in system.phases:
        raise CommandError(f"{system.name} has no liquid phase here (its phases: {', '.join(system.phases)}); "
                           f"melting and freezing need one (if --without left it out, keep it)")


def read_alloy(system, specs: str | list[str]):
    """(mole fractions of every element as a numpy array in the system's order, the resolved
    Alloy) for the --comp value(s); a binary alloy is refused outside the range the model covers."""
    spec = parse_alloy(composition_specs(system, specs))
    alloy = resolve_alloy(spec, tuple(system.elements))
    x = alloy.mole_fractions(system.molar_mass)
    problem = (coverage_problem(system, float(x[1]), spec.text) if len(system.elements) == 2
               else alloy_coverage_problem(system, x, spec.text))
    if problem:
        raise CommandError(f"{problem}; no answer is given there")
    return x, alloy


def alloy_composition(system, specs: str | list[str]) -> tuple[float, Alloy]:
    """(x_B, resolved alloy) for the --comp value(s) of a binary system, refused outside the range
    the model covers."""
    if len(system.elements) != 2:
        raise CommandError(f"this command takes binary systems only; {system.name} has "
                           f"{len(system.elements)} elements ({'-'.join(system.elements)})")
    x, alloy = read_alloy(system, specs)
    return float(x[1]), alloy


def coverage_problem(system, x_b: float, what: str) -> str | None:
    """Why `what` (an alloy of mole fraction x_B of B) gets no answer, or None if the model
    covers it."""
    lo, hi = system.covers
    if lo - 1e-12 <= x_b <= hi + 1e-12:
        return None
    return f"{what} lies outside the range this model covers ({100 * lo:g}-{100 * hi:g} at% {system.elements[1]})"


def alloy_coverage_problem(system, x, what: str) -> str | None:
    """Why `what` (an alloy of mole fractions x of every element, three or more) gets no answer,
    or None if the model covers it."""
    if system.covered(x):
        return None
    return f"{what} lies outside the range this model covers ({system.covered_range_text()})"


def temperature_kelvin(system, text: str):
    """Parsed --temp, refused outside the temperatures the models are defined for."""
    t = parse_temperature(text)
    lo, hi = system.model_range_K
    if not lo <= t.kelvin <= hi:
        raise CommandError(f"temperature {quote.one_line(text.strip())} is outside the range of this system's models "
                           f"({_range_text(lo, hi, t.unit)})")
    c_lo, c_hi = system.covers_K
    if not c_lo <= t.kelvin <= c_hi:
        raise CommandError(f"temperature {quote.one_line(text.strip())} lies outside the temperatures this model "
                           f"covers ({_range_text(c_lo, c_hi, t.unit)}); no answer is given there")
    return t


def _range_text(lo_K: float, hi_K: float, unit: str) -> str:
    """'100 to 450 C, 373.15 to 723.15 K': a range of temperatures (K) in the unit the person
    typed, then in K (K alone where that was the unit)."""
    from ladle.engine.units import kelvin_to

    kelvin = f"{lo_K:g} to {hi_K:g} K"
    if unit == "K":
        return kelvin
    lo, hi = (f"{kelvin_to(T, unit):.2f}".rstrip("0").rstrip(".") for T in (lo_K, hi_K))
    return f"{lo} to {hi} {unit}, {kelvin}"


def system_title(system) -> str:
    """The system's title, or its elements joined by '-' where the file gives none."""
    return system.title or "-".join(system.elements)


def coverage_note(system) -> str:
    """ "(model covers 0-45 at% Ag only)" for a model of part of the composition range, else ""."""
    if len(system.elements) > 2:
        return f"(model covers {system.covered_range_text()} only)" if system.covers_elements else ""
    lo, hi = system.covers
    if (lo, hi) == (0.0, 1.0):
        return ""
    return f"(model covers {100 * lo:g}-{100 * hi:g} at% {system.elements[1]} only)"


def temperature_both(T_K: float, unit: str) -> str:
    """'966.9 °C (1240.0 K)': a temperature in K shown in the person's unit ("C", "K" or "F"),
    then in K (in C when the person's unit is K)."""
    other = "K" if unit != "K" else "C"
    return f"{quote.temperature(T_K, unit)} ({quote.temperature(T_K, other)})"


def composition_both(system, x_b: float, element: str, basis: str) -> str:
    """'Sn 10.0 wt% (16.2 at%)': an alloy of mole fraction x_b of B as the person typed it
    (the share of `element` in `basis`, "wt" or "at"), then in the other basis."""
    import numpy as np

    from ladle.engine.units import mass_from_mole

    x = np.array([1.0 - x_b, x_b])
    shares = {"at": x, "wt": mass_from_mole(x, system.molar_mass)}
    other = "at" if basis == "wt" else "wt"
    i = system.elements.index(element)
    return (f"{element} {quote.percent(shares[basis][i])} {basis}% "
            f"({quote.percent(shares[other][i])} {other}%)")


def alloy_both(system, x, basis: str) -> str:
    """'Sn 96.5 wt% (95.8 at%), Ag 3.00 wt% (3.28 at%), Cu 0.500 wt% (0.927 at%)': every element
    of an alloy (mole fractions x in the system's order) in the person's basis ("wt" or "at"),
    then in the other."""
    import numpy as np

    from ladle.engine.units import mass_from_mole

    x = np.asarray(x, dtype=float)
    shares = {"at": x, "wt": mass_from_mole(x, system.molar_mass)}
    other = "at" if basis == "wt" else "wt"
    return ", ".join(f"{el} {quote.percent(shares[basis][i])} {basis}% ({quote.percent(shares[other][i])} {other}%)"
                     for i, el in enumerate(system.elements))


def terminal_plot(title: str, glyphs, min_rows: int, draw: Callable[[object, int, int], None]) -> str:
    """A plotext picture at the terminal's size: at least 80 columns and `min_rows` rows, six
    lines left for the text around it. `draw(plt, width, height)` issues the plot calls; colour
    only on a terminal without NO_COLOR; characters from `glyphs` (the explorer's glyph set)."""
    import plotext

    size = shutil.get_terminal_size((80, 24))
    width = max(size.columns, 80)
    heading = textwrap.wrap(title, width)   # plotext would blank a title wider than the plot
    height = max(size.lines - 5 - len(heading), min_rows)
    plotext.clear_figure()
    plotext.limit_size(False, False)        # plotext would shrink the picture to a smaller terminal
    plotext.plotsize(width, height)
    plotext.theme("clear")
    draw(plotext, width, height)
    text = "\n".join(heading + [plotext.build()])
    if os.environ.get("NO_COLOR") or not sys.stdout.isatty():
        text = plotext.uncolorize(text)
    return glyphs.plot_text(text)


def ascii_text(lines: list[str], ascii_only: bool) -> list[str]:
    """The lines without the degree sign that `quote.temperature` writes on UTF-8 output, when the
    person asked for plain ASCII (text from the system file is printed as written)."""
    return [line.replace("°", "") for line in lines] if ascii_only else lines


def print_json(obj) -> None:
    json.dump(obj, sys.stdout, indent=None, allow_nan=False)
    sys.stdout.write("\n")


ESTIMATE_NOTE = "Computed estimate: defer to the alloy's specification and certified data."


def closing_lines(system) -> list[str]:
    """The lines every human-readable answer ends with: the system's safety note and the
    reminder that the numbers are estimates."""
    return ([f"safety: {system.safety}"] if system.safety else []) + [ESTIMATE_NOTE]
