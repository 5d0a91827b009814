"""The explorer on Fe-C (issue 15) and switching between every kind of system (issue 14), at
80x24: the iron-cementite diagram drawn as an isopleth with nothing held, its trade lines named
on the plot, the cursor's alloy's changes on cooling and heat-treatment window in the status
pane, keys answered while the diagram is mapped, the picker opening binaries, Fe-C and ternaries
and back.

Mapping Fe-C takes seconds; the explorer keeps mapped isopleths for the session, so the tests of
this module map each diagram once."""

from __future__ import annotations

import threading

import numpy as np
import pytest
from explorer_harness import SIZE, make_app, pilot_test, screen_text, section_app, status_text, until

from ladle.engine import find_system
from ladle.engine.diagrams.alloy_transitions import alloy_transitions
from ladle.engine.units import mole_from_mass
from ladle.tui.explorer import section_exploration
from ladle.tui.explorer.screens import systems
from ladle.tui.explorer.screens.explore import ExploreScreen
from ladle.tui.explorer.screens.section_screen import SectionScreen
from ladle.tui.explorer.widgets.point_entry import PointEntry

MAPPING_S = 180.0      # mapping Fe-C on a loaded machine (measured: 4-28 s)
# Keys are pressed once the workers rest: a test's key press waits while the process computes.


def _mapped(app) -> bool:
    return app.explore_screen.exploration.isopleth is not None


def _settled(app) -> bool:
    """The isopleth is mapped and nothing in the status pane is being computed."""
    text = status_text(app)
    return _mapped(app) and "computing" not in text and "mapping" not in text


def _row(text: str, label: str) -> float:
    """The temperature (C) of the status pane's row naming `label` ('  787.1 °C A3')."""
    for line in text.split("\n"):
        words = line.split()
        if words[-1:] == [label] and len(words) == 3:
            return float(words[0])
    raise AssertionError(f"no row {label!r} in:\n{text}")


async def _go_to_steel(pilot, app, point: str) -> None:
    """Once the diagram is mapped, go to `point` (typed as at the g prompt) and wait for the
    alloy's changes."""
    await until(pilot, lambda: _settled(app), "the diagram", MAPPING_S)
    await pilot.press("g", *point, "enter")
    await until(pilot, lambda: _settled(app), "the steel's changes", MAPPING_S)


@pilot_test
async def test_a_steel_shows_its_lines_changes_and_austenitizing_window():
    """A 0.4 wt% C steel at 800 C on the iron-cementite diagram."""
    app = section_app("fe-fe3c")
    async with app.run_test(size=SIZE) as pilot:
        await _go_to_steel(pilot, app, "0.4wt% 800C")
        text, screen = status_text(app), screen_text(app)
        assert "800.0 °C" in text and "C 0.400 wt%" in text
        assert "austenite" in text                      # the trade's name of fcc, from fe-c.toml
        assert "AUSTENITIZING, A3 to solidus" in text and "your specification governs" in text
        a1, a3 = _row(text, "A1"), _row(text, "A3")
        # the eutectoid, 727 C within fe-fe3c.toml's 2 K (Okamoto, J. Phase Equilib. 13 (1992) 543,
        # as drawn in ASM Handbook Vol. 3 (1992); recalled from memory, as the file says); A3 of a
        # hypoeutectoid steel lies between it and pure iron's alpha-gamma change, 912 C (ASM
        # Handbook Vol. 3 (1992))
        assert a1 == pytest.approx(727.0, abs=2.0) and a1 < a3 < 912.0
        # the pane shows the engine's scan of this alloy (a finer scan, as `ladle transitions`)
        system = find_system("fe-fe3c")
        scan = alloy_transitions(system, mole_from_mass(np.array([0.996, 0.004]), system.molar_mass))
        assert a3 in [round(t.temperature_K - 273.15, 1) for t in scan.transitions]
        # the trade's lines named on the plot
        plot = "\n".join(line[:46] for line in screen.split("\n"))
        assert "A1" in plot and "Acm" in plot


