"""Alloy shorthands of a system file, the `[[alloy]]` list (systems/FORMAT.md), and the
composition tables by element that they and the facts of systems of three or more elements use.

Each entry names a common alloy by a published standard's designation and gives its nominal
composition in wt% or at% of every element but the balance. Commands take the name where they
take a composition (`--alloy NAME`); the composition is then read as if typed after `--comp`.
"""

from __future__ import annotations

from dataclasses import dataclass
from typing import Any, Callable

from .bounds import finite_number, shown_value
from .plain_text import has_controls, without_controls

_KEYS = {"name", "trade_name", "wt_percent", "at_percent", "source", "note"}
_MAX_NAME = 40


@dataclass(frozen=True)
class NamedAlloy:
    """A shorthand: `name`, the nominal content of each named element (`parts`, percent in
    `basis`, "wt" or "at"; the element left out is the balance), and where the name comes from."""

    name: str
    basis: str
    parts: tuple[tuple[str, float], ...]
    source: str
    note: str = ""
    trade_name: str = ""

    @property
    def shown_name(self) -> str:
        """'Sn96.5Ag3.0Cu0.5 (SAC305)': the designation, with the trade's name where there is one."""
        return f"{self.name} ({self.trade_name})" if self.trade_name else self.name

    @property
    def spec(self) -> str:
        """The composition as a --comp value, every content to the full precision of the file
        (the shortest text that reads back as the same float): 'Ag=3.0wt%,Cu=0.5wt%'."""
        return ",".join(f"{el}={pct!r}{self.basis}%" for el, pct in self.parts)


def read_alloys(items: Any, elements: tuple[str, ...], fail: Callable[[str, str], Exception]) -> tuple[NamedAlloy, ...]:
    """Validate the `[[alloy]]` list of a document: one table per alloy, names and trade names
    unique together (without regard to case), every element but one (the balance) given in wt%
    or at%, the sum below 100."""
    if not isinstance(items, list):
        raise fail("alloy", "expected a list of tables ([[alloy]])")
    out: list[NamedAlloy] = []
    seen: set[str] = set()
    for i, item in enumerate(items):
        key = f"alloy[{i}]"
        if not isinstance(item, dict):
            raise fail(key, "expected a table")
        for k in item:
            if k not in _KEYS:
                raise fail(f"{key}.{k}", f"unknown key; expected one of {', '.join(sorted(_KEYS))}")
        names = {"name": item.get("name")}
        if "trade_name" in item:
            names["trade_name"] = item["trade_name"]
        for which, name in names.items():
            if (not isinstance(name, str) or not name.strip() or len(name) > _MAX_NAME or has_controls(name)
                    or any(c in name.strip() for c in ",; ")):
                raise fail(f"{key}.{which}", f"expected a name of at most {_MAX_NAME} characters, "
                                             "without spaces, commas, semicolons or control characters")
            if name.strip().lower() in seen:
                raise fail(f"{key}.{which}", f"{name.strip()!r} is named twice")
            seen.add(name.strip().lower())
        source = item.get("source")
        if not isinstance(source, str) or not source.strip():
            raise fail(f"{key}.source", "missing: name the standard (and edition) that gives this designation")
        bases = [b for b in ("wt_percent", "at_percent") if b in item]
        if len(bases) != 1:
            raise fail(key, "give the composition once, as wt_percent or at_percent (a table by element)")
        parts = percent_table(item[bases[0]], elements, f"{key}.{bases[0]}", fail)
        note = item.get("note", "")
        if not isinstance(note, str):
            raise fail(f"{key}.note", "expected a text")
        out.append(NamedAlloy(name=names["name"].strip(), basis=bases[0][:2], parts=tuple(parts),
                              source=without_controls(source), note=without_controls(note),
                              trade_name=names.get("trade_name", "").strip()))
    return tuple(out)


def percent_table(table: Any, elements: tuple[str, ...], key: str,
                  fail: Callable[[str, str], Exception]) -> tuple[tuple[str, float], ...]:
    """A composition table of a file, `{ Ag = 3.0, Cu = 0.5 }`: (element, percent) of every
    element but one (the balance), each from 0 to below 100, together below 100."""
    if not isinstance(table, dict) or not table:
        raise fail(key, "expected a table such as { Ag = 3.0, Cu = 0.5 }")
    parts = []
    for el, v in table.items():
        if el not in elements:
            raise fail(f"{key}.{el}", f"expected an element of this system ({', '.join(elements)})")
        if not finite_number(v) or not 0 <= v < 100:
            raise fail(f"{key}.{el}", f"expected a percentage from 0 to below 100, found {shown_value(v)}")
        parts.append((el, float(v)))
    if len(parts) != len(elements) - 1:
        raise fail(key, "give every element but one, the balance")
    if sum(p for _, p in parts) >= 100:
        raise fail(key, "the named elements add up to 100 % or more; the balance needs a share")
    return tuple(parts)


def mole_fractions(parts: tuple[tuple[str, float], ...], basis: str, elements: tuple[str, ...],
                   molar_mass) -> tuple[float, ...]:
    """Mole fractions of every element (the system's order) of a composition given as (element,
    percent) of all but the balance, in `basis` "wt" or "at"; molar masses in g/mol."""
    import numpy as np

    from ..units import mole_from_mass

    shares = np.zeros(len(elements))
    named = dict(parts)
    for i, el in enumerate(elements):
        shares[i] = named.get(el, 0.0) / 100.0
    balance = next(i for i, el in enumerate(elements) if el not in named)
    shares[balance] = 1.0 - shares.sum()
    x = mole_from_mass(shares, np.asarray(molar_mass, dtype=float)) if basis == "wt" else shares
    return tuple(float(v) for v in x)


def find_alloy(alloys: tuple[NamedAlloy, ...], name: str) -> NamedAlloy | None:
    """The shorthand called `name`, by its designation or its trade name (case and surrounding
    spaces ignored), or None."""
    wanted = name.strip().lower()
    return next((a for a in alloys if wanted in (a.name.lower(), a.trade_name.lower())), None)
