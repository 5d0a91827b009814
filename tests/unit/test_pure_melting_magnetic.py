"""A pure element's melting point where its solid carries a magnetic term (Ni in cu-ni's fcc):
the system's melting point, the one diagrams start their lines from, is where the phases' full
G (end member plus the Hillert-Jarl magnetic term) cross, found here independently with
scipy.optimize.brentq on each phase's own evaluation; and the freezing commands agree with it.
Before, the magnetic term was left out of the pure element's G and Ni melted 0.17 K low (the
fcc's magnetic G of pure Ni near 1728 K is about -1.7 J/mol), while point equilibria melted it
at the right temperature; and `ladle cool` near pure Ni stopped with a traceback."""

from __future__ import annotations

import numpy as np
import pytest
from scipy.optimize import brentq

from ladle.engine import equilibrate, find_system
from ladle.tui.cli import main


def _full_gibbs_difference(system, T: float) -> float:
    pure_ni = (np.array([0.0]), np.array([1.0]))
    liquid, fcc = (float(system.phases[name].at(T).gibbs(*pure_ni)[0]) for name in ("liquid", "fcc"))
    return liquid - fcc


def test_the_melting_point_includes_the_solids_magnetic_term():
    system = find_system("cu-ni")
    T_m = brentq(lambda T: _full_gibbs_difference(system, T), 1700.0, 1750.0, xtol=1e-10)
    assert system.melting_points["Ni"] == pytest.approx(T_m, abs=1e-6)
    below, above = (equilibrate(system, T_m + d, np.array([0.0, 1.0])).phase_names for d in (-1e-3, 1e-3))
    assert below == ("fcc",) and above == ("liquid",)


@pytest.mark.parametrize("comp", ["Ni=100wt%", "Ni=99.99wt%", "Cu=0wt%"])
def test_cooling_next_to_pure_nickel_is_answered(comp, capsys):
    assert main(["cool", "cu-ni", "--comp", comp]) == 0
    out = capsys.readouterr().out
    assert "primary fcc" in out and "Traceback" not in out
