"""Heat lists: CSV files of heats (an identifier and composition columns whose headers name the
element and the unit, such as `Si wt%`: one for a binary system, one per element but the balance
for more elements), read in blocks of whole rows and parsed a column at a time with numpy.

The file is scanned once first (`scan_heat_list`): its fingerprint (for `--resume`), its
encoding (UTF-8, else Windows-1252, or the one the user names) and its size. `read_layout`
reads the header; `blocks` then cuts the data into blocks of whole rows (a quoted cell may span
lines) that can be parsed anywhere, in any order (`parse_block`).

A bad row is not an error of the file: it keeps its place with the reason, so the other rows
still get their answers. Problems of the file itself raise CommandError with one line.
Lines whose first cell starts with '#' are comments (a file can say where it comes from).
"""

from __future__ import annotations

import codecs
import csv
import hashlib
import io
import math
import re
from collections.abc import Iterator
from dataclasses import dataclass, replace
from pathlib import Path
from typing import NamedTuple

from ladle.engine.files.regular_files import NotARegularFile, open_regular

from .csv_columns import holds_controls, may_hold_formulas
from .errors import CommandError
from .quote import one_line, quoted_path

_HEADER = re.compile(r"^\s*([A-Za-z]{1,2})\s*[(\[]?\s*(wt|at|mass|mol)\s*\.?\s*%\s*[)\]]?\s*$", re.IGNORECASE)
_BASIS = {"wt": "wt", "mass": "wt", "at": "at", "mol": "at"}
_DELIMITERS = ",;\t"
_TEMPERATURE_DIFFERENCE = re.compile(r"^\s*([+]?(?:\d+(?:\.\d*)?|\.\d+))\s*(°?\s*[CcKkFf])?\s*$")
#: The largest superheat accepted (K): common foundry practice pours tens to a few hundred
#: kelvins above the liquidus; more than this is a typing error, not a pouring temperature.
MAX_SUPERHEAT_K = 500.0
#: Bytes the first scan reads at a time.
_SCAN_BYTES = 1 << 20
#: Bytes not valid in Windows-1252 (undefined code points).
_NOT_CP1252 = b"\x81\x8d\x8f\x90\x9d"
#: Identifiers up to this many characters are hashed together with numpy; longer ones alone.
_HASHED_WIDTH = 64


@dataclass(frozen=True)
class FileScan:
    """What the first pass over a heat list found: size (bytes), SHA-256 of the contents, the
    encoding to read it with and the number of lines."""

    size: int
    sha256: str
    encoding: str
    lines: int


@dataclass(frozen=True)
class Layout:
    """How to read a heat list: its encoding and separator, the header's cells, the composition
    columns (indexes, the element each names, "wt" or "at" for all), the identifier column (the
    first other column, or None), where the data start (byte offset and line number), and
    whether numbers are written with a decimal comma."""

    name: str
    encoding: str
    delimiter: str
    header: tuple[str, ...]
    columns: tuple[int, ...]
    elements: tuple[str, ...]
    basis: str
    id_column: int | None
    data_offset: int
    data_line: int
    decimal_comma: bool

    @property
    def labels(self) -> tuple[str, ...]:
        """The composition columns' headers, as the file writes them."""
        return tuple(self.header[c] for c in self.columns)


def composition_header(cell: str, elements: tuple[str, ...]) -> tuple[str, str] | None:
    """(element, "wt" or "at") when a header cell names an element of the system and a unit."""
    m = _HEADER.match(cell)
    if not m or m.group(1).capitalize() not in elements:
        return None
    return m.group(1).capitalize(), _BASIS[m.group(2).lower()]


def foreign_composition_columns(header: tuple[str, ...], elements: tuple[str, ...]) -> list[tuple[str, str]]:
    """(header cell, element) of every cell that reads as the composition column of an element
    that is not one of `elements` ('Pb wt%' in a tin-silver-copper list): not part of any alloy."""
    found = ((cell, _HEADER.match(cell)) for cell in header)
    return [(cell, m.group(1).capitalize()) for cell, m in found if m and m.group(1).capitalize() not in elements]


