"""The binary classes and the general model, one from the other.

A binary file is read once into the general model (`SublatticePhase`); the binary solution class
that today's binary engine evaluates is derived from it here (`binary_solution`), so the two never
hold separately read parameters. A stoichiometric compound (`CompoundPhase`, J per mole of atoms)
becomes a general phase with one sublattice per element of its formula, the site ratios its mole
fractions, so that one formula unit is one mole of atoms (`compound_model`).
"""

from __future__ import annotations

import numpy as np

from .phases import BINARY_PAIR, CompoundPhase, MagneticModel, SolutionPhase
from .polynomials import TemperatureFunction
from .sublattice import Interaction, SublatticePhase


def _series(terms: tuple[Interaction, ...], a: str, b: str) -> tuple[TemperatureFunction, ...]:
    """The Redlich-Kister series of the pair (a, b) among one-sublattice terms, in the order
    (a, b): odd orders change sign where the term names (b, a)."""
    for term in terms:
        if term.constituents == ((a, b),):
            return term.coefficients
        if term.constituents == ((b, a),):
            return tuple(f.scaled(-1.0) if k % 2 else f for k, f in enumerate(term.coefficients))
    return ()


def _constant(term_values: tuple[Interaction, ...], element: str) -> float:
    """The end-member value of `element` among magnetic terms (0 where none), which a binary
    file states as a number."""
    for term in term_values:
        if term.constituents == ((element,),):
            row = np.asarray(term.coefficients[0].coefficients)
            if len(row) != 1 or np.any(row[0, 1:]):
                raise ValueError(f"the magnetic value of {element} depends on temperature; the binary class needs a number")
            return float(row[0, 0])
    return 0.0


def binary_solution(model: SublatticePhase) -> SolutionPhase:
    """The binary solution class of a one-sublattice model of a two-element system."""
    if not model.is_substitutional or len(model.elements) != 2 or set(model.constituents[0]) != set(model.elements):
        raise ValueError(f"phase {model.name} is not a substitutional solution of both elements of a binary")
    a, b = model.elements
    for term in model.interactions:
        if term.constituents not in (((a, b),), ((b, a),)):
            raise ValueError(f"phase {model.name}: interaction {term.constituents} has no binary form")
    endmembers = (model.end_members[(a,)], model.end_members[(b,)])
    magnetic = None
    mag = model.magnetic
    if mag is not None:
        magnetic = MagneticModel(
            mag.above_curie_fraction,
            np.array([_constant(mag.curie_K, a), _constant(mag.curie_K, b)]),
            np.array([_constant(mag.moment, a), _constant(mag.moment, b)]),
            {BINARY_PAIR: _series(mag.curie_K, a, b)}, {BINARY_PAIR: _series(mag.moment, a, b)},
            mag.antiferro_factor)
    return SolutionPhase(model.name, model.elements, endmembers, {BINARY_PAIR: _series(model.interactions, a, b)},
                         magnetic)


def compound_model(compound: CompoundPhase) -> SublatticePhase:
    """The general form of a stoichiometric compound: one sublattice per element of its formula,
    site ratios the mole fractions (one formula unit = one mole of atoms)."""
    present = [i for i, x in enumerate(compound.x) if x > 0.0]
    G = compound.formation
    for i in present:
        G = G.plus(compound.references[i].scaled(compound.x[i]))
    combo = tuple(compound.elements[i] for i in present)
    return SublatticePhase(name=compound.name, elements=compound.elements,
                           site_ratios=tuple(float(compound.x[i]) for i in present),
                           constituents=tuple((el,) for el in combo), end_members={combo: G})
