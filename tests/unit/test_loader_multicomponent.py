"""System files of any number of elements (systems/FORMAT.md): solution phases with pair and ternary
terms, sublattice phases, compounds, systems built on binary files, the loader's bounds, and
System.without. Every bad file is one line naming the file and the key.

Check values: the Redlich-Kister / Muggianu sums and the compound energy formalism written out by
hand from the numbers in the files (H.L. Lukas, S.G. Fries, B. Sundman, Computational
Thermodynamics: The Calphad Method, Cambridge (2007), sections 5.4-5.6); the data are invented.
"""

from __future__ import annotations

import numpy as np
import pytest

from ladle.engine import SystemFileError, TemperatureOutOfRange, equilibrate
from ladle.engine.files import bounds
from ladle.engine.files.loader import load_system, shipped_folder
from ladle.engine.models.phases import CompoundPhase, SolutionPhase
from ladle.engine.models.sublattice import SublatticePhase
from ladle.engine.units import GAS_CONSTANT as R

# Invented binaries of invented elements A, B, C (one-piece functions, J/mol).
AB = '''
elements = ["A", "B"]
molar_mass = { A = 50.0, B = 30.0 }
source = "Invented test data."
[phase.liquid]
model = "solution"
G.A = [ { upto = 3000.0, a = 12000.0, b = -10.0 } ]
G.B = [ { upto = 3000.0, a = 9000.0, b = -9.0 } ]
L = [ { a = -6000.0, b = 1.0 }, { a = 1500.0 } ]
[phase.fcc]
model = "solution"
G.A = [ { upto = 3000.0 } ]
G.B = [ { upto = 3000.0, a = 3000.0 } ]
L = [ { a = 9000.0 } ]
[phase.AB2]
model = "compound"
formula = "AB2"
reference = { A = "fcc", B = "fcc" }
formation = { a = -5000.0, b = 0.5 }
'''
BC = '''
elements = ["C", "B"]
molar_mass = { B = 30.0, C = 20.0 }
source = "Invented test data."
[phase.liquid]
model = "solution"
G.C = [ { upto = 3000.0, a = 8000.0, b = -8.0 } ]
G.B = [ { upto = 3000.0, a = 9000.0, b = -9.0 } ]
L = [ { a = 2000.0 }, { a = -800.0 }, { a = 300.0 } ]
[phase.fcc]
model = "solution"
G.C = [ { upto = 3000.0, a = 2500.0 } ]
G.B = [ { upto = 3000.0, a = 3000.0 } ]
'''
AC = '''
elements = ["A", "C"]
molar_mass = { A = 50.0, C = 20.0 }
source = "Invented test data."
[phase.liquid]
model = "solution"
G.A = [ { upto = 3000.0, a = 12000.0, b = -10.0 } ]
G.C = [ { upto = 3000.0, a = 8000.0, b = -8.0 } ]
[phase.fcc]
model = "solution"
G.A = [ { upto = 3000.0 } ]
G.C = [ { upto = 3000.0, a = 2500.0 } ]
L = [ { a = -4000.0 } ]
'''
ABC = '''
elements = ["A", "B", "C"]
source = "Invented test data: the three binaries plus a ternary liquid term."
builds_on = ["a-b.toml", "c-b.toml", "a-c.toml"]
[phase.liquid]
model = "solution"
L.A-B-C = { A = { a = -3000.0 }, B = { a = 1200.0 }, C = { a = 600.0, b = -1.0 } }
'''
# The same ternary written out in one file (no builds_on), with a sublattice phase and a compound.
ONE_FILE = '''
elements = ["A", "B", "C"]
molar_mass = { A = 50.0, B = 30.0, C = 20.0 }
source = "Invented test data."
[phase.liquid]
model = "solution"
G.A = [ { upto = 3000.0, a = 12000.0, b = -10.0 } ]
G.B = [ { upto = 3000.0, a = 9000.0, b = -9.0 } ]
G.C = [ { upto = 3000.0, a = 8000.0, b = -8.0 } ]
L.A-B = [ { a = -6000.0, b = 1.0 }, { a = 1500.0 } ]
L.C-B = [ { a = 2000.0 }, { a = -800.0 }, { a = 300.0 } ]
L.A-B-C = { A = { a = -3000.0 }, B = { a = 1200.0 }, C = { a = 600.0, b = -1.0 } }
[phase.fcc]
model = "solution"
G.A = [ { upto = 3000.0 } ]
G.B = [ { upto = 3000.0, a = 3000.0 } ]
G.C = [ { upto = 3000.0, a = 2500.0 } ]
L.A-B = [ { a = 9000.0 } ]
L.A-C = [ { a = -4000.0 } ]
[phase.fcc.magnetic]
above_curie_fraction = 0.28
curie_K = { A = 600.0, B = 0.0, C = 0.0 }
moment = { A = 1.5, B = 0.0, C = 0.0 }
curie_L.A-B = [ { a = -300.0 } ]
[phase.carbide]
model = "sublattices"
sublattices = [ { sites = 1, holds = ["A", "B"] }, { sites = 2, holds = ["C", "Va"] } ]
[[phase.carbide.end_member]]
constituents = ["A", "C"]
G = { reference = { A = "fcc", C = "fcc" }, a = -30000.0, b = 4.0 }
[[phase.carbide.end_member]]
constituents = ["A", "Va"]
G = { reference = { A = "fcc" }, a = 5000.0 }
[[phase.carbide.end_member]]
constituents = ["B", "C"]
G = [ { upto = 3000.0, a = -20000.0 } ]
[[phase.carbide.end_member]]
constituents = ["B", "Va"]
G = { reference = { B = "fcc" }, a = 4000.0 }
[[phase.carbide.interaction]]
constituents = [["A", "B"], "C"]
L = [ { a = -7000.0 }, { a = 900.0 } ]
[[phase.carbide.interaction]]
constituents = [["A", "B"], ["C", "Va"]]
L = [ { a = 2500.0 } ]
[phase.A2BC]
model = "compound"
formula = "A2BC"
reference = { A = "fcc", B = "fcc", C = "liquid" }
formation = { a = -9000.0 }
'''


