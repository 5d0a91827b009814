"""The explorer's model: one system, the cursor on it, the view window, the chosen units.

Plain Python (no screen code): the screens call these methods on key presses and draw what the
`Reading` says. Every thermodynamic answer comes from the engine; this module only decides
which question to ask and caches the answers that do not change with every move (the diagram
per system and the isothermal section per temperature are cached by the engine; the melt range
per composition is cached here).
"""

from __future__ import annotations

from collections.abc import Callable
from dataclasses import dataclass, replace
from functools import lru_cache

import numpy as np

from ladle.engine import equilibrate, section_at
from ladle.engine.diagrams.diagram import map_diagram
from ladle.engine.diagrams.melt import LIQUID, melt_range

from .cursor import ZOOM_FACTOR, Cursor, Steps, Window, steps_for
from .entry import TypedPoint
from .saved_state import SavedState
from .scales import Scales


@dataclass(frozen=True)
class Boundary:
    """The boundary nearest the cursor: its name, where it is, and which way from the cursor.

    `direction` is "up", "down", "here" (a temperature in K at the cursor's composition; "here":
    the cursor is on it) or "left", "right" (a composition as mole fraction of B at the
    cursor's temperature).
    """

    name: str
    direction: str
    temperature_K: float | None = None
    x_B: float | None = None


@dataclass(frozen=True)
class Reading:
    """Everything the status pane shows for one cursor position."""

    cursor: Cursor
    equilibrium: object          # the engine's point-equilibrium result
    melt: object | None          # the engine's melt range at this composition (None: no answer)
    melt_problem: str | None     # why there is no melt range, in one line
    nearest: Boundary | None


OPENING_PROBES = 9     # alloys whose liquidus sets the opening window
OPENING_MARGIN = 0.15  # room above the highest liquidus, as a share of the window below it
OPENING_SHARE = 0.7    # narrow the opening window only when it keeps less than this of the range
ON_LINE_K = 1e-6      # the cursor is on a line this close to it (K)
SAME_LEVEL_K = 0.05   # a boundary crossing this close to a reaction line is that line (K)


def _direction(dT_K: float) -> str:
    """Which way a level dT_K above the cursor lies: "up", "down" or "here" (on it)."""
    if abs(dT_K) <= ON_LINE_K:
        return "here"
    return "up" if dT_K > 0 else "down"


def boundary_name(phase: str, partner: str) -> str:
    """The trade's name of the edge of `phase`'s one-phase field towards the field phase+partner.

    liquidus: the liquid's edge towards liquid + solid; solidus: a solid's edge towards liquid +
    solid; solvus: a solid's edge towards two solids; a phase against itself: a miscibility gap.
    """
    if phase == partner:
        return f"{phase} gap"
    if phase == LIQUID:
        return "liquidus"
    if partner == LIQUID:
        return "solidus"
    return "solvus"


def crossing_name(above: tuple[str, ...], below: tuple[str, ...],
                  name: Callable[[str], str] = str) -> str:
    """The trade's name of a boundary crossed on cooling from the phases `above` to `below`:
    liquidus, solidus, solvus (solids only); inside the freezing range (liquid on both sides,
    as in an alloy of three elements) the solid that starts to form ("austenite forms"), or the
    one that is used up, each named by `name`."""
    if above == (LIQUID,):
        return "liquidus"
    if LIQUID in above and LIQUID not in below:
        return "solidus"
    if LIQUID in above and LIQUID in below:
        new = [p for p in below if p not in above]
        if new:
            return f"{' + '.join(name(p) for p in new)} forms"
        gone = [p for p in above if p not in below]
        if gone:
            return f"{' + '.join(name(p) for p in gone)} used up"
    return "solvus"


