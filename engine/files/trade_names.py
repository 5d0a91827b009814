"""The trade's words in a system file: names of phases (austenite for fcc iron), names of the lines
where an alloy's phases change (A1, A3, Acm of steels), and the kind of heat treatment the
system's alloys take. The keys are described in systems/FORMAT.md ("The trade's names").

The loader validates them when it reads a file (`read_trade_names`); commands read them from a
loaded system with `trade_names(system)`. Temperatures in K.
"""

from __future__ import annotations

import math
from collections.abc import Callable, Collection, Iterable
from dataclasses import dataclass
from functools import lru_cache
from typing import Any

from .bounds import finite_number, shown_value
from .plain_text import without_controls

#: The heat treatments a file may name (`heat_treatment`): solution treatment of age-hardening
#: alloys, and austenitizing (hardening) of steels.
HEAT_TREATMENTS = ("solution", "austenitizing")
_LINE_KEYS = {"name", "above", "below", "note", "constituent"}
_NAME_KEYS = {"name", "from_K", "upto_K"}


@dataclass(frozen=True)
class TradeLine:
    """A named line: on cooling, the stable phases change from the set `above` to the set
    `below`; `note` (may be empty) says what the name means; `constituent` (may be empty) is the
    trade's name of what the reaction there forms (ledeburite, pearlite)."""

    name: str
    above: frozenset[str]
    below: frozenset[str]
    note: str = ""
    constituent: str = ""


@dataclass(frozen=True)
class PhaseName:
    """The trade's name of a phase between `from_K` and `upto_K` (K)."""

    name: str
    from_K: float = 0.0
    upto_K: float = math.inf


@dataclass(frozen=True)
class TradeNames:
    """A system's trade names: `phases` (phase -> its names by temperature), `lines`, the note
    shown once under any answer that crosses a named line (`lines_note`, may be empty) and the
    `heat_treatment` its alloys take (one of HEAT_TREATMENTS, or None); `cast_iron`: the
    system's alloys are cast irons, for which `ladle melt` gives the graphite eutectic and the
    carbon equivalent."""

    phases: dict[str, tuple[PhaseName, ...]]
    lines: tuple[TradeLine, ...]
    heat_treatment: str | None = None
    lines_note: str = ""
    cast_iron: bool = False

    def phase_name(self, phase: str, temperature_K: float) -> str | None:
        """The trade's name of `phase` at temperature_K (K), or None."""
        return next((n.name for n in self.phases.get(phase, ()) if n.from_K <= temperature_K < n.upto_K), None)

    def constituent_name(self, phases: Iterable[str], from_liquid: bool) -> str | None:
        """The trade's name of a constituent of `phases` formed together by a reaction of the
        liquid (`from_liquid`) or of solids, where a line names it; else None."""
        formed = frozenset(phases)
        return next((ln.constituent for ln in self.lines if ln.constituent and ln.below == formed
                     and ("liquid" in ln.above) == from_liquid), None)

    def line(self, above: Iterable[str], below: Iterable[str]) -> TradeLine | None:
        """The named line for a change from the phases `above` to those `below`, or None."""
        up, down = frozenset(above), frozenset(below)
        return next((ln for ln in self.lines if ln.above == up and ln.below == down), None)


def read_trade_names(doc: dict, phases: Collection[str] | None, fail: Callable[[str, str], Exception]) -> TradeNames:
    """The trade names of a parsed system file `doc` whose phases are `phases` (None: names of
    phases are not checked, as for a file already validated). Raises fail(key, what) for a bad
    entry."""
    names: dict[str, tuple[PhaseName, ...]] = {}
    table = doc.get("trade_names", {})
    if not isinstance(table, dict):
        raise fail("trade_names", "expected a table such as { fcc = \"austenite\" }")
    for phase, value in table.items():
        key = f"trade_names.{phase}"
        if phases is not None and phase not in phases:
            raise fail(key, f"no phase {phase!r} in this system; it has {', '.join(sorted(phases))}")
        names[phase] = _phase_names(value, key, fail)
    lines = []
    entries = doc.get("trade_line", [])
    if not isinstance(entries, list):
        raise fail("trade_line", "expected a list of [[trade_line]] tables")
    for i, entry in enumerate(entries):
        lines.append(_line(entry, f"trade_line[{i}]", phases, fail))
    treatment = doc.get("heat_treatment")
    if treatment is not None and treatment not in HEAT_TREATMENTS:
        raise fail("heat_treatment", f"expected one of {', '.join(repr(h) for h in HEAT_TREATMENTS)}, found {shown_value(treatment)}")
    note = doc.get("trade_line_note", "")
    if not isinstance(note, str):
        raise fail("trade_line_note", "expected a text")
    return TradeNames(names, tuple(lines), treatment, without_controls(note, keep_newlines=True),
                      _cast_iron(doc, phases, fail))


