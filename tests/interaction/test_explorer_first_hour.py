"""What a newcomer sees at 80x24 (issue 10): cautions whole, titles uncut, lines that never
wrap, the keys on the bar, the help's title, notices kept out of screenshots, the typed-point
example in the open system's element, solder systems opening on their solder range, the cursor
never hiding a reaction line, and the plots told apart without colour."""

from __future__ import annotations

import glob
import re

import pytest
from explorer_harness import SIZE, make_app, pilot_test, screen_text, status_text

from ladle.engine import find_system
from ladle.engine.files.catalog import list_systems
from ladle.tui.explorer.cautions import caution_line
from ladle.tui.explorer.system_choices import opens_as_section
from ladle.tui.explorer.widgets.point_entry import PointEntry
from ladle.tui.explorer.widgets.status_pane import StatusPane


def _lines(app) -> list[str]:
    return screen_text(app).split("\n")


@pytest.mark.parametrize("name", [e.name for e in list_systems() if not opens_as_section(find_system(e.name))])
@pilot_test
async def test_every_systems_caution_is_shown_whole_at_80x24(name):
    system = find_system(name)
    app = make_app(name)
    async with app.run_test(size=SIZE) as pilot:
        await pilot.press("plus", "plus", "plus")          # zoomed in: longer step lines
        screen = screen_text(app)
        side = " ".join(line[46:].strip(" │|") for line in screen.split("\n"))
        words = " ".join(side.split())
        if system.safety:
            assert caution_line(system.safety) in words
        assert all(len(line) <= 80 for line in screen.split("\n"))


@pilot_test
async def test_title_bar_keeps_the_whole_title_and_the_coverage_note():
    app = make_app("sn-ag")
    async with app.run_test(size=SIZE):
        top = " ".join(" ".join(_lines(app)[:2]).split())
        assert "Tin-silver, tin-rich side (lead-free solders)" in top
        assert "(model covers 0-45 at% Ag only)" in top and "[1 diagram]" in top


@pilot_test
async def test_the_temperature_line_never_wraps_in_fahrenheit():
    app = make_app("al-si", T_K=1500.0, x_B=0.5, temperature_unit="F")   # four-digit values
    async with app.run_test(size=SIZE):
        line = status_text(app).split("\n")[1]
        assert len(line) <= 30 and line.startswith(" 2240.3 °F")    # 1500 K (NIST SP 811 (2008))
        assert "°C" in line and " K" in line


@pilot_test
async def test_key_bar_and_help_title():
    app = make_app()
    async with app.run_test(size=SIZE) as pilot:
        bar = _lines(app)[SIZE[1] - 1]
        assert "u t unit" in bar and "w p save" in bar and "? help" in bar
        await pilot.press("question_mark")
        assert "HELP: safety and keys (Esc closes)" in _lines(app)[1]


@pilot_test
async def test_the_typed_point_example_names_the_open_systems_element():
    app = make_app("al-si")
    async with app.run_test(size=SIZE) as pilot:
        await pilot.press("g")
        entry = app.screen_stack[0].query_one(PointEntry)
        assert "Si=12wt%" in screen_text(app) and "Sn=" not in entry.query_one("Input").placeholder


@pilot_test
async def test_a_screenshot_leaves_out_the_notice_of_w(clean_environment):
    app = make_app()
    async with app.run_test(size=SIZE, notifications=True) as pilot:
        await pilot.press("w")
        await pilot.pause()
        assert "wrote" in screen_text(app)                 # the notice is on the screen
        await pilot.press("p")
        await pilot.pause(0.5)
    (saved,) = glob.glob(str(clean_environment / "ladle-screen-*.txt"))
    text = open(saved, encoding="utf-8").read()
    assert "wrote" not in text and "POINT" in text


