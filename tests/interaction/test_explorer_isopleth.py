"""The explorer on a system of three elements (issue 14): the isopleth through the cursor's
alloy, the status pane with every phase and element, the arrows along the section, `v` for the
next varying element, `g` for a typed alloy; at 80x24. The system is the invented ideal ternary
eutectic of tests/unit/ideal_ternaries.py with its closed-form equilibria (sources there)."""

from __future__ import annotations

import sys
from pathlib import Path

import pytest
from explorer_harness import SIZE, THEME, pilot_test, screen_text, section_app, status_text, until

sys.path.insert(0, str(Path(__file__).resolve().parents[1] / "unit"))

import ideal_ternaries as it  # noqa: E402

from ladle.engine.diagrams import isopleth  # noqa: E402
from ladle.tui.explorer import section_exploration  # noqa: E402
from ladle.tui.explorer.app import ExplorerApp  # noqa: E402
from ladle.tui.explorer.glyphs import glyphs_for  # noqa: E402
from ladle.tui.explorer.section_exploration import SectionExploration  # noqa: E402
from ladle.tui.explorer.widgets.point_entry import PointEntry  # noqa: E402


@pytest.fixture
def ternary_app(monkeypatch):
    system = it.eutectic_system()
    system.phases = system.models          # as a loaded System has them (the transition scan asks)
    solve = it.equilibrate_for(system)
    monkeypatch.setattr(isopleth, "equilibrate", solve)
    monkeypatch.setattr(section_exploration, "equilibrate", solve)
    app = ExplorerApp(SectionExploration(system, temperature_K=700.0), glyphs_for(False), None)
    app.theme = THEME
    return app


async def _settled(app, pilot) -> None:
    """Wait until the isopleth is mapped and the point at the cursor computed."""
    await until(pilot, lambda: app.screen.exploration.isopleth is not None and "computing" not in status_text(app),
                 "the isopleth and the point")


@pilot_test
async def test_status_pane_lists_every_phase_and_element(ternary_app):
    app = ternary_app
    async with app.run_test(size=SIZE) as pilot:
        await _settled(app, pilot)
        text = status_text(app)
        # the opening alloy: 5 at% of each element but the balance A; at 700 K alpha and liquid
        assert "A 90.0 at%" in text and "B 5.00 at%" in text and "C 5.00 at%" in text
        assert "alpha" in text and "liquid" in text
        eq = it.eutectic_equilibrium(700.0, app.screen.exploration.x_at_cursor())
        liquid = next(p for p in eq.phases if p.name == "liquid")
        assert "A {:.1f} B {:.1f} C {:.1f}".format(*(100 * liquid.x)) in text
        assert "isopleth: B varies" in app.screen.query_one("#title").render().plain


@pilot_test
async def test_keys_move_along_the_section_and_choose_the_varying_element(ternary_app):
    app = ternary_app
    async with app.run_test(size=SIZE) as pilot:
        await _settled(app, pilot)
        e = app.screen.exploration
        u, T = e.cursor.u, e.cursor.temperature_K
        await pilot.press("right", "up")
        assert e.cursor.u > u and e.cursor.temperature_K > T
        await _settled(app, pilot)
        b_before = e.x_at_cursor()[1]
        await pilot.press("v")
        assert e.element == "C" and e.x_at_cursor()[1] == pytest.approx(b_before, abs=1e-12)
        await _settled(app, pilot)
        assert "isopleth: C varies" in app.screen.query_one("#title").render().plain


@pilot_test
async def test_typed_alloy_and_temperature(ternary_app):
    app = ternary_app
    async with app.run_test(size=SIZE) as pilot:
        await _settled(app, pilot)
        await pilot.press("g")
        assert app.screen.query_one(PointEntry).display
        await pilot.press(*"B=20at% C=10at% 800K", "enter")
        e = app.screen.exploration
        assert e.cursor.temperature_K == pytest.approx(800.0)
        assert tuple(e.x_at_cursor()) == pytest.approx((0.7, 0.2, 0.1), abs=1e-12)
        await pilot.press("g", *"Q=5at%", "enter")
        assert "element Q is not in this system" in str(app.screen.query_one("#point-problem").render())


