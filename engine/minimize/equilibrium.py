"""Point equilibrium: the stable phases of an alloy at one temperature and overall composition.

`equilibrate` is the public entry for any number of elements. One engine: a binary whose phases
are all substitutional solutions or compounds takes the cached binary section (`section`) as an
internal shortcut; every other system goes to the general minimiser (`global_minimum`). Both give
the same `PointEquilibrium` (and agree to 1e-9 in composition on binaries; a test compares them).
Units: K, J per mole of atoms, mole and mass fractions.
"""

from __future__ import annotations

import math
import threading
import weakref
from collections import OrderedDict
from dataclasses import dataclass
from functools import partial
from typing import Callable

import numpy as np

from .global_minimum import global_minimum
from .section import LocalState, PhasesAtT, Section, per_system
from ..models.phases import CompoundPhase, SolutionAtT, SolutionPhase
from ..units import mass_from_mole

_SECTION_CACHE_SIZE = 64


@dataclass(frozen=True)
class PhaseShare:
    """One stable phase (one composition set where a phase splits in a miscibility gap): its
    composition (mole and mass fractions, per element), its amount (mole fraction of the alloy's
    atoms, and mass fraction of the alloy) and its site fractions, one array per sublattice in
    the order of the phase's constituents (a substitutional solution: the mole fractions)."""

    name: str
    x: np.ndarray
    w: np.ndarray
    amount_mol: float
    amount_mass: float
    site_fractions: tuple[np.ndarray, ...] = ()


