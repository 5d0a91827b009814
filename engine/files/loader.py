"""Reading and validating system files (TOML; the format is described in systems/FORMAT.md).

Every problem is reported as a SystemFileError whose one-line message names the file, the key
and what was expected. Nothing in a file is evaluated as code.
"""

from __future__ import annotations

import os
import re
from functools import lru_cache, partial
import tomllib
from pathlib import Path
from typing import Any

import numpy as np

from ..errors import SystemFileError
from . import bounds as limits
from .alloys import read_alloys
from .coverage import read_element_ranges
from .facts import parse_facts, reject_repeated_facts
from .trade_names import read_trade_names
from .variants import is_variant, load_variant
from .phase_reader import read_phases
from ..models.polynomials import COEFFICIENTS, TemperatureFunction
from ..models.system import System
from .plain_text import has_controls, without_controls
from .regular_files import open_regular, require_regular

_SYMBOL = re.compile(r"^[A-Z][a-z]?$")
_TOP_KEYS = {"elements", "molar_mass", "source", "title", "safety", "notes", "covers_at_percent", "covers_K",
             "temperature_range_K", "phase", "check", "measured", "fit", "fit_report", "builds_on",
             "trade_names", "trade_line", "trade_line_note", "heat_treatment", "alloy", "cast_iron"}
_LOWEST_K = 1.0


