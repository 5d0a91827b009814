"""The explorer's remembered point: XDG location, atomic writes, damaged files ignored."""

import json
import os

import numpy as np
import pytest

from ladle.tui.explorer.saved_state import SavedState, load_state, save_state, state_path


def test_state_path_follows_xdg(tmp_path):
    assert state_path({"XDG_STATE_HOME": str(tmp_path)}) == tmp_path / "ladle" / "explorer.json"
    home_default = state_path({"XDG_STATE_HOME": "relative/is/ignored"})
    assert home_default.parts[-4:] == (".local", "state", "ladle", "explorer.json")


def test_round_trip_and_no_leftovers(tmp_path):
    path = tmp_path / "ladle" / "explorer.json"
    state = SavedState("pb-sn", 456.15, 0.739, "F", "at")
    save_state(path, state)
    assert load_state(path) == state
    save_state(path, SavedState("pb-sn", 500.0, 0.5))
    assert load_state(path).temperature_K == 500.0
    assert os.listdir(path.parent) == ["explorer.json"]   # temporary files renamed away


def test_damaged_or_strange_files_are_ignored(tmp_path):
    path = tmp_path / "explorer.json"
    for text in ("{not json", "[]", json.dumps({"system": "pb-sn"}),
                 json.dumps({"system": "pb-sn", "temperature_K": -5, "x_B": 0.2}),
                 json.dumps({"system": "pb-sn", "temperature_K": 500, "x_B": 1.5}),
                 json.dumps({"system": "pb-sn", "temperature_K": 500, "x_B": 0.5,
                             "temperature_unit": "R"})):
        path.write_text(text)
        assert load_state(path) is None
    assert load_state(tmp_path / "missing.json") is None


def test_hostile_state_files_are_ignored_with_a_reason(tmp_path):
    from ladle.tui.explorer.saved_state import LARGEST_STATE_BYTES, read_state

    path = tmp_path / "explorer.json"
    hostile = {
        "deeply nested": "[" * 30000 + "]" * 30000,                 # RecursionError in json
        "400-digit temperature": '{"system": "pb-sn", "temperature_K": ' + "9" * 400 + ', "x_B": 0.5}',
        "5000-digit temperature": '{"system": "pb-sn", "temperature_K": ' + "9" * 5000 + ', "x_B": 0.5}',
        "infinite temperature": '{"system": "pb-sn", "temperature_K": 1e999, "x_B": 0.5}',
        "not UTF-8": b"\xff\xfe{".decode("latin-1"),
        "too large": '{"system": "' + "x" * LARGEST_STATE_BYTES + '"}',
    }
    for what, text in hostile.items():
        path.write_text(text, encoding="latin-1" if what == "not UTF-8" else "utf-8")
        state, reason = read_state(path)
        assert state is None and reason, what
    assert read_state(tmp_path / "missing.json") == (None, None)    # no file: nothing to say


def test_the_explorer_starts_afresh_on_a_corrupt_state_file_and_says_so(tmp_path, monkeypatch, capsys):
    from ladle.tui.explorer import launch

    state = tmp_path / "ladle" / "explorer.json"
    state.parent.mkdir()
    state.write_text("[" * 30000 + "]" * 30000)
    monkeypatch.setenv("XDG_STATE_HOME", str(tmp_path))
    started = []

    class Stop(Exception):
        """Ends the run where the app would start."""

    def first_exploration(asked, saved):
        started.append((asked, saved))
        raise Stop

    monkeypatch.setattr(launch, "first_exploration", first_exploration)
    monkeypatch.setattr(launch, "served_to_a_browser", lambda: True)    # no terminal needed here
    with pytest.raises(Stop):
        launch.run_explorer(["pb-sn"])
    assert started == [("pb-sn", None)]
    assert "ignored the remembered place" in capsys.readouterr().err


def test_fe_c_is_remembered_and_opened_again_at_the_same_steel():
    """A binary drawn as an isopleth keeps its cursor between runs (a ternary its temperature)."""
    from ladle.engine import find_system
    from ladle.tui.explorer import launch
    from ladle.tui.explorer.section_exploration import SectionExploration

    before = SectionExploration(find_system("fe-fe3c"), np.array([0.98, 0.02]), temperature_K=1073.15)
    state = before.saved()
    assert state.system == "fe-fe3c" and state.composition_unit == "wt"
    after = launch.first_exploration(None, state)
    assert isinstance(after, SectionExploration) and after.cursor.temperature_K == pytest.approx(1073.15)
    assert after.x_at_cursor()[1] == pytest.approx(0.02, abs=1e-12)
    ternary = launch.first_exploration(None, SectionExploration(find_system("ag-cu-sn"), temperature_K=500.0).saved())
    assert ternary.cursor.temperature_K == pytest.approx(500.0) and ternary.system.name == "ag-cu-sn"