def write(folder, name, text):
    path = folder / name
    path.write_text(text, encoding="utf-8")
    return path


@pytest.fixture
def ternary(tmp_path):
    for name, text in (("a-b.toml", AB), ("c-b.toml", BC), ("a-c.toml", AC)):
        write(tmp_path, name, text)
    return write(tmp_path, "a-b-c.toml", ABC)


def liquid_by_hand(x: np.ndarray, T: float) -> np.ndarray:
    """G of the ternary liquid from the numbers in the files (Muggianu form, Lukas et al. 2007)."""
    xa, xb, xc = x.T
    g = xa * (12000 - 10 * T) + xb * (9000 - 9 * T) + xc * (8000 - 8 * T) + R * T * (x * np.log(x)).sum(1)
    g += xa * xb * ((-6000 + T) + 1500 * (xa - xb))
    g += xc * xb * (2000 - 800 * (xc - xb) + 300 * (xc - xb) ** 2)
    v = x + (1 - x.sum(1, keepdims=True)) / 3
    g += xa * xb * xc * (-3000 * v[:, 0] + 1200 * v[:, 1] + (600 - T) * v[:, 2])
    return g


X = np.random.default_rng(7).dirichlet([1, 1, 1], size=40)


def test_a_system_built_on_binary_files_holds_their_phases_and_its_own_terms(ternary):
    system = load_system(ternary)
    assert system.elements == ("A", "B", "C")
    assert np.allclose(system.molar_mass, [50.0, 30.0, 20.0])          # taken from the binaries
    assert set(system.phases) == {"liquid", "fcc", "AB2"}
    assert isinstance(system.phases["AB2"], CompoundPhase) and np.allclose(system.phases["AB2"].x, [1 / 3, 2 / 3, 0])
    for T in (700.0, 1500.0):
        got = system.models["liquid"].at(T).gibbs(X)
        assert np.allclose(got, liquid_by_hand(X, T), rtol=1e-12, atol=1e-8)


def test_the_same_system_in_one_file_gives_the_same_liquid(tmp_path, ternary):
    built = load_system(ternary)
    whole = load_system(write(tmp_path, "whole.toml", ONE_FILE))
    for T in (600.0, 1200.0):
        assert np.allclose(whole.models["liquid"].at(T).gibbs(X), built.models["liquid"].at(T).gibbs(X), rtol=1e-13)


