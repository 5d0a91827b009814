"""Reading and validating system files (TOML; the format is described in systems/FORMAT.md).

Every problem is reported as a SystemFileError whose one-line message names the file, the key
and what was expected. Nothing in a file is evaluated as code.
"""

from __future__ import annotations

import math
import re
from functools import lru_cache
import tomllib
from pathlib import Path
from typing import Any

import numpy as np

from ..errors import SystemFileError
from .facts import parse_facts, reject_repeated_facts
from .trade_names import read_trade_names
from ..models.formula import parse_formula
from ..models.phases import CompoundPhase, MagneticModel, SolutionPhase
from ..models.polynomials import COEFFICIENTS, TemperatureFunction
from ..models.system import System

from .plain_text import has_controls, without_controls
_SYMBOL = re.compile(r"^[A-Z][a-z]?$")
_TOP_KEYS = {"elements", "molar_mass", "source", "title", "safety", "notes", "covers_at_percent", "covers_K",
             "temperature_range_K", "phase", "check", "measured", "fit", "fit_report",
             "trade_names", "trade_line", "heat_treatment"}
_SOLUTION_KEYS = {"model", "G", "L", "magnetic", "notes", "source"}
_COMPOUND_KEYS = {"model", "formula", "reference", "formation", "notes", "source"}
_MAGNETIC_KEYS = {"above_curie_fraction", "curie_K", "moment", "curie_L", "moment_L", "antiferro_factor"}
_LOWEST_K = 1.0


class _Reader:
    """Holds the file name so every message can name it."""

    def __init__(self, path: Path) -> None:
        self.path = path

    def fail(self, key: str, what: str) -> SystemFileError:
        where = f"{self.path.name}: {key}: " if key else f"{self.path.name}: "
        return SystemFileError(where + what)

    def number(self, value: Any, key: str) -> float:
        if isinstance(value, bool) or not isinstance(value, (int, float)) or not math.isfinite(value):
            raise self.fail(key, f"expected a number, found {value!r}")
        return float(value)

    def text(self, value: Any, key: str) -> str:
        """A non-empty text, without control characters (it may reach a terminal)."""
        if not isinstance(value, str) or not without_controls(value).strip():
            raise self.fail(key, "expected a non-empty text")
        return without_controls(value, keep_newlines=True)

    def table(self, value: Any, key: str) -> dict:
        if not isinstance(value, dict):
            raise self.fail(key, "expected a table")
        return value

    def known_keys(self, table: dict, allowed: set[str], key: str) -> None:
        for k in table:
            if k not in allowed:
                raise self.fail(f"{key}.{k}" if key else k, f"unknown key; expected one of {', '.join(sorted(allowed))}")

    # --- temperature functions --------------------------------------------------------------
    def expression(self, value: Any, key: str) -> TemperatureFunction:
        """One expression without pieces: {a = .., b = ..}."""
        table = self.table(value, key)
        self.known_keys(table, set(COEFFICIENTS), key)
        coeffs = {k: self.number(v, f"{key}.{k}") for k, v in table.items()}
        return TemperatureFunction.constant_terms(coeffs, 0.0, math.inf)

    def pieces(self, value: Any, key: str) -> TemperatureFunction:
        """A list of pieces [{upto = .., a = ..}, ...] in increasing `upto`."""
        if not isinstance(value, list) or not value:
            raise self.fail(key, "expected a list of pieces such as [ { upto = 3000, a = 0, b = 0 } ]")
        bounds = [_LOWEST_K]
        rows = []
        for i, piece in enumerate(value):
            k = f"{key}[{i}]"
            piece = self.table(piece, k)
            allowed = set(COEFFICIENTS) | {"upto"} | ({"from"} if i == 0 else set())
            self.known_keys(piece, allowed, k)
            if "upto" not in piece:
                raise self.fail(k, "missing 'upto' (the piece's upper temperature limit, K)")
            if i == 0 and "from" in piece:
                bounds[0] = self.number(piece["from"], f"{k}.from")
                if bounds[0] <= 0:
                    raise self.fail(f"{k}.from", "expected a temperature above 0 K")
            upto = self.number(piece["upto"], f"{k}.upto")
            if upto <= bounds[-1]:
                raise self.fail(f"{k}.upto", f"pieces must be listed in increasing 'upto' ({upto:g} K follows {bounds[-1]:g} K)")
            bounds.append(upto)
            rows.append([self.number(piece.get(c, 0.0), f"{k}.{c}") for c in COEFFICIENTS])
        return TemperatureFunction(tuple(bounds), np.array(rows))

    def expressions(self, value: Any, key: str) -> tuple[TemperatureFunction, ...]:
        if not isinstance(value, list):
            raise self.fail(key, "expected a list of tables such as [ { a = -5000, b = 1.5 }, { a = 800 } ]")
        return tuple(self.expression(v, f"{key}[{i}]") for i, v in enumerate(value))


