"""The carat-gold systems: au-cu.toml and ag-au-cu.toml (built on ag-au, ag-cu and au-cu).

Check values, each from outside the model:
- Muggianu's extrapolation (Y.-M. Muggianu, M. Gambino, J.-P. Bros, J. Chim. Phys. 72 (1975) 83)
  adds nothing on a binary edge of the triangle: the ternary without a ternary term must give the
  binary's liquidus, solidus and tie-lines there (to the solvers' precision);
- the Gibbs-Konovalov rule: where the liquidus of a binary has an extremum the liquid and the solid
  have one composition, so liquidus and solidus touch there and the liquidus rises on both sides
  (M. Hillert, Phase Equilibria, Phase Diagrams and Phase Transformations, 2nd ed., Cambridge
  (2008), section on extremum points); the Au-Cu minimum is 910 C at 44 at% Cu (H. Okamoto,
  D.J. Chakrabarti, D.E. Laughlin, T.B. Massalski, Bull. Alloy Phase Diagrams 8 (1987) 454);
- the fineness marks of ISO 9202: 18 carat is 750 and 14 carat 585 parts of gold per thousand by
  mass, so the shorthands named 18ct-... and 14ct-... hold 75.0 and 58.5 wt% Au;
- the ordered Au-Cu phases form below about 410 C (Okamoto et al. 1987): the files leave them out
  and cover only 420 C and above, so a question below that gets no answer;
- the fcc miscibility gap reaches into the ternary: an Au-55.2 at% Cu-17.4 at% Ag alloy aged at
  773 K hardens by nucleation and growth of a silver-rich precipitate (M. Nakagawa and K. Yasuda,
  J. Mater. Sci. 23 (1988) 2975, abstract), so at 773 K it lies in the two-solid field.
"""

from __future__ import annotations

import json

import numpy as np
import pytest

from ladle.engine import equilibrate, find_system
from ladle.engine.files.alloys import mole_fractions
from ladle.tui.cli import main

TERNARY, AU_CU, AG_CU = "ag-au-cu", "au-cu", "ag-cu"


@pytest.fixture(autouse=True)
def own_cache(monkeypatch, tmp_path):
    monkeypatch.setenv("XDG_CACHE_HOME", str(tmp_path / "cache"))
    monkeypatch.setenv("LADLE_SYSTEMS", str(tmp_path / "no-user-systems"))


def _melt(capsys, *args: str) -> dict:
    assert main(["melt", *args, "--json"]) == 0
    return json.loads(capsys.readouterr().out)


@pytest.mark.parametrize("cu_wt", [10.0, 25.0, 41.5])
def test_ternary_on_the_au_cu_edge_melts_as_the_binary(capsys, cu_wt):
    ternary = _melt(capsys, TERNARY, "--comp", f"Ag=0wt%,Cu={cu_wt}wt%")
    binary = _melt(capsys, AU_CU, "--comp", f"Cu={cu_wt}wt%")
    assert ternary["liquidus_K"] == pytest.approx(binary["liquidus_K"], abs=0.05)
    assert ternary["solidus_K"] == pytest.approx(binary["solidus_K"], abs=0.05)


def test_ternary_gap_on_the_ag_cu_edge_is_the_binary_solvus():
    T = 873.15   # 600 C, inside both files' covered ranges
    ternary = equilibrate(find_system(TERNARY), T, np.array([0.0, 0.5, 0.5]))
    binary = equilibrate(find_system(AG_CU), T, np.array([0.5, 0.5]))
    ternary_cu = sorted(p.x[2] for p in ternary.phases if p.name == "fcc")
    binary_cu = sorted(p.x[1] for p in binary.phases if p.name == "fcc")
    assert len(ternary_cu) == len(binary_cu) == 2
    assert ternary_cu == pytest.approx(binary_cu, abs=1e-4)


def test_au_cu_liquidus_and_solidus_touch_at_the_minimum(capsys):
    at_min = _melt(capsys, AU_CU, "--comp", "Cu=44at%")
    assert at_min["liquidus_K"] - at_min["solidus_K"] < 0.5          # the Gibbs-Konovalov rule
    assert at_min["liquidus_K"] == pytest.approx(910.0 + 273.15, abs=3.0)  # Okamoto et al. (1987)
    for side in ("Cu=34at%", "Cu=54at%"):
        assert _melt(capsys, AU_CU, "--comp", side)["liquidus_K"] > at_min["liquidus_K"] + 1.0


def test_carat_shorthands_carry_their_fineness():
    system = find_system(TERNARY)
    fineness = {"18ct": 0.750, "14ct": 0.585}   # ISO 9202: parts of gold per thousand by mass
    assert {a.name.split("-")[0] for a in system.alloys} == set(fineness)
    for alloy in system.alloys:
        x = np.array(mole_fractions(alloy.parts, alloy.basis, system.elements, system.molar_mass))
        mass = x * system.molar_mass
        assert mass[0] / mass.sum() == pytest.approx(fineness[alloy.name.split("-")[0]], abs=1e-9), alloy.name


@pytest.mark.parametrize("name, spec", [(AU_CU, "Cu=25wt%"), (TERNARY, "Ag=12.5wt%,Cu=12.5wt%")])
def test_no_answer_in_the_ordering_range(capsys, name, spec):
    with pytest.raises(SystemExit) as stop:
        main(["point", name, "--temp", "400C", "--comp", spec])
    assert stop.value.code == 2
    assert "outside the temperatures this model covers" in capsys.readouterr().err


def test_the_published_aged_alloy_separates_into_a_silver_rich_and_a_copper_rich_solid():
    system = find_system(TERNARY)                       # elements Au, Ag, Cu
    x = np.array([1.0 - 0.174 - 0.552, 0.174, 0.552])   # Nakagawa and Yasuda (1988), at%
    result = equilibrate(system, 773.15, x)
    solids = sorted((p for p in result.phases if p.name == "fcc"), key=lambda p: p.x[1])
    assert [p.name for p in result.phases] == ["fcc", "fcc"]
    copper_rich, silver_rich = solids
    assert silver_rich.x[1] > silver_rich.x[2] and copper_rich.x[2] > copper_rich.x[1]
    assert silver_rich.amount_mol < copper_rich.amount_mol   # the silver-rich phase is the precipitate
