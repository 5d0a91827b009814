"""The model's value of each measured fact of a system file, beside the reference value.

Used by `ladle check` (the `[[check]]` list, with tolerances) and at the end of `ladle fit` (the
`[[measured]]` list, with uncertainties). Every value is the model's stable equilibrium:

- melting: the pure element's melting temperature in this system (K); transformation (a pure
  element's change between two solid phases) and curie (its Curie temperature in a phase): see
  engine/checking/pure_element.py, which also melts a pure element where the diagram is not mapped;
- invariant: the model's three-phase reaction of the same kind, with the named phases, nearest
  in temperature (from the mapped diagram); its temperature (K) and each named phase's
  composition (at%). A "congruent" fact is matched to the diagram's congruent points. A reaction
  the model does not have is reported as missing (the diagram's topology is wrong), never as a
  large difference. A binary whose diagram is not mapped (sublattice phases) has its invariants
  measured on one alloy's transition scan instead (engine/checking/scanned_invariants.py);
- liquidus, solidus: solved directly at the stated composition (engine/measure_boundaries.py);
- boundary: the composition (at%) of `phase` on its stable tie-line to `partner` at the stated
  temperature, solved by Newton's method in the isothermal section;
- mixing_enthalpy, formation_enthalpy: the enthalpy of mixing of a solution phase, or of
  formation of a compound, at the stated temperature (engine/measure_enthalpy.py);
- distribution_coefficient: the equilibrium distribution coefficient k0 of a dilute solute between
  the solid `phase` and the liquid at the other element's melting point (the solute's mole fraction
  in the solid over that in the liquid, on the model's tie-line 0.5 K from that melting point).

Temperatures in K, compositions in at% of the system's second element (100 x mole fraction),
enthalpies in J per mole of atoms, distribution coefficients as plain ratios (unit "ratio").
"""

from __future__ import annotations

from dataclasses import dataclass

import numpy as np

from .boundaries import BoundaryNotFound, boundary_temperature, phase_end, tie_line_between
from .enthalpy import formation_enthalpy, mixing_enthalpy
from ..diagrams.mappable import unmapped_phases
from ..files.facts import PURE_ELEMENT_KINDS
from ..models.polynomials import TemperatureOutOfRange
from ..models.system import Fact
from ..units import mass_from_mole

#: Spread keys of a fact: the temperature's, and a composition's (per phase, else common).
_K = "K"
_AT = "at"


@dataclass(frozen=True)
class Comparison:
    """One compared number: `quantity` ("temperature", "x(liquid)", "enthalpy") in `unit` ("K",
    "at%" or "J/mol"), the reference (measured) value, the model's value (None where the model has none)
    and the spread: the tolerance of a check or the standard uncertainty of a measurement."""

    quantity: str
    unit: str
    reference: float
    model: float | None
    spread: float | None
    factor: float | None = None
    at_most: bool = False

    @property
    def difference(self) -> float | None:
        """model - reference, in `unit`."""
        return None if self.model is None else self.model - self.reference

    @property
    def within(self) -> bool:
        """True where the model lies within the spread of the reference: the absolute spread,
        and, where the fact gives a relative tolerance `factor` (dilute solubilities, at%), the
        model's dilute amount within the reference's divided or multiplied by the factor. The
        dilute amount is that of the minor element: the value itself below 50 at%, 100 minus it
        above. A ratio (unit "ratio") is compared as it is. An upper limit (`at_most`) holds where
        the model's dilute amount does not exceed the reference's."""
        d = self.difference
        if d is None:
            return False
        if self.at_most:
            flip = self.reference > 50.0
            return (100.0 - self.model <= 100.0 - self.reference) if flip else self.model <= self.reference
        if self.factor is not None:
            flip = self.unit == "at%" and self.reference > 50.0
            ref, model = (100.0 - self.reference, 100.0 - self.model) if flip else (self.reference, self.model)
            if not ref / self.factor <= model <= ref * self.factor:
                return False
        return self.factor is not None if self.spread is None else abs(d) <= self.spread


@dataclass(frozen=True)
class FactOutcome:
    """The model against one fact: its comparisons and, where the model lacks what the fact
    describes (a reaction, a tie-line, a boundary) or the fact cannot be judged, a one-line
    `problem`. `model_reaction` is the kind of the model's matched reaction (invariants)."""

    fact: Fact
    comparisons: tuple[Comparison, ...]
    problem: str | None = None
    model_reaction: str | None = None

    @property
    def passed(self) -> bool:
        return self.problem is None and bool(self.comparisons) and all(c.within for c in self.comparisons)


