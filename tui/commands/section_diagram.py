"""`ladle diagram` for systems of three or more elements: the isopleth through an alloy
(--comp SPEC --vary El=A..B) and, for a ternary, the isothermal section on the composition
triangle (--temp T) or, without options, the liquidus projection (valleys and four-phase
invariant reactions); and the whole diagram of a binary with sublattice phases (Fe-C) as its
isopleth over the range its file covers, with the lines the file names (A1, A3, Acm) listed;
plotted in the terminal with every field labelled, or --json."""

from __future__ import annotations

import argparse

from .. import quote
from ..errors import CommandError
from .common import (add_composition_argument, ascii_text, closing_lines, composition_specs, print_json,
                     system_title, terminal_plot, temperature_kelvin)

#: Columns of composition of a binary's whole diagram drawn as an isopleth (the engine's default
#: is meant for a narrow section; a whole diagram spans the file's range).
WHOLE_BINARY_COLUMNS = 33


def add_section_arguments(p: argparse.ArgumentParser) -> None:
    """The options of a section: --comp, --vary and --temp."""
    add_composition_argument(p, required=False)
    p.add_argument("--vary", metavar="EL=A..B", help="the element that varies along the isopleth and its range, "
                                                     "e.g. Cu=0..2wt%% (the balance takes up the change)")
    p.add_argument("--temp", metavar="T", help="a ternary's isothermal section at this temperature, e.g. 250C")


def wants_section(args: argparse.Namespace) -> bool:
    """Whether the options ask for a section rather than the binary diagram."""
    return bool(args.comp or args.vary or args.temp)


def run_section(system, args: argparse.Namespace) -> int:
    """Print the isopleth or the isothermal section the options ask for."""
    if args.csv:
        raise CommandError("--csv gives a binary diagram's tie-lines; use --json for a section")
    if args.temp and (args.comp or args.vary):
        raise CommandError("give either --comp with --vary (an isopleth) or --temp (an isothermal section), not both")
    if args.temp:
        return _isothermal(system, args)
    if not (args.comp or args.vary) and len(system.elements) == 3:
        return _projection(system, args)
    if not (args.comp or args.vary):
        raise CommandError(f"{system.name} has {len(system.elements)} elements: give --comp SPEC --vary EL=A..B for an "
                           f"isopleth")
    if not (args.comp and args.vary):
        raise CommandError("an isopleth needs both --comp SPEC and --vary EL=A..B, e.g. --comp Ag=3wt% --vary Cu=0..2wt%")
    return _isopleth(system, args)


def _isopleth(system, args: argparse.Namespace) -> int:
    from ladle.engine.diagrams.isopleth import map_isopleth

    from ..parsing import parse_alloy, parse_range, section_ends

    spec, vary = parse_alloy(composition_specs(system, args.comp)), parse_range(args.vary)
    low, high = section_ends(spec, vary, tuple(system.elements))
    iso = map_isopleth(system, low.fractions, high.fractions, low.basis, vary.element)
    held = "".join(f", {el} {quote.percent(f)} {low.basis}%" for el, f in zip(system.elements, low.fractions)
                   if el not in (vary.element, low.balance))
    title = f"{system_title(system)}: {vary.element} {vary.low:g}-{vary.high:g} {low.basis}%{held}, {low.balance} balance"
    return show_isopleth(system, iso, title, args)


def whole_binary(system, args: argparse.Namespace) -> int:
    """The whole diagram of a binary the tracer does not map (sublattice phases, as in Fe-C):
    its isopleth with the second element varying over the range the file covers."""
    import numpy as np

    from ladle.engine.diagrams.isopleth import map_isopleth
    from ladle.engine.units import mass_from_mole

    if args.csv:
        raise CommandError(f"{system.name}: --csv gives the tie-lines of a mapped diagram; this one is drawn as an "
                           f"isopleth: use --json")
    basis = "at" if args.at else "wt"
    ends = [np.array([1.0 - x, x]) for x in system.covers]
    if basis == "wt":
        ends = [mass_from_mole(x, system.molar_mass) for x in ends]
    element = system.elements[1]
    iso = map_isopleth(system, ends[0], ends[1], basis, element, columns=WHOLE_BINARY_COLUMNS)
    title = (f"{system_title(system)}: {element} {100 * ends[0][1]:.3g}-{100 * ends[1][1]:.3g} {basis}%, "
             f"{system.elements[0]} balance")
    return show_isopleth(system, iso, title, args)


