"""Gibbs energies as piecewise functions of temperature.

Each piece is  G(T) = a + b T + c T ln T + d T^2 + e T^3 + f / T + g T^7 + h / T^9 + i / T^2 + j / T^3
(J/mol, T in K), valid from the previous piece's upper limit (or the first piece's lower limit) up to its own.

`FunctionStack` evaluates many functions at one temperature together: one matrix product of their
coefficients with the ten terms above (what a binary section needs at each new temperature).
"""

from __future__ import annotations

import math
from bisect import bisect_left
from dataclasses import dataclass
from functools import cached_property

import numpy as np

#: Names of the coefficients, in the order of the terms above.
COEFFICIENTS = ("a", "b", "c", "d", "e", "f", "g", "h", "i", "j")


class TemperatureOutOfRange(ValueError):
    """Raised when a temperature lies outside every piece of a function."""


def _evaluate(row: tuple[float, ...], T: float) -> float:
    a, b, c, d, e, f, g, h, i, j = row
    v = a + T * (b + T * (d + T * e))
    if c:
        v += c * T * math.log(T)
    if f:
        v += f / T
    if g:
        v += g * T**7
    if h:
        v += h / T**9
    if i or j:
        v += (i + j / T) / (T * T)
    return v


def _evaluate_dT(row: tuple[float, ...], T: float) -> float:
    _a, b, c, d, e, f, g, h, i, j = row
    v = b + T * (2.0 * d + 3.0 * e * T)
    if c:
        v += c * (math.log(T) + 1.0)
    if f:
        v -= f / (T * T)
    if g:
        v += 7.0 * g * T**6
    if h:
        v -= 9.0 * h / T**10
    if i or j:
        v -= (2.0 * i + 3.0 * j / T) / (T * T * T)
    return v


@dataclass(frozen=True, eq=False)
class TemperatureFunction:
    """A piecewise temperature polynomial.

    `bounds` holds the lower limit of the first piece followed by each piece's upper limit (K);
    `coefficients` has one row of the eight coefficients (a..h) per piece.
    """

    bounds: tuple[float, ...]
    coefficients: np.ndarray

    @classmethod
    def constant_terms(cls, coefficients: dict[str, float], lower: float = 0.0, upper: float = math.inf) -> "TemperatureFunction":
        """One piece valid from `lower` to `upper` K, from a mapping of coefficient letters."""
        row = np.array([float(coefficients.get(k, 0.0)) for k in COEFFICIENTS])
        return cls((lower, upper), row[None, :])

    @property
    def lower_K(self) -> float:
        return self.bounds[0]

    @cached_property
    def is_constant(self) -> bool:
        """Whether the function takes one value at every temperature where it is defined."""
        rows = self._rows
        return all(not any(row[1:]) for row in rows) and len({row[0] for row in rows}) == 1

    @property
    def upper_K(self) -> float:
        return self.bounds[-1]

    @cached_property
    def _rows(self) -> tuple[tuple[float, ...], ...]:
        return tuple(tuple(float(c) for c in row) for row in self.coefficients)

    def _row(self, T: float) -> tuple[float, ...]:
        rows = self._rows
        if len(rows) == 1 and self.bounds[0] <= T <= self.bounds[1] and T > 0.0:
            return rows[0]
        if not (self.bounds[0] <= T <= self.bounds[-1]) or T <= 0.0:
            raise TemperatureOutOfRange(
                f"temperature {T:.2f} K is outside the model's range {self.bounds[0]:g}-{self.bounds[-1]:g} K"
            )
        i = bisect_left(self.bounds, T, 1) - 1
        return rows[min(max(i, 0), len(rows) - 1)]

    @cached_property
    def _one_piece(self) -> tuple[float, float, tuple[float, ...]] | None:
        """(lower K, upper K, coefficients) of a function of one piece, else None."""
        return (self.bounds[0], self.bounds[1], self._rows[0]) if len(self._rows) == 1 else None

    def value(self, T: float) -> float:
        """G(T) in J/mol."""
        one = self._one_piece
        if one is not None and one[0] <= T <= one[1] and T > 0.0:
            return _evaluate(one[2], T)
        return _evaluate(self._row(T), T)

    def derivative(self, T: float) -> float:
        """dG/dT in J/(mol K)."""
        one = self._one_piece
        if one is not None and one[0] <= T <= one[1] and T > 0.0:
            return _evaluate_dT(one[2], T)
        return _evaluate_dT(self._row(T), T)

    def plus(self, other: "TemperatureFunction") -> "TemperatureFunction":
        """The sum of two functions, valid where both are (pieces split where either changes)."""
        lower = max(self.lower_K, other.lower_K)
        upper = min(self.upper_K, other.upper_K)
        cuts = sorted({b for b in self.bounds[1:] + other.bounds[1:] if lower < b < upper} | {upper})
        rows = []
        start = lower
        for cut in cuts:
            mid = 0.5 * (start + cut) if math.isfinite(cut) else start + 1.0
            rows.append(np.add(self._row(max(mid, 1e-9)), other._row(max(mid, 1e-9))))
            start = cut
        return TemperatureFunction((lower, *cuts), np.array(rows))

    def scaled(self, factor: float) -> "TemperatureFunction":
        """The function times `factor`, over the same pieces."""
        return TemperatureFunction(self.bounds, np.asarray(self.coefficients) * float(factor))


