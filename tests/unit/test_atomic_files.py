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