def show_isopleth(system, iso, title: str, args: argparse.Namespace) -> int:
    """Print a mapped isopleth under `title`: plotted with its fields numbered, the invariant
    reactions it crosses and the lines the system's file names (A1, A3, ...); or --json (each
    line with its trade `label`, or null)."""
    from ladle.engine.diagrams.isopleth import trade_labels
    from ladle.engine.files.trade_names import trade_names

    names = trade_names(system)
    labels = trade_labels(iso, names)
    if args.json:
        data = iso.to_json()
        for line, label in zip(data["lines"], labels):
            line["label"] = label
        _invariants_json(iso, data)
        print_json(data)
        return 0
    from ..explorer.glyphs import glyphs_for
    from ..explorer.section_drawing import draw_section, isopleth_scene

    glyphs = glyphs_for(args.ascii)
    key: list[str] = []

    def draw(plt, width: int, height: int) -> None:
        scene = isopleth_scene(iso, args.unit, glyphs, width, height)
        key.extend(scene.key)
        draw_section(plt, scene, glyphs)

    print(terminal_plot(title, glyphs, 24, draw))
    lines = [f"fields: {'; '.join(key)}"] if key else []
    lines.append("invariant reactions crossed:" if iso.invariants else "invariant reactions crossed: none")
    from ..phase_names import beside

    for inv in iso.invariants:
        phases = " + ".join(beside(p, names.phase_name(p, inv.temperature_K)) for p in inv.phases)
        lines.append(f"  {quote.temperature(inv.temperature_K, args.unit):>12}  {phases}")
    lines += _named_lines(iso, labels, args.unit, names)
    if any(labels) and names.lines_note:
        lines.append(f"note: {names.lines_note}")
    lines += [f"note: {w}" for w in iso.warnings]
    print("\n".join(ascii_text(lines + closing_lines(system), args.ascii)))
    return 0


#: Half the bracket (K) around a mapped invariant reaction in which it is narrowed again.
_AROUND_INVARIANT_K = 1.0
#: A binary's line of the section that ends this many grid rows or fewer from an invariant
#: reaction holding all its phases is taken to end at that reaction (such lines end only there).
_ROWS_TO_INVARIANT = 1.5


def _invariant_equilibria(iso, invariant) -> dict | None:
    """Each phase of a binary's invariant reaction (name -> the phase's share of a point
    equilibrium: composition, amount), from the point equilibria of the alloy in the middle of
    the reaction's line on both sides of the reaction, narrowed to 1e-6 K (the line's ends on the
    section are only as close as its grid's columns); None for three or more elements, or where
    those two equilibria do not hold every phase of the reaction."""
    from ladle.engine import equilibrate
    from ladle.engine.diagrams.phase_change import narrow_change, phase_set

    system = iso.system
    if len(system.elements) != 2 or len(set(invariant.phases)) != len(invariant.phases):
        return None
    x = iso.mole_fractions(0.5 * sum(invariant.u_range))
    below, above = (invariant.temperature_K + d for d in (-_AROUND_INVARIANT_K, _AROUND_INVARIANT_K))
    eq_below, eq_above = (equilibrate(system, T, x) for T in (below, above))
    if phase_set(eq_below) == phase_set(eq_above):
        return None
    *_, eq_below, eq_above = narrow_change(lambda T: equilibrate(system, T, x), below, above, phase_set(eq_below),
                                           eq_below, eq_above, 1e-6, system)
    found = {p.name: p for eq in (eq_below, eq_above) if eq is not None for p in eq.phases}
    if eq_above is None or not set(invariant.phases) <= set(found):
        return None
    return {**found, _ABOVE: {p.name for p in eq_above.phases}}


#: The key of `_invariant_equilibria`'s answer that holds the names of the phases stable just above.
_ABOVE = " above"


def _invariant_kind(iso, found: dict) -> str:
    """A binary's invariant reaction named as a mapped diagram names its reactions
    (engine/diagrams/special.py `classify`): by its middle phase (in composition) and whether
    that phase forms on cooling. `found`: `_invariant_equilibria`'s answer."""
    from ladle.engine.diagrams.special import classify

    low, middle, high = sorted((n for n in found if n != _ABOVE), key=lambda n: _content(iso, found[n]))
    return classify(middle, (low, high), middle not in found[_ABOVE])


