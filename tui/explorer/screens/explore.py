"""The explorer's main screen: a plot (diagram, energy, reactions or cooling) beside the status
pane."""

from __future__ import annotations

from textual.app import ComposeResult
from textual.binding import Binding
from textual.containers import Horizontal, Vertical
from textual.events import Resize
from textual.screen import Screen
from textual.widgets import ContentSwitcher, Input, Static

from ladle.tui.commands.common import coverage_note
from ladle.tui.quote import percent

from ..cautions import caution_line, caution_rows
from ..cooling import CoolingView
from ..cooling_status import cooling_lines
from ..entry import TypedPoint, check_inside
from ..exploration import Exploration, Reading
from ..glyphs import Glyphs
from ..keymap import MAIN_KEYS
from ..reaction_rows import reaction_rows
from ..readout import format_step, format_temperature_value
from ..status_lines import (Line, alloy_line, energy_lines, melt_lines, phase_lines,
                            point_lines, status_lines, without_heading)
from ..widgets.diagram_view import DiagramView
from ..widgets.energy_view import EnergyView
from ..widgets.key_bar import KeyBar
from ..widgets.plot_pane import CachedPlot
from ..widgets.point_entry import PointEntry
from ..widgets.reactions_view import ReactionsView
from ..widgets.status_pane import StatusPane
from ..widgets.title_bar import TitleBar
from .file_writing import WritesFiles
from .help import HelpScreen

MIN_WIDTH, MIN_HEIGHT = 80, 24
SAVE_DELAY_S = 1.0   # the remembered point is written this long after the last change
STEP_ROOM = 28       # characters the step may use in the status pane's lower border


