"""What a cooling path of an alloy of any number of elements is: the record both multicomponent
cooling models (alloy_scheil.py, alloy_equilibrium.py) produce, and the pieces they share.

Amounts are mass fractions of the alloy unless a name ends in `_mol` (mole fraction of the
alloy's atoms); compositions are mole fractions of every element of the system, in its order;
temperatures in K; heats in J per gram of alloy. Arrests are the binary paths'
records (records.py); constituents carry their mean composition.
"""

from __future__ import annotations

from dataclasses import dataclass, field

import numpy as np

from .records import SAME_K, Arrest

#: The liquid phase's name in every system.
LIQUID = "liquid"

#: What a liquid freezing into k solids at once is called, by k (a ternary eutectic: three).
_TOGETHER = {2: "eutectic", 3: "ternary eutectic", 4: "quaternary eutectic"}


def forming_together(count: int) -> str:
    """The trade's word for `count` solids forming together from the liquid: 'eutectic' (two),
    'ternary eutectic' (three), 'quaternary eutectic' (four), 'k-phase eutectic' beyond."""
    return _TOGETHER.get(count, f"{count}-phase eutectic")


@dataclass(frozen=True)
class AlloyConstituent:
    """A part of the solidified structure, named by what formed together (`primary fcc`,
    `eutectic fcc + bct`, `ternary eutectic ...`): its mass fraction and mole fraction of the
    alloy (atoms), and its mean composition `x` (mole fractions of every element)."""

    name: str
    mass_fraction: float
    fraction_mol: float
    x: tuple[float, ...]


@dataclass(frozen=True)
class AlloyStep:
    """The state at one point of a path: `fraction_solid` (mass) and `fraction_solid_mol`, the
    liquid's mole fractions (None once all is solid), the phases present (liquid first) and the
    latent heat released since the liquidus (J/g)."""

    temperature_K: float
    fraction_solid: float
    fraction_solid_mol: float
    liquid_x: tuple[float, ...] | None
    phases: tuple[str, ...]
    latent_heat_J_per_g: float = 0.0


@dataclass(frozen=True)
class AlloyPath:
    """One cooling model's answer for one alloy (`x`, mole fractions of every element).

    `model` is "equilibrium" or "scheil"; `end_K` is where freezing ends (None where liquid is
    left at the bottom of the window) and `end` says how: "solidus", "eutectic", "ternary
    eutectic", ..., "last liquid", "window" or (Scheil) "outside covered range". `forms` lists
    each solid as it starts to form, (phase, temperature K)."""

    model: str
    system: object = field(repr=False)
    x: tuple[float, ...]
    liquidus_K: float
    end_K: float | None
    end: str
    steps: tuple[AlloyStep, ...]
    forms: tuple[tuple[str, float], ...]
    constituents: tuple[AlloyConstituent, ...]
    latent_heat_J_per_g: float
    arrests: tuple[Arrest, ...]
    notes: tuple[str, ...] = ()

    def state_at(self, T: float, below: bool = False) -> AlloyStep:
        """The state at T (K), interpolated linearly between the path's steps; at a plateau
        temperature the state before the plateau, or after it with `below`."""
        steps = self.steps
        if T > steps[0].temperature_K + SAME_K:
            return AlloyStep(T, 0.0, 0.0, tuple(self.x), (LIQUID,))
        at = [s for s in steps if abs(s.temperature_K - T) <= SAME_K]
        if at:
            s = at[-1] if below else at[0]
            return AlloyStep(T, s.fraction_solid, s.fraction_solid_mol, s.liquid_x, s.phases, s.latent_heat_J_per_g)
        if T < steps[-1].temperature_K:
            s = steps[-1]
            return AlloyStep(T, s.fraction_solid, s.fraction_solid_mol, s.liquid_x, s.phases, s.latent_heat_J_per_g)
        k = next(i for i in range(1, len(steps)) if steps[i].temperature_K < T)
        a, b = steps[k - 1], steps[k]
        t = (a.temperature_K - T) / (a.temperature_K - b.temperature_K)
        liquid = None if a.liquid_x is None or b.liquid_x is None else \
            tuple((1.0 - t) * np.asarray(a.liquid_x) + t * np.asarray(b.liquid_x))
        return AlloyStep(T, (1.0 - t) * a.fraction_solid + t * b.fraction_solid,
                         (1.0 - t) * a.fraction_solid_mol + t * b.fraction_solid_mol, liquid, b.phases,
                         (1.0 - t) * a.latent_heat_J_per_g + t * b.latent_heat_J_per_g)

    def to_json(self) -> dict:
        """The path as plain JSON types: the keys of the binary paths, with one entry per element
        in every composition object."""
        els = self.system.elements

        def composition(x):
            return None if x is None else {el: float(v) for el, v in zip(els, x)}

        return {
            "model": self.model,
            "liquidus_K": self.liquidus_K,
            "end_K": self.end_K,
            "end": self.end,
            "latent_heat_J_per_g": self.latent_heat_J_per_g,
            "constituents": [{"name": c.name, "mass_fraction": c.mass_fraction, "fraction_mol": c.fraction_mol,
                              "mole_fraction": composition(c.x)} for c in self.constituents],
            "forms": [{"phase": p, "temperature_K": t} for p, t in self.forms],
            "arrests": [{"temperature_K": a.temperature_K, "kind": a.kind, "description": a.description,
                         "heat_J_per_g": a.heat_J_per_g} for a in self.arrests],
            "notes": list(self.notes),
            "path": [{"temperature_K": s.temperature_K, "fraction_solid": s.fraction_solid,
                      "fraction_solid_mol": s.fraction_solid_mol, "liquid_mole_fraction": composition(s.liquid_x),
                      "phases": list(s.phases), "latent_heat_J_per_g": s.latent_heat_J_per_g} for s in self.steps],
        }


