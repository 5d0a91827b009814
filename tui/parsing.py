"""Reading what a person types: temperatures with units and compositions with units.

Shared by the line-mode commands and the explorer. Errors are ValueError with one line that
names the value and what is expected.
"""

from __future__ import annotations

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
    kelvin = kelvin_from(float(m.group(1)), unit)
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


def mole_fraction_of_B(comp: Composition, elements: tuple[str, str], molar_mass) -> float:
    """Mole fraction of the system's second element for a typed composition."""
    element = comp.element or elements[1]
    if element not in elements:
        raise ValueError(f"element {element} is not in this system ({elements[0]}-{elements[1]})")
    return float(fractions_of_B(comp.percent, element, comp.basis, elements, molar_mass))
