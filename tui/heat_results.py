"""One block of a heat list computed and written as CSV rows, a column at a time.

`compute_block` is what every worker runs (this process, a local worker process or a Dask
worker): it depends only on the job and the block, so the rows come out the same wherever and
in whatever order the blocks are computed. Temperatures are rounded once to tenths (as whole
numbers of tenths), and the freezing range and the pouring temperature are formed from those
rounded values, so that liquidus - solidus equals the range column on every row.
"""

from __future__ import annotations

from dataclasses import dataclass

import numpy as np
from numpy.dtypes import StringDType

from .csv_columns import neutralised, number_bytes, rounded, rows_bytes
from .heatlist import Layout, Rows, identifier_hashes, parse_block, percentages

#: Bad rows and blank identifiers a block reports one by one (the summary lists this many).
LISTED = 20
_TEXT = StringDType()


@dataclass(frozen=True)
class BlockJob:
    """Everything a worker needs: the file's layout, the system, its heat-list table for a
    binary system (engine/solidify/table.py; None for more elements: those alloys are computed
    one by one), the output's temperature unit ("C", "K" or "F"), the superheat (K) or None, and
    whether to follow the Scheil path."""

    layout: Layout
    system: object
    table: object | None
    unit: str
    superheat_K: float | None
    scheil: bool

    def header(self) -> list[str]:
        """The output's header: the heat list's own columns, then the results; a result's name
        that the heat list already uses (its own `note` column, or a list that is an earlier
        output) is prefixed with `ladle_` until it is unique, so no column name appears twice."""
        u = self.unit
        results = [f"liquidus_{u}", f"solidus_{u}", f"freezing_range_{u}"]
        if self.scheil:
            results += [f"scheil_end_{u}", "eutectic_scheil_mass%_of_alloy"]
        if self.table is not None:
            results.append("eutectic_equilibrium_mass%_of_alloy")
        if self.superheat_K is not None:
            results.append(f"pouring_{u}")
        cells = list(self.layout.header)
        taken = {cell.strip().casefold() for cell in cells}
        for name in results + ["note"]:
            while name.casefold() in taken:
                name = f"ladle_{name}"
            taken.add(name.casefold())
            cells.append(name)
        return cells

    def header_text(self) -> bytes:
        cells = neutralised(np.array(self.header(), dtype=_TEXT), True, self.layout.delimiter)
        return (self.layout.delimiter.join(cells.tolist()) + "\n").encode(self.layout.encoding, errors="replace")


@dataclass
class BlockResult:
    """A computed block: its output rows (encoded text), how many heats it held, how many could
    not be computed and the first LISTED of them (line, reason), the identifier hashes and lines
    of its heats that have one, and the lines of those without (count and the first LISTED)."""

    text: bytes
    heats: int
    problems: int
    listed: list[tuple[int, str]]
    id_hashes: np.ndarray
    id_lines: np.ndarray
    blank_ids: int
    blank_listed: list[int]


def identifiers(job: BlockJob, first_line: int, data: bytes) -> tuple[np.ndarray, np.ndarray]:
    """(hashes, lines) of the block's heats that have an identifier, without computing them (to
    rebuild the duplicate check when a run is resumed)."""
    rows = parse_block(job.layout, first_line, data)
    hashes, blank = identifier_hashes(job.layout, rows)
    return hashes[~blank], rows.lines[~blank]


def compute_block(job: BlockJob, first_line: int, data: bytes) -> BlockResult:
    """The output rows of a block of whole rows starting at line `first_line` of the heat list."""
    from ladle.engine.solidify.table import evaluate_alloys
    from ladle.engine.units import kelvin_to

    layout, system = job.layout, job.system
    rows = parse_block(layout, first_line, data)
    percent, reason = percentages(layout, rows)
    x = _mole_fractions(layout, system, percent)
    if len(system.elements) == 2:
        _note_outside_coverage(layout, system, rows, x[:, 1], reason)
    else:
        _note_outside_element_ranges(layout, system, rows, x, reason)
    ok = reason == ""
    names = ("liquidus", "solidus", "eutectic", "end", "eutectic_scheil")
    values = {name: np.full(rows.count, np.nan) for name in names}
    left_range = np.zeros(rows.count, dtype=bool)
    if ok.any():
        if job.table is not None:
            r = job.table.evaluate(x[ok, 1], job.scheil)
        else:
            r, problems = evaluate_alloys(system, x[ok], job.scheil)
            for k, problem in zip(np.flatnonzero(ok), problems):
                if problem:
                    reason[k] = problem
        for name, v in zip(names, (r.liquidus_K, r.solidus_K, r.eutectic_equilibrium, r.scheil_end_K,
                                   r.eutectic_scheil)):
            values[name][ok] = v
        if r.scheil_left_range is not None:
            left_range[ok] = r.scheil_left_range
    notes = _notes(reason, values, job.scheil, left_range)

    offset, scale = kelvin_to(0.0, job.unit), kelvin_to(1.0, job.unit) - kelvin_to(0.0, job.unit)
    comma, encoding = layout.decimal_comma, layout.encoding
    liquidus, liquidus_ok = rounded(offset + scale * values["liquidus"], 1)
    solidus, solidus_ok = rounded(offset + scale * values["solidus"], 1)
    columns = [_input_cells(layout, rows), number_bytes(liquidus, liquidus_ok, 1, comma),
               number_bytes(solidus, solidus_ok, 1, comma),
               number_bytes(liquidus - solidus, liquidus_ok & solidus_ok, 1, comma)]
    if job.scheil:
        columns += [number_bytes(*rounded(offset + scale * values["end"], 1), 1, comma),
                    number_bytes(*rounded(100.0 * values["eutectic_scheil"], 2), 2, comma)]
    if job.table is not None:
        columns.append(number_bytes(*rounded(100.0 * values["eutectic"], 2), 2, comma))
    if job.superheat_K is not None:
        superheat = int(np.rint(job.superheat_K * scale * 10.0))
        columns.append(number_bytes(liquidus + superheat, liquidus_ok, 1, comma))
    bad = np.flatnonzero(reason != "")
    noted = np.flatnonzero(notes != "")
    notes[noted] = neutralised(notes[noted], True, layout.delimiter)
    columns.append(notes)
    text = rows_bytes(columns, layout.delimiter, encoding)

    hashes, blank = identifier_hashes(layout, rows)
    blank_lines = rows.lines[blank]
    return BlockResult(text, rows.count, int(bad.size),
                       [(int(rows.lines[k]), str(reason[k])) for k in bad[:LISTED]],
                       hashes[~blank], rows.lines[~blank], int(blank_lines.size),
                       [int(n) for n in blank_lines[:LISTED]])


