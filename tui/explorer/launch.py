"""Starting the explorer from the command line: options, the system to open, the saved point."""

from __future__ import annotations

import os
import sys

import numpy as np

from ladle.engine import SystemFileError, UnknownSystem, find_system, list_systems

from .cursor import Cursor
from .exploration import Exploration
from .glyphs import glyphs_for
from .options import OptionsError, parse_options
from .saved_state import SavedState, read_state, state_path
from .scales import Scales
from .section_exploration import SectionExploration
from .system_choices import opens_as_section


#: The system a first run opens (nothing asked for, nothing remembered): the lead-tin solders'
#: binary, drawn at once and known to every reader of phase diagrams; the catalog's first where
#: it is missing.
FIRST_SYSTEM = "pb-sn"


def _open(name: str):
    """The system, or a one-line reason it cannot be opened."""
    try:
        return find_system(name), None
    except (SystemFileError, UnknownSystem, OSError) as error:
        return None, str(error)


def exploration_for(system, scales: Scales | None = None, cursor: Cursor | None = None
                    ) -> Exploration | SectionExploration:
    """The exploration that draws `system`: its isopleth (SectionExploration) for three or more
    elements or a binary with sublattice phases (opened at the cursor's temperature and, for a
    binary, its alloy, where given), else its traced diagram with the units `scales` and the
    `cursor` (where given)."""
    if not opens_as_section(system):
        return Exploration(system, scales, cursor)
    if cursor is None:
        return SectionExploration(system)
    alloy = np.array([1.0 - cursor.x_B, cursor.x_B]) if len(system.elements) == 2 else None
    if alloy is not None and not system.covered(alloy):
        alloy = None
    return SectionExploration(system, alloy, temperature_K=cursor.temperature_K)


def first_exploration(asked: str | None, saved: SavedState | None) -> Exploration | SectionExploration:
    """The exploration to open: the system asked for, else the last one used, else FIRST_SYSTEM
    (the first shipped where it cannot be opened); with the saved cursor and units where the
    system is the saved one; for a system drawn as an isopleth, its SectionExploration.
    Raises ValueError (one line) when the asked-for system cannot be opened."""
    if asked is not None:
        system, problem = _open(asked)
        if system is None:
            raise ValueError(problem)
    else:
        system = _open(saved.system)[0] if saved is not None else None
        if system is None:
            system = _open(FIRST_SYSTEM)[0]
        if system is None:
            entries = list_systems()
            if not entries:
                raise ValueError("no system files found (the installation is incomplete)")
            system, problem = _open(entries[0].name)
            if system is None:
                raise ValueError(problem)
    if saved is None:
        return exploration_for(system)
    scales = Scales(system.molar_mass, saved.temperature_unit, saved.composition_unit)
    cursor = Cursor(saved.temperature_K, saved.x_B) if saved.system == system.name else None
    return exploration_for(system, scales, cursor)


def served_to_a_browser() -> bool:
    """Whether this explorer runs under `ladle serve` (textual-serve talks to it over pipes and
    names its web driver in TEXTUAL_DRIVER)."""
    return "web_driver" in os.environ.get("TEXTUAL_DRIVER", "")


def run_explorer(argv: list[str]) -> int:
    """Parse the options, open the system and run the app; returns the exit status."""
    try:
        options = parse_options(argv)
        if not served_to_a_browser() and not all(stream.isatty() for stream in (sys.stdin, sys.stdout, sys.stderr)):
            raise OptionsError(
                "the full-screen explorer needs a terminal (standard input, output and error "
                "must all be one); for a file or a pipe use a line command, e.g. ladle diagram "
                f"{options.system or 'SYSTEM'} (see ladle --help)")
        path = state_path()
        saved, ignored = read_state(path)
        if ignored:
            print(f"ladle: note: ignored the remembered place in {path} ({ignored}); starting afresh",
                  file=sys.stderr)
        exploration = first_exploration(options.system, saved)
    except (OptionsError, ValueError) as error:
        print(f"ladle: {error}", file=sys.stderr)
        return 2
    from .app import ExplorerApp   # textual is imported only now

    app = ExplorerApp(exploration, glyphs_for(options.ascii_only), path)
    app.run()
    return 0
