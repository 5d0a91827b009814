"""Open the installed `ladle` explorer in an 80x24 pseudo-terminal, wait for its first full
screen, press q, and check that it drew the status pane and quit cleanly (a binary diagram's
pane ends with NEAREST; an isopleth's, such as fe-c's, lists PHASES).

    python .ci/first_screen.py [SYSTEM]

Run by .ci/run against the wheel installed in a fresh virtual environment, from a folder outside
the source tree. Exit status 0 when the first screen showed the expected words, 1 otherwise.
"""

from __future__ import annotations

import fcntl
import os
import pty
import re
import select
import shutil
import struct
import subprocess
import sys
import tempfile
import termios
import time

PANE_MARKS = (b"NEAREST", b"PHASES")   # the status pane's last heading: a binary diagram, an isopleth
MARKS = (b"quit",)                     # the key bar
TIMEOUT_S = 60.0


def drawn(seen: bytes | bytearray) -> bool:
    """Whether the output holds a whole first screen: the key bar and the pane's last heading."""
    return all(m in seen for m in MARKS) and any(m in seen for m in PANE_MARKS)


def main() -> int:
    system = sys.argv[1] if len(sys.argv) > 1 else "pb-sn"
    ladle = shutil.which("ladle")
    if ladle is None:
        print("first_screen: no `ladle` on PATH", file=sys.stderr)
        return 1
    master, slave = pty.openpty()
    fcntl.ioctl(slave, termios.TIOCSWINSZ, struct.pack("HHHH", 24, 80, 0, 0))
    with tempfile.TemporaryDirectory() as state:
        env = dict(os.environ, TERM="xterm-256color", XDG_STATE_HOME=state, XDG_CACHE_HOME=state,
                   XDG_CONFIG_HOME=state)
        process = subprocess.Popen([ladle, system], stdin=slave, stdout=slave, stderr=slave, env=env,
                                   close_fds=True, start_new_session=True)
        os.close(slave)
        seen = bytearray()
        deadline = time.monotonic() + TIMEOUT_S
        while time.monotonic() < deadline and not drawn(seen):
            ready, _, _ = select.select([master], [], [], 0.5)
            if ready:
                try:
                    seen += os.read(master, 65536)
                except OSError:
                    break
        ok = drawn(seen)
        os.write(master, b"q")
        try:
            rc = process.wait(timeout=20)
        except subprocess.TimeoutExpired:
            process.kill()
            rc = None
        os.close(master)
    text = re.sub(rb"\x1b\[[0-9;?]*[A-Za-z]", b" ", bytes(seen)).decode("utf-8", "replace")
    if not ok or rc != 0:
        print(f"first_screen: the explorer {'drew' if ok else 'did not draw'} its first screen; "
              f"exit status {rc}; last output: {' '.join(text.split())[-400:]!r}", file=sys.stderr)
        return 1
    print(f"first_screen: {system} explorer drew its first screen and quit cleanly")
    return 0


if __name__ == "__main__":
    sys.exit(main())
