"""Atomic writes: a reader sees the old file or the whole new one; nothing is replaced by accident."""

import os

import pytest

from ladle.engine.files.atomic_files import write_atomic, write_new_file


def test_atomic_write_replaces_whole_and_leaves_no_temporary_file(tmp_path):
    target = tmp_path / "out.toml"
    target.write_text("old = 1\n")
    write_atomic(target, "new = 2\n")
    assert target.read_text() == "new = 2\n"
    assert [p.name for p in tmp_path.iterdir()] == ["out.toml"]


def test_new_files_never_replace_and_take_the_next_free_number(tmp_path):
    (tmp_path / "point.json").write_text("mine")
    first = write_new_file(tmp_path, "point", ".json", "{}")
    second = write_new_file(tmp_path, "point", ".json", "[]")
    assert (first.name, second.name) == ("point-2.json", "point-3.json")
    assert (tmp_path / "point.json").read_text() == "mine"
    assert sorted(p.name for p in tmp_path.iterdir()) == ["point-2.json", "point-3.json", "point.json"]


def test_written_files_get_a_plain_new_files_permissions(tmp_path):
    old = os.umask(0o022)
    try:
        write_atomic(tmp_path / "a.txt", "x")
    finally:
        os.umask(old)
    assert (tmp_path / "a.txt").stat().st_mode & 0o777 == 0o644


def test_a_failed_write_leaves_the_old_file_and_no_temporary(tmp_path):
    target = tmp_path / "out.txt"
    target.write_text("old")
    with pytest.raises(FileNotFoundError):
        write_atomic(tmp_path / "missing-folder" / "out.txt", "new")
    assert target.read_text() == "old"
    assert [p.name for p in tmp_path.iterdir()] == ["out.txt"]


def test_devices_fifos_folders_and_links_are_refused_and_left_alone(tmp_path):
    from ladle.engine.files.atomic_files import NotARegularFile

    fifo = tmp_path / "pipe"
    os.mkfifo(fifo)
    (tmp_path / "real.txt").write_text("kept")
    link = tmp_path / "link.txt"
    link.symlink_to(tmp_path / "real.txt")
    (tmp_path / "folder").mkdir()
    for target, kind in ((fifo, "a FIFO"), (link, "a symbolic link"), (tmp_path / "folder", "a folder")):
        with pytest.raises(NotARegularFile) as caught:
            write_atomic(target, "new")
        assert kind in caught.value.strerror and caught.value.filename == str(target)
    assert fifo.is_fifo() and link.is_symlink() and (tmp_path / "real.txt").read_text() == "kept"
    assert not list(tmp_path.glob(".*.tmp"))


def test_a_character_device_is_refused_before_anything_is_written():
    from ladle.engine.files.atomic_files import NotARegularFile, refuse_unless_regular

    with pytest.raises(NotARegularFile, match="character device"):
        refuse_unless_regular("/dev/null")


def _dead_pid() -> int:
    import subprocess
    import sys

    child = subprocess.run([sys.executable, "-c", "import os; print(os.getpid())"], capture_output=True, text=True)
    return int(child.stdout)


def test_stale_temporaries_of_a_dead_writer_are_removed_by_the_next_write(tmp_path):
    stale = tmp_path / f".out.csv.{_dead_pid()}.abcd1234.tmp"
    stale.write_text("half")
    alive = tmp_path / f".out.csv.{os.getpid()}.abcd1234.tmp"   # a write in progress: kept
    alive.write_text("half")
    other = tmp_path / f".other.csv.{_dead_pid()}.abcd1234.tmp"   # another file's: kept
    other.write_text("half")
    write_atomic(tmp_path / "out.csv", "a,b\n")
    assert not stale.exists() and alive.exists() and other.exists()


@pytest.mark.parametrize("signame", ["SIGTERM", "SIGHUP"])
def test_a_signal_during_a_write_removes_the_temporary_file(tmp_path, signame):
    import signal
    import subprocess
    import sys
    import time

    script = (
        "import os, sys, time\n"
        "from ladle.engine.files import atomic_files\n"
        "def slow(fd):\n"
        "    print('writing', flush=True); time.sleep(30)\n"
        "os.fsync = slow\n"
        "atomic_files.write_atomic(sys.argv[1], 'x' * 1000)\n"
    )
    child = subprocess.Popen([sys.executable, "-c", script, str(tmp_path / "out.txt")],
                             stdout=subprocess.PIPE, text=True)
    assert child.stdout.readline() == "writing\n"
    assert len(list(tmp_path.glob(".out.txt.*.tmp"))) == 1
    child.send_signal(getattr(signal, signame))
    assert child.wait(timeout=20) == -getattr(signal, signame)
    time.sleep(0.05)
    assert list(tmp_path.iterdir()) == []


