"""Unit tests see only the shipped systems: the person's own system folder, check-count cache
and explorer state are replaced by empty temporary folders for the whole session (module-scoped
fixtures that load systems run inside it too)."""

from __future__ import annotations

import os

import pytest

ISOLATED = ("LADLE_SYSTEMS", "XDG_CACHE_HOME", "XDG_STATE_HOME")


@pytest.fixture(scope="session", autouse=True)
def without_the_users_files(tmp_path_factory):
    base = tmp_path_factory.mktemp("user-environment")
    before = {name: os.environ.get(name) for name in ISOLATED}
    os.environ["LADLE_SYSTEMS"] = str(base / "no-user-systems")
    os.environ["XDG_CACHE_HOME"] = str(base / "cache")
    os.environ["XDG_STATE_HOME"] = str(base / "state")
    yield base
    for name, value in before.items():
        if value is None:
            os.environ.pop(name, None)
        else:
            os.environ[name] = value
