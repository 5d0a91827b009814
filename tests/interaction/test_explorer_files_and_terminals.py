"""What the explorer writes (point JSON, screen snapshots, the remembered point) and how it
behaves on small, ASCII-only and colourless terminals."""

import io
import json
import re

from rich.console import Console

from explorer_harness import SIZE, make_app, pilot_test, screen_text, section_app, status_text

from ladle.engine import equilibrate
from ladle.tui.explorer import run
from ladle.tui.explorer.launch import first_exploration
from ladle.tui.explorer.saved_state import load_state, state_path


@pilot_test
async def test_w_writes_the_points_json_like_ladle_point(clean_environment):
    app = make_app(T_K=458.15, x_B=0.5)
    async with app.run_test(size=SIZE) as pilot:
        await pilot.press("w")
        written = list(clean_environment.glob("ladle-point-pb-sn-*.json"))
        assert [p.name for p in written] == ["ladle-point-pb-sn-185C-36.4wt.json"]
        system = app.screen_stack[0].exploration.system
        assert json.loads(written[0].read_text()) == json.loads(
            json.dumps(equilibrate(system, 458.15, 0.5).to_json(system)))
        assert app.clipboard == written[0].read_text()
        await pilot.press("w")                                  # never overwrites
        assert len(list(clean_environment.glob("ladle-point-pb-sn-*.json"))) == 2


@pilot_test
async def test_p_saves_the_screen_as_text_and_svg(clean_environment):
    app = make_app(T_K=458.15, x_B=0.5)
    async with app.run_test(size=SIZE) as pilot:
        await pilot.press("p")
        text = (clean_environment / "ladle-screen-pb-sn-diagram.txt").read_text()
        svg = (clean_environment / "ladle-screen-pb-sn-diagram.svg").read_text()
        assert text == screen_text(app) and "POINT" in text
        assert svg.startswith("<svg") and "POINT" in svg


@pilot_test
async def test_w_and_p_write_on_the_isopleth_screen_too(clean_environment):
    # The isopleth screen (three elements, or Fe-C) had neither: the keys did nothing there.
    # ag-cu-sn opens at 5 at% Ag and Cu, Sn the balance (README).
    app = section_app("ag-cu-sn")
    async with app.run_test(size=SIZE) as pilot:
        await pilot.press("p")
        await pilot.pause()
        text = (clean_environment / "ladle-screen-ag-cu-sn-isopleth.txt").read_text()
        svg = (clean_environment / "ladle-screen-ag-cu-sn-isopleth.svg").read_text()
        assert "ag-cu-sn  isopleth" in text and "POINT" in text and svg.startswith("<svg")
        assert any("ladle-screen-ag-cu-sn-isopleth.txt" in n.message for n in app._notifications)
        await pilot.press("w")
        await pilot.pause()
        written = list(clean_environment.glob("ladle-point-ag-cu-sn-*.json"))
        assert [p.name for p in written] == ["ladle-point-ag-cu-sn-275C-Ag5.00-Cu1.85at.json"]
        e = app.explore_screen.exploration
        assert json.loads(written[0].read_text()) == json.loads(json.dumps(
            equilibrate(e.system, e.cursor.temperature_K, e.x_at_cursor()).to_json(e.system)))
        assert app.clipboard == written[0].read_text()


@pilot_test
async def test_p_numbers_the_text_and_svg_alike_and_says_where_under_a_server(clean_environment, monkeypatch):
    (clean_environment / "ladle-screen-pb-sn-diagram.svg").write_text("an older picture")
    app = make_app(T_K=458.15, x_B=0.5)
    monkeypatch.setattr(type(app), "is_web", property(lambda self: True))     # as under ladle serve
    async with app.run_test(size=SIZE) as pilot:
        await pilot.press("p")
        await pilot.pause()
        notices = [n.message for n in app._notifications]
    assert sorted(p.name for p in clean_environment.glob("ladle-screen-*")) == [
        "ladle-screen-pb-sn-diagram-2.svg", "ladle-screen-pb-sn-diagram-2.txt", "ladle-screen-pb-sn-diagram.svg"]
    assert (clean_environment / "ladle-screen-pb-sn-diagram.svg").read_text() == "an older picture"
    assert any("on the server's disk" in n and "diagram-2.txt" in n and "diagram-2.svg" in n for n in notices)