def describe(fact: Fact, system) -> str:
    """A short label of a fact for tables: 'eutectic of liquid + fcc + bct', 'liquidus at 8.414
    at% Sn (5 wt%)', 'fcc next to liquid at 500.00 K'."""
    if fact.kind == "melting":
        return f"melting of {fact.element}"
    if fact.kind == "transformation":
        return f"{fact.element}: {fact.phase} to {fact.partner} on cooling"
    if fact.kind == "curie":
        return f"Curie temperature of {fact.element} in {fact.phase}"
    if fact.kind == "invariant":
        names = [name for name, _x in (fact.phase_x or fact.phase_x_B)]
        return f"{fact.reaction} of {' + '.join(names) or 'any phases'}"
    if fact.x is not None:
        where = ", ".join(f"{el} {100 * v:.4g}" for el, v in zip(system.elements[1:], fact.x[1:]))
        what = f"enthalpy of mixing of {fact.phase}" if fact.kind == "mixing_enthalpy" else fact.kind
        return f"{what} at {where} at%" + (f", {fact.temperature_K:.2f} K" if fact.kind == "mixing_enthalpy" else "")
    if fact.kind in ("liquidus", "solidus"):
        b = system.elements[1]
        w = float(mass_from_mole(np.array([1.0 - fact.x_B, fact.x_B]), system.molar_mass)[1])
        return f"{fact.kind} at {100 * fact.x_B:.4g} at% {b} ({100 * w:.4g} wt%)"
    if fact.kind == "mixing_enthalpy":
        return f"enthalpy of mixing of {fact.phase} at {100 * fact.x_B:.4g} at% {system.elements[1]}, {fact.temperature_K:.2f} K"
    if fact.kind == "formation_enthalpy":
        return f"enthalpy of formation of {fact.phase} at {fact.temperature_K:.2f} K"
    if fact.kind == "distribution_coefficient":
        host = next(el for el in system.elements if el != fact.element)
        return f"distribution coefficient of {fact.element} in {host} ({fact.phase} / liquid)"
    return f"{fact.phase} next to {fact.partner} at {fact.temperature_K:.2f} K"


#: The roles of a fact: an independent check (a [[check]] the model was not fitted to), a fit
#: target (a [[measured]] fact the parameters were fitted to: agreement proves nothing), and a
#: pure element's melting point, solid-state change or Curie temperature (built into the element
#: data: neither).
INDEPENDENT = "independent check"
FIT_TARGET = "fit target"
PURE_ELEMENT = "pure-element data"


def fact_role(fact: Fact, list_name: str) -> str:
    """The role of a fact of the `[[check]]` or `[[measured]]` list (`list_name` "check" or
    "measured"): INDEPENDENT, FIT_TARGET or PURE_ELEMENT."""
    if fact.kind in PURE_ELEMENT_KINDS:
        return PURE_ELEMENT
    return INDEPENDENT if list_name == "check" else FIT_TARGET


def independent_checks(system) -> list[Fact]:
    """The system's independent checks: its [[check]] facts other than pure-element data (melting points, solid-state changes, Curie temperatures)."""
    return [f for f in system.checks if fact_role(f, "check") == INDEPENDENT]


def temperature_spread(fact: Fact) -> float | None:
    return fact.spread.get(_K)


def composition_spread(fact: Fact, phase: str | None = None) -> float | None:
    """The composition spread (at%) of the fact, for `phase` where given per phase."""
    if phase is not None and f"{_AT}:{phase}" in fact.spread:
        return fact.spread[f"{_AT}:{phase}"]
    return fact.spread.get(_AT)


def outside_coverage(system, fact: Fact) -> str | None:
    """A one-line reason where the fact lies outside the compositions or temperatures the model
    covers; None where it is inside."""
    lo, hi = system.covers
    b = system.elements[1]
    xs = [fact.x_B] if fact.x_B is not None else []
    for x in xs:
        if not lo - 1e-12 <= x <= hi + 1e-12:
            return (f"{100 * x:.4g} at% {b} lies outside the range this model covers "
                    f"({100 * lo:g}-{100 * hi:g} at% {b})")
    t_lo, t_hi = system.model_range_K
    if fact.kind not in PURE_ELEMENT_KINDS and not t_lo <= fact.temperature_K <= t_hi:
        return f"{fact.temperature_K:.2f} K lies outside the range of this system's models ({t_lo:g}-{t_hi:g} K)"
    c_lo, c_hi = system.covers_K
    if not c_lo <= fact.temperature_K <= c_hi:
        return f"{fact.temperature_K:.2f} K lies outside the temperatures this model covers ({c_lo:g}-{c_hi:g} K)"
    w_lo, w_hi = system.temperature_range_K
    if fact.kind == "invariant" and not w_lo <= fact.temperature_K <= w_hi:
        return (f"{fact.temperature_K:.2f} K lies outside the window the diagram is mapped over "
                f"({w_lo:.1f}-{w_hi:.1f} K; see temperature_range_K)")
    return None


