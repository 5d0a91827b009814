"""Moving the cursor by keys and by typed points; the status pane follows with the engine's
own numbers."""

import re

import pytest
from explorer_harness import SIZE, make_app, pilot_test, status_text

from ladle.engine import equilibrate
from ladle.tui.explorer.widgets.point_entry import PointEntry
from ladle.tui.quote import percent


def _point(app):
    cursor = app.screen_stack[0].exploration.cursor
    return cursor.temperature_K, cursor.x_B


@pilot_test
async def test_status_pane_shows_the_engines_equilibrium():
    app = make_app(T_K=500.0, x_B=0.5)
    async with app.run_test(size=SIZE):
        text = status_text(app)
        result = equilibrate(app.screen_stack[0].exploration.system, 500.0, 0.5)
        # 500 K = 226.85 C = 440.33 F by the definitions of the scales (NIST Special Publication
        # 811 (2008), Guide for the Use of the International System of Units).
        assert "226.9 °C  500.0 K  440.3 °F" in text
        # each phase by its structure name, with the trade's name from the file: fcc (Pb)
        assert "fcc (Pb) + liquid" in text and [s.name for s in result.phases] == ["fcc", "liquid"]
        for share in result.phases:
            assert re.search(rf"{share.name}( \(Pb\))?\s+{re.escape(percent(share.amount_mass))}\s+"
                             rf"{re.escape(percent(share.amount_mol))}", text)
            assert f"Sn {percent(share.w[1])} wt%  ({percent(share.x[1])} at%)" in text


@pilot_test
async def test_arrows_and_vi_keys_step_on_round_numbers():
    app = make_app(T_K=500.0, x_B=0.5)          # 226.85 C, 36.4 wt% Sn
    async with app.run_test(size=SIZE) as pilot:
        scales = app.screen_stack[0].exploration.scales
        await pilot.press("up")
        assert scales.shown_temperature(_point(app)[0]) == pytest.approx(230.0)
        await pilot.press("k", "j", "j")
        assert scales.shown_temperature(_point(app)[0]) == pytest.approx(220.0)
        await pilot.press("right", "l", "h")
        assert scales.shown_composition(_point(app)[1]) == pytest.approx(38.0)
        await pilot.press("shift+right", "L")
        assert scales.shown_composition(_point(app)[1]) == pytest.approx(38.4)
        await pilot.press("shift+down")
        assert scales.shown_temperature(_point(app)[0]) == pytest.approx(219.0)
        assert "219.0 °C" in status_text(app) and "Sn 38.4 wt%" in status_text(app)


@pilot_test
async def test_typed_point_moves_the_cursor():
    app = make_app(T_K=500.0, x_B=0.5)
    async with app.run_test(size=SIZE) as pilot:
        await pilot.press("g")
        await pilot.press(*"185C 40wt%", "enter")
        T_K, x_B = _point(app)
        assert T_K == pytest.approx(458.15)
        assert app.screen_stack[0].exploration.scales.shown_composition(x_B) == pytest.approx(40.0)
        assert not app.screen_stack[0].query_one(PointEntry).display
        assert "185.0 °C" in status_text(app)


@pilot_test
async def test_bad_typed_point_is_marked_with_the_reason_and_nothing_moves():
    app = make_app(T_K=500.0, x_B=0.5)
    async with app.run_test(size=SIZE) as pilot:
        await pilot.press("g", *"Cu=3wt%", "enter")
        entry = app.screen_stack[0].query_one(PointEntry)
        assert entry.display
        assert entry.query_one("#point-input").has_class("-bad")
        assert "not used: element Cu is not in this system (Pb-Sn)" in str(
            entry.query_one("#point-problem").render())
        assert _point(app) == (500.0, 0.5)
        await pilot.press("escape")
        assert not entry.display
        await pilot.press("up")                     # keys move the cursor again
        assert _point(app)[0] > 500.0


@pilot_test
async def test_points_outside_the_system_are_refused():
    app = make_app(T_K=500.0, x_B=0.5)
    async with app.run_test(size=SIZE) as pilot:
        app.screen_stack[0].query_one(PointEntry).open("Sn")
        await pilot.press(*"3000C", "enter")
        problem = str(app.screen_stack[0].query_one("#point-problem").render())
        assert "3000 °C is outside this system's range" in problem
        assert _point(app) == (500.0, 0.5)


def _number_after(label: str, text: str) -> float:
    match = re.search(rf"{label}\s+(-?\d+(?:\.\d+)?)", text)
    assert match, f"no {label} in the status pane:\n{text}"
    return float(match.group(1))


@pilot_test
async def test_a_40_60_solder_reads_as_the_handbooks_say():
    """Sn40 solder (40 wt% Sn, rest Pb) typed in at 185 C, just above the eutectic."""
    app = make_app(T_K=500.0, x_B=0.5)
    async with app.run_test(size=SIZE) as pilot:
        await pilot.press("g", *"185C Sn=40wt%", "enter")
        text = status_text(app)
        # ASTM B32 table of solder grades, grade Sn40: liquidus 238 C, solidus 183 C (the
        # values in the shipped system's checks); a model estimate within 5 C is accepted.
        assert _number_after("liquidus", text) == pytest.approx(238, abs=5)
        assert _number_after("solidus", text) == pytest.approx(183, abs=1)
        # T.B. Massalski (ed.), Binary Alloy Phase Diagrams, 2nd ed. (1990): the eutectic
        # liquid holds 61.9 wt% Sn, the Pb-rich fcc solid about 18-19 wt% Sn at 183 C.
        assert "fcc (Pb) + liquid" in text     # the trade writes the Pb-rich solid (Pb)
        liquid = re.search(r"liquid\s+[\d.]+\s+[\d.]+\n\s+Sn ([\d.]+) wt%", text)
        fcc = re.search(r"fcc \(Pb\)\s+[\d.]+\s+[\d.]+\n\s+Sn ([\d.]+) wt%", text)
        assert float(liquid.group(1)) == pytest.approx(61.9, abs=1.5)
        assert float(fcc.group(1)) == pytest.approx(18.5, abs=2.0)
        # Lever rule by hand with those handbook compositions: liquid share
        # (40 - 18.5) / (61.9 - 18.5) = 49.5 % of the mass.
        mass_liquid = re.search(r"liquid\s+([\d.]+)\s+[\d.]+", text)
        assert float(mass_liquid.group(1)) == pytest.approx(49.5, abs=4.0)