def _terms(T: float) -> list[float]:
    """The ten terms of a piece at T (K), in the order of COEFFICIENTS: 1, T, T ln T, T^2, T^3,
    1/T, T^7, T^-9, T^-2, T^-3."""
    inv = 1.0 / T
    inv2 = inv * inv
    T3 = T * T * T
    return [1.0, T, T * math.log(T), T * T, T3, inv, T3 * T3 * T, inv2 * inv2 * inv2 * inv2 * inv, inv2, inv2 * inv]


def _terms_dT(T: float) -> list[float]:
    """The temperature derivatives (per K) of the ten terms of `_terms`."""
    inv = 1.0 / T
    inv2 = inv * inv
    T2 = T * T
    return [0.0, 1.0, math.log(T) + 1.0, 2.0 * T, 3.0 * T2, -inv2, 7.0 * T2 * T2 * T2,
            -9.0 * inv2 * inv2 * inv2 * inv2 * inv2, -2.0 * inv2 * inv, -3.0 * inv2 * inv2]


class FunctionStack:
    """Several temperature functions evaluated together at one temperature: the rows of the
    piece each function takes between neighbouring piece limits of any of them are stacked once,
    so that every value and dG/dT at T is one matrix product. They agree with each function's
    own `value` and `derivative` to rounding (the terms are summed in another order).
    A temperature outside a function's range raises that function's TemperatureOutOfRange."""

    def __init__(self, functions: tuple[TemperatureFunction, ...]) -> None:
        self.functions = functions
        self.lower_K = max((f.lower_K for f in functions), default=0.0)
        self.upper_K = min((f.upper_K for f in functions), default=math.inf)
        cuts = sorted({b for f in functions for b in f.bounds[1:-1] if self.lower_K < b < self.upper_K})
        #: the upper limit of each interval between piece limits; T at a limit belongs to the
        #: interval below it, as each function's own pieces do
        self._uppers = cuts + [self.upper_K]
        self._rows = []
        lower = self.lower_K
        for upper in self._uppers:
            inside = upper if math.isfinite(upper) else lower + 1.0
            self._rows.append(np.array([f._row(inside) for f in functions]).reshape(len(functions), len(COEFFICIENTS)))
            lower = upper

    @property
    def piece_rows(self) -> tuple[np.ndarray, ...]:
        """Per interval between piece limits (in order of temperature): the (functions, 10)
        coefficient rows each function takes there, in the order of COEFFICIENTS."""
        return tuple(self._rows)

    def piece(self, T: float) -> int:
        """The index into `piece_rows` of the interval holding T (K); a temperature outside a
        function's range raises that function's TemperatureOutOfRange."""
        if not (self.lower_K <= T <= self.upper_K) or T <= 0.0:
            for f in self.functions:        # the first function out of range raises
                f.value(T)
        return bisect_left(self._uppers, T) if len(self._rows) > 1 else 0

    def values_and_derivatives(self, T: float) -> np.ndarray:
        """(2, functions): every function's value (J/mol) and dG/dT (J/(mol K)) at T (K), in the
        order of `functions`."""
        return np.array((_terms(T), _terms_dT(T))) @ self._rows[self.piece(T)].T


def terms(T: float) -> np.ndarray:
    """(10,): the ten terms of a piece at T (K), in the order of COEFFICIENTS: any linear
    combination of the coefficients (a function's value, or values on a grid) at T is this
    times a fixed matrix."""
    return np.array(_terms(T))

