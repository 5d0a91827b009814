"""The explorer opens a system of three elements as its isopleth (issue 14), and so does the
picker: it lists the system with how it is drawn."""

import ideal_ternaries as it
from ladle.engine import load_system
from ladle.tui.explorer.launch import first_exploration
from ladle.tui.explorer.section_exploration import SectionExploration
from ladle.tui.explorer.system_choices import drawn_as, opens_as_section


def test_a_ternary_opens_as_its_isopleth_and_the_picker_says_so(tmp_path):
    path = it.write_system_files(tmp_path)["pb-sn-bi"]
    system = load_system(path)
    assert opens_as_section(system)
    assert drawn_as(system) == "3 elements: isopleth and triangle"
    exploration = first_exploration(str(path), None)
    assert isinstance(exploration, SectionExploration)
    assert exploration.element == "Sn" and exploration.ends()[0] == (0.95, 0.0, 0.05)
