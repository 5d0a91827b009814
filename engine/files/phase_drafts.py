"""Phases while a system file is read and merged with the files it builds on (`builds_on`):
every value of a phase with where it came from, so that two files that disagree can both be
named; merging (the file's own values win, files built on must agree), and building the general
model from the result. Messages go through the reader's `fail` (file and key).
"""

from __future__ import annotations

import itertools
from dataclasses import dataclass, field
from typing import TYPE_CHECKING, Any

import numpy as np

from . import bounds
from ..models.general_form import compound_model
from ..models.phases import CompoundPhase
from ..models.polynomials import TemperatureFunction
from ..models.sublattice import Interaction, MagneticTerms, SublatticePhase

if TYPE_CHECKING:
    from .loader import _Reader

Constituents = tuple[tuple[str, ...], ...]


@dataclass
class PhaseDraft:
    """One phase while it is read and merged: every value with `where` it came from
    ("file: key"), so that a conflict between two files can name both."""

    name: str
    kind: str                                   # "solution" or "sublattices"
    site_ratios: tuple[float, ...]
    constituents: list[list[str]]
    end_members: dict[tuple[str, ...], tuple[TemperatureFunction, str]] = field(default_factory=dict)
    interactions: dict[Constituents, tuple[tuple[TemperatureFunction, ...], str]] = field(default_factory=dict)
    curie: dict[Constituents, tuple[tuple[TemperatureFunction, ...], str]] = field(default_factory=dict)
    moment: dict[Constituents, tuple[tuple[TemperatureFunction, ...], str]] = field(default_factory=dict)
    magnetic: tuple[float, float, str] | None = None   # (above_curie_fraction, antiferro_factor, where)


def _same_function(f: TemperatureFunction, g: TemperatureFunction) -> bool:
    """Whether two functions agree (to 1e-9 relative) wherever both hold."""
    if f.bounds == g.bounds and np.array_equal(np.asarray(f.coefficients), np.asarray(g.coefficients)):
        return True
    lo, hi = max(f.lower_K, g.lower_K, 1.0), min(f.upper_K, g.upper_K, bounds.MAX_TEMPERATURE_K)
    if lo >= hi:
        return False
    for T in np.geomspace(lo, hi, 41):
        a, b = f.value(float(T)), g.value(float(T))
        if abs(a - b) > 1e-9 * max(abs(a), abs(b), 1.0):
            return False
    return True


def _same(a: tuple[TemperatureFunction, ...], b: tuple[TemperatureFunction, ...]) -> bool:
    return len(a) == len(b) and all(_same_function(f, g) for f, g in zip(a, b))


def draft_of(model: SublatticePhase, origin: str) -> PhaseDraft:
    """A phase of a file built on, as a draft whose values name that file."""
    where = f"{origin}: phase.{model.name}"
    kind = "solution" if model.is_substitutional else "sublattices"
    draft = PhaseDraft(model.name, kind, model.site_ratios, [list(c) for c in model.constituents])
    draft.end_members = {combo: (f, where) for combo, f in model.end_members.items()}
    draft.interactions = {t.constituents: (t.coefficients, where) for t in model.interactions}
    if model.magnetic is not None:
        mag = model.magnetic
        draft.magnetic = (mag.above_curie_fraction, mag.antiferro_factor, where)
        draft.curie = {t.constituents: (t.coefficients, where) for t in mag.curie_K}
        draft.moment = {t.constituents: (t.coefficients, where) for t in mag.moment}
    return draft


