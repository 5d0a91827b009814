"""Conversion between the engine's units (K, mole fraction of B) and the units on screen.

On screen a temperature is in C, K or F, and a composition is the percentage of the system's
second element B by mass (wt%) or by amount (at%). Works on floats and on numpy arrays.
"""

from __future__ import annotations

from dataclasses import dataclass, replace

import numpy as np

from ladle.engine.units import (TEMPERATURE_UNITS, kelvin_from, kelvin_to, mass_from_mole,
                                mole_from_mass)

COMPOSITION_UNITS = ("wt", "at")


@dataclass(frozen=True)
class Scales:
    """The units the user has chosen, and the molar masses (g/mol, [A, B]) to convert with."""

    molar_mass: np.ndarray
    temperature_unit: str = "C"   # "C", "K" or "F"
    composition_unit: str = "wt"  # "wt" or "at"

    def shown_temperature(self, T_K):
        """Temperature in the chosen unit, from K (a float, or an array from an array)."""
        if np.ndim(T_K) == 0:
            return kelvin_to(T_K, self.temperature_unit)
        offset = kelvin_to(0.0, self.temperature_unit)   # every unit is affine in K
        return offset + (kelvin_to(1.0, self.temperature_unit) - offset) * np.asarray(T_K)

    def engine_temperature(self, value):
        """Temperature in K, from the chosen unit (a float, or an array from an array)."""
        if np.ndim(value) == 0:
            return kelvin_from(value, self.temperature_unit)
        offset = kelvin_from(0.0, self.temperature_unit)
        return offset + (kelvin_from(1.0, self.temperature_unit) - offset) * np.asarray(value)

    def shown_temperature_difference(self, dT_K):
        """A temperature difference in the chosen unit (a kelvin is 1.8 degrees F)."""
        return kelvin_to(dT_K, self.temperature_unit) - kelvin_to(0.0, self.temperature_unit)

    def shown_fraction(self, x_B, unit: str | None = None):
        """Mass fraction (unit "wt") or mole fraction ("at") of B, from the mole fraction of B;
        default: the chosen unit."""
        x_B = np.asarray(x_B, dtype=float)
        if (unit or self.composition_unit) == "at":
            fraction = x_B
        else:
            fraction = mass_from_mole(np.stack([1.0 - x_B, x_B], axis=-1), self.molar_mass)[..., 1]
        return float(fraction) if fraction.ndim == 0 else fraction

    def shown_composition(self, x_B, unit: str | None = None):
        """Percent of B (wt% or at%, default the chosen unit) from the mole fraction of B."""
        return 100.0 * self.shown_fraction(x_B, unit)

    def engine_composition(self, percent_B, unit: str | None = None):
        """Mole fraction of B from percent of B (wt% or at%, default the chosen unit)."""
        unit = unit or self.composition_unit
        fraction = np.asarray(percent_B, dtype=float) / 100.0
        if unit == "at":
            x_B = fraction
        else:
            x_B = mole_from_mass(np.stack([1.0 - fraction, fraction], axis=-1),
                                 self.molar_mass)[..., 1]
        return float(x_B) if np.ndim(x_B) == 0 else x_B

    def next_temperature_unit(self) -> "Scales":
        """The same scales with the next temperature unit (C, K, F, C, ...)."""
        index = TEMPERATURE_UNITS.index(self.temperature_unit)
        return replace(self, temperature_unit=TEMPERATURE_UNITS[(index + 1) % 3])

    def next_composition_unit(self) -> "Scales":
        """The same scales with the other composition unit (wt% <-> at%)."""
        index = COMPOSITION_UNITS.index(self.composition_unit)
        return replace(self, composition_unit=COMPOSITION_UNITS[(index + 1) % 2])