def composition_factor(fact: Fact, phase: str | None = None) -> float | None:
    """The relative composition tolerance of a check (for `phase` where given per phase), or None."""
    if phase is not None and f"factor:{phase}" in fact.spread:
        return fact.spread[f"factor:{phase}"]
    return fact.spread.get("factor")


def composition_comparison(fact: Fact, phase: str | None, quantity: str, reference: float, model: float | None) -> Comparison:
    return Comparison(quantity, "at%", reference, model, composition_spread(fact, phase), composition_factor(fact, phase),
                      "at_most" in fact.spread)


def enthalpy_spread(fact: Fact) -> float | None:
    return fact.spread.get("J")


def model_enthalpy(system, fact: Fact) -> float:
    """The model's enthalpy (J/mol) for a mixing_enthalpy or formation_enthalpy fact."""
    phase = system.phases[fact.phase]
    if fact.kind == "mixing_enthalpy":
        return mixing_enthalpy(phase, fact.temperature_K, fact.x_B)
    return formation_enthalpy(system, phase, fact.temperature_K)


def temperature_comparison(fact: Fact, model: float | None) -> Comparison:
    return Comparison("temperature", "K", fact.temperature_K, model, temperature_spread(fact))


def _melting(system, fact: Fact) -> FactOutcome:
    T = system.melting_points.get(fact.element)
    if T is None:
        return FactOutcome(fact, (temperature_comparison(fact, None),), f"pure {fact.element} does not melt in this model's range")
    return FactOutcome(fact, (temperature_comparison(fact, float(T)),))


def _boundary_T(system, fact: Fact) -> FactOutcome:
    try:
        found = boundary_temperature(system, fact.x_B, fact.kind)
    except BoundaryNotFound as e:
        return FactOutcome(fact, (temperature_comparison(fact, None),), str(e))
    return FactOutcome(fact, (temperature_comparison(fact, found.temperature_K),))


def _tie_line(system, fact: Fact) -> FactOutcome:
    tie = tie_line_between(system, fact.temperature_K, fact.phase, fact.partner, fact.x_B)
    quantity = f"x({fact.phase})"
    if tie is None:
        return FactOutcome(fact, (composition_comparison(fact, None, quantity, 100 * fact.x_B, None),),
                           f"the model has no {fact.phase} + {fact.partner} tie-line at {fact.temperature_K:.2f} K")
    x = phase_end(tie, fact.phase, fact.x_B)
    return FactOutcome(fact, (composition_comparison(fact, None, quantity, 100 * fact.x_B, 100 * x),))


#: Distance (K) from the host's melting point of the tie-line a distribution coefficient is read on:
#: close enough for the dilute limit (the solute's amount is then of order 0.1-1 at%), far
#: enough for the section to resolve the two-phase field.
_DILUTE_K = 0.5


def _distribution(system, fact: Fact) -> FactOutcome:
    """k0 = x(solute in the solid) / x(solute in the liquid) on the liquid + solid tie-line next to
    the pure host, just below or above the host's melting point (whichever side has it)."""
    host = next(el for el in system.elements if el != fact.element)
    host_x_B = 0.0 if host == system.elements[0] else 1.0
    ref = Comparison("k", "ratio", fact.ratio, None, None, composition_factor(fact))
    melting = system.melting_points.get(host)
    if melting is None:
        return FactOutcome(fact, (ref,), f"pure {host} does not melt in this model's range")
    for T in (melting - _DILUTE_K, melting + _DILUTE_K):
        tie = tie_line_between(system, T, fact.phase, "liquid", host_x_B)
        if tie is None:
            continue
        solid, liquid = phase_end(tie, fact.phase, host_x_B), phase_end(tie, "liquid", host_x_B)
        if max(abs(solid - host_x_B), abs(liquid - host_x_B)) > 0.1:
            continue    # a tie-line of another part of the diagram, not the dilute end
        k = abs(solid - host_x_B) / abs(liquid - host_x_B)
        return FactOutcome(fact, (Comparison("k", "ratio", fact.ratio, float(k), None, ref.factor),))
    return FactOutcome(fact, (ref,), f"the model has no {fact.phase} + liquid tie-line next to pure {host} "
                                     f"within {_DILUTE_K:g} K of its melting point")