class _Reader:
    """Holds the file name so every message can name it."""

    def __init__(self, path: Path) -> None:
        self.path = path

    def fail(self, key: str, what: str) -> SystemFileError:
        where = f"{self.path.name}: {key}: " if key else f"{self.path.name}: "
        return SystemFileError(where + what)

    def number(self, value: Any, key: str) -> float:
        if not limits.finite_number(value):
            raise self.fail(key, f"expected a number, found {limits.shown_value(value)}")
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
        limits.check_terms([coeffs.get(c, 0.0) for c in COEFFICIENTS], _LOWEST_K, limits.MAX_TEMPERATURE_K, key, self.fail)
        return TemperatureFunction.constant_terms(coeffs, 0.0, limits.MAX_TEMPERATURE_K)

    def pieces(self, value: Any, key: str) -> TemperatureFunction:
        """A list of pieces [{upto = .., a = ..}, ...] in increasing `upto`."""
        if not isinstance(value, list) or not value:
            raise self.fail(key, "expected a list of pieces such as [ { upto = 3000, a = 0, b = 0 } ]")
        limits.check_count(len(value), limits.MAX_PIECES, key, "pieces", self.fail)
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
            limits.check_temperature(upto, f"{k}.upto", self.fail)
            bounds.append(upto)
            rows.append([self.number(piece.get(c, 0.0), f"{k}.{c}") for c in COEFFICIENTS])
            limits.check_terms(rows[-1], bounds[-2], upto, k, self.fail)
        return TemperatureFunction(tuple(bounds), np.array(rows))

    def expressions(self, value: Any, key: str) -> tuple[TemperatureFunction, ...]:
        if not isinstance(value, list):
            raise self.fail(key, "expected a list of tables such as [ { a = -5000, b = 1.5 }, { a = 800 } ]")
        limits.check_count(len(value), limits.MAX_TERMS, key, "coefficients", self.fail)
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
        with open_regular(path) as f:       # a FIFO or folder is refused at once, not waited on
            size = os.fstat(f.fileno()).st_size
            if size > limits.MAX_FILE_BYTES:
                raise SystemFileError(f"{path.name}: {size} bytes; a system file may hold at most {limits.MAX_FILE_BYTES} bytes")
            data = f.read()
    except FileNotFoundError:
        raise SystemFileError(f"{path}: no such file") from None
    except OSError as e:
        raise SystemFileError(f"{path}: cannot read: {e.strerror}") from None
    try:
        return tomllib.loads(data.decode("utf-8-sig"))   # a byte-order mark (some Windows editors) is dropped
    except UnicodeDecodeError:
        raise SystemFileError(f"{path.name}: not a text file (expected UTF-8 TOML)") from None
    except ValueError as e:                 # TOMLDecodeError, or an integer of more digits than Python reads
        raise SystemFileError(f"{path.name}: not valid TOML: {e}") from None
    except RecursionError:                  # arrays or tables nested thousands deep
        raise SystemFileError(f"{path.name}: not valid TOML: arrays or tables nested too deeply") from None


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
                document: dict | None = None, building: tuple[Path, ...] = ()) -> System:
    """Read, validate and build the System in `path`.

    `document` may hold the already parsed TOML (the fitting command rebuilds systems from edited
    documents); `library` is the element library (default: the shipped one); `building` holds
    the files being built on this one (`builds_on`), to refuse a cycle.
    """
    path = Path(path)
    if library is None:
        library = shipped_library()
    doc = _read_toml(path) if document is None else document
    if is_variant(doc):
        return load_variant(path, doc, name, _read_toml, partial(load_system, library=library))
    r = _Reader(path)
    r.known_keys(doc, _TOP_KEYS, "")
    for key in ("elements", "source") + (() if "builds_on" in doc else ("molar_mass", "phase")):
        if key not in doc:
            raise r.fail(key, "missing (required)")
    elements = doc["elements"]
    if (not isinstance(elements, list) or not 2 <= len(elements) <= limits.MAX_ELEMENTS
            or not all(isinstance(e, str) and _SYMBOL.match(e) for e in elements) or len(set(elements)) != len(elements)):
        raise r.fail("elements", f"expected two different element symbols or more (at most {limits.MAX_ELEMENTS}), "
                     "such as [\"Cu\", \"Ni\"]")
    elements = tuple(elements)
    bases = _bases(r, library, doc, elements, path, building)
    mm = r.table(doc.get("molar_mass", {}), "molar_mass")
    masses = []
    for el in elements:
        if el not in mm:
            known = [float(b.molar_mass[b.elements.index(el)]) for _n, b in bases if el in b.elements]
            if not known:
                raise r.fail(f"molar_mass.{el}", "missing (g/mol of every element is required)")
            masses.append(known[0])
            continue
        m = r.number(mm[el], f"molar_mass.{el}")
        lightest, heaviest = limits.MOLAR_MASS_G_PER_MOL
        if not lightest <= m <= heaviest:
            raise r.fail(f"molar_mass.{el}", f"expected a positive molar mass in g/mol, from {lightest:g} to "
                         f"{heaviest:g} (those of the periodic table), found {m:g}")
        masses.append(m)
    r.known_keys(mm, set(elements), "molar_mass")
    source = r.text(doc["source"], "source")
    covers, covers_elements = (0.0, 1.0), {}
    if "covers_at_percent" in doc and len(elements) > 2:
        covers_elements = read_element_ranges(doc["covers_at_percent"], elements, r.fail)
    elif "covers_at_percent" in doc:
        c = doc["covers_at_percent"]
        if not isinstance(c, list) or len(c) != 2:
            raise r.fail("covers_at_percent", "expected [from, to] in at% of " + elements[1])
        lo, hi = (r.number(v, "covers_at_percent") for v in c)
        if not 0 <= lo < hi <= 100:
            raise r.fail("covers_at_percent", "expected 0 <= from < to <= 100 (at%)")
        if hi - lo < limits.MIN_ELEMENT_RANGE_AT_PERCENT:
            raise r.fail("covers_at_percent", f"{lo:g}-{hi:g} at% is too narrow a range; expected one of at least "
                         f"{limits.MIN_ELEMENT_RANGE_AT_PERCENT:g} at%")
        covers = (lo / 100.0, hi / 100.0)
    covers_K = (0.0, float("inf"))
    if "covers_K" in doc:
        c = doc["covers_K"]
        if not isinstance(c, list) or len(c) != 2:
            raise r.fail("covers_K", "expected [low, high]: the temperatures (K) the model is meant for")
        lo, hi = (r.number(v, "covers_K") for v in c)
        if not 0 <= lo < hi:
            raise r.fail("covers_K", "expected 0 <= low < high (K)")
        limits.check_temperature(hi, "covers_K", r.fail)
        covers_K = (lo, hi)
    t_range = None
    if "temperature_range_K" in doc:
        c = doc["temperature_range_K"]
        if not isinstance(c, list) or len(c) != 2:
            raise r.fail("temperature_range_K", "expected [low, high] in K")
        lo, hi = (r.number(v, "temperature_range_K") for v in c)
        if not 0 < lo < hi:
            raise r.fail("temperature_range_K", "expected 0 < low < high (K)")
        limits.check_temperature(hi, "temperature_range_K", r.fail)
        t_range = (lo, hi)

    phase_table = r.table(doc.get("phase", {}), "phase")
    if not phase_table and not bases:
        raise r.fail("phase", "expected at least one phase")
    for pname in phase_table:
        if has_controls(pname):
            raise r.fail(f"phase.{pname!r}", "a phase name may not hold control characters")
    phases, models = read_phases(r, library, phase_table, elements, bases)

    system = System(
        name=name or path.stem.lower(),
        path=path,
        elements=elements,
        molar_mass=np.array(masses),
        source=source,
        phases=phases,
        models=models,
        title=r.text(doc["title"], "title") if "title" in doc else "",
        safety=r.text(doc["safety"], "safety") if "safety" in doc else "",
        notes=r.text(doc["notes"], "notes") if "notes" in doc else "",
        covers=covers,
        covers_K=covers_K,
        covers_elements=covers_elements,
        declared_temperature_range_K=t_range,
        document=doc,
        built_from=tuple(dict.fromkeys(f for _n, b in bases for f in (b.path, *b.built_from))),
    )
    system.checks = parse_facts(doc.get("check", []), "check", system, r.fail)
    system.measured = parse_facts(doc.get("measured", []), "measured", system, r.fail)
    read_trade_names(doc, phases, r.fail)
    system.alloys = read_alloys(doc.get("alloy", []), elements, r.fail)
    reject_repeated_facts(system.checks, system.measured, r.fail)
    if "fit" in doc:
        fit = r.table(doc["fit"], "fit")
        r.known_keys(fit, {"free", "facts_at_percent"}, "fit")
        free = fit.get("free", [])
        if not isinstance(free, list) or not all(isinstance(f, str) for f in free):
            raise r.fail("fit.free", "expected a list of parameter paths such as [\"liquid.L.0.a\"]")
        system.fit_free = list(free)
        if "facts_at_percent" in fit:
            system.fit_covers = _fit_range(r, fit["facts_at_percent"], system)
    lo, hi = system.model_range_K
    if lo >= hi:
        raise r.fail("phase", f"the phases share no temperature range (they overlap from {lo:g} K to {hi:g} K)")
    _check_window(r, system)
    return system


