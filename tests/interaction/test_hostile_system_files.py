"""System files written to attack the terminal or the catalog: control characters from a file
never reach the terminal (titles, sources, safety notes, fact sources, phase names), with or
without --ascii; a fitted result that cannot be written is kept and named."""

from __future__ import annotations

import errno
import os
import subprocess
import sys
import tempfile
from pathlib import Path

import pytest

SHIPPED = Path(__file__).resolve().parents[2] / "systems"
#: Sets the window title, clears the screen, moves the cursor, colours, reverses the text.
NASTY_IN_TOML = r"\u001b]0;window title set\u0007\u001b[2J\u001b[H\u009b31m\u202e\r\b"


def _hostile_copy(folder: Path, name: str = "x-y") -> Path:
    """cu-ni with escape sequences in its title, source, safety text and a fact's source."""
    text = (SHIPPED / "cu-ni.toml").read_text(encoding="utf-8")
    lines = []
    for line in text.splitlines():
        for key in ("title", "source", "safety"):
            for quote in ('"""', '"'):
                if line.startswith(f"{key} = {quote}"):
                    start = len(key) + 3 + len(quote)
                    line = line[:start] + NASTY_IN_TOML + line[start:]
                    break
        lines.append(line)
    path = folder / f"{name}.toml"
    path.write_text("\n".join(lines) + "\n", encoding="utf-8")
    return path


def _ladle(*args: str, env: dict) -> subprocess.CompletedProcess:
    return subprocess.run([sys.executable, "-m", "ladle.tui.cli", *args], capture_output=True, text=True,
                          stdin=subprocess.DEVNULL, env={**os.environ, **env}, timeout=120)


def test_the_copy_really_holds_the_control_characters(tmp_path):
    from ladle.engine.files.loader import _read_toml

    doc = _read_toml(_hostile_copy(tmp_path))
    assert "\x1b]0;" in doc["title"] and "\x1b[2J" in doc["source"] and "\u202e" in doc["safety"]


@pytest.mark.parametrize("args", [("systems",), ("melt", "x-y", "--comp", "Ni=30wt%"),
                                  ("diagram", "x-y", "--ascii"), ("check", "x-y")], ids=lambda a: a[0])
def test_no_control_character_from_a_file_reaches_the_terminal(tmp_path, args):
    folder = tmp_path / "systems"
    folder.mkdir()
    _hostile_copy(folder)
    run = _ladle(*args, env={"LADLE_SYSTEMS": str(folder)})
    assert run.returncode in (0, 1), run.stderr
    output = run.stdout + run.stderr
    assert "x-y" in output or "Copper" in output
    for ch in "\x1b\x07\x9b\u202e\r\b":
        assert ch not in output, (repr(ch), args)


@pytest.mark.parametrize("args", [("systems",), ("point", "pb-sn", "--temp", "200C", "--comp", "Sn=30wt%")],
                         ids=lambda a: a[0])
def test_no_control_character_from_a_file_name_reaches_the_terminal(tmp_path, args):
    """File and folder names in the user's systems are the user's too: a folder named with an
    escape sequence holding a file of a shipped system's name (the note that it is not used
    under that name, on every command) and an unreadable file named with a bell (its row of
    `ladle systems`) are shown escaped."""
    folder = tmp_path / "u\x1b[31mx"
    folder.mkdir()
    (folder / "pb-sn.toml").write_text((SHIPPED / "pb-sn.toml").read_text(encoding="utf-8"), encoding="utf-8")
    (folder / "q\x07r.toml").write_text("x =\n", encoding="utf-8")
    run = _ladle(*args, env={"LADLE_SYSTEMS": str(folder)})
    assert run.returncode == 0, run.stderr
    assert "u\\x1b[31mx/pb-sn.toml: a system named 'pb-sn' exists already" in run.stderr
    if args[0] == "systems":
        assert "q\\x07r" in run.stdout and "(unreadable)" in run.stdout
    for ch in "\x1b\x07":
        assert ch not in run.stdout + run.stderr, repr(ch)


def test_a_phase_name_with_control_characters_is_refused_in_one_line(tmp_path):
    text = (SHIPPED / "cu-ni.toml").read_text(encoding="utf-8").replace("[phase.fcc]", '[phase."fcc\\u001b[2J"]', 1)
    path = tmp_path / "odd.toml"
    path.write_text(text, encoding="utf-8")
    run = _ladle("melt", str(path), "--comp", "Ni=30wt%", env={"XDG_CACHE_HOME": str(tmp_path / "cache")})
    assert run.returncode == 2 and run.stderr.count("\n") == 1
    assert "phase name may not hold control characters" in run.stderr and "\x1b" not in run.stderr