def reaction_candidates(diagram, reaction: str) -> list[tuple[str, float, tuple[tuple[str, float], ...]]]:
    """(kind, T in K, ((phase, x_B), ...)) of every reaction of the mapped diagram that a fact of
    `reaction` may be compared with: the congruent points for "congruent", else the invariants."""
    if reaction == "congruent":
        return [("congruent", s.temperature_K, tuple((n, s.x_B) for n in s.phases))
                for s in diagram.special_points if s.kind == "congruent"]
    return [(i.kind, i.temperature_K, tuple(i.phases)) for i in diagram.invariants]


def match_reaction(candidates, fact: Fact):
    """The candidate nearest in temperature that has the fact's named phases, preferring the
    fact's kind: (candidate, kind_matches), or (None, False) where none has those phases."""
    named = {name for name, _x in fact.phase_x_B}
    with_phases = [c for c in candidates if named <= {n for n, _x in c[2]}]
    same = [c for c in with_phases if c[0] == fact.reaction]
    pool = same or with_phases
    if not pool:
        return None, False
    return min(pool, key=lambda c: abs(c[1] - fact.temperature_K)), bool(same)


def reaction_comparisons(fact: Fact, T: float | None, phases) -> tuple[Comparison, ...]:
    """Temperature and each named phase's composition against the model's (T, ((phase, x_B), ...))."""
    out = [temperature_comparison(fact, T)]
    for name, x_ref in fact.phase_x_B:
        xs = [x for n, x in phases if n == name]
        model = 100 * min(xs, key=lambda x: abs(x - x_ref)) if xs else None
        out.append(composition_comparison(fact, name, f"x({name})", 100 * x_ref, model))
    return tuple(out)


def reaction_name(reaction: str) -> str:
    """'eutectic', ..., 'congruent point' (for sentences)."""
    return "congruent point" if reaction == "congruent" else reaction


def _invariant(system, fact: Fact, diagram) -> FactOutcome:
    cand, same_kind = match_reaction(reaction_candidates(diagram, fact.reaction), fact)
    names = " + ".join(name for name, _x in fact.phase_x_B) or "any phases"
    if cand is None:
        return FactOutcome(fact, reaction_comparisons(fact, None, ()),
                           f"the model has no {reaction_name(fact.reaction)} of {names} (its diagram has a different topology)")
    kind, T, phases = cand
    problem = None
    if not same_kind:
        problem = f"the model's reaction of {names} at {T:.2f} K is a {kind}, not a {fact.reaction}"
    return FactOutcome(fact, reaction_comparisons(fact, T, phases), problem, kind)


def evaluate(system, fact: Fact, diagram=None) -> FactOutcome:
    """The model against one fact. `diagram` is the system's mapped diagram (needed for
    invariant facts; mapped on demand when not given)."""
    reason = outside_coverage(system, fact)
    if reason is not None:
        return FactOutcome(fact, (), reason)
    try:
        if fact.kind in PURE_ELEMENT_KINDS[1:] or (fact.kind == "melting" and unmapped_phases(system)):
            from .pure_element import curie_temperature, pure_element_change

            if fact.kind == "curie":
                return curie_temperature(system, fact)
            return pure_element_change(system, fact, *((fact.phase, fact.partner) if fact.partner else ("liquid", None)))
        if fact.kind == "melting":
            return _melting(system, fact)
        if len(system.elements) > 2:
            from .multicomponent import evaluate_multicomponent

            return evaluate_multicomponent(system, fact)
        if fact.kind in ("liquidus", "solidus", "boundary") and unmapped_phases(system):
            from .point_boundaries import point_boundary

            return point_boundary(system, fact)
        if fact.kind in ("liquidus", "solidus"):
            return _boundary_T(system, fact)
        if fact.kind == "boundary":
            return _tie_line(system, fact)
        if fact.kind == "distribution_coefficient":
            return _distribution(system, fact)
        if fact.kind in ("mixing_enthalpy", "formation_enthalpy"):
            return FactOutcome(fact, (Comparison("enthalpy", "J/mol", fact.enthalpy_J_per_mol, model_enthalpy(system, fact),
                                                 enthalpy_spread(fact)),))
        if diagram is None and unmapped_phases(system):
            from .scanned_invariants import scanned_invariant

            return scanned_invariant(system, fact)
        if diagram is None:
            from ..diagrams.diagram import map_diagram

            diagram = map_diagram(system)
        return _invariant(system, fact, diagram)
    except TemperatureOutOfRange as e:
        return FactOutcome(fact, (), str(e))


def evaluate_all(system, facts: list[Fact]) -> list[FactOutcome]:
    """The model against every fact of a list (the diagram is mapped once, if any fact needs it)."""
    diagram = None
    if len(system.elements) == 2 and not unmapped_phases(system) and any(f.kind == "invariant" for f in facts):
        from ..diagrams.diagram import map_diagram

        diagram = map_diagram(system)
    return [evaluate(system, f, diagram) for f in facts]
