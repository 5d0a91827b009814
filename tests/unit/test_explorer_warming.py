"""Computing ahead for the next key: after `warm_neighbours`, a step left or right (coarse or
fine) finds its melt range cached."""

from __future__ import annotations

from ladle.engine import find_system
from ladle.tui.explorer.cursor import Cursor
from ladle.tui.explorer.exploration import Exploration


def test_a_step_after_warming_finds_its_melt_range_cached():
    e = Exploration(find_system("pb-sn"), cursor=Cursor(500.0, 0.3))
    e.reading()
    e.warm_neighbours()
    before = e._melt.cache_info()
    for d_composition in (1, -1):
        for fine in (False, True):
            probe = Exploration(e.system, e.scales, e.cursor)
            probe._melt = e._melt                # the same cache
            probe.window = e.window
            probe.move(0, d_composition, fine)
            probe.reading()
    after = e._melt.cache_info()
    assert after.misses == before.misses and after.hits >= before.hits + 4
