"""`ladle serve`: the same explorer in a web browser on this machine (textual-serve).

Each browser tab runs its own explorer process (`python -m ladle.tui.explorer`). The server
listens on localhost only unless --host says otherwise. Needs the optional `serve` extra.
"""

from __future__ import annotations

import argparse
import shlex
import sys

from .options import ASCII_ENV, OptionsError


class _Parser(argparse.ArgumentParser):
    def error(self, message: str) -> None:
        raise OptionsError(f"{message} (try: ladle serve --help)")


def _parser() -> argparse.ArgumentParser:
    parser = _Parser(prog="ladle serve",
                     description="Serve the full-screen explorer to a web browser.")
    parser.add_argument("system", nargs="?", default=None,
                        help="a shipped system or a path to a system file")
    parser.add_argument("--ascii", action="store_true",
                        help=f"draw with plain ASCII only (also: {ASCII_ENV}=1)")
    parser.add_argument("--host", default="localhost",
                        help="address to listen on (default: localhost, this machine only)")
    parser.add_argument("--port", type=int, default=8000, help="port (default 8000)")
    return parser


def explorer_command(system: str | None, ascii_only: bool) -> str:
    """The shell command that runs one explorer for one browser tab."""
    words = [sys.executable, "-m", "ladle.tui.explorer"]
    if system:
        words.append(system)
    if ascii_only:
        words.append("--ascii")
    return shlex.join(words)


def serve_in_browser(argv: list[str]) -> int:
    """Parse `ladle serve` arguments and run the server until interrupted."""
    try:
        args = _parser().parse_args(argv)
    except OptionsError as error:
        print(f"ladle serve: {error}", file=sys.stderr)
        return 2
    try:
        from textual_serve.server import Server
    except ImportError:
        print("ladle serve: needs the optional serve extra: pip install '.[serve]' "
              "in ladle's source folder (see the README)",
              file=sys.stderr)
        return 2
    server = Server(explorer_command(args.system, args.ascii), host=args.host, port=args.port,
                    title="ladle")
    print(f"ladle serve: open http://{args.host}:{args.port} in a browser; Ctrl+C stops",
          file=sys.stderr)
    server.serve()
    return 0
