"""`ladle diagram SYSTEM` for a ternary without --temp, --comp or --vary: the liquidus projection
drawn on the triangle (valleys, invariant points, primary fields labelled) with the four-phase
reactions listed, or --json; on the invented ideal ternary eutectic of tests/unit/ideal_ternaries.py
read as a system file (its closed forms are checked in tests/unit/test_liquidus_projection.py)."""

from __future__ import annotations

import json
import sys
from pathlib import Path

import pytest

sys.path.insert(0, str(Path(__file__).resolve().parent))
sys.path.insert(0, str(Path(__file__).resolve().parents[1] / "unit"))

import ideal_ternaries as it  # noqa: E402
from test_line_commands import run  # noqa: E402,F401  (shared fixture)


@pytest.fixture
def ternary_file(tmp_path) -> str:
    return str(it.write_system_files(tmp_path)["ideal-eutectic"])


def test_projection_is_drawn_and_listed(run, ternary_file):
    code, out, err = run("diagram", ternary_file, "--ascii", "--unit", "K")
    assert code == 0 and err == "", err
    assert out.isascii()
    for name in ("Pb", "Sn", "Bi", "alpha", "beta", "gamma"):        # corners and primary fields
        assert name in out
    # 558.39 K: a_A + a_B + a_C = 1 (ideal_ternaries' closed form)
    assert "eutectic" in out and "558.4 K" in out and "liquid -> alpha + beta + gamma" in out
    assert max(len(line) for line in out.splitlines()) <= 120


def test_projection_json(run, ternary_file):
    code, out, err = run("diagram", ternary_file, "--json")
    assert code == 0 and err == ""
    js = json.loads(out)
    assert [r["kind"] for r in js["invariants"]] == ["eutectic"]
    assert js["invariants"][0]["temperature_K"] == pytest.approx(558.39088, abs=1e-4)
    assert len(js["valleys"]) == 3


def test_four_solid_invariants_are_listed_and_in_the_json(run, tmp_path):
    """ideal_ternaries.FOUR_SOLIDS_FILE: its exchange reaction at 500 K (closed form there) is in
    the listing and among the JSON's invariants with its kind and phases."""
    path = str(it.write_four_solids_file(tmp_path))
    code, out, err = run("diagram", path, "--ascii", "--unit", "K")
    assert code == 0 and err == ""
    assert "invariant reactions of four solids:" in out and "quasi-peritectoid" in out
    assert "500.0 K  PbBi + beta -> PbSn + gamma" in out
    code, out, err = run("diagram", path, "--json")
    [reaction] = json.loads(out)["invariants"]
    assert reaction["kind"] == "quasi-peritectoid" and reaction["temperature_K"] == pytest.approx(500.0, abs=1e-5)
    assert {p["name"] for p in reaction["phases"]} == {"PbBi", "PbSn", "beta", "gamma"}


def test_the_reactions_carry_the_trade_names_the_file_gives(run, ternary_file):
    """A file's trade names stand beside the structure names in the listed reactions, as on the
    other commands' tables (the reactions listed 'liquid -> alpha + beta + gamma' whatever the
    file called its phases)."""
    path = Path(ternary_file)
    path.write_text('trade_names = { alpha = "(Pb)", gamma = "eta" }\n' + path.read_text(encoding="utf-8"),
                    encoding="utf-8")
    code, out, err = run("diagram", str(path), "--ascii", "--unit", "K")
    assert code == 0 and err == "", err
    assert "558.4 K  liquid -> alpha (Pb) + beta + gamma (eta)  (liquid " in out
