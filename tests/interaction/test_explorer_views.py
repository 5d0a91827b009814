"""Views, units, zoom, the reactions table, help and the system picker."""

import pytest
from explorer_harness import SIZE, make_app, pilot_test, screen_text, status_text, until
from textual.widgets import ContentSwitcher, OptionList

from ladle.tui.explorer.cautions import GENERAL_CAUTIONS
from ladle.tui.explorer.keymap import MAIN_KEYS
from ladle.tui.explorer.screens.help import HelpScreen
from ladle.tui.explorer.screens.systems import SystemPicker
from ladle.tui.explorer.widgets.energy_view import EnergyView
from ladle.tui.explorer.widgets.reactions_view import ReactionsView


def _main(app):
    return app.screen_stack[0]


@pilot_test
async def test_number_keys_switch_views_and_the_title_brackets_the_active_one():
    app = make_app(T_K=500.0, x_B=0.5)
    async with app.run_test(size=SIZE) as pilot:
        switcher = _main(app).query_one(ContentSwitcher)
        assert switcher.current == "diagram" and "[1 diagram]" in screen_text(app)
        await pilot.press("2")
        assert switcher.current == "energy" and "[2 energy]" in screen_text(app)
        assert "G kJ/mol" in screen_text(app)
        await pilot.press("3")
        assert switcher.current == "reactions" and "[3 reactions]" in screen_text(app)
        await pilot.press("1")
        assert switcher.current == "diagram"


@pilot_test
async def test_unit_keys_apply_to_the_status_pane_and_the_reactions():
    app = make_app(T_K=456.15, x_B=0.5)
    async with app.run_test(size=SIZE) as pilot:
        # 456.15 K = 183.0 C = 361.4 F (NIST Special Publication 811 (2008)); 50 at% Sn is 36.4 wt%
        # with the IUPAC standard atomic weights Pb 207.2, Sn 118.71 g/mol.
        await pilot.press("t")
        assert "456.1 K  183.0 °C" in status_text(app)      # the chosen unit comes first
        await pilot.press("t")
        assert "361.4 °F  183.0 °C  456.1 K" in status_text(app)
        await pilot.press("u")
        assert "Sn 50.0 at%  (36.4 wt%)" in status_text(app)
        await pilot.press("3")
        assert "°F" in screen_text(app) and "at%" in screen_text(app)


@pilot_test
async def test_zoom_narrows_the_window_about_the_cursor_and_0_restores_it():
    app = make_app(T_K=500.0, x_B=0.5)
    async with app.run_test(size=SIZE) as pilot:
        exploration = _main(app).exploration
        whole = exploration.window
        await pilot.press("plus")
        zoomed = exploration.window
        assert zoomed.T_high - zoomed.T_low == pytest.approx((whole.T_high - whole.T_low) / 2)
        assert zoomed.contains(500.0, 0.5)
        coarse_before = exploration.steps(False)
        assert coarse_before.temperature <= 10.0      # finer steps in a smaller window
        await pilot.press("minus")
        assert exploration.window.T_high - exploration.window.T_low == pytest.approx(
            whole.T_high - whole.T_low)
        await pilot.press("plus", "plus", "0")
        assert exploration.window == whole


@pilot_test
async def test_choosing_a_reaction_moves_the_cursor_there():
    app = make_app(T_K=600.0, x_B=0.5)
    async with app.run_test(size=SIZE) as pilot:
        await pilot.press("3")
        table = _main(app).query_one(ReactionsView)
        first = table._rows[0]
        assert first.kind == "eutectic"
        await pilot.press("enter")
        cursor = _main(app).exploration.cursor
        assert (cursor.temperature_K, cursor.x_B) == (first.temperature_K, first.x_B)
        assert _main(app).query_one(ContentSwitcher).current == "diagram"


@pilot_test
async def test_help_lists_every_key_and_the_cautions():
    app = make_app(T_K=500.0, x_B=0.5)
    async with app.run_test(size=(100, 60)) as pilot:
        await pilot.press("question_mark")
        assert isinstance(app.screen, HelpScreen)
        text = screen_text(app)
        for use in MAIN_KEYS:
            assert use.description[:30] in text
        assert "Lead is toxic" in text                       # the system's own safety note
        assert GENERAL_CAUTIONS[-1][:40] in text             # computed values are estimates
        await pilot.press("escape")
        assert not isinstance(app.screen, HelpScreen)


