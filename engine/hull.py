"""The lower convex hull of points sorted by composition (Andrew's monotone chain).

A.M. Andrew, "Another efficient algorithm for convex hulls in two dimensions",
Information Processing Letters 9 (1979) 216-219. Only the lower chain is built. The hull is taken
over a coarse set of points (a few dozen per phase): it only seeds the Newton refinement, and the
result is checked against every phase on a fine grid afterwards.
"""

from __future__ import annotations


def lower_hull(xs: list[float], gs: list[float]) -> list[int]:
    """Indices of the lower-hull vertices of the points (xs, gs); xs strictly increasing.

    Collinear middle points are dropped.
    """
    chain: list[int] = []
    for i, (xi, gi) in enumerate(zip(xs, gs)):
        while len(chain) >= 2:
            a, b = chain[-2], chain[-1]
            if (gs[b] - gs[a]) * (xi - xs[a]) >= (gi - gs[a]) * (xs[b] - xs[a]):
                chain.pop()
            else:
                break
        chain.append(i)
    return chain
