"""Reading the phases of a system file (systems/FORMAT.md): substitutional solutions in any number
of elements, sublattice phases, stoichiometric compounds, and the phases of the files a system
builds on, merged with its own (phase_drafts.py).

Every solution and sublattice phase is read once into the general model (`SublatticePhase`); a
binary's solution class is derived from that model (models/general_form.py). Messages name the
file and the key (through the reader's `fail`).
"""

from __future__ import annotations

from typing import TYPE_CHECKING, Any

import numpy as np

from . import bounds
from .phase_drafts import Constituents, PhaseDraft, build, draft_of, find, merge, same_compound, same_phase
from ..models.formula import parse_formula
from ..models.general_form import binary_solution, compound_model
from ..models.phases import CompoundPhase
from ..models.polynomials import COEFFICIENTS, TemperatureFunction
from ..models.sublattice import VACANCY, SublatticePhase

if TYPE_CHECKING:
    from ..models.system import System
    from .loader import ElementLibrary, _Reader

SOLUTION_KEYS = {"model", "G", "L", "magnetic", "notes", "source"}
SUBLATTICE_KEYS = {"model", "sublattices", "end_member", "interaction", "magnetic", "notes", "source"}
COMPOUND_KEYS = {"model", "formula", "reference", "formation", "notes", "source"}
MODELS = ("solution", "sublattices", "compound")
_SOLUTION_MAGNETIC_KEYS = {"above_curie_fraction", "curie_K", "moment", "curie_L", "moment_L", "antiferro_factor"}
_SUBLATTICE_MAGNETIC_KEYS = {"above_curie_fraction", "antiferro_factor"}
_SUBLATTICE_ENTRY_KEYS = {"sites", "holds"}
_END_MEMBER_KEYS = {"constituents", "G", "curie_K", "moment", "notes", "source"}
_INTERACTION_KEYS = {"constituents", "L", "curie_L", "moment_L", "notes", "source"}



# --- temperature functions of elements --------------------------------------------------------
def element_function(r: "_Reader", library: "ElementLibrary", value: Any, key: str, element: str) -> TemperatureFunction:
    """G (J/mol) of one element: pieces, a structure of the element library, or
    { library = "...", a = ... } (the library function plus a correction)."""
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


def _reference_function(r: "_Reader", library: "ElementLibrary", ref: Any, element: str, key: str,
                        solutions: dict[str, SublatticePhase]) -> TemperatureFunction:
    """G (J/mol) of pure `element` in `ref`: a solution phase of this system, or else a structure
    of the element library."""
    if isinstance(ref, str) and ref in solutions:
        f = solutions[ref].end_members.get((element,))
        if f is None:
            raise r.fail(key, f"solution phase {ref} does not hold {element}")
        return f
    if isinstance(ref, str) and ref:
        return library.function(element, ref, key, r)
    raise r.fail(key, f"expected a solution phase of this system ({', '.join(solutions) or 'none'}) "
                 f"or a structure of the element library, found {bounds.shown_value(ref)}")


# --- names of interacting elements --------------------------------------------------------------
def _named_elements(r: "_Reader", name: str, key: str, allowed: tuple[str, ...]) -> tuple[str, ...]:
    """ "Ag-Cu" or "Ag-Cu-Sn": two or three distinct constituents of `allowed`."""
    parts = tuple(name.split("-"))
    if len(parts) not in (2, 3) or len(set(parts)) != len(parts) or any(p not in allowed for p in parts):
        raise r.fail(key, f"expected two or three different elements of this system joined by '-', such as "
                     f"\"{'-'.join(allowed[:2])}\"")
    return parts


