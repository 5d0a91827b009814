"""The eutectic of a cast iron and its carbon equivalent, from the model.

A cast iron (iron, carbon, silicon) freezes its last liquid as austenite + graphite (grey iron,
the stable eutectic) or austenite + cementite (white iron, the metastable one). With silicon the
eutectic is no longer one point but a trough: for each silicon content of the liquid there is
one liquid saturated with both austenite and the carbon-rich phase. `eutectic_of_silicon` finds
that liquid (its carbon content and temperature) at a given silicon content, from the liquid's
chemical potentials alone: at a trial temperature the liquid saturated with the carbon-rich
phase is found by bisection in carbon (where that phase's driving force is zero), and the
temperature is narrowed until austenite's driving force against that liquid is zero too.

The foundry reads the eutectic through the carbon equivalent, CE = %C + %Si/3 (common practice:
silicon moves the eutectic to less carbon by about a third of its own amount). The model's
carbon equivalent (`carbon_equivalent`) is the same idea computed instead of assumed:

    CE_model = %C + (C_E(0) - C_E(%Si))

with C_E(s) the model's eutectic carbon content (wt%) of a liquid of s wt% Si; an iron with
CE_model = C_E(0) (the model's Fe-C eutectic, 4.34 wt% C) is eutectic. Compositions in wt% unless a name says
otherwise, temperatures in K, driving forces in J per mole of atoms.
"""

from __future__ import annotations

from dataclasses import dataclass
from functools import lru_cache

import numpy as np

from ..units import mole_from_mass
from .phase_change import driving_force_at

#: The phases of a cast iron model: the liquid, austenite, and the carbon-rich phases.
LIQUID, AUSTENITE, GRAPHITE, CEMENTITE = "liquid", "fcc", "graphite", "Fe3C"
#: The foundry rule's divisor: CE = %C + %Si / 3 (common practice, no source).
RULE_SILICON_DIVISOR = 3.0
#: The carbon contents (wt%) searched for a liquid saturated with the carbon-rich phase, the
#: temperature window (K) searched for each eutectic (the stable one lies at 1427 K in Fe-C and
#: rises with silicon; the metastable one at 1421 K falls with it, below cementite's own melting
#: near 1500 K), and how closely each is narrowed.
_CARBON_WT = {GRAPHITE: (1.0, 7.0), CEMENTITE: (1.0, 6.6)}       # cementite itself: 6.69 wt% C
_WINDOW_K = {GRAPHITE: (1350.0, 1600.0), CEMENTITE: (1250.0, 1450.0)}
_CARBON_TOLERANCE_WT = 1e-6
_TEMPERATURE_TOLERANCE_K = 1e-4
_EDGE_TOLERANCE_K = 0.01
#: A driving force (J/mol of atoms) below minus this marks a phase as more stable than austenite.
_OVERTAKEN_J = 1.0


class NotACastIron(ValueError):
    """The system lacks what a cast iron's eutectic needs (one-line reason)."""


@dataclass(frozen=True)
class IronEutectic:
    """The liquid saturated with austenite and `carbon_phase` at `silicon_wt` wt% Si: its
    temperature (K) and carbon content (wt%)."""

    carbon_phase: str
    silicon_wt: float
    temperature_K: float
    carbon_wt: float
    #: Phases (other than the carbon-rich ones) more stable than austenite against that liquid:
    #: where any, the model's melt freezes another way first (delta ferrite, say) and this
    #: eutectic is a metastable extrapolation.
    overtaken_by: tuple[str, ...] = ()


@dataclass(frozen=True)
class CarbonEquivalent:
    """An iron's carbon equivalent from the model beside the foundry rule's (wt%), with the
    model's graphite eutectic of the iron's silicon content and the binary one."""

    carbon_wt: float
    silicon_wt: float
    model: float
    rule: float
    eutectic: IronEutectic
    binary_eutectic: IronEutectic

    @property
    def difference(self) -> float:
        """CE_model - CE_rule (wt%)."""
        return self.model - self.rule


def _elements(system) -> tuple[int, int, int]:
    """The indexes of Fe, C and Si in the system's elements (NotACastIron without them)."""
    els = list(system.elements)
    missing = [e for e in ("Fe", "C", "Si") if e not in els]
    if missing:
        raise NotACastIron(f"{system.name}: a cast iron's eutectic needs Fe, C and Si; "
                           f"the system has no {', '.join(missing)}")
    return els.index("Fe"), els.index("C"), els.index("Si")


def _mole_fractions(system, carbon_wt: float, silicon_wt: float) -> np.ndarray:
    fe, c, si = _elements(system)
    w = np.zeros(len(system.elements))
    w[c], w[si] = carbon_wt / 100.0, silicon_wt / 100.0
    w[fe] = 1.0 - w[c] - w[si]
    return mole_from_mass(w, system.molar_mass)