def test_a_fitted_file_that_cannot_be_written_is_kept_and_named(tmp_path, monkeypatch):
    from ladle.engine.files import atomic_files
    from ladle.tui.commands.fit import _write_or_keep
    from ladle.tui.errors import CommandError

    def disk_full(path, text):
        raise OSError(errno.ENOSPC, "No space left on device", str(path))

    monkeypatch.setattr(atomic_files, "write_atomic", disk_full)
    monkeypatch.setattr(tempfile, "tempdir", str(tmp_path / "kept"))
    (tmp_path / "kept").mkdir()
    with pytest.raises(CommandError) as refused:
        _write_or_keep(SHIPPED / "ag-au.toml", tmp_path / "fitted.toml", False, "fitted = 1\n")
    message = str(refused.value)
    assert "fitted.toml: No space left on device" in message
    kept = tmp_path / "kept" / "fitted.toml"
    assert f"the fitted file was kept as {kept}" in message and kept.read_text() == "fitted = 1\n"


def test_shipped_names_are_found_without_reading_the_users_folders(tmp_path, monkeypatch):
    from ladle.engine.files import catalog

    read = []
    real = catalog._system_files
    monkeypatch.setattr(catalog, "_system_files", lambda folder: read.append(folder) or real(folder))
    monkeypatch.setenv("LADLE_SYSTEMS", os.pathsep.join(str(tmp_path / n) for n in ("first", "second")))
    (tmp_path / "first").mkdir()
    (tmp_path / "second").mkdir()
    _hostile_copy(tmp_path / "first", "my-own")
    _hostile_copy(tmp_path / "second", "later")
    assert catalog.resolve("pb-sn").origin == "shipped"
    assert read == [catalog.shipped_folder()]
    read.clear()
    assert catalog.resolve("my-own").origin == "user"
    assert read == [catalog.shipped_folder(), tmp_path / "first"]          # the second folder is never read


#: Mutants of pb-sn.toml found by fuzzing the shipped files, each of which ended in a traceback, a
#: run of minutes or a wrong answer: (what, line replaced, replacement, words of the one line).
FUZZED = [
    ("fact temperature beyond the float range", "temperature_C = 327.462", "temperature_C = 1" + "0" * 400,
     "check[0].temperature_C: expected a number"),
    ("molar mass beyond the periodic table", "Pb = 207.2", "Pb = 1e308", "molar_mass.Pb"),
    ("integer of 400 digits", "Pb = 207.2", "Pb = 1" + "0" * 400, "molar_mass.Pb: expected a number"),
    ("arrays nested thousands deep", "[[check]]", "zzz = " + "[" * 50_000 + "]" * 50_000 + "\n[[check]]",
     "nested too deeply"),
    ("covered range of a billionth of a percent", "source = ", "covers_at_percent = [0, 1e-9]\nsource = ",
     "covers_at_percent"),
    ("covered temperatures below the diagram's window", "source = ", "covers_K = [300, 301]\nsource = ", "covers_K"),
]


@pytest.mark.parametrize("what,old,new,words", FUZZED, ids=[f[0] for f in FUZZED])
def test_fuzzed_files_are_one_line_and_status_2(tmp_path, what, old, new, words):
    text = (SHIPPED / "pb-sn.toml").read_text(encoding="utf-8")
    assert old in text, what
    path = tmp_path / "mutant.toml"
    path.write_text(text.replace(old, new, 1), encoding="utf-8")
    run = _ladle("diagram", str(path), env={"XDG_CACHE_HOME": str(tmp_path / "cache")})
    assert run.returncode == 2 and run.stderr.count("\n") == 1, run.stderr[-2000:]
    assert run.stderr.startswith("ladle diagram: mutant.toml: ") and words in run.stderr, run.stderr


def test_a_file_covering_a_hundredth_of_an_at_percent_draws_its_diagram(tmp_path):
    """A two-element file may cover as little as 0.01 at% (a dilute range): its diagram is drawn,
    cut at the window (before lines were cut, plotext joined the points of every segment reaching
    far beyond such a window dot by dot: 46 s for a 0.1 at% range)."""
    text = (SHIPPED / "pb-sn.toml").read_text(encoding="utf-8")
    path = tmp_path / "pb-sn-dilute.toml"
    path.write_text(text.replace('title = "', 'covers_at_percent = [0, 0.01]\ntitle = "', 1), encoding="utf-8")
    done = _ladle("diagram", str(path), env={"XDG_CACHE_HOME": str(tmp_path / "cache")})
    assert done.returncode == 0, done.stderr
    assert "covers 0-0.01 at% Sn only" in done.stdout