class ElementLibrary:
    """The pure-element Gibbs energies of systems/elements.toml (or another library file)."""

    def __init__(self, path: Path) -> None:
        self.path = path
        self._doc: dict | None = None
        self._cache: dict[tuple[str, str], TemperatureFunction] = {}

    def _document(self) -> dict:
        if self._doc is None:
            self._doc = _read_toml(self.path)
        return self._doc

    def function(self, element: str, structure: str, key: str, reader: _Reader) -> TemperatureFunction:
        """G (J/mol) of `element` in `structure`; `key` and `reader` name the referring file in errors."""
        if (element, structure) not in self._cache:
            doc = self._document()
            entry = doc.get(element)
            if not isinstance(entry, dict):
                raise reader.fail(key, f"element {element} is not in the element library {self.path.name}")
            struct = entry.get(structure)
            if not isinstance(struct, dict) or "G" not in struct:
                known = sorted(k for k, v in entry.items() if isinstance(v, dict))
                raise reader.fail(key, f"{element} has no structure {structure!r} in {self.path.name}; it has {', '.join(known) or 'none'}")
            lib_reader = _Reader(self.path)
            self._cache[(element, structure)] = lib_reader.pieces(struct["G"], f"{element}.{structure}.G")
        return self._cache[(element, structure)]


def _read_toml(path: Path) -> dict:
    try:
        data = path.read_bytes()
    except FileNotFoundError:
        raise SystemFileError(f"{path}: no such file") from None
    except OSError as e:
        raise SystemFileError(f"{path}: cannot read: {e.strerror}") from None
    try:
        return tomllib.loads(data.decode("utf-8"))
    except UnicodeDecodeError:
        raise SystemFileError(f"{path.name}: not a text file (expected UTF-8 TOML)") from None
    except tomllib.TOMLDecodeError as e:
        raise SystemFileError(f"{path.name}: not valid TOML: {e}") from None


LIBRARY_FILE = "elements.toml"


def shipped_folder() -> Path:
    """The folder of the shipped system files."""
    import ladle.systems

    return Path(ladle.systems.__file__).parent


@lru_cache(maxsize=1)
def shipped_library() -> ElementLibrary:
    """The shipped pure-element library (systems/elements.toml)."""
    return ElementLibrary(shipped_folder() / LIBRARY_FILE)


