"""A small dense Newton solver with a finite-difference Jacobian, for the few-unknown systems of
a phase diagram's special points (three-phase equilibria, congruent points, critical points)."""

from __future__ import annotations

from dataclasses import dataclass
from typing import Callable

import numpy as np


@dataclass(frozen=True)
class NewtonResult:
    """`x` the solution; `converged` whether max|f| fell below `ftol` (units of f);
    `iterations` taken; `residual` the final max|f|."""

    x: np.ndarray
    converged: bool
    iterations: int
    residual: float


def newton(f: Callable[[np.ndarray], np.ndarray], x0: np.ndarray, steps: np.ndarray, ftol: float,
           max_step: np.ndarray | None = None, max_iter: int = 40) -> NewtonResult:
    """Solve f(x) = 0 from x0. `steps` are the finite-difference steps per unknown (central
    differences); `max_step` limits each unknown's change per iteration. After the residual
    falls below ftol one more step is taken. A failed evaluation (ValueError, non-finite values)
    ends the solve as not converged."""
    x = np.array(x0, dtype=float)
    steps = np.asarray(steps, dtype=float)
    done = False
    res = np.inf
    for it in range(1, max_iter + 1):
        try:
            fx = np.asarray(f(x), dtype=float)
        except (ValueError, ZeroDivisionError, OverflowError):
            return NewtonResult(x, False, it, res)
        if not np.all(np.isfinite(fx)):
            return NewtonResult(x, False, it, res)
        res = float(np.max(np.abs(fx)))
        if done:
            return NewtonResult(x, res < 10 * ftol, it, res)
        if res < ftol:
            done = True
        J = np.empty((len(fx), len(x)))
        try:
            for k in range(len(x)):
                e = np.zeros_like(x)
                e[k] = steps[k]
                J[:, k] = (np.asarray(f(x + e)) - np.asarray(f(x - e))) / (2 * steps[k])
            dx = np.linalg.solve(J, -fx)
        except (ValueError, ZeroDivisionError, OverflowError, np.linalg.LinAlgError):
            return NewtonResult(x, False, it, res)
        if max_step is not None:
            scale = np.max(np.abs(dx) / max_step)
            if scale > 1.0:
                dx = dx / scale
        x = x + dx
    return NewtonResult(x, res < 10 * ftol, max_iter, res)
