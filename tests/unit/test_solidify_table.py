"""The heat-list table (many alloys at once) against the one-alloy computations, and the
heat-list reader's pieces."""

from __future__ import annotations

import math

import numpy as np
import pytest

from synthetic import R, Solution, Synthetic, fusion

from ladle.engine import find_system
from ladle.engine.diagrams.melt import melt_range
from ladle.engine.solidify.paths import solidify
from ladle.engine.solidify.table import composition_table
from ladle.tui.errors import CommandError
from ladle.tui.heatlist import (blocks, composition_header, parse_block, parse_temperature_difference, percentages,
                                read_layout, scan_heat_list)


@pytest.mark.parametrize("name", ["pb-sn", "cu-zn", "al-cu"])
def test_table_agrees_with_melt_ranges_and_single_paths(name):
    system = find_system(name)
    lo, hi = system.covers
    x = np.linspace(max(lo, 1e-3), hi - 1e-3, 9)
    r = composition_table(system).evaluate(x, scheil=True)

    def same(table_value: float, single: float | None, tolerance: float) -> bool:
        """Equal within the tolerance, or both without an answer inside the window."""
        return math.isnan(table_value) if single is None else abs(table_value - single) <= tolerance

    for k, xk in enumerate(x):
        m = melt_range(system, float(xk))
        assert same(r.liquidus_K[k], m.liquidus_K, 1e-3)
        assert same(r.solidus_K[k], m.solidus_K, 1e-3)
        paths = solidify(system, float(xk))
        assert same(r.scheil_end_K[k], paths.scheil.end_K, 1e-6)
        eutectic = {p.model: sum(c.mass_fraction for c in p.constituents if c.name.startswith("eutectic"))
                    for p in (paths.equilibrium, paths.scheil)}
        assert r.eutectic_equilibrium[k] == pytest.approx(eutectic["equilibrium"], abs=1e-6)
        if paths.scheil.end_K is not None:
            assert r.eutectic_scheil[k] == pytest.approx(eutectic["scheil"], abs=1e-6)


def test_pure_elements_and_the_eutectic_composition():
    system = find_system("pb-sn")
    table = composition_table(system)
    inv = next(i for i in table.plateaus)
    x = np.array([0.0, 1.0, inv.liquid])
    r = table.evaluate(x, scheil=True)
    melting = system.melting_points
    assert r.liquidus_K[:2] == pytest.approx([melting["Pb"], melting["Sn"]], abs=1e-6)
    assert r.solidus_K[:2] == pytest.approx(r.liquidus_K[:2], abs=1e-9)
    assert list(r.eutectic_scheil[:2]) == [0.0, 0.0]
    assert r.freezing_range_K[2] == pytest.approx(0.0, abs=1e-3)
    assert r.eutectic_equilibrium[2] == pytest.approx(1.0, abs=1e-6)
    assert r.eutectic_scheil[2] == pytest.approx(1.0, abs=1e-6)


def test_no_answer_outside_the_mapped_window_is_nan(tmp_path):
    """A solid whose B end-member is never stable (x_S = k x_L with k = 0.2 everywhere): an
    alloy with 2 at% B freezes fully at equilibrium, but its Scheil liquid is still there at the
    bottom of the window, and an alloy with 99 at% B is liquid over the whole window."""
    liquid = Solution("liquid", fusion(10000.0, 1000.0), {})
    solid = Solution("fcc", {}, {"b": -R * math.log(0.2)})
    system = Synthetic([liquid, solid], (300.0, 1100.0)).load(tmp_path, "constant_k")
    r = composition_table(system).evaluate(np.array([0.02, 0.99]), scheil=True)
    assert 300.0 < r.solidus_K[0] < r.liquidus_K[0] < 1000.0
    assert r.eutectic_equilibrium[0] == 0.0
    assert math.isnan(r.scheil_end_K[0]) and math.isnan(r.eutectic_scheil[0])
    assert math.isnan(r.liquidus_K[1]) and math.isnan(r.solidus_K[1])


@pytest.mark.parametrize("cell, expected", [
    ("Si wt%", ("Si", "wt")), ("si (wt.%)", ("Si", "wt")), ("Al at%", ("Al", "at")), ("Si [mass%]", ("Si", "wt")),
    ("Fe wt%", None), ("Si", None), ("heat", None),
])
def test_composition_headers(cell, expected):
    assert composition_header(cell, ("Al", "Si")) == expected


@pytest.mark.parametrize("text, unit, kelvins", [("60C", "C", 60.0), ("60 K", "K", 60.0), ("108F", "F", 60.0),
                                                 ("60", "C", 60.0), ("108", "F", 60.0)])
def test_superheat_is_a_temperature_difference(text, unit, kelvins):
    default = "F" if text == "108" else "C"
    assert parse_temperature_difference(text, default) == (pytest.approx(kelvins), unit)


def _read(path, elements=("Al", "Si"), block_bytes=1 << 20):
    """(layout, [(line, cells, percent, reason)]) of a heat list read block by block."""
    scan = scan_heat_list(path, None)
    layout = read_layout(path, scan, elements)
    heats = []
    for block in blocks(path, layout.data_offset, layout.data_line, scan.size, block_bytes):
        rows = parse_block(layout, block.first_line, block.data)
        percent, reason = percentages(layout, rows)
        heats += [(int(rows.lines[k]), [str(c[k]) for c in rows.cells], None if math.isnan(percent[k, 0]) else float(percent[k, 0]),
                   str(reason[k]) or None) for k in range(rows.count)]
    return layout, heats


def test_reader_keeps_line_numbers_past_comments_and_quoted_cells(tmp_path):
    path = tmp_path / "h.csv"
    path.write_text('# invented\nheat,"Si wt%"\n"A, first",7.5\n\nB,x\n')
    layout, heats = _read(path)
    assert (layout.columns, layout.elements, layout.basis) == ((1,), ("Si",), "wt")
    assert heats == [(3, ["A, first", "7.5"], 7.5, None), (5, ["B", "x"], None, "Si wt% 'x' is not a number")]
    with pytest.raises(CommandError, match="not a text file"):
        (tmp_path / "b.csv").write_bytes(b"\xff\xfe\x00bad")
        scan_heat_list(tmp_path / "b.csv", None)


def test_blocks_end_at_row_ends_whatever_their_size(tmp_path):
    """Cut into blocks of any size, a list with CR LF and CR line ends, a quoted cell spanning
    two lines and comments reads the same rows on the same lines."""
    path = tmp_path / "h.csv"
    path.write_bytes(b'heat,Si wt%\r\nA,7\r\n"B\r\nsecond line",8\r\n# note\rC,9\rD,1,2\n\nE,\n')
    whole = _read(path)[1]
    assert [(h[0], h[1][0], h[2], h[3]) for h in whole] == [
        (2, "A", 7.0, None), (3, "B\nsecond line", 8.0, None), (6, "C", 9.0, None),
        (7, "D", None, "3 values but the header has 2 columns"), (9, "E", None, "no Si wt% value")]
    for size in (1, 2, 3, 5, 8, 13):
        assert _read(path, block_bytes=size)[1] == whole
