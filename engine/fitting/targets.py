"""What a fit compares with each measured fact, solved quickly from the previous solution.

During a fit the model changes a little between evaluations, so each target keeps its last
solution (a hint) and solves from it: a three-phase equilibrium by Newton's method with
temperature free (engine/special.py), a liquidus or solidus by a root bracketed around the last
temperature, a tie-line end by Newton's method on the two phases alone. These values may be
metastable for a moment (a trial step that loses a phase); the fit's result is judged afterwards
on the model's stable diagram (engine/measure.py).

Temperatures in K, compositions in at% of B (100 x mole fraction), enthalpies in J/mol, as in the
measurement file.
"""

from __future__ import annotations

from abc import ABC, abstractmethod
from dataclasses import dataclass, replace

from ..checking.measure import (composition_spread, enthalpy_spread, match_reaction, model_enthalpy, reaction_candidates,
                      reaction_name, temperature_spread)
from ..checking.boundaries import BoundaryNotFound, boundary_temperature, phase_end, tie_line_between
from ..models.phases import CompoundPhase
from ..models.polynomials import TemperatureOutOfRange
from ..diagrams.special import compound_congruent, solution_congruent, three_phase
from ..models.system import Fact

#: Half-width (K) of the bracket searched around the last congruent temperature.
_CONGRUENT_WINDOW_K = 25.0


class TargetLost(ValueError):
    """The model at the trial parameters has no solution for a target (one-line reason)."""


class TargetInputError(ValueError):
    """A measured fact cannot be fitted as written (one-line message naming its key)."""


@dataclass(frozen=True)
class Quantity:
    """One measured number of a fact: name, unit ("K", "at%" or "J/mol"), value and standard uncertainty."""

    name: str
    unit: str
    measured: float
    uncertainty: float


def _key(fact: Fact) -> str:
    return f"measured[{fact.index}]"


def _temperature_quantity(fact: Fact) -> Quantity:
    u = temperature_spread(fact)
    if u is None:
        raise TargetInputError(f"{_key(fact)}: uncertainty_K missing (the standard uncertainty of the temperature, K)")
    return Quantity("temperature", "K", fact.temperature_K, u)


def _composition_quantity(fact: Fact, phase: str, x_B: float) -> Quantity:
    u = composition_spread(fact, phase)
    if u is None:
        raise TargetInputError(f"{_key(fact)}: uncertainty_at missing for {phase} "
                               f"(the standard uncertainty of its composition, at%)")
    return Quantity(f"x({phase})", "at%", 100.0 * x_B, u)


def _enthalpy_quantity(fact: Fact) -> Quantity:
    u = enthalpy_spread(fact)
    if u is None:
        raise TargetInputError(f"{_key(fact)}: uncertainty_J missing (the standard uncertainty of the enthalpy, J/mol)")
    return Quantity("enthalpy", "J/mol", fact.enthalpy_J_per_mol, u)


class Target(ABC):
    """A measured fact in a fit: `quantities` and `values(system)`, the model's values of them
    in the same order (raises TargetLost where the model has none)."""

    quantities: tuple[Quantity, ...]

    def __init__(self, fact: Fact) -> None:
        self.fact = fact

    def values(self, system) -> list[float]:
        try:
            return self._values(system)
        except (BoundaryNotFound, TemperatureOutOfRange) as e:
            raise TargetLost(str(e)) from None

    @abstractmethod
    def _values(self, system) -> list[float]:
        """The model's values of `quantities` (K, at%)."""


class MeltingTarget(Target):
    def __init__(self, fact: Fact) -> None:
        super().__init__(fact)
        self.quantities = (_temperature_quantity(fact),)

    def _values(self, system) -> list[float]:
        T = system.melting_points.get(self.fact.element)
        if T is None:
            raise TargetLost(f"pure {self.fact.element} does not melt in the model's range")
        return [float(T)]


class BoundaryTemperatureTarget(Target):
    """A liquidus or solidus temperature at the fact's composition."""

    def __init__(self, fact: Fact) -> None:
        super().__init__(fact)
        self.quantities = (_temperature_quantity(fact),)
        self.hint: float | None = None

    def _values(self, system) -> list[float]:
        found = boundary_temperature(system, self.fact.x_B, self.fact.kind, self.hint)
        self.hint = found.temperature_K
        return [found.temperature_K]


class TieLineTarget(Target):
    """The composition of `phase` on its tie-line to `partner` at the fact's temperature."""

    def __init__(self, fact: Fact) -> None:
        super().__init__(fact)
        self.quantities = (_composition_quantity(fact, fact.phase, fact.x_B),)
        self.hint = fact.x_B

    def _values(self, system) -> list[float]:
        f = self.fact
        tie = tie_line_between(system, f.temperature_K, f.phase, f.partner, self.hint, stable=False)
        if tie is None:
            raise TargetLost(f"no {f.phase} + {f.partner} tie-line at {f.temperature_K:.2f} K")
        self.hint = phase_end(tie, f.phase, self.hint)
        return [100.0 * self.hint]