def _force(system, phase: str, T: float, carbon_wt: float, silicon_wt: float) -> float:
    """The driving force (J/mol of atoms) of `phase` against the liquid of that composition at T:
    positive where the liquid is not saturated with it."""
    mu = system.models[LIQUID].at(T).element_potentials(_mole_fractions(system, carbon_wt, silicon_wt))
    force = driving_force_at(system, T, mu, (phase,))
    if force is None:
        raise NotACastIron(f"{system.name}: the phase {phase} has no sampled model")
    return force


def _bisect(f, lo: float, hi: float, tolerance: float) -> float | None:
    """A root of f between lo and hi by bisection (None where f does not change sign there)."""
    f_lo, f_hi = f(lo), f(hi)
    if f_lo == 0.0:
        return lo
    if np.sign(f_lo) == np.sign(f_hi):
        return None
    while hi - lo > tolerance:
        mid = 0.5 * (lo + hi)
        f_mid = f(mid)
        if np.sign(f_mid) == np.sign(f_lo):
            lo, f_lo = mid, f_mid
        else:
            hi = mid
    return 0.5 * (lo + hi)


def _saturated_carbon(system, phase: str, T: float, silicon_wt: float) -> float | None:
    """The carbon content (wt%) of the liquid of silicon_wt wt% Si saturated with `phase` at T
    (None where none in the searched range)."""
    lo, hi = _CARBON_WT.get(phase, _CARBON_WT[GRAPHITE])
    return _bisect(lambda c: _force(system, phase, T, c, silicon_wt), lo, hi, _CARBON_TOLERANCE_WT)


def eutectic_of_silicon(system, silicon_wt: float, carbon_phase: str = GRAPHITE) -> IronEutectic:
    """The model's eutectic liquid of silicon_wt wt% Si: saturated with austenite and
    `carbon_phase` ("graphite", the stable eutectic, or "Fe3C", the metastable one). Raises
    NotACastIron where the system lacks a phase or no such liquid lies in the searched window."""
    _elements(system)
    for phase in (LIQUID, AUSTENITE, carbon_phase):
        if phase not in system.phases:
            raise NotACastIron(f"{system.name}: a cast iron's eutectic needs the phase {phase}, which this "
                               "system has not (or leaves out)")
    return _eutectic_cached(system, float(silicon_wt), carbon_phase)


@lru_cache(maxsize=64)
def _eutectic_cached(system, silicon_wt: float, carbon_phase: str) -> IronEutectic:
    def austenite_force(T: float) -> float:
        c = _saturated_carbon(system, carbon_phase, T, silicon_wt)
        if c is None:
            raise NotACastIron(f"{system.name}: no liquid of {silicon_wt:g} wt% Si saturated with {carbon_phase} "
                               f"at {T:.1f} K")
        return _force(system, AUSTENITE, T, c, silicon_wt)

    window = _WINDOW_K.get(carbon_phase, _WINDOW_K[GRAPHITE])
    lo_K, hi_K = max(window[0], system.model_range_K[0]), min(window[1], system.model_range_K[1])
    if _saturated_carbon(system, carbon_phase, hi_K, silicon_wt) is None:
        # the carbon-rich phase melts (cementite near 1500 K): the window ends where a liquid
        # saturated with it last exists, found by bisection
        lo_found = lo_K
        while hi_K - lo_found > _EDGE_TOLERANCE_K:
            mid = 0.5 * (lo_found + hi_K)
            if _saturated_carbon(system, carbon_phase, mid, silicon_wt) is None:
                hi_K = mid
            else:
                lo_found = mid
        hi_K = lo_found
    T = _bisect(austenite_force, lo_K, hi_K, _TEMPERATURE_TOLERANCE_K)
    if T is None:
        raise NotACastIron(f"{system.name}: no eutectic of austenite and {carbon_phase} at {silicon_wt:g} wt% Si "
                           f"between {lo_K:.0f} and {hi_K:.0f} K")
    carbon = _saturated_carbon(system, carbon_phase, T, silicon_wt)
    others = [p for p in system.phases if p not in (LIQUID, AUSTENITE, GRAPHITE, CEMENTITE)]
    overtaken = tuple(p for p in others if (_force(system, p, T, carbon, silicon_wt) < -_OVERTAKEN_J))
    return IronEutectic(carbon_phase, silicon_wt, T, float(carbon), overtaken)


def carbon_equivalent(system, carbon_wt: float, silicon_wt: float) -> CarbonEquivalent:
    """The iron's carbon equivalent from the model, CE_model = %C + (C_E(0) - C_E(%Si)), beside
    the foundry rule's CE = %C + %Si/3, with the graphite eutectics they rest on (wt%, K)."""
    at_silicon = eutectic_of_silicon(system, silicon_wt, GRAPHITE)
    binary = eutectic_of_silicon(system, 0.0, GRAPHITE)
    model = carbon_wt + (binary.carbon_wt - at_silicon.carbon_wt)
    rule = carbon_wt + silicon_wt / RULE_SILICON_DIVISOR
    return CarbonEquivalent(carbon_wt, silicon_wt, model, rule, at_silicon, binary)
