"""Alloy shorthands (issue 16): a system file's [[alloy]] list, `--alloy NAME` in the commands
that take --comp, and one line with exit status 2 for an unknown name or a bad list.

The designations and compositions in these files are test data: the two tin-lead ones follow the
naming rule of IPC J-STD-006C (2013), 1.2.1 (chemical symbols with nominal mass percentages);
'Test-Alloy-1' is invented."""

from __future__ import annotations

import json
import sys
from pathlib import Path

import pytest

sys.path.insert(0, str(Path(__file__).resolve().parent))

from test_line_commands import _one_line_error, own_folders, run  # noqa: E402,F401  (shared fixtures)

from ladle.engine.errors import SystemFileError  # noqa: E402
from ladle.engine.files.loader import load_system, shipped_folder  # noqa: E402

ALLOYS = '''
[[alloy]]
name = "Sn63Pb37"
wt_percent = { Sn = 63.0 }
source = "IPC J-STD-006C naming rule: test data"

[[alloy]]
name = "Test-Alloy-1"
at_percent = { Sn = 10.0 }
source = "invented for this test"
'''


@pytest.fixture
def pb_sn(tmp_path) -> str:
    """The shipped lead-tin file with two alloy shorthands added."""
    text = (shipped_folder() / "pb-sn.toml").read_text(encoding="utf-8")
    path = tmp_path / "pb-sn-alloys.toml"
    path.write_text(text + ALLOYS, encoding="utf-8")
    return str(path)


def test_an_alloy_by_name_is_its_composition(run, pb_sn):
    by_name = run("melt", pb_sn, "--alloy", "Sn63Pb37", "--json")
    by_comp = run("melt", pb_sn, "--comp", "Sn=63wt%", "--json")
    assert by_name[0] == by_comp[0] == 0
    assert json.loads(by_name[1]) == json.loads(by_comp[1])
    # case and surrounding spaces do not matter; at% shorthands read as at%
    assert json.loads(run("melt", pb_sn, "--alloy", " sn63pb37 ", "--json")[1]) == json.loads(by_comp[1])
    assert (json.loads(run("point", pb_sn, "--alloy", "test-alloy-1", "--temp", "250C", "--json")[1])
            == json.loads(run("point", pb_sn, "--comp", "Sn=10at%", "--temp", "250C", "--json")[1]))


def test_an_unknown_name_lists_the_known_ones(run, pb_sn):
    for command in (("melt",), ("cool",), ("transitions",), ("point", "--temp", "250C")):
        code, out, err = run(command[0], pb_sn, *command[1:], "--alloy", "SAC305")
        _one_line_error(code, out, err, command[0], "unknown alloy 'SAC305'")
        assert "Sn63Pb37, Test-Alloy-1" in err


def test_a_system_without_alloys_says_so(run):
    _one_line_error(*run("melt", "pb-sn", "--alloy", "Sn63Pb37"), "melt", "its file lists no alloys: give --comp")


def test_comp_and_alloy_together_are_refused(run, pb_sn):
    code, out, err = run("melt", pb_sn, "--alloy", "Sn63Pb37", "--comp", "Sn=63wt%")
    assert code == 2 and out == "" and "not allowed with argument" in err


def test_a_ternary_alloy_by_name(run, tmp_path):
    path = tmp_path / "ag-cu-sn-test.toml"
    path.write_text('elements = ["Sn", "Ag", "Cu"]\nsource = "Test: the shipped binaries only."\n'
                    'builds_on = ["sn-ag.toml", "sn-cu.toml", "ag-cu.toml"]\n'
                    '[[alloy]]\nname = "Test-Solder"\nwt_percent = { Ag = 3.0, Cu = 0.5 }\nsource = "invented for this test"\n',
                    encoding="utf-8")
    by_name = run("point", str(path), "--alloy", "Test-Solder", "--temp", "200C", "--json")
    by_comp = run("point", str(path), "--comp", "Ag=3wt%,Cu=0.5wt%", "--temp", "200C", "--json")
    assert by_name[0] == 0 and json.loads(by_name[1]) == json.loads(by_comp[1])


