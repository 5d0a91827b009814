"""The covered range of a system of three or more elements: its `covers_at_percent` table of
at% ranges per element, read into mole fractions."""

from __future__ import annotations

from collections.abc import Callable
from typing import Any

from .bounds import MIN_ELEMENT_RANGE_AT_PERCENT, finite_number
from .plain_text import without_controls

EXAMPLE = "{ Ag = [0, 5.5], Cu = [0, 3.7] }"


def read_element_ranges(value: Any, elements: tuple[str, ...],
                        fail: Callable[[str, str], Exception]) -> dict[str, tuple[float, float]]:
    """{element: (lowest, highest) mole fraction} from a table of [from, to] at% per element
    (elements not named may take any amount). `fail(key, what)` builds the error raised for bad
    input: a value that is not a table, an element the system lacks, a range not within 0-100 at%,
    or ranges that leave no composition."""
    key = "covers_at_percent"
    if not isinstance(value, dict) or not value:
        raise fail(key, f"expected a table of [from, to] at% per element for a system of three or more "
                        f"elements, such as {EXAMPLE}")
    ranges: dict[str, tuple[float, float]] = {}
    for el, pair in value.items():
        where = f"{key}.{without_controls(el)}"
        if el not in elements:
            raise fail(where, f"not an element of this system; expected one of {', '.join(elements)}")
        if (not isinstance(pair, list) or len(pair) != 2
                or not all(finite_number(v) for v in pair)):
            raise fail(where, f"expected [from, to] in at% of {el}")
        lo, hi = float(pair[0]), float(pair[1])
        if not 0 <= lo < hi <= 100:
            raise fail(where, "expected 0 <= from < to <= 100 (at%)")
        if hi - lo < MIN_ELEMENT_RANGE_AT_PERCENT:
            raise fail(where, f"{lo:g}-{hi:g} at% is too narrow a range; expected one of at least "
                              f"{MIN_ELEMENT_RANGE_AT_PERCENT:g} at%")
        ranges[el] = (lo / 100.0, hi / 100.0)
    lows = sum(lo for lo, _ in ranges.values())
    highs = sum(ranges.get(el, (0.0, 1.0))[1] for el in elements)
    if lows > 1.0 or highs < 1.0:
        raise fail(key, "the ranges leave no composition (the lowest contents add up to more than 100 at%, "
                        "or the highest to less)")
    return {el: ranges[el] for el in elements if el in ranges}
