"""The Al-Si-Mg casting alloys (systems/al-mg-si.toml) through `ladle transitions --json` and
`ladle cool --json`: the foundry's and the heat treater's questions.

Reference values:
- A356.0-T6 castings are solution treated at about 540 C (813 K) (ASM Handbook Vol. 4,
  Heat Treating (1991), aluminium alloy casting practice; recalled from memory: common
  practice), so the model's solution-treatment window must hold 540 C;
- the last liquid of an Al-Si-Mg casting alloy freezes in the ternary eutectic
  L = (Al) + (Si) + Mg2Si at 555 C (L.F. Mondolfo, Aluminum Alloys: Structure and Properties,
  Butterworths (1976); recalled from memory), far below the binary Al-Si eutectic at 577 C
  (J.L. Murray and A.J. McAlister, Bull. Alloy Phase Diagrams 5 (1984) 74);
- at room temperature all of an A356.0's magnesium is tied up in Mg2Si: by mass balance (a closed
  form) 0.35 wt% Mg makes 0.35 x M(Mg2Si) / (2 M(Mg)) = 0.552 wt% Mg2Si (IUPAC 2013 atomic weights);
- the (Al) of the model dissolves 1.89 wt% Mg2Si at 583.5 C; J. Zhang et al., Mater. Sci. Technol.
  17 (2001) 494 give 1.91 wt%. The (Al) ternary term of the file was set with that value in view, so
  this is a fit target guarded (within a factor of 1.5, a dilute solubility), not a validation.
"""

from __future__ import annotations

import json
import re

import numpy as np
import pytest

from ladle.engine import find_system
from ladle.engine.files.loader import load_system, shipped_folder
from ladle.engine.minimize.equilibrium import equilibrate
from ladle.tui.cli import main

MOLAR_MASS = {"Al": 26.9815385, "Mg": 24.305, "Si": 28.085}     # g/mol, IUPAC 2013


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


def test_all_magnesium_is_mg2si_at_room_temperature(capsys):
    out = _json(["point", "al-mg-si", "--alloy", "A356.0", "--temp", "25C"], capsys)
    amounts = {p["name"]: p["phase_fraction_mass"] for p in out["phases"]}
    expected = 0.0035 * (2 * MOLAR_MASS["Mg"] + MOLAR_MASS["Si"]) / (2 * MOLAR_MASS["Mg"])
    assert amounts["Mg2Si"] == pytest.approx(expected, rel=0.01)


def _quasi_binary(w_mg2si: float) -> np.ndarray:
    """Mole fractions (Al, Mg, Si) of Al with `w_mg2si` wt% Mg2Si."""
    m = 2 * MOLAR_MASS["Mg"] + MOLAR_MASS["Si"]
    w = {"Al": 100.0 - w_mg2si, "Mg": w_mg2si * 2 * MOLAR_MASS["Mg"] / m, "Si": w_mg2si * MOLAR_MASS["Si"] / m}
    n = np.array([w[e] / MOLAR_MASS[e] for e in ("Al", "Mg", "Si")])
    return n / n.sum()


def test_al_takes_up_mg2si_as_the_quasi_binary_section_says():
    system, T = find_system("al-mg-si"), 583.5 + 273.15
    assert equilibrate(system, T, _quasi_binary(1.91 / 1.5)).phase_names == ("fcc",)
    assert "Mg2Si" in equilibrate(system, T, _quasi_binary(1.91 * 1.5)).phase_names


def test_no_second_al_phase_anywhere_in_the_covered_corner():
    """The (Al) ternary term is large: the file declares no miscibility gap, so no phase may
    appear twice over the covered corner from 300 to 1000 K."""
    system = find_system("al-mg-si")
    for T in np.arange(300.0, 1001.0, 100.0):
        for mg in np.linspace(0.001, 0.12, 5):
            for si in np.linspace(0.001, 0.16, 6):
                names = equilibrate(system, float(T), np.array([1.0 - mg - si, mg, si])).phase_names
                assert len(set(names)) == len(names), (T, mg, si, names)


# A binary shared by two shipped systems is one file: a change to al-si.toml or mg-si.toml changes
# al-mg-si too. Check value: the equilibrium Gibbs energy is the minimum over states of functions
# linear in a coefficient c, so raising c by d changes G by between d times its derivative at the
# state before and d times that after (the envelope theorem; M. Hillert, Phase Equilibria, Phase
# Diagrams and Phase Transformations, 2nd ed. (2008), ch. 2: G as a minimum at fixed T and
# composition). The derivative is the compound's amount (moles of atoms per mole of alloy) for its
# formation energy, and sum over (Al) of amount x_Al x_Si for (Al)'s Al-Si L[0].
CHANGE_J = -1500.0


def _compound(eq, name: str) -> float:
    return sum(p.amount_mol for p in eq.phases if p.name == name)


def _al_si_pairs(eq) -> float:
    return sum(p.amount_mol * p.x[0] * p.x[2] for p in eq.phases if p.name == "fcc")


@pytest.mark.parametrize("binary, anchor, derivative", [
    ("mg-si", r"formation = \{ a = (-?[0-9.]+)", lambda eq: _compound(eq, "Mg2Si")),
    ("al-si", r"(?m)^L = \[ \{ a = (-3201\.[0-9]+)", _al_si_pairs),
])
def test_a_change_to_a_shared_binary_changes_al_mg_si(tmp_path, binary, anchor, derivative):
    shipped = shipped_folder()
    text = (shipped / f"{binary}.toml").read_text(encoding="utf-8")
    changed, count = re.subn(anchor, lambda m: m.group(0).replace(m.group(1), repr(float(m.group(1)) + CHANGE_J)), text)
    assert count == 1
    (tmp_path / f"{binary}.toml").write_text(changed, encoding="utf-8")
    (tmp_path / "al-mg-si.toml").write_text((shipped / "al-mg-si.toml").read_text(encoding="utf-8"), encoding="utf-8")
    x, T = np.array([0.925, 0.005, 0.07]), 700.0       # Al-0.5 at% Mg-7 at% Si: (Al) + (Si) + Mg2Si
    before = equilibrate(load_system(shipped / "al-mg-si.toml"), T, x)
    after = equilibrate(load_system(tmp_path / "al-mg-si.toml"), T, x)
    assert before.converged and after.converged and derivative(before) > 1e-4
    drop = after.gibbs_J_per_mol - before.gibbs_J_per_mol
    bounds = sorted((CHANGE_J * derivative(before), CHANGE_J * derivative(after)))
    assert bounds[0] - 1e-6 <= drop <= bounds[1] + 1e-6 and drop < 0.0