BAD_LISTS = [
    ('name = "X"\nwt_percent = { Sn = 63.0 }\n', "alloy[0].source: missing"),
    ('name = "X"\nwt_percent = { Ag = 3.0 }\nsource = "s"\n', "alloy[0].wt_percent.Ag: expected an element of this system"),
    ('name = "X"\nwt_percent = { Sn = 100.0 }\nsource = "s"\n', "alloy[0].wt_percent.Sn: expected a percentage from 0 to below 100"),
    ('name = "X"\nwt_percent = { Sn = 63.0, Pb = 37.0 }\nsource = "s"\n', "give every element but one, the balance"),
    ('name = "X"\nwt_percent = { Sn = 63.0 }\nat_percent = { Sn = 50.0 }\nsource = "s"\n', "give the composition once"),
    ('name = "X,Y"\nwt_percent = { Sn = 63.0 }\nsource = "s"\n', "alloy[0].name: expected a name of at most 40"),
    ('name = "X"\ntrade_name = "S 63"\nwt_percent = { Sn = 63.0 }\nsource = "s"\n', "alloy[0].trade_name: expected a name"),
    ('name = "X"\ntrade_name = 63\nwt_percent = { Sn = 63.0 }\nsource = "s"\n', "alloy[0].trade_name: expected a name"),
    ('name = "X"\ntrade_name = "x"\nwt_percent = { Sn = 63.0 }\nsource = "s"\n', "alloy[0].trade_name: 'x' is named twice"),
    ('name = "X"\nwt_percent = { Sn = 63.0 }\nsource = "s"\ncolour = "grey"\n', "alloy[0].colour: unknown key"),
]


@pytest.mark.parametrize("body,expected", BAD_LISTS, ids=[e for _, e in BAD_LISTS])
def test_a_bad_alloy_list_is_one_line(tmp_path, body, expected):
    text = (shipped_folder() / "pb-sn.toml").read_text(encoding="utf-8")
    path = tmp_path / "bad.toml"
    path.write_text(text + "\n[[alloy]]\n" + body, encoding="utf-8")
    with pytest.raises(SystemFileError) as e:
        load_system(path)
    assert expected in str(e.value) and "\n" not in str(e.value)


def test_a_trade_name_stands_for_the_designation_and_is_listed_beside_it(run):
    """The shipped tin-silver-copper file names Sn96.5Ag3.0Cu0.5 by the trade's SAC305 too (makers'
    sheets cited there); an unknown name lists both."""
    by_trade = run("melt", "ag-cu-sn", "--alloy", "sac305", "--json")
    by_designation = run("melt", "ag-cu-sn", "--alloy", "Sn96.5Ag3.0Cu0.5", "--json")
    assert by_trade[0] == by_designation[0] == 0 and json.loads(by_trade[1]) == json.loads(by_designation[1])
    code, out, err = run("melt", "ag-cu-sn", "--alloy", "SAC999")
    _one_line_error(code, out, err, "melt", "unknown alloy 'SAC999'")
    assert "Sn96.5Ag3.0Cu0.5 (SAC305)" in err


def test_a_trade_name_may_not_repeat_another_alloys_name(tmp_path):
    text = (shipped_folder() / "pb-sn.toml").read_text(encoding="utf-8")
    path = tmp_path / "twice.toml"
    path.write_text(text + ALLOYS + '\n[[alloy]]\nname = "Sn60Pb40"\ntrade_name = "test-alloy-1"\n'
                    'wt_percent = { Sn = 60.0 }\nsource = "s"\n', encoding="utf-8")
    with pytest.raises(SystemFileError, match="alloy.2..trade_name: 'test-alloy-1' is named twice"):
        load_system(path)


def test_a_name_given_twice_is_refused(tmp_path):
    text = (shipped_folder() / "pb-sn.toml").read_text(encoding="utf-8")
    path = tmp_path / "twice.toml"
    path.write_text(text + ALLOYS + '\n[[alloy]]\nname = "SN63PB37"\nwt_percent = { Sn = 60.0 }\nsource = "s"\n',
                    encoding="utf-8")
    with pytest.raises(SystemFileError, match="'SN63PB37' is named twice"):
        load_system(path)


def test_the_explorer_go_to_takes_an_alloy_name(pb_sn):
    from ladle.tui.explorer.entry import EntryError, parse_point

    system = load_system(Path(pb_sn))
    by_name = parse_point("sn63pb37 200C", system.elements, system.molar_mass, system.alloys)
    by_comp = parse_point("Sn=63wt% 200C", system.elements, system.molar_mass, system.alloys)
    assert by_name == by_comp and by_name.temperature_K == pytest.approx(473.15)
    with pytest.raises(EntryError, match="^Sn63Pb37 gives the whole composition; type its name or the contents, not both$"):
        parse_point("Sn63Pb37 Sn=60wt%", system.elements, system.molar_mass, system.alloys)
    with pytest.raises(EntryError, match="^Sn63Pb37 and sn63pb37: type one alloy name$"):
        parse_point("Sn63Pb37 sn63pb37 200C", system.elements, system.molar_mass, system.alloys)
    with pytest.raises(EntryError):
        parse_point("SAC305 200C", system.elements, system.molar_mass, system.alloys)
