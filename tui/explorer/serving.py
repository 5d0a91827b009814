"""`ladle serve`: the same explorer in a web browser (textual-serve, the optional `serve` extra).

Each browser tab runs its own explorer process (`python -m ladle.tui.explorer`), which can
write files in the server's working folder; web_server.py guards who may start one. By default
the server listens on this machine only (127.0.0.1); another --host needs --open-to-network.
This module imports neither textual nor the web server until the server starts.
"""

from __future__ import annotations

import argparse
import ipaddress
import os
import secrets
import shlex
import socket
import sys

from .options import ASCII_ENV

DEFAULT_HOST = "127.0.0.1"
DEFAULT_PORT = 8000
DEFAULT_SESSIONS = 3
OPEN_FLAG = "--open-to-network"


def add_serve_arguments(p: argparse.ArgumentParser) -> None:
    """The options of `ladle serve` (in any order, with or without a system name)."""
    p.add_argument("system", nargs="?", default=None, metavar="SYSTEM",
                   help="a shipped system or a path to a system file (default: the one used last)")
    p.add_argument("--ascii", action="store_true", help=f"draw with plain ASCII only (also: {ASCII_ENV}=1)")
    p.add_argument("--port", type=int, default=DEFAULT_PORT, help=f"port to listen on (default {DEFAULT_PORT})")
    p.add_argument("--sessions", type=int, default=DEFAULT_SESSIONS, metavar="N",
                   help=f"at most N browser tabs at once, each running its own explorer (default {DEFAULT_SESSIONS})")
    p.add_argument("--host", default=DEFAULT_HOST,
                   help=f"address to listen on (default {DEFAULT_HOST}: this machine only); "
                        f"any other address needs {OPEN_FLAG}")
    p.add_argument(OPEN_FLAG, action="store_true",
                   help="allow a --host that other machines can reach: this EXPOSES THE EXPLORER TO THE "
                        "NETWORK (whoever has the printed address, secret included, can run it and make it "
                        "write files in this folder)")


def explorer_command(system: str | None, ascii_only: bool) -> str:
    """The shell command that runs one explorer for one browser tab."""
    words = [sys.executable, "-m", "ladle.tui.explorer"]
    if system:
        words.append(system)
    if ascii_only:
        words.append("--ascii")
    return shlex.join(words)


def is_loopback(host: str) -> bool:
    """Whether `host` names this machine only (localhost or a loopback address)."""
    if host.lower() == "localhost":
        return True
    try:
        return ipaddress.ip_address(host.strip("[]")).is_loopback
    except ValueError:
        return False


def _problem(args: argparse.Namespace) -> str | None:
    """Why these options cannot be served, in one line; None when they can."""
    if not 1 <= args.port <= 65535:
        return f"--port {args.port}: expected a port number from 1 to 65535"
    if args.sessions < 1:
        return f"--sessions {args.sessions}: expected at least 1"
    if not is_loopback(args.host) and not args.open_to_network:
        return (f"--host {args.host}: other machines could reach the explorer there; add {OPEN_FLAG} "
                "if that is what you want")
    return None


def _page_title(system: str | None) -> str:
    """'ladle: <the system's title>' for the browser tab; a system that cannot be opened raises
    SystemFileError or UnknownSystem (one line)."""
    from ladle.engine import SystemFileError, UnknownSystem, find_system

    from .saved_state import load_state, state_path

    if system is None:
        saved = load_state(state_path())
        system = saved.system if saved is not None else None
        if system is None:
            return "ladle"
        try:
            loaded = find_system(system)
        except (SystemFileError, UnknownSystem, OSError):   # the explorer will say why, in the tab
            return "ladle"
    else:
        loaded = find_system(system)
    return f"ladle: {loaded.title or loaded.name}"


def serve_in_browser(args: argparse.Namespace) -> int:
    """Serve the explorer until interrupted; returns the exit status (2: bad options, a busy
    port or a missing `serve` extra, each with one line on stderr)."""
    problem = _problem(args)
    if problem is not None:
        print(f"ladle serve: {problem}", file=sys.stderr)
        return 2
    try:
        from .web_server import GuardedServer
    except ImportError:
        print("ladle serve: needs the optional serve extra: pip install 'ladle[serve]'", file=sys.stderr)
        return 2
    title = _page_title(args.system)
    try:
        listening = socket.create_server((args.host.strip("[]"), args.port), reuse_port=False)
    except OSError as error:
        reason = os.strerror(error.errno) if error.errno else str(error)
        print(f"ladle serve: cannot listen on {args.host} port {args.port}: {reason}", file=sys.stderr)
        return 2
    token = secrets.token_urlsafe(24)
    server = GuardedServer(explorer_command(args.system, args.ascii), host=args.host, port=args.port,
                           page_title=title, token=token, max_sessions=args.sessions,
                           open_to_network=args.open_to_network)
    shown_host = f"[{args.host.strip('[]')}]" if ":" in args.host else args.host
    print(f"ladle serve: open http://{shown_host}:{args.port}/?token={token} in a browser "
          f"(at most {args.sessions} tabs at once; Ctrl+C stops)", file=sys.stderr, flush=True)
    if args.open_to_network:
        print("ladle serve: warning: the explorer is open to the network; anyone with this address can "
              "use it and write files in this folder", file=sys.stderr, flush=True)
    server.serve_on(listening)
    return 0