def _coefficients(r: "_Reader", value: Any, key: str, named: tuple[str, ...]) -> tuple[TemperatureFunction, ...]:
    """The coefficients of an interaction among `named` (on one sublattice): for two, the list of
    Redlich-Kister orders; for three, a one-entry list (composition-independent) or a table with
    one expression per constituent; otherwise a one-entry list."""
    if len(named) == 3 and isinstance(value, dict):
        r.known_keys(value, set(named), key)
        for c in named:
            if c not in value:
                raise r.fail(f"{key}.{c}", f"missing: a ternary term gives one expression for each of {', '.join(named)}")
        return tuple(r.expression(value[c], f"{key}.{c}") for c in named)
    series = r.expressions(value, key)
    if not series:
        raise r.fail(key, "expected at least one expression such as [ { a = -5000 } ]")
    bounds.check_count(len(series), bounds.MAX_TERMS, key, "coefficients", r.fail)
    if len(named) != 2 and len(series) != 1:
        raise r.fail(key, "expected one expression here (several orders exist only between two constituents; "
                     "a ternary term's three coefficients are a table, one per constituent)")
    return series


def _pair_terms(r: "_Reader", value: Any, key: str, elements: tuple[str, ...]) -> dict[Constituents, tuple[TemperatureFunction, ...]]:
    """A solution phase's L (or curie_L, moment_L): a list (the pair of a two-element file) or a
    table by "A-B" / "A-B-C"."""
    if isinstance(value, list) and not value:
        return {}
    if isinstance(value, list):
        if len(elements) != 2:
            raise r.fail(key, "expected a table by element pair, such as { Ag-Cu = [ { a = -5000 } ] } (a plain list names "
                         "the pair of a two-element system only)")
        return {(tuple(elements),): _coefficients(r, value, key, tuple(elements))}
    if not isinstance(value, dict):
        raise r.fail(key, "expected a list of expressions such as [ { a = -5000 } ] (the pair of a two-element system) "
                     "or a table by element pair such as { Ag-Cu = [ { a = -5000 } ] }")
    table = value
    bounds.check_count(len(table), bounds.MAX_INTERACTIONS, key, "interaction parameters", r.fail)
    out = {}
    for name, v in table.items():
        named = _named_elements(r, name, f"{key}.{name}", elements)
        if any(set(named) == set(c[0]) for c in out):
            raise r.fail(f"{key}.{name}", "these elements are named twice")
        out[(named,)] = _coefficients(r, v, f"{key}.{name}", named)
    return out


def _magnetic_header(r: "_Reader", m: dict, key: str) -> tuple[float, float, str]:
    if "above_curie_fraction" not in m:
        raise r.fail(f"{key}.above_curie_fraction", "missing (required for a magnetic contribution)")
    p = r.number(m["above_curie_fraction"], f"{key}.above_curie_fraction")
    if not 0 < p < 1:
        raise r.fail(f"{key}.above_curie_fraction", "expected a number between 0 and 1 (0.40 for bcc, 0.28 otherwise)")
    factor = r.number(m.get("antiferro_factor", -3.0), f"{key}.antiferro_factor")
    if factor >= 0:
        raise r.fail(f"{key}.antiferro_factor", "expected a negative number (-1 for bcc, -3 for fcc and hcp)")
    return p, factor, f"{r.path.name}: {key}"


def _constant(value: float) -> TemperatureFunction:
    return TemperatureFunction.constant_terms({"a": value}, 0.0, bounds.MAX_TEMPERATURE_K)


def _magnetic_number(r: "_Reader", value: Any, key: str, which: str) -> float:
    v = r.number(value, key)
    if which == "curie_K":
        bounds.check_magnitude(v, bounds.MAX_CURIE_K, key, "K", r.fail)
    else:
        bounds.check_magnitude(v, bounds.MAX_MOMENT, key, "Bohr magnetons", r.fail)
    return v


