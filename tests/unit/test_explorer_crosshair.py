"""The cursor written over a built plot: found where plotext draws the same point, only on blank
cells (reaction lines and labels stay), the mark on top; Unicode and ASCII frames."""

from __future__ import annotations

import plotext
from rich.text import Text

from ladle.tui.explorer.crosshair import Crosshair, plot_area_of, with_crosshair
from ladle.tui.explorer.glyphs import ASCII, UNICODE
from ladle.tui.explorer.plotting import Frame


def _picture(points, width=40, height=12):
    """A plotext picture of the points with limits 0..10 on both axes, without colour."""
    plotext.clear_figure()
    plotext.plotsize(width, height)
    plotext.theme("clear")
    plotext.xlim(0, 10)
    plotext.ylim(0, 10)
    xs, ys = zip(*points)
    plotext.scatter(list(xs), list(ys), marker="#")
    return plotext.uncolorize(plotext.build())


def test_the_cursor_lands_where_plotext_draws_the_same_point():
    for x, y in ((2.0, 3.0), (7.5, 8.2), (0.0, 10.0)):
        reference = _picture([(x, y)]).split("\n")
        area = plot_area_of(reference)
        (row, column), = [(r, c) for r in range(area.rows) for c in range(area.columns)
                          if reference[area.top + r][area.left + c] == "#"]
        blank = _picture([(-5.0, -5.0)])                      # nothing inside the limits
        frame = Frame(0.0, 10.0, 0.0, 10.0, 0, 0)
        drawn = with_crosshair(Text(blank), Crosshair(frame, x, y), UNICODE).plain.split("\n")
        assert drawn[area.top + row][area.left + column] == UNICODE.cursor_marker


def test_the_crosshair_takes_only_blank_cells():
    picture = Text("┌─────┐\n│ ═══ │\n│     │\n└─────┘")
    drawn = with_crosshair(picture, Crosshair(Frame(0.0, 4.0, 0.0, 1.0, 5, 2), 0.0, 1.0), UNICODE)
    lines = drawn.plain.split("\n")
    assert lines[1] == "│╋═══·│"                                # the reaction line stays
    assert lines[2] == "│·    │"


def test_ascii_frames_are_found_too():
    area = plot_area_of(["  +-----+", "10|     |", "  |     |", "  +-+---+", "   0    "])
    assert (area.top, area.left, area.rows, area.columns) == (1, 3, 2, 5)
    drawn = with_crosshair(Text("+---+\n|   |\n+---+"), Crosshair(Frame(0, 1, 0, 1, 3, 1), x=0.5), ASCII)
    assert drawn.plain.split("\n")[1] == "| . |"


def test_the_crosshair_leaves_the_spaces_between_a_labels_words():
    picture = Text("┌──────────┐\n│ lowest G │\n│          │\n└──────────┘")
    drawn = with_crosshair(picture, Crosshair(Frame(0.0, 9.0, 0.0, 1.0, 10, 2), x=6.0), UNICODE)
    lines = drawn.plain.split("\n")
    assert lines[1] == "│ lowest G │" and lines[2] == "│      ·   │"