@pilot_test
async def test_the_binary_screens_movement_keys_move_on_the_isopleth_too(ternary_app):
    """h j k l move a step as the arrows do, and shift+arrows or H J K L a tenth of one, as on a
    binary's diagram (the help lists them); on the isopleth they did nothing."""
    app = ternary_app
    async with app.run_test(size=SIZE) as pilot:
        await _settled(app, pilot)
        e = app.screen.exploration
        w = e.window
        du, dT = section_exploration.STEP_SHARE * (w.u_high - w.u_low), section_exploration.STEP_SHARE * (w.T_high - w.T_low)
        for keys, (step_u, step_T) in ((("l",), (du, 0.0)), (("k",), (0.0, dT)), (("h", "j"), (-du, -dT)),
                                       (("L",), (du / 10, 0.0)), (("shift+up",), (0.0, dT / 10)),
                                       (("H", "J"), (-du / 10, -dT / 10))):
            u, T = e.cursor.u, e.cursor.temperature_K
            await pilot.press(*keys)
            assert (e.cursor.u - u, e.cursor.temperature_K - T) == pytest.approx((step_u, step_T), abs=1e-9), keys
        await pilot.press("question_mark")
        assert ("arrows h j k l", "shift+arrows") == tuple(keys for keys, _ in app.screen.rows[:2])


@pilot_test
async def test_help_shows_the_cautions_and_this_screens_keys(ternary_app):
    app = ternary_app
    async with app.run_test(size=SIZE) as pilot:
        await pilot.press("question_mark")
        text = screen_text(app)
        assert "SAFETY" in text and "Molten metal burns" in text
        assert any(what.startswith("let the next element vary") for _, what in app.screen.rows)
        await pilot.press("escape")
        assert app.screen is app.screen_stack[0]


@pilot_test
async def test_the_isothermal_section_at_the_cursors_temperature(ternary_app, monkeypatch):
    from ladle.engine.diagrams import isothermal

    monkeypatch.setattr(isothermal, "equilibrate", it.equilibrate_for(it.eutectic_system()))
    app = ternary_app
    async with app.run_test(size=SIZE) as pilot:
        await _settled(app, pilot)
        await pilot.press("i")
        e = app.screen.exploration
        await until(pilot, lambda: e.triangle is not None, "the isothermal section")
        assert e.view == "triangle" and e.triangle.temperature_K == pytest.approx(700.0)
        text = screen_text(app)
        assert "alpha + liquid" in text and "mole fractions" in text
        await pilot.press("i")
        assert e.view == "isopleth"


@pilot_test
async def test_the_cooling_view_shows_both_paths_of_the_cursors_alloy(ternary_app, monkeypatch):
    from ladle.engine.diagrams import alloy_transitions
    from ladle.engine.solidify import alloy_equilibrium, alloy_scheil

    solve = it.equilibrate_for(it.eutectic_system())
    for module in (alloy_transitions, alloy_scheil, alloy_equilibrium):
        monkeypatch.setattr(module, "equilibrate", solve)
    app = ternary_app
    async with app.run_test(size=SIZE) as pilot:
        await _settled(app, pilot)
        await pilot.press("c")
        await until(pilot, lambda: "computing" not in status_text(app), "the freezing paths")
        text = status_text(app)
        # 90 A, 5 B, 5 C (at%): alpha first, the ternary eutectic ends freezing (ideal_ternaries)
        assert "FREEZING" in text and "primary alpha" in text and "(ternary eutectic)" in text
        assert "solid, mass %" in screen_text(app)


