"""The System: one alloy system (two or more elements) as loaded from its file."""

from __future__ import annotations

from dataclasses import dataclass, field, replace
from functools import cached_property
from pathlib import Path

import numpy as np

from .phases import CompoundPhase, Phase, SolutionPhase
from .pure import melting_point
from .sublattice import SublatticePhase


@dataclass(frozen=True)
class Fact:
    """One measured fact of a system file (`[[check]]` or `[[measured]]`), validated.

    `temperature_K` and `x_B` (mole fraction of B) are None where the kind does not use them;
    `phase_x_B` holds (phase, x_B) pairs of an invariant, in the file's order (a phase may occur twice);
    `enthalpy_J_per_mol` is the measured enthalpy of the calorimetric kinds (J per mole of atoms);
    `ratio` is the measured equilibrium distribution coefficient k (dimensionless) of the
    distribution_coefficient kind, whose `element` is the dilute solute and `phase` the solid;
    `spread` is the tolerance (checks) or standard uncertainty (measurements): keys "K", "J"
    (J/mol) and "at" (at%), or per-phase at% under "at:<phase>"; "factor" (or "factor:<phase>") a
    relative composition tolerance, and "at_most" (1.0) where the composition is an upper limit.
    In a system of three or more elements `x` holds the fact's composition (mole fractions of
    every element) instead of `x_B`, and `phase_x` an invariant's phases with their mole
    fractions (None where the fact gives none) instead of `phase_x_B`.
    """

    kind: str
    source: str
    temperature_K: float | None = None
    x_B: float | None = None
    element: str | None = None
    reaction: str | None = None
    phase: str | None = None
    partner: str | None = None
    phase_x_B: tuple[tuple[str, float], ...] = ()
    enthalpy_J_per_mol: float | None = None
    ratio: float | None = None
    spread: dict[str, float] = field(default_factory=dict)
    index: int = 0
    x: tuple[float, ...] | None = None
    phase_x: tuple[tuple[str, tuple[float, ...] | None], ...] = ()


@dataclass(eq=False)
class System:
    """An alloy system: its elements (two or more), molar masses (g/mol) and phase models.

    `phases` holds each phase in the form today's binary engine evaluates where one exists (a
    binary's substitutional solutions as SolutionPhase, compounds as CompoundPhase) and as the
    general SublatticePhase otherwise; `models` holds every phase in the general form, built
    from the same parsed parameters.
    `covers` is the range of x_B (mole fraction; binaries) and `covers_K` the range of
    temperature (K) the model is meant for; `covers_elements` the range of mole fraction of each
    element it names (systems of three or more elements; an element not named may take any).
    `fit_covers` is the range of x_B a binary's fit draws its measured facts from, where the file
    gives `[fit] facts_at_percent` (None: the covered range). `built_from` lists the files its
    model was built from besides `path` (`builds_on`, and what those build on).
    """

    name: str
    path: Path
    elements: tuple[str, ...]
    molar_mass: np.ndarray
    source: str
    phases: dict[str, Phase | SublatticePhase]
    models: dict[str, SublatticePhase]
    title: str = ""
    safety: str = ""
    notes: str = ""
    covers: tuple[float, float] = (0.0, 1.0)
    covers_K: tuple[float, float] = (0.0, float("inf"))
    covers_elements: dict[str, tuple[float, float]] = field(default_factory=dict)
    declared_temperature_range_K: tuple[float, float] | None = None
    checks: list[Fact] = field(default_factory=list)
    measured: list[Fact] = field(default_factory=list)
    fit_free: list[str] = field(default_factory=list)
    fit_covers: tuple[float, float] | None = None
    alloys: tuple = ()
    document: dict = field(default_factory=dict, repr=False)
    built_from: tuple[Path, ...] = ()

    @property
    def solutions(self) -> dict[str, SolutionPhase]:
        return {n: p for n, p in self.phases.items() if isinstance(p, SolutionPhase)}

    @property
    def compounds(self) -> dict[str, CompoundPhase]:
        return {n: p for n, p in self.phases.items() if isinstance(p, CompoundPhase)}

    def without(self, names) -> "System":
        """A new System lacking the phases `names` (metastable equilibria). Raises ValueError
        naming an unknown phase, or when no phase would be left."""
        names = [names] if isinstance(names, str) else list(names)
        for n in names:
            if n not in self.phases:
                raise ValueError(f"{self.name}: no phase named {n!r}; its phases are {', '.join(self.phases)}")
        kept = [n for n in self.phases if n not in names]
        if not kept:
            raise ValueError(f"{self.name}: leaving out {', '.join(names)} leaves no phase")
        return replace(self, phases={n: self.phases[n] for n in kept}, models={n: self.models[n] for n in kept})

    @property
    def element_ranges(self) -> np.ndarray:
        """(N, 2): the lowest and highest mole fraction of each element (the system's order)
        that the model covers; a binary's from `covers`."""
        if len(self.elements) == 2:
            lo, hi = self.covers
            return np.array([[1.0 - hi, 1.0 - lo], [lo, hi]])
        return np.array([self.covers_elements.get(el, (0.0, 1.0)) for el in self.elements])

    def covered(self, x) -> np.ndarray | bool:
        """Whether the model covers each composition of `x` (mole fractions in the system's
        order: shape (N,) gives a bool, (k, N) an array of k)."""
        x = np.asarray(x, dtype=float)
        r = self.element_ranges
        inside = (x >= r[:, 0] - 1e-12) & (x <= r[:, 1] + 1e-12)
        return bool(inside.all()) if x.ndim == 1 else inside.all(axis=-1)

    def covered_range_text(self) -> str:
        """'Ag 0-5.5 at%, Cu 0-3.7 at%': the ranges of a system of three or more elements that
        names them (at%), else ''."""
        return ", ".join(f"{el} {100 * lo:g}-{100 * hi:g} at%" for el, (lo, hi) in self.covers_elements.items())

    @cached_property
    def model_range_K(self) -> tuple[float, float]:
        """Temperatures (K) where every phase of the system is defined."""
        ranges = [p.valid_range_K() for p in self.phases.values()]
        return max(1.0, max(r[0] for r in ranges)), min(r[1] for r in ranges)

    @cached_property
    def melting_points(self) -> dict[str, float | None]:
        """Melting temperature (K) of each pure element in this system (None if it does not melt in range)."""
        lo, hi = self.model_range_K
        hi = min(hi, 6000.0)
        return {el: melting_point(self.phases, i, el, max(lo, 10.0), hi) for i, el in enumerate(self.elements)}

    @cached_property
    def temperature_range_K(self) -> tuple[float, float]:
        """The window (K) diagrams are mapped over: declared in the file, or from the melting
        points; never outside the temperatures the model covers."""
        c_lo, c_hi = self.covers_K
        if self.declared_temperature_range_K is not None:
            lo, hi = self.declared_temperature_range_K
        else:
            melts = [t for t in self.melting_points.values() if t]
            m_lo, m_hi = self.model_range_K
            lo, hi = (max(m_lo, 300.0), min(m_hi, 2000.0)) if not melts else \
                (max(m_lo, 0.6 * min(melts)), min(m_hi, 1.15 * max(melts)))
        return max(lo, c_lo), min(hi, c_hi)