def merge(r: "_Reader", into: PhaseDraft, other: PhaseDraft, own: bool, chosen: PhaseDraft | None = None) -> None:
    """Add `other` (a file built on, or with `own` the file itself, whose values win) into `into`.
    Two files built on may disagree only where the file itself (`chosen`) gives the value."""
    chosen = chosen or PhaseDraft(into.name, into.kind, into.site_ratios, [])
    key = f"phase.{into.name}"
    if into.kind != other.kind or len(into.site_ratios) != len(other.site_ratios) or \
            any(abs(a - b) > 1e-12 * max(a, b) for a, b in zip(into.site_ratios, other.site_ratios)):
        raise r.fail(key, f"the phase has a different structure in {_origin(other)} than in {_origin(into)} "
                     "(model, number of sublattices or sites); phases of the same name must agree")
    for s, held in enumerate(other.constituents):
        into.constituents[s].extend(c for c in held if c not in into.constituents[s])
    for mine, theirs, settled, what in ((into.end_members, other.end_members, chosen.end_members, "Gibbs energy"),
                                        (into.interactions, other.interactions, chosen.interactions, "interaction"),
                                        (into.curie, other.curie, chosen.curie, "Curie temperature"),
                                        (into.moment, other.moment, chosen.moment, "magnetic moment")):
        for c, value in theirs.items():
            old = find(mine, c)
            if old is not None and not own and find(settled, c) is None:
                a, b = mine[old][0], value[0]
                a, b = (a, b) if isinstance(a, tuple) else ((a,), (b,))
                if not _same(a, _reordered(b, c, old)):
                    raise r.fail(key, f"the {what} of {_label(c)} differs between {mine[old][1]} and {value[1]}; "
                                 "give it in this file to choose")
                continue
            if old is not None:
                del mine[old]
            mine[c] = value
    if other.magnetic is not None:
        if into.magnetic is not None and not own and chosen.magnetic is None and into.magnetic[:2] != other.magnetic[:2]:
            raise r.fail(f"{key}.magnetic", f"above_curie_fraction or antiferro_factor differ between {into.magnetic[2]} "
                         f"and {other.magnetic[2]}; give them in this file to choose")
        into.magnetic = other.magnetic


def find(store: dict, c) -> Any:
    """The key of `store` naming the same constituents as `c` (in any order within a sublattice)."""
    if c in store:
        return c
    if isinstance(c, tuple) and c and isinstance(c[0], tuple):
        want = tuple(frozenset(s) for s in c)
        for k in store:
            if tuple(frozenset(s) for s in k) == want:
                return k
    return None


def _reordered(coeffs: tuple[TemperatureFunction, ...], c, target) -> tuple[TemperatureFunction, ...]:
    """Coefficients of the term `c` expressed in the constituent order of `target`: a binary
    series changes the sign of its odd orders when its pair is reversed; a ternary's three follow
    their constituents."""
    if c == target or not (isinstance(c, tuple) and c and isinstance(c[0], tuple)):
        return coeffs
    mixed = [(a, b) for a, b in zip(c, target) if len(a) > 1]
    if len(mixed) == 1 and len(mixed[0][0]) == 2 and mixed[0][0] != mixed[0][1]:
        return tuple(f.scaled(-1.0) if k % 2 else f for k, f in enumerate(coeffs))
    if len(mixed) == 1 and len(mixed[0][0]) == 3 and len(coeffs) == 3:
        a, b = mixed[0]
        return tuple(coeffs[a.index(x)] for x in b)
    return coeffs


def _label(c) -> str:
    if isinstance(c, tuple) and c and isinstance(c[0], tuple):
        return " : ".join(",".join(s) for s in c)
    return " : ".join(c)


def _origin(d: PhaseDraft) -> str:
    for _f, where in d.end_members.values():
        return where.split(":")[0]
    return "this file"


