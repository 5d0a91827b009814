"""Turning the engine's and the parser's errors into one line on stderr and exit status 2."""

from __future__ import annotations

import sys
from contextlib import contextmanager
from typing import Iterator


class CommandError(Exception):
    """A problem with what the person asked for; the message is shown as it is."""


@contextmanager
def report(prog: str) -> Iterator[None]:
    """Run a command; on bad input print `prog: message` on stderr and exit with status 2."""
    from ladle.engine import SystemFileError, TemperatureOutOfRange, UnknownSystem

    try:
        yield
    except (CommandError, SystemFileError, UnknownSystem, TemperatureOutOfRange, ValueError) as e:
        message = e.args[0] if e.args else str(e)
        print(f"{prog}: {message}", file=sys.stderr)
        sys.exit(2)
    except BrokenPipeError:
        sys.exit(0)
    except KeyboardInterrupt:
        print(f"{prog}: interrupted", file=sys.stderr)
        sys.exit(130)
