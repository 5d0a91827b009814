"""Numbers as people read them (issue 10): three significant figures, no numerical noise, no
'-0.0', and one convention for temperature differences."""

from __future__ import annotations

import pytest

from ladle.tui.quote import percent, temperature, temperature_difference


@pytest.mark.parametrize("fraction, shown", [
    (0.40, "40.0"), (0.0251, "2.51"), (0.008, "0.800"), (0.00769, "0.769"), (0.0999999999, "10.0"),
    (3.4e-11, "<0.001"), (1e-14, "0"), (0.999999999966, ">99.999"), (0.9998, "99.98"), (0.9, "90.0"),
])
def test_percent_has_three_significant_figures_and_no_noise(fraction, shown):
    assert percent(fraction) == shown


def test_no_minus_zero_temperature():
    assert temperature(273.10, "C").lstrip("-") == temperature(273.10, "C")   # -0.05 C shows as 0.0
    assert temperature(273.10, "K") == "273.1 K"


def test_a_difference_is_in_the_unit_of_the_temperatures():
    # a difference of 1 K is 1 C and 1.8 F (NIST Special Publication 811 (2008))
    assert temperature_difference(40.0, "K") == "40.0 K"
    assert temperature_difference(40.0, "C").endswith("40.0 °C") or temperature_difference(40.0, "C") == "40.0 C"
    assert temperature_difference(40.0, "F").startswith("72.0 ")
