"""A binary shared by two shipped systems is one file: sn-ag.toml is the Sn-Ag binary and also the
Sn-Ag part of ag-cu-sn.toml (through builds_on). A copy of sn-ag.toml with Ag3Sn's formation
energy lowered, beside a copy of ag-cu-sn.toml in a temporary folder, changes the answers of both.

Check value: the equilibrium Gibbs energy is the minimum over states of functions linear in the
compound's formation energy (per mole of atoms), so lowering it by d lowers G by between d times
the compound's amount (moles of atoms per mole of alloy) before the change and d times its amount
after it (the envelope theorem; M. Hillert, Phase Equilibria, Phase Diagrams and Phase
Transformations, 2nd ed. (2008), ch. 2 on G as a minimum at fixed T, P and composition).
"""

from __future__ import annotations

import numpy as np
import pytest

from ladle.engine import equilibrate
from ladle.engine.files.loader import load_system, shipped_folder

CHANGE_J = -2000.0   # J per mole of atoms, added to Ag3Sn's formation energy (-4500 in the shipped file)
T_K = 400.0


@pytest.fixture
def folders(tmp_path):
    """(shipped folder, a folder with sn-ag.toml changed and ag-cu-sn.toml copied beside it)."""
    shipped = shipped_folder()
    text = (shipped / "sn-ag.toml").read_text(encoding="utf-8")
    old = "formation = { a = -4500.0, b = 0.0 }"
    assert text.count(old) == 1
    (tmp_path / "sn-ag.toml").write_text(text.replace(old, f"formation = {{ a = {-4500.0 + CHANGE_J}, b = 0.0 }}"),
                                         encoding="utf-8")
    (tmp_path / "ag-cu-sn.toml").write_text((shipped / "ag-cu-sn.toml").read_text(encoding="utf-8"), encoding="utf-8")
    return shipped, tmp_path


def _amount(eq, phase: str) -> float:
    return sum(p.amount_mol for p in eq.phases if p.name == phase)


@pytest.mark.parametrize("name, x", [("sn-ag", [0.9, 0.1]), ("ag-cu-sn", [0.96, 0.03, 0.01])])
def test_a_change_to_the_shared_binary_changes_both_systems(folders, name, x):
    shipped, changed = folders
    before = equilibrate(load_system(shipped / f"{name}.toml"), T_K, np.array(x))
    after = equilibrate(load_system(changed / f"{name}.toml"), T_K, np.array(x))
    assert before.converged and after.converged and _amount(before, "Ag3Sn") > 0.02
    drop = after.gibbs_J_per_mol - before.gibbs_J_per_mol
    bounds = sorted((CHANGE_J * _amount(before, "Ag3Sn"), CHANGE_J * _amount(after, "Ag3Sn")))
    assert bounds[0] - 1e-6 <= drop <= bounds[1] + 1e-6 and drop < -40.0

