"""A file that others build on, fitted to facts outside its own covered range (`[fit]
facts_at_percent`, systems/FORMAT.md): the shared Cu-Sn liquid of sn-cu.toml and cu-sn.toml.

The round trip uses the invented eutectic of tests/unit/measure_systems.py: liquidus points of
the true model, one of them outside the covered range, give back the true coefficient.
"""

from __future__ import annotations

import json

import pytest

from ladle.engine import SystemFileError, load_system
from ladle.engine.checking.boundaries import boundary_temperature
from ladle.engine.fitting.fit import FitInputError, fit, fitting_view
from ladle.tui.cli import main
from measure_systems import EUTECTIC_TRUE, eutectic_text, write

COVERS = "covers_at_percent = [0, 40]"
#: Liquidus compositions (mole fraction B) of the round trip: 0.6 lies outside the covered 0-40 at%.
XS = (0.15, 0.3, 0.6)


def _liquidus_facts(tmp_path) -> str:
    truth = load_system(write(tmp_path, eutectic_text(), "truth.toml"))
    text = ""
    for x in XS:
        T = boundary_temperature(truth, x, "liquidus").temperature_K
        text += (f'\n[[measured]]\nkind = "liquidus"\nat_percent = {100 * x!r}\ntemperature_K = {T!r}\n'
                 f'uncertainty_K = 1.0\nsource = "generated from the invented true model"\n')
    return text


def _fit_table(facts_range: str) -> str:
    return f'\n[fit]\nfree = ["liquid.L.0.a"]\n{facts_range}\n'


def test_without_the_range_a_fact_outside_the_covered_range_is_refused(tmp_path):
    text = eutectic_text({"liquid.L.0.a": -2500.0}, _fit_table("") + _liquidus_facts(tmp_path), covers=COVERS)
    with pytest.raises(FitInputError, match=r"measured\[2\]: 60 at% B lies outside the range this model covers"):
        fit(load_system(write(tmp_path, text)))


def test_with_the_range_the_fit_recovers_the_true_coefficient(tmp_path):
    text = eutectic_text({"liquid.L.0.a": -2500.0}, _fit_table("facts_at_percent = [0, 100]") + _liquidus_facts(tmp_path),
                         covers=COVERS)
    system = load_system(write(tmp_path, text))
    assert system.covers == (0.0, 0.4) and system.fit_covers == (0.0, 1.0)
    result = fit(system)
    assert result.acceptable, result.problems
    fitted = result.parameters[0]
    # the measurements are the true model's own liquidus temperatures (no noise): the true value comes back
    assert fitted.value == pytest.approx(EUTECTIC_TRUE["liquid.L.0.a"], abs=1.0)
    # the written document keeps the file's own covered range
    assert load_system(write(tmp_path, text, "again.toml")).covers == (0.0, 0.4)


def test_the_fitting_view_widens_only_the_composition_range(tmp_path):
    system = load_system(write(tmp_path, eutectic_text(extra=_fit_table("facts_at_percent = [0, 100]"), covers=COVERS)))
    view = fitting_view(system)
    assert view.covers == (0.0, 1.0) and view.covers_K == system.covers_K and view.phases is system.phases
    plain = load_system(write(tmp_path, eutectic_text(covers=COVERS), "plain.toml"))
    assert fitting_view(plain) is plain


@pytest.mark.parametrize("value, message", [
    ("[0, 30]", "expected 0 <= from < to <= 100 (at%), holding covers_at_percent (0-40)"),
    ("[10, 100]", "expected 0 <= from < to <= 100 (at%), holding covers_at_percent (0-40)"),
    ("[0]", "expected [from, to] in at% of B"),
    ('"all"', "expected [from, to] in at% of B"),
])
def test_a_bad_range_is_refused_in_one_line(tmp_path, value, message):
    path = write(tmp_path, eutectic_text(extra=_fit_table(f"facts_at_percent = {value}"), covers=COVERS))
    with pytest.raises(SystemFileError) as e:
        load_system(path)
    assert "fit.facts_at_percent" in str(e.value) and message in str(e.value) and "\n" not in str(e.value)


def test_check_measures_the_fit_targets_over_the_fits_range(tmp_path, capsys):
    """`ladle check` shows every fit target measured, also the one outside the covered range."""
    text = eutectic_text(extra=_fit_table("facts_at_percent = [0, 100]") + _liquidus_facts(tmp_path), covers=COVERS)
    path = write(tmp_path, text)
    assert main(["check", str(path), "--json"]) == 0
    facts = [f for f in json.loads(capsys.readouterr().out)["facts"] if f["list"] == "measured"]
    assert len(facts) == len(XS)
    for f in facts:
        assert f["problem"] is None and f["comparisons"][0]["model"] is not None, f
