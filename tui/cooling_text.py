"""Words shared by `ladle cool` and the explorer's cooling view: the names of the two cooling
paths, and the structure at the end of freezing by both of them."""

from __future__ import annotations

#: The engine's path models ("equilibrium", "scheil") as the text names them, in display order.
PATH_NAMES: dict[str, str] = {"equilibrium": "equilibrium", "scheil": "Scheil"}


def structure_rows(result) -> list[tuple[str, list[float | None]]]:
    """The constituents at the end of freezing of `result` (the engine's Solidification), in
    order of first appearance along the paths of PATH_NAMES, each with its mass fraction by
    each path (None where that path does not form it)."""
    paths = [result.path(model) for model in PATH_NAMES]
    names: list[str] = []
    for path in paths:
        names += [c.name for c in path.constituents if c.name not in names]
    return [(name, [next((c.mass_fraction for c in path.constituents if c.name == name), None) for path in paths])
            for name in names]
