"""Command-line options of the full-screen explorer (`ladle [SYSTEM] [--ascii]`)."""

from __future__ import annotations

import argparse
import os
from dataclasses import dataclass

ASCII_ENV = "LADLE_ASCII"
"""Environment variable: set to 1 (or yes/true/on) to draw with plain ASCII only."""


@dataclass(frozen=True)
class ExplorerOptions:
    """What the user asked for on the command line and in the environment."""

    system: str | None   # a shipped system's name or a path; None: the last one used
    ascii_only: bool


class OptionsError(ValueError):
    """A bad command line; the message is one line meant for the user."""


class _Parser(argparse.ArgumentParser):
    def error(self, message: str) -> None:  # argparse would print usage and exit
        raise OptionsError(f"{message} (try: ladle --help)")


def _parser(prog: str) -> argparse.ArgumentParser:
    parser = _Parser(
        prog=prog,
        description="Explore the phase diagram of a binary alloy system full-screen, "
        "by keyboard. Press ? inside for every key and the safety cautions.",
    )
    parser.add_argument(
        "system", nargs="?", default=None,
        help="a shipped system (for example pb-sn) or a path to a system file; "
        "default: the one used last",
    )
    parser.add_argument(
        "--ascii", action="store_true",
        help=f"draw with plain ASCII only (also: {ASCII_ENV}=1)",
    )
    return parser


def _env_flag(value: str | None) -> bool:
    return (value or "").strip().lower() in {"1", "yes", "true", "on"}


def parse_options(argv: list[str], environ: dict[str, str] | None = None,
                  prog: str = "ladle") -> ExplorerOptions:
    """Read the explorer's options; raises OptionsError with a one-line message."""
    env = os.environ if environ is None else environ
    args = _parser(prog).parse_args(argv)
    return ExplorerOptions(system=args.system,
                           ascii_only=args.ascii or _env_flag(env.get(ASCII_ENV)))
