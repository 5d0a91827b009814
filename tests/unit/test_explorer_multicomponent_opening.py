"""The explorer opens a system of three elements as its isopleth (issue 14); the picker, which
switches between binary diagrams, lists it with one line saying how to open it."""

import ideal_ternaries as it
from ladle.engine import load_system
from ladle.tui.explorer.launch import first_exploration
from ladle.tui.explorer.section_exploration import SectionExploration
from ladle.tui.explorer.system_choices import not_explorable


def test_a_ternary_opens_as_its_isopleth_and_the_picker_says_so(tmp_path):
    path = it.write_system_files(tmp_path)["pb-sn-bi"]
    problem = not_explorable(load_system(path))
    assert problem == "pb-sn-bi: 3 elements; open its isopleth with: ladle pb-sn-bi"
    exploration = first_exploration(str(path), None)
    assert isinstance(exploration, SectionExploration)
    assert exploration.element == "Sn" and exploration.ends()[0] == (0.95, 0.0, 0.05)
