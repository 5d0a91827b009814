"""The cursor and the view window, and how keys move and zoom them.

Both live in the engine's units (K, mole fraction of B). Steps are taken in the units on screen
and land on round numbers of those units (a 5 °C step from 183.2 °C goes to 185 °C), so a
practitioner reads clean values while stepping.
"""

from __future__ import annotations

import math
from dataclasses import dataclass, replace

from .scales import Scales

TEMPERATURE_STEPS_PER_SPAN = 30   # a coarse temperature step is about 1/30 of the window
COMPOSITION_STEPS_PER_SPAN = 50   # a coarse composition step is about 1/50 of the window
FINE = 10                         # a fine step is a tenth of a coarse one
ZOOM_FACTOR = 2.0
#: The narrowest window zooming in reaches (K; mole fraction, or the isopleth's parameter): finer
#: is below anything a model means, and the window's floats would collapse to one value.
SMALLEST_SPAN_K = 1e-3
SMALLEST_SPAN_X = 1e-7


@dataclass(frozen=True)
class Window:
    """A rectangle of the diagram: temperatures in K, compositions as mole fraction of B."""

    T_low: float
    T_high: float
    x_low: float
    x_high: float

    def clamp(self, T_K: float, x_B: float) -> tuple[float, float]:
        """The nearest point inside the window."""
        return (min(max(T_K, self.T_low), self.T_high), min(max(x_B, self.x_low), self.x_high))

    def contains(self, T_K: float, x_B: float) -> bool:
        """Whether the point lies inside the window (edges included)."""
        return self.T_low <= T_K <= self.T_high and self.x_low <= x_B <= self.x_high

    def zoomed(self, factor: float, T_K: float, x_B: float, limits: "Window") -> "Window":
        """This window scaled by `factor` (below 1 zooms in) about the point, kept in limits."""
        return Window(*_scaled(self.T_low, self.T_high, T_K, factor, limits.T_low, limits.T_high, SMALLEST_SPAN_K),
                      *_scaled(self.x_low, self.x_high, x_B, factor, limits.x_low, limits.x_high, SMALLEST_SPAN_X))

    def following(self, T_K: float, x_B: float) -> "Window":
        """This window, shifted (not resized) just enough to contain the point."""
        dT = min(T_K - self.T_low, 0.0) + max(T_K - self.T_high, 0.0)
        dx = min(x_B - self.x_low, 0.0) + max(x_B - self.x_high, 0.0)
        return Window(self.T_low + dT, self.T_high + dT, self.x_low + dx, self.x_high + dx)


def _scaled(low: float, high: float, centre: float, factor: float,
            lowest: float, highest: float, smallest: float) -> tuple[float, float]:
    span = min(max((high - low) * factor, smallest), highest - lowest)
    new_low = min(max(centre - span / 2.0, lowest), highest - span)
    return new_low, new_low + span


def nice_step(span: float, steps: int) -> float:
    """A round step (1, 2 or 5 times a power of ten) close to span / steps."""
    raw = span / steps
    power = 10.0 ** math.floor(math.log10(raw))
    for multiple in (1.0, 2.0, 5.0, 10.0):
        if raw <= multiple * power * 1.5:
            return multiple * power
    return 10.0 * power


def step_on_grid(value: float, step: float, direction: int) -> float:
    """The next value on the grid of `step` from `value` in `direction` (+1 or -1)."""
    ratio = value / step
    if direction > 0:
        return (math.floor(ratio + 1e-9) + 1) * step
    return (math.ceil(ratio - 1e-9) - 1) * step


@dataclass(frozen=True)
class Steps:
    """The current step sizes in the units on screen."""

    temperature: float
    composition: float


def steps_for(window: Window, scales: Scales, fine: bool) -> Steps:
    """Step sizes for the window, in the shown units; a tenth of them when `fine`."""
    t_span = scales.shown_temperature_difference(window.T_high - window.T_low)
    c_span = abs(scales.shown_composition(window.x_high) - scales.shown_composition(window.x_low))
    divide = FINE if fine else 1
    return Steps(nice_step(t_span, TEMPERATURE_STEPS_PER_SPAN) / divide,
                 nice_step(max(c_span, 1e-9), COMPOSITION_STEPS_PER_SPAN) / divide)


@dataclass(frozen=True)
class Cursor:
    """The point under study: temperature in K, overall composition as mole fraction of B."""

    temperature_K: float
    x_B: float

    def moved(self, d_temperature: int, d_composition: int, steps: Steps, scales: Scales,
              limits: Window) -> "Cursor":
        """One step up/down (d_temperature = +1/-1) and/or right/left (d_composition)."""
        T_K, x_B = self.temperature_K, self.x_B
        if d_temperature:
            shown = step_on_grid(scales.shown_temperature(T_K), steps.temperature, d_temperature)
            T_K = scales.engine_temperature(shown)
        if d_composition:
            shown = step_on_grid(scales.shown_composition(x_B), steps.composition, d_composition)
            x_B = scales.engine_composition(min(max(shown, 0.0), 100.0))
        T_K, x_B = limits.clamp(T_K, x_B)
        return replace(self, temperature_K=T_K, x_B=x_B)
