"""A bad system file is reported in one line naming the file, the key and what was expected
(issue 2); nothing in a file is evaluated as code. The expected keys and wording follow
systems/FORMAT.md."""

from __future__ import annotations

from pathlib import Path

import pytest

from ladle.engine import SystemFileError, TemperatureOutOfRange, equilibrate, load_system

SHIPPED = Path(__file__).resolve().parents[2] / "systems"

VALID = '''
elements = ["A", "B"]
molar_mass = { A = 60.0, B = 30.0 }
source = "Synthetic test system: invented parameters."

[phase.liquid]
model = "solution"
G.A = [ { upto = 3000.0, a = 12000.0, b = -10.0 } ]
G.B = [ { upto = 3000.0, a = 10000.0, b = -10.0 } ]

[phase.fcc]
model = "solution"
G.A = [ { upto = 1000.0 }, { upto = 3000.0, a = 0.0 } ]
G.B = [ { upto = 3000.0, a = 6000.0 } ]
L = [ { a = 15000.0, b = -2.0 } ]

[phase.AB]
model = "compound"
formula = "AB"
reference = { A = "fcc", B = "fcc" }
formation = { a = -8000.0 }
'''

FCC_GB = "G.B = [ { upto = 3000.0, a = 6000.0 } ]"
FCC_GA = "G.A = [ { upto = 1000.0 }, { upto = 3000.0, a = 0.0 } ]"

# (case, replace this, by this, key named in the message, words of what was expected)
CASES = [
    ("missing element energy", FCC_GB, "", "phase.fcc.G.B", "missing"),
    ("unsorted pieces", FCC_GA, "G.A = [ { upto = 2000.0 }, { upto = 1000.0 } ]", "phase.fcc.G.A[1].upto", "increasing 'upto'"),
    ("overlapping pieces", FCC_GA, "G.A = [ { upto = 1000.0 }, { upto = 1000.0 } ]", "phase.fcc.G.A[1].upto", "increasing 'upto'"),
    ("piece without upper limit", FCC_GA, "G.A = [ { a = 0.0 } ]", "phase.fcc.G.A[0]", "missing 'upto'"),
    ("unknown model", 'model = "compound"', 'model = "gas"', "phase.AB.model", "unknown model 'gas'"),
    ("non-numeric coefficient", "a = 6000.0", 'a = "6000"', "phase.fcc.G.B[0].a", "expected a number"),
    ("boolean coefficient", "L = [ { a = 15000.0, b = -2.0 } ]", "L = [ { a = true } ]", "phase.fcc.L[0].a", "expected a number"),
    ("unknown coefficient", "formation = { a = -8000.0 }", "formation = { a = -8000.0, z = 1.0 }", "phase.AB.formation.z", "unknown key"),
    ("formula with an element not in the system", 'formula = "AB"', 'formula = "AZn"', "phase.AB.formula", "Zn is not in this system"),
    ("unreadable formula", 'formula = "AB"', 'formula = "A-B"', "phase.AB.formula", "cannot read formula"),
    ("compound reference not a phase name", 'reference = { A = "fcc", B = "fcc" }', 'reference = { A = "fcc", B = 3 }',
     "phase.AB.reference.B", "solution phase of this system"),
    ("molar mass zero", "B = 30.0 }", "B = 0.0 }", "molar_mass.B", "positive molar mass"),
    ("molar mass negative", "B = 30.0 }", "B = -30.0 }", "molar_mass.B", "positive molar mass"),
    # 1e308 g/mol of gold showed every tin alloy as '0 wt%' Sn (a wrong answer, status 0)
    ("molar mass beyond the periodic table", "B = 30.0 }", "B = 1e308 }", "molar_mass.B", "from 1 to 300"),
    ("molar mass below hydrogen's", "B = 30.0 }", "B = 1e-300 }", "molar_mass.B", "from 1 to 300"),
    # found by fuzzing: ladle diagram of a range of 1e-9 at% ran for minutes, of 1e-300 at% ended in a traceback
    ("covered range too narrow", 'source = "Synthetic', 'covers_at_percent = [0, 1e-9]\nsource = "Synthetic',
     "covers_at_percent", "at least 0.01 at%"),
    # a window beyond the pieces (3000 K) ended in 'min() arg is an empty sequence'
    ("diagram window beyond the pieces", 'source = "Synthetic', 'temperature_range_K = [300, 5000]\nsource = "Synthetic',
     "temperature_range_K", "beyond the temperatures where every phase is defined (1-3000 K)"),
    ("diagram window of a ten-thousandth of a kelvin", 'source = "Synthetic',
     'temperature_range_K = [300, 300.0001]\nsource = "Synthetic', "temperature_range_K", "at least 1 K"),
    # covers_K below the window from the melting points inverted it: 'math domain error'
    ("covered temperatures outside the diagram window", 'source = "Synthetic', 'covers_K = [1, 2]\nsource = "Synthetic',
     "covers_K", "at least 1 K"),
    ("missing molar mass", "molar_mass = { A = 60.0, B = 30.0 }", "molar_mass = { A = 60.0 }", "molar_mass.B", "missing"),
    ("missing source", 'source = "Synthetic test system: invented parameters."', "", "source", "missing"),
    ("misspelt top-level key", "source =", "sourse =", "sourse", "unknown key"),
    ("one element only", 'elements = ["A", "B"]', 'elements = ["A"]', "elements", "two different element symbols"),
    ("same element twice", 'elements = ["A", "B"]', 'elements = ["A", "A"]', "elements", "two different element symbols"),
    # found by fuzzing: read and ignored
    ("phase notes not a text", 'model = "compound"', 'model = "compound"\nnotes = { a = 1 }', "phase.AB.notes",
     "expected a non-empty text"),
    ("interactions not a list", "L = [ { a = 15000.0, b = -2.0 } ]", "L = 15000.0", "phase.fcc.L", "expected a list"),
    # TOML integers have no bound: one beyond the float range raised OverflowError (a traceback)
    ("integer beyond the float range", "a = 6000.0", "a = 1" + "0" * 400, "phase.fcc.G.B[0].a", "expected a number"),
    ("integer molar mass beyond the float range", "B = 30.0 }", "B = 1" + "0" * 400 + " }", "molar_mass.B",
     "expected a number"),
]


