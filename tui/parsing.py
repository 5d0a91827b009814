"""Reading what a person types: temperatures with units and compositions with units.

Shared by the line-mode commands and the explorer. Errors are ValueError with one line that
names the value and what is expected.
"""

from __future__ import annotations

import math
import re
from dataclasses import dataclass

from ladle.engine.units import kelvin_from

_NUMBER = r"[+-]?(?:\d+(?:\.\d*)?|\.\d+)(?:[eE][+-]?\d+)?"
_TEMPERATURE = re.compile(rf"^\s*({_NUMBER})\s*(°?\s*[CcKkFf])?\s*$")
_COMPOSITION = re.compile(rf"^\s*(?:([A-Za-z]{{1,2}})\s*=\s*)?({_NUMBER})\s*(wt|at)\s*%?\s*$", re.IGNORECASE)


@dataclass(frozen=True)
class Temperature:
    """A typed temperature: its value in K and the unit the person used ("C", "K" or "F")."""

    kelvin: float
    unit: str


@dataclass(frozen=True)
class Composition:
    """A typed composition: `percent` of `element` in `basis` ("wt" or "at")."""

    element: str | None
    percent: float
    basis: str


def parse_temperature(text: str) -> Temperature:
    """'1250', '1250C', '1523.15K', '2282F' (no unit: degrees Celsius) -> Temperature."""
    m = _TEMPERATURE.match(text or "")
    if not m:
        raise ValueError(f"cannot read temperature {text!r}; expected a number with an optional unit C, K or F, e.g. 1250C")
    unit = (m.group(2) or "C").replace("°", "").strip().upper()
    value = float(m.group(1))
    if not math.isfinite(value):
        raise ValueError(f"temperature {text.strip()} is not a finite number; expected one such as 1250C")
    kelvin = kelvin_from(value, unit)
    if kelvin <= 0.0:
        raise ValueError(f"temperature {text.strip()} is at or below absolute zero")
    return Temperature(kelvin, unit)


def parse_composition(text: str) -> Composition:
    """'Ni=40wt%', 'ni=40at%', '12wt%' (no element: the system's second element) -> Composition."""
    m = _COMPOSITION.match(text or "")
    if not m:
        raise ValueError(f"cannot read composition {text!r}; expected element=amount with wt% or at%, e.g. Ni=40wt%")
    percent = float(m.group(2))
    if not 0.0 <= percent <= 100.0:
        raise ValueError(f"composition {text.strip()} is outside 0-100 %")
    element = m.group(1).capitalize() if m.group(1) else None
    return Composition(element, percent, m.group(3).lower())


#: How far (as a fraction of the alloy) the contents of an alloy that names every element may sum
#: away from 100 %.
SUM_TOLERANCE = 1e-6


@dataclass(frozen=True)
class AlloySpec:
    """A typed alloy before it meets a system: (element, percent) in the order typed (element None
    for a binary's short form, '12wt%'), all in one `basis` ("wt" or "at"); `text` as typed."""

    parts: tuple[tuple[str | None, float], ...]
    basis: str
    text: str


@dataclass(frozen=True)
class Alloy:
    """An alloy resolved against a system's `elements`: the fraction (0-1) of every element in
    `basis` ("wt": mass fractions, "at": mole fractions), the element that makes up the `balance`
    (None where every element was named), and the elements the person `named`, in typed order."""

    elements: tuple[str, ...]
    fractions: tuple[float, ...]
    basis: str
    balance: str | None
    named: tuple[str, ...]

    @property
    def shown_element(self) -> str:
        """The element whose content the person thinks in: the first one named (a binary's second
        element where none was named)."""
        return self.named[0] if self.named else self.elements[-1]

    def mole_fractions(self, molar_mass):
        """Mole fractions of every element (numpy array, system order); molar masses in g/mol."""
        import numpy as np

        from ladle.engine.units import mole_from_mass

        fractions = np.array(self.fractions)
        return fractions if self.basis == "at" else mole_from_mass(fractions, np.asarray(molar_mass, dtype=float))


