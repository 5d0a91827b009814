"""Golden-file snapshots of the explorer's screens at 80x24, as text.

A snapshot is the screen's text (what a reader sees); colours are checked by the NO_COLOR
interaction test instead. After a deliberate change of the screens, rewrite the golden files
with LADLE_UPDATE_GOLDEN=1 pytest tests/snapshot, and read the difference before committing.
"""

import os
from pathlib import Path

import pytest
from explorer_harness import SIZE, make_app, pilot_test, screen_text

from ladle.tui.explorer.widgets.point_entry import PointEntry

GOLDEN = Path(__file__).parent / "golden"
UPDATE = os.environ.get("LADLE_UPDATE_GOLDEN") == "1"

# Each case: name, keys pressed after the start, ASCII only?, terminal size.
CASES = [
    ("diagram", (), False, SIZE),
    ("energy", ("2",), False, SIZE),
    ("reactions", ("3",), False, SIZE),
    ("cooling", ("4",), False, SIZE),
    ("help", ("question_mark",), False, SIZE),
    ("systems", ("s", *"pb-sn"), False, SIZE),
    ("entry-refused", ("g", *"Cu=3wt%", "enter"), False, SIZE),
    ("too-small", (), False, (72, 20)),
    ("diagram-ascii", (), True, SIZE),
    ("energy-ascii", ("2",), True, SIZE),
    ("help-ascii", ("question_mark",), True, SIZE),
    ("cooling-ascii", ("4",), True, SIZE),
]


def assert_matches_golden(name: str, text: str) -> None:
    """Compare with tests/snapshot/golden/NAME.txt (or write it, with LADLE_UPDATE_GOLDEN=1)."""
    path = GOLDEN / f"{name}.txt"
    if UPDATE:
        path.write_text(text, encoding="utf-8")
        return
    assert path.exists(), f"no golden file {path}; create it with LADLE_UPDATE_GOLDEN=1"
    assert text == path.read_text(encoding="utf-8"), f"screen {name} differs from {path}"


@pytest.mark.parametrize("name, keys, ascii_only, size", CASES, ids=[c[0] for c in CASES])
@pilot_test
async def test_screen_matches_its_golden_file(name, keys, ascii_only, size):
    # 183 C (456.15 K) and 40 wt% Sn: a Pb-Sn solder point just above the eutectic.
    app = make_app(T_K=458.15, x_B=0.5386, ascii_only=ascii_only)
    async with app.run_test(size=size) as pilot:
        if keys:
            await pilot.press(*keys)
        await app.workers.wait_for_complete()   # the picker counts passing checks in a thread
        await pilot.pause()
        assert_matches_golden(name, screen_text(app))


@pilot_test
async def test_snapshots_are_stable_between_runs():
    texts = []
    for _ in range(2):
        app = make_app(T_K=458.15, x_B=0.5386)
        async with app.run_test(size=SIZE) as pilot:
            app.screen_stack[0].query_one(PointEntry).open("Sn")
            await pilot.pause()
            texts.append((screen_text(app), app.export_screenshot(title="ladle")))
    assert texts[0] == texts[1]
