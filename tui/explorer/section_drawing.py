"""Pictures of sections of systems of three or more elements: the isopleth (temperature against
one element's content) and the ternary isothermal section on a composition triangle.

The ternary liquidus projection (valleys and invariant points on the triangle) is drawn the same
way. Plot calls only (plotext's figure API) and the plain-numpy scenes they draw; the numbers come
from the engine's mapped sections (ladle.engine.diagrams.isopleth, isothermal,
liquidus_projection). Every field is labelled: by its phases (the trade's names where the
system's file gives them; the two sides of a miscibility gap by what each is rich in, from one
point equilibrium in the field) where the text fits, else by a number that the key under the
picture explains; the lines the file names (A1, A3, Acm) carry their names. A system that covers only a
corner of the triangle is drawn zoomed to that corner.
"""

from __future__ import annotations

from collections.abc import Sequence
from dataclasses import dataclass

import numpy as np

from ladle.engine.diagrams.isopleth import section_mole_fractions
from ladle.engine.files.trade_names import trade_names
from ladle.engine.units import kelvin_to

from .diagram_drawing import draw_lines_and_labels, plot_area
from .glyphs import Glyphs
from .plotting import Frame, Label, draw_frame, joined, place_labels, plot_within, thin_polyline

TIE_LINE_COLOUR = "green"
_SQRT3_2 = float(np.sqrt(3.0) / 2.0)
#: A triangle is drawn zoomed to the part the model covers where that spans less than this share
#: of the whole triangle's width.
ZOOM_BELOW = 0.7
#: Room around the covered part of a zoomed triangle, as a share of its width.
ZOOM_MARGIN = 0.08


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


def field_name(system, phases: Sequence[str], temperature_K: float, x: Sequence[float] | None = None) -> str:
    """'liquid + (Sn)': a field's phases at temperature_K (K) as the picture names them, by the
    trade's names where the system's file gives them. A phase present twice, the two sides of a
    miscibility gap, is named by the element each side is rich in, from the point equilibrium at
    `x` (mole fractions of a point of the field): 'fcc (Cu-rich) + fcc (Ag-rich)'; without `x`,
    or where that equilibrium holds other phases, by its structure name ('fcc + fcc')."""
    names = trade_names(system)
    if x is not None and len(set(phases)) < len(phases):
        sides = _gap_sides(system, phases, temperature_K, x)
        if sides is not None:
            return sides
    return " + ".join(p if list(phases).count(p) > 1 else names.phase_name(p, temperature_K) or p for p in phases)


def _gap_sides(system, phases: Sequence[str], temperature_K: float, x: Sequence[float]) -> str | None:
    """The field's phases with each side of a gap named by what it is rich in, from the point
    equilibrium at (temperature_K, x); None where that equilibrium has other phases or no answer."""
    from ladle.engine import equilibrate
    from ladle.tui.phase_names import equilibrium_labels

    try:
        eq = equilibrate(system, temperature_K, np.asarray(x, dtype=float))
    except (ValueError, ArithmeticError):
        return None
    found = [p.name for p in eq.phases]
    if sorted(found) != sorted(phases):
        return None
    names = trade_names(system)
    labels = equilibrium_labels(system, eq.phases, temperature_K)
    return " + ".join(label if found.count(name) > 1 else names.phase_name(name, temperature_K) or name
                      for name, label in zip(found, labels, strict=True))


def labelled_fields(wanted: list[tuple[str, float, float]], frame: Frame,
                    first: Sequence[Label] = ()) -> tuple[list[Label], list[str]]:
    """Labels for fields (name, x, y), largest first, after the labels `first` (placed where
    they fit): the name where it fits, else a number (1, 2, ...) where that fits; the key lists
    what each number stands for, then any field that got no label at all (unnumbered, so that
    the numbers on the picture run 1, 2, 3 ... without a gap)."""
    placed = place_labels(list(first) + [Label(name, x, y) for name, x, y in wanted], frame)
    named = {label.text for label in placed}
    numbered, key, unmarked = [], [], []
    for name, x, y in wanted:
        if name in named:
            continue
        tag = str(len(numbered) + 1)
        trial = place_labels(placed + numbered + [Label(tag, x, y)], frame)
        if len(trial) > len(placed) + len(numbered):
            numbered.append(Label(tag, x, y))
            key.append(f"{tag}: {name}")
        else:
            unmarked.append(f"too small: {name}")
    return placed + numbered, key + unmarked


