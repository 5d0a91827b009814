"""Measured facts of a system file: the `[[check]]` and `[[measured]]` lists (systems/FORMAT.md).

The two lists are kept apart: `[[measured]]` facts are the fit targets the parameters were fitted
to, `[[check]]` facts are independent checks the model was not fitted to. A fact may not be both
(`reject_repeated_facts`).
"""

from __future__ import annotations

from collections.abc import Collection
from dataclasses import replace
from typing import Any, Callable

import numpy as np

from ..units import kelvin_from, mole_from_mass
from .bounds import MAX_SPREAD, check_temperature, finite_number, shown_value
from .plain_text import without_controls

KINDS = ("melting", "invariant", "liquidus", "solidus", "boundary", "mixing_enthalpy", "formation_enthalpy",
         "distribution_coefficient", "transformation", "curie")
#: Facts of a pure element (its melting point, its changes between solid phases, its Curie
#: temperature): the element data build them in, so they are neither fit targets nor independent
#: checks; all but the melting point are read as [[check]] facts only.
PURE_ELEMENT_KINDS = ("melting", "transformation", "curie")
REACTIONS = ("eutectic", "peritectic", "monotectic", "eutectoid", "peritectoid", "syntectic", "metatectic", "congruent")
_COMMON = {"kind", "source", "note"}
_KIND_KEYS = {
    "melting": {"element", "temperature_C", "temperature_K"},
    "invariant": {"reaction", "phases", "temperature_C", "temperature_K"},
    "liquidus": {"at_percent", "wt_percent", "temperature_C", "temperature_K"},
    "solidus": {"at_percent", "wt_percent", "temperature_C", "temperature_K"},
    "boundary": {"phase", "partner", "at_percent", "wt_percent", "temperature_C", "temperature_K"},
    "mixing_enthalpy": {"phase", "at_percent", "wt_percent", "temperature_C", "temperature_K", "enthalpy_J_per_mol"},
    "formation_enthalpy": {"phase", "temperature_C", "temperature_K", "enthalpy_J_per_mol"},
    "distribution_coefficient": {"element", "phase", "k", "temperature_C", "temperature_K"},
    "transformation": {"element", "above", "below", "temperature_C", "temperature_K"},
    "curie": {"element", "phase", "temperature_C", "temperature_K"},
}
_SPREAD_KEYS = {"check": ("tolerance_K", "tolerance_at", "tolerance_J"),
                "measured": ("uncertainty_K", "uncertainty_at", "uncertainty_J")}
#: A relative tolerance on compositions (dilute solubilities): the model within a factor of the
#: reference value (checks only).
FACTOR_KEY = "tolerance_factor"
#: An upper limit (boundary checks only): the reference is a bound that the model's amount of the
#: minor element may not exceed, as where a source gives a solubility as "below 0.03 at%".
AT_MOST_KEY = "at_most"


def _is_phase(v: Any, system) -> bool:
    """Whether `v` names a phase of `system` (a list or table names none)."""
    return isinstance(v, str) and v in system.phases


def _read_spread(v: Any, key: str, spread: dict[str, float], name: str, low: float, expected: str,
                 phases: Collection[str], fail: Callable[[str, str], Exception]) -> None:
    """A composition spread above `low` (a number, or a table by phase, each one of `phases`) into
    `spread` under `name` or "<name>:<phase>"; `expected` says what is wanted."""
    if isinstance(v, dict):
        for ph, s in v.items():
            if ph not in phases:                # a misspelt phase would leave the real one without a spread
                raise fail(f"{key}.{ph}", f"not a phase of this system ({', '.join(phases)})")
            if not finite_number(s) or not low < s <= MAX_SPREAD[name]:
                raise fail(f"{key}.{ph}", f"expected {expected}")
            spread[f"{name}:{ph}"] = float(s)
    elif finite_number(v) and low < v <= MAX_SPREAD[name]:
        spread[name] = float(v)
    else:
        raise fail(key, f"expected {expected}, or a table per phase")


