"""`ladle serve` in a real headless browser (run on demand, not a test).

    python tests/benchmarks/browser_serve.py [--json] [--system pb-sn]

Needs Debian's chromium and chromium-driver (apt-get install -y chromium chromium-driver) and
the serve extra (pip install '.[serve]'). Starts `ladle serve SYSTEM` on 127.0.0.1 with a fresh
state folder, drives Chromium through chromedriver's WebDriver protocol (plain HTTP, no extra
Python package) and checks, with timings:

- page_title_s: from opening the printed URL to the tab's title 'ladle: <system title>';
- first_screen_s: to the explorer's first screen, seen as the status pane's temperature of the
  default cursor ('220.0' for pb-sn) in the bytes the page receives over its WebSocket;
- focused: keys reach the terminal without a click (the page focuses it on load);
- key_to_status_ms: from pressing the Up arrow (sent to whatever has focus, no click) to the
  status pane's new temperature ('230.0').
Exits with status 1 and says which check failed.
"""

from __future__ import annotations

import argparse
import json
import os
import re
import shutil
import socket
import subprocess
import sys
import tempfile
import time
import urllib.request

#: Records the text the page's WebSocket receives (the explorer's terminal output) in
#: window.__ladleText, installed before the page's own scripts run.
RECORDER = """
(function () {
  const Native = window.WebSocket;
  const decoder = new TextDecoder();
  window.__ladleText = "";
  function Recording(url, protocols) {
    const ws = protocols ? new Native(url, protocols) : new Native(url);
    ws.addEventListener("message", function (event) {
      if (typeof event.data !== "string") {
        window.__ladleText += decoder.decode(new Uint8Array(event.data), {stream: true});
      }
    });
    return ws;
  }
  Recording.prototype = Native.prototype;
  Recording.CONNECTING = 0; Recording.OPEN = 1; Recording.CLOSING = 2; Recording.CLOSED = 3;
  window.WebSocket = Recording;
})();
"""
ANSI = re.compile(r"\x1b(\[[0-?]*[ -/]*[@-~]|\][^\x07\x1b]*(\x07|\x1b\\)|[@-_])")
ARROW_UP = "\ue013"      # WebDriver's key code for the Up arrow
#: The default cursor's temperature in the status pane, and the one after one Up press (pb-sn).
FIRST, AFTER_UP = "220.0", "230.0"


def free_port() -> int:
    with socket.socket() as s:
        s.bind(("127.0.0.1", 0))
        return s.getsockname()[1]


class WebDriver:
    """The few WebDriver commands used here, over HTTP to chromedriver."""

    def __init__(self, port: int) -> None:
        self.base = f"http://127.0.0.1:{port}"
        self.session = ""

    def call(self, method: str, path: str, body: dict | None = None) -> object:
        data = None if body is None else json.dumps(body).encode()
        request = urllib.request.Request(f"{self.base}{path}", data=data, method=method,
                                         headers={"Content-Type": "application/json"})
        with urllib.request.urlopen(request, timeout=60) as response:
            return json.loads(response.read() or b"{}").get("value")

    def start(self, chromium: str) -> None:
        options = {"binary": chromium, "args": ["--headless=new", "--no-sandbox", "--disable-gpu",
                                                "--window-size=1200,800"]}
        value = self.call("POST", "/session", {"capabilities": {"alwaysMatch": {
            "browserName": "chrome", "goog:chromeOptions": options}}})
        self.session = value["sessionId"]

    def in_session(self, method: str, path: str, body: dict | None = None) -> object:
        return self.call(method, f"/session/{self.session}{path}", body)

    def script(self, source: str) -> object:
        return self.in_session("POST", "/execute/sync", {"script": source, "args": []})

    def quit(self) -> None:
        if self.session:
            self.in_session("DELETE", "")


def wait_for(predicate, timeout: float) -> float | None:
    """Seconds until predicate() is true, or None after `timeout` seconds."""
    start = time.perf_counter()
    while time.perf_counter() - start < timeout:
        if predicate():
            return time.perf_counter() - start
        time.sleep(0.02)
    return None


