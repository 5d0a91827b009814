"""Solidification of an alloy of any number of elements: equilibrium cooling and Scheil-Gulliver
cooling side by side (alloy_equilibrium.py, alloy_scheil.py), as `solidify` gives them for a
binary (paths.py).

    from ladle.engine.solidify.alloy_paths import solidify_alloy
    s = solidify_alloy(system, x)       # x: mole fractions of every element, in the system's order
    s.scheil.constituents, s.equilibrium.end_K, s.states_at(500.0)

Temperatures in K, compositions in mole fractions, amounts as mass fractions of the alloy
(`_mol`: mole fractions of its atoms), heats in J per gram of alloy.
"""

from __future__ import annotations

from dataclasses import dataclass

import numpy as np

from ..units import mass_from_mole
from .alloy_equilibrium import alloy_equilibrium_cooling
from .alloy_records import AlloyPath, AlloyStep
from .alloy_scheil import OUTSIDE_RANGE, alloy_scheil

#: The equilibrium scan starts this far (K) above the liquidus and ends this far below the
#: Scheil path's end (equilibrium freezing ends no lower than Scheil freezing).
_MARGIN_K = 1.0


@dataclass(frozen=True)
class AlloySolidification:
    """Both cooling paths of the alloy with mole fractions `x`."""

    system: object
    x: tuple[float, ...]
    equilibrium: AlloyPath
    scheil: AlloyPath

    def path(self, model: str) -> AlloyPath:
        """The path of `model` ("equilibrium" or "scheil")."""
        return self.scheil if model == "scheil" else self.equilibrium

    def states_at(self, T: float, below: bool = False) -> tuple[AlloyStep, AlloyStep]:
        """(equilibrium, Scheil) states at T (K); at a plateau temperature the states before the
        plateau, or after it with `below`."""
        return self.equilibrium.state_at(T, below), self.scheil.state_at(T, below)

    def to_json(self, model: str = "equilibrium") -> dict:
        """The `ladle cool --json` object: the chosen model's path at the top level, both paths in
        full under "equilibrium" and "scheil"; one entry per element in every composition."""
        els = self.system.elements
        w = mass_from_mole(np.array(self.x), self.system.molar_mass)
        out = {"system": self.system.name,
               "mole_fraction": {el: float(v) for el, v in zip(els, self.x)},
               "mass_fraction": {el: float(v) for el, v in zip(els, w)}}
        out.update(self.path(model).to_json())
        out["equilibrium"] = self.equilibrium.to_json()
        out["scheil"] = self.scheil.to_json()
        return out


def solidify_alloy(system, x) -> AlloySolidification:
    """Equilibrium and Scheil-Gulliver cooling of the alloy with mole fractions `x` (every element
    of `system`, summing to 1), from above its liquidus to the end of freezing. Raises PathError
    (a ValueError) with one line where a path cannot be computed."""
    scheil = alloy_scheil(system, x)
    if scheil.end == OUTSIDE_RANGE:     # the alloy itself stays inside: its own freezing goes on below
        bottom = system.temperature_range_K[0]
    else:
        bottom = (scheil.end_K if scheil.end_K is not None else scheil.steps[-1].temperature_K) - _MARGIN_K
        bottom = max(bottom, system.temperature_range_K[0])
    equilibrium = alloy_equilibrium_cooling(system, x, scheil.liquidus_K + _MARGIN_K, bottom)
    return AlloySolidification(system, tuple(float(v) for v in x), equilibrium, scheil)
