"""Writing files so that a reader never sees half of one and nothing is overwritten by accident.

Every file ladle writes (fitted systems, the check-count cache, the explorer's remembered state
and exports, heat-list results) goes through here: the text is written to a temporary file in
the destination folder, flushed to disk, then renamed into place (replacing) or linked into place
(never replacing).
"""

from __future__ import annotations

import os
import tempfile
from collections.abc import Iterator
from contextlib import contextmanager
from pathlib import Path

_MAX_NUMBERED = 1000


def _umask() -> int:
    mask = os.umask(0)
    os.umask(mask)
    return mask


@contextmanager
def _temporary_copy(folder: Path, name: str, text: str) -> Iterator[str]:
    """A temporary file holding `text` in `folder`, with a plain new file's permissions;
    removed afterwards unless it was renamed away."""
    fd, tmp = tempfile.mkstemp(prefix=f".{name}.", suffix=".tmp", dir=folder)
    try:
        with os.fdopen(fd, "w", encoding="utf-8", newline="") as handle:
            handle.write(text)
            handle.flush()
            os.fsync(handle.fileno())
        os.chmod(tmp, 0o666 & ~_umask())
        yield tmp
    finally:
        try:
            os.unlink(tmp)
        except FileNotFoundError:
            pass


def write_atomic(path: Path | str, text: str) -> None:
    """Create or replace `path` with `text` (UTF-8, newlines as given) in one rename."""
    path = Path(path)
    with _temporary_copy(path.parent, path.name, text) as tmp:
        os.replace(tmp, path)


def write_new_file(folder: Path, stem: str, suffix: str, text: str) -> Path:
    """Write `text` to folder/stem+suffix, or stem-2+suffix, stem-3+suffix, ... where that name
    is taken: an existing file is never replaced. Returns the path written."""
    with _temporary_copy(folder, stem, text) as tmp:
        for number in range(1, _MAX_NUMBERED + 1):
            path = folder / (f"{stem}{suffix}" if number == 1 else f"{stem}-{number}{suffix}")
            try:
                os.link(tmp, path)
            except FileExistsError:
                continue
            return path
    raise FileExistsError(f"{folder / (stem + suffix)}: {_MAX_NUMBERED} files of this name exist already")
