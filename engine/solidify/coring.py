"""Coring: how the composition of the first solid to freeze (the core of a dendrite) differs
from that of the last primary solid (its rim) when the solid does not diffuse (the Scheil path).

Along the Scheil path the solid forming at each temperature is in equilibrium with the liquid
there: its composition is the solid end of the tie-line whose liquid end is the Scheil liquid.
Compositions as mole fractions of B, temperatures in K.
"""

from __future__ import annotations

from dataclasses import dataclass

from ..diagrams.melt import LIQUID
from ..minimize.equilibrium import section_at


@dataclass(frozen=True)
class Coring:
    """The primary solid `phase` of a Scheil path: x_B of its first solid (`x_core`, at
    `core_K`) and of its last before another solid joins it (`x_rim`, at `rim_K`)."""

    phase: str
    x_core: float
    core_K: float
    x_rim: float
    rim_K: float


def _solid_beside(system, temperature_K: float, phase: str, x_liquid: float) -> float | None:
    """x_B of `phase` on the tie-line whose liquid end is nearest x_liquid at this temperature."""
    best = None
    for tie in section_at(system, temperature_K).tie_lines:
        if set(tie.phases) != {LIQUID, phase}:
            continue
        i_liquid = tie.phases.index(LIQUID)
        distance = abs(tie.x_B[i_liquid] - x_liquid)
        if best is None or distance < best[0]:
            best = (distance, tie.x_B[1 - i_liquid])
    return None if best is None else best[1]


def primary_coring(system, scheil_path) -> Coring | None:
    """The coring of the primary solid of a Scheil path (the engine's CoolingPath); None where
    the path has no primary stage of one solid beside the liquid."""
    primary = [s for s in scheil_path.steps
               if len(s.phases) == 2 and s.phases[0] == LIQUID and s.liquid_x_B is not None]
    if not primary:
        return None
    phase = primary[0].phases[1]
    stage = [s for s in primary if s.phases[1] == phase]
    ends = []
    for steps in (stage, stage[::-1]):   # the first step with the tie-line from either end (at
        for step in steps:               # a reaction's temperature the section may lack it)
            x_solid = _solid_beside(system, step.temperature_K, phase, step.liquid_x_B)
            if x_solid is not None:
                ends.append((x_solid, step.temperature_K))
                break
    if len(ends) < 2:
        return None
    (x_core, core_K), (x_rim, rim_K) = ends
    return Coring(phase, x_core, core_K, x_rim, rim_K)
