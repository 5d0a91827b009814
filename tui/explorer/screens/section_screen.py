"""The explorer's screen for a system of three or more elements: the isopleth through the
cursor's alloy beside the status pane (every phase with its amount and the content of every
element). The arrows move the cursor along the section and in temperature, `v` lets the next
element vary, `g` goes to a typed alloy and temperature ("Ag=3wt% Cu=0.5wt% 250C").

The isopleth and the point equilibrium are computed in worker threads: keys are answered while
they run, and a newer request replaces an older one.
"""

from __future__ import annotations

from textual.app import ComposeResult
from textual.binding import Binding
from textual.containers import Horizontal, Vertical
from textual.screen import Screen
from textual.widgets import Input, Static
from textual.worker import Worker, WorkerState

from ladle.engine.units import TEMPERATURE_UNITS
from ladle.tui.quote import percent

from ..cautions import caution_line
from ..entry import EntryError, parse_point
from ..glyphs import Glyphs
from ..section_exploration import SectionExploration
from ..widgets.point_entry import PointEntry
from ..widgets.section_view import SectionView
from ..widgets.status_pane import StatusPane
from .help import HelpScreen

KEYS = "arrows move  v vary  i triangle  c cooling  t C/K/F  g go to  ? help  q quit"
#: The help screen's rows for this screen: (keys, what they do).
HELP_ROWS = [("arrows", "move the cursor along the section (left, right) and in temperature (up, down)"),
             ("v", "let the next element vary (the balance, the first element, takes up the change)"),
             ("i", "a ternary: switch between the isopleth and the isothermal section at the cursor's temperature "
                   "(the cursor's alloy marked, its tie-line or tie-triangle drawn)"),
             ("c", "switch between the isopleth and both freezing paths of the cursor's alloy (equilibrium, "
                   "Scheil), with its liquidus, the ends of freezing and the structure in the status pane"),
             ("g", "go to a typed alloy and temperature: Ag=3wt% Cu=0.5wt% 250C (every element but the balance)"),
             ("t", "temperatures in C, K or F, everywhere"),
             ("Esc", "close the entry line"),
             ("?", "this help"),
             ("q", "quit")]


