"""The explorer's cooling view as a user drives it: key 4 shows both paths of the cursor's alloy,
the status pane gives where each path's freezing ends and the structure at the end, and moving
the cursor in temperature keeps the computed paths."""

from __future__ import annotations

import re

from explorer_harness import SIZE, make_app, pilot_test, screen_text, status_text

from ladle.engine import find_system
from ladle.engine.solidify.paths import solidify
from ladle.tui.explorer.cooling import CoolingView
from ladle.tui.quote import percent

X_PB_10SN = 0.1624346   # Pb-10 wt% Sn (mole fraction of Sn), inside the (Pb) solid solution


@pilot_test
async def test_cooling_view_shows_both_ends_and_the_structure():
    app = make_app(T_K=520.0, x_B=X_PB_10SN)
    async with app.run_test(size=SIZE) as pilot:
        await pilot.press("4")
        await app.workers.wait_for_complete()
        await pilot.pause()
        status = status_text(app)
        expected = solidify(find_system("pb-sn"), X_PB_10SN)
        assert "FREEZING of this alloy" in status
        # equilibrium: (Pb) alone, ending at the solidus; Scheil: some eutectic at 183 C (the Pb-Sn
        # eutectic: T.B. Massalski (ed.), Binary Alloy Phase Diagrams, 2nd ed. (1990))
        assert re.search(rf"equilibrium +{expected.equilibrium.end_K - 273.15:.0f} °C solidus", status)
        assert re.search(r"Scheil +183 °C eutectic", status)
        eutectic = next(c for c in expected.scheil.constituents if c.name.startswith("eutectic"))
        assert " eutectic fcc (Pb) + bct (Sn)" in status and percent(eutectic.mass_fraction) in status
        heats = [f"{p.latent_heat_J_per_g:.0f}" for p in (expected.equilibrium, expected.scheil)]
        assert re.search(rf"latent heat J/g +{heats[0]} +{heats[1]}", status)
        # coring of the (Pb) dendrites: the rim reaches about the largest solubility of Sn in (Pb),
        # 18.3 wt% at the eutectic (T.B. Massalski (ed.), Binary Alloy Phase Diagrams, 2nd ed. (1990))
        core, rim = re.search(r"core ([\d.]+) +rim ([\d.]+) Sn wt%", status).groups()
        assert float(core) < float(rim) and abs(float(rim) - 18.3) < 1.0
        screen = screen_text(app)
        assert "[4 cooling]" in screen
        assert "solid, mass % of the alloy" in screen and "T °C" in screen


@pilot_test
async def test_moving_in_temperature_keeps_the_paths_and_composition_recomputes():
    app = make_app(T_K=520.0, x_B=X_PB_10SN)
    async with app.run_test(size=SIZE) as pilot:
        await pilot.press("4")
        await app.workers.wait_for_complete()
        view = app.screen_stack[0].query_one(CoolingView)
        first = view.answer()
        await pilot.press("up", "up", "down")
        await pilot.pause()
        assert view.answer() is first and all(w.is_finished for w in app.workers)
        await pilot.press("right")
        await app.workers.wait_for_complete()
        await pilot.pause()
        assert view.answer() is not first and view.answer().x_B != first.x_B
        assert "FREEZING of this alloy" in status_text(app)


# An invented system (A melts at 1000 K; solid B is never stable, so B-rich liquids stay liquid
# through the whole window): an alloy with 99 at% B has no liquidus inside the window.
NEVER_FREEZES = """
elements = ["Al", "Si"]
molar_mass = { Al = 27.0, Si = 28.0 }
source = "Invented for the tests"
temperature_range_K = [300, 1100]
[phase.liquid]
model = "solution"
G.Al = [ { upto = 4000, a = 10000.0, b = -10.0 } ]
G.Si = [ { upto = 4000 } ]
[phase.fcc]
model = "solution"
G.Al = [ { upto = 4000 } ]
G.Si = [ { upto = 4000, b = 13.38 } ]
"""


@pilot_test
async def test_an_alloy_without_paths_says_why(tmp_path):
    path = tmp_path / "never-freezes.toml"
    path.write_text(NEVER_FREEZES)
    app = make_app(str(path), T_K=700.0, x_B=0.99)
    async with app.run_test(size=SIZE) as pilot:
        await pilot.press("4")
        await app.workers.wait_for_complete()
        await pilot.pause()
        assert "no answer: no liquidus for this alloy inside the mapped window" in status_text(app)
        assert "no cooling path (see the status pane)" in screen_text(app)


@pilot_test
async def test_how_each_path_ends_is_never_cut():
    """Cu-50 wt% Ni (shipped cu-ni, a complete solid solution): the Scheil liquid runs to pure
    copper and the status pane says so in full, 'last liquid', where it showed 'last liq' (the
    line was cut at the pane's width); at 4-digit temperatures in F the equilibrium's 'solidus'
    keeps its line too."""
    x_ni = 0.5 / 58.6934 / (0.5 / 58.6934 + 0.5 / 63.546)      # 50 wt% Ni as a mole fraction
    app = make_app("cu-ni", T_K=1500.0, x_B=x_ni, temperature_unit="F")
    async with app.run_test(size=SIZE) as pilot:
        await pilot.press("4")
        await app.workers.wait_for_complete()
        await pilot.pause()
        lines = [line.strip() for line in status_text(app).splitlines()]
        scheil = next(i for i, line in enumerate(lines) if line.startswith("Scheil "))
        assert re.fullmatch(r"Scheil +\d+ °F", lines[scheil]) and lines[scheil + 1] == "last liquid", lines
        assert any(re.fullmatch(r"equilibrium +\d+ °F solidus", line) for line in lines), lines
