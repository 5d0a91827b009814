"""Benchmark of the full-screen explorer in a real pseudo-terminal (run on demand, not a test).

    python tests/benchmarks/explorer_bench.py [--json] [--system pb-sn] [--presses 30] [--use-s 60]

Measures, on an 80x24 pseudo-terminal:
- start_to_first_screen_s: process start to the last byte of the first full screen (the
  status pane's last heading and the key bar have arrived, then the output stays quiet);
- key_to_screen_ms (median and 90th percentile) in each view (diagram, energy, reactions,
  cooling): per key press, the time from writing the key to the last byte of the updated screen.
  The cursor keeps moving to new points (fine steps right and up in turn; in the cooling view
  coarse steps up and down from 200 C, inside the plotted freezing range, since a new
  composition starts a computation measured apart and a step that changes nothing on screen
  sends nothing); the reactions view moves down its table;
- cooling_new_alloy_ms: in the cooling view, a step in composition to the last byte of the
  recomputed paths (median);
- picker_open_ms: from `s` to the last byte of the system picker (median of five);
- resident_MB_after_use: resident memory (VmRSS) after --use-s seconds of moving through every view;
- idle_bytes_per_s: bytes the explorer sends while nothing changes (target 0).
Targets (issue 10): key median 15 ms in every view, picker 100 ms; (issue 4) first screen under
1.0 s, memory under 150 MB.

    python tests/benchmarks/explorer_bench.py --isopleth [--json] [--system fe-fe3c] [--presses 30]

A system drawn as an isopleth (three or more elements, or Fe-C): start_to_mapped_s (process
start to the mapped isopleth and the cursor's alloy's transitions on screen, then quiet),
key_to_screen_ms for moves in temperature (up and down in turn) and in composition (right and
left in turn; each then waits for the transitions scanned once the cursor rests), each to the
last byte of the updated screen (the point equilibrium answered in a worker included), and
idle_bytes_per_s. Target (issue 14): a cursor move on a mapped isopleth in 50 ms or less.
"""

from __future__ import annotations

import argparse
import fcntl
import json
import os
import pty
import select
import statistics
import struct
import subprocess
import sys
import tempfile
import termios
import time
from collections.abc import Iterator
from contextlib import contextmanager

QUIET_S = 0.15          # the screen is complete when no byte arrives for this long
FINE_RIGHT, FINE_UP, FINE_DOWN = "\x1b[1;2C", "\x1b[1;2A", "\x1b[1;2B"   # shift+arrows
RIGHT, LEFT, UP, DOWN = "\x1b[C", "\x1b[D", "\x1b[A", "\x1b[B"
VIEWS = {"diagram": "1", "energy": "2", "reactions": "3", "cooling": "4"}
#: Keys per view that keep moving the cursor to new points.
WALKS = {"diagram": (FINE_RIGHT, FINE_UP), "energy": (FINE_RIGHT, FINE_UP), "reactions": (DOWN, UP),
         "cooling": (UP, DOWN)}
FIRST_SCREEN_MARKS = (b"NEAREST", b"quit")
MAPPED_MARKS = (b"FIELDS", b"governs")    # an isopleth's key of fields, the heat-treatment caution


def _read_until_quiet(fd: int, quiet_s: float, limit_s: float) -> tuple[bytes, float]:
    """Read until nothing arrives for quiet_s; returns the bytes and the time of the last one."""
    data = bytearray()
    last = time.perf_counter()
    deadline = last + limit_s
    while time.perf_counter() < deadline:
        ready, _, _ = select.select([fd], [], [], quiet_s)
        if not ready:
            break
        try:
            chunk = os.read(fd, 65536)
        except OSError:
            break
        if not chunk:
            break
        data += chunk
        last = time.perf_counter()
    return bytes(data), last


