"""The cooling picture: temperature against fraction solid for the equilibrium and the Scheil
path of one alloy, with the temperature where each path's freezing ends marked.

Plot calls only (plotext's figure API), no screen code: `ladle cool --plot` and the explorer's
cooling view both draw with it. Fraction solid is a mass percentage; temperatures are in the
unit on screen.
"""

from __future__ import annotations

from dataclasses import dataclass

import numpy as np

from ladle.tui.cooling_text import PATH_NAMES

from .diagram_drawing import plot_area
from .glyphs import Glyphs
from .plotting import CURSOR_COLOUR, Frame, Label, draw_frame, place_labels, thin_polyline
from .readout import format_temperature_value
from .scales import Scales

EQUILIBRIUM_COLOUR = "cyan"
SCHEIL_COLOUR = "magenta"
END_COLOUR = "yellow"
HEADROOM = 0.16   # room above the liquidus (for the legend), as a share of the span shown
FOOTROOM = 0.14   # room below the lowest end (for the end labels)


@dataclass(frozen=True)
class CoolingScene:
    """Both paths in screen units: fraction solid (%) across, temperature up."""

    frame: Frame
    equilibrium: tuple[list[float], list[float]]
    scheil: tuple[list[float], list[float]]
    ends: list[tuple[float, float]]        # (fraction solid %, temperature) of each path's end
    labels: list[Label]
    x_title: str
    y_title: str


def _curve(path, scales: Scales, frame: Frame) -> tuple[list[float], list[float]]:
    fs = np.array([100.0 * s.fraction_solid for s in path.steps])
    T = scales.shown_temperature(np.array([s.temperature_K for s in path.steps]))
    xs, ys = thin_polyline(fs, T, frame)
    return xs.tolist(), ys.tolist()


def cooling_scene(solidification, scales: Scales, glyphs: Glyphs, width: int, height: int) -> CoolingScene:
    """The picture of both paths of `solidification` (engine/solidify.py) for this size."""
    eq, sc = solidification.equilibrium, solidification.scheil
    temps = [s.temperature_K for p in (eq, sc) for s in p.steps]
    hot, cold = max(temps), min(temps)
    span = max(hot - cold, 1.0)
    low = scales.shown_temperature(cold - FOOTROOM * span)
    high = scales.shown_temperature(hot + HEADROOM * span)
    columns, rows = plot_area(width, height)
    frame = Frame(0.0, 100.0, min(low, high), max(low, high), columns, rows)
    unit = glyphs.temperature_unit(scales.temperature_unit)
    ends, labels = [], []
    for path, name in ((eq, PATH_NAMES["equilibrium"]), (sc, PATH_NAMES["scheil"])):
        if path.end_K is None:
            continue
        T = float(scales.shown_temperature(path.end_K))
        ends.append((100.0 * path.steps[-1].fraction_solid, T))
        below = T - 0.06 * (frame.y_high - frame.y_low)      # under its line, not over the plateau
        labels.append(Label(f"{name} end {format_temperature_value(T)} {unit}", 60.0, below))
    return CoolingScene(frame, _curve(eq, scales, frame), _curve(sc, scales, frame), ends,
                        place_labels(labels, frame), "solid (mass %)", f"temperature ({unit})")


def draw_cooling(plt, scene: CoolingScene, glyphs: Glyphs, cursor_T: float | None = None) -> None:
    """Issue the plot calls: the cursor's temperature (if given, in the unit on screen) as a line
    underneath, both paths (told apart by marker and colour), their ends, labels."""
    frame = scene.frame
    if cursor_T is not None and frame.y_low <= cursor_T <= frame.y_high:
        plt.plot([frame.x_low, frame.x_high], [cursor_T, cursor_T], marker=glyphs.crosshair_marker,
                 color=CURSOR_COLOUR)
    draw_frame(plt, frame, scene.x_title, scene.y_title)
    plt.plot(*scene.equilibrium, marker=glyphs.boundary_marker, color=EQUILIBRIUM_COLOUR, label=PATH_NAMES["equilibrium"])
    plt.plot(*scene.scheil, marker=glyphs.envelope_marker, color=SCHEIL_COLOUR, label=PATH_NAMES["scheil"])
    for x, T in scene.ends:
        plt.scatter([x], [T], marker=glyphs.cursor_marker, color=END_COLOUR)
    for label in scene.labels:
        plt.text(label.text, label.x, label.y, alignment="center")