def test_exports_fall_back_to_an_exclusive_create_without_hard_links(tmp_path, monkeypatch):
    import errno

    def no_links(src, dst):
        raise OSError(errno.EPERM, "Operation not permitted")

    monkeypatch.setattr(os, "link", no_links)
    (tmp_path / "shot.txt").write_text("mine")
    path = write_new_file(tmp_path, "shot", ".txt", "new text")
    assert path.name == "shot-2.txt" and path.read_text() == "new text"
    assert (tmp_path / "shot.txt").read_text() == "mine"
    assert sorted(p.name for p in tmp_path.iterdir()) == ["shot-2.txt", "shot.txt"]


def test_files_written_together_share_one_number(tmp_path):
    from ladle.engine.files.atomic_files import write_new_files

    (tmp_path / "screen.svg").write_text("older svg")          # only the .svg name is taken
    first = write_new_files(tmp_path, "screen", {".txt": "t", ".svg": "s"})
    second = write_new_files(tmp_path, "screen", {".txt": "t2", ".svg": "s2"})
    assert [p.name for p in first] == ["screen-2.txt", "screen-2.svg"]
    assert [p.name for p in second] == ["screen-3.txt", "screen-3.svg"]
    assert (tmp_path / "screen.svg").read_text() == "older svg" and not (tmp_path / "screen.txt").exists()


def test_a_signal_the_program_handles_lets_the_write_finish(tmp_path, monkeypatch):
    """A heat list records SIGTERM with a handler of its own and saves its state after the block:
    a SIGTERM arriving in the middle of that save must not take the temporary file away under
    it (it did: 'cannot write: No such file or directory', exit status 2 instead of 143). The
    program's handler runs, the file is written whole, and no temporary file is left."""
    import signal

    got = []
    previous = signal.signal(signal.SIGTERM, lambda signum, frame: got.append(signum))
    real_fsync = os.fsync

    def fsync_then_signal(fd):
        real_fsync(fd)
        os.kill(os.getpid(), signal.SIGTERM)      # delivered here, between the write and the rename

    monkeypatch.setattr(os, "fsync", fsync_then_signal)
    try:
        write_atomic(tmp_path / "state.json", '{"done": 3}')
    finally:
        signal.signal(signal.SIGTERM, previous)
    assert got == [signal.SIGTERM]
    assert (tmp_path / "state.json").read_text() == '{"done": 3}'
    assert [p.name for p in tmp_path.iterdir()] == ["state.json"]


def test_a_signal_just_as_the_write_installs_its_handler_reaches_the_program(tmp_path):
    """SIGTERM delivered right after the write's own handler goes in (before the write had
    recorded the program's handler, it acted as the default and killed a heat list's run in the
    middle of saving its state, leaving its worker processes behind): the program's handler runs
    and the write finishes. In a child process, which the old behaviour killed."""
    import subprocess
    import sys

    script = (
        "import os, signal, sys\n"
        "from ladle.engine.files import atomic_files\n"
        "got = []\n"
        "signal.signal(signal.SIGTERM, lambda signum, frame: got.append(signum))\n"
        "real = signal.signal\n"
        "def install_then_signal(sig, handler):\n"
        "    old = real(sig, handler)\n"
        "    if handler is atomic_files._remove_live_temporaries and sig == signal.SIGTERM:\n"
        "        os.kill(os.getpid(), signal.SIGTERM)       # handled before this returns\n"
        "    return old\n"
        "signal.signal = install_then_signal\n"
        "atomic_files.write_atomic(sys.argv[1], 'whole')\n"
        "print(got == [signal.SIGTERM], open(sys.argv[1]).read())\n"
    )
    child = subprocess.run([sys.executable, "-c", script, str(tmp_path / "state.json")], capture_output=True,
                           text=True, timeout=60)
    assert child.returncode == 0, child.stderr
    assert child.stdout == "True whole\n"
    assert [p.name for p in tmp_path.iterdir()] == ["state.json"]