@contextmanager
def _explorer(system: str) -> Iterator[tuple[subprocess.Popen, int, float]]:
    """The explorer on `system` in an 80x24 pseudo-terminal with a state folder of its own:
    (process, the terminal's file descriptor, start time); on leaving, 'q' quits it (killed if it
    does not end) and the terminal is closed."""
    with tempfile.TemporaryDirectory() as state_dir:
        master, slave = pty.openpty()
        fcntl.ioctl(slave, termios.TIOCSWINSZ, struct.pack("HHHH", 24, 80, 0, 0))
        env = dict(os.environ, TERM="xterm-256color", XDG_STATE_HOME=state_dir,
                   COLUMNS="80", LINES="24")
        env.pop("NO_COLOR", None)
        code = "import sys; from ladle.tui.explorer import run; sys.exit(run(sys.argv[1:]))"
        started = time.perf_counter()
        process = subprocess.Popen([sys.executable, "-c", code, system], stdin=slave, stdout=slave,
                                   stderr=slave, env=env, close_fds=True, start_new_session=True)
        os.close(slave)
        try:
            yield process, master, started
            os.write(master, b"q")
            process.wait(timeout=10)
        finally:
            if process.poll() is None:
                process.kill()
            os.close(master)


def _first_screen(fd: int, started: float) -> float:
    seen = bytearray()
    deadline = started + 20.0
    while time.perf_counter() < deadline:
        ready, _, _ = select.select([fd], [], [], 0.5)
        if ready:
            seen += os.read(fd, 65536)
            if all(mark in seen for mark in FIRST_SCREEN_MARKS):
                break
    _, last = _read_until_quiet(fd, QUIET_S * 2, 5.0)
    return max(last, started) - started


def _resident_mb(pid: int) -> float:
    with open(f"/proc/{pid}/status", encoding="ascii") as status:
        for line in status:
            if line.startswith("VmRSS:"):
                return int(line.split()[1]) / 1024.0
    return float("nan")


def _press(fd: int, key: str, quiet_s: float = QUIET_S) -> float | None:
    """Send one key; the time (ms) to the last byte of the answer, None when nothing came."""
    sent = time.perf_counter()
    os.write(fd, key.encode())
    data, last = _read_until_quiet(fd, quiet_s, 10.0)
    return (last - sent) * 1000.0 if data else None


def _summary(latencies: list[float]) -> dict:
    ordered = sorted(latencies)
    if not ordered:
        return {"median": None, "p90": None, "answered": 0}
    return {"median": round(statistics.median(ordered), 1),
            "p90": round(ordered[int(0.9 * (len(ordered) - 1))], 1), "answered": len(ordered)}


def _views(fd: int, presses: int) -> dict:
    """Key-to-screen times in every view, the cursor moving to new points."""
    out = {}
    for view, key in VIEWS.items():
        _press(fd, key, 0.5 if view == "cooling" else QUIET_S)
        if view == "cooling":
            _read_until_quiet(fd, 0.5, 10.0)   # the first alloy's paths
            _press(fd, "g")                    # the cursor into the plotted freezing range
            _press(fd, "200C\r", 0.5)
        walk = WALKS[view]
        times = [_press(fd, walk[i % len(walk)]) for i in range(presses)]
        out[view] = _summary([t for t in times if t is not None])
    return out


def _new_alloys(fd: int, count: int) -> dict:
    """In the cooling view: a fine step in composition to the recomputed paths."""
    times = [_press(fd, FINE_RIGHT, 0.4) for _ in range(count)]
    return _summary([t for t in times if t is not None])


def _picker(fd: int, count: int) -> dict:
    times = []
    for _ in range(count):
        t = _press(fd, "s")
        if t is not None:
            times.append(t)
        _press(fd, "\x1b")
    return _summary(times)


def _use(fd: int, seconds: float) -> None:
    """Move through every view for `seconds`, as a person exploring would."""
    keys = (RIGHT, UP, LEFT, DOWN, FINE_RIGHT, FINE_UP, "2", RIGHT, UP, "1", "+", LEFT, "-", "3",
            DOWN, "1", "0", "4", UP, "1")
    end = time.perf_counter() + seconds
    index = 0
    while time.perf_counter() < end:
        _press(fd, keys[index % len(keys)], 0.05)
        index += 1


