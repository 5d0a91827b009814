"""`ladle serve`: the explorer in a web browser on localhost (needs the `serve` extra)."""

from __future__ import annotations

import argparse

HELP = "open the explorer in a browser on localhost (pip install '.[serve]')"


def add_arguments(p: argparse.ArgumentParser) -> None:
    p.add_argument("rest", nargs=argparse.REMAINDER, metavar="...", help="options passed to the explorer (see ladle serve -h)")


def run(args: argparse.Namespace) -> int:
    from ..explorer import serve

    return serve(args.rest)