@pilot_test
async def test_a_hypereutectoid_steel_is_hardened_between_a1_and_acm():
    app = section_app("fe-fe3c")
    async with app.run_test(size=SIZE) as pilot:
        await _go_to_steel(pilot, app, "1.2wt% 760C")
        text = status_text(app)
        assert "AUSTENITIZING, A1 to Acm" in text and "austenite + cementite" in text
        assert _row(text, "A1") < _row(text, "Acm")
        assert "cementite" in text                     # at 760 C: austenite + cementite


@pilot_test
async def test_keys_are_answered_while_the_diagram_is_mapped(monkeypatch):
    """The mapping worker is held until the keys have been answered (so that the test does not
    depend on how fast the machine maps), then maps."""
    monkeypatch.setattr(section_exploration, "_MAPPED", type(section_exploration._MAPPED)())   # none kept
    release, real_map = threading.Event(), section_exploration.SectionExploration.map

    def held_map(exploration):
        release.wait(MAPPING_S)
        return real_map(exploration)

    monkeypatch.setattr(section_exploration.SectionExploration, "map", held_map)
    app = section_app("fe-c")
    async with app.run_test(size=SIZE) as pilot:
        e = app.explore_screen.exploration
        u, T = e.cursor.u, e.cursor.temperature_K
        await pilot.press("right", "up", "t")
        assert e.isopleth is None and e.cursor.u > u and e.cursor.temperature_K > T
        assert "mapping the isopleth" in screen_text(app) and " K" in status_text(app)
        release.set()
        await until(pilot, lambda: _mapped(app), "the diagram", MAPPING_S)
        await pilot.pause()
        assert "mapping" not in screen_text(app) and "A3" in screen_text(app)


@pilot_test
async def test_the_picker_opens_fe_c_and_ternaries_and_goes_back_to_a_binary(monkeypatch):
    def not_mapped(exploration):
        raise ValueError("not mapped in this test")     # the screens are under test, not the mapping

    monkeypatch.setattr(section_exploration.SectionExploration, "map", not_mapped)
    monkeypatch.setattr(systems, "with_check_result", lambda choice: choice)   # nor the checks counted
    app = make_app("pb-sn", T_K=500.0, x_B=0.5, temperature_unit="K")
    async with app.run_test(size=SIZE) as pilot:
        await pilot.press("s", *"fe-fe3c", "enter")
        await pilot.pause()
        assert isinstance(app.screen, SectionScreen) and app.explore_screen is app.screen
        assert app.screen.exploration.system.name == "fe-fe3c" and app.screen.exploration.basis == "wt"
        assert "fe-fe3c  Iron-cementite" in screen_text(app)
        await pilot.press("s", *"ag-cu-sn", "enter")
        await pilot.pause()
        assert isinstance(app.screen, SectionScreen) and app.screen.exploration.system.name == "ag-cu-sn"
        assert len(app.screen_stack) == 2          # the ternary replaced Fe-C over the first screen
        assert "isopleth: Ag varies" in screen_text(app)
        await pilot.press("s", *"cu-ni", "enter")
        await pilot.pause()
        assert isinstance(app.screen, ExploreScreen) and len(app.screen_stack) == 1
        assert app.screen.exploration.system.name == "cu-ni"
        assert app.screen.exploration.scales.temperature_unit == "K"     # kept from pb-sn


@pilot_test
async def test_the_typed_point_entry_closes_with_escape_and_names_a_bad_entry():
    app = section_app("fe-fe3c")
    async with app.run_test(size=SIZE) as pilot:
        await until(pilot, lambda: _settled(app), "the diagram", MAPPING_S)
        await pilot.press("g", *"9000C", "enter")
        entry = app.screen.query_one(PointEntry)
        problem = str(entry.query_one("#point-problem").render())
        assert entry.display and "9000 °C is outside this system's range, 327 to 1627 °C" in problem, problem    # in the screen's unit
        await pilot.press("escape", "g", *"C=8wt% 760C", "enter")    # the range in the screen's basis too
        problem = str(entry.query_one("#point-problem").render())
        assert "outside the range this model covers (0-6.69 wt% C, 0-25 at% C)" in problem, problem
        await pilot.press("escape")
        assert not entry.display and app.screen.focused is None
        await pilot.press("up")                    # the keys move the cursor again
        assert app.screen.exploration.cursor.temperature_K > 1250.0