def run(system: str) -> dict:
    chromium, driver_binary = shutil.which("chromium"), shutil.which("chromedriver")
    if not (chromium and driver_binary):
        raise SystemExit("browser_serve: needs chromium and chromedriver (apt-get install -y chromium chromium-driver)")
    state = tempfile.mkdtemp(prefix="ladle-browser-")
    env = dict(os.environ, XDG_STATE_HOME=state, XDG_CACHE_HOME=state)
    port = free_port()
    server = subprocess.Popen([sys.executable, "-m", "ladle.tui.cli", "serve", system, "--port", str(port)],
                              env=env, cwd=state, stdin=subprocess.DEVNULL, stderr=subprocess.PIPE, text=True)
    driver_port = free_port()
    driver = subprocess.Popen([driver_binary, f"--port={driver_port}"], stdout=subprocess.DEVNULL,
                              stderr=subprocess.DEVNULL)
    browser = WebDriver(driver_port)
    results: dict = {"system": system}
    failures = []
    try:
        line = server.stderr.readline()
        match = re.search(r"http://\S+\?token=\S+", line)
        if not match:
            raise SystemExit(f"browser_serve: ladle serve printed no address: {line.strip()}")
        url = match.group(0)
        if wait_for(lambda: _answers(driver_port), 20) is None:
            raise SystemExit("browser_serve: chromedriver did not start")
        browser.start(chromium)
        browser.in_session("POST", "/goog/cdp/execute", {"cmd": "Page.addScriptToEvaluateOnNewDocument",
                                                        "params": {"source": RECORDER}})
        opened = time.perf_counter()
        browser.in_session("POST", "/url", {"url": url})
        title = browser.in_session("GET", "/title")
        results["page_title"] = title
        results["page_title_s"] = round(time.perf_counter() - opened, 3)
        if not (isinstance(title, str) and title.startswith("ladle: ")):
            failures.append(f"page title {title!r}, expected 'ladle: <system title>'")

        def screen() -> str:
            return ANSI.sub("", browser.script("return window.__ladleText || '';") or "")

        waited = wait_for(lambda: FIRST in screen(), 60)
        results["first_screen_s"] = None if waited is None else round(time.perf_counter() - opened, 3)
        if waited is None:
            failures.append(f"no first screen with the status pane's {FIRST} within 60 s")
        focused = browser.script("return document.activeElement && "
                                 "document.activeElement.classList.contains('xterm-helper-textarea');")
        results["focused"] = bool(focused)
        if not focused:
            failures.append("the terminal is not focused after loading (keys would need a click)")
        before = len(screen())
        pressed = time.perf_counter()
        browser.in_session("POST", "/actions", {"actions": [{"type": "key", "id": "keyboard", "actions": [
            {"type": "keyDown", "value": ARROW_UP}, {"type": "keyUp", "value": ARROW_UP}]}]})
        changed = wait_for(lambda: AFTER_UP in screen()[before:], 30)
        results["key_to_status_ms"] = None if changed is None else round(1000 * (time.perf_counter() - pressed), 1)
        if changed is None:
            failures.append(f"the Up key did not change the status pane to {AFTER_UP} within 30 s")
    finally:
        try:
            browser.quit()
        except OSError:
            pass
        driver.terminate()
        server.terminate()
        driver.wait(timeout=20)
        server.wait(timeout=20)
        shutil.rmtree(state, ignore_errors=True)
    results["failures"] = failures
    return results


def _answers(port: int) -> bool:
    try:
        with urllib.request.urlopen(f"http://127.0.0.1:{port}/status", timeout=2):
            return True
    except OSError:
        return False


def main() -> int:
    parser = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    parser.add_argument("--json", action="store_true")
    parser.add_argument("--system", default="pb-sn")
    args = parser.parse_args()
    results = run(args.system)
    if args.json:
        print(json.dumps(results, indent=1))
    else:
        for key, value in results.items():
            if key != "failures":
                print(f"{key:>18}: {value}")
        for failure in results["failures"]:
            print(f"FAILED: {failure}")
    return 1 if results["failures"] else 0


if __name__ == "__main__":
    sys.exit(main())