def _invariants_json(iso, data: dict) -> None:
    """A binary's invariant reactions in `data` (the isopleth's JSON) get the mapped diagram's
    `kind` and each phase's composition at the reaction (`compositions`: name, mole_fraction,
    mass_fraction), from `_invariant_equilibria`; those of three or more elements stay as they are."""
    els = iso.system.elements
    for inv, out in zip(iso.invariants, data["invariants"]):
        found = _invariant_equilibria(iso, inv)
        if found is None:
            continue
        out["kind"] = _invariant_kind(iso, found)
        out["compositions"] = [{"name": n, "mole_fraction": {el: float(v) for el, v in zip(els, found[n].x)},
                                "mass_fraction": {el: float(v) for el, v in zip(els, found[n].w)}}
                               for n in sorted(inv.phases, key=lambda n: _content(iso, found[n]))]


def _content(iso, share) -> float:
    """The section's varying element's fraction (in its basis) in a phase's share."""
    return float((share.w if iso.basis == "wt" else share.x)[iso.system.elements.index(iso.element)])


def _line_points(iso, line, reactions) -> list[tuple[float, float]]:
    """The (content, T in K) points of a line of the section; for a binary, an end of the line
    at or within a grid row or so of an invariant reaction holding all its phases is moved onto
    the reaction: the content there of the phase present on both sides of the line
    (`reactions(inv)`: the reaction's phases, or None), instead of the grid's nearest column."""
    from ladle.engine.diagrams.isopleth import DEFAULT_ROWS

    points = [(float(iso.content(u)), float(T)) for u, T in line.points]
    common = set(line.with_phase) & set(line.without_phase)
    if len(iso.system.elements) != 2 or len(common) != 1:
        return points
    (phase,) = common
    row_K = (iso.temperature_range_K[1] - iso.temperature_range_K[0]) / (DEFAULT_ROWS - 1)
    for end in (0, -1):
        for inv in iso.invariants:
            if (set(line.with_phase) | set(line.without_phase) <= set(inv.phases)
                    and abs(points[end][1] - inv.temperature_K) <= _ROWS_TO_INVARIANT * row_K
                    and (found := reactions(inv)) is not None):
                at_reaction = (_content(iso, found[phase]), inv.temperature_K)
                points = [at_reaction] + points[1:] if end == 0 else points[:-1] + [at_reaction]
                break
    return points


