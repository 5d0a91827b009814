"""Operating-system errors and odd arguments, through the real command line: every one is one
line on stderr naming the path and the reason, with exit status 2; a broken pipe is status 1
for every command; nothing prints a traceback or a control character from the input."""

from __future__ import annotations

import os
import shutil
import subprocess
import sys
from pathlib import Path

import pytest

SHIPPED = Path(__file__).resolve().parents[2] / "systems"
HEATS = SHIPPED / "demo" / "al-si-heats.csv"


def _ladle(*args: str, env: dict | None = None, as_plain_user: bool = False, stdout=subprocess.PIPE,
           timeout: float = 120) -> subprocess.CompletedProcess:
    """Run `ladle ARGS`; `as_plain_user` drops root's right to ignore file permissions (so that
    an unreadable file is unreadable in this test, also when the suite runs as root)."""
    command = [sys.executable, "-m", "ladle.tui.cli", *args]
    if as_plain_user and os.geteuid() == 0:
        setpriv = shutil.which("setpriv")
        if setpriv is None:
            pytest.skip("running as root without setpriv: permissions cannot be tested")
        command = [setpriv, "--bounding-set=-dac_override,-dac_read_search", *command]
    return subprocess.run(command, stdout=stdout, stderr=subprocess.PIPE, text=True, stdin=subprocess.DEVNULL,
                          env={**os.environ, **(env or {})}, timeout=timeout)


def _one_line(run: subprocess.CompletedProcess, *expected: str) -> str:
    assert run.returncode == 2, run.stderr
    assert run.stderr.count("\n") == 1 and "Traceback" not in run.stderr, run.stderr
    for text in expected:
        assert text in run.stderr, run.stderr
    return run.stderr


@pytest.fixture
def user_env(tmp_path):
    """No user systems, a private cache and state folder."""
    return {"LADLE_SYSTEMS": str(tmp_path / "none"), "XDG_CACHE_HOME": str(tmp_path / "cache"),
            "XDG_STATE_HOME": str(tmp_path / "state")}


def test_a_path_component_over_255_bytes(user_env):
    long_name = "a" * 300 + ".toml"
    _one_line(_ladle("melt", long_name, "--comp", "Si=10wt%", env=user_env), "File name too long")
    _one_line(_ladle(long_name, env=user_env), "File name too long")          # the explorer's first word


def test_unreadable_system_file_and_folder(tmp_path, user_env):
    unreadable = tmp_path / "mine.toml"
    shutil.copy(SHIPPED / "cu-ni.toml", unreadable)
    unreadable.chmod(0)
    folder = tmp_path / "closed"
    folder.mkdir()
    shutil.copy(SHIPPED / "cu-ni.toml", folder / "x-y.toml")
    folder.chmod(0)
    try:
        _one_line(_ladle("melt", str(unreadable), "--comp", "Ni=10wt%", env=user_env, as_plain_user=True),
                  str(unreadable), "Permission denied")
        _one_line(_ladle("melt", str(folder / "x-y.toml"), "--comp", "Ni=10wt%", env=user_env, as_plain_user=True),
                  "x-y.toml", "Permission denied")
    finally:
        folder.chmod(0o755)


def test_an_unreadable_folder_in_ladle_systems_is_skipped_with_a_note(tmp_path, user_env, shared_check_cache):
    closed = tmp_path / "closed"
    closed.mkdir()
    closed.chmod(0)
    # the run's remembered check counts (the listing measures no shipped system afresh)
    env = {**user_env, "LADLE_SYSTEMS": f"{closed / 'sub'}{os.pathsep}{closed}",
           "XDG_CACHE_HOME": str(shared_check_cache)}
    try:
        melt = _ladle("melt", "cu-ni", "--comp", "Ni=10wt%", env=env, as_plain_user=True)
        listed = _ladle("systems", env=env, as_plain_user=True)
    finally:
        closed.chmod(0o755)
    assert melt.returncode == 0 and "liquidus" in melt.stdout
    assert listed.returncode == 0 and "cu-ni" in listed.stdout
    assert f"{closed}: skipped, cannot read this folder of systems (Permission denied)" in listed.stderr
    assert "Traceback" not in melt.stderr + listed.stderr


def test_output_into_a_read_only_folder(tmp_path, user_env):
    read_only = tmp_path / "read-only"
    read_only.mkdir()
    read_only.chmod(0o555)
    try:
        _one_line(_ladle("batch", "al-si", str(HEATS), "--melt-only", "-o", str(read_only / "out.csv"),
                         env=user_env, as_plain_user=True), str(read_only), "Permission denied")
        fitted = _ladle("fit", str(SHIPPED / "ag-au.toml"), "-o", str(read_only / "fitted.toml"),
                        env=user_env, as_plain_user=True, timeout=30)    # refused before fitting: fast
        _one_line(fitted, str(read_only / "fitted.toml"), "cannot write in this folder (Permission denied)")
    finally:
        read_only.chmod(0o755)
    assert list(read_only.iterdir()) == []


def test_devices_and_fifos_are_never_replaced_even_with_force(tmp_path, user_env):
    fifo = tmp_path / "pipe"
    os.mkfifo(fifo)
    _one_line(_ladle("batch", "al-si", str(HEATS), "--melt-only", "-o", str(fifo), "--force", env=user_env),
              str(fifo), "not a regular file (a FIFO)")
    _one_line(_ladle("fit", str(SHIPPED / "ag-au.toml"), "-o", str(fifo), "--force", env=user_env, timeout=30),
              str(fifo), "not a regular file (a FIFO)")
    _one_line(_ladle("fit", str(SHIPPED / "ag-au.toml"), "-o", "/dev/null", "--force", env=user_env, timeout=30),
              "/dev/null", "a character device")
    assert fifo.is_fifo()