def _check_window(r: _Reader, system: System) -> None:
    """Refuse a `temperature_range_K` beyond the temperatures where every phase is defined, and
    a `covers_K` that leaves diagrams less than MIN_WINDOW_K to be mapped over (a window of
    303-301 K ended in 'math domain error')."""
    m_lo, m_hi = system.model_range_K
    declared = system.declared_temperature_range_K
    if declared is not None and not m_lo <= declared[0] < declared[1] <= m_hi:
        raise r.fail("temperature_range_K", f"{declared[0]:g}-{declared[1]:g} K reaches beyond the temperatures where "
                     f"every phase is defined ({m_lo:g}-{m_hi:g} K)")
    w_lo, w_hi = system.temperature_range_K
    if not w_hi - w_lo >= limits.MIN_WINDOW_K:
        key = "covers_K" if declared is None else ("temperature_range_K" if system.covers_K == (0.0, float("inf"))
                                                   else "temperature_range_K and covers_K")
        raise r.fail(key, f"diagrams would be mapped over {w_lo:g}-{w_hi:g} K; expected a window of at least "
                     f"{limits.MIN_WINDOW_K:g} K, within where the phases are defined and covered")


def _fit_range(r: _Reader, value, system: System) -> tuple[float, float]:
    """The compositions (mole fraction of B) a binary's fit draws its [[measured]] facts from:
    `[fit] facts_at_percent`, a range of at% B holding the covered range (a file that others
    build on is fitted to facts of their ranges too)."""
    key = "fit.facts_at_percent"
    if len(system.elements) != 2:
        raise r.fail(key, "only for a system of two elements")
    if not isinstance(value, list) or len(value) != 2:
        raise r.fail(key, f"expected [from, to] in at% of {system.elements[1]}")
    lo, hi = (r.number(v, key) / 100.0 for v in value)
    c_lo, c_hi = system.covers
    if not 0 <= lo <= c_lo < c_hi <= hi <= 1:
        raise r.fail(key, f"expected 0 <= from < to <= 100 (at%), holding covers_at_percent "
                          f"({100 * c_lo:g}-{100 * c_hi:g})")
    return (lo, hi)


def _bases(r: _Reader, library: ElementLibrary, doc: dict, elements: tuple[str, ...], path: Path,
           building: tuple[Path, ...]) -> list[tuple[str, System]]:
    """The systems named by `builds_on` (file name, System): files beside this one, or else
    shipped ones, whose elements are all elements of this file."""
    if "builds_on" not in doc:
        return []
    names = doc["builds_on"]
    if not isinstance(names, list) or not names or not all(isinstance(n, str) for n in names):
        raise r.fail("builds_on", "expected a list of system files such as [\"ag-cu.toml\", \"sn-ag.toml\"]")
    limits.check_count(len(names), limits.MAX_ELEMENTS * (limits.MAX_ELEMENTS - 1) // 2, "builds_on", "files", r.fail)
    here = path.resolve()
    if len(building) >= limits.MAX_BUILD_DEPTH:
        raise r.fail("builds_on", f"files build on files more than {limits.MAX_BUILD_DEPTH} deep")
    out = []
    for n in names:
        if not n.endswith(".toml") or Path(n).name != n or n.startswith(".") or len(n) > 200 or n == LIBRARY_FILE:
            raise r.fail("builds_on", f"expected names of system files such as \"ag-cu.toml\" (beside this file, or shipped), found {n[:40]!r}")
        base = None
        for folder in (path.parent, shipped_folder()):
            try:
                require_regular(folder / n)
            except FileNotFoundError:
                continue                    # not beside this file: the shipped one of that name
            except OSError as e:            # a folder, FIFO or unreadable entry is refused, never replaced
                raise r.fail("builds_on", f"{n}: {e.strerror}") from None
            base = folder / n
            break
        if base is None:
            raise r.fail("builds_on", f"{n}: no such system file beside this file or among the shipped systems")
        if base.resolve() == here or base.resolve() in building:
            raise r.fail("builds_on", f"{n}: builds on the file being read (a cycle)")
        try:
            system = load_system(base, library, building=building + (here,))
        except SystemFileError as e:        # named as reached from this file: which file, and through which key
            raise r.fail("builds_on", str(e)) from None
        extra = [el for el in system.elements if el not in elements]
        if extra:
            raise r.fail("builds_on", f"{n} holds {', '.join(extra)}, which this file's elements lack")
        out.append((n, system))
    return out