def parse_alloy(texts: str | list[str] | tuple[str, ...]) -> AlloySpec:
    """Read one or more --comp values, each a comma-separated list of element=amount with wt% or
    at% ('Ag=3wt%,Cu=0.5wt%'), or a binary's short form ('12wt%': the second element). Mixing wt%
    and at% in one alloy, naming an element twice, a negative content or one above 100 % raise
    ValueError with one line naming the value."""
    texts = [texts] if isinstance(texts, str) else list(texts)
    whole = ",".join(t.strip() for t in texts)
    parts: list[tuple[str | None, float]] = []
    bases: dict[str, str] = {}
    for text in texts:
        if text.count("=") > 1 and "," not in text:
            raise ValueError(f"cannot read composition {text.strip()!r}; separate the contents with commas, "
                             f"e.g. Ag=3wt%,Cu=0.5wt%")
        for word in text.split(","):
            if word.strip() != text.strip() and not _COMPOSITION.match(word):
                raise ValueError(f"cannot read composition {text.strip()!r} (at {word.strip()!r}); expected "
                                 f"element=amount with wt% or at%, comma-separated, e.g. Ag=3wt%,Cu=0.5wt%")
            comp = parse_composition(word)
            if comp.element is not None and any(comp.element == e for e, _ in parts):
                raise ValueError(f"element {comp.element} is given twice in {whole!r}")
            parts.append((comp.element, comp.percent))
            bases.setdefault(comp.basis, word.strip())
    if len(bases) > 1:
        raise ValueError(f"{bases['wt']} and {bases['at']} mix wt% and at% in one alloy; give every content in one of them")
    if len(parts) > 1 and any(e is None for e, _ in parts):
        raise ValueError(f"name the element of every content in {whole!r}, e.g. Ag=3wt%,Cu=0.5wt%")
    return AlloySpec(tuple(parts), next(iter(bases)), whole)


def resolve_percentages(parts, basis: str, elements: tuple[str, ...], what: str = "") -> Alloy:
    """The alloy with these contents in a system of `elements`: `parts` are (element, percent)
    pairs (element None: a binary's second element), all in `basis` ("wt" or "at"); the one
    element left unnamed is the balance. `what` names the alloy in messages (a --comp value, a
    heat list's line). Plain Python, for typed alloys and heat-list rows alike.

    Raises ValueError with one line for an element not in the system, a content below 0 or
    above 100 %, contents summing over 100 %, two or more unnamed elements (balance candidates),
    or every element named with a sum other than 100 % (within SUM_TOLERANCE)."""
    what = what or ",".join(f"{e or ''}{'=' if e else ''}{p:g}{basis}%" for e, p in parts)
    named: dict[str, float] = {}
    for element, percent in parts:
        if element is None:
            if len(elements) != 2:
                raise ValueError(f"{what}: name the element (this system has {len(elements)}: "
                                 f"{'-'.join(elements)}), e.g. {elements[1]}=3wt%")
            element = elements[1]
        if element not in elements:
            raise ValueError(f"element {element} is not in this system ({'-'.join(elements)})")
        if not 0.0 <= percent <= 100.0:
            raise ValueError(f"composition {element}={percent:g}{basis}% is outside 0-100 %")
        named[element] = percent / 100.0
    total = sum(named.values())
    if total > 1.0 + SUM_TOLERANCE:
        raise ValueError(f"{what} sums to {100.0 * total:.6g} %, over 100 %")
    rest = [e for e in elements if e not in named]
    if len(rest) > 1:
        raise ValueError(f"{what} leaves {' and '.join(rest)} unnamed: name all but one (the balance)")
    if not rest and abs(total - 1.0) > SUM_TOLERANCE:
        raise ValueError(f"{what} names every element but sums to {100.0 * total:.6g} %, not 100 %")
    balance = rest[0] if rest else None
    if balance is not None:
        named[balance] = max(0.0, 1.0 - total)
    scale = sum(named.values())
    fractions = tuple(named[e] / scale for e in elements)
    return Alloy(tuple(elements), fractions, basis, balance, tuple(e for e in named if e != balance))


