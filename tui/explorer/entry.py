"""Reading a typed point: "650C 12wt%", "923K 20at%", "Sn=12wt%", "1200F", and for three or
more elements "Ag=3wt% Cu=0.5wt% 250C" (every element but the balance named), or an alloy by the
name its system file lists, "Sn96.5Ag3.0Cu0.5 250C".

The words are read by the same parser as the line-mode commands (`ladle.tui.parsing`): a
temperature is a number with an optional unit C, K or F (no unit: degrees Celsius), a
composition a number with wt% or at%, optionally after an element and "=" (several such words
make one alloy, as `--comp` does). Either part may be left out; the cursor keeps its other
coordinate. A bad entry raises EntryError, one line.
"""

from __future__ import annotations

import re
from dataclasses import dataclass

from ladle.tui.parsing import parse_alloy, parse_temperature, resolve_alloy
from ladle.tui.quote import one_line, percent

from .cursor import Window
from .glyphs import Glyphs
from .readout import format_temperature_value
from .scales import Scales


class EntryError(ValueError):
    """A typed point that cannot be used; the message says why, in one line."""


@dataclass(frozen=True)
class TypedPoint:
    """What the user typed: temperature in K and mole fraction of B (binaries), each None if not
    given; `mole_fractions` holds every element's (system order) wherever an alloy was typed."""

    temperature_K: float | None
    x_B: float | None
    mole_fractions: tuple[float, ...] | None = None


def _words(text: str) -> list[str]:
    """Split on spaces and commas, keeping "Sn = 12 wt %" and "650 C" together."""
    text = re.sub(r"\s*=\s*", "=", text.strip())
    text = re.sub(r"(\d\.?)\s+(?=°?[CFKcfk]\b|wt|at|WT|AT|%)", r"\1", text)
    text = re.sub(r"(wt|at)\s+%", r"\1%", text, flags=re.IGNORECASE)
    return [word for word in re.split(r"[\s,;]+", text) if word]


def _is_composition(word: str) -> bool:
    return (re.search(r"(wt|at)%?$", word, flags=re.IGNORECASE) is not None
            or word.endswith("%") or "=" in word)


def parse_point(text: str, elements: tuple[str, ...], molar_mass, alloys: tuple = ()) -> TypedPoint:
    """Read a typed point for a system of `elements` with molar masses (g/mol); a word naming one
    of the system's alloy shorthands (`alloys`, ladle.engine.files.alloys) stands for its
    composition."""
    from ladle.engine.files.alloys import find_alloy

    words = _words(text)
    if not words:
        raise EntryError("type a temperature and/or a composition, for example 650C 12wt%")
    temperature_K: float | None = None
    contents = [word for word in words if _is_composition(word)]
    named = [word for word in words if word not in contents and find_alloy(alloys, word) is not None]
    if len(named) > 1:
        raise EntryError(f"{' and '.join(named)}: type one alloy name")
    if named and contents:
        raise EntryError(f"{named[0]} gives the whole composition; type its name or the contents, not both")
    contents += [part for word in named for part in find_alloy(alloys, word).spec.split(",")]
    try:
        for word in words:
            if word in contents or word in named:
                continue
            if temperature_K is not None:
                raise EntryError(f"{word}: a second temperature; give one")
            if not re.match(r"[-+.\d]", word):       # a name, not a number: an alloy this file lacks
                raise EntryError(_not_understood(word, alloys))
            temperature_K = parse_temperature(word).kelvin
        if not contents:
            return TypedPoint(temperature_K, None)
        x = tuple(float(v) for v in resolve_alloy(parse_alloy(contents), tuple(elements)).mole_fractions(molar_mass))
    except EntryError:
        raise
    except ValueError as error:
        raise EntryError(str(error)) from None
    return TypedPoint(temperature_K, x[1] if len(elements) == 2 else None, x)


def _not_understood(word: str, alloys: tuple) -> str:
    """Why a word that is neither a number nor a composition was not used: it names none of the
    system's alloys (listed, as `--alloy` lists them)."""
    known = ", ".join(a.shown_name for a in alloys)
    return (f"cannot read temperature {one_line(repr(word))}, nor an alloy of this system by that name; "
            + (f"its alloys: {known}" if known else "its file lists no alloys"))


def check_inside(point: TypedPoint, limits: Window, scales: Scales, glyphs: Glyphs) -> None:
    """Raise EntryError when the typed point lies outside the system's mapped window."""
    shown_unit = glyphs.temperature_unit(scales.temperature_unit)
    if point.temperature_K is not None and not (
            limits.T_low <= point.temperature_K <= limits.T_high):
        low, high = sorted((scales.shown_temperature(limits.T_low),
                            scales.shown_temperature(limits.T_high)))
        raise EntryError(
            f"{format_temperature_value(scales.shown_temperature(point.temperature_K))} "
            f"{shown_unit} is outside this system's range, "
            f"{format_temperature_value(low)} to {format_temperature_value(high)} {shown_unit}")
    if point.x_B is not None and not (limits.x_low - 1e-12 <= point.x_B <= limits.x_high + 1e-12):
        low = scales.shown_composition(limits.x_low) / 100.0
        high = scales.shown_composition(limits.x_high) / 100.0
        raise EntryError(f"the model covers {percent(low)} to {percent(high)} "
                         f"{scales.composition_unit}% only")
