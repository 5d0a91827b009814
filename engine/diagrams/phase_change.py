"""Where the stable phases change between two points of a path through composition and
temperature: the bracket narrowed with few point equilibria, from the amount of the phase that
appears (or, at a jump, its driving force). Shared by the isopleth mapping, the Scheil path and
the transition scan of alloys of any number of elements, and the search for four-solid
invariants. Driving forces in J per mole of atoms.
"""

from __future__ import annotations

import numpy as np

from ..minimize.multiphase_newton import lowest_driving_force


def phase_set(eq) -> tuple[str, ...]:
    """The stable phases of a point equilibrium, sorted (a phase twice where it splits)."""
    return tuple(sorted(p.name for p in eq.phases))


def narrow_change(probe, near: float, far: float, near_key: tuple[str, ...], near_eq, far_eq, tolerance: float,
                  system=None, first: float | None = None):
    """Narrow a change of the stable phases between parameters `near` (phase set `near_key`,
    point equilibrium `near_eq` or None) and `far` (point equilibrium `far_eq`, another set) to
    `tolerance`; `probe(t)` gives the point equilibrium at parameter t. Returns
    (near, far, near_eq, far_eq) at the end, near_eq None where no probe fell on that side.

    Where a phase is present on one side only (the far side, the two sides swapped where need
    be, as soon as a point equilibrium on the near side is known), its amount there is a smooth function of the parameter that falls to zero at the
    change: its zero is estimated from the points found on that side (a straight line through
    the two nearest, a parabola through the three nearest; regula falsi and inverse
    interpolation), and the next point is tried just beyond the estimate, by the estimate's own
    uncertainty (the two estimates' difference, at least 0.4 `tolerance`; ten times more after
    each try that fell short), and then just before it, so that both sides close in on the
    change together. The bracket is bisected where no estimate lies inside it and after two
    tries in a row that neither halved it nor halved the amount on the far side. A change with
    several phase sets inside the bracket is narrowed to one of them.

    Where the amount gives no estimate (a jump: at an invariant reaction a phase appears with a
    finite amount) and `system` is given, the driving force of the phases that appear is taken
    on the near side instead (`driving_force`: it falls to zero at the change) and its zero
    estimated the same way. `first`, where given and inside the bracket, is tried first (a
    prediction, such as where a neighbouring edge's change lies)."""
    far_points: list[tuple[float, float, tuple[str, ...]]] = []
    near_points: list[tuple[float, float]] = []      # (parameter, driving force) on the near side
    direction = 1.0 if far > near else -1.0
    beyond = True            # the next estimated try goes just beyond the zero (on the far side)
    short = 0                # tries beyond the estimate in a row that still fell on the near side
    slow = 0                 # tries in a row that halved neither the bracket nor the far side's amount
    while abs(far - near) > tolerance:
        far_key = phase_set(far_eq)
        gained = sorted(n for n in set(far_key) if far_key.count(n) > near_key.count(n))
        if not gained and near_eq is not None:     # the phase that goes to zero is on the near side
            near, far, near_eq, far_eq = narrow_change(probe, far, near, far_key, far_eq, near_eq, tolerance, system,
                                                       first)
            return far, near, far_eq, near_eq
        if gained and (not far_points or far_points[-1][0] != far):
            far_points.append((far, sum(p.amount_mol for p in far_eq.phases if p.name == gained[0]), far_key))
        width = abs(far - near)
        trial, guessed = 0.5 * (near + far), False

        def inside(estimate) -> bool:
            return estimate is not None and min(near, far) < estimate[0] < max(near, far)

        estimate = _zero_estimate([(t, a) for t, a, k in far_points if k == far_key], near) if slow < 2 else None
        if not inside(estimate) and system is not None and near_eq is not None and gained and slow < 2:
            if not near_points or near_points[-1][0] != near:
                force = driving_force(system, near_eq, gained)
                near_points.append((near, force if force is not None else np.nan))
            estimate = _zero_estimate([(t, f) for t, f in near_points if np.isfinite(f) and f >= 0.0], far)
        if first is not None and min(near, far) < first < max(near, far):
            trial, first = first, None
        elif inside(estimate):
            zero, spread = estimate
            margin = max(0.4 * tolerance, spread) * 10.0 ** short if beyond else 0.4 * tolerance
            guess = zero + (margin if beyond else -margin) * direction
            if min(near, far) < guess < max(near, far):
                trial, guessed = guess, True
        eq = probe(trial)
        closer = False           # a try on the far side where the amount fell to less than half
        if phase_set(eq) == near_key:
            near, near_eq = trial, eq
            short = short + 1 if guessed and beyond else 0
            beyond = True
        else:
            if gained and far_points and phase_set(eq) == far_points[-1][2]:
                amount = sum(p.amount_mol for p in eq.phases if p.name == gained[0])
                closer = amount < 0.5 * far_points[-1][1]
            far, far_eq = trial, eq
            short, beyond = 0, False
        slow = slow + 1 if abs(far - near) > 0.5 * width and not closer else 0
    return near, far, near_eq, far_eq