@pilot_test
async def test_the_point_and_units_are_remembered_between_runs(clean_environment):
    path = state_path()
    app = make_app(T_K=500.0, x_B=0.5, state_file=path)
    async with app.run_test(size=SIZE) as pilot:
        await pilot.press("up", "t", "u", "q")
    saved = load_state(path)
    assert (saved.system, saved.temperature_unit, saved.composition_unit) == ("pb-sn", "K", "at")
    again = first_exploration(None, saved)
    assert again.cursor.temperature_K == saved.temperature_K and again.cursor.x_B == 0.5
    assert again.scales.temperature_unit == "K"


def test_a_first_run_opens_on_the_lead_tin_binary(clean_environment):
    """With no system asked for and nothing remembered, the explorer opens on pb-sn, a binary
    drawn at once; it opened on the catalog's first file, the gold-silver-copper ternary, whose
    isopleth takes seconds to map before anything is drawn."""
    first = first_exploration(None, None)
    assert first.system.name == "pb-sn" and first.system.elements == ("Pb", "Sn")


@pilot_test
async def test_a_small_terminal_is_told_the_size_needed():
    app = make_app(T_K=500.0, x_B=0.5)
    async with app.run_test(size=(60, 20)) as pilot:
        await pilot.pause()
        text = screen_text(app)
        assert "at least 80 x 24" in text and "this one is 60 x 20" in text
        assert "POINT" not in text
        await pilot.resize_terminal(80, 24)
        await pilot.pause()
        assert "POINT" in screen_text(app)


@pilot_test
async def test_ascii_mode_draws_only_ascii_in_every_view():
    app = make_app(T_K=456.15, x_B=0.5, ascii_only=True)
    async with app.run_test(size=SIZE) as pilot:
        for key in ("1", "2", "3", "question_mark", "escape", "g"):
            await pilot.press(key)
            text = screen_text(app)
            bad = sorted({ch for ch in text if not ch.isascii()})
            assert not bad, f"after {key}: {bad}"
        assert " 183.0 C " in status_text(app)             # no degree sign in ASCII mode


def _terminal_bytes(app) -> str:
    """What the app would write to a true-colour terminal for a full repaint."""
    console = Console(width=SIZE[0], height=SIZE[1], file=io.StringIO(), force_terminal=True,
                      color_system="truecolor", legacy_windows=False)
    console.print(app.screen._compositor.render_update(full=True))
    return console.file.getvalue()


@pilot_test
async def test_no_color_drops_every_colour(monkeypatch):
    for no_color in (False, True):
        if no_color:
            monkeypatch.setenv("NO_COLOR", "1")
        app = make_app(T_K=460.0, x_B=0.5)
        async with app.run_test(size=SIZE) as pilot:
            await pilot.pause()
            output = _terminal_bytes(app)
            has_colour = re.search(r"\x1b\[[0-9;]*[34]8;[25];", output) is not None
            assert has_colour is not no_color
            assert "POINT" in output and "liquid" in output   # meaning is in the text


def test_a_bad_system_name_is_one_line_and_exit_status_2(capsys):
    assert run(["no-such-system"]) == 2
    err = capsys.readouterr().err
    assert err.startswith("ladle: ") and err.count("\n") == 1 and "no-such-system" in err


def test_a_bad_option_is_one_line_and_exit_status_2(capsys):
    assert run(["--colour"]) == 2
    err = capsys.readouterr().err
    assert err.startswith("ladle: unrecognized arguments: --colour") and err.count("\n") == 1
