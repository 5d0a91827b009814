"""Diagrams stop at the edge of the range a model covers: no tie-line, reaction or exported row
lies wholly outside it (engine/diagrams/diagram.py covered_fields; `ladle diagram --json/--csv`;
the explorer's reactions view). The partial system is the shipped Al-Cu file, which covers
0-32 at% Cu: its model is not meant for the copper-rich side, where its liquid stays stable far
too low (a known limit of that file)."""

from __future__ import annotations

import copy
import csv
import io

from ladle.engine import find_system, load_system
from ladle.engine.diagrams.diagram import map_diagram
from ladle.tui.commands.diagram import write_csv
from ladle.tui.explorer.reaction_rows import reaction_rows
from ladle.tui.explorer.glyphs import glyphs_for
from ladle.tui.explorer.scales import Scales


def _reaches_in(xs, lo: float, hi: float) -> bool:
    return min(xs) < hi - 1e-6 and max(xs) > lo + 1e-6


def test_the_whole_fields_do_reach_outside_so_the_cut_is_tested():
    system = find_system("al-cu")
    lo, hi = system.covers
    whole = map_diagram(system).fields
    assert any(not _reaches_in(pair, lo, hi) for f in whole for pair in f.x)


def test_exports_hold_no_tie_line_or_reaction_outside_the_covered_range():
    system = find_system("al-cu")
    lo, hi = system.covers
    diagram = map_diagram(system)
    data = diagram.to_json()
    ties = [t for f in data["two_phase_fields"] for t in f["tie_lines"]]
    assert ties and all(_reaches_in(t[1:], lo, hi) for t in ties)
    for inv in data["invariants"]:
        assert _reaches_in([p["mole_fraction"]["Cu"] for p in inv["phases"]], lo, hi)
    assert all(lo - 1e-9 <= s["x_B"] <= hi + 1e-9 for s in data["special_points"])
    out = io.StringIO()
    write_csv(system, diagram, out, "K", 1000.0)   # a step wider than any field: the traced tie-lines only
    rows = list(csv.DictReader(io.StringIO(out.getvalue())))
    assert len(rows) == len(ties)
    assert all(_reaches_in([float(r["x_Cu_left"]), float(r["x_Cu_right"])], lo, hi) for r in rows)


def test_the_reactions_view_lists_only_covered_reactions():
    system = find_system("al-cu")
    lo, hi = system.covers
    diagram = map_diagram(system)
    rows = reaction_rows(diagram, system.elements, Scales(system.molar_mass), glyphs_for(False))
    assert len(rows) == len(diagram.invariants) + len(diagram.special_points)
    assert all(_reaches_in([x for _n, x in inv.phases], lo, hi) for inv in diagram.invariants)


def test_reactions_above_the_covered_temperatures_are_left_out():
    """The same model declared for 300-800 K only: its 548 C (821 K) eutectic and the melting of
    aluminium (933 K) are not reported, and no exported tie-line lies above 800 K."""
    shipped = find_system("al-cu")
    doc = copy.deepcopy(shipped.document)
    doc["covers_K"] = [300, 800]
    system = load_system(shipped.path, name="al-cu-cool", document=doc)
    diagram = map_diagram(system)
    assert all(i.temperature_K <= 800 for i in diagram.invariants)
    assert all(s.temperature_K <= 800 for s in diagram.special_points)
    assert all(t[0] <= 800 for f in diagram.to_json()["two_phase_fields"] for t in f["tie_lines"])
    assert any(i.temperature_K > 800 for i in map_diagram(shipped).invariants)


def test_a_reaction_touching_the_edge_with_a_compound_is_left_out():
    """Au-Sn covers 0-50 at% Sn; AuSn (50 at%) takes part in reactions on the tin-rich side that the
    model does not describe (its tin-rich compounds are not modelled): they are not reported."""
    system = find_system("au-sn")
    lo, hi = system.covers
    invariants = map_diagram(system).invariants
    assert invariants and all(min(x for _n, x in i.phases) < hi - 1e-6 for i in invariants)