def measure(system: str, presses: int, use_s: float) -> dict:
    with _explorer(system) as (process, fd, started):
        first = _first_screen(fd, started)
        views = _views(fd, presses)
        new_alloys = _new_alloys(fd, 5)
        _press(fd, "1")
        picker = _picker(fd, 5)
        _use(fd, use_s)
        _read_until_quiet(fd, 1.5, 10.0)   # let the last frame and the state save pass
        resident = _resident_mb(process.pid)
        idle_start = time.perf_counter()
        quiet_bytes = bytearray()
        while time.perf_counter() - idle_start < 3.0:
            ready, _, _ = select.select([fd], [], [], 0.2)
            if ready:
                quiet_bytes += os.read(fd, 65536)
    return {
        "system": system,
        "start_to_first_screen_s": round(first, 3),
        "key_to_screen_ms": views,
        "cooling_new_alloy_ms": new_alloys,
        "picker_open_ms": picker,
        "use_s": use_s,
        "resident_MB_after_use": round(resident, 1),
        "idle_bytes_per_s": round(len(quiet_bytes) / 3.0, 1),
        "targets": {"start_to_first_screen_s": 1.0, "key_to_screen_ms_median": 15,
                    "picker_open_ms": 100, "resident_MB": 150, "idle_bytes_per_s": 0},
    }


def _mapped(fd: int, started: float, limit_s: float = 300.0) -> float:
    """Wait for the mapped isopleth (its key of fields, or the transitions' caution, on screen)
    and then quiet; the time of the last byte."""
    seen = bytearray()
    last = started
    while time.perf_counter() - started < limit_s:
        data, at = _read_until_quiet(fd, 2.0, limit_s)
        if data:
            seen += data
            last = at
        if any(mark in seen for mark in MAPPED_MARKS) and not data:
            break
    return last


def measure_isopleth(system: str, presses: int) -> dict:
    """Key-to-screen times on a mapped isopleth (see the module's docstring)."""
    with _explorer(system) as (_process, fd, started):
        mapped = _mapped(fd, started)
        temperature = [_press(fd, (UP, DOWN)[i % 2]) for i in range(presses)]
        composition = []
        for i in range(presses):
            composition.append(_press(fd, (RIGHT, LEFT)[i % 2]))
            _read_until_quiet(fd, 1.0, 60.0)            # the transitions of the new alloy
        idle, _ = _read_until_quiet(fd, 3.0, 3.0)
    return {
        "system": system,
        "start_to_mapped_s": round(mapped - started, 2),
        "key_to_screen_ms": {"temperature": _summary([t for t in temperature if t is not None]),
                             "composition": _summary([t for t in composition if t is not None])},
        "idle_bytes_per_s": round(len(idle) / 3.0, 1),
        "targets": {"key_to_screen_ms_median": 50, "idle_bytes_per_s": 0},
    }


def main() -> int:
    parser = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    parser.add_argument("--json", action="store_true", help="print one JSON object")
    parser.add_argument("--system", default="pb-sn")
    parser.add_argument("--presses", type=int, default=30, help="key presses per view")
    parser.add_argument("--use-s", type=float, default=60.0, help="seconds of use before the memory is read")
    parser.add_argument("--isopleth", action="store_true", help="a system drawn as an isopleth (default fe-fe3c)")
    args = parser.parse_args()
    if args.isopleth:
        result = measure_isopleth(args.system if args.system != "pb-sn" else "fe-fe3c", args.presses)
    else:
        result = measure(args.system, args.presses, args.use_s)
    if args.json:
        print(json.dumps(result))
    else:
        for key, value in result.items():
            if key != "targets":
                print(f"{key:28} {value}")
    return 0


if __name__ == "__main__":
    sys.exit(main())
