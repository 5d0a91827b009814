"""ladle's full-screen explorer (Textual): `ladle` opens it, `ladle serve` serves it to a browser.

Textual is imported only when one of these functions runs, never on import of this package.
"""

from __future__ import annotations

import argparse


def run(argv: list[str]) -> int:
    """Open the explorer in this terminal. argv: the arguments after `ladle` (an optional system
    name or path, `--ascii`). Returns the process exit status (2 for bad arguments)."""
    from .launch import run_explorer

    return run_explorer(argv)


def serve(args: argparse.Namespace) -> int:
    """Serve the explorer to a web browser on this machine (needs the `serve` extra).
    args: the parsed options of `ladle serve` (serving.add_serve_arguments). Returns the process
    exit status."""
    from .serving import serve_in_browser

    return serve_in_browser(args)