def _write(tmp_path, text: str):
    path = tmp_path / "bad.toml"
    path.write_text(text, encoding="utf-8")
    return path


def test_the_base_file_is_valid(tmp_path):
    system = load_system(_write(tmp_path, VALID))
    assert system.elements == ("A", "B")
    assert sorted(system.phases) == ["AB", "fcc", "liquid"]


@pytest.mark.parametrize("case,old,new,key,expected", CASES, ids=[c[0] for c in CASES])
def test_bad_file_is_reported_in_one_line(tmp_path, case, old, new, key, expected):
    assert old in VALID, case
    with pytest.raises(SystemFileError) as err:
        load_system(_write(tmp_path, VALID.replace(old, new, 1)))
    message = str(err.value)
    assert "\n" not in message
    assert message.startswith("bad.toml: "), message
    assert f" {key}: " in message or f" {key}." in message or f"{key}:" in message, message
    assert expected in message, message


def test_not_toml_is_reported(tmp_path):
    with pytest.raises(SystemFileError) as err:
        load_system(_write(tmp_path, VALID.replace("[phase.fcc]", "[phase.fcc")))
    assert str(err.value).startswith("bad.toml: not valid TOML")
    assert "\n" not in str(err.value)


#: A fact appended to VALID: (case, the fact's lines, key named, words of what was expected).
FACT_CASES = [
    ("temperature beyond the float range", "temperature_C = 1" + "0" * 400, "check[0].temperature_C", "expected a number"),
    ("composition beyond the float range", "temperature_C = 500\nat_percent = 1" + "0" * 400, "check[0].at_percent",
     "expected a percentage"),
    ("tolerance beyond the float range", "temperature_C = 500\nat_percent = 30\ntolerance_K = 1" + "0" * 400,
     "check[0].tolerance_K", "positive number of kelvin"),
    # found by fuzzing: a tolerance of 1e308 K passed every check, a fact at 1e308 C was shown as a 309-digit number
    ("tolerance that cannot fail", "temperature_C = 500\nat_percent = 30\ntolerance_K = 1e308", "check[0].tolerance_K",
     "at most 100 kelvin (a wider spread cannot fail)"),
    ("composition tolerance that cannot fail", "temperature_C = 500\nat_percent = 30\ntolerance_at = 50",
     "check[0].tolerance_at", "at most 10 (a wider spread cannot fail)"),
    ("temperature beyond any file's", "temperature_C = 1e308\nat_percent = 30", "check[0].temperature_C",
     "beyond the 20000 K a file may name"),
    ("note not a text", "temperature_C = 500\nat_percent = 30\nnote = true", "check[0].note", "expected a text"),
    ("phase a table", "temperature_C = 500\nat_percent = 30\nphase = {}\npartner = \"liquid\"", "check[0].phase",
     "expected a phase of this system"),
    ("partner a list", "temperature_C = 500\nat_percent = 30\nphase = \"fcc\"\npartner = [\"liquid\"]", "check[0].partner",
     "expected a phase of this system"),
]


