"""The explorer's model for a system of three or more elements: the isopleth through one alloy,
the element that varies along it, and the cursor on it.

Plain Python (no screen code). The alloy is held as fractions of every element in mole fractions
(the at% basis); the balance is the system's first element; one other element varies along the
section, from 0 to SECTION_SHARE (or less, where the other elements, or the range the model
covers, leave less room). The
cursor is a position u along the section (0 at its start, 1 at its end) and a temperature (K).
Every thermodynamic answer comes from the engine: the isopleth (ladle.engine.diagrams.isopleth)
and the point equilibrium at the cursor.
"""

from __future__ import annotations

from dataclasses import dataclass

import numpy as np

from ladle.engine import equilibrate
from ladle.engine.diagrams.isopleth import Isopleth, map_isopleth
from ladle.engine.diagrams.isothermal import IsothermalSection, map_isothermal
from ladle.engine.units import kelvin_to, mass_from_mole
from ladle.tui.quote import percent

from .entry import TypedPoint

#: The varying element runs from 0 to this mole fraction (less where the others leave less).
SECTION_SHARE = 0.5
#: Each element but the balance starts at this mole fraction.
OPENING_SHARE = 0.05
#: Arrow keys move the cursor by this share of the section and of the temperature window.
STEP_SHARE = 1.0 / 50.0

Line = tuple[str, str]


@dataclass(frozen=True)
class SectionCursor:
    """A position on the isopleth: u along it (0-1) and the temperature (K)."""

    u: float
    temperature_K: float