def isopleth_scene(iso, unit: str, glyphs: Glyphs, width: int, height: int,
                   line_labels: Sequence[str | None] = (),
                   window: tuple[float, float, float, float] | None = None) -> SectionScene:
    """The isopleth's zero-phase-fraction lines, its invariant lines and every field labelled,
    for this size; compositions as percent of the varying element in the section's basis,
    temperatures in `unit` ("C", "K" or "F"). `line_labels` holds the trade's name of each line
    of `iso` (None where the file names none; engine.diagrams.isopleth.trade_labels): each name
    is written once, just above the middle of its longest line, before the fields' labels.
    `window` (u_low, u_high along the section, T_low, T_high in K; None: all of it) is the part
    shown; a field is then labelled at its grid node inside the window nearest the middle of
    those, and a field with none there is left out of the key."""
    columns, rows = plot_area(width, height)
    low, high = 100.0 * iso.content(0.0), 100.0 * iso.content(1.0)
    u_low, u_high, T_low, T_high = window or (0.0, 1.0, *iso.temperature_range_K)
    x_lo, x_hi = low + u_low * (high - low), low + u_high * (high - low)
    T_lo, T_hi = kelvin_to(T_low, unit), kelvin_to(T_high, unit)
    frame = Frame(min(x_lo, x_hi), max(x_lo, x_hi), min(T_lo, T_hi), max(T_lo, T_hi), columns, rows)

    def shown(points) -> tuple[np.ndarray, np.ndarray]:
        pts = np.asarray(points, dtype=float)
        return low + pts[:, 0] * (high - low), np.array([kelvin_to(T, unit) for T in pts[:, 1]])

    curves = [thin_polyline(*shown(line.points), frame) for line in iso.lines]
    flats = []
    for inv in iso.invariants:
        T = kelvin_to(inv.temperature_K, unit)
        flats.append(([low + inv.u_range[0] * (high - low), low + inv.u_range[1] * (high - low)], [T, T]))
    wanted = []
    for f in sorted(iso.fields, key=lambda f: -len(f.nodes)):
        middle = f.middle if window is None else _middle_inside(f.nodes, (u_low, u_high, T_low, T_high))
        if middle is not None:
            x = section_mole_fractions(iso.system, iso.start, iso.end, iso.basis, np.array([middle[0]]))[0]
            wanted.append((field_name(iso.system, f.phases, middle[1], x), *(float(v[0]) for v in shown([middle]))))
    named = _named_line_labels([shown(line.points) for line in iso.lines], line_labels, frame)
    labels, key = labelled_fields(wanted, frame, named)
    return SectionScene(frame, joined(curves), joined(flats), ([], []), labels, key,
                        f"{iso.element} {iso.basis}%", f"T {glyphs.temperature_unit(unit)}")


def _middle_inside(nodes, window: tuple[float, float, float, float]) -> tuple[float, float] | None:
    """The node (u, T in K) inside `window` (u_low, u_high, T_low, T_high) nearest the middle of
    those inside, in shares of the window; None where none is inside."""
    u_low, u_high, T_low, T_high = window
    pts = np.array(nodes, dtype=float)
    inside = pts[(pts[:, 0] >= u_low) & (pts[:, 0] <= u_high) & (pts[:, 1] >= T_low) & (pts[:, 1] <= T_high)]
    if not len(inside):
        return None
    scale = np.array([max(u_high - u_low, 1e-12), max(T_high - T_low, 1e-9)])
    centre = inside.mean(axis=0)
    u, T = inside[int(np.argmin(np.sum(((inside - centre) / scale) ** 2, axis=1)))]
    return float(u), float(T)


def _named_line_labels(lines: list[tuple[np.ndarray, np.ndarray]], names: Sequence[str | None],
                       frame: Frame) -> list[Label]:
    """One label per trade name of the lines (x, y on screen), shortest names first: just above
    the middle point of the longest line (in character cells) that carries it."""
    longest: dict[str, tuple[float, Label]] = {}
    row = (frame.y_high - frame.y_low) / max(frame.rows - 1, 1)
    for (x, y), name in zip(lines, names):
        if name is None:
            continue
        cells = np.array([frame.cell(float(a), float(b)) for a, b in zip(x, y)])
        length = float(np.abs(np.diff(cells, axis=0)).sum()) if len(cells) > 1 else 0.0
        middle = len(x) // 2
        if name not in longest or length > longest[name][0]:
            longest[name] = (length, Label(name, float(x[middle]), float(y[middle]) + row))
    return [label for _, label in sorted(longest.values(), key=lambda item: (len(item[1].text), item[1].text))]


def triangle_point(x: np.ndarray) -> tuple[np.ndarray, np.ndarray]:
    """Plane coordinates of ternary mole fractions (..., 3) on the triangle with the first
    element at the lower left, the second at the lower right, the third at the top."""
    x = np.asarray(x, dtype=float)
    return x[..., 1] + 0.5 * x[..., 2], _SQRT3_2 * x[..., 2]