def test_a_fix_to_a_binary_flows_into_the_system_built_on_it(tmp_path, ternary):
    before = load_system(ternary).models["liquid"].at(1000.0).gibbs(X)
    write(tmp_path, "a-b.toml", AB.replace("{ a = 1500.0 }", "{ a = 2500.0 }"))
    after = load_system(ternary).models["liquid"].at(1000.0).gibbs(X)
    xa, xb = X[:, 0], X[:, 1]
    assert np.allclose(after - before, xa * xb * 1000.0 * (xa - xb), rtol=1e-9, atol=1e-8)


def test_the_files_own_value_replaces_a_binary_one(tmp_path, ternary):
    write(tmp_path, "a-b-c.toml", ABC + 'L.A-B = [ { a = -6000.0, b = 1.0 } ]\n')
    system = load_system(ternary)
    xa, xb = X[:, 0], X[:, 1]
    expected = liquid_by_hand(X, 900.0) - xa * xb * 1500.0 * (xa - xb)
    assert np.allclose(system.models["liquid"].at(900.0).gibbs(X), expected, rtol=1e-12, atol=1e-8)


def test_sublattice_phase_and_magnetic_solution_in_one_file(tmp_path):
    system = load_system(write(tmp_path, "whole.toml", ONE_FILE))
    carbide = system.phases["carbide"]
    assert isinstance(carbide, SublatticePhase) and carbide.site_ratios == (1.0, 2.0)
    T = 800.0
    y = np.array([0.3, 0.7, 0.4, 0.6])                    # A, B | C, Va
    g_em = {"AC": 0 + 2 * 2500 - 30000 + 4 * T, "AVa": 0 + 5000, "BC": -20000, "BVa": 3000 + 4000}
    expected = (y[0] * y[2] * g_em["AC"] + y[0] * y[3] * g_em["AVa"] + y[1] * y[2] * g_em["BC"] + y[1] * y[3] * g_em["BVa"]
                + R * T * ((y[:2] * np.log(y[:2])).sum() + 2 * (y[2:] * np.log(y[2:])).sum())
                + y[0] * y[1] * y[2] * (-7000 + 900 * (y[0] - y[1])) + y[0] * y[1] * y[2] * y[3] * 2500)
    assert carbide.at(T).gibbs(y) == pytest.approx(expected, rel=1e-13)
    assert np.allclose(carbide.element_matrix, [[1, 0, 0], [0, 1, 0], [0, 0, 2], [0, 0, 0]])
    compound = system.phases["A2BC"]
    assert np.allclose(compound.x, [0.5, 0.25, 0.25])
    assert compound.gibbs(T) == pytest.approx(0.25 * (3000) + 0.25 * (8000 - 8 * T) - 9000, rel=1e-13)
    fcc = system.models["fcc"]
    assert fcc.magnetic is not None and fcc.magnetic.above_curie_fraction == 0.28
    # a three-element file has no binary classes: its solutions are general models
    assert isinstance(system.phases["fcc"], SublatticePhase)


def test_a_ternary_from_the_shipped_binaries_matches_each_binary_on_its_edge(tmp_path):
    """Ag-Cu-Sn built on the shipped ag-cu, sn-ag and sn-cu files: on each edge the ternary liquid
    is the binary liquid (the same parsed parameters)."""
    path = write(tmp_path, "ag-cu-sn.toml", '''
elements = ["Ag", "Cu", "Sn"]
source = "Test: the shipped binaries only."
builds_on = ["ag-cu.toml", "sn-ag.toml", "sn-cu.toml"]
''')
    system = load_system(path)
    assert {"liquid", "fcc", "bct", "Ag3Sn", "Cu6Sn5"} <= set(system.phases)
    T = 1100.0
    t = np.linspace(1e-6, 1 - 1e-6, 31)
    for binary, (i, j) in (("ag-cu", (0, 1)), ("sn-ag", (2, 0)), ("sn-cu", (2, 1))):
        ref = load_system(shipped_folder() / f"{binary}.toml").phases["liquid"].at(T)
        x = np.zeros((len(t), 3))
        x[:, i], x[:, j] = 1 - t, t
        assert np.allclose(system.models["liquid"].at(T).gibbs(x), ref.gibbs(1 - t, t), rtol=1e-12), binary


