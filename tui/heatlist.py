"""Heat lists: a CSV file of heats (an identifier and one composition column whose header names
the element and the unit, such as `Si wt%`), read row by row, and the results written beside
them, atomically.

A bad row is not an error of the file: it is kept with the reason in `problem`, so the other
rows still get their answers. Problems of the file itself raise CommandError with one line.
Lines whose first cell starts with '#' are comments (a file can say where it comes from).
"""

from __future__ import annotations

import csv
import io
import math
import re
from dataclasses import dataclass
from pathlib import Path

from ladle.engine.atomic_files import write_atomic

from .errors import CommandError

_HEADER = re.compile(r"^\s*([A-Za-z]{1,2})\s*[(\[]?\s*(wt|at|mass|mol)\s*\.?\s*%\s*[)\]]?\s*$", re.IGNORECASE)
_BASIS = {"wt": "wt", "mass": "wt", "at": "at", "mol": "at"}
_DELIMITERS = ",;\t"
_TEMPERATURE_DIFFERENCE = re.compile(r"^\s*([+]?(?:\d+(?:\.\d*)?|\.\d+))\s*(°?\s*[CcKkFf])?\s*$")


@dataclass(frozen=True)
class Heat:
    """One row: its line in the file, its cells, the composition read from it (percent of the
    column's element) or the reason it could not be read."""

    line: int
    cells: list[str]
    percent: float | None
    problem: str | None = None


@dataclass(frozen=True)
class HeatList:
    """A read heat list: its header, the composition column (index, element, "wt" or "at") and
    its heats in file order."""

    path: Path
    delimiter: str
    header: list[str]
    column: int
    element: str
    basis: str
    heats: list[Heat]


def composition_header(cell: str, elements: tuple[str, str]) -> tuple[str, str] | None:
    """(element, "wt" or "at") when a header cell names an element of the system and a unit."""
    m = _HEADER.match(cell)
    if not m or m.group(1).capitalize() not in elements:
        return None
    return m.group(1).capitalize(), _BASIS[m.group(2).lower()]


def _number(text: str, delimiter: str) -> float | None:
    value = text.strip()
    if delimiter != "," and value.count(",") == 1 and "." not in value:
        value = value.replace(",", ".")          # a decimal comma where commas do not split cells
    try:
        number = float(value)
    except ValueError:
        return None
    return number if math.isfinite(number) else None


def read_heat_list(path: Path, elements: tuple[str, str]) -> HeatList:
    """Read the heat list at `path` for a system of `elements` (the file is only read)."""
    name = path.name
    try:
        text = path.read_text(encoding="utf-8-sig")
    except FileNotFoundError:
        raise CommandError(f"{path}: no such file") from None
    except IsADirectoryError:
        raise CommandError(f"{path}: is a folder, not a CSV file") from None
    except UnicodeDecodeError:
        raise CommandError(f"{name}: not a text file (expected UTF-8 CSV)") from None
    except OSError as e:
        raise CommandError(f"{path}: cannot read: {e.strerror}") from None
    first = next((line for line in text.splitlines() if line.strip() and not line.lstrip().startswith("#")), "")
    if not first:
        raise CommandError(f"{name}: empty file; expected a header such as 'heat,{elements[1]} wt%' and one row per heat")
    delimiter = max(_DELIMITERS, key=first.count)
    rows = csv.reader(io.StringIO(text, newline=""), delimiter=delimiter)
    header = [c.strip() for c in next(r for r in rows if any(c.strip() for c in r) and not _comment(r))]
    found = [(i, composition_header(c, elements)) for i, c in enumerate(header)]
    found = [(i, f) for i, f in found if f is not None]
    if not found:
        raise CommandError(f"{name}: no composition column; expected a header such as '{elements[1]} wt%' or "
                           f"'{elements[0]} at%' (an element of {elements[0]}-{elements[1]} and wt% or at%)")
    if len(found) > 1:
        names = ", ".join(repr(header[i]) for i, _ in found)
        raise CommandError(f"{name}: several composition columns ({names}); keep one")
    column, (element, basis) = found[0]
    heats = []
    for cells in rows:
        line = rows.line_num
        if not any(c.strip() for c in cells) or _comment(cells):
            continue
        heats.append(_heat(line, cells, header, column, delimiter))
    if not heats:
        raise CommandError(f"{name}: a header but no heats")
    return HeatList(path, delimiter, header, column, element, basis, heats)


def _comment(cells: list[str]) -> bool:
    return bool(cells) and cells[0].lstrip().startswith("#")


def _heat(line: int, cells: list[str], header: list[str], column: int, delimiter: str) -> Heat:
    label = header[column]
    if len(cells) > len(header):
        return Heat(line, cells, None, f"{len(cells)} values but the header has {len(header)} columns")
    cells = cells + [""] * (len(header) - len(cells))
    raw = cells[column].strip()
    if not raw:
        return Heat(line, cells, None, f"no {label} value")
    value = _number(raw, delimiter)
    if value is None:
        return Heat(line, cells, None, f"{label} {raw!r} is not a number")
    if not 0.0 <= value <= 100.0:
        return Heat(line, cells, None, f"{label} {raw} is outside 0-100 %")
    return Heat(line, cells, value)


def parse_temperature_difference(text: str, default_unit: str) -> tuple[float, str]:
    """A temperature difference such as '60C', '60 K', '108F' or '60' (in `default_unit`):
    (kelvins, the unit written)."""
    m = _TEMPERATURE_DIFFERENCE.match(text or "")
    if not m:
        raise CommandError(f"cannot read superheat {text!r}; expected a positive number of degrees with an optional "
                           f"unit C, K or F, e.g. 60C")
    unit = (m.group(2) or default_unit).replace("°", "").strip().upper()
    value = float(m.group(1))
    return (value * 5.0 / 9.0 if unit == "F" else value), unit


def write_csv_atomically(path: Path, rows: list[list[str]], delimiter: str, force: bool, source: Path) -> None:
    """Write `rows` to `path` through a temporary file in the same folder and one rename, so
    that a reader never sees half a file. An existing file is replaced only with `force`; the
    heat list itself never."""
    if path.exists() and source.exists() and path.resolve() == source.resolve():
        raise CommandError(f"{path}: is the heat list itself; write the results to another file")
    if path.exists() and not force:
        raise CommandError(f"{path}: exists already; choose another name or add --force to replace it")
    text = io.StringIO()
    csv.writer(text, delimiter=delimiter, lineterminator="\n").writerows(rows)
    try:
        write_atomic(path, text.getvalue())
    except OSError as e:
        raise CommandError(f"{path}: cannot write: {e.strerror}") from None
