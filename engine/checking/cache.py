"""How many of a system's independent checks pass, remembered between runs (for `ladle systems`
and the explorer's system picker). Only independent checks count (engine/checking/measure.py:
not the fit targets, not the pure-element data).

Evaluating every check of every system maps each diagram; the counts are therefore kept in the
user's cache folder ($XDG_CACHE_HOME/ladle/checks, default ~/.cache/ladle/checks), one small
JSON file per key. The key is a SHA-256 hash of the system file, the names of the phases kept
(a variant file or --without leaves some out), the element library and the engine's own source
files, so that a change to any of them gives a fresh evaluation. Cache files are written
atomically; a cache that cannot be read or written is simply not used.
"""

from __future__ import annotations

import hashlib
import json
import os
from functools import lru_cache
from pathlib import Path

from ..files.atomic_files import write_atomic
from .measure import evaluate_all, independent_checks


def cache_folder() -> Path:
    """The folder of the remembered check counts."""
    base = os.environ.get("XDG_CACHE_HOME") or os.path.join(os.path.expanduser("~"), ".cache")
    return Path(base) / "ladle" / "checks"


@lru_cache(maxsize=1)
def _engine_digest() -> bytes:
    h = hashlib.sha256()
    root = Path(__file__).parent.parent
    for path in sorted(root.rglob("*.py")):
        h.update(path.relative_to(root).as_posix().encode())
        h.update(path.read_bytes())
    return h.digest()


def _key(system) -> str:
    from ..files.loader import shipped_library

    h = hashlib.sha256(_engine_digest())
    for path in (system.path, *system.built_from):     # a fix to a binary changes what is built on it
        h.update(Path(path).read_bytes())
    h.update(shipped_library().path.read_bytes())
    h.update("\0".join(system.phases).encode())      # a variant keeps fewer phases of the same file
    return h.hexdigest()


def _cache_file(system) -> Path | None:
    try:
        return cache_folder() / f"{_key(system)}.json"
    except OSError:
        return None


def _read(path: Path, total: int) -> tuple[int, int] | None:
    """The remembered (passed, total) of a system with `total` independent checks, or None where
    the file is missing, unreadable or damaged (not a JSON object of two whole counts, passed
    between 0 and total): the counts are then measured afresh."""
    try:
        data = json.loads(path.read_text(encoding="utf-8"))
        passed, found = data["passed"], data["total"]
    except (OSError, ValueError, KeyError, TypeError, RecursionError):
        return None
    if type(passed) is not int or found != total or type(found) is not int or not 0 <= passed <= total:
        return None
    return passed, total


def check_counts(system) -> tuple[int, int]:
    """(independent checks passed, independent checks in the file) of a loaded system, from the
    cache where it holds them, else evaluated (engine/checking/measure.py) and remembered."""
    checks = independent_checks(system)
    if not checks:
        return 0, 0
    path = _cache_file(system)
    counts = _read(path, len(checks)) if path is not None else None
    if counts is None:
        outcomes = evaluate_all(system, checks)
        counts = sum(o.passed for o in outcomes), len(outcomes)
        if path is not None:
            try:
                path.parent.mkdir(parents=True, exist_ok=True)
                write_atomic(path, json.dumps({"system": system.name, "passed": counts[0], "total": counts[1]}))
            except OSError:
                pass
    return counts