def test_binary_files_give_both_forms_from_one_parse():
    system = load_system(shipped_folder() / "cu-ni.toml")
    assert isinstance(system.phases["fcc"], SolutionPhase)
    assert set(system.models) == set(system.phases)
    assert system.models["fcc"].end_members[("Ni",)] is system.phases["fcc"].endmembers[1]


def test_without_leaves_out_phases_by_name():
    system = load_system(shipped_folder() / "al-cu.toml")
    less = system.without(["Al2Cu"])
    assert "Al2Cu" not in less.phases and "Al2Cu" not in less.models and "Al2Cu" in system.phases
    with pytest.raises(ValueError, match="no phase named 'graphite'"):
        system.without(["graphite"])
    with pytest.raises(ValueError, match="leaves no phase"):
        system.without(list(system.phases))


# --- errors: one line naming the file and the key -------------------------------------------------
CASES = [
    ("no sublattices", 'sublattices = [ { sites = 1, holds = ["A", "B"] }, { sites = 2, holds = ["C", "Va"] } ]', "",
     "phase.carbide.sublattices", "missing"),
    ("unknown constituent", 'holds = ["C", "Va"]', 'holds = ["C", "Vac"]', "phase.carbide.sublattices[1].holds",
     "neither an element"),
    ("negative sites", "sites = 2,", "sites = -2,", "phase.carbide.sublattices[1].sites", "positive number of sites"),
    ("too many sites", "sites = 2,", "sites = 5000,", "phase.carbide.sublattices[1].sites", "at most 1000"),
    ("missing end member", '[[phase.carbide.end_member]]\nconstituents = ["B", "C"]\nG = [ { upto = 3000.0, a = -20000.0 } ]\n', "",
     "phase.carbide.end_member", "missing the end member with constituents ['B', 'C']"),
    ("end member of the wrong length", 'constituents = ["B", "C"]', 'constituents = ["B"]',
     "phase.carbide.end_member[2].constituents", "2 entries, one per sublattice"),
    ("end member on the wrong sublattice", 'constituents = ["B", "C"]', 'constituents = ["C", "B"]',
     "phase.carbide.end_member[2].constituents[0]", "holds A, B, not C"),
    ("reference missing", 'G = { reference = { A = "fcc" }, a = 5000.0 }', 'G = { reference = { }, a = 5000.0 }',
     "phase.carbide.end_member[1].G.reference.A", "missing"),
    ("interaction without a mixed sublattice", 'constituents = [["A", "B"], "C"]', 'constituents = ["A", "C"]',
     "phase.carbide.interaction[0].constituents", "two or three constituents"),
    ("reciprocal term with two orders", "L = [ { a = 2500.0 } ]", "L = [ { a = 2500.0 }, { a = 1.0 } ]",
     "phase.carbide.interaction[1].L", "one expression"),
    ("ternary term missing a constituent", ", C = { a = 600.0, b = -1.0 }", "", "phase.liquid.L.A-B-C.C", "missing"),
    ("pair with an unknown element", "L.A-C = [ { a = -4000.0 } ]", "L.A-Z = [ { a = -4000.0 } ]", "phase.fcc.L.A-Z",
     "elements of this system joined by '-'"),
    ("pair named twice", "L.A-C = [ { a = -4000.0 } ]", "L.A-C = [ { a = -4000.0 } ]\nL.C-A = [ { a = 1.0 } ]",
     "phase.fcc.L.C-A", "named twice"),
    ("a plain list in a three-element file", "L.A-B = [ { a = 9000.0 } ]\nL.A-C = [ { a = -4000.0 } ]",
     "L = [ { a = -4000.0 } ]", "phase.fcc.L",
     "table by element pair"),
    ("magnetic value missing", "moment = { A = 1.5, B = 0.0, C = 0.0 }", "moment = { A = 1.5, B = 0.0 }",
     "phase.fcc.magnetic.moment.C", "every element"),
    ("solution missing an element", "G.C = [ { upto = 3000.0, a = 2500.0 } ]\n", "", "phase.fcc.G.C", "missing"),
    ("unknown model", 'model = "sublattices"', 'model = "lattice"', "phase.carbide.model", "unknown model 'lattice'"),
    ("a boundary fact in a three-element file", "[phase.liquid]",
     '[[check]]\nkind = "boundary"\nsource = "s"\ntemperature_K = 900\n[phase.liquid]', "check[0].kind",
     "two-element systems only"),
    ("covered range in a three-element file", 'source = "Invented test data."',
     'source = "Invented test data."\ncovers_at_percent = [0, 50]', "covers_at_percent",
     "expected a table of [from, to] at% per element"),
    ("too many elements", 'elements = ["A", "B", "C"]', "elements = [" + ", ".join(f'"{a}{b}"' for a in "ABCD" for b in "abcd") + "]",
     "elements", "at most 12"),
]


