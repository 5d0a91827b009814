"""The cursor's alloy through temperature, for the status pane: every temperature where its stable
phases change (the trade's lines named: A1, A3, Acm), and the heat-treatment window they give,
with the caution that the specification governs.

Plain Python (no screen code). The numbers come from the engine (alloy_transitions.py,
heat_treatment.py); shown for systems whose file names lines or a heat treatment (Fe-C). The
scan is coarser than `ladle transitions`' (SCAN_STEP_K): a field narrower than that with the same
phases on both sides is missed, and each change is bracketed to SCAN_TOLERANCE_K, finer than the
tenth of a degree shown. Temperatures in K.
"""

from __future__ import annotations

import textwrap
from dataclasses import dataclass

import numpy as np

from ladle.engine.diagrams.alloy_transitions import AlloyTransitions, alloy_transitions
from ladle.engine.diagrams.heat_treatment import HeatTreatmentWindow, line_labels
from ladle.engine.files.trade_names import trade_names
from ladle.engine.units import kelvin_to

from ..treatment_window import treatment_window
from .exploration import crossing_name
from .status_lines import WIDTH

#: Scan step (K) and bracket (K) of the cursor's alloy's transitions.
SCAN_STEP_K = 2.0
SCAN_TOLERANCE_K = 0.01
#: The caution under a heat-treatment window.
SPECIFICATION_GOVERNS = "your specification governs"
_WINDOW_NAMES = {"austenitizing": "AUSTENITIZING", "solution": "SOLUTION TREATMENT"}

Line = tuple[str, str]


@dataclass(frozen=True)
class AlloyChanges:
    """One alloy's transitions, the trade's name of each (index -> name) and the heat-treatment
    window the system's file asks for (None where there is none)."""

    transitions: AlloyTransitions
    labels: dict[int, str]
    window: HeatTreatmentWindow | None


def shows_changes(system) -> bool:
    """Whether the status pane lists the alloy's transitions: the system's file names lines or
    a heat treatment."""
    names = trade_names(system)
    return bool(names.lines or names.heat_treatment)


def alloy_changes(system, x: np.ndarray) -> AlloyChanges:
    """The transitions of the alloy `x` (mole fractions), their trade names and the window
    (slow, a few seconds for Fe-C: run it in a worker). The solution-treatment window's top is
    the lower of the equilibrium solidus and the end of Scheil freezing, as in `ladle transitions`."""
    names = trade_names(system)
    result = alloy_transitions(system, x, step_K=SCAN_STEP_K, tolerance_K=SCAN_TOLERANCE_K)
    labels = line_labels(result, names.line)
    return AlloyChanges(result, labels, treatment_window(system, result, labels, names.heat_treatment))


def change_lines(system, changes: AlloyChanges | str | None, unit: str, unit_text: str) -> list[Line]:
    """The status pane's lines: each change hot to cold (its temperature in `unit`, written
    `unit_text`, with the trade's name of the line, else liquidus, solidus, the solid that forms
    in the freezing range, or solvus), then the heat-treatment window with its caution; a note
    while they are computed (`changes` None) or why there is no answer (a string)."""
    lines: list[Line] = [("heading", "EQUILIBRIUM CHANGES ON COOLING")]
    if changes is None:
        return lines + [("note", " computing ...")]
    if isinstance(changes, str):
        return lines + [("warning", f" {changes}")]
    names = trade_names(system)
    for i, t in enumerate(changes.transitions.transitions):
        what = changes.labels.get(i) or crossing_name(
            t.above, t.below, lambda p, T=t.temperature_K: names.phase_name(p, T) or p)
        text = f"{kelvin_to(t.temperature_K, unit):.1f} {unit_text} {what}"
        lines += [("value", row) for row in textwrap.wrap(text, WIDTH, initial_indent=" ",
                                                          subsequent_indent="   ")]
    window = changes.window
    if window is not None:
        lines += window_lines(system, window, unit, unit_text)
    return lines


def window_lines(system, window: HeatTreatmentWindow, unit: str, unit_text: str) -> list[Line]:
    """The heat-treatment window: what bounds it, its temperatures, the phases it aims at, any
    note, and the caution that the specification governs."""
    names = trade_names(system)
    phases = " + ".join(names.phase_name(p, window.low_K + 1e-3) or p for p in window.phases)
    low = f"{kelvin_to(window.low_K, unit):.1f}"
    if window.high_K is None:
        span, bounds = f" above {low} {unit_text}", window.low_is
    elif window.high_K <= window.low_K:
        span, bounds = f" none: {window.high_is} at or below {window.low_is}", window.low_is
    else:
        span = f" {low}-{kelvin_to(window.high_K, unit):.1f} {unit_text}"
        bounds = f"{window.low_is} to {window.high_is}"
    return ([("heading", f"{_WINDOW_NAMES[window.kind]}, {bounds}"), ("value", span), ("note", f" {phases}")]
            + [("note", f" {n}") for n in window.notes] + [("warning", f" {SPECIFICATION_GOVERNS}")])
