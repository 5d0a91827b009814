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
    cx: list[float] = []      # x and g of the chain's points, kept beside their indices
    cg: list[float] = []
    n = 0
    for i, (xi, gi) in enumerate(zip(xs, gs)):
        while n >= 2:
            ax, ag = cx[n - 2], cg[n - 2]
            if (cg[n - 1] - ag) * (xi - ax) >= (gi - ag) * (cx[n - 1] - ax):
                chain.pop()
                cx.pop()
                cg.pop()
                n -= 1
            else:
                break
        chain.append(i)
        cx.append(xi)
        cg.append(gi)
        n += 1
    return chain