class Exploration:
    """One system being explored: cursor, window, units and cached engine answers."""

    def __init__(self, system, scales: Scales | None = None, cursor: Cursor | None = None):
        self.system = system
        self.scales = scales or Scales(molar_mass=system.molar_mass)
        T_low, T_high = system.temperature_range_K
        x_low, x_high = system.covers
        self.limits = Window(T_low, T_high, x_low, x_high)
        self.window = self._opening_window()
        T_low, T_high = self.window.T_low, self.window.T_high
        if cursor is None:   # the middle of the window, on round numbers of the steps
            self.cursor = Cursor(0.5 * (T_low + T_high), 0.5 * (x_low + x_high))
            self.move(1, 1)
            self.move(-1, -1)
        else:
            self.cursor = Cursor(*self.limits.clamp(cursor.temperature_K, cursor.x_B))
            self.window = self.window.following(self.cursor.temperature_K, self.cursor.x_B)
        self._melt = lru_cache(maxsize=256)(self._melt_uncached)

    def _opening_window(self) -> Window:
        """The window the system opens on: all of it, or, where the highest liquidus of the
        covered range lies low in the system's temperature range (solders against the melting
        point of silver or copper), from the bottom to a little above that liquidus (`0` shows
        the whole range)."""
        limits = self.limits
        tops = []
        for x_B in np.linspace(limits.x_low, limits.x_high, OPENING_PROBES):
            try:
                liquidus = melt_range(self.system, float(x_B)).liquidus_K
            except ValueError:
                continue
            if liquidus is not None:
                tops.append(liquidus)
        span = limits.T_high - limits.T_low
        if not tops:
            return limits
        top = max(tops) + OPENING_MARGIN * (max(tops) - limits.T_low)
        if top - limits.T_low > OPENING_SHARE * span:
            return limits
        return replace(limits, T_high=top)

    # -- what the engine says -------------------------------------------------------------

    @property
    def diagram(self):
        """The system's traced diagram (the engine caches it per system)."""
        return map_diagram(self.system)

    def section(self):
        """The isothermal section at the cursor's temperature (the engine caches it)."""
        return section_at(self.system, self.cursor.temperature_K)

    def _melt_uncached(self, x_B: float):
        return melt_range(self.system, x_B)

    def reading(self) -> Reading:
        """The equilibrium, melt range and nearest boundary at the cursor."""
        cursor = self.cursor
        result = equilibrate(self.system, cursor.temperature_K, cursor.x_B)
        melt, problem = None, None
        try:
            melt = self._melt(cursor.x_B)
        except ValueError as error:
            problem = str(error)
        return Reading(cursor, result, melt, problem, self._nearest_boundary(melt))

    def _nearest_boundary(self, melt) -> Boundary | None:
        """The boundary closest to the cursor on screen: across (the tie-line ends at this
        temperature) or along the temperature axis (every boundary crossed at this
        composition, from the melt range)."""
        cursor, window = self.cursor, self.window
        t_span = max(window.T_high - window.T_low, 1e-9)
        x_span = max(window.x_high - window.x_low, 1e-12)
        candidates: list[tuple[float, Boundary]] = []
        for tie in self.section().tie_lines:
            (phase, partner), (x_phase, x_partner) = tie.phases, tie.x_B
            for own, other, x_edge in ((phase, partner, x_phase), (partner, phase, x_partner)):
                dx = x_edge - cursor.x_B
                if abs(dx) > 1e-12:
                    candidates.append((abs(dx) / x_span, Boundary(
                        boundary_name(own, other), "right" if dx > 0 else "left", x_B=x_edge)))
        reaction_levels = []
        for invariant in self.diagram.invariants:   # the reaction lines this alloy crosses
            xs = [x for _, x in invariant.phases]
            if min(xs) - 1e-9 <= cursor.x_B <= max(xs) + 1e-9:
                dT = invariant.temperature_K - cursor.temperature_K
                reaction_levels.append(invariant.temperature_K)
                candidates.append((abs(dT) / t_span, Boundary(
                    invariant.kind, _direction(dT), temperature_K=invariant.temperature_K)))
        for crossing in (melt.crossings if melt is not None else ()):
            dT = crossing.temperature_K - cursor.temperature_K
            if abs(dT) > ON_LINE_K and all(abs(crossing.temperature_K - level) > SAME_LEVEL_K
                                           for level in reaction_levels):
                candidates.append((abs(dT) / t_span, Boundary(
                    crossing_name(crossing.above, crossing.below), _direction(dT),
                    temperature_K=crossing.temperature_K)))
        return min(candidates, key=lambda pair: pair[0])[1] if candidates else None

    def neighbour_temperatures(self) -> list[float]:
        """The cursor's temperatures after one step up or down, coarse and fine (K)."""
        return [self.cursor.moved(d_temperature, 0, self.steps(fine), self.scales,
                                  self.limits).temperature_K
                for fine in (False, True) for d_temperature in (1, -1)]

    def warm_neighbours(self) -> None:
        """Compute ahead what one more step in any direction (coarse or fine) will ask for: the
        melt range of each neighbouring composition and the section at each neighbouring
        temperature (both cached), so that the next key press finds them ready. Meant for a
        worker thread while the person reads the screen."""
        cursor = self.cursor
        for fine in (False, True):
            for d_temperature, d_composition in ((1, 0), (-1, 0), (0, 1), (0, -1)):
                near = cursor.moved(d_temperature, d_composition, self.steps(fine), self.scales,
                                    self.limits)
                if d_composition:
                    try:
                        self._melt(near.x_B)
                    except ValueError:
                        pass
                else:
                    section_at(self.system, near.temperature_K).tie_lines

    # -- what the keys do -----------------------------------------------------------------

    def steps(self, fine: bool = False) -> Steps:
        """The step sizes for this window, in the units on screen (a tenth of them if fine)."""
        return steps_for(self.window, self.scales, fine)

    def move(self, d_temperature: int, d_composition: int, fine: bool = False) -> None:
        """One step up/down (+1/-1 in temperature) and/or right/left (in composition)."""
        self.cursor = self.cursor.moved(d_temperature, d_composition, self.steps(fine),
                                        self.scales, self.limits)
        self.window = self.window.following(self.cursor.temperature_K, self.cursor.x_B)

    def jump(self, point: TypedPoint) -> None:
        """Move the cursor to a typed point (a coordinate left as None stays)."""
        T_K = self.cursor.temperature_K if point.temperature_K is None else point.temperature_K
        x_B = self.cursor.x_B if point.x_B is None else point.x_B
        self.cursor = Cursor(*self.limits.clamp(T_K, x_B))
        self.window = self.window.following(self.cursor.temperature_K, self.cursor.x_B)

    def zoom(self, zoom_in: bool) -> None:
        """Halve (zoom_in) or double the window about the cursor, within the system's range."""
        factor = 1.0 / ZOOM_FACTOR if zoom_in else ZOOM_FACTOR
        self.window = self.window.zoomed(factor, self.cursor.temperature_K, self.cursor.x_B,
                                         self.limits)

    def reset_zoom(self) -> None:
        """Show the system's whole range again."""
        self.window = self.limits

    def cycle_temperature_unit(self) -> None:
        """C -> K -> F -> C for every temperature on screen."""
        self.scales = self.scales.next_temperature_unit()

    def toggle_composition_unit(self) -> None:
        """wt% <-> at% for every composition on screen."""
        self.scales = self.scales.next_composition_unit()

    def saved(self) -> SavedState:
        """What to remember of this exploration for the next run."""
        return SavedState(self.system.name, self.cursor.temperature_K, self.cursor.x_B,
                          self.scales.temperature_unit, self.scales.composition_unit)

    def with_system(self, system) -> "Exploration":
        """A new exploration of another system, keeping the units and (where it fits) the
        cursor."""
        return Exploration(system, replace(self.scales, molar_mass=system.molar_mass),
                           self.cursor)
