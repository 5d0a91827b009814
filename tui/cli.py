"""The `ladle` command: line-mode subcommands, or the full-screen explorer without one.

Each subcommand lives in its own module under ladle.tui.commands and exposes `HELP`,
`add_arguments(parser)` and `run(args) -> int`. Modules import the engine inside `run`, so that
`ladle --help` and every command start fast; nothing here imports textual or scipy.
"""

from __future__ import annotations

import argparse
import importlib
import os
import re
import sys

from .blas_threads import limit_blas_threads
from .errors import report
from .quote import one_line
from .standard_streams import guard_closed_streams, tolerate_narrow_terminal

#: Subcommand name -> module under ladle.tui.commands.
COMMANDS = {
    "check": "check",
    "fit": "fit",
    "point": "point",
    "systems": "systems",
    "melt": "melt",
    "diagram": "diagram",
    "cool": "cool",
    "batch": "batch",
    "serve": "serve",
    "transitions": "transitions",
}


class _Parser(argparse.ArgumentParser):
    """An argument parser whose errors are one line on stderr and exit status 2; the `ladle`
    parser knows each command's own (`commands`), which names the command in its errors."""

    commands: dict[str, argparse.ArgumentParser]

    def error(self, message: str) -> None:  # type: ignore[override]
        self.exit(2, f"{self.prog}: {one_line(message)} (see {self.prog} --help)\n")

    def _print_message(self, message: str, file=None) -> None:  # type: ignore[override]
        """Print and flush; argparse's own version hides a broken pipe (`ladle --help | head`)."""
        if message:
            file = file or sys.stderr
            file.write(message)
            file.flush()


def build_parser(command: str | None = None) -> tuple[argparse.ArgumentParser, dict]:
    """The `ladle` parser, with the arguments of `command` only (every command is listed with
    its one-line help; building the others' arguments would only cost time)."""
    parser = _Parser(prog="ladle", description="Phase equilibria of alloys (binary and multicomponent) from Gibbs-energy models. "
                     "Without a command, `ladle [SYSTEM] [--ascii]` opens the full-screen explorer "
                     "(on the system named, else the one used last, else pb-sn; --ascii or LADLE_ASCII=1 draws "
                     "with plain ASCII for old terminals and serial consoles).")
    sub = parser.add_subparsers(dest="command", metavar="COMMAND", parser_class=_Parser)
    parser.commands = {}
    modules = {}
    for name, module in COMMANDS.items():
        mod = importlib.import_module(f"ladle.tui.commands.{module}")
        p = parser.commands[name] = sub.add_parser(name, help=mod.HELP, description=mod.HELP)
        if name == command:
            mod.add_arguments(p)
        modules[name] = mod
    return parser, modules


def _opens_explorer(argv: list[str]) -> bool:
    """True for no arguments, explorer options, or a system name or path first. A first word
    that is neither a command nor a system ends the program with the line `ladle melt WORD`
    would print (the known systems) and exit status 2."""
    if not argv:
        return True
    first = argv[0]
    if first in ("-h", "--help") or first in COMMANDS:
        return False
    if first.startswith("-"):
        return True
    from ladle.engine.errors import SystemFileError, UnknownSystem
    from ladle.engine.files.catalog import resolve

    try:
        resolve(first)
    except (SystemFileError, UnknownSystem) as error:
        print(f"ladle: {one_line(error.args[0])} (commands: {', '.join(COMMANDS)})", file=sys.stderr)
        sys.exit(2)
    return True


def _attach_negative_values(argv: list[str]) -> list[str]:
    """`--temp -40C` -> `--temp=-40C`: argparse would take a value starting with '-' and a
    letter for an unknown option; no option of ladle's looks like a negative number."""
    out: list[str] = []
    i = 0
    while i < len(argv):
        word = argv[i]
        if (word.startswith("--") and "=" not in word and i + 1 < len(argv)
                and re.match(r"^-\.?\d", argv[i + 1])):
            out.append(f"{word}={argv[i + 1]}")
            i += 2
            continue
        out.append(word)
        i += 1
    return out


def main(argv: list[str] | None = None) -> int:
    limit_blas_threads(os.environ)
    guard_closed_streams()
    argv = _attach_negative_values(sys.argv[1:] if argv is None else argv)
    if _opens_explorer(argv):
        from .explorer import run as run_explorer

        return run_explorer(argv)
    tolerate_narrow_terminal()
    parser, modules = build_parser(argv[0] if argv else None)
    with report("ladle"):          # --help into a closed pipe: status 1, as every command
        args, extra = parser.parse_known_args(argv)
        if extra:                  # named by the command that refused them, as its other errors
            parser.commands.get(args.command, parser).error(f"unrecognized arguments: {' '.join(extra)}")
    with report(f"ladle {args.command}"):
        return modules[args.command].run(args)


if __name__ == "__main__":
    sys.exit(main())
