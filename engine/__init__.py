"""ladle's equilibrium engine: a plain library (no screen, no printing, no argument parsing).

Units: temperatures in K, Gibbs energies and chemical potentials in J per mole of atoms,
compositions in mole fractions (mass fractions where a name says so), molar masses in g/mol.

Subpackages by job, each layer importing only those below it: `models` (phase models) at the
bottom, `files` (reading and writing) beside them, `minimize` (equilibrium at one temperature),
`diagrams` (whole diagrams, melt ranges), `solidify` and `checking`, and `fitting` on top.

The names below are loaded on first use (the lazy-loading convention of the scientific Python
ecosystem, SPEC 1), so that importing the package costs nothing until a name is used.
"""

from __future__ import annotations

import importlib
from typing import TYPE_CHECKING, Any

_PUBLIC = {
    "PhaseShare": ".minimize.equilibrium",
    "PointEquilibrium": ".minimize.equilibrium",
    "equilibrate": ".minimize.equilibrium",
    "section_at": ".minimize.equilibrium",
    "find_system": ".files.catalog",
    "list_systems": ".files.catalog",
    "load_system": ".files.loader",
    "SystemFileError": ".errors",
    "UnknownSystem": ".errors",
    "TemperatureOutOfRange": ".models.polynomials",
}

__all__ = sorted(_PUBLIC)


def __getattr__(name: str) -> Any:
    if name not in _PUBLIC:
        raise AttributeError(f"module {__name__!r} has no attribute {name!r}")
    value = getattr(importlib.import_module(_PUBLIC[name], __name__), name)
    globals()[name] = value
    return value


def __dir__() -> list[str]:
    return sorted(set(globals()) | set(_PUBLIC))


if TYPE_CHECKING:
    from .errors import SystemFileError, UnknownSystem
    from .files.catalog import find_system, list_systems
    from .files.loader import load_system
    from .minimize.equilibrium import PhaseShare, PointEquilibrium, equilibrate, section_at
    from .models.polynomials import TemperatureOutOfRange
