"""Where systems live: the shipped folder, and the user's folder of their own system files.

User files are read from $LADLE_SYSTEMS (folders separated by os.pathsep) or, without it, from
$XDG_CONFIG_HOME/ladle/systems (default ~/.config/ladle/systems). A user file with the same name
as a shipped one is reported as a conflict; the shipped system keeps the name.
"""

from __future__ import annotations

import os
from dataclasses import dataclass
from functools import lru_cache
from pathlib import Path

from ..errors import SystemFileError, UnknownSystem
from .loader import LIBRARY_FILE, ElementLibrary, load_system, shipped_folder, shipped_library
from ..models.system import System

def user_folders() -> list[Path]:
    """The folders searched for the user's own system files, in order."""
    env = os.environ.get("LADLE_SYSTEMS")
    if env:
        return [Path(p).expanduser() for p in env.split(os.pathsep) if p]
    base = os.environ.get("XDG_CONFIG_HOME") or os.path.join(os.path.expanduser("~"), ".config")
    return [Path(base) / "ladle" / "systems"]


@dataclass(frozen=True)
class SystemEntry:
    """One system file known to the catalog. `origin` is "shipped" or "user"."""

    name: str
    path: Path
    origin: str


def _system_files(folder: Path) -> list[Path]:
    if not folder.is_dir():
        return []
    return sorted(p for p in folder.glob("*.toml") if p.name != LIBRARY_FILE and not p.name.startswith("."))


def catalog() -> tuple[list[SystemEntry], list[str]]:
    """All system files (shipped first, then the user's) and one line per name conflict."""
    entries = [SystemEntry(p.stem.lower(), p, "shipped") for p in _system_files(shipped_folder())]
    names = {e.name for e in entries}
    conflicts = []
    for folder in user_folders():
        for p in _system_files(folder):
            name = p.stem.lower()
            if name in names:
                conflicts.append(f"{p}: a system named {name!r} exists already; this file is not used under that name "
                                 f"(rename it, or open it by its path)")
                continue
            names.add(name)
            entries.append(SystemEntry(name, p, "user"))
    return entries, conflicts


def _normalise(name: str) -> str:
    return name.strip().lower()


def resolve(name_or_path: str) -> SystemEntry:
    """The catalog entry for a system name (elements joined by '-', any case, either order) or a path."""
    text = name_or_path.strip()
    p = Path(text).expanduser()
    if text.endswith(".toml") or os.sep in text:
        if not p.is_file():
            raise SystemFileError(f"{text}: no such system file")
        return SystemEntry(p.stem.lower(), p, "path")
    wanted = _normalise(text)
    entries, _ = catalog()
    by_name = {e.name: e for e in entries}
    if wanted in by_name:
        return by_name[wanted]
    swapped = "-".join(reversed(wanted.split("-")))
    if swapped in by_name:
        return by_name[swapped]
    known = ", ".join(sorted(by_name)) or "none"
    raise UnknownSystem(f"unknown system {text!r}; known systems: {known}")


def find_system(name_or_path: str) -> System:
    """Load the system named (or at the path) `name_or_path`; cached per file."""
    entry = resolve(name_or_path)
    return _load_cached(str(entry.path.resolve()), entry.path.stat().st_mtime_ns, entry.name)


@lru_cache(maxsize=64)
def _load_cached(path: str, _mtime: int, name: str) -> System:
    return load_system(Path(path), name=name)


def list_systems() -> list[SystemEntry]:
    """Every system file the catalog knows (shipped, then the user's)."""
    return catalog()[0]
