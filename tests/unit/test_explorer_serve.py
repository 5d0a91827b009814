"""`ladle serve`: its command line, and the command each browser tab runs."""

import shlex
import subprocess
import sys

from ladle.tui.explorer.serving import explorer_command, is_loopback


def test_each_tab_runs_the_explorer_module_with_the_same_options():
    words = shlex.split(explorer_command("pb-sn", True))
    assert words == [sys.executable, "-m", "ladle.tui.explorer", "pb-sn", "--ascii"]
    assert shlex.split(explorer_command(None, False))[-1] == "ladle.tui.explorer"


def test_the_explorer_module_runs_and_answers_help():
    done = subprocess.run([sys.executable, "-m", "ladle.tui.explorer", "--help"],
                          capture_output=True, text=True, timeout=60)
    assert done.returncode == 0 and "--ascii" in done.stdout


def test_only_loopback_hosts_count_as_this_machine():
    assert all(is_loopback(h) for h in ("localhost", "127.0.0.1", "127.0.0.2", "::1", "[::1]", "LOCALHOST"))
    assert not any(is_loopback(h) for h in ("0.0.0.0", "::", "192.168.1.10", "example.org", ""))