def _open_error(path: Path, e: OSError) -> CommandError:
    if isinstance(e, FileNotFoundError):
        return CommandError(f"{quoted_path(path)}: no such file")
    if isinstance(e, IsADirectoryError):
        return CommandError(f"{quoted_path(path)}: is a folder, not a CSV file")
    if isinstance(e, NotARegularFile):
        return CommandError(f"{quoted_path(path)}: {e.strerror}")
    return CommandError(f"{quoted_path(path)}: cannot read: {e.strerror or e}")


def _ascii_compatible(encoding: str) -> bool:
    try:
        return "\n\r,;\t\"#".encode(encoding) == b"\n\r,;\t\"#"
    except (LookupError, UnicodeError):
        return False


def scan_heat_list(path: Path, encoding: str | None) -> FileScan:
    """Read the whole file once: fingerprint, encoding (`encoding`, else UTF-8, else
    Windows-1252) and line count. Refuses what is not a regular text file."""
    if encoding is not None:
        try:
            encoding = codecs.lookup(encoding).name
        except LookupError:
            raise CommandError(f"--encoding {one_line(encoding)}: unknown encoding; e.g. utf-8, cp1252, latin-1") from None
        if not _ascii_compatible(encoding):
            raise CommandError(f"--encoding {encoding}: not readable here; ladle batch reads encodings that write "
                               f"ASCII characters as single bytes (utf-8, cp1252, latin-1, ...)")
    digest = hashlib.sha256()
    decoder = codecs.getincrementaldecoder(encoding or "utf-8")()
    decodes, cp1252_ok, lines, offset = True, True, 0, 0
    try:
        with open_regular(path) as f:          # a FIFO is refused at once, never waited on
            while block := f.read(_SCAN_BYTES):
                digest.update(block)
                if b"\0" in block:
                    raise CommandError(f"{path.name}: not a text file (a NUL byte near byte {offset + block.index(0)})")
                lines += line_count(block)
                if decodes:
                    try:
                        decoder.decode(block)
                    except UnicodeDecodeError as e:
                        decodes, bad = False, offset + e.start
                cp1252_ok = cp1252_ok and len(block.translate(None, _NOT_CP1252)) == len(block)
                offset += len(block)
            if decodes:
                try:
                    decoder.decode(b"", final=True)
                except UnicodeDecodeError:
                    decodes, bad = False, offset
    except OSError as e:
        raise _open_error(path, e) from None
    if decodes:
        chosen = encoding or "utf-8"
    elif encoding is not None:
        raise CommandError(f"{path.name}: not {encoding} text (byte {bad}); name the file's encoding with --encoding")
    elif cp1252_ok:
        chosen = "cp1252"
    else:
        raise CommandError(f"{path.name}: neither UTF-8 nor Windows-1252 text (byte {bad}); name the file's "
                           f"encoding with --encoding, e.g. --encoding latin-1")
    return FileScan(offset, digest.hexdigest(), chosen, lines)


_LINE = re.compile(rb"([^\r\n]*)(\r\n|\r|\n|$)")


