"""`ladle serve` through the real command line: its options in any order, the guard on who may
start an explorer (secret token, same origin, this machine's names, a cap on sessions), the
page (title, no asset from outside), and a busy port."""

from __future__ import annotations

import asyncio
import re
import socket
import subprocess
import sys
import time
import urllib.error
import urllib.request

import pytest

aiohttp = pytest.importorskip("aiohttp", reason="ladle serve needs the serve extra (pip install '.[serve]')")
pytest.importorskip("textual_serve", reason="ladle serve needs the serve extra (pip install '.[serve]')")


def _ladle(*args: str, timeout: float = 60) -> subprocess.CompletedProcess:
    return subprocess.run([sys.executable, "-m", "ladle.tui.cli", *args], capture_output=True, text=True,
                          stdin=subprocess.DEVNULL, timeout=timeout)


def _free_port() -> int:
    with socket.socket() as s:
        s.bind(("127.0.0.1", 0))
        return s.getsockname()[1]


class Served:
    """A `ladle serve` process on a free port of 127.0.0.1, and the URL it printed."""

    def __init__(self, *options: str) -> None:
        self.port = _free_port()
        self.process = subprocess.Popen([sys.executable, "-m", "ladle.tui.cli", "serve", "--port", str(self.port),
                                         *options], stdin=subprocess.DEVNULL, stdout=subprocess.PIPE,
                                        stderr=subprocess.PIPE, text=True)
        line = self.process.stderr.readline()
        match = re.search(r"http://127\.0\.0\.1:\d+/\?token=([A-Za-z0-9_-]+)", line)
        assert match, line
        self.url, self.token = match.group(0), match.group(1)
        self.origin = f"http://127.0.0.1:{self.port}"

    def get(self, path: str, host: str | None = None) -> tuple[int, str]:
        request = urllib.request.Request(f"{self.origin}{path}", headers={"Host": host} if host else {})
        try:
            with urllib.request.urlopen(request, timeout=20) as response:
                return response.status, response.read().decode(errors="replace")
        except urllib.error.HTTPError as error:
            return error.code, error.read().decode()

    def stop(self) -> None:
        self.process.terminate()
        self.process.wait(timeout=20)


@pytest.fixture
def served():
    running = Served("pb-sn", "--sessions", "1")
    yield running
    running.stop()


def test_options_work_before_or_without_a_system_and_help_lists_them():
    helped = _ladle("serve", "-h")
    assert helped.returncode == 0
    for option in ("--port", "--host", "--sessions", "--open-to-network", "--ascii", "SYSTEM"):
        assert option in helped.stdout
    assert "EXPOSES THE EXPLORER" in helped.stdout
    refused = _ladle("serve", "--port", "0")           # parsed (no "unrecognized arguments"), then refused
    assert (refused.returncode, refused.stderr.count("\n")) == (2, 1)
    assert "--port 0: expected a port number" in refused.stderr


def test_another_host_needs_the_explicit_flag():
    run = _ladle("serve", "--host", "0.0.0.0", "pb-sn")
    assert run.returncode == 2 and run.stderr.count("\n") == 1
    assert "--open-to-network" in run.stderr and "http://" not in run.stderr


def test_a_busy_port_is_one_line_and_status_2_before_any_address():
    with socket.socket() as busy:
        busy.bind(("127.0.0.1", 0))
        busy.listen()
        run = _ladle("serve", "--port", str(busy.getsockname()[1]))
    assert run.returncode == 2
    assert run.stderr.count("\n") == 1 and "cannot listen on 127.0.0.1 port" in run.stderr
    assert "http://" not in run.stderr + run.stdout and "Traceback" not in run.stderr


def test_the_page_needs_the_token_names_the_system_and_loads_nothing_from_outside(served):
    assert served.get("/")[0] == 403
    assert served.get("/?token=wrong")[0] == 403
    status, page = served.get(f"/?token={served.token}")
    assert status == 200
    assert "<title>ladle: Lead-tin (soft solders)</title>" in page
    assert not re.search(r"(src|href)=\"(https?:)?//", page) and "googleapis" not in page
    assert served.get(f"/?token={served.token}", host=f"attacker.example:{served.port}")[0] == 421
    assert served.get("/static/fonts/RobotoMono-VariableFont_wght.ttf")[0] == 200


async def _connect(served: Served, token: str, origin: str | None):
    """(HTTP status of the refusal, or 101 and the first bytes the explorer sent)."""
    headers = {"Origin": origin} if origin else {}
    async with aiohttp.ClientSession() as session:
        try:
            ws = await session.ws_connect(f"ws://127.0.0.1:{served.port}/ws/{token}?width=80&height=24",
                                          headers=headers, timeout=aiohttp.ClientWSTimeout(ws_close=5))
        except aiohttp.WSServerHandshakeError as error:
            return error.status, None
        return 101, ws, session


def test_only_the_pages_own_origin_with_the_token_starts_an_explorer_and_sessions_are_capped(served):
    async def scenario():
        assert (await _connect(served, served.token, "http://evil.example"))[0] == 403
        assert (await _connect(served, served.token, None))[0] == 403
        assert (await _connect(served, "wrong", served.origin))[0] == 403
        headers = {"Origin": served.origin}
        async with aiohttp.ClientSession() as session:
            ws = await session.ws_connect(f"ws://127.0.0.1:{served.port}/ws/{served.token}?width=80&height=24",
                                          headers=headers)
            first = await asyncio.wait_for(ws.receive(), timeout=60)
            assert first.type in (aiohttp.WSMsgType.BINARY, aiohttp.WSMsgType.TEXT)
            async with aiohttp.ClientSession() as second:       # --sessions 1: the second waits its turn
                with pytest.raises(aiohttp.WSServerHandshakeError) as refused:
                    await second.ws_connect(f"ws://127.0.0.1:{served.port}/ws/{served.token}", headers=headers)
                assert refused.value.status == 503
            await ws.close()

    asyncio.run(scenario())
