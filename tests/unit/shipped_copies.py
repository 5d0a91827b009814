"""Copies of shipped system files with one number changed, for tests that a fix to a shared
binary flows into every system built on it (issue 16: one file per binary)."""

from __future__ import annotations

from pathlib import Path

from ladle.engine.files.catalog import find_system
from ladle.engine.files.loader import shipped_folder


def with_liquid_L0_changed(folder: Path, binary: str, change_J: float, built_on_by: tuple[str, ...]) -> Path:
    """Write into `folder` the shipped `binary` file with its liquid's L[0] constant term raised
    by change_J (J/mol) and, unchanged, the shipped files `built_on_by` (names without .toml),
    which then build on the changed copy; returns `folder`."""
    shipped = shipped_folder()
    text = (shipped / f"{binary}.toml").read_text(encoding="utf-8")
    a0 = find_system(binary).document["phase"]["liquid"]["L"][0]["a"]
    old = f"L = [ {{ a = {a0!r}"
    assert text.count(old) == 1, f"{binary}.toml: the liquid's L[0] is not written as '{old} ...' once"
    (folder / f"{binary}.toml").write_text(text.replace(old, f"L = [ {{ a = {a0 + change_J!r}"), encoding="utf-8")
    for name in built_on_by:
        (folder / f"{name}.toml").write_text((shipped / f"{name}.toml").read_text(encoding="utf-8"), encoding="utf-8")
    return folder
