"""Pictures of sections of systems of three or more elements: the isopleth (temperature against
one element's content) and the ternary isothermal section on a composition triangle.

The ternary liquidus projection (valleys and invariant points on the triangle) is drawn the same
way. Plot calls only (plotext's figure API) and the plain-numpy scenes they draw; the numbers come
from the engine's mapped sections (ladle.engine.diagrams.isopleth, isothermal,
liquidus_projection). Every field is labelled: by its phases where the text fits, else by a
number that the key under the picture explains.
"""

from __future__ import annotations

from dataclasses import dataclass

import numpy as np

from ladle.engine.units import kelvin_to

from .diagram_drawing import draw_lines_and_labels, plot_area
from .glyphs import Glyphs
from .plotting import Frame, Label, draw_frame, joined, place_labels, thin_polyline

TIE_LINE_COLOUR = "green"
_SQRT3_2 = float(np.sqrt(3.0) / 2.0)


@dataclass(frozen=True)
class SectionScene:
    """Everything of a section's picture, in the units on screen: boundary lines, invariant (or
    triangle) lines, thin lines (tie-lines), labels, the key of numbered fields, axis titles."""

    frame: Frame
    boundaries: tuple[list[float], list[float]]
    invariants: tuple[list[float], list[float]]
    thin: tuple[list[float], list[float]]
    labels: list[Label]
    key: list[str]
    x_title: str
    y_title: str | None


def field_name(phases) -> str:
    """'liquid + fcc': a field's phases as the picture names it."""
    return " + ".join(phases)


def labelled_fields(wanted: list[tuple[str, float, float]], frame: Frame) -> tuple[list[Label], list[str]]:
    """Labels for fields (name, x, y), largest first: the name where it fits, else a number
    (1, 2, ...) where that fits; the key lists what each number stands for, and any field that
    got no label at all."""
    placed = place_labels([Label(name, x, y) for name, x, y in wanted], frame)
    named = {label.text for label in placed}
    numbered, key = [], []
    for name, x, y in wanted:
        if name in named:
            continue
        tag = str(len(key) + 1)
        trial = place_labels(placed + numbered + [Label(tag, x, y)], frame)
        if len(trial) > len(placed) + len(numbered):
            numbered.append(Label(tag, x, y))
            key.append(f"{tag}: {name}")
        else:
            key.append(f"{tag} (too small to mark): {name}")
    return placed + numbered, key


def isopleth_scene(iso, unit: str, glyphs: Glyphs, width: int, height: int) -> SectionScene:
    """The isopleth's zero-phase-fraction lines, its invariant lines and every field labelled,
    for this size; compositions as percent of the varying element in the section's basis,
    temperatures in `unit` ("C", "K" or "F")."""
    columns, rows = plot_area(width, height)
    low, high = 100.0 * iso.content(0.0), 100.0 * iso.content(1.0)
    T_lo, T_hi = (kelvin_to(T, unit) for T in iso.temperature_range_K)
    frame = Frame(min(low, high), max(low, high), min(T_lo, T_hi), max(T_lo, T_hi), columns, rows)

    def shown(points) -> tuple[np.ndarray, np.ndarray]:
        pts = np.asarray(points, dtype=float)
        return low + pts[:, 0] * (high - low), np.array([kelvin_to(T, unit) for T in pts[:, 1]])

    curves = [thin_polyline(*shown(line.points), frame) for line in iso.lines]
    flats = []
    for inv in iso.invariants:
        T = kelvin_to(inv.temperature_K, unit)
        flats.append(([low + inv.u_range[0] * (high - low), low + inv.u_range[1] * (high - low)], [T, T]))
    by_size = sorted(iso.fields, key=lambda f: -len(f.nodes))
    wanted = [(field_name(f.phases), *(float(v[0]) for v in shown([f.middle]))) for f in by_size]
    labels, key = labelled_fields(wanted, frame)
    return SectionScene(frame, joined(curves), joined(flats), ([], []), labels, key,
                        f"{iso.element} {iso.basis}%", f"T {glyphs.temperature_unit(unit)}")


