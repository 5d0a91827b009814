"""Which files ladle reads and writes: regular files only. A FIFO, a device, a folder or a socket
where a file is expected is refused at once, naming what it is, instead of waiting for a writer
that never comes (opening a FIFO to read blocks) or reading without end (/dev/zero)."""

from __future__ import annotations

import errno
import os
import stat
from pathlib import Path
from typing import BinaryIO


class NotARegularFile(OSError):
    """The path exists and is not a regular file (a device, FIFO, folder, socket or link)."""


def file_kind(mode: int) -> str:
    """What a file of this `st_mode` is, in words: 'a FIFO', 'a folder', ..."""
    for test, name in ((stat.S_ISCHR, "a character device"), (stat.S_ISBLK, "a block device"),
                       (stat.S_ISFIFO, "a FIFO"), (stat.S_ISSOCK, "a socket"),
                       (stat.S_ISDIR, "a folder"), (stat.S_ISLNK, "a symbolic link")):
        if test(mode):
            return name
    return "not a plain file"


def not_regular(path: Path | str, mode: int, doing: str) -> NotARegularFile:
    """The error for `path`, of `st_mode` `mode`, that ladle does not read or write (`doing`:
    "reads" or "writes")."""
    return NotARegularFile(errno.EINVAL, f"not a regular file ({file_kind(mode)}); ladle {doing} only regular files",
                           str(path))


def open_regular(path: Path | str) -> BinaryIO:
    """`path` opened to read bytes, following links; NotARegularFile (an OSError) at once where it
    is not a regular file, other OSErrors as the system gives them."""
    fd = os.open(path, os.O_RDONLY | os.O_NONBLOCK | os.O_CLOEXEC)   # a FIFO opens without waiting
    try:
        mode = os.fstat(fd).st_mode
        if not stat.S_ISREG(mode):
            raise not_regular(path, mode, "reads")
        os.set_blocking(fd, True)
        return os.fdopen(fd, "rb")
    except BaseException:
        os.close(fd)
        raise


def require_regular(path: Path | str) -> None:
    """NotARegularFile unless `path` (links followed) is a regular file; FileNotFoundError and
    other OSErrors as the system gives them. Nothing is opened."""
    mode = os.stat(path).st_mode
    if not stat.S_ISREG(mode):
        raise not_regular(path, mode, "reads")
