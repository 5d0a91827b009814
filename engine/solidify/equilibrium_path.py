"""Equilibrium cooling of one alloy: the lever rule at every step.

The path runs from the liquidus to the solidus of the alloy's melt range (engine/melt.py); every
state on it is a point equilibrium of the engine (engine/equilibrium.py). Phase boundaries crossed
on the way are states of their own, taken just above and just below, so that an invariant
reaction shows as a plateau: its liquid freezes at one temperature. Temperatures in K,
compositions as mole fraction of B, amounts as fractions of the alloy.
"""

from __future__ import annotations

import math
from dataclasses import dataclass

from ..diagrams.diagram import map_diagram
from ..minimize.equilibrium import PointEquilibrium, equilibrate
from ..diagrams.melt import melt_range
from .heat import State, released_between
from .liquidus import LIQUID
from .records import (SAME_K, Arrest, Constituent, CoolingPath, PathError, PathStep, coverage_notes,
                            describe_reaction, molar_mass_of, reaction_products, solid_label)

#: States are taken this far (K) above and below each boundary crossed.
EDGE_K = 1e-6
#: Step (K) between states along the freezing range: the range over _STEPS, within these limits.
_MAX_STEP_K = 4.0
_MIN_STEP_K = 0.02
_STEPS = 60


@dataclass(frozen=True)
class _Reaction:
    """What happens at a plateau: `kind` (eutectic, peritectic, ..., "melting point",
    "congruent"), the reaction as text, its solids (name, x_B) and whether the liquid lies
    between them (it then leaves as a two-solid constituent)."""

    kind: str
    text: str
    solids: tuple[tuple[str, float], ...]
    liquid_in_middle: bool


def _state(eq: PointEquilibrium) -> State:
    return tuple((p.name, float(p.x[1]), p.amount_mol) for p in eq.phases)


