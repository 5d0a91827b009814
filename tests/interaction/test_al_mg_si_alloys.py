"""The Al-Si-Mg casting alloys (systems/al-mg-si.toml) through `ladle transitions --json` and
`ladle cool --json`: the foundry's and the heat treater's questions.

Reference values:
- A356.0-T6 castings are solution treated at about 540 C (813 K) (ASM Handbook Vol. 4,
  Heat Treating (1991), aluminium alloy casting practice; recalled from memory: common
  practice), so the model's solution-treatment window must hold 540 C;
- the last liquid of an Al-Si-Mg casting alloy freezes in the ternary eutectic
  L = (Al) + (Si) + Mg2Si at 555 C (L.F. Mondolfo, Aluminum Alloys: Structure and Properties,
  Butterworths (1976); recalled from memory), far below the binary Al-Si eutectic at 577 C
  (J.L. Murray and A.J. McAlister, Bull. Alloy Phase Diagrams 5 (1984) 74).
"""

from __future__ import annotations

import json

import pytest

from ladle.tui.cli import main


@pytest.fixture(autouse=True)
def own_cache(monkeypatch, tmp_path):
    monkeypatch.setenv("XDG_CACHE_HOME", str(tmp_path / "cache"))
    monkeypatch.setenv("LADLE_SYSTEMS", str(tmp_path / "no-user-systems"))


def _json(args: list[str], capsys) -> dict:
    assert main(args + ["--json"]) == 0
    return json.loads(capsys.readouterr().out)


def test_a356_solution_window_holds_the_trades_540_c(capsys):
    out = _json(["transitions", "al-mg-si", "--alloy", "A356.0"], capsys)
    window = out["heat_treatment_window"]
    assert window is not None
    assert window["low_K"] < 813.15 < window["high_K"], window
    assert window["high_is"] == "Scheil end"          # incipient melting of the cast structure bounds it
    assert set(window["phases"]) == {"fcc", "diamond"}  # (Si) stays undissolved


def test_a356_scheil_end_is_the_ternary_eutectic_far_below_the_binary_one(capsys):
    out = _json(["cool", "al-mg-si", "--alloy", "A356.0"], capsys)
    end_C = out["scheil"]["end_K"] - 273.15
    assert abs(end_C - 555.0) <= 3.0, end_C              # the invariant's 3 K tolerance
    assert 577.0 - end_C > 15.0
