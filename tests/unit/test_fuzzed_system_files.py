"""Property tests (hypothesis) on system files: whatever a file holds, loading it gives a system
or one SystemFileError line (never another exception), without control characters in the
system's texts; and whatever the parameters of a two-phase eutectic, the melt range either
agrees with point equilibria or carries a warning. Examples are few and bounded in size so that
the module stays fast; a watchdog turns a hang into a failure."""

from __future__ import annotations

import copy
import signal
import tomllib
from contextlib import contextmanager
from pathlib import Path

import pytest
from hypothesis import HealthCheck, example, given, settings
from hypothesis import strategies as st

from ladle.engine import SystemFileError, load_system
from ladle.engine.diagrams.diagram import map_diagram
from ladle.engine.diagrams.melt import LIQUID, melt_range
from ladle.engine.files.plain_text import has_controls
from ladle.engine.fitting.toml_writer import toml_text
from ladle.engine.minimize.equilibrium import equilibrate

SHIPPED = Path(__file__).resolve().parents[2] / "systems"
BASE = tomllib.loads((SHIPPED / "pb-sn.toml").read_text(encoding="utf-8"))
#: Longest a single example may take (s) before it counts as a hang.
WATCHDOG_S = 60


@contextmanager
def watchdog(seconds: int = WATCHDOG_S):
    def expired(signum, frame):
        raise TimeoutError(f"no answer within {seconds} s")

    previous = signal.signal(signal.SIGALRM, expired)
    signal.alarm(seconds)
    try:
        yield
    finally:
        signal.alarm(0)
        signal.signal(signal.SIGALRM, previous)


def _paths(doc, prefix=()):
    """Every key path of a parsed document (tables and lists walked)."""
    items = doc.items() if isinstance(doc, dict) else enumerate(doc) if isinstance(doc, list) else ()
    for key, value in items:
        yield prefix + (key,)
        yield from _paths(value, prefix + (key,))


PATHS = list(_paths(BASE))
odd_values = st.one_of(
    st.none(), st.booleans(), st.integers(min_value=-10**30, max_value=10**30),
    st.floats(allow_nan=True, allow_infinity=True), st.text(max_size=20),
    st.text(alphabet=st.characters(max_codepoint=0x9f), max_size=10),
    st.lists(st.floats(allow_nan=False), max_size=3), st.dictionaries(st.text(max_size=5), st.integers(), max_size=2),
)


def _mutated(path: tuple, value) -> dict:
    doc = copy.deepcopy(BASE)
    *parents, last = path
    where = doc
    for key in parents:
        where = where[key]
    if value is _DELETE:
        del where[last]
    else:
        where[last] = value
    return doc


_DELETE = object()


@settings(max_examples=60, deadline=None, suppress_health_check=[HealthCheck.too_slow])
@given(path=st.sampled_from(PATHS), value=st.one_of(st.just(_DELETE), odd_values))
def test_a_mutated_file_loads_or_fails_in_one_line(path, value, tmp_path_factory):
    doc = _mutated(path, value)
    file = tmp_path_factory.mktemp("fuzz") / "fuzzed.toml"
    try:
        file.write_text(toml_text(doc), encoding="utf-8")
    except (ValueError, TypeError):         # a value TOML cannot hold (the writer refuses it)
        file.write_text("", encoding="utf-8")
    with watchdog():
        try:
            system = load_system(file)
        except SystemFileError as error:
            message = str(error)
            assert "\n" not in message.strip() and message.startswith("fuzzed.toml")
            return
    for text in (system.title, system.source, system.safety, *system.phases):
        assert not has_controls(text.replace("\n", ""))


@settings(max_examples=40, deadline=None)
@given(data=st.binary(max_size=300))
def test_arbitrary_bytes_are_one_error_line(data, tmp_path_factory):
    file = tmp_path_factory.mktemp("bytes") / "bytes.toml"
    file.write_bytes(data)
    with pytest.raises(SystemFileError):
        load_system(file)


def _eutectic_text(liquid_L: float, solid_L: float, H_A: float, H_B: float) -> str:
    return f"""elements = ["A", "B"]
molar_mass = {{ A = 60.0, B = 30.0 }}
source = "Invented test system with random parameters (property test)."
temperature_range_K = [300.0, 1600.0]

[phase.liquid]
model = "solution"
G.A = [ {{ upto = 6000.0, a = {H_A!r}, b = {-H_A / 1200.0!r} }} ]
G.B = [ {{ upto = 6000.0, a = {H_B!r}, b = {-H_B / 1000.0!r} }} ]
L = [ {{ a = {liquid_L!r} }} ]

[phase.fcc]
model = "solution"
G.A = [ {{ upto = 6000.0, a = 0.0 }} ]
G.B = [ {{ upto = 6000.0, a = 0.0 }} ]
L = [ {{ a = {solid_L!r} }} ]
"""


@settings(max_examples=8, deadline=None, suppress_health_check=[HealthCheck.too_slow])
@given(liquid_L=st.floats(-20000.0, 15000.0), solid_L=st.one_of(st.floats(-10000.0, 60000.0), st.floats(5e5, 5e6)),
       H_A=st.floats(8000.0, 20000.0), H_B=st.floats(6000.0, 15000.0), x_B=st.floats(0.05, 0.95))
@example(liquid_L=0.0, solid_L=1e6, H_A=12000.0, H_B=10000.0, x_B=0.5)   # once a silent wrong answer
@example(liquid_L=0.0, solid_L=1e7, H_A=12000.0, H_B=10000.0, x_B=0.3)   # solubility below floating point
def test_melt_ranges_agree_with_point_equilibria_or_say_why_not(liquid_L, solid_L, H_A, H_B, x_B, tmp_path_factory):
    file = tmp_path_factory.mktemp("eutectic") / "random.toml"
    file.write_text(_eutectic_text(liquid_L, solid_L, H_A, H_B), encoding="utf-8")
    system = load_system(file)
    with watchdog():
        map_diagram(system)
        melt = melt_range(system, x_B)
        if melt.warnings:
            return                       # flagged: the answer says it may be incomplete
        if melt.liquidus_K is not None:
            assert equilibrate(system, melt.liquidus_K + 0.05, x_B).phase_names == (LIQUID,)
            assert equilibrate(system, melt.liquidus_K - 0.05, x_B).phase_names != (LIQUID,)
        if melt.solidus_K is not None:
            assert LIQUID not in equilibrate(system, melt.solidus_K - 0.05, x_B).phase_names
            assert LIQUID in equilibrate(system, melt.solidus_K + 0.05, x_B).phase_names
