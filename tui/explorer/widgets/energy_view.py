"""The free-energy view: Gibbs energy curves at the cursor's temperature."""

from __future__ import annotations

from collections import OrderedDict
from collections.abc import Hashable
from copy import copy
from dataclasses import replace

from rich.text import Text
from textual_plotext.plot import Plot

from ..energy_drawing import EnergyScene, draw_energy, energy_scene
from ..exploration import Exploration
from ..crosshair import Crosshair
from ..glyphs import Glyphs
from .plot_pane import CachedPlot


AHEAD_KEPT = 8   # pictures built ahead, kept (the latest)


class EnergyView(CachedPlot):
    """Draws the curves at the cursor's temperature; the scene is kept per temperature,
    window, units and size, and the cursor's line is written over the picture. The pictures one
    step above and below are built ahead in a worker thread (`build_ahead`)."""

    def __init__(self, glyphs: Glyphs, *, id: str | None = None) -> None:
        super().__init__(glyphs, id=id)
        self.exploration: Exploration | None = None
        self._scene_key: Hashable | None = None
        self._scene: EnergyScene | None = None
        self._ahead: OrderedDict[Hashable, tuple[Text, EnergyScene]] = OrderedDict()

    def _picture(self) -> Text:
        """The picture, taken from those built ahead where the cursor's temperature has one."""
        width, height = self.size.width, self.size.height
        key = (width, height, self.app.theme, self.picture_key())
        ready = self._ahead.get(key)
        e = self.exploration
        if ready is not None and e is not None and key != self._built_key:
            self._built, self._scene = ready
            self._scene_key = self._key_of_scene(e, e.cursor.temperature_K, width, height)
            self._built_key = key
        return super()._picture()

    def build_ahead(self, exploration: Exploration) -> None:
        """In a worker thread: build the pictures at the temperatures one step (coarse or fine)
        above and below the cursor (sections cached by the engine), with a plot of its own, so
        that the next move in temperature finds its picture ready."""
        width, height = self.size.width, self.size.height
        theme, colour = self.app.theme, not self.app.plain_colours
        if width <= 8 or height <= 4:
            return
        for near in exploration.neighbour_temperatures():
            key = (width, height, theme, self._key_of_picture(exploration, near))
            if key in self._ahead:
                self._ahead.move_to_end(key)
                continue
            there = copy(exploration)
            there.cursor = replace(exploration.cursor, temperature_K=near)
            scene = energy_scene(there, width, height)
            text = self.build_text(Plot(), width, height, theme,
                                   lambda plt: draw_energy(plt, scene, self.glyphs, colour=colour))
            self._ahead[key] = (text, scene)
            while len(self._ahead) > AHEAD_KEPT:
                self._ahead.popitem(last=False)

    def _key_of_picture(self, e: Exploration, T_K: float) -> Hashable:
        return (id(e), e.window, e.scales.composition_unit, T_K, self.app.plain_colours)

    @staticmethod
    def _key_of_scene(e: Exploration, T_K: float, width: int, height: int) -> Hashable:
        return (id(e), e.window, e.scales.composition_unit, T_K, width, height)

    def picture_key(self) -> Hashable:
        e = self.exploration
        return None if e is None else self._key_of_picture(e, e.cursor.temperature_K)

    def crosshair(self) -> Crosshair | None:
        e = self.exploration
        if e is None or self._scene is None:
            return None
        return Crosshair(self._scene.frame, x=float(e.scales.shown_composition(e.cursor.x_B)))

    def draw(self, plt: Plot, width: int, height: int) -> None:
        e = self.exploration
        if e is None:
            return
        key = self._key_of_scene(e, e.cursor.temperature_K, width, height)
        if key != self._scene_key or self._scene is None:
            self._scene = energy_scene(e, width, height)
            self._scene_key = key
        draw_energy(plt, self._scene, self.glyphs, colour=not self.app.plain_colours)