def parse_facts(items: Any, list_name: str, system, fail: Callable[[str, str], Exception]) -> list:
    """Validate the `[[check]]` or `[[measured]]` list of a document into Fact objects."""
    from ..models.system import Fact

    if not isinstance(items, list):
        raise fail(list_name, f"expected a list of tables ([[{list_name}]])")
    k_key, at_key, j_key = _SPREAD_KEYS[list_name]
    facts = []
    for i, item in enumerate(items):
        key = f"{list_name}[{i}]"
        if not isinstance(item, dict):
            raise fail(key, "expected a table")
        kind = item.get("kind")
        if kind not in KINDS:
            raise fail(f"{key}.kind", f"expected one of {', '.join(KINDS)}, found {shown_value(kind)}")
        allowed = _COMMON | _KIND_KEYS[kind] | {k_key, at_key, j_key}
        if list_name == "check" and kind in ("invariant", "boundary", "distribution_coefficient"):
            allowed = allowed | {FACTOR_KEY}
        if list_name == "check" and kind == "boundary":
            allowed = allowed | {AT_MOST_KEY}
        if kind == "distribution_coefficient" and (list_name != "check" or len(system.elements) != 2):
            raise fail(f"{key}.kind", "a distribution coefficient is an independent check ([[check]]) of a "
                       "system of two elements only")
        if kind in PURE_ELEMENT_KINDS[1:] and list_name != "check":
            raise fail(f"{key}.kind", f"a {kind} fact of a pure element is shown with the checks ([[check]]) only")
        for k in item:
            if k not in allowed:
                raise fail(f"{key}.{k}", f"unknown key for a {kind} fact; expected one of {', '.join(sorted(allowed))}")
        source = item.get("source")
        if not isinstance(source, str) or not source.strip():
            raise fail(f"{key}.source", "missing: every fact names its source (handbook with edition, or paper)")
        if not isinstance(item.get("note", ""), str):
            raise fail(f"{key}.note", "expected a text")
        temps = [k for k in ("temperature_C", "temperature_K") if k in item]
        if len(temps) != 1:
            raise fail(key, "give the temperature once, as temperature_C or temperature_K")
        tval = item[temps[0]]
        if not finite_number(tval):
            raise fail(f"{key}.{temps[0]}", f"expected a number, found {shown_value(tval)}")
        T = kelvin_from(tval, temps[0][-1])
        if T <= 0:
            raise fail(f"{key}.{temps[0]}", "expected a temperature above absolute zero")
        check_temperature(T, f"{key}.{temps[0]}", fail)
        fields: dict[str, Any] = {"kind": kind, "source": without_controls(source), "temperature_K": T, "index": i}

        spread: dict[str, float] = {}
        for spread_key, name, unit in ((k_key, "K", "kelvin"), (j_key, "J", "J/mol")):
            if spread_key in item:
                if not finite_number(item[spread_key]) or item[spread_key] <= 0:
                    raise fail(f"{key}.{spread_key}", f"expected a positive number of {unit}")
                if item[spread_key] > MAX_SPREAD[name]:
                    raise fail(f"{key}.{spread_key}", f"expected at most {MAX_SPREAD[name]:g} {unit} (a wider spread "
                               "cannot fail)")
                spread[name] = float(item[spread_key])
        if at_key in item:
            _read_spread(item[at_key], f"{key}.{at_key}", spread, "at", 0.0,
                         f"a positive number of at%, at most {MAX_SPREAD['at']:g} (a wider spread cannot fail)",
                         system.phases, fail)
        if FACTOR_KEY in item:
            _read_spread(item[FACTOR_KEY], f"{key}.{FACTOR_KEY}", spread, "factor", 1.0,
                         f"a factor above 1 and at most {MAX_SPREAD['factor']:g} (2 means within half to twice the "
                         "value)", system.phases, fail)
        if AT_MOST_KEY in item:
            if item[AT_MOST_KEY] is not True or at_key in item or FACTOR_KEY in item:
                raise fail(f"{key}.{AT_MOST_KEY}", "expected true (the composition is an upper limit of the minor "
                           f"element's amount), and no {at_key} or {FACTOR_KEY} beside it")
            spread[AT_MOST_KEY] = 1.0
        fields["spread"] = spread

        if kind in ("melting", "distribution_coefficient", "transformation", "curie"):
            el = item.get("element")
            if el not in system.elements:
                raise fail(f"{key}.element", f"expected one of {', '.join(system.elements)}, found {shown_value(el)}")
            fields["element"] = el
        for k, field_name in (("above", "phase"), ("below", "partner"), ("phase", "phase")):
            if kind in ("transformation", "curie") and k in _KIND_KEYS[kind]:
                if not _is_phase(item.get(k), system):
                    raise fail(f"{key}.{k}", f"expected a phase of this system ({', '.join(system.phases)}), "
                                             f"found {shown_value(item.get(k))}")
                fields[field_name] = item[k]
        if len(system.elements) > 2:
            _read_multicomponent(item, key, kind, system, fields, fail)
        elif kind in ("liquidus", "solidus", "boundary", "mixing_enthalpy"):
            comps = [k for k in ("at_percent", "wt_percent") if k in item]
            if kind != "boundary" and len(comps) != 1:
                raise fail(key, f"give the composition once, as at_percent or wt_percent of {system.elements[1]}")
            if comps:
                v = item[comps[0]]
                if not finite_number(v) or not 0 <= v <= 100:
                    raise fail(f"{key}.{comps[0]}", f"expected a percentage from 0 to 100, found {shown_value(v)}")
                frac = v / 100.0
                if comps[0] == "wt_percent":
                    frac = float(mole_from_mass(np.array([1 - frac, frac]), system.molar_mass)[1])
                fields["x_B"] = frac
        if kind == "boundary":
            for k in ("phase", "partner"):
                if not _is_phase(item.get(k), system):
                    raise fail(f"{key}.{k}", f"expected a phase of this system ({', '.join(system.phases)}), found {shown_value(item.get(k))}")
            if "x_B" not in fields:
                raise fail(key, f"give the boundary composition as at_percent or wt_percent of {system.elements[1]}")
            fields["phase"], fields["partner"] = item["phase"], item["partner"]
        if kind in ("mixing_enthalpy", "formation_enthalpy"):
            model = "solution" if kind == "mixing_enthalpy" else "compound"
            ph = item.get("phase")
            if not _is_phase(ph, system) or not _is_model(system, ph, model):
                names = [n for n in system.phases if _is_model(system, n, model)]
                raise fail(f"{key}.phase", f"expected a {model} phase of this system ({', '.join(names) or 'none'}), found {shown_value(ph)}")
            fields["phase"] = ph
            h = item.get("enthalpy_J_per_mol")
            if not finite_number(h):
                raise fail(f"{key}.enthalpy_J_per_mol", f"expected the measured enthalpy in J per mole of atoms, found {shown_value(h)}")
            fields["enthalpy_J_per_mol"] = float(h)
        if kind == "distribution_coefficient":
            ph = item.get("phase")
            if not _is_phase(ph, system) or ph == "liquid" or not _is_model(system, ph, "solution"):
                names = [n for n in system.phases if n != "liquid" and _is_model(system, n, "solution")]
                raise fail(f"{key}.phase", f"expected the solid solution the element dissolves in "
                           f"({', '.join(names) or 'none'}), found {shown_value(ph)}")
            k = item.get("k")
            if not finite_number(k) or k <= 0:
                raise fail(f"{key}.k", f"expected the distribution coefficient, a positive number, found {shown_value(k)}")
            fields["phase"], fields["ratio"] = ph, float(k)
        if kind == "invariant":
            reaction = item.get("reaction")
            if reaction not in REACTIONS:
                raise fail(f"{key}.reaction", f"expected one of {', '.join(REACTIONS)}, found {shown_value(reaction)}")
            fields["reaction"] = reaction
        if kind == "invariant" and len(system.elements) == 2:
            ph = item.get("phases", {})
            if not isinstance(ph, dict):
                raise fail(f"{key}.phases", "expected a table of phase = at% of " + system.elements[1])
            comp = []
            for name, v in ph.items():
                if name not in system.phases:
                    raise fail(f"{key}.phases.{name}", f"not a phase of this system ({', '.join(system.phases)})")
                values = v if isinstance(v, list) and 1 <= len(v) <= 2 else [v]
                for one in values:
                    if not finite_number(one) or not 0 <= one <= 100:
                        raise fail(f"{key}.phases.{name}", f"expected at% from 0 to 100 (or two of them, for a phase "
                                   f"that takes part twice), found {shown_value(v)}")
                    comp.append((name, one / 100.0))
            fields["phase_x_B"] = tuple(comp)
        facts.append(Fact(**fields))
    return facts


