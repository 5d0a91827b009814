"""Unit conversions shared by the engine and its front ends.

Temperatures: kelvin (K), degrees Celsius (C) and degrees Fahrenheit (F).
Compositions: mole fractions and mass fractions of each element of a system.

numpy is imported only by the composition conversions, so that reading a typed temperature (and
`ladle --help`) does not load it.
"""

from __future__ import annotations

from typing import TYPE_CHECKING

if TYPE_CHECKING:
    import numpy as np

#: Molar gas constant, J/(mol K) (CODATA 2018, exact).
GAS_CONSTANT = 8.314462618

_ZERO_CELSIUS_K = 273.15

TEMPERATURE_UNITS = ("C", "K", "F")


def kelvin_from(value: float, unit: str) -> float:
    """Convert a temperature in `unit` ("C", "K" or "F") to K."""
    if unit == "K":
        return float(value)
    if unit == "C":
        return float(value) + _ZERO_CELSIUS_K
    if unit == "F":
        return (float(value) - 32.0) * 5.0 / 9.0 + _ZERO_CELSIUS_K
    raise ValueError(f"unknown temperature unit {unit!r}; expected one of C, K, F")


def kelvin_to(temperature_K: float, unit: str) -> float:
    """Convert a temperature in K to `unit` ("C", "K" or "F")."""
    if unit == "K":
        return float(temperature_K)
    if unit == "C":
        return float(temperature_K) - _ZERO_CELSIUS_K
    if unit == "F":
        return (float(temperature_K) - _ZERO_CELSIUS_K) * 9.0 / 5.0 + 32.0
    raise ValueError(f"unknown temperature unit {unit!r}; expected one of C, K, F")


def mass_from_mole(x: np.ndarray, molar_mass: np.ndarray) -> np.ndarray:
    """Mass fractions from mole fractions (last axis: elements; molar masses in g/mol)."""
    import numpy as np

    m = np.asarray(x, dtype=float) * molar_mass
    return m / m.sum(axis=-1, keepdims=True)


def mole_from_mass(w: np.ndarray, molar_mass: np.ndarray) -> np.ndarray:
    """Mole fractions from mass fractions (last axis: elements; molar masses in g/mol)."""
    import numpy as np

    n = np.asarray(w, dtype=float) / molar_mass
    return n / n.sum(axis=-1, keepdims=True)
