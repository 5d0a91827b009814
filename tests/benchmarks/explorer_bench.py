"""Benchmark of the full-screen explorer in a real pseudo-terminal (run on demand, not a test).

    python tests/benchmarks/explorer_bench.py [--json] [--system pb-sn] [--presses 40]

Measures, on an 80x24 pseudo-terminal:
- start_to_first_screen_s: process start to the last byte of the first full screen (the
  status pane's last heading and the key bar have arrived, then the output stays quiet);
- key_to_screen_ms: per cursor key press (arrow keys, alternating directions), the time from
  writing the key to the last byte of the updated status pane and plot; median and 90th percentile;
- resident_MB: the explorer's resident memory after the presses (VmRSS);
- idle_bytes_per_s: bytes the explorer sends while nothing changes (target 0).
Targets (issue 4): first screen under 1.0 s, key median under 50 ms, memory under 150 MB.
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

QUIET_S = 0.15          # the screen is complete when no byte arrives for this long
KEYS = ("\x1b[C", "\x1b[A", "\x1b[D", "\x1b[B")   # right, up, left, down
FIRST_SCREEN_MARKS = (b"NEAREST", b"quit")


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


def _start(system: str, state_dir: str) -> tuple[subprocess.Popen, int, float]:
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
    return process, master, started


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


def measure(system: str, presses: int) -> dict:
    with tempfile.TemporaryDirectory() as state_dir:
        process, fd, started = _start(system, state_dir)
        try:
            first = _first_screen(fd, started)
            latencies = []
            for index in range(presses):
                sent = time.perf_counter()
                os.write(fd, KEYS[index % len(KEYS)].encode())
                data, last = _read_until_quiet(fd, QUIET_S, 5.0)
                if data:
                    latencies.append((last - sent) * 1000.0)
            resident = _resident_mb(process.pid)
            _read_until_quiet(fd, 1.5, 5.0)   # let the last frame and the state save pass
            idle_start = time.perf_counter()
            quiet_bytes = bytearray()
            while time.perf_counter() - idle_start < 3.0:
                ready, _, _ = select.select([fd], [], [], 0.2)
                if ready:
                    quiet_bytes += os.read(fd, 65536)
            os.write(fd, b"q")
            process.wait(timeout=10)
        finally:
            if process.poll() is None:
                process.kill()
            os.close(fd)
    latencies.sort()
    return {
        "system": system,
        "start_to_first_screen_s": round(first, 3),
        "key_to_screen_ms_median": round(statistics.median(latencies), 1),
        "key_to_screen_ms_p90": round(latencies[int(0.9 * (len(latencies) - 1))], 1),
        "presses_answered": len(latencies),
        "resident_MB": round(resident, 1),
        "idle_bytes_per_s": round(len(quiet_bytes) / 3.0, 1),
        "targets": {"start_to_first_screen_s": 1.0, "key_to_screen_ms_median": 50,
                    "resident_MB": 150, "idle_bytes_per_s": 0},
    }


def main() -> int:
    parser = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    parser.add_argument("--json", action="store_true", help="print one JSON object")
    parser.add_argument("--system", default="pb-sn")
    parser.add_argument("--presses", type=int, default=40)
    args = parser.parse_args()
    result = measure(args.system, args.presses)
    if args.json:
        print(json.dumps(result))
    else:
        for key, value in result.items():
            if key != "targets":
                print(f"{key:28} {value}")
    return 0


if __name__ == "__main__":
    sys.exit(main())