# --- solution phases -------------------------------------------------------------------------------
def _solution_draft(r: "_Reader", library: "ElementLibrary", name: str, table: dict, elements: tuple[str, ...],
                    complete: bool) -> PhaseDraft:
    """A solution phase of the file; `complete`: every element must be given here (no file to
    build on)."""
    key = f"phase.{name}"
    where = r.path.name
    r.known_keys(table, SOLUTION_KEYS, key)
    if "G" not in table and complete:
        raise r.fail(f"{key}.G", "missing: the Gibbs energy of each pure element in this phase")
    g_table = r.table(table.get("G", {}), f"{key}.G")
    r.known_keys(g_table, set(elements), f"{key}.G")
    draft = PhaseDraft(name, "solution", (1.0,), [[]])
    for el in elements:
        if el in g_table:
            draft.end_members[(el,)] = (element_function(r, library, g_table[el], f"{key}.G.{el}", el), f"{where}: {key}.G.{el}")
            draft.constituents[0].append(el)
        elif complete:
            raise r.fail(f"{key}.G.{el}", "missing: every element of the system needs its Gibbs energy in every solution phase")
    for c, coeffs in _pair_terms(r, table.get("L", []), f"{key}.L", elements).items():
        draft.interactions[c] = (coeffs, f"{where}: {key}.L")
    if "magnetic" in table:
        mkey = f"{key}.magnetic"
        m = r.table(table["magnetic"], mkey)
        r.known_keys(m, _SOLUTION_MAGNETIC_KEYS, mkey)
        draft.magnetic = _magnetic_header(r, m, mkey)
        for which, store in (("curie_K", draft.curie), ("moment", draft.moment)):
            if which not in m and complete:
                raise r.fail(f"{mkey}.{which}", "missing (required for a magnetic contribution)")
            t = r.table(m.get(which, {}), f"{mkey}.{which}")
            r.known_keys(t, set(elements), f"{mkey}.{which}")
            for el in elements:
                if el in t:
                    store[((el,),)] = ((_constant(_magnetic_number(r, t[el], f"{mkey}.{which}.{el}", which)),),
                                       f"{where}: {mkey}.{which}.{el}")
                elif complete:
                    raise r.fail(f"{mkey}.{which}.{el}", "missing: give a value for every element (0 if not magnetic)")
        for which, store in (("curie_L", draft.curie), ("moment_L", draft.moment)):
            for c, coeffs in _pair_terms(r, m.get(which, []), f"{mkey}.{which}", elements).items():
                store[c] = (coeffs, f"{where}: {mkey}.{which}")
    return draft


# --- sublattice phases --------------------------------------------------------------------------------
def _constituent_list(r: "_Reader", value: Any, key: str) -> list[str]:
    if isinstance(value, str):
        value = [value]
    if not isinstance(value, list) or not value or not all(isinstance(v, str) for v in value):
        raise r.fail(key, "expected a list of constituents such as [\"Fe\", \"Cr\"]")
    if len(set(value)) != len(value):
        raise r.fail(key, "a constituent is named twice")
    return list(value)


def _check_texts(r: "_Reader", table: dict, key: str) -> None:
    """The free texts a phase, end member or interaction may carry (`notes`, `source`) are texts."""
    for k in ("notes", "source"):
        if k in table:
            r.text(table[k], f"{key}.{k}")


def _entries(r: "_Reader", value: Any, key: str, allowed: set[str], required: tuple[str, ...],
             missing: str) -> list[tuple[str, dict]]:
    """The tables of the list under `key` (a TOML array of tables) with their keys for messages,
    each holding only `allowed` keys and every `required` one (`missing` says what they give)."""
    if not isinstance(value, list):
        raise r.fail(key, "expected a list of tables")
    bounds.check_count(len(value), bounds.MAX_INTERACTIONS, key, "entries", r.fail)
    out = []
    for i, entry in enumerate(value):
        k = f"{key}[{i}]"
        entry = r.table(entry, k)
        r.known_keys(entry, allowed, k)
        _check_texts(r, entry, k)
        for req in required:
            if req not in entry:
                raise r.fail(f"{k}.{req}", f"missing ({missing})")
        out.append((k, entry))
    return out


