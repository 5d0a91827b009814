"""The diagram view's picture: traced boundaries, field names, invariant lines, the cursor.

Plot calls only (plotext's figure API); the numbers come from the engine's traced diagram and
are converted to the units on screen. Field names are found by asking the diagram which field
holds each point of a coarse grid over the window, and written where there is room.
"""

from __future__ import annotations

from dataclasses import dataclass

import numpy as np

from ladle.tui.phase_names import short_label

from .exploration import Exploration
from .glyphs import Glyphs
from .plotting import Frame, Label, draw_frame, joined, place_labels, plot_within, thin_polyline
from .readout import format_temperature_value

BOUNDARY_COLOUR = "cyan"
INVARIANT_COLOUR = "yellow"
LABEL_COLUMNS = 5   # grid spacing (cells) of the field-name probe, across
LABEL_ROWS = 2      # and down


@dataclass(frozen=True)
class DiagramScene:
    """Everything of the picture except the cursor, in the units on screen."""

    frame: Frame
    boundaries: tuple[list[float], list[float]]
    invariants: tuple[list[float], list[float]]
    labels: list[Label]
    x_title: str
    y_title: str


def plot_area(width: int, height: int) -> tuple[int, int]:
    """Approximate character cells inside the axes of a width x height plot (ticks, labels
    and frame take the rest)."""
    return max(width - 8, 4), max(height - 4, 2)


def diagram_scene(exploration: Exploration, glyphs: Glyphs, width: int,
                  height: int) -> DiagramScene:
    """The diagram's boundaries, invariant lines and field names for this window and size."""
    scales, window, diagram = exploration.scales, exploration.window, exploration.diagram
    columns, rows = plot_area(width, height)
    frame = Frame(scales.shown_composition(window.x_low), scales.shown_composition(window.x_high),
                  scales.shown_temperature(window.T_low), scales.shown_temperature(window.T_high),
                  columns, rows)
    edges = []
    for field in diagram.fields:
        T_shown = scales.shown_temperature(np.asarray(field.T, dtype=float))
        for side in (0, 1):
            edges.append(thin_polyline(scales.shown_composition(field.x[:, side]), T_shown, frame))
    invariant_lines = []
    labels = []
    unit = glyphs.temperature_unit(scales.temperature_unit)
    for invariant in diagram.invariants:
        xs = [scales.shown_composition(x) for _, x in invariant.phases]
        T_shown = scales.shown_temperature(invariant.temperature_K)
        invariant_lines.append(([min(xs), max(xs)], [T_shown, T_shown]))
        above = T_shown + (frame.y_high - frame.y_low) / max(frame.rows - 1, 1)
        labels.append(Label(f"{format_temperature_value(T_shown)}{unit}",
                            0.5 * (min(xs) + max(xs)), above))
    labels += _field_labels(exploration, frame)
    element_B = exploration.system.elements[1]
    return DiagramScene(frame, joined(edges), joined(invariant_lines),
                        place_labels(labels, frame),
                        f"{element_B} {scales.composition_unit}%", f"T {unit}")


def _field_labels(exploration: Exploration, frame: Frame) -> list[Label]:
    """One label per field seen on a coarse grid, at the grid point nearest its middle;
    larger fields first."""
    scales, diagram = exploration.scales, exploration.diagram
    xs = np.linspace(frame.x_low, frame.x_high, max(frame.columns // LABEL_COLUMNS, 2) + 2)[1:-1]
    ys = np.linspace(frame.y_low, frame.y_high, max(frame.rows // LABEL_ROWS, 2) + 2)[1:-1]
    x_B = scales.engine_composition(xs)
    T_K = scales.engine_temperature(ys)
    cells: dict[tuple[str, ...], list[tuple[float, float]]] = {}
    for T, y in zip(T_K, ys, strict=True):
        for x_b, x in zip(x_B, xs, strict=True):
            cells.setdefault(tuple(diagram.field_at(float(T), float(x_b))), []).append((x, y))
    labels = []
    system = exploration.system
    for phases, points in sorted(cells.items(), key=lambda item: -len(item[1])):
        pts = np.array(points)
        middle = pts.mean(axis=0)
        x, y = pts[np.argmin(np.hypot((pts[:, 0] - middle[0]) / (frame.x_high - frame.x_low),
                                      (pts[:, 1] - middle[1]) / (frame.y_high - frame.y_low)))]
        T_K = float(scales.engine_temperature(y))
        sides = [(name, float(i)) for i, name in enumerate(phases)]   # ordered by composition
        text = "+".join(short_label(system, name, side, T_K, sides) for name, side in sides)
        labels.append(Label(text, float(x), float(y)))
    return labels


def draw_diagram(plt, scene: DiagramScene, glyphs: Glyphs) -> None:
    """Issue the plot calls: boundaries, invariant lines, labels (the explorer writes the
    cursor over the built picture)."""
    draw_frame(plt, scene.frame, scene.x_title, scene.y_title)
    draw_lines_and_labels(plt, scene.frame, scene.boundaries, scene.invariants, scene.labels, glyphs)


def draw_lines_and_labels(plt, frame: Frame, boundaries, invariants, labels, glyphs: Glyphs) -> None:
    """Issue the plot calls of a drawing's boundaries and invariant lines ((x, y) arrays with NaN
    gaps; empty where there are none), cut at the frame, and its placed labels."""
    plot_within(plt, frame, *boundaries, marker=glyphs.boundary_marker, color=BOUNDARY_COLOUR)
    plot_within(plt, frame, *invariants, marker=glyphs.invariant_marker, color=INVARIANT_COLOUR)
    for label in labels:
        plt.text(label.text, label.x, label.y, alignment="center")
