"""Turning the engine's, the parser's and the operating system's errors into one line on stderr
and an exit status.

Exit statuses of every `ladle` command: 0 done; 1 the output ended early because its reader
went away (a broken pipe, as in `ladle systems | head -1`); 2 bad input or an operating-system
error (the line names the file and the reason); 130 interrupted (Ctrl+C).
"""

from __future__ import annotations

import os
import sys
from contextlib import contextmanager
from typing import Iterator

from .quote import one_line, quoted_path

#: Exit status when the reader of the output went away (a broken pipe).
BROKEN_PIPE_STATUS = 1


class CommandError(Exception):
    """A problem with what the person asked for; the message is shown as it is."""


def os_error_text(error: OSError, what: str = "standard output") -> str:
    """'PATH: reason' for an operating-system error (`what` names the stream when the error has
    no file name, as a full disk under `> /dev/full`)."""
    reason = error.strerror or (error.args[0] if error.args else type(error).__name__)
    if error.filename is None:
        return f"{what}: {reason}"
    where = quoted_path(error.filename)
    if error.filename2 is not None:
        where += f" -> {quoted_path(error.filename2)}"
    return f"{where}: {reason}"


def _quiet_stdout() -> None:
    """Point standard output at the null device, so that the interpreter's last flush of a
    closed pipe prints nothing."""
    try:
        null = os.open(os.devnull, os.O_WRONLY)
        os.dup2(null, sys.stdout.fileno())
    except (OSError, ValueError):
        pass


@contextmanager
def report(prog: str) -> Iterator[None]:
    """Run a command and flush its output; on bad input or an operating-system error print
    `prog: message` (one line) on stderr and exit with status 2; on a broken pipe exit with
    status 1 silently."""
    from ladle.engine.errors import UnknownSystem   # no numpy: `ladle --help` runs through here

    try:
        yield
        sys.stdout.flush()
    except (CommandError, UnknownSystem, ValueError) as e:   # the engine's input errors are ValueErrors
        message = e.args[0] if e.args else str(e)
        print(f"{prog}: {one_line(str(message))}", file=sys.stderr)
        sys.exit(2)
    except BrokenPipeError:
        _quiet_stdout()
        sys.exit(BROKEN_PIPE_STATUS)
    except OSError as e:
        _quiet_stdout()
        print(f"{prog}: {one_line(os_error_text(e))}", file=sys.stderr)
        sys.exit(2)
    except KeyboardInterrupt:
        print(f"{prog}: interrupted", file=sys.stderr)
        sys.exit(130)