@pytest.mark.parametrize("case,lines,key,expected", FACT_CASES, ids=[c[0] for c in FACT_CASES])
def test_bad_fact_is_reported_in_one_line(tmp_path, case, lines, key, expected):
    """A boundary fact whose values TOML reads but the loader must refuse: these raised OverflowError
    (an integer beyond the float range) or TypeError (a table or list looked up among the phases)."""
    fact = f'\n[[check]]\nkind = "boundary"\nsource = "invented for this test"\n{lines}\n'
    with pytest.raises(SystemFileError) as err:
        load_system(_write(tmp_path, VALID + fact))
    message = str(err.value)
    assert "\n" not in message and message.startswith(f"bad.toml: {key}: "), message
    assert expected in message, message


@pytest.mark.parametrize("case,text", [
    ("arrays nested thousands deep", "x = " + "[" * 100_000 + "]" * 100_000),
    ("inline tables nested thousands deep", "x = " + "{a=" * 3000 + "1" + "}" * 3000),
    ("an integer of more digits than Python reads", "x = " + "9" * 5000),
], ids=lambda c: c if isinstance(c, str) and len(c) < 60 else "")
def test_toml_that_python_cannot_read_is_reported(tmp_path, case, text):
    """tomllib raised RecursionError on deep nesting and a ValueError naming no file on a 5000-digit
    integer."""
    with pytest.raises(SystemFileError) as err:
        load_system(_write(tmp_path, VALID + text + "\n"))
    assert str(err.value).startswith("bad.toml: not valid TOML") and "\n" not in str(err.value)


def test_a_value_too_long_to_write_is_described_not_quoted(tmp_path):
    """A hexadecimal integer of 4000 digits (4800 decimal ones) is valid TOML; its repr raised ValueError."""
    with pytest.raises(SystemFileError) as err:
        load_system(_write(tmp_path, VALID.replace("formation = { a = -8000.0 }", "formation = { a = 0x" + "f" * 4000 + " }")))
    assert "phase.AB.formation.a: expected a number, found a value holding an integer of thousands of digits" in str(err.value)


def test_missing_file_is_reported(tmp_path):
    with pytest.raises(SystemFileError, match="no such file"):
        load_system(tmp_path / "absent.toml")


def test_nothing_in_a_file_is_run_as_code(tmp_path):
    marker = tmp_path / "ran"
    text = VALID.replace("a = 6000.0", f"a = \"__import__('os').system('touch {marker}')\"")
    with pytest.raises(SystemFileError, match="expected a number"):
        load_system(_write(tmp_path, text))
    assert not marker.exists()


def test_temperature_outside_every_piece(tmp_path):
    # Pieces end at 3000 K (and the first starts at 1 K by default): outside, an error, never
    # an extrapolation (systems/FORMAT.md).
    system = load_system(_write(tmp_path, VALID))
    assert system.model_range_K == (1.0, 3000.0)
    with pytest.raises(TemperatureOutOfRange) as err:
        equilibrate(system, 3500.0, 0.3)
    assert "3500.00 K is outside" in str(err.value) and "1-3000 K" in str(err.value)


def test_temperature_below_the_first_piece(tmp_path):
    text = VALID.replace("G.A = [ { upto = 3000.0, a = 12000.0, b = -10.0 } ]",
                         "G.A = [ { from = 500.0, upto = 3000.0, a = 12000.0, b = -10.0 } ]")
    system = load_system(_write(tmp_path, text))
    assert system.model_range_K == (500.0, 3000.0)
    with pytest.raises(TemperatureOutOfRange, match="400.00 K is outside"):
        equilibrate(system, 400.0, 0.3)


def test_a_broken_file_built_on_is_named_as_reached_from_the_file_read(tmp_path):
    """The message named only sn-ag.toml, a file the person had not asked for (and not which of
    the two of that name, beside or shipped, was read)."""
    (tmp_path / "sac.toml").write_text((SHIPPED / "ag-cu-sn.toml").read_text(encoding="utf-8"), encoding="utf-8")
    (tmp_path / "sn-ag.toml").write_text(VALID.replace('["A", "B"]', '["Sn", "Ag"]'), encoding="utf-8")
    with pytest.raises(SystemFileError) as err:
        load_system(tmp_path / "sac.toml")
    assert str(err.value).startswith("sac.toml: builds_on: sn-ag.toml: molar_mass.Sn: missing"), str(err.value)


def test_the_element_library_is_not_a_file_to_build_on(tmp_path):
    """It was read as a system file: 'elements.toml: Pb: unknown key', naming neither the file
    read nor the key that led there."""
    text = (SHIPPED / "ag-cu-sn.toml").read_text(encoding="utf-8")
    (tmp_path / "sac.toml").write_text(text.replace('builds_on = [', 'builds_on = ["elements.toml", ', 1), encoding="utf-8")
    with pytest.raises(SystemFileError) as err:
        load_system(tmp_path / "sac.toml")
    assert str(err.value).startswith("sac.toml: builds_on: expected names of system files"), str(err.value)


