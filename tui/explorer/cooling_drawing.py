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
from .plotting import Frame, Label, draw_frame, joined, place_labels, plot_within, thin_polyline
from .readout import format_temperature_value
from .scales import Scales

EQUILIBRIUM_COLOUR = "cyan"
SCHEIL_COLOUR = "magenta"
END_COLOUR = "yellow"
SHARED_COLOUR = "white"
SHARED_NAME = "both paths"
HEADROOM = 0.16   # room above the liquidus (for the legend), as a share of the span shown
FOOTROOM = 0.14   # room below the lowest end (for the end labels)


@dataclass(frozen=True)
class CoolingScene:
    """Both paths in screen units: fraction solid (%) across, temperature up."""

    frame: Frame
    shared: tuple[list[float], list[float]]        # where both paths are one curve on screen
    equilibrium: tuple[list[float], list[float]]   # each path below that
    scheil: tuple[list[float], list[float]]
    ends: list[tuple[float, float]]        # (fraction solid %, temperature) of each path's end
    labels: list[Label]
    x_title: str
    y_title: str


def _points(path, scales: Scales) -> tuple[np.ndarray, np.ndarray]:
    """Fraction solid (%) and temperature (unit on screen) of every step of a path."""
    fs = np.array([100.0 * s.fraction_solid for s in path.steps])
    return fs, np.asarray(scales.shown_temperature(np.array([s.temperature_K for s in path.steps])))


def _near_other(points: tuple[np.ndarray, np.ndarray], other: tuple[np.ndarray, np.ndarray],
                frame: Frame) -> np.ndarray:
    """For each point, whether the other curve (its points joined by straight lines) passes
    within one character cell of it (there the two curves would print over each other)."""
    cell_x = (frame.x_high - frame.x_low) / max(frame.columns - 1, 1)
    cell_y = (frame.y_high - frame.y_low) / max(frame.rows - 1, 1)
    px, py = points[0][:, None] / cell_x, points[1][:, None] / cell_y     # in cells
    ox, oy = other[0] / cell_x, other[1] / cell_y
    if ox.size < 2:
        return np.zeros(px.shape[0], dtype=bool) if ox.size == 0 else \
            (np.hypot(px[:, 0] - ox[0], py[:, 0] - oy[0]) <= 1.0)
    ax, ay, dx, dy = ox[:-1], oy[:-1], np.diff(ox), np.diff(oy)
    length2 = np.maximum(dx * dx + dy * dy, 1e-12)
    t = np.clip(((px - ax) * dx + (py - ay) * dy) / length2, 0.0, 1.0)   # nearest point of each segment
    distance = np.hypot(px - (ax + t * dx), py - (ay + t * dy))
    return (distance <= 1.0).any(axis=1)


def _pieces(points: tuple[np.ndarray, np.ndarray], keep: np.ndarray, frame: Frame,
            reach: int = 1) -> tuple[list[float], list[float]]:
    """The runs of kept points (each with `reach` neighbours on either side, so the pieces join
    the rest of the curve), thinned and joined into one NaN-separated series."""
    runs = []
    start = None
    for i, flag in enumerate(list(keep) + [False]):
        if flag and start is None:
            start = i
        elif not flag and start is not None:
            lo, hi = max(start - reach, 0), min(i + reach, keep.size)
            runs.append(thin_polyline(points[0][lo:hi], points[1][lo:hi], frame))
            start = None
    return joined(runs)


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
    eq_points, sc_points = _points(eq, scales), _points(sc, scales)
    sc_shared = _near_other(sc_points, eq_points, frame)
    eq_shared = _near_other(eq_points, sc_points, frame)
    return CoolingScene(frame, _pieces(sc_points, sc_shared, frame, reach=0),
                        _pieces(eq_points, ~eq_shared, frame), _pieces(sc_points, ~sc_shared, frame),
                        ends, place_labels(labels, frame), "solid, mass % of the alloy",
                        f"T {unit}")


def draw_cooling(plt, scene: CoolingScene, glyphs: Glyphs) -> None:
    """Issue the plot calls: both paths (told apart by marker and colour; where they are one
    curve on screen, a third mark says so), their ends, labels. The explorer writes the cursor's
    temperature over the built picture."""
    frame = scene.frame
    draw_frame(plt, frame, scene.x_title, scene.y_title)
    for curve, marker, colour, name in (   # the shared part last: where both paths are, it shows
            (scene.equilibrium, glyphs.boundary_marker, EQUILIBRIUM_COLOUR, PATH_NAMES["equilibrium"]),
            (scene.scheil, glyphs.envelope_marker, SCHEIL_COLOUR, PATH_NAMES["scheil"]),
            (scene.shared, glyphs.invariant_marker, SHARED_COLOUR, SHARED_NAME)):
        # nothing where the series is empty: plotext cannot draw the legend of an empty series
        plot_within(plt, frame, *curve, marker=marker, color=colour, label=name)
    for x, T in scene.ends:
        plt.scatter([x], [T], marker=glyphs.cursor_marker, color=END_COLOUR)
    for label in scene.labels:
        plt.text(label.text, label.x, label.y, alignment="center")