def triangle_point(x: np.ndarray) -> tuple[np.ndarray, np.ndarray]:
    """Plane coordinates of ternary mole fractions (..., 3) on the triangle with the first
    element at the lower left, the second at the lower right, the third at the top."""
    x = np.asarray(x, dtype=float)
    return x[..., 1] + 0.5 * x[..., 2], _SQRT3_2 * x[..., 2]


def _triangle_frame(elements, width: int, height: int) -> tuple[Frame, tuple[list[float], list[float]], list[Label]]:
    """The composition triangle's frame for this size, its sides as one series and the labels
    of its corners (the elements)."""
    columns, rows = plot_area(width, height)
    frame = Frame(-0.05, 1.05, -0.05, _SQRT3_2 + 0.05, columns, rows)
    sides = joined([triangle_point(np.array([[1.0, 0, 0], [0, 1.0, 0], [0, 0, 1.0], [1.0, 0, 0]]))])
    corners = [Label(elements[0], 0.0, -0.04), Label(elements[1], 1.0, -0.04), Label(elements[2], 0.5, _SQRT3_2 + 0.03)]
    return frame, sides, corners


def _triangle_title(elements) -> str:
    return f"mole fractions ({elements[1]} to the right, {elements[2]} up)"


def triangle_scene(section, glyphs: Glyphs, width: int, height: int) -> SectionScene:
    """The ternary isothermal section on its triangle: the triangle's sides, the single-phase
    fields' edges, tie-lines, three-phase triangles and every field labelled."""
    els = section.system.elements
    frame, sides, corners = _triangle_frame(els, width, height)
    ties = [triangle_point(np.array(t.ends)) for f in section.fields for t in f.tie_lines]
    triangles = [triangle_point(np.array(list(t) + [t[0]])) for f in section.fields for t in f.triangles]
    wanted = []
    for f in sorted(section.fields, key=lambda f: -f.nodes):
        x, y = triangle_point(np.array(f.middle))
        wanted.append((field_name(f.phases), float(x), float(y)))
    labels, key = labelled_fields(wanted, frame)
    return SectionScene(frame, sides, joined(triangles), joined(ties), corners + labels, key, _triangle_title(els), None)


def projection_scene(projection, glyphs: Glyphs, width: int, height: int) -> SectionScene:
    """A ternary's liquidus projection on its triangle: the valleys (the liquid along liquid +
    two solids) as boundaries, each invariant point marked by its number (1 hottest), and each
    primary-phase field labelled by its solid."""
    els = projection.system.elements
    frame, sides, corners = _triangle_frame(els, width, height)
    valleys = [thin_polyline(*triangle_point(np.array([x for _T, x in v.points])), frame) for v in projection.valleys]
    wanted = [(f.phase, *(float(v) for v in triangle_point(np.array(f.middle)))) for f in projection.fields]
    labels, key = labelled_fields(wanted, frame)
    points = [triangle_point(np.array(r.phases[0][1])) for r in projection.invariants]
    numbers = [Label(str(k + 1), float(x), float(y) + 0.04) for k, (x, y) in enumerate(points)]
    shown = place_labels(corners + labels + numbers, frame)
    dots = [(np.array([x]), np.array([y])) for x, y in points]
    return SectionScene(frame, joined([sides, *valleys]), joined(dots), ([], []), shown, key, _triangle_title(els), None)


def draw_section(plt, scene: SectionScene, glyphs: Glyphs) -> None:
    """Issue the plot calls of a section's scene (a triangle, whose scene has no y title, gets
    no ticks: its corners are labelled instead)."""
    frame = scene.frame
    if scene.y_title is None:
        plt.xlim(frame.x_low, frame.x_high)
        plt.ylim(frame.y_low, frame.y_high)
        plt.xticks([])
        plt.yticks([])
        plt.xlabel(scene.x_title)
    else:
        draw_frame(plt, frame, scene.x_title, scene.y_title)
    if scene.thin[0]:
        plt.plot(*scene.thin, marker=glyphs.crosshair_marker, color=TIE_LINE_COLOUR)
    draw_lines_and_labels(plt, scene.boundaries, scene.invariants, scene.labels, glyphs)
