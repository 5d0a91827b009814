"""Remembered counts of independent checks for `ladle systems` (engine/checking/cache.py).

The invented system is ideal (tests/unit/measure_systems.py): its liquid's enthalpy of mixing is
zero at every composition and temperature (an ideal solution mixes without heat: D.R. Gaskell,
Introduction to the Thermodynamics of Materials, 5th ed. (2008), ch. 9). Pure-element melting
points are not independent checks and are not counted."""

from __future__ import annotations

import pytest

import ladle.engine.checking.cache as measure_cache
from ladle.engine import load_system
from measure_systems import MELT_A_K, ideal_text, write

CHECKS = f'''
[[check]]
kind = "melting"
element = "A"
temperature_K = {MELT_A_K}
tolerance_K = 0.5
source = "closed form: Tm of the invented simple-form liquid (not counted: a pure-element melting point)"

[[check]]
kind = "mixing_enthalpy"
phase = "liquid"
at_percent = 40
temperature_K = 1100
enthalpy_J_per_mol = 0.0
tolerance_J = 1
source = "closed form: an ideal solution mixes without heat"

[[check]]
kind = "mixing_enthalpy"
phase = "liquid"
at_percent = 40
temperature_K = 1100
enthalpy_J_per_mol = 500.0
tolerance_J = 1
source = "built to fail by 500 J/mol"
'''


@pytest.fixture
def cache_home(tmp_path, monkeypatch):
    monkeypatch.setenv("XDG_CACHE_HOME", str(tmp_path / "cache"))
    return tmp_path / "cache" / "ladle" / "checks"


def test_counts_are_evaluated_once_then_remembered(tmp_path, cache_home, monkeypatch):
    system = load_system(write(tmp_path, ideal_text(CHECKS)))
    assert measure_cache.check_counts(system) == (1, 2)
    assert len(list(cache_home.glob("*.json"))) == 1

    def no_evaluation(*_args):
        raise AssertionError("evaluated although remembered")

    monkeypatch.setattr(measure_cache, "evaluate_all", no_evaluation)
    assert measure_cache.check_counts(system) == (1, 2)


def test_a_changed_file_is_evaluated_again(tmp_path, cache_home):
    path = write(tmp_path, ideal_text(CHECKS))
    assert measure_cache.check_counts(load_system(path)) == (1, 2)
    path.write_text(ideal_text(CHECKS.replace("enthalpy_J_per_mol = 500.0", "enthalpy_J_per_mol = 0.5")))
    assert measure_cache.check_counts(load_system(path)) == (2, 2)
    assert len(list(cache_home.glob("*.json"))) == 2


def test_an_unusable_cache_is_not_needed(tmp_path, monkeypatch):
    blocker = tmp_path / "not-a-folder"
    blocker.write_text("")
    monkeypatch.setenv("XDG_CACHE_HOME", str(blocker))
    system = load_system(write(tmp_path, ideal_text(CHECKS)))
    assert measure_cache.check_counts(system) == (1, 2)


def test_a_change_to_a_file_built_on_is_evaluated_again(tmp_path, cache_home, monkeypatch):
    """A ternary's counts depend on the binaries it builds on (builds_on, beside it): a fix to
    one of them must not leave the ternary's old counts standing."""
    from types import SimpleNamespace

    from ladle.engine.files.loader import shipped_folder

    for name in ("ag-cu-sn.toml", "sn-ag.toml", "sn-cu.toml", "ag-cu.toml"):
        (tmp_path / name).write_bytes((shipped_folder() / name).read_bytes())
    evaluated = []

    def counted(system, checks):
        evaluated.append(system.name)
        return [SimpleNamespace(passed=True)] * len(checks)

    monkeypatch.setattr(measure_cache, "evaluate_all", counted)
    ternary = tmp_path / "ag-cu-sn.toml"
    measure_cache.check_counts(load_system(ternary))
    measure_cache.check_counts(load_system(ternary))
    assert len(evaluated) == 1
    binary = tmp_path / "sn-ag.toml"
    binary.write_text(binary.read_text(encoding="utf-8") + "\n# a changed binary\n", encoding="utf-8")
    measure_cache.check_counts(load_system(ternary))
    assert len(evaluated) == 2


@pytest.mark.parametrize("damage", ['{"passed": Infinity, "total": 2}', '{"passed": 5, "total": 2}',
                                    '{"passed": -1, "total": 2}', '{"passed": 1, "total": 7}',
                                    '{"passed": 1.5, "total": 2}', '{"passed": true, "total": 2}',
                                    "[" * 100_000 + "]" * 100_000, "\x00\xff"])
def test_a_damaged_cache_file_is_measured_afresh(tmp_path, cache_home, damage):
    """Found by fuzzing: Infinity ended `ladle systems` in an OverflowError, deep nesting in a
    RecursionError, and a count of passes above the total was shown as read."""
    system = load_system(write(tmp_path, ideal_text(CHECKS)))
    assert measure_cache.check_counts(system) == (1, 2)
    (remembered,) = cache_home.glob("*.json")
    remembered.write_text(damage, encoding="utf-8", errors="surrogateescape")
    assert measure_cache.check_counts(system) == (1, 2)