def read_layout(path: Path, scan: FileScan, elements: tuple[str, ...]) -> Layout:
    """The header of the heat list at `path` (scanned as `scan`) for a system of `elements`: one
    composition column for a binary, one per element but one (the balance) for more."""
    name = path.name
    try:
        with open(path, "rb") as f:
            head = f.read(min(scan.size, 4 * _SCAN_BYTES))
    except OSError as e:
        raise _open_error(path, e) from None
    offset, line = (3, 1) if head.startswith(codecs.BOM_UTF8) and scan.encoding == "utf-8" else (0, 1)
    while True:
        m = _LINE.match(head, offset)
        if m is None or (offset >= len(head)):
            raise CommandError(f"{name}: empty file; expected a header such as 'heat,{elements[1]} wt%' and one row per heat")
        text = m.group(1).decode(scan.encoding, errors="replace")
        offset, line = m.end(), line + 1
        if text.strip() and not text.lstrip().startswith("#"):
            break
        if not m.group(2):
            raise CommandError(f"{name}: empty file; expected a header such as 'heat,{elements[1]} wt%' and one row per heat")
    delimiter = max(_DELIMITERS, key=text.count)
    header = tuple(c.strip() for c in next(csv.reader([text], delimiter=delimiter)))
    found = [(i, f) for i, f in ((i, composition_header(c, elements)) for i, c in enumerate(header)) if f is not None]
    columns, named, basis = _composition_columns(name, header, found, elements)
    id_column = next((i for i in range(len(header)) if i not in columns), None)
    layout = Layout(name, scan.encoding, delimiter, header, columns, named, basis, id_column, offset, line, False)
    first = next(blocks(path, offset, line, scan.size), None)
    rows = parse_block(layout, first.first_line, first.data) if first is not None else None
    if rows is None or not rows.count:
        raise CommandError(f"{name}: a header but no heats")
    return replace(layout, decimal_comma=delimiter != "," and _writes_decimal_comma(rows.raws, delimiter))


def _composition_columns(name: str, header: tuple[str, ...], found: list, elements: tuple[str, ...]):
    """(column indexes, elements they name, basis) of the composition columns `found` as
    (index, (element, basis)); CommandError where they do not make an alloy of `elements`."""
    if not found:
        example = (f"'{elements[1]} wt%' or '{elements[0]} at%'" if len(elements) == 2
                   else " and ".join(f"'{e} wt%'" for e in elements[1:]))
        raise CommandError(f"{name}: no composition column; expected a header such as {example} "
                           f"(an element of {'-'.join(elements)} and wt% or at%)")
    names = ", ".join(repr(header[i]) for i, _ in found)
    if len(elements) == 2 and len(found) > 1:
        raise CommandError(f"{one_line(name)}: several composition columns ({one_line(names)}); keep one")
    named = [element for _, (element, _) in found]
    if len(set(named)) < len(named):
        raise CommandError(f"{one_line(name)}: two columns name the same element ({one_line(names)}); keep one")
    if len({basis for _, (_, basis) in found}) > 1:
        raise CommandError(f"{one_line(name)}: the composition columns mix wt% and at% ({one_line(names)}); use one")
    if len(elements) > 2 and len(found) == len(elements):
        raise CommandError(f"{one_line(name)}: a column for every element ({one_line(names)}); leave out one, the "
                           f"balance, which takes the rest")
    if len(elements) > 2 and len(found) < len(elements) - 1:
        missing = [e for e in elements if e not in named]
        raise CommandError(f"{one_line(name)}: name every element but the balance in a column of its own: columns for "
                           f"{', '.join(named)} leave {', '.join(missing)}; expected one of these to be the balance")
    return tuple(i for i, _ in found), tuple(named), found[0][1][1]


def _writes_decimal_comma(raws: list, delimiter: str) -> bool:
    """Whether a file writes decimal commas, from its first block's composition cells: a comma
    in a number says so, a point says not; whole numbers only: a ';'-separated file does."""
    import numpy as np

    if any(np.any(np.strings.find(raw, ",") >= 0) for raw in raws):
        return True
    if any(np.any(np.strings.find(raw, ".") >= 0) for raw in raws):
        return False
    return delimiter == ";"


class Block(NamedTuple):
    """Whole rows of the heat list: the byte offset after them, the line they start on, the
    line after them, and their bytes."""

    end: int
    first_line: int
    next_line: int
    data: bytes


def line_count(data: bytes) -> int:
    """Lines in `data` (ended by LF, CR LF or CR, as the CSV reader counts them)."""
    if b"\r" not in data:
        return data.count(b"\n")
    return data.count(b"\n") + data.count(b"\r") - data.count(b"\r\n")


