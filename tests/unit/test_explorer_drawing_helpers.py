"""Plot helpers, glyph sets and the key map of the explorer."""

import numpy as np

from ladle.tui.explorer.glyphs import ASCII, UNICODE
from ladle.tui.explorer.keymap import MAIN_KEYS, help_rows, key_bar_text
from ladle.engine import find_system
from ladle.tui.explorer.cursor import Cursor
from ladle.tui.explorer.energy_drawing import draw_energy, energy_scene
from ladle.tui.explorer.exploration import Exploration
from ladle.tui.explorer.plotting import (Frame, Label, clipped_to_frame, inside_frame, joined, place_choices,
                                         place_labels, round_ticks, thin_polyline)
from ladle.tui.explorer.scales import Scales

FRAME = Frame(0.0, 100.0, 0.0, 400.0, columns=40, rows=20)


def test_thinning_keeps_the_ends_and_one_point_per_dot():
    x = np.linspace(0.0, 100.0, 10_001)
    y = 400.0 * (x / 100.0) ** 2
    tx, ty = thin_polyline(x, y, FRAME)
    assert (tx[0], ty[0], tx[-1], ty[-1]) == (x[0], y[0], x[-1], y[-1])
    # 80 dots across and 80 down: a monotone curve crosses at most 160 dot cells.
    assert len(tx) <= 2 * (FRAME.columns * 2 + FRAME.rows * 4)
    assert len(tx) >= FRAME.columns * 2


def test_joined_curves_are_separated_by_gaps():
    xs, ys = joined([([0, 1], [2, 3]), ([4], [5])])
    assert xs[:2] == [0.0, 1.0] and np.isnan(xs[2]) and xs[3] == 4.0
    assert np.isnan(ys[2]) and len(xs) == len(ys) == 4


def test_labels_never_overlap_and_stay_inside():
    wanted = [Label("liquid", 50, 300), Label("liquid+fcc", 52, 300), Label("fcc", 50, 100),
              Label("outside", 99.5, 100)]
    placed = place_labels(wanted, FRAME)
    assert [label.text for label in placed] == ["liquid", "fcc"]


def test_ticks_are_round():
    assert round_ticks(27.0, 377.0, 4) == [100.0, 200.0, 300.0]
    assert round_ticks(0.0, 100.0, 5) == [0.0, 20.0, 40.0, 60.0, 80.0, 100.0]


def test_ascii_glyphs_are_ascii_and_plot_text_keeps_its_layout():
    plot = "┌──┐\n│⣿⠁•│\n└┬─┘ 183°C ═ ╋"
    flat = ASCII.plot_text(plot)
    assert flat.isascii() and len(flat) == len(plot)
    assert [len(line) for line in flat.split("\n")] == [len(line) for line in plot.split("\n")]
    assert UNICODE.plot_text(plot) == plot
    for name in ("degree", "left", "right", "up", "down", "boundary_marker", "invariant_marker",
                 "crosshair_marker", "cursor_marker", "envelope_marker"):
        assert getattr(ASCII, name).isascii()


def test_key_bar_fits_80_columns_and_always_offers_help_and_quit():
    for glyphs in (UNICODE, ASCII):
        bar = key_bar_text(glyphs, 80)
        assert len(bar) <= 80 and "? help" in bar and "q quit" in bar
        assert "u t" in bar and "w p" in bar and "g go" in bar and "1-4 view" in bar
        assert key_bar_text(glyphs, 200).count("  ") >= 8   # every short form when there is room
    assert key_bar_text(ASCII, 80).isascii()


def test_help_lists_every_key_once():
    rows = help_rows(UNICODE, "Ag")
    assert len(rows) == len(MAIN_KEYS)
    assert any("Ag=12wt%" in what for _, what in rows)    # the open system's element
    keys = [key for use in MAIN_KEYS for key in use.keys.split(",")]
    assert len(keys) == len(set(keys))


def test_a_label_at_the_frames_edge_moves_inside_and_stays_over_its_point():
    edge = inside_frame(Label("AuSn", 100.0, 200.0), FRAME)
    column, _ = FRAME.cell(edge.x, edge.y)
    first = column - len("AuSn") // 2
    assert (first, first + len("AuSn") - 1) == (FRAME.columns - 4, FRAME.columns - 1)   # over x=100
    assert place_labels([edge], FRAME) == [edge]
    assert inside_frame(Label("middle", 50.0, 200.0), FRAME) == Label("middle", 50.0, 200.0)


def test_a_compound_at_the_energy_windows_edge_is_named():
    # Au-Sn at 600 C, 7.32 wt% Sn: the model covers 0-50 at% Sn, so AuSn (37.6 wt% Sn) sits on
    # the window's right edge near its top; its point was drawn with the cursor's mark and no
    # name (the label, centred on the edge and above the top, was dropped).
    system = find_system("au-sn")
    e = Exploration(system, Scales(system.molar_mass, "C", "wt"), Cursor(873.15, 0.116))
    scene = energy_scene(e, 44, 20)      # the energy plot's size on an 80x24 screen
    assert [name for name, _, _ in scene.points] == ["AuSn"]
    assert "AuSn" in [label.text for label in scene.labels]


def test_a_curve_crowded_out_at_its_lowest_point_is_named_elsewhere():
    # Au-Sn at 600 C: fcc (Au) and hcp (zeta) have their lowest points in one cell, so the hcp
    # curve went unnamed; it is now named at another of its points, in its own colour.
    system = find_system("au-sn")
    e = Exploration(system, Scales(system.molar_mass, "C", "wt"), Cursor(873.15, 0.116))
    scene = energy_scene(e, 46, 21)
    assert {"fcc", "hcp", "liquid"} <= {label.text for label in scene.labels}
    first, second = Label("first", 50.0, 200.0), Label("second", 50.0, 200.0)
    aside = Label("second", 20.0, 200.0)
    assert place_choices([[first], [second, aside]], FRAME) == [first, aside]


