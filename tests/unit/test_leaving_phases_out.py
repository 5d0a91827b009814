"""Leaving phases out (`--without`, variant files): a metastable equilibrium is the minimum over
fewer phases, so where the left-out phase was not stable nothing changes, and where it was, the
alloy's Gibbs energy can only rise (a minimum over a subset is never lower: the definition of the
minimum; M. Hillert, Phase Equilibria, Phase Diagrams and Phase Transformations, 2nd ed.,
Cambridge (2008), ch. 1)."""

from __future__ import annotations

import shutil

import numpy as np
import pytest

from ladle.engine import SystemFileError, equilibrate, find_system, load_system
from ladle.engine.diagrams.alloy_transitions import alloy_transitions
from ladle.engine.files.loader import shipped_folder


def test_transitions_change_only_where_the_phase_was_stable() -> None:
    system = find_system("pb-sn")
    x_b = 0.3
    full = alloy_transitions(system, x_b)
    meta = alloy_transitions(system.without(["bct"]), x_b)
    first_bct = max(t.temperature_K for t in full.transitions if "bct" in t.below)
    same = [t for t in full.transitions if t.temperature_K > first_bct + 1e-6]
    assert same, "the alloy must change phases above the first bct"
    for t, u in zip(same, meta.transitions):
        assert (t.above, t.below) == (u.above, u.below)
        assert abs(t.temperature_K - u.temperature_K) < 1e-5
    assert all("bct" not in t.above + t.below for t in meta.transitions)
    assert [(t.above, t.below) for t in meta.transitions] != [(t.above, t.below) for t in full.transitions]


@pytest.mark.parametrize("T", np.linspace(320.0, 620.0, 13))
def test_point_equilibria_rise_only_where_the_phase_was_stable(T: float) -> None:
    system = find_system("pb-sn")
    meta = system.without(["bct"])
    for x_b in (0.05, 0.3, 0.7):
        a, b = equilibrate(system, float(T), x_b), equilibrate(meta, float(T), x_b)
        if "bct" in a.phase_names:
            assert b.gibbs_J_per_mol >= a.gibbs_J_per_mol - 1e-9
        else:
            assert b.phase_names == a.phase_names
            assert b.gibbs_J_per_mol == pytest.approx(a.gibbs_J_per_mol, abs=1e-9)


@pytest.fixture
def folder(tmp_path):
    shutil.copy(shipped_folder() / "pb-sn.toml", tmp_path / "pb-sn.toml")
    return tmp_path


def test_a_variant_file_is_its_system_less_the_named_phases(folder) -> None:
    (folder / "pb-sn-no-tin.toml").write_text(
        'variant_of = "pb-sn.toml"\nwithout = ["bct"]\ntitle = "Lead-tin without white tin (invented test variant)"\n')
    v = load_system(folder / "pb-sn-no-tin.toml")
    assert v.name == "pb-sn-no-tin"
    assert set(v.phases) == {"liquid", "fcc"}
    assert v.title.startswith("Lead-tin without white tin")
    base = load_system(folder / "pb-sn.toml")
    assert v.elements == base.elements and v.source == base.source


@pytest.mark.parametrize("text, key", [
    ('variant_of = "pb-sn.toml"\nwithout = ["gamma"]\n', "without"),
    ('variant_of = "pb-sn.toml"\nwithout = ["liquid", "fcc", "bct"]\n', "without"),
    ('variant_of = "pb-sn.toml"\n', "without"),
    ('variant_of = "../pb-sn.toml"\nwithout = ["bct"]\n', "variant_of"),
    ('variant_of = "v.toml"\nwithout = ["bct"]\n', "variant_of"),
    ('variant_of = "pb-sn.toml"\nwithout = ["bct"]\nsafety = "x"\n', "safety"),
    ('variant_of = "missing.toml"\nwithout = ["bct"]\n', "missing.toml"),
])
def test_bad_variant_files_name_the_key(folder, text: str, key: str) -> None:
    (folder / "v.toml").write_text(text)
    with pytest.raises(SystemFileError, match=key):
        load_system(folder / "v.toml")


def test_a_variant_of_a_variant_is_refused(folder) -> None:
    (folder / "a.toml").write_text('variant_of = "pb-sn.toml"\nwithout = ["bct"]\n')
    (folder / "b.toml").write_text('variant_of = "a.toml"\nwithout = ["fcc"]\n')
    with pytest.raises(SystemFileError, match="variant itself"):
        load_system(folder / "b.toml")
