"""`ladle serve`: the explorer in a web browser on this machine (needs the `serve` extra)."""

from __future__ import annotations

import argparse

HELP = "open the explorer in a browser on this machine (pip install '.[serve]')"


def add_arguments(p: argparse.ArgumentParser) -> None:
    from ..explorer.serving import add_serve_arguments

    add_serve_arguments(p)


def run(args: argparse.Namespace) -> int:
    from ..explorer import serve

    return serve(args)
