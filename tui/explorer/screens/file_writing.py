"""Files a screen writes on request, shared by the explorer's screens: the screen saved as text
and SVG under one new number (`p`), and any texts written the same way (`w` on the binary
screen). They go to the working folder through ladle.engine.files.atomic_files.write_new_files,
which never replaces an existing file; a notice says where (under `ladle serve`, on the disk of
the machine that serves the explorer)."""

from __future__ import annotations

import json
from pathlib import Path

from ladle.engine.files.atomic_files import write_new_files
from ladle.tui.errors import os_error_text

from ..exports import safe_stem
from ..screen_text import screen_text

NOTICE_S = 3.0   # a "wrote ..." notice leaves the status pane after this long
NOTICE_WAITS = 20   # frames to wait at most for notices to leave before a screenshot
FRAME_S = 0.02


class WritesFiles:
    """A Screen mixin: `action_write_screen` saves the screen as ladle-screen-<screen_stem()>
    .txt and .svg; `write_point` a point's result as JSON; `write_files` any texts under a new
    number."""

    def screen_stem(self) -> str:
        """What the saved screen's file names say after 'ladle-screen-' (system and view)."""
        raise NotImplementedError

    def action_write_screen(self) -> None:
        self.app.clear_notifications()   # a notice from an earlier write is not part of the screen to save
        self._save_screen()

    def _save_screen(self, waited: int = 0, clear: int = 0) -> None:
        """Save once no notice has been on the screen for two looks a frame apart (the screen
        is then drawn without it)."""
        clear = 0 if self.query("Toast") else clear + 1
        if clear < 2 and waited < NOTICE_WAITS:
            self.refresh(layout=True)
            self.set_timer(FRAME_S, lambda: self._save_screen(waited + 1, clear))
            return
        self.write_files(safe_stem(f"ladle-screen-{self.screen_stem()}"),
                         {".txt": screen_text(self.app), ".svg": self.app.export_screenshot(title="ladle")})

    def write_point(self, result, system, what: str) -> None:
        """Write a point equilibrium as `ladle point --json` gives it, to
        ladle-point-<what>.json (and copy it)."""
        text = json.dumps(result.to_json(system), indent=1) + "\n"
        self.write_files(safe_stem(f"ladle-point-{what}"), {".json": text}, also_copy=True)

    def write_files(self, stem: str, texts: dict[str, str], also_copy: bool = False) -> None:
        """Write the texts (suffix -> text) under one new number in the working folder and say
        where (in a browser: on the disk of the machine that serves the explorer)."""
        try:
            paths = write_new_files(Path.cwd(), stem, texts)
        except OSError as error:
            self.app.notify(f"nothing written: {os_error_text(error)}", severity="error", markup=False)
            return
        if also_copy:
            self.app.copy_to_clipboard(next(iter(texts.values())))
        where = " on the server's disk" if self.app.is_web else ""
        self.app.notify(f"wrote {' and '.join(str(p) for p in paths)}{where}"
                        + (" (and copied it)" if also_copy else ""), timeout=NOTICE_S, markup=False)   # paths as they are
