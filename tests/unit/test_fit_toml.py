"""The TOML writer of fitted system files (engine/fit_toml.py): tomllib (the standard library's
reader) reads back exactly what was written; writes are atomic."""

from __future__ import annotations

import tomllib

import pytest
from hypothesis import given, settings
from hypothesis import strategies as st

from ladle.engine.fitting.toml_writer import toml_text, value_text

keys = st.text(min_size=1, max_size=8)
scalars = (st.text(max_size=20) | st.integers(-10**12, 10**12) | st.booleans()
           | st.floats(allow_nan=False, allow_infinity=False))
values = st.recursive(scalars, lambda inner: st.lists(inner, max_size=4) | st.dictionaries(keys, inner, max_size=4),
                      max_leaves=12)
documents = st.dictionaries(keys, values | st.lists(st.dictionaries(keys, values, max_size=3), min_size=1, max_size=3),
                            max_size=6)


@settings(max_examples=60, deadline=None)
@given(documents)
def test_round_trip_through_tomllib(doc):
    assert tomllib.loads(toml_text(doc)) == doc


def test_system_shapes_are_written_readably():
    doc = {"elements": ["Pb", "Sn"], "molar_mass": {"Pb": 207.2, "Sn": 118.71},
           "phase": {"liquid": {"model": "solution", "L": [{"a": -5000.0, "b": 1.5}]}},
           "fit": {"free": ["liquid.L.0.a"]},
           "measured": [{"kind": "melting", "element": "Pb", "temperature_C": 327.462}],
           "fit_report": {"parameters": {"liquid.L.0.a": {"value": 1.0}}}}
    text = toml_text(doc, "first line\nsecond line")
    assert text.splitlines()[:4] == ["# first line", "# second line", 'elements = [ "Pb", "Sn" ]',
                                     "molar_mass = { Pb = 207.2, Sn = 118.71 }"]
    assert "\n[phase.liquid]\nmodel = \"solution\"\nL = [ { a = -5000.0, b = 1.5 } ]\n" in text
    assert "\n[fit]\nfree = [ \"liquid.L.0.a\" ]\n" in text
    assert "\n[[measured]]\nkind = \"melting\"\n" in text
    assert '\n[fit_report.parameters]\n"liquid.L.0.a" = { value = 1.0 }\n' in text
    assert tomllib.loads(text) == doc


def test_keys_that_are_not_bare_are_quoted():
    # a trailing newline once slipped past a bare-key pattern anchored with $ (found by hypothesis)
    doc = {"z\n": "", "a b": 1, "liquid.L.0.a": 2.0, "plain_key-1": 3}
    text = toml_text(doc)
    assert '"z\\n" = ""' in text and "plain_key-1 = 3" in text
    assert tomllib.loads(text) == doc


def test_non_finite_numbers_are_refused():
    with pytest.raises(ValueError, match="non-finite"):
        value_text(float("nan"))
