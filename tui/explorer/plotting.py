"""Plot data prepared for a picture of a given size: thinned curves and placed labels.

Plain numpy, no screen code. The plot's build time grows with the number of points drawn, so
every curve is thinned to what the character cells can show before it is drawn.
"""

from __future__ import annotations

from collections.abc import Iterable, Sequence
from dataclasses import dataclass

import numpy as np

from .cursor import nice_step

SUBCELLS_X = 2   # braille dots per character cell, across
SUBCELLS_Y = 4   # and down


@dataclass(frozen=True)
class Frame:
    """The data window shown on a plot area of `columns` x `rows` character cells."""

    x_low: float
    x_high: float
    y_low: float
    y_high: float
    columns: int
    rows: int

    def cell(self, x: float, y: float) -> tuple[int, int]:
        """The (column, row) of a data point; row 0 at the top."""
        column = (x - self.x_low) / (self.x_high - self.x_low) * (self.columns - 1)
        row = (self.y_high - y) / (self.y_high - self.y_low) * (self.rows - 1)
        return int(round(column)), int(round(row))


def thin_polyline(x: np.ndarray, y: np.ndarray, frame: Frame,
                  per_cell: tuple[int, int] = (SUBCELLS_X, SUBCELLS_Y)) -> tuple[np.ndarray, np.ndarray]:
    """Keep one point per braille dot the curve passes through (and always both ends); with
    per_cell=(1, 1), one per character cell (the plot's lines join the points dot by dot, so a
    curve drawn through fewer points looks nearly the same and builds faster)."""
    x, y = np.asarray(x, dtype=float), np.asarray(y, dtype=float)
    if x.size <= 2:
        return x, y
    dot_x = (frame.x_high - frame.x_low) / (frame.columns * per_cell[0])
    dot_y = (frame.y_high - frame.y_low) / (frame.rows * per_cell[1])
    ix = np.floor((x - frame.x_low) / dot_x)
    iy = np.floor((y - frame.y_low) / dot_y)
    keep = np.ones(x.size, dtype=bool)
    keep[1:] = (np.diff(ix) != 0) | (np.diff(iy) != 0)
    keep[-1] = True
    return x[keep], y[keep]


def clipped_to_frame(x: Sequence[float] | np.ndarray, y: Sequence[float] | np.ndarray,
                     frame: Frame) -> tuple[list[float], list[float]]:
    """The polyline (x, y; NaN gaps allowed) cut where it leaves the frame widened by one
    character cell each side (Liang-Barsky clipping of every segment): plotext joins neighbouring
    points dot by dot on the screen, so a segment reaching far beyond a zoomed-in window costs
    time and memory in proportion to its length there (twelve zooms on Pb-Sn took 36 s and
    660 MB to draw, sixteen ran out of memory). What lies inside is unchanged; where the line
    leaves and comes back, a NaN gap parts the pieces."""
    p = np.column_stack([np.asarray(x, dtype=float), np.asarray(y, dtype=float)])
    cell = np.array([(frame.x_high - frame.x_low) / max(frame.columns, 1),
                     (frame.y_high - frame.y_low) / max(frame.rows, 1)])
    low = np.array([frame.x_low, frame.y_low]) - cell
    high = np.array([frame.x_high, frame.y_high]) + cell
    gap = np.isnan(p).any(axis=1)
    if not (~gap & ((p < low) | (p > high)).any(axis=1)).any():
        return p[:, 0].tolist(), p[:, 1].tolist()
    a, d = p[:-1], p[1:] - p[:-1]
    t0, t1 = np.zeros(len(d)), np.ones(len(d))
    with np.errstate(divide="ignore", invalid="ignore"):
        for axis in (0, 1):
            for bound, sign in ((low[axis], -1.0), (high[axis], 1.0)):
                room = sign * (bound - a[:, axis])       # how far inside this bound the start lies
                rate = sign * d[:, axis]
                t = room / rate
                t0 = np.where(rate < 0.0, np.maximum(t0, t), t0)
                t1 = np.where(rate > 0.0, np.minimum(t1, t), t1)
                t1 = np.where((rate == 0.0) & (room < 0.0), -1.0, t1)   # beside the bound, outside it
    k = np.flatnonzero(~(gap[:-1] | gap[1:]) & (t0 <= t1))
    if not len(k):
        return [], []
    starts = np.clip(a[k] + t0[k, None] * d[k], low, high)
    ends = np.clip(a[k] + t1[k, None] * d[k], low, high)
    continued = np.zeros(len(k), dtype=bool)     # a segment that goes on from the one before it
    continued[1:] = (k[1:] == k[:-1] + 1) & (t1[k[:-1]] == 1.0) & (t0[k[1:]] == 0.0)
    rows = np.stack([np.full_like(starts, np.nan), starts, ends], axis=1)
    keep = np.column_stack([~continued, ~continued, np.ones(len(k), dtype=bool)])
    keep[0, 0] = False
    out = rows[keep]
    return out[:, 0].tolist(), out[:, 1].tolist()


