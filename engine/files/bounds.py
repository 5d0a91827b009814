"""What a system file may hold: bounds that keep a hostile or mistyped file from costing minutes
or giving nonsense (systems/FORMAT.md, "Bounds"). Each bound is far beyond any published
assessment; a file that exceeds one is refused in one line naming the file and the key.
"""

from __future__ import annotations

import math
from typing import Any, Callable

#: The largest system file (bytes).
MAX_FILE_BYTES = 2_000_000
#: Elements of one system.
MAX_ELEMENTS = 12
#: Phases of one system (its own and those of the files it builds on).
MAX_PHASES = 200
#: Pieces of one temperature function.
MAX_PIECES = 16
#: Coefficients of one interaction parameter (Redlich-Kister orders 0..9).
MAX_TERMS = 10
#: Interaction parameters (pairs, triples, sublattice terms) of one phase.
MAX_INTERACTIONS = 500
#: Sublattices of one phase, and constituents of one sublattice.
MAX_SUBLATTICES = 8
MAX_CONSTITUENTS = 16
#: Sites of one sublattice per formula unit: at most, and at least (a hundred-millionth of a site,
#: 1e-9, took the minimiser minutes on Fe-C; 1e-300 ended in numpy errors).
MAX_SITES = 1000.0
MIN_SITES = 0.01
#: The narrowest range (at%) a file may cover of one element (of B in a two-element file): an
#: isothermal section of Ag-Cu-Sn with Cu covered over 1e-7 at% took 122 s, over 1e-4 at% 7 s,
#: over 1e-3 at% 1.5 s (load 5.5 on 2 cores). A binary diagram of 0.001-0.5 at% draws in about
#: 0.19 s of CPU since drawings are cut at their window (it took 46 s at 0.1 at% before).
MIN_ELEMENT_RANGE_AT_PERCENT = 0.01
#: The narrowest window (K) diagrams may be mapped over, after covers_K has narrowed it.
MIN_WINDOW_K = 1.0
#: Temperatures a file may name (piece limits, covered and mapped ranges), K.
MAX_TEMPERATURE_K = 20_000.0
#: The largest magnitude of any one term (a, b*T, c*T*ln(T), ...) of a Gibbs-energy function over
#: the temperatures where it holds, J/mol: a hundred times the largest formation energies known.
MAX_TERM_J = 1e8
#: The largest magnitude of a Curie (or Neel) temperature (K) and of a magnetic moment (Bohr
#: magnetons) stated as a number.
MAX_CURIE_K = 1e5
MAX_MOMENT = 100.0
#: The molar masses a file may give (g/mol): those of the periodic table, hydrogen's 1.008 to
#: oganesson's 294 (IUPAC standard atomic weights), with room either side.
MOLAR_MASS_G_PER_MOL = (1.0, 300.0)
#: The widest spread a fact may give: its tolerance (a [[check]]) or standard uncertainty (a
#: [[measured]] fact) in K, at% and J/mol, and its tolerance factor. A check whose tolerance is
#: wider cannot fail (1e308 K passed every check), and such an uncertainty weighs nothing in a fit.
MAX_SPREAD = {"K": 100.0, "at": 10.0, "J": 10_000.0, "factor": 10.0}
#: How deep files may build on files that build on files.
MAX_BUILD_DEPTH = 4

Fail = Callable[[str, str], Exception]

#: Each term of a piece as a function of T, in the order of the coefficients a..h.
_TERMS = (lambda T: 1.0, lambda T: T, lambda T: T * math.log(T), lambda T: T * T, lambda T: T**3,
          lambda T: 1.0 / T, lambda T: T**7, lambda T: T**-9, lambda T: T**-2, lambda T: T**-3)


def finite_number(value: Any) -> bool:
    """Whether `value`, as TOML gives it, is a number (a boolean is not) that is finite as a float:
    NaN, infinities and integers beyond the float range (10**400, which TOML allows) are not."""
    if isinstance(value, bool) or not isinstance(value, (int, float)):
        return False
    try:
        return math.isfinite(value)
    except OverflowError:                   # an integer too large for a float
        return False


def shown_value(value: Any) -> str:
    """`value` from a file as a message quotes it: its repr, shortened to about 80 characters (an
    integer of thousands of digits, which TOML allows in hexadecimal, has none Python will write)."""
    try:
        text = repr(value)
    except ValueError:                      # more digits than Python converts to text
        return "a value holding an integer of thousands of digits"
    return text if len(text) <= 80 else text[:77] + "..."


def check_count(n: int, limit: int, key: str, what: str, fail: Fail) -> None:
    """Refuse more than `limit` of `what` under `key`."""
    if n > limit:
        raise fail(key, f"{n} {what}; a file may hold at most {limit}")


def check_temperature(T: float, key: str, fail: Fail) -> None:
    """Refuse a temperature limit above MAX_TEMPERATURE_K."""
    if T > MAX_TEMPERATURE_K:
        raise fail(key, f"{T:g} K is beyond the {MAX_TEMPERATURE_K:g} K a file may name")


def check_terms(row: list[float], low_K: float, high_K: float, key: str, fail: Fail) -> None:
    """Refuse a piece (coefficients a..h, J/mol) one of whose terms exceeds MAX_TERM_J in
    magnitude somewhere between low_K and high_K (each term is largest at an end, or for
    T ln T at most e^-1 K away from one)."""
    from ..models.polynomials import COEFFICIENTS

    ends = (max(low_K, 1e-3), high_K)
    for letter, coefficient, term in zip(COEFFICIENTS, row, _TERMS):
        if coefficient == 0.0:
            continue
        largest = max(abs(coefficient * term(T)) for T in ends)
        if not largest <= MAX_TERM_J:
            raise fail(f"{key}.{letter}", f"{coefficient:g} gives a term of {largest:.3g} J/mol between {ends[0]:g} and "
                       f"{ends[1]:g} K; expected at most {MAX_TERM_J:g} J/mol (a plausible Gibbs energy)")


def check_magnitude(value: float, limit: float, key: str, unit: str, fail: Fail) -> None:
    """Refuse a number whose magnitude exceeds `limit`."""
    if abs(value) > limit:
        raise fail(key, f"{value:g} {unit} is implausible; expected a magnitude of at most {limit:g} {unit}")