def blocks(path: Path, offset: int, line: int, size: int, block_bytes: int = 1 << 20) -> Iterator[Block]:
    """The data from byte `offset` (line `line`) to `size` in blocks of about `block_bytes`
    that end at the end of a row (never inside a quoted cell)."""
    try:
        with open(path, "rb") as f:
            f.seek(offset)
            carry = b""
            while offset < size:
                data = carry + f.read(max(0, min(block_bytes, size - offset - len(carry))))
                cut = _row_end(data, at_end=offset + len(data) >= size)
                if cut is None:
                    data, cut = _long_row(f, data, block_bytes, size - offset)
                block, carry = data[:cut], data[cut:]
                after = line + line_count(block)
                yield Block(offset + len(block), line, after, block)
                offset, line = offset + len(block), after
    except OSError as e:
        raise _open_error(path, e) from None


_LINE_END = re.compile(rb"[\r\n]")


def _long_row(f, data: bytes, block_bytes: int, left: int) -> tuple[bytes, int]:
    """(data, cut) where `data`, the start of the `left` bytes still to read from `f`, holds no
    whole row: `block_bytes` more are read at a time until a row ends, as `_row_end` would find,
    but only the new bytes are searched each time, so that a row of any length costs time in
    proportion to it (searching all of it again after every read took quadratic time)."""
    data = bytearray(data)
    searched, quotes = 0, 0                  # positions before `searched` end no row; quotes before it
    while True:
        more = f.read(max(0, min(block_bytes, left - len(data))))
        data += more
        if len(data) >= left or not more:
            return bytes(data), len(data)
        found = False
        for m in _LINE_END.finditer(data, searched, len(data) - 1):     # the last byte: a CR whose LF may follow
            i = m.start()
            quotes += data.count(b'"', searched, i + 1)
            searched = i + 1
            if not quotes % 2 and data[i:i + 2] != b"\r\n":
                found = True
                break
        if found:
            return bytes(data), _row_end(data, at_end=False)
        quotes += data.count(b'"', searched, len(data) - 1)
        searched = len(data) - 1


def _row_end(data: bytes, at_end: bool) -> int | None:
    """Length of the longest prefix of `data` made of whole rows, or None if none is complete
    (all of `data` at the end of the file). A cut never falls inside a quoted cell (an odd
    number of quotes before it) nor between the two characters of a CR LF."""
    if at_end:
        return len(data)
    end = len(data) - 1                      # the last byte may be a CR whose LF is still to come
    quotes = data.count(b'"', 0, end)        # quotes before `end`, kept up to date as `end` moves back
    while True:
        i = max(data.rfind(b"\n", 0, end), data.rfind(b"\r", 0, end))
        if i < 0:
            return None
        quotes -= data.count(b'"', i + 1, end)
        if not (data[i:i + 2] == b"\r\n") and not quotes % 2:
            return i + 1
        end = i


@dataclass
class Rows:
    """The heats of one block, a column at a time (numpy arrays of one length): the line each
    starts on, its cells (the header's number of them, padded), its number of cells, the
    composition cells stripped (`raws`, one array per composition column), whether the block
    holds quotes, each row's text where it has none (else None), and whether a cell might start
    a formula or hold a control character (either is rewritten before it is written back), and
    the line of a row whose quoted cell is never closed (it runs to the end of the file), or 0."""

    lines: "object"
    cells: list
    counts: "object"
    raws: list
    quoted: bool
    text: "object | None"
    formulas: bool
    unclosed_line: int = 0

    #: The reason given for the row where a quote opens a cell that the file never closes.
    UNCLOSED = "a quote opens a cell on this line that is never closed: the rest of the file was read into it"

    @property
    def count(self) -> int:
        return len(self.lines)


