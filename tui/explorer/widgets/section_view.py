"""The isopleth view of a system of three or more elements: the mapped section with the
cursor's crosshair on top (an empty frame while the section is being mapped)."""

from __future__ import annotations

from collections.abc import Hashable

import numpy as np
from textual.message import Message
from textual_plotext.plot import Plot

from ladle.engine.units import kelvin_to

from ..cooling_drawing import cooling_scene, draw_cooling
from ..crosshair import Crosshair
from ..glyphs import Glyphs
from ..section_drawing import SectionScene, draw_section, isopleth_scene, triangle_point, triangle_scene
from ..scales import Scales
from ..section_exploration import SectionExploration
from .plot_pane import CachedPlot


#: plotext's colour for the cursor's alloy and tie-line on the triangle (the crosshair's red).
CURSOR_COLOUR = "red"


class SectionView(CachedPlot):
    """Draws the exploration's isopleth; the picture is kept per section, unit and size."""

    class Drawn(Message):
        """A new picture was drawn (its key of numbered fields may have changed)."""

    def __init__(self, glyphs: Glyphs, *, id: str | None = None) -> None:
        super().__init__(glyphs, id=id)
        self.exploration: SectionExploration | None = None
        self.unit = "C"
        self.equilibrium = None        # the point equilibrium at the cursor (its tie-line on the triangle)
        self._scene: SectionScene | None = None

    def picture_key(self) -> Hashable:
        e = self.exploration
        if e is None:
            return None
        if e.view == "triangle":            # the cursor's alloy and tie-line are part of the picture
            return (e.view, id(e.triangle), tuple(e.x_at_cursor()), id(self.equilibrium))
        if e.view == "cooling":
            return (e.view, id(e.freezing.get(e.alloy_key())), self.unit)
        return (e.view, id(e.isopleth), self.unit, e.window)

    def crosshair(self) -> Crosshair | None:
        e = self.exploration
        if e is None or e.view != "isopleth" or e.isopleth is None or self._scene is None:
            return None
        return Crosshair(self._scene.frame, 100.0 * e.isopleth.content(e.cursor.u),
                         kelvin_to(e.cursor.temperature_K, self.unit))

    def draw(self, plt: Plot, width: int, height: int) -> None:
        e = self.exploration
        if e is not None and e.view == "triangle":
            self._draw_triangle(plt, width, height)
            return
        if e is not None and e.view == "cooling":
            self._draw_cooling(plt, width, height)
            return
        if e is None or e.isopleth is None:
            self._scene = None
            plt.title("mapping the isopleth ...")
            return
        w = e.window
        zoomed = None if w == e.whole else (w.u_low, w.u_high, w.T_low, w.T_high)
        self._scene = isopleth_scene(e.isopleth, self.unit, self.glyphs, width, height, e.line_labels, zoomed)
        draw_section(plt, self._scene, self.glyphs)
        self.post_message(self.Drawn())

    def key(self) -> list[str]:
        """What the numbered field labels of the picture stand for ('1: alpha + gamma')."""
        return [] if self._scene is None else self._scene.key

    def _draw_triangle(self, plt: Plot, width: int, height: int) -> None:
        """The isothermal section with the cursor's alloy marked and the tie-line or
        tie-triangle through it drawn."""
        e = self.exploration
        if e.triangle is None:
            self._scene = None
            plt.title("mapping the isothermal section ...")
            return
        self._scene = triangle_scene(e.triangle, self.glyphs, width, height)
        draw_section(plt, self._scene, self.glyphs)
        self.post_message(self.Drawn())
        eq = self.equilibrium
        if eq is not None and len(eq.phases) > 1:
            corners = np.array([p.x for p in eq.phases] + [eq.phases[0].x])
            plt.plot(*triangle_point(corners), marker=self.glyphs.invariant_marker, color=CURSOR_COLOUR)
        x, y = triangle_point(e.x_at_cursor())
        plt.scatter([float(x)], [float(y)], marker=self.glyphs.cursor_marker, color=CURSOR_COLOUR)

    def _draw_cooling(self, plt: Plot, width: int, height: int) -> None:
        """Both freezing paths of the cursor's alloy (fraction solid against temperature)."""
        e = self.exploration
        result = e.freezing.get(e.alloy_key())
        self._scene = None
        if result is None or isinstance(result, str):
            plt.title("computing the freezing paths ..." if result is None else result)
            return
        draw_cooling(plt, cooling_scene(result, Scales(e.system.molar_mass, self.unit), self.glyphs, width, height),
                     self.glyphs)