def _zero_estimate(points: list[tuple[float, float]], near: float) -> tuple[float, float] | None:
    """(where the amount falls to zero, how uncertain that is) from points (parameter, amount)
    on the side holding the phase: the line through the two points nearest `near` (regula
    falsi), improved by the parabola in amount through the three nearest (inverse quadratic
    interpolation), the two estimates' difference being the uncertainty; None where the amount
    does not fall toward `near`."""
    points = sorted(points, key=lambda p: abs(p[0] - near))[:3]
    if len(points) < 2:
        return None
    (t1, a1), (t2, a2) = points[:2]
    if not 0.0 <= a1 < a2:
        return None
    line = t1 - a1 * (t2 - t1) / (a2 - a1)
    if len(points) < 3 or not a2 < points[2][1]:
        return line, 0.0
    t3, a3 = points[2]
    # t as a parabola in the amount a through the three points, evaluated at a = 0 (Lagrange form)
    parabola = (t1 * a2 * a3 / ((a1 - a2) * (a1 - a3)) + t2 * a1 * a3 / ((a2 - a1) * (a2 - a3))
                + t3 * a1 * a2 / ((a3 - a1) * (a3 - a2)))
    if not min(line, t1) - abs(t1 - line) <= parabola <= max(line, t1) + abs(t1 - line):
        return line, abs(t1 - line)
    return parabola, abs(parabola - line)


def driving_force(system, eq, names) -> float | None:
    """The least driving force (J per mole of atoms) of the phases `names` against the chemical
    potentials of the point equilibrium `eq`: min over each phase's compositions of
    G - sum_i mu_i x_i, from its lowest sample refined by Newton steps
    (minimize.multiphase_newton.lowest_driving_force). Positive where the phases are less
    stable than the equilibrium, zero where one of them joins it. None where the equilibrium
    gives no chemical potentials or a phase has no sampled model."""
    return driving_force_at(system, eq.temperature_K, getattr(eq, "chemical_potentials", ()), names)


def driving_force_at(system, temperature_K: float, chemical_potentials, names) -> float | None:
    """The least driving force (J per mole of atoms) of the phases `names` against the chemical
    potentials (J/mol, one per element of the system, NaN where an element is absent) at
    temperature_K (K), as `driving_force` takes them from a point equilibrium."""
    mu = np.asarray(chemical_potentials, dtype=float)
    models = getattr(system, "models", None)
    if mu.size == 0 or models is None:
        return None
    active = np.isfinite(mu)
    elements = np.flatnonzero(active)
    best = None
    for name in set(names):
        phase = models.get(name)
        if phase is None or not hasattr(phase, "at"):
            return None
        model = phase.at(temperature_K)
        Y, X, G = model.samples()
        E = np.asarray(model.element_matrix)
        free = np.flatnonzero(~np.any(E[:, ~active] != 0.0, axis=1))
        inside = ~np.any(X[:, ~active] > 0.0, axis=1)
        if not inside.any() or len(free) == 0:
            return None
        d = np.where(inside, G - np.nan_to_num(X[:, active] @ mu[active]), np.inf)
        k = int(np.argmin(d))
        _y, refined = lowest_driving_force(model, Y[k], mu[active], elements, free, margin=np.inf)
        force = min(float(d[k]), refined) if np.isfinite(refined) else float(d[k])
        best = force if best is None else min(best, force)
    return best
