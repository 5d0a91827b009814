"""Unit conversions on screen: checked against hand calculation from the molar masses."""

import numpy as np
import pytest

from ladle.tui.explorer.scales import Scales

# Molar masses, g/mol: IUPAC standard atomic weights (Pb 207.2, Sn 118.71).
PB_SN = np.array([207.2, 118.71])


def test_wt_percent_of_the_eutectic_composition():
    # 73.9 at% Sn: mass of Sn 0.739*118.71 = 87.727; of Pb 0.261*207.2 = 54.079;
    # wt% Sn = 87.727 / 141.806 = 61.86 % (by hand).
    scales = Scales(PB_SN, "C", "wt")
    assert scales.shown_composition(0.739) == pytest.approx(61.864, abs=1e-3)
    assert scales.engine_composition(61.864) == pytest.approx(0.739, abs=1e-5)


def test_arrays_convert_like_floats():
    scales = Scales(PB_SN, "F", "wt")
    x = np.array([0.0, 0.25, 0.739, 1.0])
    assert np.allclose(scales.shown_composition(x), [scales.shown_composition(v) for v in x])
    T = np.array([273.15, 373.15])
    assert np.allclose(scales.shown_temperature(T), [32.0, 212.0])
    assert np.allclose(scales.engine_temperature(np.array([32.0, 212.0])), T)


def test_temperature_differences_in_fahrenheit_are_nine_fifths():
    assert Scales(PB_SN, "F").shown_temperature_difference(10.0) == pytest.approx(18.0)
    assert Scales(PB_SN, "C").shown_temperature_difference(10.0) == pytest.approx(10.0)


def test_units_cycle():
    scales = Scales(PB_SN)
    units = [scales.temperature_unit]
    for _ in range(3):
        scales = scales.next_temperature_unit()
        units.append(scales.temperature_unit)
    assert units == ["C", "K", "F", "C"]
    assert scales.next_composition_unit().composition_unit == "at"
    assert scales.next_composition_unit().next_composition_unit().composition_unit == "wt"
