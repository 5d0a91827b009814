"""`ladle serve`: the explorer in a web browser on localhost (needs the `serve` extra)."""

from __future__ import annotations

import argparse

HELP = "open the explorer in a browser on localhost (pip install '.[serve]')"


def add_arguments(p: argparse.ArgumentParser) -> None:
    p.add_argument("rest", nargs=argparse.REMAINDER, metavar="[SYSTEM] [--ascii] [--host HOST] [--port PORT]",
                   help="the system to open (default: the one used last), plain ASCII drawing, the address "
                   "to listen on (default localhost: this machine only) and the port (default 8000)")


def run(args: argparse.Namespace) -> int:
    from ..explorer import serve

    return serve(args.rest)