def _named_lines(iso, labels: list[str | None], unit: str, names) -> list[str]:
    """One row per trade name on the isopleth: the range of temperature and of the varying
    element's content its lines span (for a binary, out to the invariant reactions they end at);
    for a binary's invariant reaction, its phases' contents."""
    from ..phase_names import beside

    known: dict = {}

    def reactions(inv) -> dict | None:
        if inv not in known:
            known[inv] = _invariant_equilibria(iso, inv)
        return known[inv]

    spans: dict[str, list[tuple[float, float]]] = {}
    for line, label in zip(iso.lines, labels):
        if label is not None:
            spans.setdefault(label, []).extend((float(iso.content(u)), T) for u, T in line.points)
    ends: dict[str, list[tuple[float, float]]] = {}     # the lines with their ends on reactions
    for line, label in zip(iso.lines, labels):
        if label is not None:
            ends.setdefault(label, []).extend(_line_points(iso, line, reactions))
    rows = ["lines the trade names:"] if spans else []
    for label, points in spans.items():
        T_mid = sorted(p[1] for p in points)[len(points) // 2]
        flat = next((inv for inv in iso.invariants if abs(inv.temperature_K - T_mid) < 0.5), None)
        found = None if flat is None else reactions(flat)
        if found is not None:     # a binary's invariant reaction: its phases
            phases = sorted(flat.phases, key=lambda name: _content(iso, found[name]))
            parts = ", ".join(f"{beside(name, names.phase_name(name, flat.temperature_K))} "
                              f"{quote.percent(_content(iso, found[name]))}" for name in phases)
            rows.append(f"  {label:<24} at {quote.temperature(flat.temperature_K, unit)}: {parts} "
                        f"{iso.basis}% {iso.element}")
            continue
        if flat is not None:      # an invariant reaction: its temperature and the compositions along it
            c = [p[0] for p in points if abs(p[1] - flat.temperature_K) < 0.5]
            where = f"at {quote.temperature(flat.temperature_K, unit)}"
        else:
            points = ends[label]
            c = [p[0] for p in points]
            where = f"{quote.temperature(max(p[1] for p in points), unit)} to " \
                    f"{quote.temperature(min(p[1] for p in points), unit)}"
        rows.append(f"  {label:<24} {where}, {iso.element} {quote.percent(min(c))}-{quote.percent(max(c))} {iso.basis}%")
    return rows


def _plot(title: str, ascii_only: bool, scene_for) -> list[str]:
    """Print the picture of a section under `title`: `scene_for(glyphs, width, height)` gives its
    scene for the terminal's size. Returns the scene's key of numbered fields."""
    from ..explorer.glyphs import glyphs_for
    from ..explorer.section_drawing import draw_section

    glyphs = glyphs_for(ascii_only)
    key: list[str] = []

    def draw(plt, width: int, height: int) -> None:
        scene = scene_for(glyphs, width, height)
        key.extend(scene.key)
        draw_section(plt, scene, glyphs)

    print(terminal_plot(title, glyphs, 24, draw))
    return key


def _isothermal(system, args: argparse.Namespace) -> int:
    from ladle.engine.diagrams.isothermal import map_isothermal

    t = temperature_kelvin(system, args.temp)
    if len(system.elements) != 3:
        raise CommandError(f"--temp draws a ternary's isothermal section; {system.name} has {len(system.elements)} "
                           f"elements: use --comp with --vary for an isopleth")
    section = map_isothermal(system, t.kelvin)
    if args.json:
        print_json(section.to_json())
        return 0
    from ..explorer.section_drawing import triangle_scene

    title = f"{system_title(system)} at {quote.temperature(t.kelvin, t.unit)}"
    key = _plot(title, args.ascii, lambda glyphs, width, height: triangle_scene(section, glyphs, width, height))
    lines = [f"fields: {'; '.join(key)}"] if key else []
    lines += [f"note: {w}" for w in section.warnings]
    print("\n".join(ascii_text(lines + closing_lines(system), args.ascii)))
    return 0


def _projection(system, args: argparse.Namespace) -> int:
    """A ternary's liquidus projection: the valleys and invariant points drawn on the triangle
    with the primary fields labelled, the four-phase reactions listed (hottest first); or --json."""
    from ladle.engine.diagrams.liquidus_projection import map_liquidus_projection

    if system.covers_elements:
        raise CommandError(f"{system.name} covers only part of the triangle ({system.covered_range_text()}): its "
                           f"liquidus projection is not drawn; give --comp with --vary (an isopleth) or --temp "
                           f"(an isothermal section), which stop at the edge of that range")
    from ladle.engine.diagrams.solid_invariants import solid_invariants

    try:
        projection = map_liquidus_projection(system)
        projection = projection.with_solid_invariants(solid_invariants(system))
    except ValueError as e:
        raise CommandError(f"{system.name}: {e}") from None
    if args.json:
        print_json(projection.to_json())
        return 0
    from ..explorer.section_drawing import projection_scene

    key = _plot(f"{system_title(system)}: liquidus projection", args.ascii,
                lambda glyphs, width, height: projection_scene(projection, glyphs, width, height))
    lines = [f"primary fields: {'; '.join(key)}"] if key else []
    lines.append("invariant reactions (liquid composition at%):" if projection.invariants
                 else "invariant reactions of four phases: none found" if not projection.solid_invariants
                 else "invariant reactions with the liquid: none found")
    from ..phase_names import with_trade_names

    for k, r in enumerate(projection.invariants):
        liquid = ", ".join(f"{el} {quote.percent(v)}" for el, v in zip(system.elements, r.phases[0][1]))
        lines.append(f"  {k + 1}  {r.kind:<16} {quote.temperature(r.temperature_K, args.unit):>12}  "
                     f"{with_trade_names(system, r.equation(), r.temperature_K)}  (liquid {liquid})")
    if projection.solid_invariants:
        lines.append("invariant reactions of four solids:")
    for r in projection.solid_invariants:
        lines.append(f"     {r.kind:<17} {quote.temperature(r.temperature_K, args.unit):>12}  "
                     f"{with_trade_names(system, r.equation(), r.temperature_K)}")
    lines += [f"note: {w}" for w in projection.warnings]
    print("\n".join(ascii_text(lines + closing_lines(system), args.ascii)))
    return 0
