"""The isopleth view of a system of three or more elements: the mapped section with the
cursor's crosshair on top (an empty frame while the section is being mapped)."""

from __future__ import annotations

from collections.abc import Hashable

from textual_plotext.plot import Plot

from ladle.engine.units import kelvin_to

from ..crosshair import Crosshair
from ..glyphs import Glyphs
from ..section_drawing import SectionScene, draw_section, isopleth_scene
from ..section_exploration import SectionExploration
from .plot_pane import CachedPlot


class SectionView(CachedPlot):
    """Draws the exploration's isopleth; the picture is kept per section, unit and size."""

    def __init__(self, glyphs: Glyphs, *, id: str | None = None) -> None:
        super().__init__(glyphs, id=id)
        self.exploration: SectionExploration | None = None
        self.unit = "C"
        self._scene: SectionScene | None = None

    def picture_key(self) -> Hashable:
        e = self.exploration
        return None if e is None else (id(e.isopleth), self.unit)

    def crosshair(self) -> Crosshair | None:
        e = self.exploration
        if e is None or e.isopleth is None or self._scene is None:
            return None
        return Crosshair(self._scene.frame, 100.0 * e.isopleth.content(e.cursor.u),
                         kelvin_to(e.cursor.temperature_K, self.unit))

    def draw(self, plt: Plot, width: int, height: int) -> None:
        e = self.exploration
        if e is None or e.isopleth is None:
            self._scene = None
            plt.title("mapping the isopleth ...")
            return
        self._scene = isopleth_scene(e.isopleth, self.unit, self.glyphs, width, height)
        draw_section(plt, self._scene, self.glyphs)

    def key(self) -> list[str]:
        """What the numbered field labels of the picture stand for ('1: alpha + gamma')."""
        return [] if self._scene is None else self._scene.key
