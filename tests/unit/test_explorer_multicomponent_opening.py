"""The explorer shows binary systems only so far: a system of three elements is refused with one
line naming it and the line commands that answer for it, never a traceback (issue 14)."""

import pytest

import ideal_ternaries as it
from ladle.engine import load_system
from ladle.tui.explorer.launch import first_exploration
from ladle.tui.explorer.system_choices import not_explorable


def test_a_ternary_is_refused_with_one_line(tmp_path):
    path = it.write_system_files(tmp_path)["pb-sn-bi"]
    problem = not_explorable(load_system(path))
    assert problem.startswith("pb-sn-bi: 3 elements;") and "ladle diagram --vary" in problem
    assert "\n" not in problem and len(problem) <= 100
    with pytest.raises(ValueError, match="3 elements; the explorer shows binaries only so far"):
        first_exploration(str(path), None)