def resolve_alloy(spec: AlloySpec, elements: tuple[str, ...]) -> Alloy:
    """A parsed alloy (`parse_alloy`) in a system of `elements`; errors as `resolve_percentages`."""
    return resolve_percentages(spec.parts, spec.basis, elements, spec.text)


def fractions_of_B(percent, element: str, basis: str, elements: tuple[str, str], molar_mass):
    """Mole fractions of the system's second element (numpy array) for percentages (array) of
    `element` in `basis` ("wt" or "at"); molar masses in g/mol."""
    import numpy as np

    from ladle.engine.units import mole_from_mass

    frac = np.asarray(percent, dtype=float) / 100.0
    pair = np.stack([frac, 1.0 - frac], axis=-1) if element == elements[0] else np.stack([1.0 - frac, frac], axis=-1)
    if basis == "wt":
        pair = mole_from_mass(pair, np.asarray(molar_mass))
    return pair[..., 1]


_RANGE = re.compile(rf"^\s*([A-Za-z]{{1,2}})\s*=\s*({_NUMBER})\s*\.\.\s*({_NUMBER})\s*(?:(wt|at)\s*%?)?\s*$", re.IGNORECASE)


@dataclass(frozen=True)
class ContentRange:
    """A typed range of one element's content: from `low` to `high` percent in `basis` ("wt" or
    "at"; None where the person left it to the alloy's basis)."""

    element: str
    low: float
    high: float
    basis: str | None


def parse_range(text: str) -> ContentRange:
    """'Cu=0..2wt%', 'Si=5..12at%', 'Cu=0..2' -> ContentRange; ValueError with one line naming the
    value otherwise."""
    m = _RANGE.match(text or "")
    if not m:
        raise ValueError(f"cannot read range {text!r}; expected element=low..high with wt% or at%, e.g. Cu=0..2wt%")
    low, high = float(m.group(2)), float(m.group(3))
    if not 0.0 <= low < high <= 100.0:
        raise ValueError(f"range {text.strip()} must rise from low to high within 0-100 %")
    return ContentRange(m.group(1).capitalize(), low, high, m.group(4).lower() if m.group(4) else None)


def section_ends(spec: AlloySpec, vary: ContentRange, elements: tuple[str, ...]) -> tuple[Alloy, Alloy]:
    """The two ends of a section through the alloy `spec` along which `vary`'s element runs from
    its low to its high content, every other named element held and the balance taking up the
    rest; errors as `resolve_percentages`, plus a range in another basis than the alloy's, or
    no balance element left to take up the change."""
    basis = vary.basis or spec.basis
    if basis != spec.basis:
        raise ValueError(f"--vary {vary.element} is in {basis}% but the alloy is in {spec.basis}%; give both in one of them")
    held = [(e, p) for e, p in spec.parts if e != vary.element]
    unnamed = [e for e in elements if e not in {h for h, _ in held} | {vary.element}]
    if len(elements) > 2 and vary.element in elements and len(unnamed) > 1:
        raise ValueError(f"{spec.text} with --vary {vary.element} leaves {' and '.join(unnamed)} unnamed: --comp holds "
                         f"every element but {vary.element} and the balance, e.g. --comp {unnamed[-1]}=1{basis}%")
    if {e for e, _ in held} | {vary.element} >= set(elements):
        raise ValueError(f"{spec.text} and --vary {vary.element} name every element: leave one unnamed as the "
                         f"balance that takes up {vary.element}'s change")
    low = resolve_percentages(held + [(vary.element, vary.low)], basis, elements, f"{spec.text} with {vary.element} at {vary.low:g}{basis}%")
    high = resolve_percentages(held + [(vary.element, vary.high)], basis, elements, f"{spec.text} with {vary.element} at {vary.high:g}{basis}%")
    return low, high
