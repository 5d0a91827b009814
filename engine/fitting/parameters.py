"""The free parameters of a fit: dotted paths to single coefficients of a system document.

A path names a phase, then the keys and list indexes inside its table, then one coefficient
letter (systems/FORMAT.md): "liquid.L.0.a" is coefficient a of L[0] of the liquid,
"fcc.G.Sn.a" the constant correction to the fcc Sn library function (a library name such as
G.Sn = "fcc" becomes { library = "fcc", a = ... }), "Al2Cu.formation.b", "fcc.G.Sn.1.a"
(the second piece of a piecewise function). The table holding the coefficient must exist in the
file; a coefficient it omits starts at zero, as the format defines.

Coefficients are J/mol times a power of K (a in J/mol, b in J/(mol K), ...).
"""

from __future__ import annotations

import math
from dataclasses import dataclass
from typing import Any

from ..models.polynomials import COEFFICIENTS

#: Magnitude (J/mol) that one unit of a scaled parameter adds to G at the reference temperature.
SCALE_J_PER_MOL = 1000.0
_TABLE_KEYS = set(COEFFICIENTS) | {"library", "upto", "from", "reference"}   # "reference": an end member's G


class ParameterPathError(ValueError):
    """A free-parameter path does not name a coefficient of the document (one-line message)."""


@dataclass(frozen=True)
class ParameterPath:
    """One free coefficient: `text` as written, the keys/indexes leading to its table under
    doc["phase"], and the coefficient letter."""

    text: str
    keys: tuple[str | int, ...]
    letter: str

    def _table(self, doc: dict) -> dict:
        node: Any = doc["phase"]
        for i, k in enumerate(self.keys):
            child = node[k]
            if isinstance(child, str) and i == len(self.keys) - 1:
                child = {"library": child}     # a library name gains a correction table
                node[k] = child
            node = child
        return node

    def get(self, doc: dict) -> float:
        """The coefficient's value in `doc` (0 where the table omits it)."""
        return float(self._table(doc).get(self.letter, 0.0))

    def set(self, doc: dict, value: float) -> None:
        """Write the coefficient into `doc` (in place)."""
        self._table(doc)[self.letter] = float(value)

    def scale(self, T_ref: float) -> float:
        """The coefficient change (its own unit) that changes G by SCALE_J_PER_MOL at T_ref (K)."""
        lnT = math.log(T_ref)
        term = {"a": 1.0, "b": T_ref, "c": T_ref * lnT, "d": T_ref**2, "e": T_ref**3, "f": 1.0 / T_ref,
                "g": T_ref**7, "h": T_ref**-9, "i": T_ref**-2, "j": T_ref**-3}[self.letter]
        return SCALE_J_PER_MOL / abs(term)


def _describe_node(where: str, node: Any) -> str:
    if isinstance(node, list):
        return f"{where} has {len(node)} entries (0 to {len(node) - 1})" if node else f"{where} is an empty list"
    if isinstance(node, dict):
        return f"{where} has keys {', '.join(map(str, node)) or 'none'}"
    return f"{where} is {node!r}, not a table"


def parse_path(text: Any, doc: dict) -> ParameterPath:
    """Check that `text` names one coefficient of `doc` and return its ParameterPath."""
    if not isinstance(text, str) or not text.strip():
        raise ParameterPathError(f"expected a dotted path such as \"liquid.L.0.a\", found {text!r}")
    parts = text.strip().split(".")
    if len(parts) < 3:
        raise ParameterPathError(f"{text!r}: expected phase, key(s) and a coefficient letter, such as \"liquid.L.0.a\"")
    phase, *middle, letter = parts
    phases = doc.get("phase", {})
    if phase not in phases:
        raise ParameterPathError(f"{text!r}: no phase {phase!r} in this file (phases: {', '.join(phases)})")
    if letter not in COEFFICIENTS:
        raise ParameterPathError(f"{text!r}: expected a coefficient letter ({', '.join(COEFFICIENTS)}) at the end, found {letter!r}")
    node: Any = phases[phase]
    where = f"phase.{phase}"
    keys: list[str | int] = [phase]
    for i, part in enumerate(middle):
        last = i == len(middle) - 1
        if isinstance(node, list):
            if not part.isdigit() or int(part) >= len(node):
                raise ParameterPathError(f"{text!r}: {_describe_node(where, node)}; add the entry (for example {{ a = 0 }}) to fit it")
            key: str | int = int(part)
            where = f"{where}[{part}]"
        elif isinstance(node, dict):
            if part not in node:
                raise ParameterPathError(f"{text!r}: {_describe_node(where, node)}, not {part!r}")
            key = part
            where = f"{where}.{part}"
        else:
            raise ParameterPathError(f"{text!r}: {_describe_node(where, node)}")
        node = node[key]
        keys.append(key)
        if isinstance(node, str) and not (last and where.split(".")[-2:-1] == ["G"]):
            raise ParameterPathError(f"{text!r}: {where} is the text {node!r}, not a table of coefficients")
    if isinstance(node, str):
        return ParameterPath(text, tuple(keys), letter)
    if isinstance(node, list):
        raise ParameterPathError(f"{text!r}: {where} is a list; name the entry by its index, such as {where.split('.', 1)[1]}.0.{letter}")
    if not isinstance(node, dict) or not set(node) <= _TABLE_KEYS:
        raise ParameterPathError(f"{text!r}: {where} is not a table of coefficients such as {{ a = -5000, b = 1.5 }}")
    value = node.get(letter, 0.0)
    if isinstance(value, bool) or not isinstance(value, (int, float)) or not math.isfinite(value):
        raise ParameterPathError(f"{text!r}: the starting value {value!r} is not a number")
    return ParameterPath(text, tuple(keys), letter)


def parse_free(free: list[str], doc: dict) -> list[ParameterPath]:
    """The free parameters of `doc` (its [fit] free list), each checked; repeated paths refused.
    Messages start with the key, such as 'fit.free[2]: ...'."""
    paths: list[ParameterPath] = []
    seen: set[tuple] = set()
    for i, text in enumerate(free):
        try:
            p = parse_path(text, doc)
        except ParameterPathError as e:
            raise ParameterPathError(f"fit.free[{i}]: {e}") from None
        ident = (p.keys, p.letter)
        if ident in seen:
            raise ParameterPathError(f"fit.free[{i}]: {text!r} is listed twice")
        seen.add(ident)
        paths.append(p)
    return paths
