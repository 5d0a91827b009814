"""Names for the files the explorer writes on request (a point's result as JSON, snapshots of
the screen). They go to the working folder through ladle.engine.files.atomic_files.write_new_file,
which never replaces an existing file (the name gets -2, -3, ... instead)."""

from __future__ import annotations


def safe_stem(text: str) -> str:
    """A file-name stem from text: letters, digits, '-', '.' and '_' only."""
    return "".join(ch if ch.isalnum() or ch in "-._" else "_" for ch in text).strip("._") or "ladle"