def _is_model(system, name: str, model: str) -> bool:
    """Whether phase `name` is a `model` ("solution" or "compound") phase; in a system of three or
    more elements a solution is a substitutional phase of the general model."""
    if len(system.elements) > 2 and model == "solution":
        return bool(system.models[name].is_substitutional)
    return system.phases[name].kind == model


#: The kinds read in systems of three or more elements so far.
MULTICOMPONENT_KINDS = ("melting", "invariant", "liquidus", "solidus", "mixing_enthalpy", "transformation", "curie")


def _read_multicomponent(item: dict, key: str, kind: str, system, fields: dict,
                         fail: Callable[[str, str], Exception]) -> None:
    """The compositions of a fact of a system of three or more elements into `fields`: `x` (a
    liquidus, solidus or mixing enthalpy: `at_percent` or `wt_percent` as a table by element, all
    but the balance) or `phase_x` (an invariant: each phase's at% by element, `{}` where unknown)."""
    from .alloys import mole_fractions, percent_table

    if kind not in MULTICOMPONENT_KINDS:
        raise fail(f"{key}.kind", f"a {kind} fact is read for two-element systems only so far "
                                  f"(here: {', '.join(MULTICOMPONENT_KINDS)})")
    if kind in ("liquidus", "solidus", "mixing_enthalpy"):
        comps = [k for k in ("at_percent", "wt_percent") if k in item]
        if len(comps) != 1:
            raise fail(key, "give the composition once, as at_percent or wt_percent: a table by element, "
                            "every element but the balance, e.g. { Ag = 3.5, Cu = 0.9 }")
        parts = percent_table(item[comps[0]], system.elements, f"{key}.{comps[0]}", fail)
        fields["x"] = mole_fractions(parts, comps[0][:2], system.elements, system.molar_mass)
    if kind == "invariant":
        ph = item.get("phases")
        if not isinstance(ph, dict) or not ph:
            raise fail(f"{key}.phases", "expected a table of every phase taking part = its at% by element "
                                        "(all but the balance), or {} where not known")
        phase_x = []
        for name, v in ph.items():
            if name not in system.phases:
                raise fail(f"{key}.phases.{name}", f"not a phase of this system ({', '.join(system.phases)})")
            if v == {}:
                phase_x.append((name, None))
                continue
            parts = percent_table(v, system.elements, f"{key}.phases.{name}", fail)
            phase_x.append((name, mole_fractions(parts, "at", system.elements, system.molar_mass)))
        fields["phase_x"] = tuple(phase_x)