def _sublattice_draft(r: "_Reader", library: "ElementLibrary", name: str, table: dict, elements: tuple[str, ...],
                      solutions: dict[str, SublatticePhase]) -> PhaseDraft:
    key = f"phase.{name}"
    where = r.path.name
    r.known_keys(table, SUBLATTICE_KEYS, key)
    if "sublattices" not in table:
        raise r.fail(f"{key}.sublattices", "missing: the list of sublattices, such as "
                     "[ { sites = 1, holds = [\"Fe\", \"Cr\"] }, { sites = 3, holds = [\"C\", \"Va\"] } ]")
    lattices = table["sublattices"]
    if not isinstance(lattices, list) or not lattices:
        raise r.fail(f"{key}.sublattices", "expected a list of tables such as [ { sites = 1, holds = [\"Fe\"] } ]")
    bounds.check_count(len(lattices), bounds.MAX_SUBLATTICES, f"{key}.sublattices", "sublattices", r.fail)
    ratios, held = [], []
    for k, entry in _entries(r, lattices, f"{key}.sublattices", _SUBLATTICE_ENTRY_KEYS, ("sites", "holds"),
                             "each sublattice gives its sites per formula unit and what it holds"):
        sites = r.number(entry["sites"], f"{k}.sites")
        if not bounds.MIN_SITES <= sites <= bounds.MAX_SITES:
            raise r.fail(f"{k}.sites", f"expected a positive number of sites per formula unit, at least "
                         f"{bounds.MIN_SITES:g} and at most {bounds.MAX_SITES:g}")
        holds = _constituent_list(r, entry["holds"], f"{k}.holds")
        bounds.check_count(len(holds), bounds.MAX_CONSTITUENTS, f"{k}.holds", "constituents", r.fail)
        for c in holds:
            if c != VACANCY and c not in elements:
                raise r.fail(f"{k}.holds", f"{c} is neither an element of this system ({', '.join(elements)}) nor {VACANCY} (the vacancy)")
        ratios.append(sites)
        held.append(holds)
    if all(c == VACANCY for h in held for c in h):
        raise r.fail(f"{key}.sublattices", "the phase holds only vacancies")
    draft = PhaseDraft(name, "sublattices", tuple(ratios), held)
    magnetic_values = False

    def constituents_of(value: Any, k: str, single: bool) -> Constituents:
        if not isinstance(value, list) or len(value) != len(held):
            raise r.fail(k, f"expected {len(held)} entries, one per sublattice")
        out = []
        for s, v in enumerate(value):
            names = _constituent_list(r, v, f"{k}[{s}]")
            if single and len(names) != 1:
                raise r.fail(f"{k}[{s}]", "expected one constituent per sublattice for an end member")
            for c in names:
                if c not in held[s]:
                    raise r.fail(f"{k}[{s}]", f"sublattice {s + 1} holds {', '.join(held[s])}, not {c}")
            out.append(tuple(names))
        return tuple(out)

    for k, entry in _entries(r, table.get("end_member", []), f"{key}.end_member", _END_MEMBER_KEYS,
                             ("constituents", "G"), "each end member names its constituents and gives its G"):
        combo = tuple(c[0] for c in constituents_of(entry["constituents"], f"{k}.constituents", True))
        if combo in draft.end_members:
            raise r.fail(f"{k}.constituents", "this end member is given twice")
        draft.end_members[combo] = (_end_member_function(r, library, entry["G"], f"{k}.G", combo, ratios, solutions),
                                    f"{where}: {k}.G")
        for which, store in (("curie_K", draft.curie), ("moment", draft.moment)):
            if which in entry:
                magnetic_values = True
                store[tuple((c,) for c in combo)] = ((_constant(_magnetic_number(r, entry[which], f"{k}.{which}", which)),),
                                                     f"{where}: {k}.{which}")
    for k, entry in _entries(r, table.get("interaction", []), f"{key}.interaction", _INTERACTION_KEYS,
                             ("constituents",), "the constituents on each sublattice, such as [[\"Fe\", \"Cr\"], \"Va\"]"):
        consts = constituents_of(entry["constituents"], f"{k}.constituents", False)
        mixed = [c for c in consts if len(c) > 1]
        if not mixed:
            raise r.fail(f"{k}.constituents", "an interaction names two or three constituents on at least one sublattice")
        if any(len(c) > 3 for c in mixed):
            raise r.fail(f"{k}.constituents", "at most three constituents interact on one sublattice")
        named = mixed[0] if len(mixed) == 1 else ()
        found = False
        for which, store in (("L", draft.interactions), ("curie_L", draft.curie), ("moment_L", draft.moment)):
            if which in entry:
                if find(store, consts) is not None:
                    raise r.fail(f"{k}.constituents", f"{which} of these constituents is given twice")
                found = True
                magnetic_values |= which != "L"
                store[consts] = (_coefficients(r, entry[which], f"{k}.{which}", named), f"{where}: {k}.{which}")
        if not found:
            raise r.fail(k, "expected L (and/or curie_L, moment_L): the interaction's coefficients")
    if "magnetic" in table:
        mkey = f"{key}.magnetic"
        m = r.table(table["magnetic"], mkey)
        r.known_keys(m, _SUBLATTICE_MAGNETIC_KEYS, mkey)
        draft.magnetic = _magnetic_header(r, m, mkey)
    elif magnetic_values:
        raise r.fail(f"{key}.magnetic", "missing: curie_K or moment values need [phase.NAME.magnetic] with above_curie_fraction")
    return draft


