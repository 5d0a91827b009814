"""Equilibrium cooling of an alloy of any number of elements: the lever rule at every step.

Every state is a point equilibrium of the whole alloy. The temperatures where its stable phases
change come from the one-alloy transition scan (engine/diagrams/alloy_transitions.py) between
the liquidus and a temperature below the end of freezing; between them the path is sampled
evenly. A change at which liquid is left above and none below is the end of freezing: an
invariant reaction (a plateau: `eutectic`, `ternary eutectic`, ... by the number of solids it
gives) where a finite amount of liquid freezes at once, else the solidus.

Temperatures in K, compositions in mole fractions of every element, amounts as fractions of
the alloy, heats in J per gram of alloy (H = G - T dG/dT of each phase from its model).
"""

from __future__ import annotations

import numpy as np

from ..diagrams.alloy_transitions import alloy_transitions
from ..minimize.equilibrium import equilibrate
from .alloy_records import (LIQUID, AlloyConstituent, AlloyPath, AlloyStep, forming_together, labelled, molar_mass,
                            phase_enthalpy)
from .records import Arrest, PathError

#: About this many states between the liquidus and the end of freezing; the transition scan
#: steps as finely (at least 1 K, at most _MAX_SCAN_STEP_K).
_STATES = 40
_MAX_SCAN_STEP_K = 5.0
#: Liquid (mole fraction of the alloy's atoms) above a change that ends freezing, beyond which
#: the change is a plateau (an invariant reaction) rather than the solidus.
PLATEAU_LIQUID = 1e-6


def _equilibrium(system, T: float, x: np.ndarray):
    return equilibrate(system, T, float(x[1]) if len(x) == 2 else x)


def _liquid_amount(eq) -> float:
    return sum(p.amount_mol for p in eq.phases if p.name == LIQUID)


def _enthalpy(system, eq, T: float) -> float:
    """Enthalpy (J per mole of alloy) of the phases of a point equilibrium, all at T (K)."""
    return sum(p.amount_mol * phase_enthalpy(system, p, T) for p in eq.phases if p.amount_mol > 0.0)


def alloy_equilibrium_cooling(system, x, top_K: float, bottom_K: float) -> AlloyPath:
    """The equilibrium path of the alloy with mole fractions `x`, scanned from `top_K` (K, above
    its liquidus) down to `bottom_K` (K, below the end of its freezing, such as the Scheil
    path's end). Raises PathError with one line where the alloy has no liquidus in that range."""
    x = np.asarray(x, dtype=float)
    step = min(_MAX_SCAN_STEP_K, max(1.0, (top_K - bottom_K) / _STATES))
    scan = alloy_transitions(system, x, step_K=step, highest_K=top_K, lowest_K=bottom_K)
    changes = list(scan.transitions)
    first = next((k for k, t in enumerate(changes) if t.above == (LIQUID,)), None)
    if scan.top != (LIQUID,) or first is None:
        raise PathError(f"the alloy is not all liquid at {top_K:.1f} K or has no liquidus above {bottom_K:.1f} K")
    liquidus = changes[first].temperature_K
    end_at = next((k for k in range(first, len(changes)) if LIQUID in changes[k].above and LIQUID not in changes[k].below),
                  None)
    end_K = None if end_at is None else changes[end_at].temperature_K
    inside = changes[first:(end_at + 1 if end_at is not None else len(changes))]
    M = molar_mass(system, x)

    temperatures = {liquidus}
    low = end_K if end_K is not None else bottom_K
    temperatures.update(np.linspace(liquidus, low, _STATES + 1)[1:-1].tolist())
    edges = {c.temperature_K for c in inside}
    states: list[tuple[float, object]] = [(liquidus, _equilibrium(system, liquidus + scan.tolerance_K, x))]
    for T in sorted(temperatures | edges, reverse=True):
        if T in edges:
            width = 0.5 * scan.tolerance_K
            if T != liquidus:
                states.append((T, _equilibrium(system, T + width, x)))
            states.append((T, next(c for c in inside if c.temperature_K == T).below_equilibrium))
        elif T != liquidus:
            states.append((T, _equilibrium(system, T, x)))

    steps: list[AlloyStep] = []
    heat = 0.0
    arrests: list[Arrest] = []
    forms: list[tuple[str, float]] = []
    previous = None
    for T, eq in states:
        if previous is not None:
            T_mid = 0.5 * (T + previous[0])
            heat += _enthalpy(system, previous[1], T_mid) - _enthalpy(system, eq, T_mid)
        liquid = next((p for p in eq.phases if p.name == LIQUID), None)
        solids = [p for p in eq.phases if p.name != LIQUID]
        f_mol = 1.0 - (liquid.amount_mol if liquid else 0.0)
        f_mass = 1.0 - (liquid.amount_mass if liquid else 0.0)
        names = tuple(labelled(system, solids))
        for n in names:
            if n not in {f for f, _ in forms}:
                forms.append((n, T))
        steps.append(AlloyStep(T, f_mass, f_mol, None if liquid is None else tuple(float(v) for v in liquid.x),
                               ((LIQUID,) if liquid else ()) + names, heat / M))
        previous = (T, eq)

    end = "window"
    for c in inside:
        T = c.temperature_K
        if c is inside[0]:
            arrests.append(Arrest(T, "liquidus", f"liquidus: {' + '.join(n for n in c.below if n != LIQUID)} starts to form"))
            continue
        if LIQUID in c.below:
            new = [n for n in c.below if n not in c.above]
            gone = [n for n in c.above if n not in c.below]
            what = [f"{n} starts to form" for n in new] + [f"{n} is used up" for n in gone]
            arrests.append(Arrest(T, "new phase", "; ".join(what) or "the stable phases change"))
    constituents = _constituents(system, states, forms)
    if end_K is not None:
        above = next(eq for T, eq in states if T == end_K)        # the state just above the end
        below = inside[-1].below_equilibrium
        if _liquid_amount(above) > PLATEAU_LIQUID:
            products = list(below.phases)
            end = forming_together(len(products)) if len(products) > 1 else "congruent"
            plateau = (_enthalpy(system, above, end_K) - _enthalpy(system, below, end_K)) / M
            reaction = " + ".join(labelled(system, products))
            arrests.append(Arrest(end_K, "plateau", f"{end} plateau: liquid -> {reaction}", float(plateau)))
        else:
            end = "solidus"
            arrests.append(Arrest(end_K, "end", "solidus: freezing ends"))
    else:
        liquid = next(p for p in states[-1][1].phases if p.name == LIQUID)
        constituents.append(AlloyConstituent("liquid left at the bottom of the window", float(liquid.amount_mass),
                                             float(liquid.amount_mol), tuple(float(v) for v in liquid.x)))
    notes = tuple(scan.warnings)
    return AlloyPath("equilibrium", system, tuple(float(v) for v in x), liquidus, end_K, end, tuple(steps), tuple(forms),
                     tuple(constituents), heat / M, tuple(arrests), notes)


