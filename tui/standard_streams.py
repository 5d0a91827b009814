"""Standard streams as a command finds them: closed by the caller, or a terminal that is not UTF-8.

A caller may start `ladle` with a standard stream closed (`ladle systems >&-`, `2>&-`, `<&-`);
Python then has no `sys.stdout` (or `sys.stderr`, `sys.stdin`) at all, and the next file ladle
opens would take the free descriptor, so that output meant for the terminal could land in it.
Each closed descriptor gets the null device instead, opened so that it still cannot carry
output: what a command writes to a closed standard output fails as an operating-system error
(one line on stderr, exit status 2), never vanishes with status 0. A closed standard error
swallows the messages (the exit status still tells), instead of Python's `print(file=None)`
sending them into standard output; a closed standard input reads as empty.

On a terminal whose encoding is not UTF-8 (`PYTHONIOENCODING=ascii`, a Latin-1 serial console),
a character it cannot show (an en dash in a user's system title) is written as '?' instead of
ending the command.
"""

from __future__ import annotations

import os
import sys

#: (descriptor, attribute of sys, mode of the text stream, flags the null device is opened with).
#: Standard output gets the null device read-only, so that a write to it fails with EBADF.
_STREAMS = ((0, "stdin", "r", os.O_RDONLY), (1, "stdout", "w", os.O_RDONLY), (2, "stderr", "w", os.O_WRONLY))


def _is_closed(fd: int) -> bool:
    try:
        os.fstat(fd)
    except OSError:
        return True
    return False


def guard_closed_streams() -> None:
    """Give every closed standard descriptor (0, 1, 2) the null device and a text stream on it,
    as the module's docstring says."""
    for fd, name, mode, flags in _STREAMS:
        if not _is_closed(fd):
            continue
        null = os.open(os.devnull, flags)
        if null != fd:
            os.dup2(null, fd)
            os.close(null)
        errors = "backslashreplace" if name == "stderr" else "strict"
        setattr(sys, name, open(fd, mode, buffering=1 if name == "stderr" else -1, encoding="utf-8",
                                errors=errors, closefd=False))


def tolerate_narrow_terminal() -> None:
    """Write '?' for characters standard output's encoding cannot hold, where that encoding is
    not a Unicode one (a command's text stays readable instead of ending in an encoding error)."""
    encoding = (getattr(sys.stdout, "encoding", None) or "").lower().replace("-", "")
    if encoding.startswith("utf") or not hasattr(sys.stdout, "reconfigure"):
        return
    sys.stdout.reconfigure(errors="replace")
