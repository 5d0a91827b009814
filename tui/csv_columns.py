"""Writing CSV rows a column at a time with numpy, without a Python object per row.

Every column becomes a byte matrix (one row per CSV row, zero bytes as padding): numbers as
digit matrices (`number_bytes`), text cells encoded (`text_bytes`). `rows_bytes` puts them side
by side with the separator and drops the padding, which yields the rows' text. The files read
never hold a zero byte (the heat list's scan refuses them), so padding cannot be confused with
text.
"""

from __future__ import annotations

import re

import numpy as np

#: A cell a spreadsheet would evaluate as a formula starts with one of these (OWASP, "CSV
#: Injection"); such a cell is written with a leading apostrophe unless it is a plain number.
_FORMULA_STARTS = ("=", "+", "-", "@", "\t", "\r")
_PLAIN_NUMBER = re.compile(r"^[+-]?(\d+([.,]\d*)?|[.,]\d+)([eE][+-]?\d+)?$")
#: Rows are written in slices of this many; a row with a cell longer than _LONG_CELL characters
#: is written alone (a byte matrix is as wide as its longest row).
_SLICE_ROWS = 8192
_LONG_CELL = 1024


def rounded(values: np.ndarray, decimals: int) -> tuple[np.ndarray, np.ndarray]:
    """(values in units of the last decimal as integers, rounded half to even; whether finite).
    Sums and differences of the integers are exact, so columns formed from them agree."""
    finite = np.isfinite(values)
    scaled = np.zeros(values.shape, dtype=np.int64)
    scaled[finite] = np.rint(values[finite] * 10.0 ** decimals).astype(np.int64)
    return scaled, finite


def number_bytes(scaled: np.ndarray, finite: np.ndarray, decimals: int, comma: bool) -> np.ndarray:
    """Integers in units of the last decimal written with `decimals` decimals (a decimal comma
    with `comma`), as a byte matrix; empty where not `finite`."""
    size = 10 ** decimals
    magnitude = np.abs(scaled)
    whole, fraction = magnitude // size, magnitude % size
    width = len(str(int(whole.max()))) if whole.size else 1
    powers = 10 ** np.arange(width - 1, -1, -1, dtype=np.int64)
    digits = (whole[:, None] // powers % 10 + ord("0")).astype(np.uint8)
    digits[(whole[:, None] < powers) & (powers > 1)] = 0            # no leading zeros
    fraction_powers = 10 ** np.arange(decimals - 1, -1, -1, dtype=np.int64)
    matrix = np.hstack([np.where(scaled < 0, ord("-"), 0).astype(np.uint8)[:, None], digits,
                        np.full((scaled.size, 1), ord("," if comma else "."), dtype=np.uint8),
                        (fraction[:, None] // fraction_powers % 10 + ord("0")).astype(np.uint8)])
    matrix[~finite] = 0
    return matrix


def text_bytes(cells: np.ndarray, encoding: str) -> np.ndarray:
    """Text cells (a numpy string array) encoded, as a byte matrix as wide as the longest."""
    if not cells.size:
        return np.zeros((0, 0), dtype=np.uint8)
    joined = np.frombuffer("\0".join(cells.tolist()).encode(encoding, errors="replace") + b"\0", dtype=np.uint8)
    ends = np.flatnonzero(joined == 0)
    starts = np.concatenate([[0], ends[:-1] + 1])
    lengths = ends - starts
    width = np.arange(int(lengths.max()))
    return np.where(width < lengths[:, None], joined[np.minimum(starts[:, None] + width, joined.size - 1)], 0).astype(np.uint8)


def rows_bytes(columns: list, delimiter: str, encoding: str) -> bytes:
    """The CSV rows (each ending with a newline) of columns given as byte matrices (numbers) or
    numpy string arrays (text), taken a slice of rows at a time so that the matrices stay small
    even where a few cells are very long."""
    n = columns[0].shape[0] if columns else 0
    text_columns = [c for c in columns if c.ndim == 1]
    longest = np.zeros(n, dtype=np.int64)
    for column in text_columns:
        np.maximum(longest, np.strings.str_len(column), out=longest)
    long_rows = np.flatnonzero(longest > _LONG_CELL)
    cuts = sorted({0, n, *range(0, n, _SLICE_ROWS), *long_rows.tolist(), *(long_rows + 1).tolist()})
    return b"".join(_slice_bytes([c[a:b] for c in columns], delimiter, encoding) for a, b in zip(cuts[:-1], cuts[1:]))


def _slice_bytes(columns: list, delimiter: str, encoding: str) -> bytes:
    n = columns[0].shape[0]
    separator = np.full((n, 1), ord(delimiter), dtype=np.uint8)
    parts = []
    for column in columns:
        parts += [text_bytes(column, encoding) if column.ndim == 1 else column, separator]
    parts[-1] = np.full((n, 1), ord("\n"), dtype=np.uint8)
    matrix = np.hstack(parts)
    return matrix[matrix != 0].tobytes()


def may_hold_formulas(text: str, delimiter: str) -> bool:
    """Whether any cell of unquoted CSV `text` could start a formula (a quick test of a whole
    block, so that cells are examined one by one only where one might)."""
    return text[:1] in _FORMULA_STARTS or any(start in text and (f"\n{start}" in text or f"{delimiter}{start}" in text)
                                               for start in _FORMULA_STARTS)


def holds_controls(text: str, delimiter: str) -> bool:
    """Whether CSV `text` holds a control character other than its line feeds and separator."""
    from ladle.engine.files.plain_text import has_controls

    return has_controls(text.replace("\n", "").replace(delimiter, ""))


def _escaped(cell: str) -> str:
    """`cell` with its control characters (escape sequences, CR, tab, ...; a quoted cell's line
    feed aside) written as backslash escapes, as ladle's messages show text from a file."""
    from ladle.engine.files.plain_text import has_controls

    return "".join(repr(ch)[1:-1] if ch != "\n" and has_controls(ch) else ch for ch in cell)


def neutralised(cells: np.ndarray, quote: bool, delimiter: str) -> np.ndarray:
    """Text cells ready to write: control characters escaped (`\\x1b`, `\\r`), so that no
    file can drive the terminal the results are shown on; a cell a spreadsheet would evaluate
    as a formula (starting with = + - @ or a tab, unless a plain number) gets a leading
    apostrophe; with `quote`, cells holding the separator, a quote or a line break are quoted
    as CSV quotes them."""
    if holds_controls(delimiter.join(cells.tolist()), delimiter):
        cells = cells.copy()
        for k in range(cells.size):
            if holds_controls(str(cells[k]), delimiter):
                cells[k] = _escaped(str(cells[k]))
    risky = np.zeros(cells.shape, dtype=bool)
    for start in _FORMULA_STARTS:
        risky |= np.strings.startswith(cells, start)
    if risky.any():
        cells = cells.copy()
        for k in np.flatnonzero(risky):
            if not _PLAIN_NUMBER.match(str(cells[k])):
                cells[k] = "'" + str(cells[k])
    if quote:
        special = np.zeros(cells.shape, dtype=bool)
        for ch in (delimiter, '"', "\n", "\r"):
            special |= np.strings.find(cells, ch) >= 0
        if special.any():
            cells = np.where(special, np.strings.add(np.strings.add('"', np.strings.replace(cells, '"', '""')), '"'),
                             cells)
    return cells