#: What a cast iron system holds: its elements and the phases of its eutectics.
CAST_IRON_ELEMENTS = ("Fe", "C", "Si")
CAST_IRON_PHASES = ("liquid", "fcc", "graphite")


def _cast_iron(doc: dict, phases: Collection[str] | None, fail: Callable[[str, str], Exception]) -> bool:
    """The file's `cast_iron` flag (default false); a file that sets it must hold iron, carbon and
    silicon and the phases liquid, fcc (austenite) and graphite."""
    value = doc.get("cast_iron", False)
    if not isinstance(value, bool):
        raise fail("cast_iron", f"expected true or false, found {shown_value(value)}")
    if value and phases is not None:
        lacking = [e for e in CAST_IRON_ELEMENTS if e not in doc.get("elements", ())]
        lacking += [p for p in CAST_IRON_PHASES if p not in phases]
        if lacking:
            raise fail("cast_iron", f"a cast iron system needs the elements {', '.join(CAST_IRON_ELEMENTS)} and the "
                       f"phases {', '.join(CAST_IRON_PHASES)}; this one lacks {', '.join(lacking)}")
    return value


def _table(item: Any, key: str, allowed: set[str], fail: Callable[[str, str], Exception], what: str) -> dict:
    """`item` as a table holding only `allowed` keys (`what` describes it in the message)."""
    if not isinstance(item, dict):
        raise fail(key, f"expected {what}")
    for extra in set(item) - allowed:
        raise fail(f"{key}.{extra}", f"unknown key; expected one of {', '.join(sorted(allowed))}")
    return item


def _text(value: Any, key: str, fail: Callable[[str, str], Exception], example: str = "") -> str:
    """A non-empty text without control characters."""
    if not isinstance(value, str) or not without_controls(value).strip():
        raise fail(key, "expected a non-empty text" + (f" such as {example}" if example else ""))
    return without_controls(value)


def _phase_names(value: Any, key: str, fail: Callable[[str, str], Exception]) -> tuple[PhaseName, ...]:
    if isinstance(value, str) and without_controls(value).strip():
        return (PhaseName(without_controls(value)),)
    if not isinstance(value, list) or not value:
        raise fail(key, "expected a name, or a list of { name = .., from_K = .., upto_K = .. }")
    out = []
    for i, item in enumerate(value):
        k = f"{key}[{i}]"
        item = _table(item, k, _NAME_KEYS, fail, "a table { name = .., from_K = .., upto_K = .. }")
        name = _text(item.get("name"), f"{k}.name", fail)
        bounds = []
        for bound, default in (("from_K", 0.0), ("upto_K", math.inf)):
            v = item.get(bound, default)
            if not (finite_number(v) or v == math.inf) or v < 0:       # upto_K may be unbounded
                raise fail(f"{k}.{bound}", f"expected a temperature in K, found {shown_value(v)}")
            bounds.append(float(v))
        if not bounds[0] < bounds[1]:
            raise fail(k, "expected from_K below upto_K")
        out.append(PhaseName(name, bounds[0], bounds[1]))
    return tuple(out)


def _line(entry: Any, key: str, phases: Collection[str] | None, fail: Callable[[str, str], Exception]) -> TradeLine:
    entry = _table(entry, key, _LINE_KEYS, fail, "a table with name, above and below")
    name = _text(entry.get("name"), f"{key}.name", fail, '"A3"')
    sides = []
    for side in ("above", "below"):
        value = entry.get(side)
        if not isinstance(value, list) or not value or not all(isinstance(p, str) for p in value):
            raise fail(f"{key}.{side}", "expected a list of phase names such as [\"fcc\"]")
        for p in value:
            if phases is not None and p not in phases:
                raise fail(f"{key}.{side}", f"no phase {p!r} in this system; it has {', '.join(sorted(phases))}")
        sides.append(frozenset(value))
    note = entry.get("note", "")
    if not isinstance(note, str):
        raise fail(f"{key}.note", "expected a text")
    constituent = _text(entry["constituent"], f"{key}.constituent", fail, '"pearlite"') if "constituent" in entry else ""
    return TradeLine(name, sides[0], sides[1], without_controls(note, keep_newlines=True), constituent)


@lru_cache(maxsize=64)
def trade_names(system) -> TradeNames:
    """The trade names of a loaded system (validated when it was loaded). A system with phases
    left out keeps the names of its file: lines naming a left-out phase then match no change."""

    def fail(key: str, what: str) -> Exception:
        return ValueError(f"{system.path.name}: {key}: {what}")

    return read_trade_names(system.document, None, fail)