def assert_refused(path, key: str, expected: str) -> None:
    """Loading `path` fails with one line naming the file, the key and what was expected."""
    with pytest.raises(SystemFileError) as err:
        load_system(path)
    message = str(err.value)
    assert "\n" not in message and message.startswith(f"{path.name}: "), message
    assert f" {key}: " in message or f" {key}." in message, message
    assert expected in message, message


@pytest.mark.parametrize("case,old,new,key,expected", CASES, ids=[c[0] for c in CASES])
def test_bad_multicomponent_file_is_one_line(tmp_path, case, old, new, key, expected):
    assert old in ONE_FILE, case
    assert_refused(write(tmp_path, "bad.toml", ONE_FILE.replace(old, new, 1)), key, expected)


def test_builds_on_errors_name_the_key(tmp_path, ternary):
    cases = [
        (ABC.replace('"a-c.toml"]', '"a-c.toml", "absent.toml"]'), "absent.toml: no such system file"),
        (ABC.replace('"a-c.toml"]', '"a-c.toml", "a-b-c.toml"]'), "a cycle"),
        (ABC.replace('"a-c.toml"]', '"a-c.toml", "../a-b.toml"]'), "expected names of system files"),
        (ABC.replace('"a-c.toml"]', '"a-c.toml", "pb-sn.toml"]'), "pb-sn.toml holds Pb, Sn"),
    ]
    for text, words in cases:
        write(tmp_path, "a-b-c.toml", text)
        with pytest.raises(SystemFileError) as err:
            load_system(ternary)
        assert str(err.value).startswith("a-b-c.toml: builds_on: ") and words in str(err.value), str(err.value)
    # two binaries that disagree on one pure element's energy: name both and say how to choose
    write(tmp_path, "a-c.toml", AC.replace("a = 12000.0, b = -10.0", "a = 12500.0, b = -10.0"))
    write(tmp_path, "a-b-c.toml", ABC)
    with pytest.raises(SystemFileError) as err:
        load_system(ternary)
    assert "phase.liquid" in str(err.value) and "a-b.toml" in str(err.value) and "a-c.toml" in str(err.value)
    assert "give it in this file to choose" in str(err.value)
    write(tmp_path, "a-b-c.toml", ABC + "G.A = [ { upto = 3000.0, a = 12000.0, b = -10.0 } ]\n")
    assert load_system(ternary).models["liquid"].end_members[("A",)].value(1000.0) == pytest.approx(2000.0)


# --- bounds (issue 11) -------------------------------------------------------------------------------
VALID = '''
elements = ["A", "B"]
molar_mass = { A = 60.0, B = 30.0 }
source = "Synthetic test system: invented parameters."
[phase.liquid]
model = "solution"
G.A = [ { upto = 3000.0, a = 12000.0, b = -10.0 } ]
G.B = [ { upto = 3000.0, a = 10000.0, b = -10.0 } ]
L = [ { a = 15000.0, b = -2.0 } ]
'''
PIECE = "G.A = [ { upto = 3000.0, a = 12000.0, b = -10.0 } ]"
BOUND_CASES = [
    ("coefficient near the float limit", "a = 15000.0", "a = 1e308", "phase.liquid.L[0].a", "plausible Gibbs energy"),
    ("T^7 term far too large", PIECE, "G.A = [ { upto = 3000.0, a = 12000.0, g = 1.0 } ]", "phase.liquid.G.A[0].g",
     "plausible Gibbs energy"),
    ("piece up to 1e300 K", PIECE, "G.A = [ { upto = 1e300, a = 12000.0, g = 1e-30 } ]", "phase.liquid.G.A[0].upto",
     "beyond the 20000 K"),
    ("too many Redlich-Kister terms", "L = [ { a = 15000.0, b = -2.0 } ]", "L = [" + ", ".join(["{ a = 1.0 }"] * 11) + "]",
     "phase.liquid.L", "11 coefficients; a file may hold at most 10"),
    ("too many pieces", PIECE, "G.A = [" + ", ".join(f"{{ upto = {100 + 10 * i}.0 }}" for i in range(17)) + "]",
     "phase.liquid.G.A", "17 pieces; a file may hold at most 16"),
    ("mapped range beyond the bound", 'source = "', "temperature_range_K = [300, 1e9]\nsource = \"",
     "temperature_range_K", "beyond"),
]


