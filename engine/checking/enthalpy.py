"""Enthalpies the model gives for calorimetric facts: H = G - T dG/dT (the Gibbs-Helmholtz
relation), in J per mole of atoms, at T in K.

- mixing: the enthalpy of mixing of a solution phase at mole fraction x of B, relative to the two
  pure elements in that same phase: H(x) - x_A H(pure A) - x_B H(pure B). Ideal mixing adds
  nothing; a regular solution with L0 = a + b T gives x_A x_B a.
- formation: the enthalpy of formation of a compound from the pure elements, each in its stable
  phase of this system at T (the usual reference state of calorimetry).
"""

from __future__ import annotations

from ..models.phases import CompoundPhase, SolutionPhase
from ..models.pure import stable_pure_phase


def _solution_enthalpy(phase: SolutionPhase, T: float, xa: float, xb: float) -> float:
    at = phase.at(T)
    return float(at.gibbs(xa, xb) - T * at.gibbs_dT(xa, xb))


def mixing_enthalpy(phase: SolutionPhase, T: float, x_B: float) -> float:
    """Enthalpy of mixing (J/mol) of solution `phase` at x_B (mole fraction) and T (K)."""
    xa, xb = 1.0 - x_B, x_B
    return (_solution_enthalpy(phase, T, xa, xb)
            - xa * _solution_enthalpy(phase, T, 1.0, 0.0) - xb * _solution_enthalpy(phase, T, 0.0, 1.0))


def formation_enthalpy(system, compound: CompoundPhase, T: float) -> float:
    """Enthalpy of formation (J/mol of atoms) of `compound` at T (K) from the pure elements in
    their stable phases of `system` at T."""
    h = compound.gibbs(T) - T * compound.gibbs_dT(T)
    for i, xi in enumerate(compound.x):
        if xi > 0.0:
            ref = system.phases[stable_pure_phase(system.phases, i, T)]
            pure = (1.0, 0.0) if i == 0 else (0.0, 1.0)
            h -= xi * _solution_enthalpy(ref, T, *pure)
    return float(h)
