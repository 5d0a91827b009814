"""Free-parameter paths of a fit (engine/fit_parameters.py): reading, writing, scaling, and a
one-line message for every path that does not name a coefficient."""

from __future__ import annotations

import math

import pytest

from ladle.engine.fitting.parameters import ParameterPathError, parse_free, parse_path


def document() -> dict:
    return {"phase": {
        "liquid": {"model": "solution", "G": {"A": [{"upto": 3000, "a": 100.0}], "B": "liquid"},
                   "L": [{"a": -5000.0, "b": 1.5}, {"a": 300}]},
        "Al2Cu": {"model": "compound", "formula": "A2B", "reference": {"A": "liquid", "B": "liquid"},
                  "formation": {"a": -16000.0}},
    }}


def test_get_and_set_coefficients():
    doc = document()
    p = parse_path("liquid.L.0.b", doc)
    assert p.get(doc) == 1.5
    p.set(doc, 2.25)
    assert doc["phase"]["liquid"]["L"][0] == {"a": -5000.0, "b": 2.25}
    # an omitted coefficient starts at zero, as systems/FORMAT.md defines
    c = parse_path("liquid.L.1.c", doc)
    assert c.get(doc) == 0.0
    assert parse_path("Al2Cu.formation.a", doc).get(doc) == -16000.0
    assert parse_path("liquid.G.A.0.a", doc).get(doc) == 100.0


def test_a_library_name_gains_a_correction_table():
    doc = document()
    p = parse_path("liquid.G.B.a", doc)
    assert p.get(doc) == 0.0
    p.set(doc, 40.0)
    assert doc["phase"]["liquid"]["G"]["B"] == {"library": "liquid", "a": 40.0}


def test_scale_is_one_kilojoule_at_the_reference_temperature():
    doc = document()
    T = 800.0
    assert parse_path("liquid.L.0.a", doc).scale(T) == pytest.approx(1000.0)
    assert parse_path("liquid.L.0.b", doc).scale(T) * T == pytest.approx(1000.0)
    assert parse_path("liquid.L.0.c", doc).scale(T) * T * math.log(T) == pytest.approx(1000.0)


@pytest.mark.parametrize("path, message", [
    ("gas.L.0.a", "'gas.L.0.a': no phase 'gas' in this file (phases: liquid, Al2Cu)"),
    ("liquid.L.2.a", "'liquid.L.2.a': phase.liquid.L has 2 entries (0 to 1); add the entry (for example { a = 0 }) to fit it"),
    ("liquid.L.0.q", "'liquid.L.0.q': expected a coefficient letter (a, b, c, d, e, f, g, h, i, j) at the end, found 'q'"),
    ("liquid.M.0.a", "'liquid.M.0.a': phase.liquid has keys model, G, L, not 'M'"),
    ("liquid.L.a", "'liquid.L.a': phase.liquid.L is a list; name the entry by its index, such as liquid.L.0.a"),
    ("liquid.a", "'liquid.a': expected phase, key(s) and a coefficient letter, such as \"liquid.L.0.a\""),
    ("liquid.model.a", "'liquid.model.a': phase.liquid.model is the text 'solution', not a table of coefficients"),
])
def test_bad_paths_are_named_in_one_line(path, message):
    with pytest.raises(ParameterPathError) as e:
        parse_path(path, document())
    assert str(e.value) == message
    assert "\n" not in str(e.value)


def test_free_list_names_the_entry_and_refuses_repeats():
    doc = document()
    assert [p.text for p in parse_free(["liquid.L.0.a", "liquid.L.1.a"], doc)] == ["liquid.L.0.a", "liquid.L.1.a"]
    with pytest.raises(ParameterPathError, match=r"^fit.free\[1\]: 'liquid.L.0.a' is listed twice$"):
        parse_free(["liquid.L.0.a", "liquid.L.0.a"], doc)
    with pytest.raises(ParameterPathError, match=r"^fit.free\[0\]: 'liquid.L.9.a'"):
        parse_free(["liquid.L.9.a"], doc)
