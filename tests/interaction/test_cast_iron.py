"""Cast irons as a foundryman reads them (issue 15): `ladle melt fe-c-si` shows the graphite
eutectic of the iron's silicon content and the carbon equivalent from the model beside the
foundry rule CE = %C + %Si/3 (common practice), as text and as --json `cast_iron`; with graphite
left out the white-iron eutectic alone; a file that declares itself a cast iron system without
what one needs gets one line; the explorer's picker opens fe-c-si on its isopleth screen; the
isopleth of a grey iron's silicon content is drawn.

The numbers themselves are tested in tests/unit/test_fe_c_si.py; here, what the commands show."""

from __future__ import annotations

import json

import pytest
from explorer_harness import SIZE, make_app, pilot_test, screen_text

from ladle.engine import find_system
from ladle.engine.diagrams.carbon_equivalent import carbon_equivalent
from ladle.tui.cli import main
from ladle.tui.commands.cast_iron import cast_iron_report
from ladle.tui.explorer import section_exploration
from ladle.tui.explorer.screens import systems
from ladle.tui.explorer.screens.section_screen import SectionScreen

GREY_IRON = "C=3.4wt%,Si=2.5wt%"


@pytest.fixture(autouse=True)
def own_cache(monkeypatch, tmp_path):
    monkeypatch.setenv("XDG_CACHE_HOME", str(tmp_path / "cache"))
    monkeypatch.setenv("LADLE_SYSTEMS", str(tmp_path / "no-user-systems"))


def test_melt_shows_the_eutectics_and_both_carbon_equivalents(capsys):
    assert main(["melt", "fe-c-si", "--comp", GREY_IRON]) == 0
    out = capsys.readouterr().out
    ce = carbon_equivalent(find_system("fe-c-si"), 3.4, 2.5)
    assert "graphite eutectic" in out and "cementite eutectic" in out
    line = next(ln for ln in out.splitlines() if ln.startswith("carbon equivalent"))
    assert f"{ce.model:.2f} wt% from the model" in line
    assert "4.23 by the foundry rule %C + %Si/3" in line          # 3.4 + 2.5/3 = 4.233
    assert "hypoeutectic" in line
    assert out.index("carbon equivalent") < out.index("on cooling:")


def test_melt_json_gives_the_cast_iron_figures(capsys):
    assert main(["melt", "fe-c-si", "--comp", GREY_IRON, "--json"]) == 0
    report = json.loads(capsys.readouterr().out)["cast_iron"]
    assert report["carbon_wt_percent"] == pytest.approx(3.4) and report["silicon_wt_percent"] == pytest.approx(2.5)
    ce = report["carbon_equivalent"]
    assert ce["rule_wt_percent"] == pytest.approx(3.4 + 2.5 / 3.0)
    assert ce["difference_wt_percent"] == pytest.approx(ce["model_wt_percent"] - ce["rule_wt_percent"])
    assert ce["side"] == "hypoeutectic"
    stable, metastable = report["graphite_eutectic"], report["cementite_eutectic"]
    assert stable["temperature_K"] > metastable["temperature_K"]      # silicon widens the gap (grey iron)
    assert report["notes"] == []


def test_without_graphite_only_the_white_iron_eutectic_is_shown(capsys):
    assert main(["melt", "fe-c-si", "--comp", GREY_IRON, "--without", "graphite", "--json"]) == 0
    report = json.loads(capsys.readouterr().out)["cast_iron"]
    assert report["graphite_eutectic"] is None and report["carbon_equivalent"] is None
    assert report["cementite_eutectic"] is not None


def test_systems_that_are_not_cast_irons_get_no_cast_iron_figures():
    al_mg_si = find_system("al-mg-si")
    assert cast_iron_report(al_mg_si, [0.9, 0.005, 0.095]) is None
    assert cast_iron_report(find_system("fe-c"), [0.85, 0.15]) is None     # fe-c does not declare itself one


def test_a_file_that_is_no_cast_iron_system_gets_one_line(tmp_path, capsys):
    path = tmp_path / "fe-c-mine.toml"
    path.write_text('elements = ["Fe", "C"]\nsource = "invented for this test"\nbuilds_on = ["fe-c.toml"]\n'
                    "cast_iron = true\n", encoding="utf-8")
    with pytest.raises(SystemExit) as e:
        main(["point", str(path), "--comp", "C=3wt%", "--temp", "1000"])
    assert e.value.code == 2
    err = capsys.readouterr().err.strip().splitlines()
    assert len(err) == 1 and "cast_iron" in err[0] and "Si" in err[0]


def test_the_isopleth_of_a_grey_iron_is_drawn(capsys):
    assert main(["diagram", "fe-c-si", "--comp", "Si=2wt%", "--vary", "C=0..5wt%", "--ascii"]) == 0
    out = capsys.readouterr().out
    assert "austenite + graphite" in out and "eutectic (graphite) begins" in out


@pilot_test
async def test_the_picker_opens_fe_c_si_on_its_isopleth_screen(monkeypatch):
    def not_mapped(exploration):
        raise ValueError("not mapped in this test")     # the screen is under test, not the mapping

    monkeypatch.setattr(section_exploration.SectionExploration, "map", not_mapped)
    monkeypatch.setattr(systems, "with_check_result", lambda choice: choice)
    app = make_app("pb-sn", T_K=500.0, x_B=0.5, temperature_unit="K")
    async with app.run_test(size=SIZE) as pilot:
        await pilot.press("s", *"fe-c-si", "enter")
        await pilot.pause()
        assert isinstance(app.screen, SectionScreen)
        assert app.screen.exploration.system.name == "fe-c-si"
        assert "fe-c-si  isopleth: C varies" in screen_text(app)
