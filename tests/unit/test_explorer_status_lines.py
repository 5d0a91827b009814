"""The binary status pane's lines, made from an exploration with the cursor set directly: every
line fits the pane, and every distance names its unit."""

import pytest

from ladle.engine import find_system
from ladle.tui.explorer.cursor import Cursor
from ladle.tui.explorer.exploration import Exploration
from ladle.tui.explorer.glyphs import ASCII, UNICODE
from ladle.tui.explorer.scales import Scales
from ladle.tui.explorer.status_lines import WIDTH, boundary_lines, status_lines


def _exploration(system: str, T_K: float, x_B: float, temperature_unit: str = "C",
                 composition_unit: str = "wt") -> Exploration:
    loaded = find_system(system)
    return Exploration(loaded, Scales(loaded.molar_mass, temperature_unit, composition_unit),
                       Cursor(T_K, x_B))


@pytest.mark.parametrize("glyphs", [UNICODE, ASCII], ids=["unicode", "ascii"])
def test_a_near_pure_phase_keeps_its_composition_on_one_line(glyphs):
    # Al-Si at 287 C, 72 at% Si: (Al) + (Si), the silicon nearly pure (>99.999 in both units),
    # which made the phase's composition line 32 characters and wrap in the pane.
    e = _exploration("al-si", 560.1, 0.724)
    lines = status_lines(e.reading(), e.system, e.scales, glyphs)
    texts = [text for _, text in lines]
    assert any(">99.999 wt%" in text and ">99.999 at%)" in text for text in texts)
    assert all(len(text) <= WIDTH for text in texts), [t for t in texts if len(t) > WIDTH]


@pytest.mark.parametrize("unit, shown", [("C", "°C"), ("K", "K"), ("F", "°F")])
def test_the_distance_to_a_boundary_above_names_its_unit(unit, shown):
    # Pb-Sn, 36 wt% Sn at 220 C: the liquidus is 25 K above (ladle melt pb-sn --comp Sn=36wt%:
    # 245.2 C); a difference takes the temperatures' unit (45 in F).
    e = _exploration("pb-sn", 493.15, 0.495, temperature_unit=unit)
    text = " ".join(t for _, t in boundary_lines(e.reading(), "Sn", e.scales, UNICODE))
    gap = "45" if unit == "F" else "25"
    assert f"{gap} {shown} up" in text, text


def test_the_distance_to_a_boundary_across_names_its_unit():
    # Pb-Sn, 90 wt% Sn at 150 C: the (Sn) solvus at 97.7 wt% Sn lies 7.74 wt% to the right.
    e = _exploration("pb-sn", 423.15, 0.940)
    lines = boundary_lines(e.reading(), "Sn", e.scales, UNICODE)
    text = " ".join(t for _, t in lines)
    assert "solvus" in text and " wt% right" in text, text
    assert all(len(t) <= WIDTH for _, t in lines)