def test_a_variant_of_a_missing_file_names_the_variant_and_its_key(tmp_path):
    (tmp_path / "v.toml").write_text('variant_of = "absent.toml"\nwithout = ["fcc"]\n', encoding="utf-8")
    with pytest.raises(SystemFileError) as err:
        load_system(tmp_path / "v.toml")
    assert str(err.value).startswith("v.toml: variant_of: ") and str(err.value).endswith("absent.toml: no such file")


@pytest.mark.parametrize("table", ["tolerance_at", "tolerance_factor"])
def test_a_tolerance_by_phase_naming_no_phase_is_refused(tmp_path, table):
    """'FCC' for 'fcc' was read and ignored, leaving the fcc end of the fact without a tolerance."""
    value = "{ FCC = 2.0 }" if table == "tolerance_at" else "{ FCC = 2 }"
    fact = ('\n[[check]]\nkind = "invariant"\nreaction = "eutectic"\nsource = "invented for this test"\n'
            f'temperature_C = 500\nphases = {{ liquid = 40, fcc = 10 }}\ntolerance_K = 5\n{table} = {value}\n')
    with pytest.raises(SystemFileError) as err:
        load_system(_write(tmp_path, VALID + fact))
    assert str(err.value).startswith(f"bad.toml: check[0].{table}.FCC: not a phase of this system"), str(err.value)


@pytest.mark.parametrize("sites", ["1e-9", "0.001"])
def test_a_sublattice_of_a_hundredth_of_a_site_or_less_is_refused(tmp_path, sites):
    """Found by fuzzing: fe-c with 1e-9 sites on austenite's iron sublattice kept ladle melt busy for
    minutes; with 1e-300 it ended in 'cannot reshape array of size 0'."""
    text = (SHIPPED / "fe-c.toml").read_text(encoding="utf-8")
    line = 'sublattices = [ { sites = 1, holds = ["Fe"] }, { sites = 1, holds = ["C", "Va"] } ]'
    assert line in text
    with pytest.raises(SystemFileError) as err:
        load_system(_write(tmp_path, text.replace(line, line.replace("sites = 1,", f"sites = {sites},", 1))))
    assert "phase.fcc.sublattices[0].sites: expected a positive number of sites per formula unit, at least 0.01" in str(err.value)


@pytest.mark.parametrize("table", ["check", "measured"])
def test_a_fact_given_twice_is_refused(tmp_path, table):
    """Found by fuzzing: a repeated [[check]] counted twice among the checks passed (7 of 8 for a
    file of seven), a repeated [[measured]] fact weighed double in a fit."""
    spread = "tolerance_K = 5" if table == "check" else "uncertainty_K = 5"
    fact = (f'\n[[{table}]]\nkind = "liquidus"\nsource = "invented for this test"\ntemperature_C = 900\n'
            f'at_percent = 30\n{spread}\n')
    with pytest.raises(SystemFileError) as err:
        load_system(_write(tmp_path, VALID + fact + fact))
    assert str(err.value).startswith(f"bad.toml: {table}[1]: repeats {table}[0] key for key"), str(err.value)


def test_a_phase_given_twice_under_two_names_is_refused(tmp_path):
    """Found by fuzzing: fe-si with its bcc copied as bcc2 kept ladle check busy for minutes."""
    copy = VALID[VALID.index("[phase.fcc]"):VALID.index("[phase.AB]")].replace("[phase.fcc]", "[phase.fcc2]")
    with pytest.raises(SystemFileError) as err:
        load_system(_write(tmp_path, VALID + "\n" + copy))
    assert str(err.value) == "bad.toml: phase.fcc2: the same phase as fcc (every energy alike); give a phase once"


def test_a_ternarys_covered_range_of_an_element_too_narrow_is_refused(tmp_path):
    """Found by fuzzing: Ag-Cu-Sn with Cu covered over 1e-7 at% took two minutes per isothermal section."""
    text = (SHIPPED / "ag-cu-sn.toml").read_text(encoding="utf-8")
    old = "covers_at_percent = { Ag = [0, 5.5], Cu = [0, 3.7] }"
    assert old in text
    (tmp_path / "sac.toml").write_text(text.replace(old, old.replace("3.7", "1e-7")), encoding="utf-8")
    with pytest.raises(SystemFileError) as err:
        load_system(tmp_path / "sac.toml")
    assert str(err.value).startswith("sac.toml: covers_at_percent.Cu: 0-1e-07 at% is too narrow a range"), str(err.value)
