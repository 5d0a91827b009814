"""The explorer's model for a system drawn as an isopleth: a system of three or more elements
(the isopleth through one alloy, the element that varies along it) or a binary with sublattice
phases (Fe-C: its whole diagram, an isopleth with nothing held), and the cursor on it.

Plain Python (no screen code). The alloy is held as fractions of every element in mole fractions;
the balance is the system's first element; one other element varies along the section, from 0 to
SECTION_SHARE (or less, where the other elements, or the range the model covers, leave less
room). The section is straight in its basis, which `toggle_basis` switches: in at% the other
elements keep their mole fractions, in wt% their mass fractions. A binary and a cast iron open in
wt% (as the trade reads Fe-C and Fe-C-Si), other systems of three or more elements in at%. The cursor is a position u along the section (0 at its start, 1 at
its end) and a temperature (K). Every thermodynamic answer comes from the engine: the isopleth
(ladle.engine.diagrams.isopleth) with the trade's names of its lines, the point equilibrium at
the cursor and, where the system's file names lines or a heat treatment, the cursor's alloy's
transitions (alloy_changes.py). Mapped isopleths are kept for the session (`MAPPED_KEPT`), so a
system opened again finds its picture ready.
"""

from __future__ import annotations

import re
import textwrap
from collections import OrderedDict
from dataclasses import dataclass

import numpy as np

from ladle.engine import equilibrate
from ladle.engine.diagrams.isopleth import (Isopleth, covered_range_words, map_isopleth, section_mole_fractions,
                                           trade_labels)
from ladle.engine.diagrams.isothermal import IsothermalSection, map_isothermal
from ladle.engine.files.trade_names import trade_names
from ladle.engine.units import kelvin_to, mass_from_mole, mole_from_mass
from ladle.tui.phase_names import constituent_trade_name, equilibrium_labels
from ladle.tui.quote import percent

from .alloy_changes import AlloyChanges, alloy_changes, shows_changes
from .cursor import SMALLEST_SPAN_K, SMALLEST_SPAN_X, ZOOM_FACTOR
from .entry import TypedPoint
from .readout import format_temperature_value
from .saved_state import SavedState
from .status_lines import WIDTH

#: The varying element runs from 0 to this mole fraction (less where the others leave less).
SECTION_SHARE = 0.5
#: Grid points over the varying element's mass fraction where a wt% section's covered stretch
#: is looked for (its ends are then bisected).
MASS_SPAN_SAMPLES = 201
#: Each element but the balance starts at this mole fraction.
OPENING_SHARE = 0.05
#: Arrow keys move the cursor by this share of the window shown (along the section and in
#: temperature).
STEP_SHARE = 1.0 / 50.0
#: Columns of composition of a binary's whole diagram (as `ladle diagram` maps it: a whole
#: diagram spans the file's range, wider than a section through one alloy).
WHOLE_BINARY_COLUMNS = 33
#: Mapped isopleths kept for the session (section key -> the isopleth and its lines' trade names).
MAPPED_KEPT = 8
#: Alloys whose transitions are kept.
CHANGES_KEPT = 64
_MAPPED: OrderedDict[tuple, tuple[Isopleth, tuple[str | None, ...]]] = OrderedDict()

Line = tuple[str, str]


@dataclass(frozen=True)
class SectionCursor:
    """A position on the isopleth: u along it (0-1) and the temperature (K)."""

    u: float
    temperature_K: float


@dataclass(frozen=True)
class SectionWindow:
    """The part of the isopleth shown: u from `u_low` to `u_high` (0-1 along the section) and
    temperatures from `T_low` to `T_high` (K)."""

    u_low: float
    u_high: float
    T_low: float
    T_high: float

    def following(self, cursor: SectionCursor) -> "SectionWindow":
        """The same window, moved the least that keeps `cursor` inside it."""
        du = min(0.0, cursor.u - self.u_low) + max(0.0, cursor.u - self.u_high)
        dT = min(0.0, cursor.temperature_K - self.T_low) + max(0.0, cursor.temperature_K - self.T_high)
        return SectionWindow(self.u_low + du, self.u_high + du, self.T_low + dT, self.T_high + dT)


