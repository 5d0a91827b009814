"""The cursor drawn over a plot's finished picture, so that a cursor move does not rebuild it.

The picture (plotext's text, styled) is built once per window, units and size, without the
cursor; each move writes the crosshair into a copy of it. The crosshair takes only blank cells
of the plot area (not the spaces between a label's words), so boundaries, invariant lines and
labels stay visible under it; the cursor's own mark goes on top. Cells are found as plotext
places data: a value v between the axis limits lo and hi lands in cell
floor(0.5 + (n - 1) (v - lo) / (hi - lo)) of the n cells across (or up) the plot area inside
the frame.
"""

from __future__ import annotations

import math
from dataclasses import dataclass

from rich.segment import Segment
from rich.style import Style
from rich.text import Text
from textual.strip import Strip

from .glyphs import Glyphs
from .plotting import Frame

_BLANK = (" ", "\u2800")             # a space, and an empty braille cell
CURSOR_STYLE = Style(color="bright_red", bold=True)   # the cursor in every view


@dataclass(frozen=True)
class Crosshair:
    """Where the cursor is, in the plot's data units: a line across at `y` and a line up at
    `x` (either may be None), and the cursor's mark where both are given."""

    frame: Frame
    x: float | None = None
    y: float | None = None


@dataclass(frozen=True)
class PlotArea:
    """The character cells inside a picture's frame: the first row and column, and how many."""

    top: int
    left: int
    rows: int
    columns: int


def plot_area_of(lines: list[str]) -> PlotArea | None:
    """The cells inside the frame of a plotext picture (its lines), or None without a frame.
    The frame is found by its four corners (box-drawing, or '+' in ASCII): the first line with
    a corner followed by a horizontal line, and the first line below it with corners in the
    same two columns."""
    for top, line in enumerate(lines):
        left = next((i for i, (a, b) in enumerate(zip(line, line[1:]))
                     if a in "┌+" and b in "─-"), None)
        if left is None:
            continue
        right = max(line.rfind("┐"), line.rfind("+"))
        if right <= left + 1:
            return None
        for bottom in range(top + 2, len(lines)):
            below = lines[bottom]
            if len(below) > right and below[left] in "└+" and below[right] in "┘+":
                return PlotArea(top + 1, left + 1, bottom - top - 1, right - left - 1)
        return None
    return None


def _cell(value: float, low: float, high: float, cells: int) -> int | None:
    """The cell (0 = left or bottom) where plotext draws `value`; None outside the limits."""
    if not low <= value <= high or high <= low:
        return None
    return math.floor(round(0.5 + (cells - 1) * (value - low) / (high - low), 8))


def _free(line: str, column: int, area: PlotArea) -> bool:
    """Whether the crosshair may take this cell of a picture's line: a blank one, but not the
    space between two words of a label or legend (non-blank cells on both sides within the
    plot area)."""
    if line[column] not in _BLANK:
        return False
    inside = area.left < column < area.left + area.columns - 1
    return not (inside and line[column - 1] not in _BLANK and line[column + 1] not in _BLANK)


def crosshair_cells(lines: list[str], crosshair: Crosshair,
                    glyphs: Glyphs) -> dict[tuple[int, int], str]:
    """The characters to write over the picture (its lines): (line, column) -> character. The
    crosshair takes the blank cells of the plot area only; the cursor's mark takes its cell."""
    area = plot_area_of(lines)
    if area is None:
        return {}
    frame = crosshair.frame
    column = None if crosshair.x is None else _cell(crosshair.x, frame.x_low, frame.x_high,
                                                     area.columns)
    up = None if crosshair.y is None else _cell(crosshair.y, frame.y_low, frame.y_high, area.rows)
    row = None if up is None else area.rows - 1 - up
    wanted: list[tuple[int, int]] = []
    if row is not None:
        wanted += [(row, c) for c in range(area.columns)]
    if column is not None:
        wanted += [(r, column) for r in range(area.rows)]
    cells = {(area.top + r, area.left + c): glyphs.crosshair_marker for r, c in wanted
             if _free(lines[area.top + r], area.left + c, area)}
    if row is not None and column is not None:
        cells[(area.top + row, area.left + column)] = glyphs.cursor_marker
    return cells


def with_crosshair(picture: Text, crosshair: Crosshair, glyphs: Glyphs) -> Text:
    """A copy of `picture` with the crosshair written into the blank cells of its plot area."""
    lines = picture.plain.split("\n")
    cells = crosshair_cells(lines, crosshair, glyphs)
    starts = [0]
    for line in lines[:-1]:
        starts.append(starts[-1] + len(line) + 1)
    chars = list(picture.plain)
    for (line, column), mark in cells.items():
        chars[starts[line] + column] = mark
    drawn = picture.copy()
    drawn.plain = "".join(chars)
    for line, column in cells:
        at = starts[line] + column
        drawn.stylize(CURSOR_STYLE, at, at + 1)
    return drawn


def strips_with_crosshair(strips: list[Strip], cells: dict[tuple[int, int], str],
                          base: Style) -> list[Strip]:
    """The screen lines of a picture (one Strip per line, one cell per character) with `cells`
    written in the cursor's style over `base` (the widget's own style)."""
    style = base + CURSOR_STYLE
    by_line: dict[int, list[tuple[int, str]]] = {}
    for (line, column), mark in cells.items():
        by_line.setdefault(line, []).append((column, mark))
    out = list(strips)
    for line, marks in by_line.items():
        if line >= len(out):
            continue
        strip, pieces, at = out[line], [], 0
        for column, mark in sorted(marks):
            pieces += [strip.crop(at, column), Strip([Segment(mark, style)], 1)]
            at = column + 1
        pieces.append(strip.crop(at, strip.cell_length))
        out[line] = Strip.join(pieces)
    return out