class SectionScreen(Screen[None]):
    """Keys move the cursor on the isopleth; the status pane follows."""

    BINDINGS = [Binding("left", "move(-1, 0)", show=False), Binding("right", "move(1, 0)", show=False),
                Binding("up", "move(0, 1)", show=False), Binding("down", "move(0, -1)", show=False),
                Binding("v", "vary", show=False), Binding("i", "view('triangle')", show=False),
                Binding("c", "view('cooling')", show=False), Binding("t", "temperature_unit", show=False),
                Binding("g", "go_to", show=False),
                Binding("escape", "back", show=False), Binding("question_mark,f1", "help", show=False),
                Binding("q", "app.quit", show=False)]

    def __init__(self, exploration: SectionExploration, glyphs: Glyphs) -> None:
        super().__init__()
        self.exploration = exploration
        self.glyphs = glyphs
        self._equilibrium = None
        self._point_worker: Worker | None = None
        self._mapped_key = None

    def compose(self) -> ComposeResult:
        yield Static("", id="title")
        with Horizontal(id="body"):
            yield SectionView(self.glyphs, id="diagram")
            with Vertical(id="side"):
                yield StatusPane(id="status")
                yield Static("", id="caution")   # under the pane, never pushed off it
        yield PointEntry(id="entry")
        yield Static(KEYS, id="keys")

    def on_mount(self) -> None:
        self.query_one(PointEntry).display = False
        caution = self.query_one("#caution", Static)
        caution.update(caution_line(self.exploration.system.safety))
        caution.display = bool(self.exploration.system.safety)
        self.query_one(SectionView).exploration = self.exploration
        self._changed(remap=True)

    # -- drawing and workers ------------------------------------------------------------------
    def _title(self) -> str:
        e = self.exploration
        held = ", ".join(f"{el} {percent(e.alloy[i])}" for i, el in enumerate(e.system.elements)
                         if i not in (0, e.varying))
        return f" {e.system.name}  isopleth: {e.element} varies; {held} at%; {e.system.elements[0]} balance"

    def _changed(self, remap: bool = False) -> None:
        """The cursor or the section moved: redraw, and ask the workers for what changed."""
        e = self.exploration
        self.query_one("#title", Static).update(self._title())
        if remap and e.section_key() != self._mapped_key:
            self._mapped_key = e.section_key()
            key = e.section_key()
            self.run_worker(lambda: (key, e.map()), thread=True, group="isopleth", exclusive=True, exit_on_error=False)
        if e.view == "triangle" and (e.triangle is None or e.triangle.temperature_K != e.cursor.temperature_K):
            self.run_worker(e.map_triangle, thread=True, group="triangle", exclusive=True, exit_on_error=False)
        if e.view == "cooling" and e.alloy_key() not in e.freezing:
            self.run_worker(e.freeze, thread=True, group="cooling", exclusive=True, exit_on_error=False)
        self._equilibrium = None
        self.query_one(SectionView).equilibrium = None
        self._point_worker = self.run_worker(e.equilibrium, thread=True, group="point", exclusive=True,
                                             exit_on_error=False)
        self._show_status()
        self.query_one(SectionView).refresh()

    def _show_status(self) -> None:
        e = self.exploration
        unit = self.query_one(SectionView).unit
        lines = e.status_lines(self._equilibrium, unit, self.glyphs.temperature_unit(unit), phases=e.view != "cooling")
        if e.view == "cooling":
            lines += e.freezing_lines(unit, self.glyphs.temperature_unit(unit))
        elif (e.triangle if e.view == "triangle" else e.isopleth) is None:
            lines.append(("note", f" mapping the {'isothermal section' if e.view == 'triangle' else 'isopleth'} ..."))
        else:
            key = self.query_one(SectionView).key()
            lines += ([("heading", "FIELDS")] + [("note", f" {entry}") for entry in key]) if key else []
        self.query_one(StatusPane).show_lines(lines)

    def on_worker_state_changed(self, event: Worker.StateChanged) -> None:
        worker = event.worker
        if event.state == WorkerState.ERROR and worker.group == "cooling":
            self.exploration.freezing[self.exploration.alloy_key()] = str(worker.error)
            self._show_status()
            self.query_one(SectionView).refresh()
            return
        if event.state == WorkerState.ERROR:
            self.query_one(StatusPane).show_lines([("warning", f" no answer here: {worker.error}")])
            return
        if event.state != WorkerState.SUCCESS:
            return
        if worker.group == "isopleth":
            key, isopleth = worker.result
            if key == self.exploration.section_key():       # still the section on screen
                self.exploration.isopleth = isopleth
                self.query_one(SectionView).refresh()
        elif worker.group == "cooling":
            key, result = worker.result
            self.exploration.freezing[key] = result
            self.query_one(SectionView).refresh()
        elif worker.group == "triangle":
            T, section = worker.result
            if T == self.exploration.cursor.temperature_K:      # still the cursor's temperature
                self.exploration.triangle = section
                self.query_one(SectionView).refresh()
        elif worker is self._point_worker:
            self._equilibrium = worker.result
            self.query_one(SectionView).equilibrium = worker.result
            self.query_one(SectionView).refresh()
        self._show_status()

    def on_section_view_drawn(self, event: SectionView.Drawn) -> None:
        """A new picture: its key of numbered fields goes into the status pane."""
        self._show_status()

    # -- keys ----------------------------------------------------------------------------------
    def action_move(self, columns: int, rows: int) -> None:
        self.exploration.move(columns, rows)
        self._changed(remap=True)

    def action_vary(self) -> None:
        self.exploration.vary_next()
        self._changed(remap=True)

    def action_help(self) -> None:
        system = self.exploration.system
        self.app.push_screen(HelpScreen(self.glyphs, system.name, system.safety, self.exploration.element, HELP_ROWS))

    def action_view(self, view: str) -> None:
        self.exploration.switch_view(view)
        self._changed(remap=True)

    def action_temperature_unit(self) -> None:
        view = self.query_one(SectionView)
        view.unit = TEMPERATURE_UNITS[(TEMPERATURE_UNITS.index(view.unit) + 1) % len(TEMPERATURE_UNITS)]
        view.refresh()
        self._show_status()

    def action_go_to(self) -> None:
        self.query_one(PointEntry).open(self.exploration.element)

    def action_back(self) -> None:
        entry = self.query_one(PointEntry)
        if entry.display:
            entry.close()
            self.set_focus(None)

    def on_input_submitted(self, event: Input.Submitted) -> None:
        event.stop()
        e = self.exploration
        entry = self.query_one(PointEntry)
        try:
            e.jump(parse_point(event.value, e.system.elements, e.system.molar_mass, e.system.alloys))
        except (EntryError, ValueError) as error:
            entry.show_problem(str(error))
            return
        entry.close()
        self.set_focus(None)
        self._changed(remap=True)
