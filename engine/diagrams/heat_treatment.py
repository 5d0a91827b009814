"""Heat-treatment windows read from one alloy's transitions (engine/diagrams/alloy_transitions.py).

- Austenitizing (steels; the trade's lines A1, A3 and Acm named in the system file): a
  hypoeutectoid steel is fully austenitic from A3 up to the next change above it; a hypereutectoid
  steel is hardened from austenite + cementite between A1 and Acm; a eutectoid steel is fully
  austenitic above A1.
- Solution treatment (age-hardening alloys): the solid phases above the highest solvus (one,
  or more where one stays undissolved, such as the (Si) of an Al-Si-Mg casting) between that
  solvus and the lower of the equilibrium solidus and the end of Scheil-Gulliver freezing
  (above that end the last liquid of a cast structure can melt: incipient melting).

- Constituents of a plain carbon steel after slow cooling, by the lever rule at A1: the
  austenite just above A1 becomes pearlite (the eutectoid constituent, ferrite + cementite); the
  ferrite or cementite already there is the proeutectoid constituent.
- Constituents of a white cast iron after slow cooling (the iron-cementite diagram): the liquid
  left at the eutectic freezes as the eutectic constituent (ledeburite, austenite + cementite),
  whose austenite later becomes pearlite at A1 (transformed ledeburite); primary austenite rejects
  secondary cementite between the eutectic and A1 (the lever rule on its carbon, from its content
  at the eutectic to that at A1) and becomes pearlite; primary cementite stays. (W.D. Callister,
  D.G. Rethwisch, Materials Science and Engineering: An Introduction, Wiley, ch. 9, the
  iron-carbon system, for the constituents and the lever rule.)

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
    """The solution-treatment window: from the highest solvus (solid phases above, the same
    phases and a precipitate below: one phase, or more where a phase stays undissolved, such
    as the (Si) of an Al-Si-Mg casting alloy above its Mg2Si solvus) up to the lower of the
    next change above (the equilibrium solidus) and `scheil_end_K` (K, the end of
    Scheil-Gulliver freezing; None where unknown). None where no precipitate dissolves in the
    solid state."""
    solvus = next((t for t in result.transitions
                   if _LIQUID not in t.above and set(t.above) < set(t.below)), None)
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


def slow_cooled_constituents(result: AlloyTransitions, named_line: Callable,
                             trade_name: Callable[[str, float], str | None]) -> tuple[Constituent, ...]:
    """The constituents of a steel or a white cast iron that cools slowly through A1 (mass
    fractions of the alloy, by the lever rule; see the module's docstring). `named_line(above,
    below)` gives the trade's line of a change (with its `name` and `constituent`) or None
    (TradeNames.line); `trade_name(phase, T)` (T in K) a phase's trade name. Empty where A1 is not
    crossed, or where the alloy is neither all austenite at some temperature (a steel) nor freezes
    through a eutectic that names its constituent (a cast iron)."""
    lines = {i: line for i, t in enumerate(result.transitions) if (line := named_line(t.above, t.below)) is not None}
    a1_at = next((i for i, line in lines.items() if line.name == A1), None)
    if a1_at is None:
        return ()
    a1, pearlite_name = result.transitions[a1_at], lines[a1_at].constituent or PEARLITE
    eutectic_at = next((i for i, line in lines.items()
                        if line.constituent and _LIQUID in result.transitions[i].above
                        and _LIQUID not in result.transitions[i].below), None)
    if eutectic_at is not None:
        return _cast_iron(result.transitions[eutectic_at], lines[eutectic_at].constituent, a1, pearlite_name, trade_name)
    if not any((_AUSTENITE,) in (t.above, t.below) for t in result.transitions):
        return ()
    T = a1.above_equilibrium.temperature_K
    out = [Constituent(f"proeutectoid {trade_name(p.name, T) or p.name}", p.amount_mass)
           for p in a1.above_equilibrium.phases if p.name != _AUSTENITE]
    pearlite = sum(p.amount_mass for p in a1.above_equilibrium.phases if p.name == _AUSTENITE)
    return tuple(out + [Constituent(pearlite_name, pearlite)])


def _cast_iron(eutectic: Transition, eutectic_name: str, a1: Transition, pearlite_name: str,
               trade_name: Callable[[str, float], str | None]) -> tuple[Constituent, ...]:
    """A white cast iron's constituents after slow cooling: primary phases as they stand just above
    the eutectic, primary austenite split into secondary carbide and pearlite by the lever rule on
    the second element's mass fraction (austenite's at the eutectic and at A1, the carbide's),
    and the eutectic constituent transformed at A1."""
    T_e = eutectic.above_equilibrium.temperature_K
    austenite_e = next(p for p in eutectic.below_equilibrium.phases if p.name == _AUSTENITE)
    austenite_a1 = next((p for p in a1.above_equilibrium.phases if p.name == _AUSTENITE), None)
    carbide = next((p for p in a1.above_equilibrium.phases if p.name != _AUSTENITE), None)
    if austenite_a1 is None or carbide is None:
        return ()
    w_e, w_a1, w_carbide = float(austenite_e.w[1]), float(austenite_a1.w[1]), float(carbide.w[1])
    out = []
    for p in eutectic.above_equilibrium.phases:
        if p.name == _LIQUID:
            continue
        if p.name == _AUSTENITE:
            secondary = p.amount_mass * (w_e - w_a1) / (w_carbide - w_a1)
            T_a1 = a1.above_equilibrium.temperature_K
            out += [Constituent(f"secondary {trade_name(carbide.name, T_a1) or carbide.name}", secondary),
                    Constituent(pearlite_name, p.amount_mass - secondary)]
        else:
            out.append(Constituent(f"primary {trade_name(p.name, T_e) or p.name}", p.amount_mass))
    liquid = sum(p.amount_mass for p in eutectic.above_equilibrium.phases if p.name == _LIQUID)
    return tuple(out + [Constituent(f"transformed {eutectic_name}", liquid)])