def load_system(path: Path | str, library: ElementLibrary | None = None, name: str | None = None,
                document: dict | None = None) -> System:
    """Read, validate and build the System in `path`.

    `document` may hold the already parsed TOML (the fitting command rebuilds systems from edited
    documents); `library` is the element library (default: the shipped one).
    """
    path = Path(path)
    if library is None:
        library = shipped_library()
    doc = _read_toml(path) if document is None else document
    r = _Reader(path)
    r.known_keys(doc, _TOP_KEYS, "")
    for key in ("elements", "molar_mass", "source", "phase"):
        if key not in doc:
            raise r.fail(key, "missing (required)")
    elements = doc["elements"]
    if (not isinstance(elements, list) or len(elements) != 2 or not all(isinstance(e, str) and _SYMBOL.match(e) for e in elements)
            or elements[0] == elements[1]):
        raise r.fail("elements", "expected two different element symbols, such as [\"Cu\", \"Ni\"]")
    elements = (elements[0], elements[1])
    mm = r.table(doc["molar_mass"], "molar_mass")
    masses = []
    for el in elements:
        if el not in mm:
            raise r.fail(f"molar_mass.{el}", "missing (g/mol of every element is required)")
        m = r.number(mm[el], f"molar_mass.{el}")
        if m <= 0:
            raise r.fail(f"molar_mass.{el}", f"expected a positive molar mass in g/mol, found {m:g}")
        masses.append(m)
    r.known_keys(mm, set(elements), "molar_mass")
    source = r.text(doc["source"], "source")
    covers = (0.0, 1.0)
    if "covers_at_percent" in doc:
        c = doc["covers_at_percent"]
        if not isinstance(c, list) or len(c) != 2:
            raise r.fail("covers_at_percent", "expected [from, to] in at% of " + elements[1])
        lo, hi = (r.number(v, "covers_at_percent") for v in c)
        if not 0 <= lo < hi <= 100:
            raise r.fail("covers_at_percent", "expected 0 <= from < to <= 100 (at%)")
        covers = (lo / 100.0, hi / 100.0)
    covers_K = (0.0, float("inf"))
    if "covers_K" in doc:
        c = doc["covers_K"]
        if not isinstance(c, list) or len(c) != 2:
            raise r.fail("covers_K", "expected [low, high]: the temperatures (K) the model is meant for")
        lo, hi = (r.number(v, "covers_K") for v in c)
        if not 0 <= lo < hi:
            raise r.fail("covers_K", "expected 0 <= low < high (K)")
        covers_K = (lo, hi)
    t_range = None
    if "temperature_range_K" in doc:
        c = doc["temperature_range_K"]
        if not isinstance(c, list) or len(c) != 2:
            raise r.fail("temperature_range_K", "expected [low, high] in K")
        lo, hi = (r.number(v, "temperature_range_K") for v in c)
        if not 0 < lo < hi:
            raise r.fail("temperature_range_K", "expected 0 < low < high (K)")
        t_range = (lo, hi)

    phase_table = r.table(doc["phase"], "phase")
    if not phase_table:
        raise r.fail("phase", "expected at least one phase")
    solutions: dict[str, SolutionPhase] = {}
    compound_docs = {}
    for pname, ptable in phase_table.items():
        key = f"phase.{pname}"
        ptable = r.table(ptable, key)
        model = ptable.get("model")
        if model == "solution":
        if has_controls(pname):
            raise r.fail(f"phase.{pname!r}", "a phase name may not hold control characters")
            solutions[pname] = _solution(r, library, pname, ptable, elements)
        elif model == "compound":
            compound_docs[pname] = ptable
        else:
            raise r.fail(f"{key}.model", f"unknown model {model!r}; expected \"solution\" or \"compound\"")
    phases: dict = dict(solutions)
    for pname, ptable in compound_docs.items():
        phases[pname] = _compound(r, library, pname, ptable, elements, solutions)

    system = System(
        name=name or path.stem.lower(),
        path=path,
        elements=elements,
        molar_mass=np.array(masses),
        source=source,
        phases=phases,
        title=r.text(doc["title"], "title") if "title" in doc else "",
        safety=r.text(doc["safety"], "safety") if "safety" in doc else "",
        notes=r.text(doc["notes"], "notes") if "notes" in doc else "",
        covers=covers,
        covers_K=covers_K,
        declared_temperature_range_K=t_range,
        document=doc,
    )
    system.checks = parse_facts(doc.get("check", []), "check", system, r.fail)
    system.measured = parse_facts(doc.get("measured", []), "measured", system, r.fail)
    reject_repeated_facts(system.checks, system.measured, r.fail)
    read_trade_names(doc, phases, r.fail)
    if "fit" in doc:
        fit = r.table(doc["fit"], "fit")
        r.known_keys(fit, {"free"}, "fit")
        free = fit.get("free", [])
        if not isinstance(free, list) or not all(isinstance(f, str) for f in free):
            raise r.fail("fit.free", "expected a list of parameter paths such as [\"liquid.L.0.a\"]")
        system.fit_free = list(free)
    lo, hi = system.model_range_K
    if lo >= hi:
        raise r.fail("phase", f"the phases share no temperature range (they overlap from {lo:g} K to {hi:g} K)")
    return system


def _element_function(r: _Reader, library: ElementLibrary, value: Any, key: str, element: str) -> TemperatureFunction:
    if isinstance(value, list):
        return r.pieces(value, key)
    if isinstance(value, str):
        return library.function(element, value, key, r)
    if isinstance(value, dict):
        r.known_keys(value, set(COEFFICIENTS) | {"library"}, key)
        if "library" not in value or not isinstance(value["library"], str):
            raise r.fail(key, "a table here needs 'library' naming a structure of the element library, e.g. { library = \"bct\", a = 4000 }")
        base = library.function(element, value["library"], key, r)
        extra = {k: v for k, v in value.items() if k != "library"}
        return base.plus(r.expression(extra, key))
    raise r.fail(key, "expected a list of pieces, a structure name of the element library, or { library = \"...\", a = ... }")