@pilot_test
async def test_system_picker_lists_sources_and_narrows_by_typing():
    app = make_app(T_K=500.0, x_B=0.5)
    async with app.run_test(size=SIZE) as pilot:
        await pilot.press("s")
        assert isinstance(app.screen, SystemPicker)
        options = app.screen.query_one(OptionList)
        assert options.option_count >= 1
        assert "Massalski" in screen_text(app) or "fitted" in screen_text(app)
        await pilot.press(*"no-such-alloy")      # nothing matches: one line says so (the list was empty)
        assert options.option_count == 1 and options.get_option_at_index(0).disabled
        assert "no system's name, title, source or alloy holds 'no-such-alloy'" in screen_text(app)
        await pilot.press("enter")                # nothing to open
        assert isinstance(app.screen, SystemPicker)
        await pilot.press("escape")
        assert not isinstance(app.screen, SystemPicker)
        assert _main(app).exploration.system.name == "pb-sn"


@pilot_test
async def test_system_picker_finds_a_system_by_an_alloys_name(monkeypatch):
    """Typing an alloy's shorthand finds the system whose file lists it, with the alloy shown:
    SAC305 (the trade's name of Sn96.5Ag3.0Cu0.5) in ag-cu-sn, 14ct-1N in ag-au-cu. The search
    read only names, titles and sources, and left the list empty."""
    from ladle.tui.explorer.screens import systems

    monkeypatch.setattr(systems, "with_check_result", lambda choice: choice)   # checks not counted here
    app = make_app(T_K=500.0, x_B=0.5)
    async with app.run_test(size=SIZE) as pilot:
        await pilot.press("s", *"sac305")
        options = app.screen.query_one(OptionList)
        assert [options.get_option_at_index(i).id for i in range(options.option_count)] == ["ag-cu-sn"]
        assert "alloy Sn96.5Ag3.0Cu0.5 (SAC305)" in screen_text(app)
        await pilot.press(*["backspace"] * 6, *"14ct-1N")
        assert [options.get_option_at_index(i).id for i in range(options.option_count)] == ["ag-au-cu"]
        assert "alloy 14ct-1N" in screen_text(app)
        await pilot.press("enter")
        await pilot.pause()
        assert app.explore_screen.exploration.system.name == "ag-au-cu"


@pilot_test
async def test_the_pickers_counts_arrive_one_by_one_and_leave_the_highlight(monkeypatch):
    """A system's independent checks are counted the first time its file is seen (seconds
    each): each count shows as it arrives, while the list keeps the user's highlight."""
    import threading

    from ladle.tui.explorer.screens import systems as picker_module

    release, counted = threading.Event(), []
    real = picker_module.with_check_result

    def held_after_the_first(choice):
        if counted:
            release.wait(10.0)
        counted.append(choice.name)
        return real(choice)

    monkeypatch.setattr(picker_module, "with_check_result", held_after_the_first)
    app = make_app(T_K=500.0, x_B=0.5)
    async with app.run_test(size=SIZE) as pilot:
        await pilot.press("s", "down", "down", "down")
        options = app.screen.query_one(OptionList)
        before = options.highlighted
        assert before and before > 0                  # where a refilled list would have put it back to 0
        first, last = options.get_option_at_index(0).id, options.get_option_at_index(options.option_count - 1).id
        await until(pilot, lambda: "independent checks passed" in str(options.get_option(first).prompt)
                    or "no independent checks" in str(options.get_option(first).prompt), "the first count")
        assert "independent checks passed" not in str(options.get_option(last).prompt)   # not counted yet,
        assert "independent checks (checking ...)" in str(options.get_option(last).prompt)  # and says so
        assert options.highlighted == before
        release.set()
        await until(pilot, lambda: "passed" in str(options.get_option(last).prompt)
                    or "no independent checks" in str(options.get_option(last).prompt), "the last count", 120.0)
        assert options.highlighted == before


@pilot_test
async def test_a_long_system_title_wraps_indented_under_its_name():
    # ag-au-cu's title is 'Gold-silver-copper (carat golds, gold solders), above the ordering
    # range': its last words went to the picker's left edge, like a line of their own.
    app = make_app(T_K=500.0, x_B=0.5)
    async with app.run_test(size=SIZE) as pilot:
        await pilot.press("s", *"ag-au-cu")
        await pilot.pause()
        lines = screen_text(app).splitlines()
        name = next(i for i, line in enumerate(lines) if "ag-au-cu  Gold-silver-copper" in line)
        after = next(part for part in lines[name + 1].split("│") if "ordering" in part)   # inside the picker's border
        assert "ordering range" in after and after.startswith("     "), lines[name + 1]


