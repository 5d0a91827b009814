"""Plot helpers, glyph sets and the key map of the explorer."""

import numpy as np

from ladle.tui.explorer.glyphs import ASCII, UNICODE
from ladle.tui.explorer.keymap import MAIN_KEYS, help_rows, key_bar_text
from ladle.engine import find_system
from ladle.tui.explorer.cursor import Cursor
from ladle.tui.explorer.energy_drawing import draw_energy, energy_scene
from ladle.tui.explorer.exploration import Exploration
from ladle.tui.explorer.plotting import (Frame, Label, inside_frame, joined, place_choices,
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
