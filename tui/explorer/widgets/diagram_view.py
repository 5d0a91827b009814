"""The diagram view: the traced phase diagram with the cursor's crosshair on top."""

from __future__ import annotations

from collections.abc import Hashable

from textual_plotext.plot import Plot

from ..diagram_drawing import DiagramScene, diagram_scene, draw_diagram
from ..exploration import Exploration
from ..crosshair import Crosshair
from ..glyphs import Glyphs
from .plot_pane import CachedPlot


class DiagramView(CachedPlot):
    """Draws the exploration's diagram; the picture (all but the cursor) is kept per window,
    units and size, and the cursor's crosshair is written over it."""

    def __init__(self, glyphs: Glyphs, *, id: str | None = None) -> None:
        super().__init__(glyphs, id=id)
        self.exploration: Exploration | None = None
        self._scene_key: Hashable | None = None
        self._scene: DiagramScene | None = None

    def picture_key(self) -> Hashable:
        e = self.exploration
        if e is None:
            return None
        return (id(e), e.window, e.scales.temperature_unit, e.scales.composition_unit)

    def crosshair(self) -> Crosshair | None:
        e = self.exploration
        if e is None or self._scene is None:
            return None
        return Crosshair(self._scene.frame, float(e.scales.shown_composition(e.cursor.x_B)),
                         float(e.scales.shown_temperature(e.cursor.temperature_K)))

    def draw(self, plt: Plot, width: int, height: int) -> None:
        e = self.exploration
        if e is None:
            return
        key = (id(e), e.window, e.scales.temperature_unit, e.scales.composition_unit,
               width, height)
        if key != self._scene_key or self._scene is None:
            self._scene = diagram_scene(e, self.glyphs, width, height)
            self._scene_key = key
        draw_diagram(plt, self._scene, self.glyphs)
