"""A two-phase field's tie-lines at least every so many kelvin: the traced tie-lines of the
mapped diagram (placed where the boundaries bend) with tie-lines solved between them where two
traced ones lie further apart, from the isothermal section at each added temperature.
Temperatures in K, compositions as mole fractions of B.
"""

from __future__ import annotations

import numpy as np

from ..minimize.equilibrium import section_at


def dense_tie_lines(system, field, every_K: float) -> tuple[np.ndarray, np.ndarray]:
    """(T, x) of `field` (the engine's TwoPhaseField) with no gap in T wider than every_K: the
    traced tie-lines and, between them, the section's tie-line of the same two phases nearest the
    traced boundaries (a level where the section has none is left out)."""
    T_traced, x_traced = np.asarray(field.T, dtype=float), np.asarray(field.x, dtype=float)
    temperatures: list[float] = [float(T_traced[0])] if T_traced.size else []
    for low, high in zip(T_traced[:-1], T_traced[1:]):
        count = int(np.ceil((high - low) / every_K))
        temperatures += np.linspace(low, high, max(count, 1) + 1)[1:].tolist()
    rows_T, rows_x = [], []
    for T in temperatures:
        traced = np.flatnonzero(np.isclose(T_traced, T, rtol=0.0, atol=1e-9))
        if traced.size:
            rows_T.append(T)
            rows_x.append(x_traced[traced[0]])
            continue
        guess = np.array([np.interp(T, T_traced, x_traced[:, side]) for side in (0, 1)])
        ties = [np.array(tie.x_B) for tie in section_at(system, T).tie_lines
                if tuple(tie.phases) == tuple(field.phases)]
        if ties:
            rows_T.append(T)
            rows_x.append(min(ties, key=lambda ends: float(np.abs(ends - guess).sum())))
    return np.array(rows_T), np.array(rows_x).reshape(-1, 2)