@pilot_test
async def test_choosing_another_system_keeps_the_units_and_redraws():
    app = make_app(T_K=500.0, x_B=0.5, temperature_unit="K")
    async with app.run_test(size=SIZE) as pilot:
        await pilot.press("s", *"cu-ni", "enter")
        exploration = _main(app).exploration
        assert exploration.system.name == "cu-ni"
        assert exploration.scales.temperature_unit == "K"
        assert "cu-ni" in screen_text(app) and "Ni " in status_text(app)


@pilot_test
async def test_the_picker_opens_again_with_an_empty_filter_and_the_open_system_marked():
    app = make_app(T_K=500.0, x_B=0.5)
    async with app.run_test(size=SIZE) as pilot:
        await pilot.press("s", *"no-such-alloy", "escape")
        await pilot.press("s", *"cu-ni", "enter")
        assert _main(app).exploration.system.name == "cu-ni"
        await pilot.press("s")
        picker = app.screen
        assert isinstance(picker, SystemPicker) and picker.query_one("Input").value == ""
        options = picker.query_one(OptionList)
        assert options.option_count >= 2
        assert str(options.get_option("cu-ni").prompt).startswith("* cu-ni")
        assert str(options.get_option("pb-sn").prompt).startswith("  pb-sn")
        await pilot.press("escape")
        assert _main(app).exploration.system.name == "cu-ni"


@pytest.mark.parametrize("system, T_K, x_B, zooms", [
    ("al-cu", 999.0, 0.3, 0),       # the only tie-line (liquid + theta) lies beyond the covered range
    ("pb-sn", 423.15, 0.02, 4),     # zoomed in on the lead-rich solid, far from fcc + bct's tangent
])
@pilot_test
async def test_energy_view_draws_where_no_tangent_reaches_the_window(system, T_K, x_B, zooms):
    app = make_app(system, T_K=T_K, x_B=x_B)
    async with app.run_test(size=SIZE) as pilot:
        await pilot.press("2", *["plus"] * zooms)
        await pilot.pause()
        screen = screen_text(app)
        assert app.is_running and "lowest G (equilibrium)" in screen
        assert "common tangent" not in screen     # its legend only where it is drawn


@pilot_test
async def test_the_energy_picture_built_ahead_is_the_one_built_on_the_spot():
    app = make_app(T_K=458.15, x_B=0.5386)
    async with app.run_test(size=SIZE) as pilot:
        await pilot.press("2", "shift+right")
        await app.workers.wait_for_complete()        # the pictures one step up and down
        energy = _main(app).query_one(EnergyView)
        assert len(energy._ahead) == 4
        await pilot.press("shift+up")
        ahead = energy._picture().plain
        assert any(text.plain == ahead for text, _ in energy._ahead.values())
        energy._ahead.clear()
        energy._built_key = None                     # build it again, here and now
        assert energy._picture().plain == ahead


@pilot_test
async def test_a_status_line_too_long_for_the_pane_goes_on_indented():
    """A line wider than the status pane is broken at its words, its further rows indented under
    its text (a row at the pane's edge read as a line of its own: ' too small: delta ferrite +'
    above 'liquid' in Fe-C's key of fields)."""
    from ladle.tui.explorer.widgets.status_pane import StatusPane

    app = make_app(T_K=500.0, x_B=0.5)
    async with app.run_test(size=SIZE) as pilot:
        pane = _main(app).query_one(StatusPane)
        pane.show_lines([("heading", "FIELDS"), ("note", " too small: delta ferrite + liquid + more"),
                         ("note", " 1: fcc (Cu-rich) + fcc (Ag-rich)"),
                         ("heading", "SOLUTION TREATMENT, solvus to Scheil end")])
        await pilot.pause()
        rows = [pane.render_line(y).text.rstrip() for y in range(pane.rows_needed())]
        assert rows == ["FIELDS", " too small: delta ferrite +", "   liquid + more",
                        " 1: fcc (Cu-rich) + fcc", "   (Ag-rich)",              # not 'fcc (Ag-' over 'rich)'
                        "SOLUTION TREATMENT, solvus to", "  Scheil end"], rows