def test_a_full_disk_on_standard_output(user_env):
    if not os.path.exists("/dev/full"):
        pytest.skip("this system has no /dev/full")
    with open("/dev/full", "w") as full:
        run = _ladle("systems", env=user_env, stdout=full)
    _one_line(run, "standard output: No space left on device")


#: One cheap invocation of every command (and of --help), whose output goes to a closed pipe.
EVERY_COMMAND = [
    ("systems",), ("point", "pb-sn", "--temp", "200C", "--comp", "Sn=30wt%"), ("melt", "pb-sn", "--comp", "Sn=30wt%"),
    ("diagram", "pb-sn", "--csv"), ("cool", "pb-sn", "--comp", "Sn=30wt%"), ("check", "ag-au"),
    ("batch", "al-si", str(HEATS), "--melt-only"), ("transitions", "pb-sn", "--comp", "Sn=30wt%"),
    ("--help",), ("melt", "--help"),
]


def test_a_broken_pipe_is_status_1_for_every_command(user_env):
    reader, writer = os.pipe()
    os.close(reader)                               # the reader went away, as `| head` does
    try:                                           # all at once: they only wait for the machine
        running = {args[0] + (" --help" if "--help" in args[1:] else ""): subprocess.Popen(
            [sys.executable, "-m", "ladle.tui.cli", *args], stdout=writer, stderr=subprocess.PIPE,
            stdin=subprocess.DEVNULL, text=True, env={**os.environ, **user_env}) for args in EVERY_COMMAND}
    finally:
        os.close(writer)
    for name, process in running.items():
        _out, err = process.communicate(timeout=300)
        assert (name, process.returncode, err) == (name, 1, "")


def test_a_path_with_a_newline_is_one_line_and_a_huge_argument_is_shortened(user_env):
    _one_line(_ladle("melt", "bad\nname.toml", "--comp", "Sn=10wt%", env=user_env), "bad\\nname.toml")
    huge = _ladle("melt", "pb-sn", "--comp", "Sn=" + "9" * 100_000 + "wt%", env=user_env)
    _one_line(huge, "characters)")
    assert len(huge.stderr) < 2000
    escape = _ladle("melt", "\x1b]0;pwned\x07\x1b[2J.toml", "--comp", "Sn=10wt%", env=user_env)
    _one_line(escape)
    assert "\x1b" not in escape.stderr and "\x07" not in escape.stderr


def _with_closed(fd: int, *args: str, env: dict) -> subprocess.CompletedProcess:
    """Run `ladle ARGS` with descriptor `fd` closed, as `ladle ARGS >&-` (1), `2>&-` (2) or
    `<&-` (0) does; the other two streams are pipes (stdout, stderr) or the null device."""
    streams = {0: subprocess.DEVNULL, 1: subprocess.PIPE, 2: subprocess.PIPE}
    return subprocess.run([sys.executable, "-m", "ladle.tui.cli", *args], text=True, timeout=120,
                          stdin=streams[0], stdout=streams[1], stderr=streams[2],
                          env={**os.environ, **env}, preexec_fn=lambda: os.close(fd))


@pytest.mark.parametrize("args", [("systems",), ("--help",), ("point", "pb-sn", "--temp", "200C", "--comp", "Sn=30wt%")])
def test_a_closed_standard_output_is_one_line_and_status_2(args, user_env):
    run = _with_closed(1, *args, env=user_env)
    _one_line(run, "standard output: Bad file descriptor")


def test_a_closed_standard_output_does_not_stop_a_run_that_writes_a_file(tmp_path, user_env):
    out = tmp_path / "results.csv"
    run = _with_closed(1, "batch", "al-si", str(HEATS), "--melt-only", "-o", str(out), env=user_env)
    assert "Traceback" not in run.stderr and "Bad file descriptor" not in run.stderr, run.stderr
    assert out.read_text().startswith("heat,furnace,Si wt%,liquidus_C,")


def test_a_closed_standard_error_keeps_messages_out_of_standard_output(user_env):
    run = _with_closed(2, "point", "pb-sn", "--temp", "200C", "--comp", "Sn=300wt%", env=user_env)
    assert (run.returncode, run.stdout) == (2, "")


def test_the_explorer_with_a_closed_standard_input_is_refused_in_one_line(user_env):
    _one_line(_with_closed(0, "pb-sn", env=user_env), "needs a terminal")


def test_a_terminal_that_is_not_utf8_gets_question_marks_for_what_it_cannot_show(tmp_path, user_env):
    mine = tmp_path / "pb-sn-mine.toml"
    text = (SHIPPED / "pb-sn.toml").read_text(encoding="utf-8")
    mine.write_text(text.replace('title = "', 'title = "Blei\u2013Zinn, ', 1), encoding="utf-8")
    run = _ladle("point", str(mine), "--temp", "200C", "--comp", "Sn=30wt%", env={**user_env, "PYTHONIOENCODING": "ascii"})
    assert (run.returncode, run.stderr) == (0, "")
    assert run.stdout.startswith("Blei?Zinn, ")
