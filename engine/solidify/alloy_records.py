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

from .branches import hermite
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
        """The state at T (K), interpolated between the path's steps by monotone cubic pieces
        (_between); at a plateau temperature the state before the plateau, or after it with
        `below`."""
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
        v = _between(steps, k, T)
        # each element's monotone slope is its own, so the pieces' sum can stray from 1 by the
        # order of the step's curvature: the liquid's mole fractions are scaled back to 1
        liquid = (None if steps[k - 1].liquid_x is None or steps[k].liquid_x is None
                  else tuple(float(u) for u in v[3:] / v[3:].sum()))
        return AlloyStep(T, float(v[0]), float(v[1]), liquid, steps[k].phases, float(v[2]))

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


def _values(step: AlloyStep) -> np.ndarray:
    """What state_at interpolates: fraction solid (mass, moles), heat, the liquid's mole fractions."""
    liquid = () if step.liquid_x is None else step.liquid_x
    return np.array([step.fraction_solid, step.fraction_solid_mol, step.latent_heat_J_per_g, *liquid])


def _between(steps, k: int, T: float) -> np.ndarray:
    """_values at T (K) between steps[k - 1] and steps[k]: the cubic Hermite piece whose slopes
    at both ends are the monotone ones of F.N. Fritsch and J. Butland, SIAM J. Sci. Stat.
    Comput. 5 (1984) 300 (the weighted harmonic mean of the neighbouring secants, zero where
    they differ in sign), taken from the neighbours in the same stage only (same phases, no
    plateau between); at a stage's end, the three-point end slope of the same method, or the
    secant where the stage has only this piece. The Scheil path's steps are several K long
    where its error allows: a straight line between them would misplace the fraction solid
    by up to half a percent."""
    a, b = steps[k - 1], steps[k]
    va, vb = _values(a), _values(b)
    if va.shape != vb.shape:
        t = (a.temperature_K - T) / (a.temperature_K - b.temperature_K)
        return (1.0 - t) * va[:3] + t * vb[:3]

    def same_stage(i: int) -> bool:
        """Whether steps i and i + 1 bound a piece of the stage of steps k - 1 to k."""
        if i < 0 or i + 1 >= len(steps):
            return False
        p, q = steps[i], steps[i + 1]
        return (q.phases == b.phases and p.temperature_K > q.temperature_K
                and (p.liquid_x is None) == (a.liquid_x is None) and (q.liquid_x is None) == (a.liquid_x is None))

    def secant(i: int) -> tuple[float, np.ndarray]:
        p, q = steps[i], steps[i + 1]
        h = q.temperature_K - p.temperature_K
        return h, (_values(q) - _values(p)) / h

    h, d = secant(k - 1)
    before = secant(k - 2) if same_stage(k - 2) else None
    after = secant(k) if same_stage(k) else None
    m_a = _inner_slope(before, (h, d)) if before else (_end_slope((h, d), after) if after else d)
    m_b = _inner_slope((h, d), after) if after else (_end_slope((h, d), before) if before else d)
    return hermite(a.temperature_K, b.temperature_K, va, vb, m_a, m_b, T)[0]


def _inner_slope(left: tuple[float, np.ndarray], right: tuple[float, np.ndarray]) -> np.ndarray:
    """The slope at the node between two pieces (length, secant): the weighted harmonic mean of
    their secants (Fritsch and Butland 1984), zero where they differ in sign or one is zero."""
    (h1, d1), (h2, d2) = left, right
    w1, w2 = 2.0 * abs(h2) + abs(h1), abs(h2) + 2.0 * abs(h1)
    with np.errstate(divide="ignore", invalid="ignore"):
        mean = (w1 + w2) / (w1 / d1 + w2 / d2)
    return np.where(d1 * d2 > 0.0, mean, 0.0)


def _end_slope(piece: tuple[float, np.ndarray], other: tuple[float, np.ndarray]) -> np.ndarray:
    """The slope at a stage's end node of `piece` (length, secant), `other` being the next piece
    inward: the three-point formula, kept of the piece's sign and within three times its secant
    where the secants differ in sign (the end condition of Fritsch and Butland's method)."""
    (h0, d0), (h1, d1) = piece, other
    m = ((2.0 * abs(h0) + abs(h1)) * d0 - abs(h0) * d1) / (abs(h0) + abs(h1))
    m = np.where(m * d0 <= 0.0, 0.0, m)
    return np.where((d0 * d1 < 0.0) & (np.abs(m) > 3.0 * np.abs(d0)), 3.0 * d0, m)


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
