"""Cursor steps and view windows of the explorer (pure arithmetic, no screen)."""

import numpy as np
import pytest

from ladle.tui.explorer.cursor import Cursor, Steps, Window, nice_step, step_on_grid, steps_for
from ladle.tui.explorer.scales import Scales

PB_SN = np.array([207.2, 118.71])   # g/mol; the molar masses of the shipped Pb-Sn file
LIMITS = Window(300.0, 700.0, 0.0, 1.0)


@pytest.mark.parametrize("span, steps, expected", [
    (350.0, 30, 10.0), (100.0, 50, 2.0), (0.7, 10, 0.05), (1.0, 1, 1.0), (14.0, 2, 5.0),
])
def test_nice_step_is_one_two_or_five_times_a_power_of_ten(span, steps, expected):
    assert nice_step(span, steps) == pytest.approx(expected)


def test_step_on_grid_lands_on_round_numbers_and_always_moves():
    assert step_on_grid(183.2, 5.0, +1) == pytest.approx(185.0)
    assert step_on_grid(183.2, 5.0, -1) == pytest.approx(180.0)
    assert step_on_grid(185.0, 5.0, +1) == pytest.approx(190.0)
    assert step_on_grid(185.0, 5.0, -1) == pytest.approx(180.0)
    assert step_on_grid(0.3, 0.1, +1) == pytest.approx(0.4)   # no floating-point stall


def test_moving_in_wt_percent_lands_on_round_wt_percent():
    scales = Scales(PB_SN, "C", "wt")
    cursor = Cursor(500.0, 0.5)                       # 36.4 wt% Sn
    moved = cursor.moved(0, +1, Steps(10.0, 2.0), scales, LIMITS)
    assert scales.shown_composition(moved.x_B) == pytest.approx(38.0)
    assert moved.temperature_K == cursor.temperature_K


def test_moving_in_celsius_lands_on_round_celsius():
    scales = Scales(PB_SN, "C", "wt")
    moved = Cursor(500.0, 0.5).moved(+1, 0, Steps(10.0, 2.0), scales, LIMITS)
    assert scales.shown_temperature(moved.temperature_K) == pytest.approx(230.0)


def test_moves_stop_at_the_limits():
    scales = Scales(PB_SN, "K", "at")
    cursor = Cursor(699.0, 0.995)
    moved = cursor.moved(+1, +1, Steps(10.0, 2.0), scales, LIMITS)
    assert (moved.temperature_K, moved.x_B) == (700.0, 1.0)


def test_zoom_halves_about_the_cursor_and_stays_inside():
    zoomed = LIMITS.zoomed(0.5, 320.0, 0.5, LIMITS)
    assert zoomed.T_high - zoomed.T_low == pytest.approx(200.0)
    assert zoomed.T_low == pytest.approx(300.0)            # pushed back inside
    assert zoomed.x_low == pytest.approx(0.25) and zoomed.x_high == pytest.approx(0.75)
    assert zoomed.zoomed(4.0, 320.0, 0.5, LIMITS) == LIMITS  # never larger than the system


def test_window_follows_a_cursor_that_leaves_it():
    window = Window(400.0, 500.0, 0.2, 0.4)
    moved = window.following(510.0, 0.1)
    assert moved.T_high == pytest.approx(510.0) and moved.T_low == pytest.approx(410.0)
    assert moved.x_low == pytest.approx(0.1) and moved.x_high == pytest.approx(0.3)
    assert window.following(450.0, 0.3) == window


def test_steps_follow_the_window_and_the_units():
    scales = Scales(PB_SN, "C", "wt")
    coarse, fine = steps_for(LIMITS, scales, False), steps_for(LIMITS, scales, True)
    assert coarse == Steps(10.0, 2.0)
    assert fine.temperature == pytest.approx(1.0) and fine.composition == pytest.approx(0.2)
    in_fahrenheit = steps_for(LIMITS, Scales(PB_SN, "F", "wt"), False)
    assert in_fahrenheit.temperature == pytest.approx(20.0)   # 400 K = 720 F; 720/30 -> 20
