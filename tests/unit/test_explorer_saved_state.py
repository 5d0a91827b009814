"""The explorer's remembered point: XDG location, atomic writes, damaged files ignored."""

import json
import os

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
