"""Which systems the whole-diagram tracer (engine/diagrams/diagram.py) can map: binaries whose
phases are substitutional solutions and stoichiometric compounds. Sublattice phases (interstitial
solutions such as austenite, carbides on sublattices) are evaluated by point equilibria only so
far; a diagram traced without them would be wrong, so it is refused instead (`ladle diagram`
draws such a binary as an isopleth over the range its file covers: engine/diagrams/isopleth.py).
"""

from __future__ import annotations

from ..models.phases import CompoundPhase, SolutionPhase


def unmapped_phases(system) -> list[str]:
    """The phases of `system` that the diagram tracer cannot evaluate (sublattice phases)."""
    return [n for n, p in system.phases.items() if not isinstance(p, (SolutionPhase, CompoundPhase))]


def require_mappable(system) -> None:
    """Raise ValueError (one line naming the system and what stops it) unless the tracer can map
    the whole diagram of `system`."""
    unmapped = unmapped_phases(system)
    if len(system.elements) == 2 and not unmapped:
        return
    what = f"the sublattice phases {', '.join(unmapped)}" if unmapped else f"{len(system.elements)} elements"
    raise ValueError(f"{system.name}: whole diagrams of systems with {what} are not traced as tie-lines; "
                     "ladle point, melt, cool and transitions answer for one alloy, and ladle diagram draws "
                     "an isopleth (of a binary: over the range its file covers)")
