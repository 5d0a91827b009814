"""How `ladle` starts: what a mistyped first word says, what `--help` costs and says, the
explorer refusing a pipe, and the BLAS thread limit."""

from __future__ import annotations

import json
import subprocess
import sys
import textwrap

from ladle.tui.blas_threads import THREAD_VARIABLES, limit_blas_threads


def _ladle(*args: str) -> subprocess.CompletedProcess:
    """Run `ladle ARGS` in a fresh interpreter with standard input and output not a terminal."""
    return subprocess.run([sys.executable, "-m", "ladle.tui.cli", *args], capture_output=True,
                          text=True, stdin=subprocess.DEVNULL, timeout=120)


def test_unknown_system_first_says_what_ladle_melt_says():
    run = _ladle("al-zn")
    assert run.returncode == 2
    assert run.stdout == ""
    assert run.stderr.count("\n") == 1
    assert run.stderr.startswith("ladle: unknown system 'al-zn'; known systems: ")
    assert "pb-sn" in run.stderr and "commands: check" in run.stderr


def test_explorer_refuses_output_that_is_not_a_terminal():
    run = _ladle("al-si")
    assert run.returncode == 2
    assert run.stdout == ""                    # no escape codes written to the file
    assert run.stderr.count("\n") == 1
    assert "needs a terminal" in run.stderr and "ladle diagram al-si" in run.stderr


def test_help_names_the_explorer_and_ascii_and_imports_no_numpy():
    script = textwrap.dedent("""
        import contextlib, io, json, sys
        from ladle.tui.cli import main
        buf = io.StringIO()
        with contextlib.redirect_stdout(buf):
            try:
                main(["--help"])
            except SystemExit:
                pass
        print(json.dumps({"help": buf.getvalue(), "numpy": "numpy" in sys.modules}))
    """)
    run = subprocess.run([sys.executable, "-c", script], capture_output=True, text=True, timeout=120)
    out = json.loads(run.stdout.strip().splitlines()[-1])
    assert "--ascii" in out["help"] and "explorer" in out["help"]
    assert out["numpy"] is False


def test_one_blas_thread_unless_the_person_chose():
    environ: dict[str, str] = {}
    limit_blas_threads(environ)
    assert environ == {name: "1" for name in THREAD_VARIABLES}
    chosen = {"OMP_NUM_THREADS": "4"}
    limit_blas_threads(chosen)
    assert chosen == {"OMP_NUM_THREADS": "4"}
