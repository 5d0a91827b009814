"""The explorer application: one main screen, its stylesheet, and remembering the point."""

from __future__ import annotations

import os
from pathlib import Path

from textual.app import App

from .exploration import Exploration
from .glyphs import Glyphs
from .saved_state import save_state
from .screens.explore import ExploreScreen
from .screens.section_screen import SectionScreen
from .section_exploration import SectionExploration


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
        if glyphs.ascii_only:
            self.add_class("-ascii")

    def get_default_screen(self) -> ExploreScreen | SectionScreen:
        if isinstance(self._first_exploration, SectionExploration):
            return SectionScreen(self._first_exploration, self.glyphs)
        return ExploreScreen(self._first_exploration, self.glyphs)

    @property
    def explore_screen(self) -> ExploreScreen:
        """The main screen (under any dialog)."""
        return self.screen_stack[0]  # type: ignore[return-value]

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
                            severity="warning")

    async def action_quit(self) -> None:
        self.remember()
        self.exit()