def _end_member_function(r: "_Reader", library: "ElementLibrary", value: Any, key: str, combo: tuple[str, ...],
                         ratios: list[float], solutions: dict[str, SublatticePhase]) -> TemperatureFunction:
    """G (J per mole of formula units) of an end member: pieces, or
    { reference = { El = "phase or structure" }, a = ..., ... }: the sum over sublattices of sites
    times the element's reference energy, plus the expression."""
    if isinstance(value, list):
        return r.pieces(value, key)
    table = r.table(value, key) if isinstance(value, dict) else None
    if table is None or "reference" not in table:
        raise r.fail(key, "expected a list of pieces, or { reference = { Fe = \"fcc\", C = \"graphite\" }, a = ..., b = ... }")
    r.known_keys(table, set(COEFFICIENTS) | {"reference"}, key)
    refs = r.table(table["reference"], f"{key}.reference")
    present = [c for c in combo if c != VACANCY]
    r.known_keys(refs, set(present), f"{key}.reference")
    total = r.expression({k: v for k, v in table.items() if k != "reference"}, key)
    for el in dict.fromkeys(present):
        if el not in refs:
            raise r.fail(f"{key}.reference.{el}", "missing: name the phase or structure whose pure-element energy is the reference")
        sites = sum(a for a, c in zip(ratios, combo) if c == el)
        f = _reference_function(r, library, refs[el], el, f"{key}.reference.{el}", solutions)
        total = total.plus(f.scaled(sites))
    return total


# --- compounds ----------------------------------------------------------------------------------------
def _compound(r: "_Reader", library: "ElementLibrary", name: str, table: dict, elements: tuple[str, ...],
              solutions: dict[str, SublatticePhase]) -> CompoundPhase:
    key = f"phase.{name}"
    r.known_keys(table, COMPOUND_KEYS, key)
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
    refs: dict[int, TemperatureFunction] = {}
    for i, el in enumerate(elements):
        ref = refs_table.get(el)
        if ref is None:
            if x[i] > 0:
                raise r.fail(f"{key}.reference.{el}", "missing: name the phase whose pure-element energy is the reference")
            continue
        refs[i] = _reference_function(r, library, ref, el, f"{key}.reference.{el}", solutions)
    formation = r.expression(table["formation"], f"{key}.formation")
    return CompoundPhase(name, elements, x, _all_references(refs, x), formation)


def _all_references(refs: dict[int, TemperatureFunction], x: np.ndarray) -> tuple[TemperatureFunction, ...]:
    """One reference per element; an element the formula lacks (weight 0) takes the first formula
    element's, which leaves G and the valid temperatures unchanged."""
    first = refs[next(i for i in range(len(x)) if x[i] > 0)]
    return tuple(refs.get(i, first) for i in range(len(x)))


def _widened(c: CompoundPhase, elements: tuple[str, ...]) -> CompoundPhase:
    """A compound of a file built on, over this system's elements."""
    x = np.array([c.x[c.elements.index(el)] if el in c.elements else 0.0 for el in elements])
    refs = {i: c.references[c.elements.index(el)] for i, el in enumerate(elements) if el in c.elements and x[i] > 0}
    return CompoundPhase(c.name, elements, x, _all_references(refs, x), c.formation)