def phase_enthalpy(system, share, T: float) -> float:
    """Molar enthalpy H = G - T dG/dT (J per mole of atoms) of one phase of a point equilibrium
    (`share`: name and site fractions, one array per sublattice) at T (K), from the phase's
    model (Gibbs-Helmholtz)."""
    at = system.models[share.name].at(T)
    y = np.concatenate([np.atleast_1d(np.asarray(lattice, dtype=float)) for lattice in share.site_fractions])
    atoms = float((y @ at.element_matrix).sum())
    return float(at.gibbs(y) - T * at.gibbs_dT(y)) / atoms


def solid_enthalpy(system, shares, x_solid, T: float) -> float:
    """Enthalpy (J per mole of atoms) at T (K) of the solid of composition `x_solid` (mole
    fractions) made of the phases `shares` (each at its own composition): the phases are weighted
    so that together they have the solid's composition (least squares where they cannot match it
    exactly), not by their amounts in a point equilibrium, which are those of the whole assemblage
    and not of what forms in one step."""
    X = np.array([np.asarray(p.x, dtype=float) for p in shares]).T
    A = np.vstack([X, np.ones(len(shares))])
    b = np.concatenate([np.asarray(x_solid, dtype=float), [1.0]])
    weights = np.linalg.lstsq(A, b, rcond=None)[0]
    return float(sum(w * phase_enthalpy(system, p, T) for w, p in zip(weights, shares)))


def molar_mass(system, x) -> float:
    """Mass (g) of one mole of atoms of composition x (mole fractions)."""
    return float(np.asarray(x, dtype=float) @ system.molar_mass)


def labelled(system, shares) -> list[str]:
    """Names of phases (point-equilibrium shares) for a constituent's name, with the element a
    composition set is rich in where the same phase occurs twice (the two sides of a miscibility
    gap: 'fcc (Cu-rich)'): the element whose mole fraction in it most exceeds (relative) its mean
    over the phase's sets, so that the sets get different names even where the same element is
    the largest in both (Ag-Au-Cu: fcc (Ag-rich) and fcc (Cu-rich), each with about 30 % Au)."""
    names = [p.name for p in shares]
    out = []
    for p in shares:
        if names.count(p.name) < 2:
            out.append(p.name)
            continue
        mean = np.mean([np.asarray(q.x, dtype=float) for q in shares if q.name == p.name], axis=0)
        with np.errstate(divide="ignore", invalid="ignore"):
            enrichment = np.where(mean > 0.0, np.asarray(p.x, dtype=float) / mean, 0.0)
        out.append(f"{p.name} ({system.elements[int(np.argmax(enrichment))]}-rich)")
    return out
