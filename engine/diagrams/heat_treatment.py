"""Heat-treatment windows read from one alloy's transitions (engine/diagrams/alloy_transitions.py).

- Austenitizing (steels; the trade's lines A1, A3 and Acm named in the system file): a
  hypoeutectoid steel is fully austenitic from A3 up to the next change above it; a hypereutectoid
  steel is hardened from austenite + cementite between A1 and Acm; a eutectoid steel is fully
  austenitic above A1.
- Solution treatment (age-hardening alloys): the single solid phase between its solvus and the
  lower of the equilibrium solidus and the end of Scheil-Gulliver freezing (above that end the
  last liquid of a cast structure can melt: incipient melting).

- Constituents of a plain carbon steel after slow cooling, by the lever rule at A1: the
  austenite just above A1 becomes pearlite (the eutectoid constituent, ferrite + cementite); the
  ferrite or cementite already there is the proeutectoid constituent.

These are equilibrium results of the model, not a process specification: real heating and cooling
rates shift the temperatures and change the constituents. Temperatures in K, amounts as mass
fractions of the alloy.
"""

from __future__ import annotations

from collections.abc import Callable
from dataclasses import dataclass

from .alloy_transitions import AlloyTransitions, Transition

A1, A3, ACM = "A1", "A3", "Acm"
#: The trade's name of the eutectoid constituent of steels.
PEARLITE = "pearlite"
_LIQUID = "liquid"
_AUSTENITE = "fcc"


@dataclass(frozen=True)
class HeatTreatmentWindow:
    """The temperatures (K) between `low_K` and `high_K` where `phases` are the stable phases
    that the treatment `kind` ("austenitizing" or "solution") aims at. `low_is` and `high_is` say
    what bounds the window ("A3", "solvus", "solidus", "Scheil end", ...); `high_K` is None where
    nothing bounds it inside the scan. `notes` explain a missing or narrowed window."""

    kind: str
    low_K: float
    high_K: float | None
    low_is: str
    high_is: str
    phases: tuple[str, ...]
    notes: tuple[str, ...] = ()


def _next_above(result: AlloyTransitions, t: Transition) -> Transition | None:
    hotter = [u for u in result.transitions if u.temperature_K > t.temperature_K]
    return hotter[-1] if hotter else None


def _bounded_above(result: AlloyTransitions, t: Transition, kind: str, low_is: str) -> HeatTreatmentWindow:
    up = _next_above(result, t)
    if up is None:
        return HeatTreatmentWindow(kind, t.temperature_K, None, low_is, "top of the scan", t.above)
    high_is = "solidus" if _LIQUID in up.above and _LIQUID not in up.below else "next change"
    return HeatTreatmentWindow(kind, t.temperature_K, up.temperature_K, low_is, high_is, t.above)


def austenitizing_window(result: AlloyTransitions, labels: dict[int, str]) -> HeatTreatmentWindow | None:
    """The austenitizing window of a steel from its transitions and their trade labels
    (`labels`: index into result.transitions -> label); None where no A1 or A3 is crossed."""
    found = {label: result.transitions[i] for i, label in labels.items()}
    if ACM in found and A1 in found:
        a1, acm = found[A1], found[ACM]
        return HeatTreatmentWindow("austenitizing", a1.temperature_K, acm.temperature_K, A1, ACM, a1.above)
    if A3 in found:
        return _bounded_above(result, found[A3], "austenitizing", A3)
    if A1 in found and len(found[A1].above) == 1:
        return _bounded_above(result, found[A1], "austenitizing", A1)
    return None


def solution_window(result: AlloyTransitions, scheil_end_K: float | None) -> HeatTreatmentWindow | None:
    """The solution-treatment window: from the highest solvus (a single solid phase above, that
    phase and a precipitate below) up to the lower of the next change above (the equilibrium
    solidus) and `scheil_end_K` (K, the end of Scheil-Gulliver freezing; None where unknown).
    None where the alloy never has a single solid phase above a solvus."""
    solvus = next((t for t in result.transitions
                   if len(t.above) == 1 and _LIQUID not in t.above and set(t.above) < set(t.below)), None)
    if solvus is None:
        return None
    window = _bounded_above(result, solvus, "solution", "solvus")
    notes = []
    if scheil_end_K is None:
        notes.append("the end of Scheil-Gulliver freezing is not known here; the window's top is the equilibrium solidus")
    elif window.high_K is None or scheil_end_K < window.high_K:
        if scheil_end_K <= window.low_K:
            notes.append("Scheil-Gulliver freezing ends below the solvus: a cast structure can melt locally "
                         "at any temperature of the single-phase field (homogenise first)")
        window = HeatTreatmentWindow("solution", window.low_K, scheil_end_K, "solvus", "Scheil end", window.phases)
    return HeatTreatmentWindow(window.kind, window.low_K, window.high_K, window.low_is, window.high_is,
                               window.phases, tuple(notes))


@dataclass(frozen=True)
class Constituent:
    """A constituent of the slowly cooled alloy: its name and mass fraction of the alloy."""

    name: str
    mass_fraction: float


def line_labels(result: AlloyTransitions, named_line: Callable) -> dict[int, str]:
    """Index -> the trade's name of each transition of `result` that a named line fits;
    `named_line(above, below)` gives that line (with its `name`) or None (TradeNames.line)."""
    return {i: line.name for i, t in enumerate(result.transitions) if (line := named_line(t.above, t.below)) is not None}


def slow_cooled_constituents(result: AlloyTransitions, labels: dict[int, str],
                             trade_name: Callable[[str, float], str | None]) -> tuple[Constituent, ...]:
    """Proeutectoid constituent and pearlite of a steel that cools slowly through A1 (the lever
    rule just above A1): the austenite there becomes pearlite; each other phase there is named
    'proeutectoid' + its trade name (`trade_name(phase, T)`, T in K). Empty where A1 is not
    crossed, or where the alloy is never all austenite (a cast iron: its cementite above A1 is
    partly eutectic, not proeutectoid)."""
    a1 = next((result.transitions[i] for i, label in labels.items() if label == A1), None)
    all_austenite = any((_AUSTENITE,) in (t.above, t.below) for t in result.transitions)
    if a1 is None or not all_austenite:
        return ()
    T = a1.above_equilibrium.temperature_K
    out = [Constituent(f"proeutectoid {trade_name(p.name, T) or p.name}", p.amount_mass)
           for p in a1.above_equilibrium.phases if p.name != _AUSTENITE]
    pearlite = sum(p.amount_mass for p in a1.above_equilibrium.phases if p.name == _AUSTENITE)
    return tuple(out + [Constituent(PEARLITE, pearlite)])