@pilot_test
async def test_solder_systems_open_on_their_solder_range_and_0_shows_all():
    app = make_app("sn-ag")
    async with app.run_test(size=SIZE) as pilot:
        e = app.screen_stack[0].exploration
        # the highest liquidus of 0-45 at% Ag lies below 600 C; silver melts at 961.78 C (CRC
        # Handbook of Chemistry and Physics, 97th ed. (2016)), the top of the whole range
        assert e.window.T_high - 273.15 < 650.0 < e.limits.T_high - 273.15
        await pilot.press("0")
        assert e.window == e.limits


@pilot_test
async def test_the_cursor_line_leaves_the_reaction_line_visible():
    # 183.5 C: the cursor's row is the row of the Pb-Sn eutectic line at 183 C (T.B. Massalski
    # (ed.), Binary Alloy Phase Diagrams, 2nd ed. (1990))
    app = make_app(T_K=456.65, x_B=0.5)
    async with app.run_test(size=SIZE):
        row = next(line for line in _lines(app) if "╋" in line)
        assert row.count("═") > 10                           # the reaction line shows through
        assert "eutectic" in status_text(app).split("NEAREST BOUNDARY")[1]


@pilot_test
async def test_nearest_boundary_on_the_eutectic_line_is_the_eutectic():
    app = make_app(T_K=456.15, x_B=0.5)   # exactly at the model's eutectic temperature or within 0.1 K
    async with app.run_test(size=SIZE) as pilot:
        await pilot.press("g", *"183C", "enter")
        nearest = status_text(app).split("NEAREST BOUNDARY")[1]
        assert "eutectic" in nearest


@pilot_test
async def test_without_colour_every_energy_curve_has_its_own_mark(monkeypatch):
    monkeypatch.setenv("NO_COLOR", "1")
    app = make_app(T_K=458.15, x_B=0.5386)
    async with app.run_test(size=SIZE) as pilot:
        await pilot.press("2")
        screen = screen_text(app)
        legend = {m.group(2): m.group(1) for m in re.finditer(r"[│┤] (\S\S) ([a-z][a-zA-Z ()]+?)\s{2,}", screen)}
        assert {"liquid", "fcc", "bct", "lowest G (equilibrium)", "common tangent"} <= set(legend)
        marks = [legend[name] for name in ("liquid", "fcc", "bct", "lowest G (equilibrium)")]
        assert len(set(marks)) == 4


@pilot_test
async def test_narrow_melt_range_to_a_tenth():
    # near the Pb-Sn eutectic, 61.9 wt% Sn (Massalski, 2nd ed. (1990)): the model's range is under 10 K
    app = make_app(T_K=470.0, x_B=0.739)
    async with app.run_test(size=SIZE):
        status = status_text(app)
        assert re.search(r"liquidus +\d+\.\d °C", status) and re.search(r"freezing range +\d\.\d °C", status)


@pytest.mark.parametrize("system, T_K, x_B, keys", [
    ("al-si", 850.0, 0.05, ("plus",) * 3),   # a three-line caution; two phases; zoomed: long steps
    ("ag-cu", 742.0, 0.02, ("4",)),          # the cooling view's longest pane (three constituents,
                                             # latent heat and coring) under a one-line caution
    ("al-cu", 561.15, 0.02, ()),             # a two-line title and a three-line caution: the
                                             # field's name goes (the phase rows name its phases)
    ("cu-zn", 1373.15, 0.02, ("4",)),        # the same in the cooling view: the melt range on one
])                                           # line, the composition without its heading
@pilot_test
async def test_no_line_of_the_status_pane_is_cut_at_80x24(system, T_K, x_B, keys):
    app = make_app(system, T_K=T_K, x_B=x_B)
    async with app.run_test(size=SIZE) as pilot:
        await pilot.press(*keys)
        await app.workers.wait_for_complete()
        await pilot.pause()
        pane = app.screen_stack[0].query_one(StatusPane)
        assert pane.rows_needed() <= pane.content_region.height
        side = [line[46:] for line in _lines(app)]
        for text in status_text(app).split("\n"):
            assert any(text.strip() in row for row in side), text     # every line on screen
        assert re.search(r"╰─+ step [\d.]+ °C, [\d.]+ wt%.* ─╯", side[-3])  # the keys' step too