def plot_within(plt, frame: Frame, x: Sequence[float] | np.ndarray, y: Sequence[float] | np.ndarray,
                **style) -> None:
    """plt.plot of the polyline's part inside the frame (`clipped_to_frame`); nothing where no
    part is."""
    xs, ys = clipped_to_frame(x, y, frame)
    if xs:
        plt.plot(xs, ys, **style)


def joined(curves: Iterable[tuple[np.ndarray, np.ndarray]]) -> tuple[list[float], list[float]]:
    """Many curves as one series with NaN gaps between them (one plot call draws them all)."""
    xs: list[float] = []
    ys: list[float] = []
    for x, y in curves:
        if xs:
            xs.append(float("nan"))
            ys.append(float("nan"))
        xs.extend(np.asarray(x, dtype=float).tolist())
        ys.extend(np.asarray(y, dtype=float).tolist())
    return xs, ys


@dataclass(frozen=True)
class Label:
    """A text to write at a data point (its middle character lands on the point)."""

    text: str
    x: float
    y: float


def inside_frame(label: Label, frame: Frame) -> Label:
    """The label moved sideways, by whole columns, so that all of it lies inside the frame
    (still over its point where the point is inside): a point at the window's edge keeps its
    name."""
    column, _ = frame.cell(label.x, label.y)
    first = column - len(label.text) // 2
    last = first + len(label.text) - 1
    shift = -first if first < 0 else min(frame.columns - 1 - last, 0)
    if shift == 0:
        return label
    column_width = (frame.x_high - frame.x_low) / max(frame.columns - 1, 1)
    return Label(label.text, label.x + shift * column_width, label.y)


def place_labels(wanted: Sequence[Label], frame: Frame) -> list[Label]:
    """The labels that fit inside the frame without overlapping, in order of preference.

    Each label needs its own cells plus one free cell on either side.
    """
    taken: list[tuple[int, int, int]] = []   # row, first column, last column
    placed: list[Label] = []
    for label in wanted:
        column, row = frame.cell(label.x, label.y)
        first = column - len(label.text) // 2
        last = first + len(label.text) - 1
        if first < 0 or last >= frame.columns or not 0 <= row < frame.rows:
            continue
        if any(r == row and first - 1 <= l_last and l_first <= last + 1
               for r, l_first, l_last in taken):
            continue
        taken.append((row, first, last))
        placed.append(label)
    return placed


def place_choices(choices: Sequence[Sequence[Label]], frame: Frame) -> list[Label]:
    """One label of each group at most, in order of preference: each group's first choice that
    fits beside those already placed (as `place_labels` judges), so that a name crowded out at
    one spot of its curve is written at another."""
    placed: list[Label] = []
    for group in choices:
        for label in group:
            trial = place_labels(placed + [label], frame)
            if len(trial) > len(placed):
                placed = trial
                break
    return placed


def round_ticks(low: float, high: float, count: int) -> list[float]:
    """About `count` tick positions on round numbers between low and high."""
    step = nice_step(high - low, max(count, 1))
    first = np.ceil(low / step - 1e-9) * step
    ticks = np.arange(first, high + 1e-9 * step, step)
    return [float(t) + 0.0 for t in np.round(ticks, 10)]   # + 0.0: never a tick "-0.00"


def draw_frame(plt, frame: Frame, x_title: str, y_title: str | None = None) -> None:
    """Limits, round ticks (about one per ten columns and four rows) and axis titles."""
    plt.xlim(frame.x_low, frame.x_high)
    plt.ylim(frame.y_low, frame.y_high)
    plt.xticks(round_ticks(frame.x_low, frame.x_high, max(frame.columns // 10, 2)))
    plt.yticks(round_ticks(frame.y_low, frame.y_high, max(frame.rows // 4, 2)))
    plt.xlabel(x_title)
    if y_title is not None:
        plt.ylabel(y_title)
