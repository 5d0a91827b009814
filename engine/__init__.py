"""ladle's equilibrium engine: a plain library (no screen, no printing, no argument parsing).

Units: temperatures in K, Gibbs energies and chemical potentials in J per mole of atoms,
compositions in mole fractions (mass fractions where a name says so), molar masses in g/mol.
"""

from .catalog import find_system, list_systems
from .equilibrium import PhaseShare, PointEquilibrium, equilibrate, section_at
from .errors import SystemFileError, UnknownSystem
from .loader import load_system
from .polynomials import TemperatureOutOfRange

__all__ = [
    "PhaseShare", "PointEquilibrium", "SystemFileError", "TemperatureOutOfRange", "UnknownSystem",
    "equilibrate", "find_system", "list_systems", "load_system", "section_at",
]