class SectionExploration:
    """One system drawn as an isopleth, the alloy, the varying element and the cursor."""

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
        self.basis = "wt" if n == 2 or trade_names(system).cast_iron else "at"   # the section is straight in it
        self.T_low, self.T_high = system.temperature_range_K
        T = 0.5 * (self.T_low + self.T_high) if temperature_K is None else temperature_K
        self.cursor = SectionCursor(self._u_of(self.alloy), min(max(T, self.T_low), self.T_high))
        self.whole = SectionWindow(0.0, 1.0, self.T_low, self.T_high)
        self.window = self.whole           # the part of the isopleth shown (`+`, `-`, `0`)
        self.isopleth: Isopleth | None = None
        self.line_labels: tuple[str | None, ...] = ()   # the trade's name of each of its lines, or None
        self.view = "isopleth"     # "triangle": a ternary's isothermal section at the cursor's temperature;
        self.triangle: IsothermalSection | None = None   # "cooling": both freezing paths of the cursor's alloy
        self.freezing: dict[tuple[float, ...], object] = {}   # the cursor's alloy -> its AlloySolidification
        self.lists_changes = shows_changes(system)   # the status pane lists the alloy's transitions
        self.changes: OrderedDict[tuple[float, ...], AlloyChanges | str] = OrderedDict()   # alloy -> them, or why none

    # -- the section ------------------------------------------------------------------------
    @property
    def element(self) -> str:
        """The element that varies along the section."""
        return self.system.elements[self.varying]

    @property
    def is_binary(self) -> bool:
        """A binary's whole diagram (nothing held, one element to vary, no triangle)."""
        return len(self.system.elements) == 2

    @property
    def _holds_mass(self) -> bool:
        """Whether the held elements keep their mass fractions (a wt% section of three or more
        elements) rather than their mole fractions."""
        return self.basis == "wt" and not self.is_binary

    def _span(self, alloy: np.ndarray | None = None) -> tuple[float, float]:
        """The varying element's smallest and largest fraction in the section's basis (mass
        fractions where the held elements keep theirs, else mole fractions) on the section through
        `alloy` (mole fractions; default: the current one): from 0 to a mole fraction of
        SECTION_SHARE, less where the other elements leave less room, and within the range the
        model covers (the balance's too)."""
        alloy = self.alloy if alloy is None else alloy
        if self._holds_mass:
            return self._mass_span(mass_from_mole(alloy, self.system.molar_mass))
        others = sum(v for i, v in enumerate(alloy) if i not in (0, self.varying))
        (lo, hi), (balance_lo, balance_hi) = self.system.element_ranges[[self.varying, 0]]
        return (max(0.0, lo, 1.0 - others - balance_hi),
                min(SECTION_SHARE, 1.0 - others, hi, 1.0 - others - balance_lo))

    def _mass_section(self, w: np.ndarray, w_varying: np.ndarray) -> np.ndarray:
        """Mole fractions (k, N) of the alloys with mass fractions `w` but the varying element's
        set to each of `w_varying` (k,), the balance taking up the change."""
        ws = np.repeat(w[None, :], len(w_varying), axis=0)
        ws[:, self.varying] = w_varying
        ws[:, 0] = 0.0
        ws[:, 0] = 1.0 - ws.sum(axis=1)
        return mole_from_mass(ws, self.system.molar_mass)

    def _mass_span(self, w: np.ndarray) -> tuple[float, float]:
        """The stretch of the varying element's mass fraction, the others' held at `w`, where the
        alloy is covered and holds at most SECTION_SHARE of it by moles: the covered run of a
        MASS_SPAN_SAMPLES grid (and the alloy's own content) nearest the alloy, its ends bisected
        to 1e-12."""
        room = 1.0 - sum(v for i, v in enumerate(w) if i not in (0, self.varying))

        def inside(w_varying: np.ndarray) -> np.ndarray:
            x = self._mass_section(w, np.clip(w_varying, 0.0, room))
            return self.system.covered(x) & (x[:, self.varying] <= SECTION_SHARE + 1e-12)

        grid = np.union1d(np.linspace(0.0, room, MASS_SPAN_SAMPLES), [min(max(w[self.varying], 0.0), room)])
        ok = inside(grid)            # the alloy's own content is sampled: a stretch narrower than the grid is found
        if not ok.any():
            return float(w[self.varying]), float(w[self.varying])
        good = np.flatnonzero(ok)
        here = good[np.argmin(np.abs(grid[good] - w[self.varying]))]
        first, last = here, here
        while first > 0 and ok[first - 1]:
            first -= 1
        while last < len(grid) - 1 and ok[last + 1]:
            last += 1

        def edge(inner: float, outer: float) -> float:
            for _ in range(60):
                middle = 0.5 * (inner + outer)
                inner, outer = (middle, outer) if inside(np.array([middle]))[0] else (inner, middle)
                if abs(outer - inner) < 1e-12:
                    break
            return inner

        low = grid[first] if first == 0 else edge(grid[first], grid[first - 1])
        high = grid[last] if last == len(grid) - 1 else edge(grid[last], grid[last + 1])
        return float(low), float(high)

    def _top(self, alloy: np.ndarray | None = None) -> float:
        """The varying element's largest fraction (as `_span`) on the section through `alloy`."""
        return self._span(alloy)[1]

    def _u_of(self, alloy: np.ndarray) -> float:
        """Where `alloy` (mole fractions) lies along the section: its varying element's content
        in the section's basis, as a share of the section (0-1)."""
        content = self._in_basis(alloy)[self.varying]
        bottom, top = (self._in_basis(np.array(end))[self.varying] for end in self.ends())
        return min(max((content - bottom) / (top - bottom), 0.0), 1.0)

    def _in_basis(self, x: np.ndarray) -> np.ndarray:
        """Mole fractions `x` as fractions in the section's basis."""
        return mass_from_mole(x, self.system.molar_mass) if self.basis == "wt" else np.asarray(x, dtype=float)

    def ends(self) -> tuple[tuple[float, ...], tuple[float, ...]]:
        """Mole fractions of every element at the start (u = 0) and end (u = 1) of the section."""
        if self._holds_mass:
            w = mass_from_mole(self.alloy, self.system.molar_mass)
            start, end = self._mass_section(w, np.array(self._span()))
            return tuple(float(v) for v in start), tuple(float(v) for v in end)
        start, end = self.alloy.copy(), self.alloy.copy()
        start[self.varying], end[self.varying] = self._span()
        start[0] = end[0] = 0.0
        start[0], end[0] = 1.0 - start.sum(), 1.0 - end.sum()
        return tuple(float(v) for v in start), tuple(float(v) for v in end)

    def section_key(self) -> tuple:
        """What the mapped isopleth depends on."""
        return (id(self.system), self.ends(), self.element, self.basis)

    def map(self) -> tuple[Isopleth, tuple[str | None, ...]]:
        """The isopleth of this section and the trade's name of each of its lines (None where
        the file names none) (slow: run it in a worker, then `keep` the answer)."""
        start, end = (tuple(float(v) for v in self._in_basis(np.array(x))) for x in self.ends())
        columns = {"columns": WHOLE_BINARY_COLUMNS} if self.is_binary else {}
        iso = map_isopleth(self.system, start, end, self.basis, self.element, (self.T_low, self.T_high), **columns)
        return iso, tuple(trade_labels(iso, trade_names(self.system)))

    def keep(self, key: tuple, mapped: tuple[Isopleth, tuple[str | None, ...]]) -> None:
        """Remember a mapped isopleth for the session (the newest MAPPED_KEPT) and show it where
        `key` is still this section's."""
        _MAPPED[key] = mapped
        _MAPPED.move_to_end(key)
        while len(_MAPPED) > MAPPED_KEPT:
            _MAPPED.popitem(last=False)
        if key == self.section_key():
            self.isopleth, self.line_labels = mapped

    def recall(self) -> bool:
        """Show this section's isopleth where it was mapped before in this session; whether it
        was."""
        mapped = _MAPPED.get(self.section_key())
        if mapped is not None:
            self.isopleth, self.line_labels = mapped
        return mapped is not None

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
        """The cursor's alloy, as the key of its freezing paths and transitions (rounded, so that
        steps there and back give the same key)."""
        return tuple(round(float(v), 12) for v in self.x_at_cursor())

    def scan_changes(self) -> tuple[tuple[float, ...], AlloyChanges | str]:
        """(the cursor's alloy, its transitions and heat-treatment window, or why there are
        none, in one line) (slow: run it in a worker, then `keep_changes` the answer)."""
        key = self.alloy_key()
        try:
            return key, alloy_changes(self.system, np.array(key))
        except (ValueError, ArithmeticError) as error:
            return key, f"no transitions: {error}"

    def keep_changes(self, key: tuple[float, ...], changes: AlloyChanges | str) -> None:
        """Remember an alloy's transitions (the newest CHANGES_KEPT alloys)."""
        self.changes[key] = changes
        while len(self.changes) > CHANGES_KEPT:
            self.changes.popitem(last=False)

    def freeze(self) -> tuple[tuple[float, ...], object]:
        """(the cursor's alloy, its equilibrium and Scheil paths) (slow: run it in a worker)."""
        from ladle.engine.solidify.alloy_paths import solidify_alloy

        key = self.alloy_key()
        return key, solidify_alloy(self.system, np.array(key))

    def freezing_lines(self, unit: str, unit_text: str, compact: bool = False) -> list[Line]:
        """The cursor's alloy's liquidus, the end of freezing by both paths and the structure at
        the end (mass %), or a note while they are computed (`compact`: the structure's heading
        names the two paths, one line less)."""
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
        lines += ([("heading", "STRUCTURE mass %: eq. / Scheil")] if compact else
                  [("heading", "STRUCTURE, mass %"), ("note", " equilibrium / Scheil")])
        for name, fractions in structure_rows(result):
            shown = " / ".join("-" if f is None else percent(f) for f in fractions)
            named = self.constituent_name(name, result.equilibrium.liquidus_K)
            if len(named) + len(shown) + 3 <= WIDTH:
                lines.append(("note", f" {named}: {shown}"))
            else:   # the name on its own lines, the two amounts together under it
                lines += [("note", row) for row in textwrap.wrap(named, WIDTH, initial_indent=" ",
                                                                 subsequent_indent="   ")]
                lines.append(("note", f"   {shown}"))
        return lines

    def constituent_name(self, name: str, temperature_K: float) -> str:
        """A constituent of the freezing paths ('eutectic fcc + Fe3C') with each phase by the
        trade's name near temperature_K (K) where the file gives one (a side of a miscibility
        gap, 'fcc (Ag-rich)', keeps its name), and the name of what its reaction forms: 'eutectic
        austenite + cementite (ledeburite)'."""
        names = trade_names(self.system)
        phases = sorted(self.system.phases, key=len, reverse=True)
        pattern = r"(?<![\w(])(" + "|".join(map(re.escape, phases)) + r")(?![\w)]| \()"   # not a gap's side
        shown = re.sub(pattern, lambda m: names.phase_name(m.group(0), temperature_K) or m.group(0), name)
        trade = constituent_trade_name(self.system, name)
        return shown + (f" ({trade})" if trade else "")

    def x_at_cursor(self) -> np.ndarray:
        """Mole fractions of every element at the cursor (in the at% basis straight between the
        ends, so that the held elements keep their exact values and the section its key)."""
        start, end = (np.array(x) for x in self.ends())
        if self.basis == "at":
            return start + self.cursor.u * (end - start)
        start, end = self._in_basis(start), self._in_basis(end)
        return section_mole_fractions(self.system, start, end, self.basis, np.array([self.cursor.u]))[0]

    # -- moves ------------------------------------------------------------------------------
    def move(self, columns: int, rows: int, fine: bool = False) -> None:
        """Move the cursor by whole steps (STEP_SHARE of the window shown; a tenth of that where
        `fine`) along the section (columns) and in temperature (rows, positive up), within the
        section and the system's window; the window shown follows it."""
        w = self.window
        step = STEP_SHARE * (0.1 if fine else 1.0)
        u = min(max(self.cursor.u + columns * step * (w.u_high - w.u_low), 0.0), 1.0)
        T = self.cursor.temperature_K + rows * step * (w.T_high - w.T_low)
        self.cursor = SectionCursor(u, min(max(T, self.T_low), self.T_high))
        self.alloy = self.x_at_cursor()
        self.window = w.following(self.cursor)

    def zoom(self, zoom_in: bool) -> None:
        """Halve (zoom_in) or double the window shown about the cursor, within the whole
        section and the system's temperatures."""
        factor = 1.0 / ZOOM_FACTOR if zoom_in else ZOOM_FACTOR
        w, c = self.window, self.cursor

        def scaled(low: float, high: float, at: float, bottom: float, top: float,
                   smallest: float) -> tuple[float, float]:
            span = min(max((high - low) * factor, smallest), top - bottom)
            low = min(max(at - (at - low) * factor, bottom), top - span)
            return low, low + span

        u_low, u_high = scaled(w.u_low, w.u_high, c.u, 0.0, 1.0, SMALLEST_SPAN_X)
        T_low, T_high = scaled(w.T_low, w.T_high, c.temperature_K, self.T_low, self.T_high, SMALLEST_SPAN_K)
        self.window = SectionWindow(u_low, u_high, T_low, T_high)

    def reset_zoom(self) -> None:
        """Show the whole section again."""
        self.window = self.whole

    def toggle_basis(self) -> None:
        """Switch the section between at% and wt% (the held elements keep their mole or their
        mass fractions); the cursor keeps its alloy and temperature."""
        self.alloy = self.x_at_cursor()
        self.basis = "at" if self.basis == "wt" else "wt"
        self.cursor = SectionCursor(self._u_of(self.alloy), self.cursor.temperature_K)
        self.isopleth = None
        self.window = self.whole

    def vary_next(self) -> None:
        """Let the next element (after the balance, in the system's order) vary; the cursor
        keeps its alloy."""
        self.alloy = self.x_at_cursor()
        n = len(self.system.elements)
        self.varying = self.varying % (n - 1) + 1
        self.cursor = SectionCursor(self._u_of(self.alloy), self.cursor.temperature_K)
        self.isopleth = None
        self.window = self.whole

    def jump(self, point: TypedPoint, unit: str = "K", unit_text: str = "K") -> None:
        """Go to a typed alloy and/or temperature (K); ValueError, in one line with temperatures in
        `unit` ("C", "K" or "F", written `unit_text`), when either lies outside, and then nothing
        moves."""
        T = self.cursor.temperature_K if point.temperature_K is None else point.temperature_K
        if not self.T_low <= T <= self.T_high:     # worded as on the binary screen
            low, high = (format_temperature_value(kelvin_to(t, unit)) for t in (self.T_low, self.T_high))
            raise ValueError(f"{format_temperature_value(kelvin_to(T, unit))} {unit_text} is outside this "
                             f"system's range, {low} to {high} {unit_text}")
        if point.mole_fractions is not None:
            x = np.asarray(point.mole_fractions, dtype=float)
            if not self.system.covered(x):
                raise ValueError(f"that alloy lies outside the range this model covers ({self._covered_words()})")
            basis = "wt" if self._holds_mass else "at"
            content = (mass_from_mole(x, self.system.molar_mass) if self._holds_mass else x)[self.varying]
            if content > self._top(x) + 1e-12:
                raise ValueError(f"{self.element} {percent(content)} {basis}% lies beyond this section's "
                                 f"{percent(self._top(x))} {basis}%")
            self.alloy = x
            self.isopleth = None
        self.cursor = SectionCursor(self._u_of(self.alloy), T)
        self.window = self.window.following(self.cursor)

    def _covered_words(self) -> str:
        """The range the model covers; a binary's in the section's basis first ('0-6.69 wt% C,
        0-25 at%')."""
        words = covered_range_words(self.system)
        if not (self.is_binary and self.basis == "wt"):
            return words
        shown = [percent(mass_from_mole(np.array([1.0 - x, x]), self.system.molar_mass)[1])
                 for x in self.system.covers]
        return f"{shown[0]}-{shown[1]} wt% {self.element}, {words}"

    def saved(self) -> SavedState:
        """What to remember for the next run: the system, the cursor's temperature and, for a
        binary, its alloy (`launch.exploration_for` opens them again)."""
        return SavedState(self.system.name, self.cursor.temperature_K, float(self.x_at_cursor()[1]),
                          composition_unit=self.basis)

    # -- the status pane ---------------------------------------------------------------------
    def equilibrium(self):
        """The point equilibrium at the cursor."""
        return equilibrate(self.system, self.cursor.temperature_K, self.x_at_cursor())

    def status_lines(self, eq, unit: str, unit_text: str, phases: bool = True, compact: bool = False) -> list[Line]:
        """The cursor's temperature in `unit` ("C", "K" or "F", written `unit_text`), the alloy
        (every element, or a binary's second one, in the section's basis and the other), and
        every phase of `eq` (the point equilibrium at the cursor, None while it is computed) with
        the trade's name beside it, its amount and its content of every element (left out with
        `phases` False). In the wt% basis amounts are mass % of the alloy, else mol %.
        `compact`: without the POINT heading, and a binary's phases one line each, by the
        trade's name where there is one."""
        els = self.system.elements
        x = self.x_at_cursor()
        w = mass_from_mole(x, self.system.molar_mass)
        T = self.cursor.temperature_K
        by_mass = self.basis == "wt"
        first, second, other = (w, x, "at") if by_mass else (x, w, "wt")
        shown = range(1, len(els)) if self.is_binary else range(len(els))   # a binary: the balance is the rest
        lines: list[Line] = [] if compact else [("heading", "POINT")]
        lines.append(("value", f" {kelvin_to(T, unit):.1f} {unit_text}" + ("" if unit == "K" else f"  ({T:.1f} K)")))
        lines += [("value", f" {els[i]} {percent(first[i])} {self.basis}% ({percent(second[i])} {other}%)")
                  for i in shown]
        if not phases:
            return lines
        lines.append(("heading", f"PHASES, {'mass' if by_mass else 'mol'} % and {self.basis}%"))
        if eq is None:
            lines.append(("note", " computing ..."))
            return lines
        for p, name in zip(eq.phases, equilibrium_labels(self.system, eq.phases, T), strict=True):
            amount, content = (p.amount_mass, p.w) if by_mass else (p.amount_mol, p.x)
            contents = " ".join(f"{els[i]} {percent(content[i])}" for i in shown)
            if compact and self.is_binary:
                short = trade_names(self.system).phase_name(p.name, T) if name.count("(") == 1 else None
                lines.append(("value", f" {short or name} {percent(amount)}%, {contents}"))
                continue
            lines.append(("value", f" {name} {percent(amount)} {'mass' if by_mass else 'mol'}%"))   # an amount, not a content
            lines.append(("note", f"   {contents}"))
        if not eq.converged:
            lines.append(("warning", " did not converge: treat with suspicion"))
        return lines
