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
    """Everything a worker needs: the file's layout, the system's heat-list table
    (engine/solidify/table.py), the output's temperature unit ("C", "K" or "F"), the superheat
    (K) or None, and whether to follow the Scheil path."""

    layout: Layout
    table: object
    unit: str
    superheat_K: float | None
    scheil: bool

    def header(self) -> list[str]:
        """The output's header: the heat list's own columns, then the results."""
        u = self.unit
        cells = list(self.layout.header) + [f"liquidus_{u}", f"solidus_{u}", f"freezing_range_{u}"]
        if self.scheil:
            cells += [f"scheil_end_{u}", "eutectic_scheil_mass%_of_alloy"]
        cells.append("eutectic_equilibrium_mass%_of_alloy")
        if self.superheat_K is not None:
            cells.append(f"pouring_{u}")
        return cells + ["note"]

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
    from ladle.engine.units import kelvin_to

    from .commands.common import coverage_problem
    from .parsing import fractions_of_B

    layout, system = job.layout, job.table.system
    rows = parse_block(layout, first_line, data)
    percent, reason = percentages(layout, rows)
    x_b = fractions_of_B(percent, layout.element, layout.basis, system.elements, system.molar_mass)
    lo, hi = system.covers
    for k in np.flatnonzero(~((x_b >= lo) & (x_b <= hi)) & (reason == "")):
        problem = coverage_problem(system, float(x_b[k]), f"{layout.label} {rows.raw[k]}")
        if problem:
            reason[k] = problem
    ok = reason == ""
    names = ("liquidus", "solidus", "eutectic", "end", "eutectic_scheil")
    values = {name: np.full(rows.count, np.nan) for name in names}
    if ok.any():
        r = job.table.evaluate(x_b[ok], job.scheil)
        for name, v in zip(names, (r.liquidus_K, r.solidus_K, r.eutectic_equilibrium, r.scheil_end_K,
                                   r.eutectic_scheil)):
            values[name][ok] = v
    _note_missing(reason, ok, values, job.scheil)

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
    columns.append(number_bytes(*rounded(100.0 * values["eutectic"], 2), 2, comma))
    if job.superheat_K is not None:
        superheat = int(np.rint(job.superheat_K * scale * 10.0))
        columns.append(number_bytes(liquidus + superheat, liquidus_ok, 1, comma))
    bad = np.flatnonzero(reason != "")
    notes = reason.copy()
    notes[bad] = neutralised(reason[bad], True, layout.delimiter)
    columns.append(notes)
    text = rows_bytes(columns, layout.delimiter, encoding)

    hashes, blank = identifier_hashes(layout, rows)
    blank_lines = rows.lines[blank]
    return BlockResult(text, rows.count, int(bad.size),
                       [(int(rows.lines[k]), str(reason[k])) for k in bad[:LISTED]],
                       hashes[~blank], rows.lines[~blank], int(blank_lines.size),
                       [int(n) for n in blank_lines[:LISTED]])


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


def _note_missing(reason: np.ndarray, ok: np.ndarray, values: dict, scheil: bool) -> None:
    """Give computed rows that lack an answer the reason (they count as rows not computed)."""
    missing = [(np.isnan(values["liquidus"]), "not fully liquid at the top of the mapped window"),
               (np.isnan(values["solidus"]), "not fully solid at the bottom of the mapped window")]
    if scheil:
        missing.append((np.isnan(values["end"]), "Scheil: liquid left at the bottom of the mapped window"))
    for k in np.flatnonzero(ok & np.logical_or.reduce([m for m, _ in missing])):
        reason[k] = "; ".join(text for m, text in missing if m[k])
