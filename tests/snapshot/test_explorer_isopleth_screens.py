"""Golden-file snapshots of the explorer on a system of three elements, at 80x24, as text: the
isopleth (Unicode and ASCII) and the isothermal section on the triangle. The system is the
invented ideal ternary eutectic of tests/unit/ideal_ternaries.py, with its closed-form
equilibria (so the pictures do not move with the engine's numerics)."""

import sys
from pathlib import Path

import pytest
from explorer_harness import SIZE, THEME, pilot_test, screen_text
from test_explorer_screens import assert_matches_golden

sys.path.insert(0, str(Path(__file__).resolve().parents[1] / "unit"))

import ideal_ternaries as it  # noqa: E402

from ladle.engine.diagrams import isopleth, isothermal  # noqa: E402
from ladle.tui.explorer import section_exploration  # noqa: E402
from ladle.tui.explorer.app import ExplorerApp  # noqa: E402
from ladle.tui.explorer.glyphs import glyphs_for  # noqa: E402
from ladle.tui.explorer.section_exploration import SectionExploration  # noqa: E402

CASES = [("isopleth", (), False), ("isopleth-ascii", (), True), ("isopleth-triangle", ("i",), False)]


@pytest.mark.parametrize("name, keys, ascii_only", CASES, ids=[c[0] for c in CASES])
@pilot_test
async def test_screen_matches_its_golden_file(monkeypatch, name, keys, ascii_only):
    system = it.eutectic_system()
    solve = it.equilibrate_for(system)
    for module in (isopleth, isothermal, section_exploration):
        monkeypatch.setattr(module, "equilibrate", solve)
    app = ExplorerApp(SectionExploration(system, temperature_K=700.0), glyphs_for(ascii_only), None)
    app.theme = THEME
    async with app.run_test(size=SIZE) as pilot:
        await app.workers.wait_for_complete()
        if keys:
            await pilot.press(*keys)
            await app.workers.wait_for_complete()
        await pilot.pause()
        await pilot.pause()
        assert_matches_golden(name, screen_text(app))
