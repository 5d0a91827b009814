"""The free-energy view: Gibbs energy curves at the cursor's temperature."""

from __future__ import annotations

from collections.abc import Hashable

from textual_plotext.plot import Plot

from ..energy_drawing import EnergyScene, draw_energy, energy_scene
from ..exploration import Exploration
from ..crosshair import Crosshair
from ..glyphs import Glyphs
from .plot_pane import CachedPlot


class EnergyView(CachedPlot):
    """Draws the curves at the cursor's temperature; the scene is kept per temperature,
    window, units and size, and the cursor's line is written over the picture."""

    def __init__(self, glyphs: Glyphs, *, id: str | None = None) -> None:
        super().__init__(glyphs, id=id)
        self.exploration: Exploration | None = None
        self._scene_key: Hashable | None = None
        self._scene: EnergyScene | None = None

    def picture_key(self) -> Hashable:
        e = self.exploration
        if e is None:
            return None
        return (id(e), e.window, e.scales.composition_unit, e.cursor.temperature_K,
                self.app.plain_colours)

    def crosshair(self) -> Crosshair | None:
        e = self.exploration
        if e is None or self._scene is None:
            return None
        return Crosshair(self._scene.frame, x=float(e.scales.shown_composition(e.cursor.x_B)))

    def draw(self, plt: Plot, width: int, height: int) -> None:
        e = self.exploration
        if e is None:
            return
        key = (id(e), e.window, e.scales.composition_unit, e.cursor.temperature_K, width, height)
        if key != self._scene_key or self._scene is None:
            self._scene = energy_scene(e, width, height)
            self._scene_key = key
        draw_energy(plt, self._scene, self.glyphs, colour=not self.app.plain_colours)
