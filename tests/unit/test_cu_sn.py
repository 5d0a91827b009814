"""Copper-tin: one model in two files. sn-cu.toml (the solders' tin-rich side) holds the liquid over
the whole range, (Cu) and Cu6Sn5; cu-sn.toml (the bronzes' copper-rich side) builds on it and adds
beta/gamma, delta and epsilon.

Check values: the liquid's excess Gibbs energy is the Redlich-Kister sum written out by hand
(O. Redlich and A.T. Kister, Ind. Eng. Chem. 40 (1948) 345); a change of L[0] by d changes the
liquid's G by x_Cu x_Sn d exactly; the shipped fits are what `ladle fit` gives again from the
shipped files (their [fit_report] is true).
"""

from __future__ import annotations

import math

import numpy as np
import pytest

from ladle.engine.checking.boundaries import boundary_temperature
from ladle.engine.files.catalog import find_system
from ladle.engine.files.loader import load_system, shipped_folder
from ladle.engine.fitting.fit import fit
from ladle.tui.cli import main
from shipped_copies import with_liquid_L0_changed

R = 8.314462618  # J/(mol K), CODATA 2018, as the engine uses
CHANGE_J = -2000.0  # J/mol added to sn-cu's liquid L[0] in the changed copy
T_K = 1300.0


def _liquid_excess(system, T: float, x_sn: float) -> float:
    """G of the liquid minus its pure-element line and ideal mixing (J/mol) at x_Sn, T."""
    sn_first = system.elements[0] == "Sn"
    xa, xb = (x_sn, 1.0 - x_sn) if sn_first else (1.0 - x_sn, x_sn)
    at = system.phases["liquid"].at(T)
    g = float(at.gibbs(np.array(xa), np.array(xb)))
    ideal = R * T * (xa * math.log(xa) + xb * math.log(xb))
    return g - xa * at.g0a - xb * at.g0b - ideal


def _excess_by_hand(T: float, x_sn: float) -> float:
    """x_Sn x_Cu sum_k L[k](T) (x_Sn - x_Cu)^k from sn-cu.toml's own numbers."""
    L = find_system("sn-cu").document["phase"]["liquid"]["L"]
    x_cu = 1.0 - x_sn
    return x_sn * x_cu * sum((c.get("a", 0.0) + c.get("b", 0.0) * T) * (x_sn - x_cu) ** k for k, c in enumerate(L))


@pytest.mark.parametrize("x_sn", [0.05, 0.25, 0.6, 0.97])
def test_both_files_have_the_one_liquid_of_sn_cu(x_sn):
    by_hand = _excess_by_hand(T_K, x_sn)
    for name in ("sn-cu", "cu-sn"):
        assert _liquid_excess(find_system(name), T_K, x_sn) == pytest.approx(by_hand, abs=1e-6), name


def test_the_bronze_phases_stay_out_of_the_solder_systems():
    assert set(find_system("cu-sn").phases) == {"liquid", "fcc", "bct", "Cu6Sn5", "bcc", "Cu41Sn11", "Cu3Sn"}
    for name in ("sn-cu", "ag-cu-sn"):
        assert not {"bcc", "Cu41Sn11", "Cu3Sn"} & set(find_system(name).phases), name


@pytest.fixture
def changed(tmp_path):
    """A folder with sn-cu.toml's liquid L[0] lowered by CHANGE_J and cu-sn.toml copied beside it."""
    return with_liquid_L0_changed(tmp_path, "sn-cu", CHANGE_J, ("cu-sn",))


def test_a_change_to_sn_cu_changes_the_bronzes(changed):
    before, after = find_system("cu-sn"), load_system(changed / "cu-sn.toml")
    for x_sn in (0.06, 0.2):
        drop = _liquid_excess(after, T_K, x_sn) - _liquid_excess(before, T_K, x_sn)
        assert drop == pytest.approx(x_sn * (1.0 - x_sn) * CHANGE_J, abs=1e-6)
    # a more stable melt freezes lower: the liquidus of a 10 % tin bronze (5.61 at% Sn) drops
    x = 0.0561
    t_before = boundary_temperature(before, x, "liquidus").temperature_K
    t_after = boundary_temperature(after, x, "liquidus").temperature_K
    assert t_after < t_before - 1.0


@pytest.mark.parametrize("name", ["sn-cu", "cu-sn"])
def test_the_shipped_fit_is_what_ladle_fit_gives_again(tmp_path, name):
    shipped = shipped_folder()
    for f in ("sn-cu.toml", "cu-sn.toml"):
        (tmp_path / f).write_text((shipped / f).read_text(encoding="utf-8"), encoding="utf-8")
    system = load_system(tmp_path / f"{name}.toml")
    result = fit(system)
    assert result.acceptable, result.problems
    assert result.degrees_of_freedom >= 2
    report = system.document["fit_report"]
    assert result.chi_square == pytest.approx(report["chi_square"], rel=1e-3)
    for p in result.parameters:
        shipped_value = report["parameters"][p.path]["value"]
        assert abs(p.value - shipped_value) <= 0.05 * p.uncertainty, p.path
        assert p.uncertainty < abs(p.value), p.path


def test_a_bronze_by_its_uns_designation(capsys):
    assert main(["melt", "cu-sn", "--alloy", "c90700"]) == 0
    out = capsys.readouterr().out
    assert "Sn 11.0 wt%" in out and "liquidus" in out
    with pytest.raises(SystemExit) as e:
        main(["melt", "cu-sn", "--alloy", "C95400"])
    assert e.value.code == 2
    err = capsys.readouterr().err
    assert err.count("\n") == 1 and all(n in err for n in ("C51000", "C52100", "C90700", "C90900"))