def _solution(r: _Reader, library: ElementLibrary, name: str, table: dict, elements: tuple[str, str]) -> SolutionPhase:
    key = f"phase.{name}"
    r.known_keys(table, _SOLUTION_KEYS, key)
    if "G" not in table:
        raise r.fail(f"{key}.G", "missing: the Gibbs energy of each pure element in this phase")
    g_table = r.table(table["G"], f"{key}.G")
    r.known_keys(g_table, set(elements), f"{key}.G")
    endmembers = []
    for el in elements:
        if el not in g_table:
            raise r.fail(f"{key}.G.{el}", "missing: every element of the system needs its Gibbs energy in every solution phase")
        endmembers.append(_element_function(r, library, g_table[el], f"{key}.G.{el}", el))
    interactions = {(0, 1): r.expressions(table.get("L", []), f"{key}.L")}
    magnetic = None
    if "magnetic" in table:
        magnetic = _magnetic(r, table["magnetic"], f"{key}.magnetic", elements)
    return SolutionPhase(name, elements, tuple(endmembers), interactions, magnetic)


def _magnetic(r: _Reader, value: Any, key: str, elements: tuple[str, str]) -> MagneticModel:
    m = r.table(value, key)
    r.known_keys(m, _MAGNETIC_KEYS, key)
    for req in ("above_curie_fraction", "curie_K", "moment"):
        if req not in m:
            raise r.fail(f"{key}.{req}", "missing (required for a magnetic contribution)")
    p = r.number(m["above_curie_fraction"], f"{key}.above_curie_fraction")
    if not 0 < p < 1:
        raise r.fail(f"{key}.above_curie_fraction", "expected a number between 0 and 1 (0.40 for bcc, 0.28 otherwise)")

    def per_element(k: str) -> np.ndarray:
        t = r.table(m[k], f"{key}.{k}")
        r.known_keys(t, set(elements), f"{key}.{k}")
        vals = []
        for el in elements:
            if el not in t:
                raise r.fail(f"{key}.{k}.{el}", "missing: give a value for every element (0 if not magnetic)")
            vals.append(r.number(t[el], f"{key}.{k}.{el}"))
        return np.array(vals)

    factor = r.number(m.get("antiferro_factor", -3.0), f"{key}.antiferro_factor")
    if factor >= 0:
        raise r.fail(f"{key}.antiferro_factor", "expected a negative number (-1 for bcc, -3 for fcc and hcp)")
    return MagneticModel(p, per_element("curie_K"), per_element("moment"),
                         {(0, 1): r.expressions(m.get("curie_L", []), f"{key}.curie_L")},
                         {(0, 1): r.expressions(m.get("moment_L", []), f"{key}.moment_L")}, factor)


def _compound(r: _Reader, library: ElementLibrary, name: str, table: dict, elements: tuple[str, str],
              solutions: dict[str, SolutionPhase]) -> CompoundPhase:
    key = f"phase.{name}"
    r.known_keys(table, _COMPOUND_KEYS, key)
    for req in ("formula", "reference", "formation"):
        if req not in table:
            raise r.fail(f"{key}.{req}", "missing (required for a compound)")
    try:
        counts = parse_formula(table["formula"])
    except ValueError as e:
        raise r.fail(f"{key}.formula", str(e)) from None
    for el in counts:
        if el not in elements:
            raise r.fail(f"{key}.formula", f"element {el} is not in this system ({', '.join(elements)})")
    total = sum(counts.values())
    x = np.array([counts.get(el, 0.0) / total for el in elements])
    refs_table = r.table(table["reference"], f"{key}.reference")
    r.known_keys(refs_table, set(elements), f"{key}.reference")
    refs = []
    for i, el in enumerate(elements):
        ref = refs_table.get(el)
        if ref is None:
            if x[i] > 0:
                raise r.fail(f"{key}.reference.{el}", "missing: name the phase whose pure-element energy is the reference")
            ref = next(iter(solutions), None)
        if ref in solutions:
            refs.append(solutions[ref].endmembers[i])
        elif isinstance(ref, str):      # a structure of the element library
            refs.append(library.function(el, ref, f"{key}.reference.{el}", r))
        else:
            raise r.fail(f"{key}.reference.{el}", f"expected a solution phase of this system ({', '.join(solutions) or 'none'}) "
                         f"or a structure of the element library, found {ref!r}")
    formation = r.expression(table["formation"], f"{key}.formation")
    return CompoundPhase(name, elements, x, tuple(refs), formation)
