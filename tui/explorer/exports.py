"""Files the explorer writes on request: a point's result as JSON, snapshots of the screen.

Files go to the working folder under a new name; an existing file is never overwritten (the
name gets -2, -3, ... instead). Each file is written to a temporary name first and then linked
to its final name, which fails rather than replaces when that name exists.
"""

from __future__ import annotations

import os
import tempfile
from pathlib import Path

_MAX_TRIES = 1000


def write_new_file(folder: Path, stem: str, suffix: str, text: str) -> Path:
    """Write text to folder/stem+suffix (or stem-2+suffix, ...); returns the path written."""
    fd, tmp = tempfile.mkstemp(dir=folder, prefix=".ladle-", suffix=".tmp")
    try:
        with os.fdopen(fd, "w", encoding="utf-8") as handle:
            handle.write(text)
            handle.flush()
            os.fsync(handle.fileno())
        for number in range(1, _MAX_TRIES + 1):
            path = folder / (f"{stem}{suffix}" if number == 1 else f"{stem}-{number}{suffix}")
            try:
                os.link(tmp, path)
            except FileExistsError:
                continue
            return path
        raise FileExistsError(f"{folder / (stem + suffix)}: {_MAX_TRIES} files of this name "
                              "exist already")
    finally:
        os.unlink(tmp)


def safe_stem(text: str) -> str:
    """A file-name stem from text: letters, digits, '-', '.' and '_' only."""
    return "".join(ch if ch.isalnum() or ch in "-._" else "_" for ch in text).strip("._") or "ladle"