class _Recorder:
    """Records plotext's text calls (the rest of the figure API does nothing)."""

    def __init__(self):
        self.texts = []

    def text(self, label, x, y, **options):
        self.texts.append((label, options.get("color")))

    def __getattr__(self, name):
        return lambda *args, **kwargs: None


def test_each_curves_name_takes_its_curves_colour():
    system = find_system("au-sn")
    e = Exploration(system, Scales(system.molar_mass, "C", "wt"), Cursor(873.15, 0.116))
    scene = energy_scene(e, 46, 21)
    plt = _Recorder()
    draw_energy(plt, scene, UNICODE)
    colours = dict(plt.texts)
    assert colours["fcc"] != colours["hcp"] and colours["AuSn"] is None
    plt = _Recorder()
    draw_energy(plt, scene, UNICODE, colour=False)
    assert all(colour is None for _, colour in plt.texts)


def _on_polyline(px: float, py: float, xs: list[float], ys: list[float]) -> bool:
    """Whether the point lies on one of the polyline's segments (to 1e-9 of the frame's size)."""
    for ax, ay, bx, by in zip(xs[:-1], ys[:-1], xs[1:], ys[1:]):
        if np.isnan(ax) or np.isnan(bx):
            continue
        dx, dy = bx - ax, by - ay
        length2 = dx * dx + dy * dy
        u = 0.0 if length2 == 0.0 else min(max(((px - ax) * dx + (py - ay) * dy) / length2, 0.0), 1.0)
        if np.hypot((ax + u * dx - px) / 100.0, (ay + u * dy - py) / 400.0) < 1e-9:
            return True
    return False


def test_a_line_is_cut_at_the_frame_widened_by_a_cell_and_keeps_what_lies_inside():
    # one cell is 2.5 across and 20 down; a segment from far off the left edge starts at -2.5
    xs, ys = clipped_to_frame([-1e9, 50.0, 60.0], [200.0, 200.0, 300.0], FRAME)
    assert xs == [-2.5, 50.0, 60.0] and ys == [200.0, 200.0, 300.0]
    # leaving on the right and coming back: two pieces parted by a gap
    xs, ys = clipped_to_frame([50.0, 1e6, 50.0], [100.0, 100.0, 300.0], FRAME)
    assert len(xs) == 5 and np.isnan(xs[2]) and xs[:2] == [50.0, 102.5] and xs[3:] == [102.5, 50.0]
    assert ys[:2] == [100.0, 100.0] and abs(ys[3] - 300.0) < 0.1 and ys[4] == 300.0
    # wholly outside: nothing; wholly inside: the same points
    assert clipped_to_frame([-50.0, -10.0], [500.0, 900.0], FRAME) == ([], [])
    assert clipped_to_frame([10.0, 20.0], [30.0, 40.0], FRAME) == ([10.0, 20.0], [30.0, 40.0])


def test_random_lines_keep_every_point_inside_the_widened_frame_and_nothing_outside():
    rng = np.random.default_rng(4)
    for _ in range(200):
        x = rng.normal(50.0, 300.0, 12)
        y = rng.normal(200.0, 1200.0, 12)
        xs, ys = clipped_to_frame(x, y, FRAME)
        shown = ~np.isnan(xs)
        assert np.all((np.array(xs)[shown] >= -2.5 - 1e-9) & (np.array(xs)[shown] <= 102.5 + 1e-9))
        assert np.all((np.array(ys)[shown] >= -20.0 - 1e-9) & (np.array(ys)[shown] <= 420.0 + 1e-9))
        for i in range(len(x) - 1):
            for u in np.linspace(0.0, 1.0, 11):
                px, py = x[i] + u * (x[i + 1] - x[i]), y[i] + u * (y[i + 1] - y[i])
                if -2.5 <= px <= 102.5 and -20.0 <= py <= 420.0:
                    assert _on_polyline(px, py, xs, ys)


def test_zooming_in_far_on_a_binary_draws_only_inside_the_window():
    """Twelve zooms on Pb-Sn took 36 s and 660 MB to draw (plotext joins the points of a segment
    reaching far beyond the window dot by dot), sixteen ran out of memory, and at about fifty the
    window's floats collapsed to one value (a ZeroDivisionError)."""
    import plotext as plt

    from ladle.tui.explorer.cursor import SMALLEST_SPAN_K, SMALLEST_SPAN_X
    from ladle.tui.explorer.diagram_drawing import diagram_scene, draw_diagram

    exploration = Exploration(find_system("pb-sn"))
    for _ in range(60):
        exploration.zoom(True)
    window = exploration.window
    assert window.T_high - window.T_low >= SMALLEST_SPAN_K * (1 - 1e-9)
    assert window.x_high - window.x_low >= SMALLEST_SPAN_X * (1 - 1e-9)
    scene = diagram_scene(exploration, UNICODE, 80, 20)
    plt.clear_figure()
    plt.plotsize(80, 20)
    plotted = []
    original_plot = plt.plot
    try:
        plt.plot = lambda *args, **kwargs: (plotted.append(args), original_plot(*args, **kwargs))
        draw_diagram(plt, scene, UNICODE)
    finally:
        plt.plot = original_plot
    assert "(Pb)" in plt.build()
    frame = scene.frame
    cell_x = (frame.x_high - frame.x_low) / frame.columns
    for xs, _ys in plotted:
        shown = np.array(xs)[~np.isnan(xs)]
        assert np.all((shown >= frame.x_low - cell_x * 1.000001) & (shown <= frame.x_high + cell_x * 1.000001))
