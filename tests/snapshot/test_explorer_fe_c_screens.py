"""Golden-file snapshots at 80x24, as text, of the explorer on shipped systems drawn as isopleths:
the iron-cementite diagram with a 0.4 wt% C steel at 800 C (whole, and zoomed twice in ASCII: the
trade's lines A1, A3, Acm named, the steel's changes and austenitizing window in the status pane),
and Sn-Ag-Cu's isothermal section zoomed to the corner its model covers.

These pictures come from the shipped data (fe-c.toml, ag-cu-sn.toml and the files they build on):
a refit moves them. Read the new screens before rewriting them (LADLE_UPDATE_GOLDEN=1)."""

import pytest
from explorer_harness import SIZE, pilot_test, screen_text, section_app, status_text, until
from test_explorer_screens import assert_matches_golden

WAIT_S = 240.0    # mapping Fe-C or a ternary section on a loaded machine
CASES = [("fe-fe3c-steel", "fe-fe3c", ("g", *"0.4wt% 800C", "enter"), False),
         ("fe-fe3c-steel-zoomed-ascii", "fe-fe3c", ("g", *"0.4wt% 800C", "enter", "plus", "plus"), True),
         ("ag-cu-sn-triangle", "ag-cu-sn", ("i",), False)]


def _at_rest(app) -> bool:
    e = app.explore_screen.exploration
    shown = e.triangle if e.view == "triangle" else e.isopleth
    text = status_text(app)
    return shown is not None and "computing" not in text and "mapping" not in text


@pytest.mark.parametrize("name, system, keys, ascii_only", CASES, ids=[c[0] for c in CASES])
@pilot_test
async def test_screen_matches_its_golden_file(name, system, keys, ascii_only):
    app = section_app(system, ascii_only)
    async with app.run_test(size=SIZE) as pilot:
        await until(pilot, lambda: _at_rest(app), "the isopleth", WAIT_S)
        await pilot.press(*keys)
        await until(pilot, lambda: _at_rest(app), "what the keys asked for", WAIT_S)
        await pilot.pause()
        await pilot.pause()
        assert_matches_golden(name, screen_text(app))