def _mole_fractions(layout: Layout, system, percent: np.ndarray) -> np.ndarray:
    """Mole fractions of every element of `system` (one row per heat) from the percentages of
    the elements the columns name (wt% or at%); the balance element takes the rest."""
    from ladle.engine.units import mole_from_mass

    elements = list(system.elements)
    fractions = np.zeros((percent.shape[0], len(elements)))
    for j, element in enumerate(layout.elements):
        fractions[:, elements.index(element)] = percent[:, j] / 100.0
    balance = next(i for i, e in enumerate(elements) if e not in layout.elements)
    fractions[:, balance] = 1.0 - fractions.sum(axis=1)
    if layout.basis == "wt":
        fractions = mole_from_mass(fractions, np.asarray(system.molar_mass))
    return fractions


def _note_outside_coverage(layout: Layout, system, rows: Rows, x_b: np.ndarray, reason: np.ndarray) -> None:
    """Give the binary alloys outside the range the model covers their reason."""
    from .commands.common import coverage_problem

    lo, hi = system.covers
    for k in np.flatnonzero(~((x_b >= lo) & (x_b <= hi)) & (reason == "")):
        problem = coverage_problem(system, float(x_b[k]), f"{layout.labels[0]} {rows.raws[0][k]}")
        if problem:
            reason[k] = problem


def _note_outside_element_ranges(layout: Layout, system, rows: Rows, x: np.ndarray, reason: np.ndarray) -> None:
    """Give the alloys of three or more elements outside the range the model covers their reason."""
    from .commands.common import alloy_coverage_problem

    for k in np.flatnonzero(~system.covered(x) & (reason == "")):
        what = ", ".join(f"{label} {raw[k]}" for label, raw in zip(layout.labels, rows.raws))
        reason[k] = alloy_coverage_problem(system, x[k], what)


def _input_cells(layout: Layout, rows: Rows) -> np.ndarray:
    """Each row's own cells as written back: the header's number of them, formulas neutralised,
    joined with the separator (the row's text itself where nothing changed)."""
    cells = [neutralised(c, rows.quoted, layout.delimiter) for c in rows.cells] if rows.formulas else rows.cells
    unchanged = all(c is original for c, original in zip(cells, rows.cells))
    if rows.text is not None and unchanged and bool(np.all(rows.counts == len(layout.header))):
        return rows.text
    joined = cells[0]
    for cell in cells[1:]:
        joined = np.strings.add(np.strings.add(joined, layout.delimiter), cell)
    return joined


def _notes(reason: np.ndarray, values: dict, scheil: bool, left_range: np.ndarray) -> np.ndarray:
    """The note column: the reason a row was not computed; a computed row without a liquidus or
    solidus inside the mapped window gets that as its reason (it counts as not computed); one
    whose Scheil path has no end keeps its melt range and says why: its liquid left the range
    the model covers (`left_range`), or is still there at the bottom of the window."""
    ok = reason == ""
    melt = [(np.isnan(values["liquidus"]), "not fully liquid at the top of the mapped window"),
            (np.isnan(values["solidus"]), "not fully solid at the bottom of the mapped window")]
    for k in np.flatnonzero(ok & (melt[0][0] | melt[1][0])):
        reason[k] = "; ".join(text for m, text in melt if m[k])
    notes = reason.copy()
    if scheil:
        open_end = (reason == "") & np.isnan(values["end"])
        notes[open_end & ~left_range] = "Scheil: liquid left at the bottom of the mapped window"
        notes[open_end & left_range] = "Scheil: not followed where the liquid leaves the range this model covers"
    return notes