def _constituents(system, states, forms) -> list[AlloyConstituent]:
    """The structure by what froze together: the liquid lost between two states of the path
    (its amount and mean composition by mass balance) belongs to the constituent named by the
    solids present with the liquid at the later state: `primary X` first, `eutectic X + Y` (or
    `ternary eutectic ...`) while several form together, `peritectic X` where one other solid
    forms alone later, and, where the last liquid freezes at once at an invariant reaction, the
    reaction's products. The classical analysis of equilibrium freezing (the solids keep
    re-equilibrating, so a constituent's composition is that of the liquid it came from)."""
    order = {n: k for k, (n, _) in enumerate(forms)}
    found: dict[str, list] = {}
    previous = None
    for _T, eq in states:
        liquid = next((p for p in eq.phases if p.name == LIQUID), None)
        if previous is not None:
            f0, x0, m0 = previous.amount_mol, np.asarray(previous.x, dtype=float), previous.amount_mass
            f1, x1, m1 = (liquid.amount_mol, np.asarray(liquid.x, dtype=float), liquid.amount_mass) if liquid else \
                (0.0, np.zeros_like(x0), 0.0)
            if f0 - f1 > 0.0:
                solids = sorted((p for p in eq.phases if p.name != LIQUID), key=lambda p: order.get(p.name, len(order)))
                names = labelled(system, solids)
                if liquid is None and f0 <= PLATEAU_LIQUID and found:
                    name = next(reversed(found))                     # the last trace joins the stage it ends
                elif len(names) > 1:
                    name = f"{forming_together(len(names))} {' + '.join(names)}"
                elif not found or next(iter(found)) == f"primary {names[0]}":
                    name = f"primary {names[0]}"
                else:
                    name = f"peritectic {names[0]}"
                stage = found.setdefault(name, [0.0, np.zeros_like(x0), 0.0])
                stage[0] += f0 - f1
                stage[1] = stage[1] + f0 * x0 - f1 * x1
                stage[2] += m0 - m1
        previous = liquid
    return [AlloyConstituent(name, float(mass), float(mol), tuple(float(v) for v in elements / mol))
            for name, (mol, elements, mass) in found.items() if mol > 0.0]
