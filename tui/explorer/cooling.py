"""The cooling view: how the alloy at the cursor's composition freezes, at equilibrium and by
Scheil-Gulliver, both paths on one plot, with the cursor's temperature as a line across.

Both paths of a new composition take a few tenths of a second, so they are computed in a worker
thread and kept per system and composition: moving the cursor in temperature costs nothing, and
the screen is told (`Ready`) when a new answer has arrived.
"""

from __future__ import annotations

from collections import OrderedDict
from collections.abc import Hashable

from textual.message import Message
from textual.worker import Worker, WorkerState
from textual_plotext.plot import Plot

from ladle.engine.solidify.coring import Coring, primary_coring
from ladle.engine.solidify.paths import solidify

from .cooling_drawing import CoolingScene, cooling_scene, draw_cooling
from .crosshair import Crosshair
from .exploration import Exploration
from .glyphs import Glyphs
from .widgets.plot_pane import CachedPlot

KEPT = 32          # answers kept, per system and composition


class CoolingView(CachedPlot):
    """Both cooling paths of the cursor's alloy."""

    class Ready(Message):
        """The paths of the cursor's alloy have been computed (or found impossible)."""

    def __init__(self, glyphs: Glyphs, *, id: str | None = None) -> None:
        super().__init__(glyphs, id=id)
        self.exploration: Exploration | None = None
        self._answers: OrderedDict[tuple[int, float], object] = OrderedDict()
        self._corings: dict[tuple[int, float], Coring | None] = {}
        self._pending: dict[Worker, tuple[int, float]] = {}
        self._scene: CoolingScene | None = None

    def _key(self) -> tuple[int, float] | None:
        e = self.exploration
        return None if e is None else (id(e.system), e.cursor.x_B)

    def answer(self):
        """The Solidification of the cursor's alloy, a one-line reason why there is none, or
        None while it is being computed."""
        return self._answers.get(self._key())

    def coring(self) -> Coring | None:
        """The coring of the Scheil path's primary solid of the cursor's alloy (None: none, or
        not computed yet)."""
        return self._corings.get(self._key())

    def follow(self, exploration: Exploration) -> None:
        """Show the alloy at `exploration`'s cursor; start computing it if it is new."""
        self.exploration = exploration
        key = self._key()
        if key not in self._answers and key not in self._pending.values():
            system, x_B = exploration.system, exploration.cursor.x_B
            worker = self.run_worker(lambda: _freeze(system, x_B), thread=True, exclusive=True,
                                     group="cooling", exit_on_error=False)
            self._pending[worker] = key
        self.redraw()

    def on_worker_state_changed(self, event: Worker.StateChanged) -> None:
        worker = event.worker
        if worker not in self._pending or not worker.is_finished:
            return
        key = self._pending.pop(worker)
        if event.state == WorkerState.CANCELLED:
            return
        if event.state == WorkerState.SUCCESS:
            self._answers[key], self._corings[key] = worker.result
        else:
            self._answers[key] = _reason(worker.error)
        while len(self._answers) > KEPT:
            self._corings.pop(self._answers.popitem(last=False)[0], None)
        self.refresh()
        self.post_message(self.Ready())

    def picture_key(self) -> Hashable:
        e = self.exploration
        if e is None:
            return None
        answer = self.answer()
        return (self._key(), id(answer), e.scales.temperature_unit)

    def crosshair(self) -> Crosshair | None:
        e = self.exploration
        if e is None or self._scene is None or not hasattr(self.answer(), "scheil"):
            return None
        return Crosshair(self._scene.frame, y=float(e.scales.shown_temperature(e.cursor.temperature_K)))

    def draw(self, plt: Plot, width: int, height: int) -> None:
        e = self.exploration
        answer = self.answer()
        if e is None or answer is None or isinstance(answer, str):
            message = "computing how this alloy freezes ..." if answer is None else \
                "no cooling path (see the status pane)"
            plt.xlim(0.0, 1.0)
            plt.ylim(0.0, 1.0)
            plt.xticks([])
            plt.yticks([])
            plt.text(message, 0.5, 0.5, alignment="center")
            return
        self._scene = cooling_scene(answer, e.scales, self.glyphs, width, height)
        draw_cooling(plt, self._scene, self.glyphs)


def _freeze(system, x_B: float):
    """Both paths of the alloy x_B, and the coring of the Scheil path's primary solid."""
    solidification = solidify(system, x_B)
    return solidification, primary_coring(system, solidification.scheil)


def _reason(error: BaseException | None) -> str:
    """One line saying why the paths could not be computed."""
    if isinstance(error, ValueError) and error.args:
        return str(error.args[0])
    return f"the computation failed ({type(error).__name__})"
