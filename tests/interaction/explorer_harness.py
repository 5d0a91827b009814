"""Shared by the explorer's interaction and snapshot tests: a clean environment, an app on a
shipped system with the cursor set directly, and the screen's text."""

from __future__ import annotations

import asyncio
import functools

import pytest

from ladle.engine import find_system
from ladle.tui.explorer.app import ExplorerApp
from ladle.tui.explorer.cursor import Cursor
from ladle.tui.explorer.exploration import Exploration
from ladle.tui.explorer.glyphs import glyphs_for
from ladle.tui.explorer.launch import exploration_for
from ladle.tui.explorer.scales import Scales
from ladle.tui.explorer.screen_text import screen_text
from ladle.tui.explorer.widgets.status_pane import StatusPane

SIZE = (80, 24)
THEME = "textual-dark"
ENVIRONMENT_LEAKS = ("NO_COLOR", "LADLE_ASCII", "TEXTUAL_THEME", "COLORTERM", "FORCE_COLOR")


@pytest.fixture(autouse=True)
def clean_environment(monkeypatch, tmp_path, shared_check_cache):
    """No colour or theme settings from outside; state and written files in a temporary
    folder; the run's own cache of check counts (tests/conftest.py)."""
    for name in ENVIRONMENT_LEAKS:
        monkeypatch.delenv(name, raising=False)
    monkeypatch.setenv("XDG_STATE_HOME", str(tmp_path / "state"))
    monkeypatch.setenv("XDG_CACHE_HOME", str(shared_check_cache))
    monkeypatch.setenv("LADLE_SYSTEMS", str(tmp_path / "no-user-systems"))   # shipped ones only
    monkeypatch.chdir(tmp_path)
    return tmp_path


def pilot_test(test):
    """Run an async test function (one that drives an app with a pilot) to completion."""
    @functools.wraps(test)
    def run(*args, **kwargs):
        return asyncio.run(test(*args, **kwargs))
    return run


def make_app(system: str = "pb-sn", *, T_K: float | None = None, x_B: float | None = None,
             temperature_unit: str = "C", composition_unit: str = "wt", ascii_only: bool = False,
             state_file=None) -> ExplorerApp:
    """An explorer on a shipped system; the cursor is set directly when T_K and x_B are given."""
    loaded = find_system(system)
    cursor = Cursor(T_K, x_B) if T_K is not None and x_B is not None else None
    exploration = Exploration(loaded, Scales(loaded.molar_mass, temperature_unit,
                                             composition_unit), cursor)
    app = ExplorerApp(exploration, glyphs_for(ascii_only), state_file)
    app.theme = THEME
    return app


def section_app(system: str, ascii_only: bool = False) -> ExplorerApp:
    """An explorer on a shipped system drawn as an isopleth (Fe-C, a ternary)."""
    app = ExplorerApp(exploration_for(find_system(system)), glyphs_for(ascii_only), None)
    app.theme = THEME
    return app


def status_text(app: ExplorerApp) -> str:
    """The status pane's text, as shown."""
    return app.explore_screen.query_one(StatusPane).plain_text()


async def until(pilot, answered, what: str, timeout_s: float = 6.0) -> None:
    """Wait (at most timeout_s) until `answered()` is true: the workers have given what the test
    needs."""
    for _ in range(int(timeout_s / 0.02)):
        await pilot.pause(0.02)
        if answered():
            return
    raise AssertionError(f"the workers did not answer within {timeout_s:g} s: {what}")


__all__ = ["SIZE", "clean_environment", "make_app", "pilot_test", "screen_text", "section_app", "status_text",
           "until"]
