"""The web server of `ladle serve` (textual-serve, aiohttp), guarded for a shared desktop.

Every browser tab that connects runs its own explorer process, which can write files into the
server's working folder, so a connection must come from the page this server handed out:

- the page and its WebSocket need the per-run secret token that `ladle serve` prints in its URL;
- the WebSocket must come from the page's own origin (the Origin header names the Host served),
  so another web site open in the same browser cannot drive it;
- the Host header must name this machine unless the server was opened to the network (which
  also defeats DNS rebinding);
- at most `max_sessions` explorers run at once.

The page is ladle's own template (serve_page.html): every asset comes from this server.
Imports textual-serve: load this module only when serving.
"""

from __future__ import annotations

import asyncio
import secrets
import signal
import socket
from pathlib import Path
from typing import Any

import aiohttp_jinja2
import jinja2
from aiohttp import web
from textual_serve.server import Server, to_int

PAGE = "serve_page.html"
LOOPBACK_NAMES = ("localhost", "127.0.0.1", "[::1]")


class GuardedServer(Server):
    """textual-serve's server with the token, origin, host and session checks above."""

    def __init__(self, command: str, *, host: str, port: int, page_title: str, token: str,
                 max_sessions: int, open_to_network: bool) -> None:
        super().__init__(command, host=host, port=port, title=page_title,
                         templates_path=Path(__file__).parent)
        self.token = token
        self.max_sessions = max_sessions
        self.open_to_network = open_to_network
        self.sessions = 0

    # -- the checks --------------------------------------------------------------------------

    def _host_allowed(self, request: web.Request) -> bool:
        if self.open_to_network:
            return True
        return request.host in {f"{name}:{self.port}" for name in (*LOOPBACK_NAMES, self.host)}

    def _token_matches(self, given: str | None) -> bool:
        return given is not None and secrets.compare_digest(given.encode(), self.token.encode())

    def _same_origin(self, request: web.Request) -> bool:
        origin = request.headers.get("Origin")
        return origin is not None and origin in (f"http://{request.host}", f"https://{request.host}")

    # -- the routes --------------------------------------------------------------------------

    async def _make_app(self) -> web.Application:
        app = web.Application()
        aiohttp_jinja2.setup(app, loader=jinja2.FileSystemLoader(self.templates_path))
        app.add_routes([
            web.get("/", self.handle_index, name="index"),
            web.get("/ws/{token}", self.handle_websocket, name="websocket"),
            web.static("/static", self.statics_path, name="static"),
        ])
        return app

    async def handle_index(self, request: web.Request) -> web.StreamResponse:  # type: ignore[override]
        if not self._host_allowed(request):
            raise web.HTTPMisdirectedRequest(text="ladle serve: this server answers only to this machine's names\n")
        if not self._token_matches(request.query.get("token")):
            raise web.HTTPForbidden(text="ladle serve: open the whole address that `ladle serve` printed "
                                    "(it holds this run's secret token)\n")
        context: dict[str, Any] = {
            "page_title": self.title,
            "static_url": "/static/",
            "websocket_url": f"{'wss' if request.secure else 'ws'}://{request.host}/ws/{self.token}",
            "font_size": to_int(request.query.get("fontsize", "16"), 16),
        }
        response = aiohttp_jinja2.render_template(PAGE, request, context)
        response.headers["Cache-Control"] = "no-store"
        response.headers["Referrer-Policy"] = "no-referrer"
        return response

    async def handle_websocket(self, request: web.Request) -> web.StreamResponse:  # type: ignore[override]
        if not (self._host_allowed(request) and self._token_matches(request.match_info.get("token"))
                and self._same_origin(request)):
            raise web.HTTPForbidden(text="ladle serve: refused (not this server's page)\n")
        if self.sessions >= self.max_sessions:
            raise web.HTTPServiceUnavailable(
                text=f"ladle serve: all {self.max_sessions} sessions are in use (ladle serve --sessions N allows more)\n")
        self.sessions += 1
        try:
            return await super().handle_websocket(request)
        finally:
            self.sessions -= 1

    # -- running -----------------------------------------------------------------------------

    def serve_on(self, listening: socket.socket) -> None:
        """Serve on an already bound and listening socket until Ctrl+C or SIGTERM."""
        loop = asyncio.new_event_loop()
        asyncio.set_event_loop(loop)
        for sig in (signal.SIGINT, signal.SIGTERM):
            try:
                loop.add_signal_handler(sig, self.request_exit)
            except (NotImplementedError, RuntimeError):
                pass
        web.run_app(self._make_app(), sock=listening, handle_signals=False, loop=loop,
                    print=lambda *args: None)