class PointEquilibrium:
    """The global-minimum state of an alloy at temperature_K (K) and composition x (mole fractions).

    `gibbs_J_per_mol` is the alloy's molar Gibbs energy, `gibbs_dT_J_per_mol_K` its temperature
    derivative at fixed composition (-S, J/(mol K)) and `enthalpy_J_per_mol` H = G - T dG/dT;
    `chemical_potentials` holds mu of each element in J/mol (NaN where undefined: an element
    absent from the alloy, or at a compound's exact composition); `converged` says whether every
    Newton solve met its tolerance; `w` the alloy's mass fractions and `phases` its stable phases
    (`PhaseShare`). Read-only. The binary shortcut leaves `w`, `phases`, dG/dT and H to be
    computed on first access (`deferred`): most callers of a point read only some of them.
    """

    __slots__ = ("_T", "_x", "_w", "_phases", "_names", "_gibbs", "_mu", "_converged", "_gibbs_dT", "_enthalpy",
                 "_details")

    def __init__(self, temperature_K: float, x: np.ndarray, w: np.ndarray, phases: tuple[PhaseShare, ...],
                 gibbs_J_per_mol: float, chemical_potentials: np.ndarray, converged: bool,
                 gibbs_dT_J_per_mol_K: float = math.nan, enthalpy_J_per_mol: float = math.nan) -> None:
        self._T, self._x, self._w, self._phases = temperature_K, x, w, phases
        self._names = tuple([p.name for p in phases])
        self._gibbs, self._mu, self._converged = gibbs_J_per_mol, chemical_potentials, converged
        self._gibbs_dT, self._enthalpy = gibbs_dT_J_per_mol_K, enthalpy_J_per_mol
        self._details = None

    @classmethod
    def deferred(cls, temperature_K: float, x: np.ndarray, names: tuple[str, ...], gibbs_J_per_mol: float,
                 chemical_potentials: np.ndarray, converged: bool,
                 details: Callable[[], tuple[np.ndarray, tuple[PhaseShare, ...], float]]) -> "PointEquilibrium":
        """An answer whose mass fractions, phases and dG/dT (J/(mol K)) `details()` gives on first
        access (H follows from dG/dT); `names` are the phases' names in the order it gives them."""
        self = cls.__new__(cls)
        self._T, self._x, self._names = temperature_K, x, names
        self._gibbs, self._mu, self._converged = gibbs_J_per_mol, chemical_potentials, converged
        self._details = details
        return self

    def _resolve(self) -> None:
        details = self._details
        if details is not None:
            self._w, self._phases, self._gibbs_dT = details()
            self._enthalpy = self._gibbs - self._T * self._gibbs_dT
            self._details = None

    @property
    def temperature_K(self) -> float:
        return self._T

    @property
    def x(self) -> np.ndarray:
        return self._x

    @property
    def w(self) -> np.ndarray:
        self._resolve()
        return self._w

    @property
    def phases(self) -> tuple[PhaseShare, ...]:
        self._resolve()
        return self._phases

    @property
    def gibbs_J_per_mol(self) -> float:
        return self._gibbs

    @property
    def chemical_potentials(self) -> np.ndarray:
        return self._mu

    @property
    def converged(self) -> bool:
        return self._converged

    @property
    def gibbs_dT_J_per_mol_K(self) -> float:
        self._resolve()
        return self._gibbs_dT

    @property
    def enthalpy_J_per_mol(self) -> float:
        self._resolve()
        return self._enthalpy

    @property
    def phase_names(self) -> tuple[str, ...]:
        return self._names

    def to_json(self, system) -> dict:
        """The JSON object of `ladle point --json`."""
        els = system.elements

        def per_element(v: np.ndarray) -> dict:
            return {el: float(v[i]) for i, el in enumerate(els)}

        def number(v: float) -> float | None:
            return None if not math.isfinite(v) else float(v)

        mu = {el: number(self.chemical_potentials[i]) for i, el in enumerate(els)}
        return {
            "system": system.name,
            "temperature_K": self.temperature_K,
            "mole_fraction": per_element(self.x),
            "mass_fraction": per_element(self.w),
            "phases": [
                {"name": p.name, "phase_fraction_mol": p.amount_mol, "phase_fraction_mass": p.amount_mass,
                 "mole_fraction": per_element(p.x), "mass_fraction": per_element(p.w),
                 "site_fractions": [[float(v) for v in lattice] for lattice in p.site_fractions]}
                for p in self.phases
            ],
            "gibbs_energy_J_per_mol": self.gibbs_J_per_mol,
            "enthalpy_J_per_mol": number(self.enthalpy_J_per_mol),
            "gibbs_energy_dT_J_per_mol_K": number(self.gibbs_dT_J_per_mol_K),
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


def _composition(system, composition, x_A: float | None) -> np.ndarray:
    """The overall mole fractions as an array (a float is a binary's x_B). Raises ValueError with one line for a composition of the wrong length, a negative or
    non-finite fraction, or fractions that do not sum to 1."""
    n = len(system.elements)
    if isinstance(composition, (float, int)) or np.ndim(composition) == 0:
        x_B = float(composition)
        if n != 2:
            raise ValueError(f"{system.name} has {n} elements; give a mole fraction for each of {', '.join(system.elements)}")
        if not 0.0 <= x_B <= 1.0:
            raise ValueError(f"mole fraction {composition!r} is outside 0-1")
        return np.array([1.0 - x_B if x_A is None else float(x_A), x_B])
    z = np.asarray(composition, dtype=float)
    if z.shape != (n,):
        raise ValueError(f"expected {n} mole fractions ({', '.join(system.elements)}), got {np.size(z)}")
    if not np.all(np.isfinite(z)) or np.any(z < 0.0):
        raise ValueError("mole fractions must be finite and not negative")
    if abs(float(z.sum()) - 1.0) > 1e-9:
        raise ValueError(f"mole fractions sum to {float(z.sum()):.12g}, expected 1")
    return z


#: Whether each system takes the binary shortcut (systems are not changed in place).
_shortcut: "weakref.WeakKeyDictionary[object, bool]" = weakref.WeakKeyDictionary()


def _binary_shortcut(system) -> bool:
    """True for a binary of substitutional solutions and compounds (today's fast binary path)."""
    return per_system(_shortcut, system, lambda s: len(s.elements) == 2 and all(
        isinstance(p, (SolutionPhase, CompoundPhase)) for p in s.phases.values()))


def equilibrate(system, temperature_K: float, composition, x_A: float | None = None,
                near: PointEquilibrium | None = None) -> PointEquilibrium:
    """Global-minimum equilibrium of `system` at temperature_K (K) and overall `composition`:
    a float (the mole fraction x_B of a binary; `x_A` may be given separately, default 1 - x_B,
    to keep digits near pure B) or the mole fractions of every element (summing to 1).

    `near` may be the answer at a nearby composition or temperature (neighbouring points of a
    section, the last step of a path): the general minimiser starts from its phases, which is
    several times cheaper; the answer is checked the same way (every phase's samples against its
    chemical potentials, the full sampled start where one lies below). The binary shortcut
    ignores it.

    Raises ValueError for a composition outside the composition simplex or a temperature at or
    below 0 K, and TemperatureOutOfRange outside the models.
    """
    if not temperature_K > 0:
        raise ValueError("temperature must be above 0 K")
    z = _composition(system, composition, x_A)
    if _binary_shortcut(system):
        return _binary_equilibrium(system, float(temperature_K), z)
    return general_equilibrium(system, temperature_K, z, near)


def _binary_equilibrium(system, T: float, z: np.ndarray) -> PointEquilibrium:
    """The binary shortcut: the cached isothermal section of the binary engine. Phases, mass
    fractions and dG/dT are left to first access (`_binary_details`)."""
    sec = section_at(system, T)
    za, zb = z.tolist()
    state = sec.state_at(za, zb)
    mu_a, mu_b = state.mu
    mu = np.array((math.nan if mu_a is None else mu_a, math.nan if mu_b is None else mu_b))
    names = tuple([name for name, _x, _amount in state.phases])
    return PointEquilibrium.deferred(T, z, names, float(state.gibbs), mu, state.converged,
                                     partial(_binary_details, system, T, za, zb, state, sec.phases_at_T))


def _binary_details(system, T: float, za: float, zb: float, state: LocalState,
                    phases_at_T: PhasesAtT) -> tuple[np.ndarray, tuple[PhaseShare, ...], float]:
    """The alloy's mass fractions, its phase shares and dG/dT (J/(mol K)) of a binary state at
    T (K): `phases_at_T` holds the section's phases (`Section.phases_at_T`). Mass fractions are
    computed in Python floats (two elements: cheaper than numpy on two-element arrays)."""
    ma, mb = system.molar_mass.tolist()
    m_alloy = za * ma + zb * mb
    shares = []
    gibbs_dT = 0.0
    for name, (pa, pb), amount in state.phases:
        phase = phases_at_T.phase(name)
        solution = isinstance(phase, SolutionAtT)
        gibbs_dT += amount * (float(phase.gibbs_dT(pa, pb)) if solution else phase.gibbs_dT(T))
        px = np.array((pa, pb))
        sites = (px,) if solution else _compound_sites(system, name)
        m_sum = pa * ma + pb * mb            # the same sum as m_alloy: a single phase's share is exactly 1
        shares.append(PhaseShare(name, px, np.array((pa * ma / m_sum, pb * mb / m_sum)), float(amount),
                                 float(amount * m_sum / m_alloy), sites))
    return np.array((za * ma / m_alloy, zb * mb / m_alloy)), tuple(shares), gibbs_dT


#: The site fractions of each compound's general form, per system (systems are not changed in place).
_sites: "weakref.WeakKeyDictionary[object, dict[str, tuple[np.ndarray, ...]]]" = weakref.WeakKeyDictionary()


def _compound_sites(system, name: str) -> tuple[np.ndarray, ...]:
    """The site fractions of a stoichiometric compound's general form: 1 for each constituent
    of each sublattice, one array per sublattice, remembered per system (read-only: every
    answer shares them)."""
    sites = per_system(_sites, system, lambda _s: {})
    found = sites.get(name)
    if found is None:
        model = getattr(system, "models", {}).get(name)
        found = sites[name] = tuple(np.ones(size) for size in (tuple(len(g) for g in model.groups) if model is not None else (1,)))
        for lattice in found:
            lattice.setflags(write=False)
    return found


def general_equilibrium(system, temperature_K: float, composition,
                        near: PointEquilibrium | None = None) -> PointEquilibrium:
    """The general minimiser on `system.models` (any number of elements, any phases), for any
    system: `equilibrate` calls it for everything but the binary shortcut; tests call it on
    binaries to compare the two paths. `composition`: mole fractions of every element; `near`:
    see `equilibrate`."""
    T = float(temperature_K)
    z = _composition(system, composition, None)
    models = {name: phase.at(T) for name, phase in system.models.items()}
    start = None
    if near is not None:
        start = ([(p.name, np.concatenate(p.site_fractions)) for p in near.phases], near.chemical_potentials)
    found = global_minimum(models, z, start)
    M = system.molar_mass
    m_alloy = float(z @ M)
    shares = []
    for p in found.phases:
        groups = models[p.name].groups
        shares.append(PhaseShare(p.name, p.x, mass_from_mole(p.x, M), float(p.amount),
                                 float(p.amount * (p.x @ M) / m_alloy), tuple(p.y[g] for g in groups)))
    return PointEquilibrium(T, z, mass_from_mole(z, M), tuple(shares), found.gibbs, found.mu, found.converged,
                            found.gibbs_dT, found.gibbs - T * found.gibbs_dT)
