"""Remembered check counts for `ladle systems` (engine/measure_cache.py)."""

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
source = "closed form: Tm of the invented simple-form liquid"

[[check]]
kind = "melting"
element = "A"
temperature_K = {MELT_A_K + 10}
tolerance_K = 0.5
source = "built to fail by 10 K"
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
    path.write_text(ideal_text(CHECKS.replace(f"{MELT_A_K + 10}", f"{MELT_A_K + 0.1}")))
    assert measure_cache.check_counts(load_system(path)) == (2, 2)
    assert len(list(cache_home.glob("*.json"))) == 2


def test_an_unusable_cache_is_not_needed(tmp_path, monkeypatch):
    blocker = tmp_path / "not-a-folder"
    blocker.write_text("")
    monkeypatch.setenv("XDG_CACHE_HOME", str(blocker))
    system = load_system(write(tmp_path, ideal_text(CHECKS)))
    assert measure_cache.check_counts(system) == (1, 2)
