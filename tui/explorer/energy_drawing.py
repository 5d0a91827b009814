"""The free-energy view's picture: at the cursor's temperature, each phase's Gibbs energy
against composition, the lower envelope (the alloy's equilibrium Gibbs energy), the common
tangents that make the two-phase fields, and the cursor's composition.

Energies are drawn relative to the straight line joining the envelope's values at the
window's two edges, in kJ/mol: subtracting a straight line changes no tangent, and it makes
curves that differ by a few hundred J/mol visible beside totals of tens of kJ/mol.
"""

from __future__ import annotations

from dataclasses import dataclass

import numpy as np

from .exploration import Exploration
from .glyphs import Glyphs
from .plotting import Frame, Label, draw_frame, inside_frame, joined, place_choices, plot_within, thin_polyline
from .diagram_drawing import plot_area

ENVELOPE_POINTS = 120        # envelope samples across the window (drawn: one per cell)
CURVE_COLOURS = ("cyan", "magenta", "green", "blue", "yellow", "white")
TANGENT_COLOUR = "yellow"
ENVELOPE_COLOUR = "white"
PLAIN_CURVE_MARKERS = ("+", "x", "%", "@", "&", "$")   # without colour: one mark per phase
ENVELOPE_LABEL = "lowest G (equilibrium)"
TANGENT_LABEL = "common tangent"
HEADROOM = 0.8               # room above the envelope, as a share of its own height
SMALLEST_SPAN_KJ = 0.5       # the y range never shrinks below this (kJ/mol)


@dataclass(frozen=True)
class EnergyScene:
    """The picture in screen units: composition of B (%), energy (kJ/mol, relative)."""

    frame: Frame
    curves: list[tuple[str, list[float], list[float]]]    # phase, x, y (NaN-joined pieces)
    points: list[tuple[str, float, float]]                # compounds: name, x, y
    envelope: tuple[list[float], list[float]]
    tangents: tuple[list[float], list[float]]
    labels: list[Label]
    x_title: str


def energy_scene(exploration: Exploration, width: int, height: int) -> EnergyScene:
    """The curves, envelope and tangents at the cursor's temperature, for this window and size."""
    scales, window = exploration.scales, exploration.window
    section = exploration.section()
    x_env = np.linspace(window.x_low, window.x_high, ENVELOPE_POINTS)
    g_env = section.envelope(1.0 - x_env, x_env)
    slope = (g_env[-1] - g_env[0]) / max(window.x_high - window.x_low, 1e-12)

    def relative(x: np.ndarray, g: np.ndarray) -> np.ndarray:
        """kJ/mol above the reference line through the envelope's ends."""
        return (np.asarray(g) - (g_env[0] + slope * (np.asarray(x) - window.x_low))) / 1000.0

    env_rel = relative(x_env, g_env)
    low, high = float(env_rel.min()), float(env_rel.max())
    span = max(high - low, SMALLEST_SPAN_KJ)
    columns, rows = plot_area(width, height)
    frame = Frame(scales.shown_composition(window.x_low), scales.shown_composition(window.x_high),
                  low - 0.1 * span, high + HEADROOM * span, columns, rows)
    curves, points, labels = [], [], []

    def inside(x):
        return (x >= window.x_low) & (x <= window.x_high)

    for name, (x, g) in section.curves().items():
        x = np.asarray(x, dtype=float)
        y = relative(x, g)
        shown_x = scales.shown_composition(x)
        if x.size == 1:
            if inside(x[0]) and frame.y_low <= y[0] <= frame.y_high:
                points.append((name, float(shown_x[0]), float(y[0])))
                above = float(y[0]) + span * 0.12     # its name above it, else below it
                label_y = above if above <= frame.y_high else float(y[0]) - span * 0.12
                labels.append([inside_frame(Label(name, float(shown_x[0]), label_y), frame)])
            continue
        keep = inside(x) & (y <= frame.y_high + span)
        if not (keep & (y >= frame.y_low) & (y <= frame.y_high)).any():
            continue   # nothing of it on the plot (a labelled series must show somewhere)
        xs, ys = thin_polyline(shown_x[keep], y[keep], frame, per_cell=(1, 1))
        curves.append((name, xs.tolist(), ys.tolist()))
        lowest = int(np.argmin(ys))
        shown = np.flatnonzero((ys >= frame.y_low) & (ys <= frame.y_high))   # the curve's points on the plot
        elsewhere = [int(shown[int(share * (shown.size - 1))]) for share in (0.25, 0.75, 0.5)]
        labels.append([Label(name, float(xs[i]), float(ys[i]) + side * span * 0.08)   # under its lowest point,
                       for i, side in [(lowest, -1)] + [(i, s) for i in elsewhere for s in (-1, 1)]])  # else beside another

    tangents = []
    for tie in section.tie_lines:
        ends = np.array(tie.x_B)
        if ends.max() < window.x_low or ends.min() > window.x_high:
            continue   # a tangent wholly outside the window (zoomed in, or a partial model)
        g_ends = np.array([tie.mu[0] * (1 - xb) + tie.mu[1] * xb for xb in ends])
        tangents.append((scales.shown_composition(ends), relative(ends, g_ends)))
    element_B = exploration.system.elements[1]
    envelope = thin_polyline(scales.shown_composition(x_env), env_rel, frame, per_cell=(1, 1))
    return EnergyScene(frame, curves, points, (envelope[0].tolist(), envelope[1].tolist()),
                       joined(tangents), place_choices(labels, frame),
                       f"{element_B} {scales.composition_unit}%   G kJ/mol, relative (see right)")


def draw_energy(plt, scene: EnergyScene, glyphs: Glyphs, colour: bool = True) -> None:
    """Issue the plot calls: curves, envelope, tangents, labels (each curve's in its colour) and
    a legend of the envelope and the tangent (the explorer writes the cursor's line over the
    built picture). Without `colour` each phase's curve has its own mark, named in the legend
    too."""
    frame = scene.frame
    draw_frame(plt, frame, scene.x_title)
    for index, (name, xs, ys) in enumerate(scene.curves):
        if colour:
            plot_within(plt, frame, xs, ys, marker=glyphs.boundary_marker,
                        color=CURVE_COLOURS[index % len(CURVE_COLOURS)])
        else:
            plot_within(plt, frame, xs, ys, marker=PLAIN_CURVE_MARKERS[index % len(PLAIN_CURVE_MARKERS)],
                        label=name)
    plot_within(plt, frame, *scene.envelope, marker=glyphs.envelope_marker, color=ENVELOPE_COLOUR,
                label=ENVELOPE_LABEL)
    plot_within(plt, frame, *scene.tangents, marker=glyphs.invariant_marker, color=TANGENT_COLOUR,
                label=TANGENT_LABEL)
    for _, x, y in scene.points:
        plt.scatter([x], [y], marker=glyphs.cursor_marker)
    curve_colour = {name: CURVE_COLOURS[i % len(CURVE_COLOURS)] for i, (name, _, _) in enumerate(scene.curves)}
    for label in scene.labels:      # in colour, a curve's name takes its curve's colour
        plt.text(label.text, label.x, label.y, alignment="center",
                 color=curve_colour.get(label.text) if colour else None)