class SectionExploration:
    """One system of three or more elements, the alloy, the varying element and the cursor."""

    def __init__(self, system, alloy: np.ndarray | None = None, varying: int = 1,
                 temperature_K: float | None = None) -> None:
        self.system = system
        n = len(system.elements)
        if alloy is None:   # OPENING_SHARE of each, or the middle of its range where the model covers less
            ranges = system.element_ranges
            alloy = np.where((ranges[:, 0] <= OPENING_SHARE) & (OPENING_SHARE <= ranges[:, 1]),
                             OPENING_SHARE, ranges.mean(axis=1))
            alloy[0] = 1.0 - alloy[1:].sum()
        self.alloy = np.asarray(alloy, dtype=float)
        self.varying = varying
        self.T_low, self.T_high = system.temperature_range_K
        T = 0.5 * (self.T_low + self.T_high) if temperature_K is None else temperature_K
        self.cursor = SectionCursor(self._u_of(self.alloy[varying]), min(max(T, self.T_low), self.T_high))
        self.isopleth: Isopleth | None = None
        self.view = "isopleth"     # "triangle": a ternary's isothermal section at the cursor's temperature;
        self.triangle: IsothermalSection | None = None   # "cooling": both freezing paths of the cursor's alloy
        self.freezing: dict[tuple[float, ...], object] = {}   # the cursor's alloy -> its AlloySolidification

    # -- the section ------------------------------------------------------------------------
    @property
    def element(self) -> str:
        """The element that varies along the section."""
        return self.system.elements[self.varying]

    def _span(self, alloy: np.ndarray | None = None) -> tuple[float, float]:
        """The varying element's smallest and largest mole fraction on the section through
        `alloy` (default: the current one): from 0 to SECTION_SHARE, less where the other
        elements leave less room, and within the range the model covers (the balance's too)."""
        alloy = self.alloy if alloy is None else alloy
        others = sum(v for i, v in enumerate(alloy) if i not in (0, self.varying))
        (lo, hi), (balance_lo, balance_hi) = self.system.element_ranges[[self.varying, 0]]
        return (max(0.0, lo, 1.0 - others - balance_hi),
                min(SECTION_SHARE, 1.0 - others, hi, 1.0 - others - balance_lo))

    def _top(self, alloy: np.ndarray | None = None) -> float:
        """The varying element's largest mole fraction on the section through `alloy`."""
        return self._span(alloy)[1]

    def _u_of(self, fraction: float) -> float:
        bottom, top = self._span()
        return min(max((fraction - bottom) / (top - bottom), 0.0), 1.0)

    def ends(self) -> tuple[tuple[float, ...], tuple[float, ...]]:
        """Mole fractions of every element at the start (u = 0) and end (u = 1) of the section."""
        start, end = self.alloy.copy(), self.alloy.copy()
        start[self.varying], end[self.varying] = self._span()
        start[0] = end[0] = 0.0
        start[0], end[0] = 1.0 - start.sum(), 1.0 - end.sum()
        return tuple(float(v) for v in start), tuple(float(v) for v in end)

    def section_key(self) -> tuple:
        """What the mapped isopleth depends on."""
        return (id(self.system), self.ends(), self.element)

    def map(self) -> Isopleth:
        """The isopleth of this section (slow: run it in a worker)."""
        start, end = self.ends()
        return map_isopleth(self.system, start, end, "at", self.element, (self.T_low, self.T_high))

    def map_triangle(self) -> tuple[float, IsothermalSection]:
        """(temperature K, the ternary's isothermal section there) at the cursor (slow: run it in
        a worker)."""
        T = self.cursor.temperature_K
        return T, map_isothermal(self.system, T)

    def switch_view(self, view: str) -> None:
        """Show `view` ("triangle": ternaries only; "cooling"), or the isopleth again where it
        shows already."""
        if view == "triangle" and len(self.system.elements) != 3:
            return
        self.view = "isopleth" if self.view == view else view

    def alloy_key(self) -> tuple[float, ...]:
        """The cursor's alloy, as the key of its freezing paths."""
        return tuple(float(v) for v in self.x_at_cursor())

    def freeze(self) -> tuple[tuple[float, ...], object]:
        """(the cursor's alloy, its equilibrium and Scheil paths) (slow: run it in a worker)."""
        from ladle.engine.solidify.alloy_paths import solidify_alloy

        key = self.alloy_key()
        return key, solidify_alloy(self.system, np.array(key))

    def freezing_lines(self, unit: str, unit_text: str) -> list[Line]:
        """The cursor's alloy's liquidus, the end of freezing by both paths and the structure at
        the end (mass %), or a note while they are computed."""
        from ladle.tui.cooling_text import PATH_NAMES, structure_rows

        result = self.freezing.get(self.alloy_key())
        lines: list[Line] = [("heading", "FREEZING")]
        if result is None:
            return lines + [("note", " computing ...")]
        if isinstance(result, str):
            return lines + [("warning", f" {result}")]
        lines.append(("value", f" liquidus {kelvin_to(result.equilibrium.liquidus_K, unit):.1f} {unit_text}"))
        for model, name in PATH_NAMES.items():
            path = result.path(model)
            end = "liquid left" if path.end_K is None else f"{kelvin_to(path.end_K, unit):.1f} {unit_text}"
            lines.append(("value", f" {name} end {end}"))
            lines.append(("note", f"   ({path.end})"))
        lines += [("heading", "STRUCTURE, mass %"), ("note", " equilibrium / Scheil")]
        for name, fractions in structure_rows(result):
            shown = " / ".join("-" if f is None else percent(f) for f in fractions)
            lines.append(("note", f" {name}: {shown}"))
        return lines

    def x_at_cursor(self) -> np.ndarray:
        """Mole fractions of every element at the cursor."""
        start, end = (np.array(v) for v in self.ends())
        return start + self.cursor.u * (end - start)

    # -- moves ------------------------------------------------------------------------------
    def move(self, columns: int, rows: int) -> None:
        """Move the cursor by whole steps along the section (columns) and in temperature (rows,
        positive up), within the section and the window."""
        u = min(max(self.cursor.u + columns * STEP_SHARE, 0.0), 1.0)
        T = self.cursor.temperature_K + rows * STEP_SHARE * (self.T_high - self.T_low)
        self.cursor = SectionCursor(u, min(max(T, self.T_low), self.T_high))
        self.alloy = self.x_at_cursor()

    def vary_next(self) -> None:
        """Let the next element (after the balance, in the system's order) vary; the cursor
        keeps its alloy."""
        self.alloy = self.x_at_cursor()
        n = len(self.system.elements)
        self.varying = self.varying % (n - 1) + 1
        self.cursor = SectionCursor(self._u_of(self.alloy[self.varying]), self.cursor.temperature_K)
        self.isopleth = None

    def jump(self, point: TypedPoint) -> None:
        """Go to a typed alloy and/or temperature (K)."""
        if point.mole_fractions is not None:
            x = np.asarray(point.mole_fractions, dtype=float)
            if not self.system.covered(x):
                raise ValueError(f"that alloy lies outside the range this model covers "
                                 f"({self.system.covered_range_text()})")
            if x[self.varying] > self._top(x):
                raise ValueError(f"{self.element} {percent(x[self.varying])} at% lies beyond this section's "
                                 f"{percent(self._top(x))} at%")
            self.alloy = x
            self.isopleth = None
        T = self.cursor.temperature_K if point.temperature_K is None else point.temperature_K
        if not self.T_low <= T <= self.T_high:
            raise ValueError(f"{T:.1f} K is outside this system's window, {self.T_low:.0f}-{self.T_high:.0f} K")
        self.cursor = SectionCursor(self._u_of(self.alloy[self.varying]), T)

    def saved(self) -> None:
        """Nothing is remembered of a section between runs (the remembered point is a binary's)."""
        return None

    # -- the status pane ---------------------------------------------------------------------
    def equilibrium(self):
        """The point equilibrium at the cursor."""
        return equilibrate(self.system, self.cursor.temperature_K, self.x_at_cursor())

    def status_lines(self, eq, unit: str, unit_text: str, phases: bool = True) -> list[Line]:
        """The cursor's temperature in `unit` ("C", "K" or "F", written `unit_text`), the alloy
        (every element, at% and wt%), and every phase of `eq` (the point equilibrium at the
        cursor, None while it is computed) with its amount and the content of every element
        (left out with `phases` False)."""
        els = self.system.elements
        x = self.x_at_cursor()
        w = mass_from_mole(x, self.system.molar_mass)
        T = self.cursor.temperature_K
        lines: list[Line] = [("heading", "POINT"),
                             ("value", f" {kelvin_to(T, unit):.1f} {unit_text}" + ("" if unit == "K" else f"  ({T:.1f} K)"))]
        lines += [("value", f" {el} {percent(x[i])} at% ({percent(w[i])} wt%)") for i, el in enumerate(els)]
        if not phases:
            return lines
        lines.append(("heading", "PHASES, mol % and at%"))
        if eq is None:
            lines.append(("note", " computing ..."))
            return lines
        for p in eq.phases:
            lines.append(("value", f" {p.name} {percent(p.amount_mol)} mol%"))
            lines.append(("note", "   " + " ".join(f"{el} {percent(p.x[i])}" for i, el in enumerate(els))))
        if not eq.converged:
            lines.append(("warning", " did not converge: treat with suspicion"))
        return lines
