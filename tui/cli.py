"""The `ladle` command: line-mode subcommands, or the full-screen explorer without one.

Each subcommand lives in its own module under ladle.tui.commands and exposes `HELP`,
`add_arguments(parser)` and `run(args) -> int`. Modules import the engine inside `run`, so that
`ladle --help` and every command start fast; nothing here imports textual or scipy.
"""

from __future__ import annotations

import argparse
import importlib
import sys

from .errors import report

#: Subcommand name -> module under ladle.tui.commands.
COMMANDS = {
    "check": "check",
    "fit": "fit",
    "point": "point",
    "systems": "systems",
    "melt": "melt",
    "diagram": "diagram",
}


class _Parser(argparse.ArgumentParser):
    """An argument parser whose errors are one line on stderr and exit status 2."""

    def error(self, message: str) -> None:  # type: ignore[override]
        self.exit(2, f"{self.prog}: {message} (see {self.prog} --help)\n")


def build_parser() -> tuple[argparse.ArgumentParser, dict]:
    parser = _Parser(prog="ladle", description="Phase equilibria of binary alloys from Gibbs-energy models. "
                     "Without a command, opens the full-screen explorer.")
    sub = parser.add_subparsers(dest="command", metavar="COMMAND", parser_class=_Parser)
    modules = {}
    for name, module in COMMANDS.items():
        mod = importlib.import_module(f"ladle.tui.commands.{module}")
        p = sub.add_parser(name, help=mod.HELP, description=mod.HELP)
        mod.add_arguments(p)
        modules[name] = mod
    return parser, modules


def main(argv: list[str] | None = None) -> int:
    argv = sys.argv[1:] if argv is None else argv
    if not argv or (argv[0].startswith("-") and argv[0] not in ("-h", "--help")):
        from .explorer import run as run_explorer

        return run_explorer(argv)
    parser, modules = build_parser()
    args = parser.parse_args(argv)
    with report(f"ladle {args.command}"):
        return modules[args.command].run(args)
    return 2


if __name__ == "__main__":
    sys.exit(main())
