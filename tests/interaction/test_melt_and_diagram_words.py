"""Words a newcomer reads from `ladle melt`, `ladle diagram` and `ladle fit` (issue 10): where an
alloy lies against its eutectic, the pouring temperature from the person's own superheat, the
diagram's title line, and why a fit stopped."""

from __future__ import annotations

import json
import re

import numpy as np
import pytest
from scipy.optimize import least_squares

from ladle.tui.cli import main
from ladle.tui.commands.fit import stop_in_words


def _melt(capsys, *argv: str) -> str:
    assert main(["melt", *argv]) == 0
    return capsys.readouterr().out


# Al-Si: eutectic at 577 C and 12.6 wt% Si (T.B. Massalski (ed.), Binary Alloy Phase Diagrams,
# 2nd ed. (1990)); A356-type alloys (7 wt% Si) are hypoeutectic, piston alloys (18 wt%) hyper.
@pytest.mark.parametrize("si, words", [("7", "hypoeutectic: less Si than the eutectic"),
                                       ("18", "hypereutectic: more Si than the eutectic")])
def test_melt_says_which_side_of_the_eutectic(capsys, si, words):
    out = _melt(capsys, "al-si", "--comp", f"Si={si}wt%")
    assert words in out
    eutectic = re.search(r"the eutectic is ([\d.]+) wt% Si at ([\d.]+) °?C", out)
    assert float(eutectic.group(1)) == pytest.approx(12.6, abs=0.5)
    assert float(eutectic.group(2)) == pytest.approx(577.0, abs=2.0)


def test_melt_near_the_eutectic_and_with_a_superheat(capsys):
    # Pb-Sn eutectic at 61.9 wt% Sn (Massalski, 2nd ed. (1990)); the model's lies within 0.2 wt%
    out = _melt(capsys, "pb-sn", "--comp", "Sn=61wt%", "--superheat", "40C")
    assert re.search(r"^(near-eutectic, hypoeutectic|eutectic alloy)", out, re.MULTILINE)
    liquidus = float(re.search(r"liquidus +([\d.]+)", out).group(1))
    pouring = float(re.search(r"pouring +([\d.]+)", out).group(1))
    assert pouring == pytest.approx(liquidus + 40.0, abs=0.051)
    assert "your superheat of 40.0 °C (ladle advises none)" in out.replace("°", "°")
    assert re.search(r"freezing range +\d+\.\d °?C", out)          # a difference in the unit shown


def test_melt_json_has_the_eutectic_and_the_pouring_temperature(capsys):
    report = json.loads(_melt(capsys, "al-si", "--comp", "Si=7wt%", "--superheat", "108F", "--json"))
    assert report["eutectic"]["side"] == "hypo"
    assert report["superheat_K"] == pytest.approx(60.0, abs=1e-9)            # 108 F of difference = 60 K
    assert report["pouring_K"] == pytest.approx(report["liquidus_K"] + 60.0, abs=1e-9)


def test_an_alloy_without_a_eutectic_gets_no_eutectic_words(capsys):
    out = _melt(capsys, "cu-ni", "--comp", "Ni=30wt%")
    assert "eutectic" not in out


def test_diagram_title_line_is_not_blank_at_80_columns(capsys, monkeypatch):
    monkeypatch.setenv("COLUMNS", "80")
    monkeypatch.setenv("LINES", "24")
    assert main(["diagram", "sn-ag"]) == 0
    first, second = capsys.readouterr().out.split("\n")[:2]
    assert " ".join((first + " " + second).split()).startswith(
        "Tin-silver, tin-rich side (lead-free solders) (model covers 0-45 at% Ag only)")


def test_why_a_fit_stopped_in_the_reports_words():
    # the messages come from scipy itself, for a fit that settles and one cut short
    settled = least_squares(lambda x: x - 1.0, [0.0]).message
    cut_short = least_squares(lambda x: np.array([x[0] ** 2 + 1.0]), [3.0], max_nfev=2).message
    assert stop_in_words(settled) in ("chi-square is flat in every coefficient (a minimum)",
                                      "chi-square stopped changing", "the coefficients stopped changing",
                                      "chi-square and the coefficients both stopped changing")
    assert stop_in_words(cut_short) == "the step limit (--max-steps) was reached before the fit settled"
    assert stop_in_words("an unknown reason") == "an unknown reason"
