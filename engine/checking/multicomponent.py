"""The model's value of a measured fact of a system of three or more elements (systems/FORMAT.md,
"Measured facts"), beside the reference value:

- liquidus, solidus: from the one-alloy transition scan at the stated composition (K), in steps
  of SCAN_STEP_K (each change found is still narrowed to the scan's tolerance);
- mixing_enthalpy: the enthalpy of mixing of a substitutional solution phase, H = G - T dG/dT
  (the Gibbs-Helmholtz relation) less the pure elements' in the same phase (J per mole of atoms);
- invariant, a eutectic (the liquid freezing to every named solid at once): the Scheil-Gulliver
  path of the stated liquid, which ends at the model's eutectic of the solids it meets, gives
  the temperature (K) and the last liquid's composition (at% of every element but the first).
  Where the path ends in other solids, the model lacks the reaction and says so.
"""

from __future__ import annotations

import numpy as np

from ..models.system import Fact
from .measure import (Comparison, FactOutcome, composition_factor, composition_spread, enthalpy_spread,
                      temperature_comparison)


#: Scan step (K) of the transition scan behind a liquidus or solidus fact. The liquidus (the first
#: change out of the all-liquid state) and every change found are narrowed to 1e-6 K whatever the
#: step; a coarser step can only miss a field narrower than itself with the same phases on both
#: sides (liquid reappearing and vanishing again within 5 K), against the checks' 5 K tolerance.
#: Five times the commands' 1 K step: fe-c-si's ten facts took 31 s to measure at 1 K.
SCAN_STEP_K = 5.0


def evaluate_multicomponent(system, fact: Fact) -> FactOutcome:
    """The model against one fact of a system of three or more elements; a fact whose
    composition lies outside the range the model covers is not measured (its problem says so)."""
    stated = [fact.x] if fact.x is not None else []
    stated += [x for n, x in fact.phase_x if n == "liquid" and x is not None]
    for x in stated:
        if not system.covered(x):
            at = ", ".join(f"{el} {100 * v:.4g}" for el, v in zip(system.elements[1:], x[1:]))
            return FactOutcome(fact, (), f"{at} at% lies outside the range this model covers "
                                         f"({system.covered_range_text()})")
    if fact.kind in ("liquidus", "solidus"):
        from ..diagrams.alloy_transitions import alloy_transitions

        scan = alloy_transitions(system, np.asarray(fact.x), step_K=SCAN_STEP_K)
        T = scan.liquidus_K if fact.kind == "liquidus" else scan.solidus_K
        problem = None if T is not None else f"the model has no {fact.kind} of this alloy in its range"
        return FactOutcome(fact, (temperature_comparison(fact, T),), problem)
    if fact.kind == "mixing_enthalpy":
        model = mixing_enthalpy(system.models[fact.phase], fact.temperature_K, np.asarray(fact.x), system.elements)
        return FactOutcome(fact, (Comparison("enthalpy", "J/mol", fact.enthalpy_J_per_mol, model, enthalpy_spread(fact)),))
    if fact.kind == "invariant" and fact.reaction == "eutectic":
        return _eutectic(system, fact)
    return FactOutcome(fact, (), f"a {fact.reaction or fact.kind} fact is not measured in systems of three or more "
                                 "elements yet")


def mixing_enthalpy(phase, T: float, x: np.ndarray, elements: tuple[str, ...]) -> float:
    """Enthalpy of mixing (J per mole of atoms) of a substitutional solution `phase` (the general
    model) at mole fractions `x` (every element of `elements`) and T (K), relative to the pure
    elements in the same phase."""
    if not phase.is_substitutional or tuple(phase.elements) != tuple(elements):
        raise ValueError("a mixing enthalpy is measured for substitutional solution phases only")
    to_sites = phase.element_matrix          # one site: each site fraction is one element's mole fraction
    at = phase.at(T)

    def enthalpy(fractions: np.ndarray) -> float:
        y = to_sites @ fractions
        if not np.allclose(to_sites.T @ y, fractions, atol=1e-12):
            raise ValueError(f"phase {phase.name} does not hold every element of this composition")
        return float(at.gibbs(y[None, :])[0] - T * at.gibbs_dT(y[None, :])[0])

    pure = sum(xi * enthalpy(np.eye(len(elements))[i]) for i, xi in enumerate(x) if xi > 0.0)
    return enthalpy(np.asarray(x, dtype=float)) - pure


def _eutectic(system, fact: Fact) -> FactOutcome:
    from ..solidify.alloy_records import forming_together
    from ..solidify.alloy_scheil import alloy_scheil
    from ..solidify.records import PathError

    liquid = [(n, x) for n, x in fact.phase_x if n == "liquid"]
    solids = {n for n, _x in fact.phase_x if n != "liquid"}
    if not liquid or liquid[0][1] is None:
        return FactOutcome(fact, (), "a eutectic of three or more elements is measured from its liquid's composition: "
                                     "give the liquid's at%")
    x_ref = np.asarray(liquid[0][1])
    try:
        path = alloy_scheil(system, x_ref)
    except PathError as e:
        return FactOutcome(fact, (), f"no freezing path of the stated liquid: {e}")
    last = [s for s in path.steps if s.liquid_x is not None]
    frozen = {name for name, _T in path.forms}
    comparisons = [temperature_comparison(fact, path.end_K)]
    x_model = np.asarray(last[-1].liquid_x) if last and path.end_K is not None else None
    for i, el in enumerate(system.elements[1:], start=1):
        model = None if x_model is None else 100.0 * float(x_model[i])
        comparisons.append(Comparison(f"x(liquid) {el}", "at%", 100.0 * float(x_ref[i]), model,
                                      composition_spread(fact, "liquid"), composition_factor(fact, "liquid")))
    problem = None
    if path.end != forming_together(len(solids)) or not solids <= frozen:
        problem = (f"the model's liquid of this composition ends by {path.end} at "
                   f"{'no temperature' if path.end_K is None else f'{path.end_K:.2f} K'} with "
                   f"{' + '.join(sorted(frozen)) or 'no solid'}, not the {forming_together(len(solids))} "
                   f"of {' + '.join(sorted(solids))}")
    return FactOutcome(fact, tuple(comparisons), problem, "eutectic" if problem is None else None)