@pilot_test
async def test_u_switches_the_section_between_at_and_wt_percent_keeping_the_alloy(ternary_app):
    app = ternary_app
    async with app.run_test(size=SIZE) as pilot:
        await _settled(app, pilot)
        e = app.screen.exploration
        alloy = e.x_at_cursor()
        assert e.basis == "at" and " at%; A balance" in app.screen.query_one("#title").render().plain
        await pilot.press("u")
        await _settled(app, pilot)
        assert e.basis == "wt" and e.x_at_cursor() == pytest.approx(alloy, abs=1e-12)
        assert " wt%; A balance" in app.screen.query_one("#title").render().plain
        assert "B wt%" in screen_text(app) and "PHASES, mass % and wt%" in status_text(app)
        # each phase's amount is a mass % of the alloy, not a content: 'liquid 16.3 mass%' (it said 'wt%')
        amounts = [row.strip() for row in status_text(app).splitlines() if row.strip().startswith(("liquid ", "alpha "))]
        assert amounts and all(row.endswith(" mass%") for row in amounts), amounts
        await pilot.press("u")
        assert e.basis == "at" and e.x_at_cursor() == pytest.approx(alloy, abs=1e-12)


@pilot_test
async def test_t_switches_the_temperature_unit_everywhere(ternary_app):
    app = ternary_app
    async with app.run_test(size=SIZE) as pilot:
        await _settled(app, pilot)
        assert "426.9 °C  (700.0 K)" in status_text(app)      # 700 K - 273.15 (NIST SP 811)
        await pilot.press("t")
        assert " 700.0 K" in status_text(app) and "T K" in screen_text(app)
        await pilot.press("t")
        assert "800.3 °F" in status_text(app)                  # (700 - 273.15) 9/5 + 32 (NIST SP 811)


@pilot_test
async def test_the_systems_caution_stands_under_the_status_pane(ternary_app):
    """As on a binary's screen: the first clause of the system's safety note, whole, with where
    its full text is (the note here is invented for the test)."""
    app = ternary_app
    app._first_exploration.system.safety = "Lead is toxic: wash hands. Invented note for the test."
    async with app.run_test(size=SIZE) as pilot:
        await _settled(app, pilot)
        assert "! Lead is toxic (? more)" in screen_text(app)


@pilot_test
async def test_zoom_halves_the_window_about_the_cursor_and_0_shows_all_of_it(ternary_app):
    app = ternary_app
    async with app.run_test(size=SIZE) as pilot:
        await until(pilot, lambda: app.screen.exploration.isopleth is not None, "the isopleth")
        e = app.screen.exploration
        ticks = screen_text(app)
        await pilot.press("plus")
        w, c = e.window, e.cursor
        assert w.u_high - w.u_low == pytest.approx(0.5) and w.T_high - w.T_low == pytest.approx(0.5 * (e.T_high - e.T_low))
        assert w.u_low <= c.u <= w.u_high and w.T_low <= c.temperature_K <= w.T_high
        assert screen_text(app) != ticks                       # redrawn on the new axes
        T = c.temperature_K
        await pilot.press("up")                                # a step is a fiftieth of the window shown
        assert e.cursor.temperature_K - T == pytest.approx((w.T_high - w.T_low) / 50.0)
        await pilot.press("0")
        assert e.window == e.whole and screen_text(app).split("\n")[-4] == ticks.split("\n")[-4]   # the axis again


@pilot_test
async def test_a_point_without_an_answer_says_so_and_later_points_are_answered(ternary_app, monkeypatch):
    """The point is computed at once while that is quick; one that fails is asked again in a
    worker, which reports the problem in the status pane."""
    app = ternary_app
    async with app.run_test(size=SIZE) as pilot:
        await until(pilot, lambda: app.screen.exploration.isopleth is not None, "the isopleth")
        e = app.screen.exploration
        answer = e.equilibrium

        def refused():
            raise ValueError("refused for the test")

        monkeypatch.setattr(e, "equilibrium", refused)
        await pilot.press("up")
        await until(pilot, lambda: "no answer here: refused for the test" in status_text(app), "the problem")
        monkeypatch.setattr(e, "equilibrium", answer)
        await pilot.press("down")
        await until(pilot, lambda: "PHASES" in status_text(app) and "computing" not in status_text(app), "the point")


