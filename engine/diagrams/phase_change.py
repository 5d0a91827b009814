"""Where the stable phases change between two points of a path through composition and
temperature: the bracket narrowed with few point equilibria. Shared by the isopleth mapping and
the Scheil path of alloys of any number of elements.
"""

from __future__ import annotations


def phase_set(eq) -> tuple[str, ...]:
    """The stable phases of a point equilibrium, sorted (a phase twice where it splits)."""
    return tuple(sorted(p.name for p in eq.phases))


def narrow_change(probe, near: float, far: float, near_key: tuple[str, ...], near_eq, far_eq, tolerance: float):
    """Narrow a change of the stable phases between parameters `near` (phase set `near_key`,
    point equilibrium `near_eq` or None) and `far` (point equilibrium `far_eq`, another set) to
    `tolerance`; `probe(t)` gives the point equilibrium at parameter t. Returns
    (near, far, near_eq, far_eq) at the end, near_eq None where no probe fell on that side.

    Where a phase is present on one side only (the far side, the two sides swapped where need
    be), its amount there is nearly linear in the parameter close to the change and falls to
    zero at it (regula falsi: its zero is tried, a little to either side by turns); bisection
    where that is not so, and whenever a try does not halve the bracket. A change with several phase sets inside the bracket is narrowed to
    one of them."""
    far_key = phase_set(far_eq)
    if near_eq is not None and not any(far_key.count(n) > near_key.count(n) for n in set(far_key)):
        near, far, near_eq, far_eq = narrow_change(probe, far, near, far_key, far_eq, near_eq, tolerance)
        return far, near, far_eq, near_eq                 # the phase that goes to zero is on the near side
    far_points: list[tuple[float, float, tuple[str, ...]]] = []
    side = 1.0
    direction = 1.0 if far > near else -1.0
    while abs(far - near) > tolerance:
        far_key = phase_set(far_eq)
        gained = sorted(n for n in set(far_key) if far_key.count(n) > near_key.count(n))
        if gained and (not far_points or far_points[-1][0] != far):
            far_points.append((far, sum(p.amount_mol for p in far_eq.phases if p.name == gained[0]), far_key))
        same = [(t, a) for t, a, k in far_points if k == far_key]
        width = abs(far - near)
        trial = 0.5 * (near + far)
        guessed = False
        if len(same) >= 2:
            (t1, a1), (t2, a2) = sorted(same[-2:], key=lambda p: abs(p[0] - near))
            if a1 < a2:
                guess = t1 - a1 * (t2 - t1) / (a2 - a1) + side * 0.4 * tolerance * direction
                if min(near, far) < guess < max(near, far):
                    trial, guessed = guess, True
        eq = probe(trial)
        if phase_set(eq) == near_key:
            near, near_eq, side = trial, eq, 1.0
        else:
            far, far_eq, side = trial, eq, -1.0
        if guessed and abs(far - near) > 0.5 * width:
            mid = 0.5 * (near + far)                     # a slow step: bisect once more
            eq = probe(mid)
            if phase_set(eq) == near_key:
                near, near_eq = mid, eq
            else:
                far, far_eq = mid, eq
    return near, far, near_eq, far_eq