def read_phases(r: "_Reader", library: "ElementLibrary", phase_table: dict, elements: tuple[str, ...],
                bases: list[tuple[str, "System"]]) -> tuple[dict, dict[str, SublatticePhase]]:
    """The phases of a file (`phase_table`, names already checked) merged with those of the files
    it builds on (`bases`: file name and System). Returns (phases, models): `phases` in the forms
    the binary engine evaluates where they exist, `models` every phase in the general form."""
    tables = {}
    for name, table in phase_table.items():
        table = r.table(table, f"phase.{name}")
        _check_texts(r, table, f"phase.{name}")
        model = table.get("model")
        if model not in MODELS:
            raise r.fail(f"phase.{name}.model", f"unknown model {bounds.shown_value(model)}; expected one of {', '.join(repr(m) for m in MODELS)}")
        tables[name] = (model, table)
    complete = not bases
    base_drafts: dict[str, list[PhaseDraft]] = {}
    base_compounds: dict[str, tuple[CompoundPhase, str]] = {}
    for origin, system in bases:
        for name, phase in system.phases.items():
            if isinstance(phase, CompoundPhase):
                if name in base_compounds and name not in tables and not same_compound(base_compounds[name][0], phase):
                    raise r.fail(f"phase.{name}", f"compound {name} differs between {base_compounds[name][1]} and {origin}; "
                                 "give it in this file to choose")
                base_compounds.setdefault(name, (phase, origin))
            else:
                base_drafts.setdefault(name, []).append(draft_of(system.models[name], origin))
    for name in base_compounds:
        if name in base_drafts:
            raise r.fail(f"phase.{name}", "is a compound in one file built on and a solution or sublattice phase in another")
    bounds.check_count(len(set(tables) | set(base_drafts) | set(base_compounds)), bounds.MAX_PHASES, "phase", "phases", r.fail)

    def merged(name: str, own: PhaseDraft | None) -> SublatticePhase:
        drafts = base_drafts.get(name, [])
        into = drafts[0] if drafts else own
        for other in drafts[1:]:
            merge(r, into, other, own=False, chosen=own)
        if own is not None and into is not own:
            merge(r, into, own, own=True)
        return build(r, into, elements)

    def gather(kind: str, read) -> dict[str, SublatticePhase]:
        """Every phase of one model: the file's own (read by `read(name, table)`), merged with
        the files built on, then those only the files built on have."""
        out = {name: merged(name, read(name, table)) for name, (model, table) in tables.items() if model == kind}
        out.update({name: merged(name, None) for name, drafts in base_drafts.items()
                    if name not in tables and drafts[0].kind == kind})
        return out

    solutions = gather("solution", lambda name, table: _solution_draft(r, library, name, table, elements, complete))
    lattices = gather("sublattices", lambda name, table: _sublattice_draft(r, library, name, table, elements, solutions))
    compounds: dict[str, CompoundPhase] = {}
    for name, (model, table) in tables.items():
        if model == "compound":
            if name in base_drafts:
                raise r.fail(f"phase.{name}.model", "a file this one builds on has this phase as a solution or sublattice phase")
            compounds[name] = _compound(r, library, name, table, elements, solutions)
    for name, (phase, _origin_name) in base_compounds.items():
        if name not in tables:
            compounds[name] = _widened(phase, elements)
        elif tables[name][0] != "compound":
            raise r.fail(f"phase.{name}.model", "a file this one builds on has this phase as a compound")

    binary = len(elements) == 2
    phases: dict = {n: binary_solution(m) if binary else m for n, m in solutions.items()}
    phases.update(lattices)
    phases.update(compounds)
    models: dict[str, SublatticePhase] = {**solutions, **lattices}
    models.update({n: compound_model(c) for n, c in compounds.items()})
    names = list(models)
    for i, name in enumerate(names):
        twin = next((other for other in names[:i] if same_phase(models[other], models[name])), None)
        if twin is not None:
            raise r.fail(f"phase.{name}", f"the same phase as {twin} (every energy alike); give a phase once")
    return phases, {n: models[n] for n in phases}
