"""Heat released on freezing, from the enthalpy H = G - T dG/dT of each phase (the
Gibbs-Helmholtz relation) with the models' analytic temperature derivatives.

The latent heat of a step of a path is the enthalpy given off when the state before the step
turns into the state after it at one temperature (the step's mid temperature): the heat of the
phase change and of the redistribution of the elements, without the sensible heat of cooling.
Energies in J per mole of atoms (J/g where a name says so), temperatures in K.
"""

from __future__ import annotations

from ..models.phases import CompoundPhase

#: A state: (phase name, x_B of the phase, moles of atoms of the phase per mole of alloy).
State = tuple[tuple[str, float, float], ...]


def phase_enthalpy(system, name: str, T: float, x_B: float) -> float:
    """Molar enthalpy H = G - T dG/dT (J/mol) of phase `name` at T (K) and x_B; for a compound
    x_B is its own."""
    phase = system.phases[name]
    if isinstance(phase, CompoundPhase):
        return phase.gibbs(T) - T * phase.gibbs_dT(T)
    at = phase.at(T)
    xa, xb = 1.0 - x_B, x_B
    return float(at.gibbs(xa, xb) - T * at.gibbs_dT(xa, xb))


def state_enthalpy(system, state: State, T: float) -> float:
    """Enthalpy (J per mole of alloy) of the phases of `state`, all at T (K)."""
    return sum(amount * phase_enthalpy(system, name, T, x) for name, x, amount in state if amount > 0.0)


def released_between(system, before: State, after: State, T_before: float, T_after: float) -> float:
    """Latent heat (J per mole of alloy) released when `before` becomes `after`, both taken at
    the mid temperature (K) of the step."""
    T = 0.5 * (T_before + T_after)
    return state_enthalpy(system, before, T) - state_enthalpy(system, after, T)
