"""`ladle serve`: its command line, and the command each browser tab runs."""

import shlex
import subprocess
import sys

from ladle.tui.explorer import serve
from ladle.tui.explorer.serving import explorer_command


def test_each_tab_runs_the_explorer_module_with_the_same_options():
    words = shlex.split(explorer_command("pb-sn", True))
    assert words == [sys.executable, "-m", "ladle.tui.explorer", "pb-sn", "--ascii"]
    assert shlex.split(explorer_command(None, False))[-1] == "ladle.tui.explorer"


def test_the_explorer_module_runs_and_answers_help():
    done = subprocess.run([sys.executable, "-m", "ladle.tui.explorer", "--help"],
                          capture_output=True, text=True, timeout=60)
    assert done.returncode == 0 and "--ascii" in done.stdout


def test_a_bad_serve_option_is_one_line_and_exit_status_2(capsys):
    assert serve(["--port", "many"]) == 2
    err = capsys.readouterr().err
    assert err.startswith("ladle serve: argument --port: invalid int value")
    assert err.count("\n") == 1