class EquilibriumCooling:
    """The equilibrium (lever-rule) path of the alloy with mole fraction x_B of B."""

    def __init__(self, system, x_B: float) -> None:
        self.system = system
        self.x_B = x_B
        self.molar_mass = molar_mass_of(system, x_B)
        mr = melt_range(system, x_B)
        if mr.liquidus_K is None:
            lo, hi = system.temperature_range_K
            raise PathError(f"the alloy is not fully liquid at the top of the mapped window ({hi:.0f} K)")
        self.liquidus_K = mr.liquidus_K
        self.solidus_K = mr.solidus_K
        bottom = mr.solidus_K if mr.solidus_K is not None else system.temperature_range_K[0]
        # boundaries crossed with liquid present; the liquidus itself only where the alloy
        # freezes at one temperature (a pure element, a congruent or a eutectic composition)
        self.events = [c.temperature_K for c in mr.crossings if LIQUID in c.above and bottom <= c.temperature_K
                       and (c.above != (LIQUID,) or LIQUID not in c.below)]
        self.bottom_K = bottom

    # --- states ---------------------------------------------------------------------------------
    def _equilibrium(self, T: float) -> PointEquilibrium:
        return equilibrate(self.system, T, self.x_B)

    def _step(self, T: float, eq: PointEquilibrium | None, heat: float = 0.0) -> PathStep:
        if eq is None:                      # at the liquidus: all liquid
            return PathStep(T, 0.0, 0.0, self.x_B, (LIQUID,), heat)
        liquid = next((p for p in eq.phases if p.name == LIQUID), None)
        f_mass = liquid.amount_mass if liquid is not None else 0.0
        f_mol = liquid.amount_mol if liquid is not None else 0.0
        solids = tuple(p.name for p in eq.phases if p.name != LIQUID)
        phases = ((LIQUID,) if liquid is not None else ()) + solids
        return PathStep(T, 1.0 - f_mass, 1.0 - f_mol, float(liquid.x[1]) if liquid is not None else None, phases, heat)

    def state_at(self, T: float, below: bool = False) -> PathStep:
        """The state at T (K); at a boundary the state just above it, or just below with `below`."""
        if T > self.liquidus_K or (T == self.liquidus_K and not below):
            return self._step(T, None)
        event = next((e for e in self.events if abs(e - T) <= SAME_K), None)
        if event is not None:
            return self._step(T, self._equilibrium(event - EDGE_K if below else event + EDGE_K))
        return self._step(T, self._equilibrium(T))

    def _temperatures(self) -> list[tuple[float, float | None]]:
        """(temperature reported, temperature evaluated; None for all liquid), hot to cold."""
        marks = [self.liquidus_K] + self.events
        if self.solidus_K is None:
            marks.append(self.bottom_K)
        step = min(_MAX_STEP_K, max(_MIN_STEP_K, (self.liquidus_K - marks[-1]) / _STEPS))
        out: list[tuple[float, float | None]] = [(self.liquidus_K, None)]
        for hot, cold in zip(marks[:-1], marks[1:]):
            n = max(1, math.ceil((hot - cold) / step))
            out += [(hot - j * (hot - cold) / n,) * 2 for j in range(1, n)]
            out += [(cold, cold + EDGE_K), (cold, cold - EDGE_K)] if cold in self.events else [(cold, cold)]
        return out

    # --- the record ---------------------------------------------------------------------------------
    def path(self) -> CoolingPath:
        """The whole path as a CoolingPath."""
        system, M = self.system, self.molar_mass
        steps: list[PathStep] = []
        states: list[State] = []
        heat = 0.0
        arrests: list[Arrest] = []
        kinds: dict[str, str] = {}          # solid -> how it formed: primary, peritectic, ...
        forms: list[tuple[str, float]] = []
        last_eq = above_eq = None
        eutectic: Constituent | None = None   # the liquid that left as a two-solid constituent
        end_reaction: _Reaction | None = None
        for T, T_eval in self._temperatures():
            eq = None if T_eval is None else self._equilibrium(T_eval)
            state: State = ((LIQUID, self.x_B, 1.0),) if eq is None else _state(eq)
            step_heat = released_between(system, states[-1], state, steps[-1].temperature_K, T) / M if states else 0.0
            heat += step_heat
            step = self._step(T, eq, heat)
            reaction = self._reaction_at(T) if steps and T == steps[-1].temperature_K else None
            if steps and T == steps[-1].temperature_K and reaction is None:
                steps.pop()                 # a boundary without a reaction: one state is enough
                states.pop()
            if reaction is not None and step.fraction_solid > steps[-1].fraction_solid:
                arrests.append(Arrest(T, "plateau", f"{reaction.kind} plateau: {reaction.text}", step_heat))
                if LIQUID not in step.phases:
                    end_reaction = reaction
                    if reaction.liquid_in_middle:
                        eutectic = Constituent(f"{reaction.kind} {reaction_products(system, list(reaction.solids))}",
                                               1.0 - steps[-1].fraction_solid)
                        above_eq = last_eq
            for name in step.phases:
                if name == LIQUID or name in kinds:
                    continue
                kind = "primary" if not kinds else reaction.kind if reaction is not None else "boundary"
                kinds[name] = kind
                forms.append((name, T if steps and steps[-1].temperature_K == T else self.liquidus_K))
                if kind != "primary" and not (arrests and arrests[-1].temperature_K == T):
                    arrests.append(Arrest(T, "new phase", f"{kind}: {name} starts to form"))
            steps.append(step)
            states.append(state)
            last_eq = eq
        first = f"liquidus: {forms[0][0]} starts to form" if forms else "liquidus: freezing starts"
        if not (arrests and arrests[0].temperature_K == self.liquidus_K):
            arrests.insert(0, Arrest(self.liquidus_K, "liquidus", first))
        notes: list[str] = []
        if self.solidus_K is None:
            end, end_K = "window", None
            notes.append("liquid is left at the bottom of the mapped temperature window")
        elif end_reaction is not None:
            end, end_K = end_reaction.kind, self.solidus_K
        else:
            end, end_K = "solidus", self.solidus_K
            arrests.append(Arrest(self.solidus_K, "end", "solidus: freezing ends"))
        among = list(end_reaction.solids) if end_reaction is not None else []
        constituents = self._constituents(kinds, among, above_eq if eutectic is not None else last_eq, eutectic)
        return CoolingPath("equilibrium", system, self.x_B, self.liquidus_K, end_K, end, tuple(steps), tuple(forms),
                           tuple(c for c in constituents if c.mass_fraction > 0.0), heat, tuple(arrests),
                           tuple(notes + coverage_notes(system, steps)))

    def _constituents(self, kinds: dict[str, str], among: list[tuple[str, float]], final: PointEquilibrium | None,
                      eutectic: Constituent | None) -> tuple[Constituent, ...]:
        """The solids of `final` (the end of freezing, or the state just above a eutectic-like
        plateau) named by how they formed (`kinds`; labelled apart where the last reaction's
        solids, `among`, hold one phase twice), then the eutectic, or the liquid left."""
        phases = final.phases if final is not None else ()
        out = [Constituent(f"{kinds.get(p.name, 'boundary')} {solid_label(self.system, p.name, float(p.x[1]), among)}",
                           p.amount_mass) for p in phases if p.name != LIQUID]
        if eutectic is not None:
            out.append(eutectic)
        else:
            out += [Constituent("liquid left at the bottom of the window", p.amount_mass)
                    for p in phases if p.name == LIQUID]
        return tuple(out)

    def _reaction_at(self, T: float) -> _Reaction | None:
        """The diagram's reaction that freezes liquid at one temperature T (K): an invariant
        reaction, or the melting point of a pure element or a congruent composition."""
        diagram = map_diagram(self.system)
        inv = next((i for i in diagram.invariants if abs(i.temperature_K - T) < 1e-6), None)
        if inv is not None:
            solids = tuple((n, x) for n, x in inv.phases if n != LIQUID)
            return _Reaction(inv.kind, describe_reaction(self.system, inv), solids, inv.phases[1][0] == LIQUID)
        for sp in diagram.special_points:
            if (sp.kind in ("melting", "congruent") and LIQUID in sp.phases and abs(sp.temperature_K - T) < 1e-6
                    and abs(sp.x_B - self.x_B) < 1e-9):
                solid = next(p for p in sp.phases if p != LIQUID)
                kind = "melting point" if sp.kind == "melting" else "congruent"
                return _Reaction(kind, f"liquid -> {solid}", ((solid, sp.x_B),), False)
        return None
