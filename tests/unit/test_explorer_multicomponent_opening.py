"""The explorer opens a system of three elements as its isopleth (issue 14), from the command
line and from the picker."""

import ideal_ternaries as it
from ladle.engine import load_system
from ladle.tui.explorer.launch import first_exploration
from ladle.tui.explorer.section_exploration import SectionExploration
from ladle.tui.explorer.system_choices import opens_as_section, system_choices


def test_a_ternary_opens_as_its_isopleth_and_the_picker_says_so(tmp_path):
    path = it.write_system_files(tmp_path)["pb-sn-bi"]
    system = load_system(path)
    assert opens_as_section(system)
    exploration = first_exploration(str(path), None)
    assert isinstance(exploration, SectionExploration)
    assert exploration.element == "Sn" and exploration.ends()[0] == (0.95, 0.0, 0.05)


def test_the_picker_offers_every_shipped_system():
    """Ternaries and Fe-C are no longer refused (each opens as its isopleth)."""
    choices = {choice.name: choice for choice in system_choices()}
    for name in ("fe-c", "fe-fe3c", "ag-cu-sn", "pb-sn"):
        assert not choices[name].problem


def test_a_typed_name_puts_that_system_first():
    """Typing 'pb-sn' and Enter opens pb-sn, not a system whose source names pb-sn.toml."""
    from ladle.tui.explorer.system_choices import SystemChoice

    choices = [SystemChoice("bi-pb-sn", source="built on pb-sn.toml"), SystemChoice("bi-pb", source="as pb-sn"),
               SystemChoice("pb-sn"), SystemChoice("pb-sn-x")]
    query = "pb-sn"
    ranked = sorted((c for c in choices if c.matches(query)), key=lambda c: c.rank(query))
    assert [c.name for c in ranked] == ["pb-sn", "bi-pb-sn", "pb-sn-x", "bi-pb"]