class ExploreScreen(WritesFiles, Screen[None]):
    """Keys move the cursor; the status pane and the plot follow."""

    BINDINGS = [Binding(use.keys, use.action, use.description, show=False)
                for use in MAIN_KEYS] + [Binding("escape", "back", show=False)]

    def __init__(self, exploration: Exploration, glyphs: Glyphs) -> None:
        super().__init__()
        self.exploration = exploration
        self.glyphs = glyphs
        self.view = "diagram"
        self._save_timer = None
        self._warming = None   # the worker computing ahead for the next step

    # -- layout ----------------------------------------------------------------------------

    def compose(self) -> ComposeResult:
        yield TitleBar(id="title")
        with Horizontal(id="body"):
            with ContentSwitcher(id="views", initial="diagram"):
                yield DiagramView(self.glyphs, id="diagram")
                yield EnergyView(self.glyphs, id="energy")
                yield ReactionsView(id="reactions")
                yield CoolingView(self.glyphs, id="cooling")
            with Vertical(id="side"):
                yield StatusPane(id="status")
                yield Static("", id="caution", markup=False)   # under the pane, never pushed off it; file text as written
        yield PointEntry(id="entry")
        yield KeyBar(self.glyphs, id="keys")
        yield Static("", id="too-small")

    def on_mount(self) -> None:
        self.query_one(PointEntry).display = False
        self._show_exploration()

    def on_resize(self, event: Resize) -> None:
        width, height = event.size
        small = width < MIN_WIDTH or height < MIN_HEIGHT
        self.set_class(small, "-too-small")
        self.query_one("#too-small", Static).update(
            f"ladle needs a terminal of at least {MIN_WIDTH} x {MIN_HEIGHT} characters; "
            f"this one is {width} x {height}. Enlarge it, or press q to quit.")
        self._show_title()

    def _show_exploration(self) -> None:
        """Point every view at the current exploration and draw everything."""
        for view in (self.query_one(DiagramView), self.query_one(EnergyView)):
            view.exploration = self.exploration
        self._fill_reactions()
        self.update_all()

    # -- drawing ---------------------------------------------------------------------------

    def update_all(self) -> None:
        """Redraw the status pane, the title and the visible plot for the current state."""
        self._show_title()
        self._show_status()
        self._show_step()
        self._show_caution()
        if self.view in ("diagram", "energy"):
            self.query_one(f"#{self.view}", CachedPlot).redraw()
        elif self.view == "cooling":
            self.query_one(CoolingView).follow(self.exploration)
        self._schedule_save()
        self._warm_neighbours()

    def _warm_neighbours(self) -> None:
        """In a thread, compute what the next step will need (one at a time: a move made while
        one runs is warmed by the next)."""
        if self._warming is None or self._warming.is_finished:
            exploration, energy = self.exploration, self.query_one(EnergyView)
            in_energy = self.view == "energy"

            def warm() -> None:
                exploration.warm_neighbours()
                if in_energy:
                    energy.build_ahead(exploration)

            self._warming = self.run_worker(warm, thread=True, group="warm", exit_on_error=False)

    def _show_title(self) -> None:
        system = self.exploration.system
        self.query_one(TitleBar).show(system.name, system.title, coverage_note(system), self.view,
                                      self.size.width)

    def _show_status(self) -> None:
        """The status pane's lines, and the same facts in fewer lines for a pane too short for
        them: without the field's name, then also without the ALLOY heading and with the melt
        range on one line."""
        e = self.exploration
        try:
            reading = e.reading()
        except (ValueError, ArithmeticError) as error:
            self.query_one(StatusPane).show_lines(
                [("heading", "POINT"), ("warning", f" no answer here: {error}")])
            return
        lines = self._status_lines(reading)
        compact = without_heading(without_heading(self._status_lines(reading, compact=True),
                                                  "FIELD", 1), "ALLOY")
        self.query_one(StatusPane).show_lines(lines, without_heading(lines, "FIELD", 1), compact)

    def _status_lines(self, reading: Reading, compact: bool = False) -> list[Line]:
        e = self.exploration
        if self.view == "cooling":
            cooling = self.query_one(CoolingView)
            return ([("heading", "ALLOY"), alloy_line(e.cursor.x_B, e.system.elements[1], e.scales)]
                    + melt_lines(reading, e.scales, self.glyphs, compact)
                    + cooling_lines(cooling.answer(), cooling.coring(), e.system, e.scales,
                                    self.glyphs))
        if self.view == "energy":
            return (point_lines(reading, e.system.elements[1], e.scales, self.glyphs)
                    + phase_lines(reading, e.system, e.scales) + energy_lines(reading))
        return status_lines(reading, e.system, e.scales, self.glyphs, compact)

    def _show_step(self) -> None:
        """The step of the arrow keys, in the status pane's lower border (it never takes one of
        the pane's lines)."""
        e = self.exploration
        steps = e.steps()
        unit = self.glyphs.temperature_unit(e.scales.temperature_unit)
        step = (f"step {format_step(steps.temperature)} {unit}, "
                f"{format_step(steps.composition)} {e.scales.composition_unit}%")
        side = self.query_one("#side")
        width = side.outer_size.width
        room = width - 6 if width else STEP_ROOM   # corners, rules and spaces
        text = next(step + hint for hint in (" (shift /10)", ", shift /10", "")
                    if len(step) + len(hint) <= room)
        if side.border_subtitle != text:
            side.border_subtitle = text

    def _show_caution(self) -> None:
        """The system's caution, whole, under the status pane (its full text: ? help)."""
        safety = self.exploration.system.safety
        caution = self.query_one("#caution", Static)
        text = caution_rows(caution_line(safety))
        if str(caution.render()) != text or caution.display != bool(safety):
            caution.display = bool(safety)
            caution.update(text)

    def _fill_reactions(self) -> None:
        e = self.exploration
        self.query_one(ReactionsView).show_rows(
            reaction_rows(e.diagram, e.system.elements, e.scales, self.glyphs),
            f"{e.system.elements[1]} {e.scales.composition_unit}%")

    # -- key actions -----------------------------------------------------------------------

    def action_move(self, d_temperature: int, d_composition: int, fine: bool = False) -> None:
        self.exploration.move(d_temperature, d_composition, fine)
        self.update_all()

    def action_zoom(self, zoom_in: bool) -> None:
        self.exploration.zoom(zoom_in)
        self.update_all()

    def action_whole(self) -> None:
        self.exploration.reset_zoom()
        self.update_all()

    def action_composition_unit(self) -> None:
        self.exploration.toggle_composition_unit()
        self._fill_reactions()
        self.update_all()

    def action_temperature_unit(self) -> None:
        self.exploration.cycle_temperature_unit()
        self._fill_reactions()
        self.update_all()

    def action_view(self, view: str) -> None:
        self.view = view
        self.query_one(ContentSwitcher).current = view
        if view == "reactions":
            self.query_one(ReactionsView).focus()
        else:
            self.set_focus(None)
        self.update_all()

    def action_go_to(self) -> None:
        self.query_one(PointEntry).open(self.exploration.system.elements[1])

    def action_back(self) -> None:
        self.query_one(PointEntry).close()

    def on_input_submitted(self, event: Input.Submitted) -> None:
        event.stop()
        if self.query_one(PointEntry).submit(event.value, self.exploration.system, self._go_to):
            self.update_all()

    def _go_to(self, point: TypedPoint) -> None:
        """Move the cursor to a typed point inside the system's range (EntryError: outside)."""
        e = self.exploration
        check_inside(point, e.limits, e.scales, self.glyphs)
        e.jump(point)

    def on_cooling_view_ready(self, event: CoolingView.Ready) -> None:
        if self.view == "cooling":
            self._show_status()

    def on_reactions_view_chosen(self, event: ReactionsView.Chosen) -> None:
        self.exploration.jump(TypedPoint(event.row.temperature_K, event.row.x_B))
        self.action_view("diagram")

    def show_system(self, system) -> None:
        """Explore another binary diagram here, keeping the units and (where it fits) the
        cursor."""
        self.exploration = self.exploration.with_system(system)
        self._show_exploration()

    def action_help(self) -> None:
        system = self.exploration.system
        self.app.push_screen(HelpScreen(self.glyphs, system.name, system.safety,
                                        system.elements[1]))

    def action_write_point(self) -> None:
        e = self.exploration
        try:
            result = e.reading().equilibrium
        except (ValueError, ArithmeticError) as error:
            self.app.notify(f"nothing written: {error}", severity="error", markup=False)
            return
        T = format_temperature_value(e.scales.shown_temperature(e.cursor.temperature_K))
        comp = percent(e.scales.shown_fraction(e.cursor.x_B))
        self.write_point(result, e.system, f"{e.system.name}-{T}{e.scales.temperature_unit}-"
                                           f"{comp}{e.scales.composition_unit}")

    def screen_stem(self) -> str:
        return f"{self.exploration.system.name}-{self.view}"

    # -- remembering the point -------------------------------------------------------------

    def _schedule_save(self) -> None:
        if self._save_timer is not None:
            self._save_timer.stop()
        self._save_timer = self.set_timer(SAVE_DELAY_S, self.app.remember)
