"""Point equilibrium: the stable phases of an alloy at one temperature and overall composition."""

from __future__ import annotations

import threading
from collections import OrderedDict
from dataclasses import dataclass

import numpy as np

from .section import Section
from ..units import mass_from_mole

_SECTION_CACHE_SIZE = 64


@dataclass(frozen=True)
class PhaseShare:
    """One stable phase: its composition (mole and mass fractions, per element) and its amount
    (mole fraction of the alloy's atoms, and mass fraction of the alloy)."""

    name: str
    x: np.ndarray
    w: np.ndarray
    amount_mol: float
    amount_mass: float


@dataclass(frozen=True)
class PointEquilibrium:
    """The global-minimum state of an alloy at temperature_K (K) and composition x (mole fractions).

    `gibbs_J_per_mol` is the alloy's molar Gibbs energy; `chemical_potentials` holds mu of each
    element in J/mol (NaN where undefined: the absent element of a pure metal, or at a compound's
    exact composition); `converged` says whether every Newton solve met its tolerance.
    """

    temperature_K: float
    x: np.ndarray
    w: np.ndarray
    phases: tuple[PhaseShare, ...]
    gibbs_J_per_mol: float
    chemical_potentials: np.ndarray
    converged: bool

    @property
    def phase_names(self) -> tuple[str, ...]:
        return tuple(p.name for p in self.phases)

    def to_json(self, system) -> dict:
        """The JSON object of `ladle point --json`."""
        els = system.elements

        def per_element(v: np.ndarray) -> dict:
            return {el: float(v[i]) for i, el in enumerate(els)}

        mu = {el: (None if np.isnan(self.chemical_potentials[i]) else float(self.chemical_potentials[i]))
              for i, el in enumerate(els)}
        return {
            "system": system.name,
            "temperature_K": self.temperature_K,
            "mole_fraction": per_element(self.x),
            "mass_fraction": per_element(self.w),
            "phases": [
                {"name": p.name, "phase_fraction_mol": p.amount_mol, "phase_fraction_mass": p.amount_mass,
                 "mole_fraction": per_element(p.x), "mass_fraction": per_element(p.w)}
                for p in self.phases
            ],
            "gibbs_energy_J_per_mol": self.gibbs_J_per_mol,
            "chemical_potential_J_per_mol": mu,
            "converged": self.converged,
        }


class SectionCache:
    """Recently used isothermal sections, per system and temperature (K). Safe to share between
    threads (the explorer computes in worker threads); sections are built outside the lock."""

    def __init__(self, size: int = _SECTION_CACHE_SIZE) -> None:
        self.size = size
        self._items: OrderedDict[tuple[int, float], Section] = OrderedDict()
        self._lock = threading.Lock()

    def get(self, system, T: float) -> Section:
        key = (id(system), float(T))
        with self._lock:
            sec = self._items.get(key)
            if sec is not None and sec.system is system:
                self._items.move_to_end(key)
                return sec
        sec = Section(system, T)
        with self._lock:
            self._items[key] = sec
            if len(self._items) > self.size:
                self._items.popitem(last=False)
        return sec


_sections = SectionCache()


def section_at(system, T: float) -> Section:
    """The isothermal section of `system` at T (K), cached."""
    return _sections.get(system, T)


def equilibrate(system, temperature_K: float, x_B: float, x_A: float | None = None) -> PointEquilibrium:
    """Global-minimum equilibrium of `system` at temperature_K (K) and mole fraction x_B of B.

    `x_A` may be given separately (default 1 - x_B) to keep digits near pure B. Raises
    ValueError for a composition outside [0, 1] and TemperatureOutOfRange outside the models.
    """
    if not 0.0 <= x_B <= 1.0:
        raise ValueError(f"mole fraction {x_B!r} is outside 0-1")
    if temperature_K <= 0:
        raise ValueError("temperature must be above 0 K")
    xa0 = 1.0 - x_B if x_A is None else x_A
    state = section_at(system, temperature_K).state_at(float(xa0), float(x_B))
    M = system.molar_mass
    x = np.array([xa0, x_B])
    w = mass_from_mole(x, M)
    m_alloy = float(x @ M)
    shares = []
    for name, (pa, pb), amount in state.phases:
        px = np.array([pa, pb])
        shares.append(PhaseShare(name, px, mass_from_mole(px, M), float(amount), float(amount * (px @ M) / m_alloy)))
    mu = np.array([np.nan if v is None else v for v in state.mu])
    return PointEquilibrium(float(temperature_K), x, w, tuple(shares), float(state.gibbs), mu, state.converged)