@pytest.mark.parametrize("case,old,new,key,expected", BOUND_CASES, ids=[c[0] for c in BOUND_CASES])
def test_what_a_file_may_hold_is_bounded(tmp_path, case, old, new, key, expected):
    assert old in VALID, case
    assert_refused(write(tmp_path, "big.toml", VALID.replace(old, new, 1)), key, expected)


def test_a_file_too_large_is_refused_before_it_is_parsed(tmp_path):
    path = write(tmp_path, "huge.toml", VALID + "#" * bounds.MAX_FILE_BYTES)
    with pytest.raises(SystemFileError, match=r"^huge\.toml: \d+ bytes; a system file may hold at most 2000000 bytes$"):
        load_system(path)


def test_every_shipped_file_is_within_the_bounds():
    for path in shipped_folder().glob("*.toml"):
        if path.name != "elements.toml":
            load_system(path)


def test_a_temperature_far_outside_the_model_is_an_error_not_an_overflow(tmp_path):
    """A term g T^7 (allowed: at most 1e8 J/mol up to the piece's limit) cannot overflow at 1e60 K:
    every function ends at a bounded temperature."""
    system = load_system(write(tmp_path, "t7.toml", VALID.replace(PIECE, "G.A = [ { upto = 3000.0, a = 12000.0, g = 1e-20 } ]")))
    with pytest.raises(TemperatureOutOfRange):
        equilibrate(system, 1e60, 0.5)


def test_terms_in_inverse_square_and_cube_of_temperature(tmp_path):
    """i/T^2 and j/T^3 (graphite's function has them): read, evaluated as written out, dG/dT by
    central differences; refused where a term exceeds the bound (j / T^3 at 1 K)."""
    piece = "G.A = [ { from = 298.15, upto = 3000.0, a = 1000.0, f = 2.5e6, i = -2.6e8, j = 1.2e10 } ]"
    system = load_system(write(tmp_path, "ij.toml", VALID.replace(PIECE, piece)))
    G = system.models["liquid"].end_members[("A",)]
    for T in (300.0, 900.0, 2500.0):
        assert G.value(T) == pytest.approx(1000.0 + 2.5e6 / T - 2.6e8 / T**2 + 1.2e10 / T**3, rel=1e-14)
        assert G.derivative(T) == pytest.approx((G.value(T + 1e-3) - G.value(T - 1e-3)) / 2e-3, rel=1e-7)
    assert_refused(write(tmp_path, "low.toml", VALID.replace(PIECE, piece.replace("from = 298.15, ", ""))),
                   "phase.liquid.G.A[0].i", "plausible Gibbs energy")


def test_compounds_of_two_files_built_on_must_agree_unless_the_file_gives_its_own(tmp_path, ternary):
    write(tmp_path, "c-b.toml", BC + '''[phase.AB2]
model = "compound"
formula = "CB2"
reference = { C = "fcc", B = "fcc" }
formation = { a = -5000.0 }
''')
    assert_refused(ternary, "phase.AB2", "differs between a-b.toml and c-b.toml")
    write(tmp_path, "a-b-c.toml", ABC + '''[phase.AB2]
model = "compound"
formula = "AB2"
reference = { A = "fcc", B = "fcc" }
formation = { a = -6000.0 }
''')
    system = load_system(ternary)
    assert system.phases["AB2"].formation.value(800.0) == pytest.approx(-6000.0)
