"""Phase names as the trade reads them, shared by the line commands and the explorer.

A phase is shown by its structure name (the system file's name, as the engine knows it) with the
trade's name beside it where the file gives one (`trade_names`: "bct (Sn)", "fcc (Pb)"); where a
phase appears twice, on both sides of a miscibility gap, each side is named by the element it is
rich in ("fcc (Ag-rich)"), as the cooling paths name them.
"""

from __future__ import annotations

import re
from collections.abc import Sequence

from ladle.engine.files.trade_names import trade_names
from ladle.engine.solidify.records import solid_label


def _trade_name(system, phase: str, temperature_K: float) -> str | None:
    return trade_names(system).phase_name(phase, temperature_K)


def phase_label(system, phase: str, x_B: float, temperature_K: float,
                among: Sequence[tuple[str, float]] = ()) -> str:
    """'bct (Sn)', 'fcc (Ag-rich)' or 'liquid': the phase (x_B, mole fraction of B, at
    temperature_K, K) among the phases it is stable with (name, x_B)."""
    gap_side = solid_label(system, phase, x_B, list(among))
    if gap_side != phase:
        return gap_side
    return beside(phase, _trade_name(system, phase, temperature_K))


def equilibrium_labels(system, phases: Sequence, temperature_K: float) -> list[str]:
    """Each phase of one equilibrium (objects with `name` and `x`, mole fractions of every
    element in the system's order) as the trade reads it, any number of elements: the structure
    name with the trade's name beside it ('bct (Sn)'), and where a phase is stable twice, on both
    sides of a miscibility gap, each side named by the element it holds most more of than the
    other side(s) ('fcc (Cu-rich)' beside 'fcc (Ag-rich)'); for a binary the same names as
    `phase_label`."""
    labels = []
    for i, p in enumerate(phases):
        others = [q.x for j, q in enumerate(phases) if j != i and q.name == p.name]
        if not others:
            labels.append(beside(p.name, _trade_name(system, p.name, temperature_K)))
            continue
        excess = [float(p.x[k]) - sum(float(o[k]) for o in others) / len(others) for k in range(len(system.elements))]
        labels.append(f"{p.name} ({system.elements[excess.index(max(excess))]}-rich)")
    return labels


def change_side(system, phases: Sequence[str], temperature_K: float, equilibrium_at=None) -> str:
    """'fcc (Ag-rich) + fcc (Cu-rich)', 'bct (Sn) + liquid': the stable phases on one side of a
    change of an alloy's phases, at temperature_K (K), as the trade reads them. A phase stable
    twice is named by what each side of the gap is rich in, from `equilibrium_at(T)`, the alloy's
    point equilibrium at T just on that side (asked only then); otherwise each phase carries its
    trade name at that temperature."""
    if len(set(phases)) == len(phases) or equilibrium_at is None:
        return " + ".join(beside(p, _trade_name(system, p, temperature_K)) for p in phases)
    eq = equilibrium_at(temperature_K)
    if sorted(p.name for p in eq.phases) != sorted(phases):
        return " + ".join(beside(p, _trade_name(system, p, temperature_K)) for p in phases)
    return " + ".join(equilibrium_labels(system, eq.phases, temperature_K))


def beside(phase: str, trade: str | None) -> str:
    """'fcc (austenite)', 'bct (Sn)': a phase with its trade name beside it (bracketed unless the
    name is a bracketed one already); the phase alone where the name is empty or the same."""
    if not trade or trade == phase:
        return phase
    return f"{phase} {trade}" if trade.startswith("(") else f"{phase} ({trade})"


def with_trade_names(system, text: str, temperature_K: float) -> str:
    """`text` (a constituent such as 'eutectic fcc + bct') with the trade's name beside each
    phase named in it ('eutectic fcc (Pb) + bct (Sn)'); a name already followed by a bracket
    (a side of a gap, 'fcc (Ag-rich)') is left as it is."""
    def named(match: re.Match) -> str:
        return phase_label(system, match.group(0), 0.0, temperature_K)

    phases = sorted(system.phases, key=len, reverse=True)
    pattern = r"(?<![\w(])(" + "|".join(map(re.escape, phases)) + r")(?![\w)]| \()"
    return re.sub(pattern, named, text)


def short_label(system, phase: str, x_B: float, temperature_K: float,
                among: Sequence[tuple[str, float]] = ()) -> str:
    """The shortest name a reader knows the phase by, for labels on a plot: the trade's name
    ('(Sn)'), '(Ag)' for the Ag-rich side of a gap, else the structure name."""
    gap_side = solid_label(system, phase, x_B, list(among))
    if gap_side != phase:
        return f"({gap_side.split('(')[1].removesuffix('-rich)')})"
    return _trade_name(system, phase, temperature_K) or phase


def constituent_label(system, name: str, temperature_K: float) -> str:
    """A constituent of a freezing path ('eutectic fcc + Fe3C') with the trade's names beside its
    phases and, where the file names what the reaction forms, beside it: 'eutectic fcc (austenite)
    + Fe3C (cementite): ledeburite'."""
    label = with_trade_names(system, name, temperature_K)
    trade = constituent_trade_name(system, name)
    return f"{label}: {trade}" if trade else label


def constituent_trade_name(system, name: str) -> str | None:
    """The trade's name of a constituent of a freezing path ('ledeburite' for 'eutectic fcc +
    Fe3C') where a [[trade_line]] of the file names what its reaction forms; else None."""
    kind, _, phases = name.partition(" ")
    if kind not in ("eutectic", "peritectic", "monotectic") or not phases:
        return None
    return trade_names(system).constituent_name(phases.split(" + "), from_liquid=True)
