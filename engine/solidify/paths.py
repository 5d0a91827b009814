"""Solidification of one alloy: equilibrium cooling (the lever rule at every step) and
Scheil-Gulliver cooling (no diffusion in the solid) side by side, with the latent heat released
and the arrests a thermal-analysis trace would show.

    from ladle.engine.solidify.paths import solidify
    s = solidify(system, x_B)          # x_B: mole fraction of the system's second element
    s.equilibrium.end_K, s.scheil.constituents, s.states_at(500.0)

Temperatures in K, compositions as mole fraction of B, amounts as mass fractions of the alloy
(`_mol`: mole fractions of its atoms), heats in J per gram of alloy.
"""

from __future__ import annotations

from dataclasses import dataclass

from .equilibrium_path import EquilibriumCooling
from .records import Arrest, Constituent, CoolingPath, PathError, PathStep, mass_fraction_of_B
from .scheil import ScheilCooling

MODELS = ("equilibrium", "scheil")

__all__ = ["MODELS", "Arrest", "Constituent", "CoolingPath", "PathError", "PathStep", "Solidification", "solidify"]


@dataclass(frozen=True)
class Solidification:
    """Both cooling paths of the alloy with mole fraction x_B of B."""

    system: object
    x_B: float
    equilibrium: CoolingPath
    scheil: CoolingPath
    _models: tuple[EquilibriumCooling, ScheilCooling]

    def path(self, model: str) -> CoolingPath:
        """The path of `model` ("equilibrium" or "scheil")."""
        return self.scheil if model == "scheil" else self.equilibrium

    def states_at(self, T: float, below: bool = False) -> tuple[PathStep, PathStep]:
        """(equilibrium, Scheil) states at T (K); at a plateau temperature the states before the
        plateau, or after it with `below`."""
        eq, sc = self._models
        return eq.state_at(T, below), sc.state_at(T, below)

    def to_json(self, model: str = "equilibrium") -> dict:
        """The `ladle cool --json` object: the chosen model's path at the top level, both paths
        in full under "equilibrium" and "scheil"."""
        els = self.system.elements
        w_b = mass_fraction_of_B(self.system, self.x_B)
        out = {"system": self.system.name,
               "mole_fraction": {els[0]: 1.0 - self.x_B, els[1]: self.x_B},
               "mass_fraction": {els[0]: 1.0 - w_b, els[1]: w_b}}
        out.update(self.path(model).to_json())
        out["equilibrium"] = self.equilibrium.to_json()
        out["scheil"] = self.scheil.to_json()
        return out


def solidify(system, x_B: float) -> Solidification:
    """Equilibrium and Scheil-Gulliver cooling of the alloy with mole fraction x_B of B, from
    above its liquidus to the end of solidification. Raises PathError (a ValueError) with one
    line where a path cannot be computed (no liquidus inside the mapped window, for example)."""
    if not 0.0 <= x_B <= 1.0:
        raise PathError(f"mole fraction {x_B!r} is outside 0-1")
    scheil = ScheilCooling(system, x_B)
    equilibrium = EquilibriumCooling(system, x_B)
    return Solidification(system, x_B, equilibrium.path(), scheil.path(), (equilibrium, scheil))