def _same_fact(a, b) -> bool:
    """Whether two facts state the same measurement (kind, temperature within 0.5 K, the same
    composition, element, phases and reaction)."""
    if a.kind != b.kind or abs(a.temperature_K - b.temperature_K) > 0.5:
        return False
    if (a.element, a.reaction, a.phase, a.partner) != (b.element, b.reaction, b.phase, b.partner):
        return False
    if (a.x_B is None) != (b.x_B is None) or (a.x_B is not None and abs(a.x_B - b.x_B) > 5e-4):
        return False
    if (a.x is None) != (b.x is None) or (a.x is not None and max(abs(p - q) for p, q in zip(a.x, b.x)) > 5e-4):
        return False
    return a.kind != "invariant" or _phase_names(a) & _phase_names(b) != set()


def _phase_names(fact) -> set[str]:
    """The phases an invariant fact names (binary or of three or more elements)."""
    return {n for n, _x in fact.phase_x_B} | {n for n, _x in fact.phase_x}


def named_phases(fact) -> set[str]:
    """Every phase a fact names (an invariant's phases, a boundary's phase and partner, ...)."""
    return _phase_names(fact) | {n for n in (fact.phase, fact.partner) if n is not None}


def reject_repeated_facts(checks: list, measured: list, fail: Callable[[str, str], Exception]) -> None:
    """Refuse a `[[check]]` that repeats a `[[measured]]` fact: a fact the model was fitted to
    proves nothing about it, so it cannot also be an independent check. Pure-element melting
    points are exempt (they are neither: the element data build them in). Refuse as well a fact
    written twice in one list (the same in every key), which would count twice among the checks
    passed or weigh double in a fit."""
    for name, facts in (("check", checks), ("measured", measured)):
        for i, later in enumerate(facts):
            earlier = next((f for f in facts[:i] if replace(f, index=later.index) == later), None)
            if earlier is not None:
                raise fail(f"{name}[{later.index}]", f"repeats {name}[{earlier.index}] key for key; give a fact once")
    for c in checks:
        if c.kind in PURE_ELEMENT_KINDS:
            continue
        for m in measured:
            if _same_fact(c, m):
                raise fail(f"check[{c.index}]", f"repeats measured[{m.index}], a fact the parameters are fitted to; "
                           "a fit target is not an independent check (keep it in [[measured]] only)")