@pilot_test
async def test_the_sides_of_a_ternary_gap_are_named_by_what_each_is_rich_in():
    """14-carat gold 14ct-1N at 500 C (shipped ag-au-cu) lies in the gap between a copper-rich and
    a silver-rich fcc. Each side is named by the element it holds most more of than the other:
    'fcc (Cu-rich)' (some 55 at% Cu) and 'fcc (Ag-rich)' (some 54 at% Ag). The status pane
    called the copper-rich side 'fcc (Au-rich)', from its silver content alone, as for a binary."""
    app = section_app("ag-au-cu")
    async with app.run_test(size=SIZE) as pilot:
        await pilot.press("g", *"14ct-1N 500C", "enter")
        await until(pilot, lambda: "PHASES" in status_text(app) and "computing" not in status_text(app), "the point")
        rows = [line.strip() for line in status_text(app).splitlines()]
        sides = {row.split(" ")[1]: rows[i + 1] for i, row in enumerate(rows) if row.startswith("fcc (")}
        assert set(sides) == {"(Cu-rich)", "(Ag-rich)"}, rows
        cu, ag = (dict(zip(sides[side].split()[::2], map(float, sides[side].split()[1::2])))
                  for side in ("(Cu-rich)", "(Ag-rich)"))
        assert cu["Cu"] > ag["Cu"] and ag["Ag"] > cu["Ag"]


@pilot_test
async def test_a_typed_name_the_system_lacks_gets_its_alloys_listed():
    """'A356 600C' on the shipped al-mg-si, whose file names the alloy A356.0 (the Aluminum
    Association's designation): the entry says the name is not one of this system's alloys and
    lists them. It said only "cannot read temperature 'A356'", as if a number were mistyped."""
    app = section_app("al-mg-si")
    async with app.run_test(size=SIZE) as pilot:
        await pilot.press("g", *"A356 600C", "enter")
        problem = str(app.screen.query_one("#point-problem").render())
        assert problem.startswith("not used: cannot read temperature 'A356', nor an alloy of this system by that name; "
                                  "its alloys: A356.0, "), problem
        assert app.screen.query_one(PointEntry).display            # kept open for correcting


@pilot_test
async def test_the_pointer_to_the_full_caution_stays_on_one_row():
    """The shipped bi-pb-sn's caution line under the status pane ends on one row with '(? more)'
    (where the full text is: ? help); the pane broke it into '(?' and 'more)' on two rows."""
    app = section_app("bi-pb-sn")
    async with app.run_test(size=SIZE) as pilot:
        await pilot.pause()
        side = [line[46:].strip(" │") for line in screen_text(app).split("\n")]
        start = next(i for i, row in enumerate(side) if row.startswith("! A computed melting point"))
        assert side[start:start + 3] == ["! A computed melting point", "qualifies no safety part", "(? more)"], side


@pilot_test
async def test_a_long_caution_keeps_its_statement_under_the_pane():
    """The shipped fe-c-si's caution begins 'Molten iron (...) explodes on contact with water,
    damp tools, rust, ...': under the status pane it is that statement and where the rest is,
    in two rows; the whole list took five of the pane's rows (the POINT heading fell off)."""
    app = section_app("fe-c-si")
    async with app.run_test(size=SIZE) as pilot:
        await pilot.pause()
        side = [line[46:].strip(" │") for line in screen_text(app).split("\n")]
        start = next(i for i, row in enumerate(side) if row.startswith("! Molten iron"))
        assert side[start:start + 3] == ["! Molten iron explodes on", "contact with water (? more)",
                                         "╰" + "─" * 32 + "╯"], side
        assert "POINT" in side
