"""What a solidification path is: the record both cooling models produce.

A path runs from the liquidus to the end of solidification. Amounts are mass fractions of the
alloy unless a name ends in `_mol` (mole fraction of the alloy's atoms); compositions are mole
fractions of B; temperatures in K; heats in J per gram of alloy.
"""

from __future__ import annotations

from dataclasses import dataclass, field

import numpy as np

from ..units import mass_from_mole

#: Temperatures (K) closer than this are one plateau's (the two paths find each reaction's
#: temperature separately).
SAME_K = 1e-9


class PathError(ValueError):
    """A cooling path cannot be computed for this alloy; the message says why, in one line."""


@dataclass(frozen=True)
class PathStep:
    """The state at one point of a path: `fraction_solid` (mass) and `fraction_solid_mol`, the
    liquid's x_B (None once all is solid), the phases present (liquid first, then solids by
    composition) and the latent heat released since the liquidus (J/g)."""

    temperature_K: float
    fraction_solid: float
    fraction_solid_mol: float
    liquid_x_B: float | None
    phases: tuple[str, ...]
    latent_heat_J_per_g: float = 0.0


@dataclass(frozen=True)
class Constituent:
    """A part of the solidified structure, named as a metallographer would (`primary fcc`,
    `eutectic fcc + bct`), with its mass fraction of the alloy."""

    name: str
    mass_fraction: float


@dataclass(frozen=True)
class Arrest:
    """A feature of the predicted cooling curve: `kind` is "liquidus" (heat release starts),
    "new phase" (a kink: another solid starts to form), "plateau" (heat released at constant
    temperature; `heat_J_per_g` says how much) or "end" (heat release stops)."""

    temperature_K: float
    kind: str
    description: str
    heat_J_per_g: float | None = None


@dataclass(frozen=True)
class CoolingPath:
    """One cooling model's answer for one alloy (x_B, mole fraction).

    `model` is "equilibrium" or "scheil"; `end_K` is where solidification ends (None where liquid
    is left at the bottom of the mapped window) and `end` says how: "solidus", "eutectic" (or the
    kind of another invariant reaction), "last liquid", "melting point", "congruent" or "window".
    `forms` lists each solid as it starts to form, (phase, temperature K)."""

    model: str
    system: object = field(repr=False)
    x_B: float
    liquidus_K: float
    end_K: float | None
    end: str
    steps: tuple[PathStep, ...]
    forms: tuple[tuple[str, float], ...]
    constituents: tuple[Constituent, ...]
    latent_heat_J_per_g: float
    arrests: tuple[Arrest, ...]
    notes: tuple[str, ...] = ()

    def to_json(self) -> dict:
        """The path as plain JSON types (the `ladle cool --json` object of one model)."""
        els = self.system.elements

        def composition(x_b: float | None):
            return None if x_b is None else {els[0]: 1.0 - x_b, els[1]: x_b}

        return {
            "model": self.model,
            "liquidus_K": self.liquidus_K,
            "end_K": self.end_K,
            "end": self.end,
            "latent_heat_J_per_g": self.latent_heat_J_per_g,
            "constituents": [{"name": c.name, "mass_fraction": c.mass_fraction} for c in self.constituents],
            "forms": [{"phase": p, "temperature_K": t} for p, t in self.forms],
            "arrests": [{"temperature_K": a.temperature_K, "kind": a.kind, "description": a.description,
                         "heat_J_per_g": a.heat_J_per_g} for a in self.arrests],
            "notes": list(self.notes),
            "path": [{"temperature_K": s.temperature_K, "fraction_solid": s.fraction_solid,
                      "fraction_solid_mol": s.fraction_solid_mol,
                      "liquid_mole_fraction": composition(s.liquid_x_B), "phases": list(s.phases),
                      "latent_heat_J_per_g": s.latent_heat_J_per_g} for s in self.steps],
        }


def molar_mass_of(system, x_B: np.ndarray | float) -> np.ndarray | float:
    """Mass (g) of one mole of atoms of composition x_B (mole fraction of B)."""
    m = system.molar_mass
    return (1.0 - x_B) * m[0] + x_B * m[1]


def mass_fraction_of_B(system, x_B: float) -> float:
    """Mass fraction of B of a composition given as mole fraction of B."""
    return float(mass_from_mole(np.array([1.0 - x_B, x_B]), system.molar_mass)[1])


def solid_label(system, name: str, x_B: float, among: list[tuple[str, float]]) -> str:
    """A phase's name, with the element it is rich in where `among` (phases with their x_B, such
    as a reaction's) holds that phase twice: the two sides of a miscibility gap, 'fcc (Ag-rich)'."""
    same = [x for n, x in among if n == name]
    if len(same) < 2:
        return name
    rich = system.elements[1] if x_B > 0.5 * (min(same) + max(same)) else system.elements[0]
    return f"{name} ({rich}-rich)"


def reaction_products(system, solids: list[tuple[str, float]]) -> str:
    """'fcc + bct': the solids (name, x_B) a liquid leaves at an invariant reaction."""
    return " + ".join(solid_label(system, n, x, solids) for n, x in solids)


def describe_reaction(system, invariant) -> str:
    """'liquid -> fcc + bct', 'liquid + fcc -> hcp': an invariant reaction as it runs on cooling
    (`invariant`: a diagram Invariant, phases ordered by composition)."""
    l1, l2, l3 = (solid_label(system, n, x, list(invariant.phases)) for n, x in invariant.phases)
    if invariant.kind in ("peritectic", "peritectoid", "syntectic"):
        return f"{l1} + {l3} -> {l2}"
    return f"{l2} -> {l1} + {l3}"


def coverage_notes(system, steps) -> list[str]:
    """A note where the liquid's composition on a path leaves the range the model covers."""
    lo, hi = system.covers
    xs = [s.liquid_x_B for s in steps if s.liquid_x_B is not None]
    if not xs or (lo - 1e-9 <= min(xs) and max(xs) <= hi + 1e-9):
        return []
    b = system.elements[1]
    return [f"the liquid reaches {100 * min(xs):.3g}-{100 * max(xs):.3g} at% {b}, outside the {100 * lo:g}-{100 * hi:g} "
            f"at% this model covers: treat the late part of the path with suspicion"]