def build(r: "_Reader", draft: PhaseDraft, elements: tuple[str, ...]) -> SublatticePhase:
    key = f"phase.{draft.name}"
    if draft.kind == "solution":
        for el in elements:
            if (el,) not in draft.end_members:
                raise r.fail(f"{key}.G.{el}", "missing: every element of the system needs its Gibbs energy in every "
                             "solution phase (none of the files this one builds on gives it)")
        draft.constituents = [[el for el in elements]]
        if draft.magnetic is not None:
            for which, store in (("curie_K", draft.curie), ("moment", draft.moment)):
                for el in elements:
                    if ((el,),) not in store:
                        raise r.fail(f"{key}.magnetic.{which}.{el}", "missing: give a value for every element (0 if not magnetic)")
    else:
        for combo in itertools.product(*draft.constituents):
            if combo not in draft.end_members:
                raise r.fail(f"{key}.end_member", f"missing the end member with constituents {list(combo)}: every "
                             "combination of one constituent per sublattice needs its G")
    magnetic = None
    if draft.magnetic is not None:
        p, factor, _where = draft.magnetic
        magnetic = MagneticTerms(p, tuple(Interaction(c, v[0]) for c, v in draft.curie.items()),
                                 tuple(Interaction(c, v[0]) for c, v in draft.moment.items()), factor)
    elif draft.curie or draft.moment:
        raise r.fail(f"{key}.magnetic", "missing: magnetic values need above_curie_fraction")
    try:
        return SublatticePhase(name=draft.name, elements=elements, site_ratios=draft.site_ratios,
                               constituents=tuple(tuple(h) for h in draft.constituents),
                               end_members={c: v[0] for c, v in draft.end_members.items()},
                               interactions=tuple(Interaction(c, v[0]) for c, v in draft.interactions.items()),
                               magnetic=magnetic)
    except ValueError as e:
        raise r.fail(key, str(e)) from None


def _same_terms(a: tuple[Interaction, ...], b: tuple[Interaction, ...]) -> bool:
    """Whether two tuples of terms hold the same constituents with the same coefficients."""
    ours, theirs = {t.constituents: t.coefficients for t in a}, {t.constituents: t.coefficients for t in b}
    return ours.keys() == theirs.keys() and all(_same(ours[c], theirs[c]) for c in ours)


def same_phase(a: SublatticePhase, b: SublatticePhase) -> bool:
    """Whether two phases are one phase under two names: the same sublattices, sites and
    constituents, and the same energy of every end member and interaction, magnetic terms
    included (a phase copied under a second name kept ladle check of Fe-Si busy for minutes)."""
    if (a.site_ratios, a.constituents) != (b.site_ratios, b.constituents) or a.end_members.keys() != b.end_members.keys():
        return False
    if not all(_same_function(f, b.end_members[c]) for c, f in a.end_members.items()):
        return False
    if not _same_terms(a.interactions, b.interactions) or (a.magnetic is None) != (b.magnetic is None):
        return False
    m, n = a.magnetic, b.magnetic
    return m is None or ((m.above_curie_fraction, m.antiferro_factor) == (n.above_curie_fraction, n.antiferro_factor)
                         and _same_terms(m.curie_K, n.curie_K) and _same_terms(m.moment, n.moment))


def same_compound(a: CompoundPhase, b: CompoundPhase) -> bool:
    """Whether two compounds of files built on are the same (formula and G)."""
    ma, mb = compound_model(a), compound_model(b)
    if set(ma.constituents) != set(mb.constituents):
        return False
    lo, hi = max(ma.valid_range_K()[0], mb.valid_range_K()[0], 1.0), min(ma.valid_range_K()[1], mb.valid_range_K()[1])
    xa = dict(zip((c[0] for c in ma.constituents), ma.site_ratios))
    xb = dict(zip((c[0] for c in mb.constituents), mb.site_ratios))
    if any(abs(xa[k] - xb[k]) > 1e-12 for k in xa):
        return False
    fa, fb = next(iter(ma.end_members.values())), next(iter(mb.end_members.values()))
    return lo < hi and all(abs(fa.value(float(T)) - fb.value(float(T))) <= 1e-9 * max(1.0, abs(fa.value(float(T))))
                           for T in np.geomspace(lo, min(hi, bounds.MAX_TEMPERATURE_K), 21))