def _triangle_frame(system, width: int, height: int) -> tuple[Frame, tuple[list[float], list[float]], list[Label], str]:
    """The composition triangle's frame for this size, its sides (and, zoomed, the edges of the
    covered part) as one series, the labels of its corners and the axis title. Where the model
    covers only a corner (ZOOM_BELOW), the frame shows that part with a margin, in the whole
    triangle's proportions, its far edges labelled with their at%. The frame has the plot's own
    cells (no ticks: everything inside the border but the axis title), so that labels judged
    apart here are apart on the screen."""
    columns, rows = width - 2, height - 3
    els = system.elements
    whole = Frame(-0.05, 1.05, -0.05, _SQRT3_2 + 0.05, columns, rows)
    corners = np.array([[1.0, 0, 0], [0, 1.0, 0], [0, 0, 1.0], [1.0, 0, 0]])
    title = f"mole fractions ({els[1]} to the right, {els[2]} up)"
    labels = [Label(els[0], 0.0, -0.04), Label(els[1], 1.0, -0.04), Label(els[2], 0.5, _SQRT3_2 + 0.03)]
    (lo1, hi1), (lo2, hi2) = system.element_ranges[1:3]
    part = np.array([[1.0 - a - b, a, b] for a in (lo1, hi1) for b in (lo2, hi2) if a + b <= 1.0])
    px, py = triangle_point(part)
    span = max(float(np.ptp(px)), float(np.ptp(py)) * (whole.x_high - whole.x_low) / (whole.y_high - whole.y_low))
    if len(part) < 4 or span >= ZOOM_BELOW:
        return whole, joined([triangle_point(corners)]), labels, title
    x_span = span * (1.0 + 2.0 * ZOOM_MARGIN)
    y_span = x_span * (whole.y_high - whole.y_low) / (whole.x_high - whole.x_low)
    x0, y0 = float(px.min()) - ZOOM_MARGIN * span, float(py.min()) - ZOOM_MARGIN * span
    frame = Frame(x0, x0 + x_span, y0, y0 + y_span, columns, rows)
    covered = np.array([[1.0 - lo1 - hi2, lo1, hi2], [1.0 - hi1 - hi2, hi1, hi2], [1.0 - hi1 - lo2, hi1, lo2]])
    row = y_span / max(rows - 1, 1)
    lx, ly = triangle_point(np.array([[1.0 - hi1, hi1, 0.0], [1.0 - hi2, 0.0, hi2], [1.0, 0.0, 0.0]]))
    labels = [Label(f"{els[1]} {100 * hi1:g}", float(lx[0]), float(ly[0]) - row),
              Label(f"{els[2]} {100 * hi2:g}", float(lx[1]), float(ly[1]) + row),
              Label(els[0], float(lx[2]), float(ly[2]) - row)]
    title = f"at% ({els[1]} to the right, {els[2]} up): covered part"
    return frame, joined([triangle_point(corners), triangle_point(covered)]), labels, title


def triangle_scene(section, glyphs: Glyphs, width: int, height: int) -> SectionScene:
    """The ternary isothermal section on its triangle: the triangle's sides, the single-phase
    fields' edges, tie-lines, three-phase triangles and every field labelled (zoomed to the part
    the model covers where that is a corner)."""
    system = section.system
    frame, sides, corners, title = _triangle_frame(system, width, height)
    ties = [triangle_point(np.array(t.ends)) for f in section.fields for t in f.tie_lines]
    triangles = [triangle_point(np.array(list(t) + [t[0]])) for f in section.fields for t in f.triangles]
    wanted = []
    for f in sorted(section.fields, key=lambda f: -f.nodes):
        x, y = triangle_point(np.array(f.middle))
        wanted.append((field_name(system, f.phases, section.temperature_K, f.middle), float(x), float(y)))
    labels, key = labelled_fields(wanted, frame, corners)
    return SectionScene(frame, sides, joined(triangles), joined(ties), labels, key, title, None)


def projection_scene(projection, glyphs: Glyphs, width: int, height: int) -> SectionScene:
    """A ternary's liquidus projection on its triangle: the valleys (the liquid along liquid +
    two solids) as boundaries, each invariant point marked by its number (1 hottest), and each
    primary-phase field labelled by its solid."""
    frame, sides, corners, title = _triangle_frame(projection.system, width, height)
    valleys = [thin_polyline(*triangle_point(np.array([x for _T, x in v.points])), frame) for v in projection.valleys]
    wanted = [(f.phase, *(float(v) for v in triangle_point(np.array(f.middle)))) for f in projection.fields]
    labels, key = labelled_fields(wanted, frame)
    points = [triangle_point(np.array(r.phases[0][1])) for r in projection.invariants]
    numbers = [Label(str(k + 1), float(x), float(y) + 0.04) for k, (x, y) in enumerate(points)]
    shown = place_labels(corners + labels + numbers, frame)
    dots = [(np.array([x]), np.array([y])) for x, y in points]
    return SectionScene(frame, joined([sides, *valleys]), joined(dots), ([], []), shown, key, title, None)


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
    plot_within(plt, frame, *scene.thin, marker=glyphs.crosshair_marker, color=TIE_LINE_COLOUR)
    draw_lines_and_labels(plt, frame, scene.boundaries, scene.invariants, scene.labels, glyphs)