def parse_block(layout: Layout, first_line: int, data: bytes) -> Rows:
    """The heats of a block of whole rows starting at line `first_line` (blank and comment rows
    left out)."""
    import numpy as np
    from numpy.dtypes import StringDType

    text_dtype = StringDType()
    width = len(layout.header)
    text = data.decode(layout.encoding, errors="replace").replace("\r\n", "\n").replace("\r", "\n")
    if '"' in text:
        reader = csv.reader(io.StringIO(text, newline=""), delimiter=layout.delimiter)
        rows, starts, at = [], [], first_line
        for row in reader:
            rows.append(row)
            starts.append(at)
            at = first_line + reader.line_num
        counts = np.array([len(r) for r in rows], dtype=np.int64)
        keep = np.array([any(c.strip() for c in r) and not r[0].lstrip().startswith("#") for r in rows], dtype=bool)
        rows = [r for r, k in zip(rows, keep) if k]
        cells = [np.array([r[i] if i < len(r) else "" for r in rows], dtype=text_dtype) for i in range(width)]
        unclosed = starts[-1] if starts and _never_closed("\n".join(text.split("\n")[starts[-1] - first_line:]),
                                                        layout.delimiter) else 0
        lines = np.array(starts, dtype=np.int64)[keep]
        counts = counts[keep]
        rest = None
    else:
        unclosed = 0
        lines_text = text.split("\n")
        if lines_text and lines_text[-1] == "":
            lines_text.pop()
        whole = rest = np.array(lines_text, dtype=text_dtype)
        lines = first_line + np.arange(rest.size, dtype=np.int64)
        delimiter = np.array(layout.delimiter, dtype=text_dtype)
        counts = np.ones(rest.size, dtype=np.int64)
        cells = []
        for _ in range(width):
            cell, separator, rest = np.strings.partition(rest, delimiter)
            cells.append(cell)
            counts += separator != ""
        more = np.flatnonzero(counts > width)              # cells beyond the header's: count them all
        counts[more] += np.strings.count(rest[more], delimiter)
        raws = [np.strings.strip(cells[c]) for c in layout.columns]
        blank = raws[0] == ""
        maybe = np.flatnonzero(blank)                      # a blank row has a blank composition cell
        blank[maybe] = np.strings.strip(np.strings.replace(whole[maybe], delimiter, "")) == ""
        keep = ~blank & ~np.strings.startswith(np.strings.lstrip(cells[0]), "#")
        lines, counts, cells, rest = lines[keep], counts[keep], [c[keep] for c in cells], whole[keep]
        raws = [raw[keep] for raw in raws]
    quoted = '"' in text
    if quoted:
        raws = [np.strings.strip(cells[c]) for c in layout.columns]
    return Rows(lines, cells, counts, raws, quoted, rest,
                quoted or may_hold_formulas(text, layout.delimiter) or holds_controls(text, layout.delimiter), unclosed)


def _never_closed(row: str, delimiter: str) -> bool:
    """Whether the CSV `row` (the last of a block, to its end) opens a quoted cell it never closes."""
    try:
        for _ in csv.reader(io.StringIO(row, newline=""), delimiter=delimiter, strict=True):
            pass
    except csv.Error as e:
        return "unexpected end of data" in str(e)
    return False


def percentages(layout: Layout, rows: Rows) -> tuple["object", "object"]:
    """(percent of each composition column's element, an array of one column per element named,
    NaN where a row has none; the reason a row could not be read, "" where it could) for the
    rows of a block."""
    import numpy as np
    from numpy.dtypes import StringDType

    reason = np.full(rows.count, "", dtype=StringDType())
    percent = np.full((rows.count, len(layout.columns)), np.nan)
    for j in reversed(range(len(layout.columns))):        # the first column's problem is the one told
        raw, label = rows.raws[j], layout.labels[j]
        text = raw
        if layout.delimiter != ",":         # a decimal comma where commas do not split cells
            comma = (np.strings.count(raw, ",") == 1) & (np.strings.find(raw, ".") < 0)
            text = np.where(comma, np.strings.replace(raw, ",", "."), raw)
        percent[:, j], readable = _floats(text)
        for k in np.flatnonzero(readable & ~((percent[:, j] >= 0.0) & (percent[:, j] <= 100.0))):
            reason[k] = f"{label} {raw[k]} is outside 0-100 %"
        for k in np.flatnonzero(~readable & (raw != "")):
            reason[k] = f"{label} {str(raw[k])!r} is not a number"
        reason[raw == ""] = f"no {label} value"
    if len(layout.columns) > 1:
        total = percent.sum(axis=1)
        for k in np.flatnonzero((reason == "") & (total > 100.0 + 1e-9)):
            reason[k] = f"{' + '.join(layout.labels)} = {total[k]:g} %, over 100 %"
    for k in np.flatnonzero(rows.counts > len(layout.header)):
        reason[k] = f"{rows.counts[k]} values but the header has {len(layout.header)} columns"
    if rows.unclosed_line:
        reason[rows.lines == rows.unclosed_line] = Rows.UNCLOSED
    percent[reason != ""] = np.nan
    return percent, reason