class ReactionTarget(Target):
    """An invariant (three-phase) reaction or a congruent point: temperature and the named
    phases' compositions, solved with temperature free from the last solution."""

    def __init__(self, fact: Fact, diagram) -> None:
        super().__init__(fact)
        self.quantities = (_temperature_quantity(fact),) + tuple(
            _composition_quantity(fact, name, x) for name, x in fact.phase_x_B)
        cand, _same = match_reaction(reaction_candidates(diagram, fact.reaction), fact)
        if cand is not None:
            self.T, self.entries = cand[1], list(cand[2])
        elif fact.reaction != "congruent" and len(fact.phase_x_B) == 3:
            self.T, self.entries = fact.temperature_K, sorted(fact.phase_x_B, key=lambda e: e[1])
        else:
            named = " + ".join(name for name, _x in fact.phase_x_B) or "no phases"
            raise TargetInputError(
                f"{_key(fact)}: the starting model has no {reaction_name(fact.reaction)} of {named}; "
                + ("change the starting values so that it has one"
                   if fact.reaction == "congruent" or len(fact.phase_x_B) == 3
                   else "name all three phases with their compositions, or change the starting values"))

    def _solve(self, system):
        if self.fact.reaction != "congruent":
            return three_phase(system, self.entries, self.T)
        (p, x), (q, _x) = self.entries[0], self.entries[1]
        compounds = [n for n, _ in self.entries[:2] if isinstance(system.phases[n], CompoundPhase)]
        if compounds:
            solution = q if compounds[0] == p else p
            lo, hi = system.model_range_K
            return compound_congruent(system, compounds[0], solution, max(lo, self.T - _CONGRUENT_WINDOW_K),
                                      min(hi, self.T + _CONGRUENT_WINDOW_K))
        return solution_congruent(system, p, q, x, self.T)

    def _values(self, system) -> list[float]:
        r = self._solve(system)
        if r is None or not r.converged:
            raise TargetLost(f"the {reaction_name(self.fact.reaction)} of {' + '.join(n for n, _ in self.entries)} was not found "
                             f"near {self.T:.2f} K")
        self.T = r.temperature_K
        self.entries = [(name, xb) for name, _xa, xb in r.phases]
        out = [self.T]
        for name, x_ref in self.fact.phase_x_B:
            xs = [x for n, x in self.entries if n == name]
            out.append(100.0 * min(xs, key=lambda x: abs(x - x_ref)))
        return out


class EnthalpyTarget(Target):
    """An enthalpy of mixing or of formation (J/mol), computed directly from the model."""

    def __init__(self, fact: Fact) -> None:
        super().__init__(fact)
        self.quantities = (_enthalpy_quantity(fact),)

    def _values(self, system) -> list[float]:
        return [model_enthalpy(system, self.fact)]


class MulticomponentTarget(Target):
    """A fact of a system of three or more elements (liquidus, solidus, mixing enthalpy, or a
    eutectic's temperature and liquid composition), measured as `ladle check` measures it
    (engine/checking/multicomponent.py)."""

    def __init__(self, fact: Fact, elements: tuple[str, ...]) -> None:
        super().__init__(fact)
        if fact.kind == "mixing_enthalpy":
            self.quantities = (_enthalpy_quantity(fact),)
        elif fact.kind == "invariant":
            liquid = [x for name, x in fact.phase_x if name == "liquid"]
            if fact.reaction != "eutectic" or not liquid or liquid[0] is None:
                raise TargetInputError(f"{_key(fact)}: a reaction of three or more elements is fitted as a eutectic "
                                       "with its liquid's composition")
            self.quantities = (_temperature_quantity(fact),) + tuple(
                replace(_composition_quantity(fact, "liquid", x), name=f"x(liquid) {el}")
                for el, x in zip(elements[1:], liquid[0][1:]))
        else:
            self.quantities = (_temperature_quantity(fact),)

    def _values(self, system) -> list[float]:
        from ..checking.multicomponent import evaluate_multicomponent

        outcome = evaluate_multicomponent(system, self.fact)
        if outcome.problem is not None:
            raise TargetLost(outcome.problem)
        values = [c.model for c in outcome.comparisons]
        if any(v is None for v in values):
            raise TargetLost("the model has no value for it")
        return values


class PointBoundaryTarget(Target):
    """A liquidus, solidus or tie-line end of a binary with sublattice phases (which the tracer
    does not map), measured from point equilibria as `ladle check` measures it
    (engine/checking/point_boundaries.py)."""

    def __init__(self, fact: Fact) -> None:
        super().__init__(fact)
        self.quantities = ((_composition_quantity(fact, fact.phase, fact.x_B),) if fact.kind == "boundary"
                           else (_temperature_quantity(fact),))

    def _values(self, system) -> list[float]:
        from ..checking.point_boundaries import point_boundary

        outcome = point_boundary(system, self.fact)
        values = [c.model for c in outcome.comparisons]
        if outcome.problem is not None or not values or any(v is None for v in values):
            raise TargetLost(outcome.problem or "the model has no value for it")
        return values


def make_target(fact: Fact, diagram, elements: tuple[str, ...] = (), point_equilibria: bool = False) -> Target:
    """The fit target of one measured fact; `diagram` is the starting model's mapped diagram
    (used to find its reactions); `elements` the system's (for facts of three or more);
    `point_equilibria` for a binary with sublattice phases, whose boundaries are measured from
    point equilibria."""
    if fact.kind == "melting":
        return MeltingTarget(fact)
    if fact.x is not None or fact.phase_x:
        return MulticomponentTarget(fact, elements)
    if point_equilibria and fact.kind in ("liquidus", "solidus", "boundary"):
        return PointBoundaryTarget(fact)
    if fact.kind in ("liquidus", "solidus"):
        return BoundaryTemperatureTarget(fact)
    if fact.kind == "boundary":
        return TieLineTarget(fact)
    if fact.kind in ("mixing_enthalpy", "formation_enthalpy"):
        return EnthalpyTarget(fact)
    return ReactionTarget(fact, diagram)
