"""Where systems live: the shipped folder, and the user's folder of their own system files.

User files are read from $LADLE_SYSTEMS (folders separated by os.pathsep) or, without it, from
$XDG_CONFIG_HOME/ladle/systems (default ~/.config/ladle/systems). A user file with the same name
as a shipped one is reported as a conflict; the shipped system keeps the name. A folder that
cannot be read is skipped with a note. Nothing is loaded until a system is asked for.
"""

from __future__ import annotations

import os
from collections.abc import Iterator
from dataclasses import dataclass
from functools import lru_cache
from pathlib import Path

from ..errors import SystemFileError, UnknownSystem
from .loader import LIBRARY_FILE, load_system, shipped_folder
from .regular_files import require_regular
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


def _system_files(folder: Path) -> tuple[list[Path], str | None]:
    """The system files in `folder` (sorted), and a note when the folder cannot be read."""
    try:
        if not folder.is_dir():
            return [], None
        with os.scandir(folder) as listing:
            names = [e.name for e in listing]
    except OSError as error:
        return [], f"{folder}: skipped, cannot read this folder of systems ({error.strerror or error})"
    files = sorted(folder / n for n in names if n.endswith(".toml") and n != LIBRARY_FILE and not n.startswith("."))
    return files, None


def _shipped_entries() -> list[SystemEntry]:
    return [SystemEntry(p.stem.lower(), p, "shipped") for p in _system_files(shipped_folder())[0]]


def _user_entries(taken: set[str]) -> Iterator[SystemEntry | str]:
    """The user's system files, folder by folder (each folder read only when reached), and one
    note (a str) per name conflict or unreadable folder. `taken` holds the names used so far
    and grows."""
    for folder in user_folders():
        files, problem = _system_files(folder)
        if problem:
            yield problem
        for p in files:
            name = p.stem.lower()
            if name in taken:
                yield (f"{p}: a system named {name!r} exists already; this file is not used under that name "
                       f"(rename it, or open it by its path)")
                continue
            taken.add(name)
            yield SystemEntry(name, p, "user")


def catalog() -> tuple[list[SystemEntry], list[str]]:
    """All system files (shipped first, then the user's) and one line per name conflict or
    unreadable folder of the user's (which is skipped). No file is read here."""
    entries = _shipped_entries()
    notes = []
    for item in _user_entries({e.name for e in entries}):
        (notes if isinstance(item, str) else entries).append(item)
    return entries, notes


def _normalise(name: str) -> str:
    return name.strip().lower()


def _require_system_file(p: Path, text: str) -> None:
    """SystemFileError of one line naming `text` unless `p` (links followed) is a regular file:
    missing, a FIFO (reading it would wait for a writer), a folder, a device, or out of reach."""
    try:
        require_regular(p)
    except FileNotFoundError:
        raise SystemFileError(f"{text}: no such system file") from None
    except OSError as error:
        raise SystemFileError(f"{text}: {error.strerror or error}") from None


def resolve(name_or_path: str) -> SystemEntry:
    """The catalog entry for a system name (elements joined by '-', any case, either order) or a
    path. Shipped names are found without reading the user's folders, and the user's folders are
    read in order only until the name is found."""
    text = name_or_path.strip()
    if text.endswith(".toml") or os.sep in text:
        p = Path(text).expanduser()
        _require_system_file(p, text)
        return SystemEntry(p.stem.lower(), p, "path")
    wanted = _normalise(text)
    candidates = (wanted, "-".join(reversed(wanted.split("-"))))
    shipped = _shipped_entries()
    known = [e.name for e in shipped]
    for entries in (shipped, _user_entries(set(known))):
        found = []
        for e in entries:
            if isinstance(e, SystemEntry):
                if e.origin == "user":
                    known.append(e.name)
                if e.name in candidates:
                    found.append(e)
                    if e.name == wanted:
                        return e
        if found:
            return found[0]
    raise UnknownSystem(f"unknown system {text!r}; known systems: {', '.join(sorted(known)) or 'none'}")


def find_system(name_or_path: str) -> System:
    """Load the system named (or at the path) `name_or_path`; cached per file."""
    entry = resolve(name_or_path)
    _require_system_file(entry.path, str(entry.path))
    return _load_cached(str(entry.path.resolve()), entry.path.stat().st_mtime_ns, entry.name)


@lru_cache(maxsize=64)
def _load_cached(path: str, _mtime: int, name: str) -> System:
    return load_system(Path(path), name=name)


def list_systems() -> list[SystemEntry]:
    """Every system file the catalog knows (shipped, then the user's)."""
    return catalog()[0]
