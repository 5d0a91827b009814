"""The explorer application: one main screen (a binary's diagram, or an isopleth), the system
picker that switches between them, its stylesheet, and remembering the point."""

from __future__ import annotations

import os
from pathlib import Path

from textual.app import App

from ladle.engine import SystemFileError, UnknownSystem, find_system
from ladle.tui.quote import one_line

from .exploration import Exploration
from .glyphs import Glyphs
from .launch import exploration_for
from .saved_state import save_state
from .screens.explore import ExploreScreen
from .screens.section_screen import SectionScreen
from .screens.systems import SystemPicker
from .section_exploration import SectionExploration
from .system_choices import opens_as_section, system_choices

PREWARM_DELAY_S = 1.0   # the systems are loaded for the picker this long after the start
PICKER = "systems"      # the name under which the system picker is kept


class ExplorerApp(App[None]):
    """ladle's full-screen explorer: binary phase diagrams, and the isopleths of larger systems."""

    CSS_PATH = "explorer.tcss"
    ENABLE_COMMAND_PALETTE = False
    AUTO_FOCUS = None   # keys go to the screen; the table, entry and dialogs take focus as shown
    TITLE = "ladle"

    def __init__(self, exploration: Exploration, glyphs: Glyphs, state_file: Path | None) -> None:
        # Textual reads (and removes) NO_COLOR; with it, ansi_color=True makes Textual drop
        # colours instead of turning them grey, and the plots tell curves apart by their marks.
        self.plain_colours = "NO_COLOR" in os.environ
        super().__init__(ansi_color=True if self.plain_colours else None)
        self.glyphs = glyphs
        self.state_file = state_file
        self._first_exploration = exploration
        self._save_problem_shown = False
        self._picker: SystemPicker | None = None
        if glyphs.ascii_only:
            self.add_class("-ascii")

    def get_default_screen(self) -> ExploreScreen | SectionScreen:
        return self._screen_for(self._first_exploration)

    def _screen_for(self, exploration: Exploration | SectionExploration) -> ExploreScreen | SectionScreen:
        if isinstance(exploration, SectionExploration):
            return SectionScreen(exploration, self.glyphs)
        return ExploreScreen(exploration, self.glyphs)

    @property
    def explore_screen(self) -> ExploreScreen | SectionScreen:
        """The main screen (under any dialog): the first screen, or the one shown over it for
        another kind of system."""
        return next(s for s in reversed(self.screen_stack) if isinstance(s, (ExploreScreen, SectionScreen)))

    def on_mount(self) -> None:
        self.set_timer(PREWARM_DELAY_S, self._prewarm_picker)

    def _prewarm_picker(self) -> None:
        """Load every system once in a thread, after the first screen, so that the picker opens
        at once (the engine keeps loaded systems)."""
        self.run_worker(system_choices, thread=True, group="prewarm", exit_on_error=False)

    def action_systems(self) -> None:
        """Show the system picker (built once, then kept installed and shown again)."""
        current = self.explore_screen.exploration.system.name
        if self._picker is None:
            self._picker = SystemPicker(system_choices(), current)
            self.install_screen(self._picker, name=PICKER)
        else:
            self._picker.reopen(current)
        self.push_screen(PICKER, self.open_system)

    def open_system(self, name: str | None) -> None:
        """Open the system `name` (None or the open one: nothing changes). A traced binary
        diagram is shown on the first screen where that draws binaries (keeping the units and,
        where it fits, the cursor); any other system on a screen shown over the first one (an
        isopleth for three or more elements or a binary with sublattice phases, such as Fe-C),
        which replaces the one shown there before."""
        if not name or name == self.explore_screen.exploration.system.name:
            return
        try:
            system = find_system(name)
        except (SystemFileError, UnknownSystem, OSError) as error:
            self.notify(one_line(str(error)), severity="error", markup=False)
            return
        first = self.screen_stack[0]
        if isinstance(first, ExploreScreen) and not opens_as_section(system):
            while len(self.screen_stack) > 1:
                self.pop_screen()
            first.show_system(system)
            return
        screen = self._screen_for(exploration_for(system))
        if len(self.screen_stack) > 1:
            self.switch_screen(screen)
        else:
            self.push_screen(screen)

    def remember(self) -> None:
        """Write the system, cursor and units to the state file (atomically)."""
        state = self.explore_screen.exploration.saved()
        if self.state_file is None or state is None:
            return
        try:
            save_state(self.state_file, state)
        except OSError as error:
            if not self._save_problem_shown:
                self._save_problem_shown = True
                self.notify(f"cannot remember the point in {self.state_file}: {error.strerror}",
                            severity="warning", markup=False)

    async def action_quit(self) -> None:
        self.remember()
        self.exit()