def _floats(text) -> tuple["object", "object"]:
    """(values, finite) of numbers written as text: each element read on its own (a bad one
    does not spoil the others); NaN where not a finite number."""
    import numpy as np

    values = np.full(text.shape, np.nan)
    pending = [np.arange(text.size)]
    while pending:
        index = pending.pop()
        try:
            values[index] = text[index].astype(float)
        except ValueError:
            if index.size > 1:
                pending.extend(np.array_split(index, min(index.size, 16)))
    finite = np.isfinite(values)
    values[~finite] = np.nan
    return values, finite


def identifier_hashes(layout: Layout, rows: Rows) -> tuple["object", "object"]:
    """(64-bit hashes of the rows' identifiers, stripped; whether the identifier is blank). The
    hash (FNV-1a over the code points) is the same in every process, so that duplicates can be
    found across blocks computed anywhere."""
    import numpy as np

    if layout.id_column is None:
        return np.zeros(rows.count, dtype=np.uint64), np.zeros(rows.count, dtype=bool)
    ids = np.strings.strip(rows.cells[layout.id_column])
    lengths = np.strings.str_len(ids)
    h = np.full(ids.size, 0xCBF29CE484222325, dtype=np.uint64)
    short = np.flatnonzero(lengths <= _HASHED_WIDTH)
    width = int(lengths[short].max()) if short.size else 0
    if width:
        points = ids[short].astype(f"U{width}").view(np.uint32).reshape(short.size, width).astype(np.uint64)
        mixed = h[short]
        prime = np.uint64(0x100000001B3)
        with np.errstate(over="ignore"):
            for j in range(width):
                mixed = (mixed ^ points[:, j]) * prime
            h[short] = (mixed ^ lengths[short].astype(np.uint64)) * prime
    for k in np.flatnonzero(lengths > _HASHED_WIDTH):      # rare: long identifiers, one at a time
        digest = hashlib.blake2b(str(ids[k]).encode("utf-8", "surrogatepass"), digest_size=8).digest()
        h[k] = int.from_bytes(digest, "little")
    return h, ids == ""


def parse_temperature_difference(text: str, default_unit: str) -> tuple[float, str]:
    """A temperature difference such as '60C', '60 K', '108F' or '60' (in `default_unit`):
    (kelvins, the unit written); refused above MAX_SUPERHEAT_K."""
    m = _TEMPERATURE_DIFFERENCE.match(text or "")
    if not m:
        raise CommandError(f"cannot read superheat {one_line(repr(text))}; expected a positive number of degrees with "
                           f"an optional unit C, K or F, e.g. 60C")
    unit = (m.group(2) or default_unit).replace("°", "").strip().upper()
    value = float(m.group(1))
    kelvins = value * 5.0 / 9.0 if unit == "F" else value
    if not math.isfinite(kelvins) or kelvins > MAX_SUPERHEAT_K:
        raise CommandError(f"superheat {one_line(text)} is more than {MAX_SUPERHEAT_K:g} K ({1.8 * MAX_SUPERHEAT_K:g} F) "
                           f"above the liquidus; no casting practice pours that hot (expected e.g. 60C)")
    return kelvins, unit
