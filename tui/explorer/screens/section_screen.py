"""The explorer's screen for a system drawn as an isopleth (three or more elements, or a binary
with sublattice phases such as Fe-C): the isopleth through the cursor's alloy, the trade's lines
named on it, beside the status pane (every phase with its amount and the content of every
element; where the file names lines or a heat treatment, the alloy's changes on cooling and its
heat-treatment window). The arrows move the cursor along the section and in temperature, `v` lets
the next element vary, `g` goes to a typed alloy and temperature ("Ag=3wt% Cu=0.5wt% 250C"), `s`
opens another system.

The isopleth, the point equilibrium and the alloy's transitions are computed in worker threads
(background.py: the explorer quits without waiting for them):
keys are answered while they run ("mapping the isopleth ..." shows meanwhile); a newer request
for the point replaces an older one, and the transitions are scanned once the cursor rests.
"""

from __future__ import annotations

import time

from textual.app import ComposeResult
from textual.binding import Binding
from textual.containers import Horizontal, Vertical
from textual.screen import Screen
from textual.widgets import Input, Static
from textual.worker import Worker, WorkerState

from ladle.engine.units import TEMPERATURE_UNITS, kelvin_to, mass_from_mole
from ladle.tui.quote import percent

from ..alloy_changes import change_lines
from ..background import in_background
from ..cautions import caution_line, caution_rows
from ..glyphs import Glyphs
from ..section_exploration import SectionExploration
from ..widgets.point_entry import PointEntry
from ..widgets.section_view import SectionView
from ..widgets.status_pane import StatusPane
from .file_writing import WritesFiles
from .help import HelpScreen

#: The key bar of a ternary's isopleth: each key and its word (a binary drawn as an isopleth, and
#: a system of four or more elements, leave off what they lack; the arrows are in the help).
KEY_BAR = (("v", "vary"), ("i", "triangle"), ("c", "cool"), ("u t", "unit"), ("g", "go"),
           ("+-0", "zoom"), ("s", "system"), ("?", "help"), ("q", "quit"))
#: The help screen's rows for this screen: (keys, what they do).
HELP_ROWS = [("arrows h j k l", "move the cursor along the section (left, right) and in temperature (up, down)"),
             ("shift+arrows", "the same by a tenth of a step (or H J K L)"),
             ("v", "let the next element vary (the balance, the first element, takes up the change)"),
             ("i", "a ternary: switch between the isopleth and the isothermal section at the cursor's temperature "
                   "(the cursor's alloy marked, its tie-line or tie-triangle drawn)"),
             ("c", "switch between the isopleth and both freezing paths of the cursor's alloy (equilibrium, "
                   "Scheil), with its liquidus, the ends of freezing and the structure in the status pane"),
             ("g", "go to a typed alloy and temperature: Ag=3wt% Cu=0.5wt% 250C (every element but the balance)"),
             ("u", "compositions in wt% or at%: the section holds the other elements' mass or mole fractions "
                   "(a cast iron opens in wt%, other systems of three or more elements in at%)"),
             ("t", "temperatures in C, K or F, everywhere"),
             ("+ - 0", "zoom the isopleth in, out, or show all of it again (the arrows' steps follow the zoom)"),
             ("s", "choose another system"),
             ("w", "write the point's result as JSON, as ladle point --json gives it (and copy it)"),
             ("p", "save the screen as text and SVG files (in the working folder, never over an existing file)"),
             ("Esc", "close the entry line"),
             ("?", "this help"),
             ("q", "quit")]
#: Said where the key of numbered fields does not fit the status pane.
ZOOM_HINT = "numbered fields: + names them"
#: The cursor's alloy's transitions are scanned once it has rested this long (s).
SCAN_DELAY_S = 0.4
#: The point equilibrium is computed at once, without a worker, while the last one took less
#: than this (s): a key then updates the screen once.
INLINE_POINT_S = 0.02


def _keys_here(exploration: SectionExploration) -> set[str]:
    """The keys of KEY_BAR and HELP_ROWS this system leaves off: `v` with one element to vary,
    `i` without a triangle."""
    n = len(exploration.system.elements)
    return ({"v"} if n == 2 else set()) | ({"i"} if n != 3 else set())


def key_bar(exploration: SectionExploration) -> str:
    """The key bar for this system."""
    off = _keys_here(exploration)
    return "  ".join(f"{key} {what}" for key, what in KEY_BAR if key not in off)


def help_rows(exploration: SectionExploration) -> list[tuple[str, str]]:
    """The help screen's rows for this system; a binary's typed-point example names its element."""
    off = _keys_here(exploration)
    rows = [(key, what) for key, what in HELP_ROWS if key not in off]
    if exploration.is_binary:
        el = exploration.element
        rows = [(key, f"go to a typed alloy and temperature: {el}=0.8wt% 760C, or 0.8wt% 760C" if key == "g" else what)
                for key, what in rows]
    return rows


class SectionScreen(WritesFiles, Screen[None]):
    """Keys move the cursor on the isopleth; the status pane follows."""

    BINDINGS = [Binding("left,h", "move(-1, 0)", show=False), Binding("right,l", "move(1, 0)", show=False),
                Binding("up,k", "move(0, 1)", show=False), Binding("down,j", "move(0, -1)", show=False),
                Binding("shift+left,H", "move(-1, 0, True)", show=False),
                Binding("shift+right,L", "move(1, 0, True)", show=False),
                Binding("shift+up,K", "move(0, 1, True)", show=False),
                Binding("shift+down,J", "move(0, -1, True)", show=False),
                Binding("v", "vary", show=False), Binding("i", "view('triangle')", show=False),
                Binding("c", "view('cooling')", show=False), Binding("t", "temperature_unit", show=False),
                Binding("u", "composition_unit", show=False),
                Binding("g", "go_to", show=False), Binding("s", "app.systems", show=False),
                Binding("plus,equals_sign", "zoom(True)", show=False), Binding("minus", "zoom(False)", show=False),
                Binding("0", "whole", show=False), Binding("p", "write_screen", show=False),
                Binding("w", "write_point", show=False),
                Binding("escape", "back", show=False), Binding("question_mark,f1", "help", show=False),
                Binding("q", "app.quit", show=False)]

    def __init__(self, exploration: SectionExploration, glyphs: Glyphs) -> None:
        super().__init__()
        self.exploration = exploration
        self.glyphs = glyphs
        self._equilibrium = None
        self._point_worker: Worker | None = None
        self._point_s = 0.0          # how long the last point equilibrium took (s)
        self._mapping: tuple | None = None      # the section whose isopleth a worker maps
        self._scan_timer = None
        self._scanning: Worker | None = None

    def compose(self) -> ComposeResult:
        yield Static("", id="title", markup=False)   # the file's title as written
        with Horizontal(id="body"):
            yield SectionView(self.glyphs, id="diagram")
            with Vertical(id="side"):
                yield StatusPane(id="status")
                yield Static("", id="caution", markup=False)   # under the pane, never pushed off it; file text as written
        yield PointEntry(id="entry")
        yield Static(key_bar(self.exploration), id="keys")

    def on_mount(self) -> None:
        self.query_one(PointEntry).display = False
        caution = self.query_one("#caution", Static)
        caution.update(caution_rows(caution_line(self.exploration.system.safety)))
        caution.display = bool(self.exploration.system.safety)
        self.query_one(SectionView).exploration = self.exploration
        self._changed()

    # -- drawing and workers ------------------------------------------------------------------
    def _title(self) -> str:
        e = self.exploration
        if e.view == "triangle":
            unit = self.query_one(SectionView).unit
            T = kelvin_to(e.cursor.temperature_K, unit)
            return f" {e.system.name}  isothermal section at {T:.1f} {self.glyphs.temperature_unit(unit)}"
        if e.is_binary:
            return f" {e.system.name}  {e.system.title}"
        x = e.x_at_cursor()
        shares = mass_from_mole(x, e.system.molar_mass) if e.basis == "wt" else x
        held = ", ".join(f"{el} {percent(shares[i])}" for i, el in enumerate(e.system.elements)
                         if i not in (0, e.varying))
        return f" {e.system.name}  isopleth: {e.element} varies; {held} {e.basis}%; {e.system.elements[0]} balance"

    def _changed(self) -> None:
        """The cursor or the section moved: redraw, and ask the workers for what changed (the
        isopleth only where it was not mapped before in this session)."""
        e = self.exploration
        self.query_one("#title", Static).update(self._title())
        if e.isopleth is None and not e.recall() and e.section_key() != self._mapping:
            self._mapping = key = e.section_key()
            self.run_worker(in_background(lambda: (key, e.map())), group="isopleth", exit_on_error=False)
        if e.view == "triangle" and (e.triangle is None or e.triangle.temperature_K != e.cursor.temperature_K):
            self.run_worker(in_background(e.map_triangle), group="triangle", exclusive=True, exit_on_error=False)
        if e.view == "cooling" and e.alloy_key() not in e.freezing:
            self.run_worker(in_background(e.freeze), group="cooling", exclusive=True, exit_on_error=False)
        self._ask_changes()
        view = self.query_one(SectionView)
        self._ask_point()
        self._show_status()
        view.redraw()

    def _ask_point(self) -> None:
        """The point equilibrium at the cursor: at once where the last one took less than
        INLINE_POINT_S (one screen update instead of two), else in a worker (keys answered
        meanwhile; "computing ..." shows)."""
        e, view = self.exploration, self.query_one(SectionView)
        self._equilibrium = view.equilibrium = None
        if self._point_s < INLINE_POINT_S:
            started = time.perf_counter()
            try:
                self._equilibrium = view.equilibrium = e.equilibrium()
            except (ValueError, ArithmeticError):
                self._point_s = INLINE_POINT_S     # the worker asks again and reports the problem
            else:
                self._point_s = time.perf_counter() - started
                return

        def timed():
            started = time.perf_counter()
            result = e.equilibrium()
            return result, time.perf_counter() - started

        self._point_worker = self.run_worker(in_background(timed), group="point", exclusive=True, exit_on_error=False)

    def _ask_changes(self) -> None:
        """Scan the cursor's alloy's transitions once the cursor has rested (SCAN_DELAY_S), where
        the status pane lists them and they are not known yet."""
        e = self.exploration
        if not e.lists_changes or e.view != "isopleth" or e.alloy_key() in e.changes:
            return
        if self._scan_timer is not None:
            self._scan_timer.stop()
        self._scan_timer = self.set_timer(SCAN_DELAY_S, self._scan)

    def _scan(self) -> None:
        """One scan at a time, after the isopleth is mapped (each asks again when it ends)."""
        e = self.exploration
        busy = self._scanning is not None and not self._scanning.is_finished
        if busy or self._mapping is not None or e.alloy_key() in e.changes:
            return
        self._scanning = self.run_worker(in_background(e.scan_changes), group="changes", exit_on_error=False)

    def _show_status(self) -> None:
        """The status pane: the point and its phases, then the view's own lines (the freezing
        paths; the alloy's transitions and the key of numbered fields); where they do not fit,
        the key in fewer lines (the fields marked on the picture), then a binary's phases one line
        each, then, instead of the key, how to see the numbered fields named (ZOOM_HINT)."""
        e = self.exploration
        unit = self.query_one(SectionView).unit
        unit_text = self.glyphs.temperature_unit(unit)
        if e.view == "cooling":     # where the structure would be cut off: without POINT, one line less
            self.query_one(StatusPane).show_lines(*(e.status_lines(self._equilibrium, unit, unit_text, phases=False,
                                                                   compact=c) + e.freezing_lines(unit, unit_text, c)
                                                    for c in (False, True)))
            return
        tail = []
        if e.view == "isopleth" and e.lists_changes:
            tail = change_lines(e.system, e.changes.get(e.alloy_key()), unit, unit_text)
        full, compact = (e.status_lines(self._equilibrium, unit, unit_text, compact=c) + tail for c in (False, True))
        if (e.triangle if e.view == "triangle" else e.isopleth) is None:
            what = "isothermal section" if e.view == "triangle" else "isopleth"
            mapping = [("note", f" mapping the {what} ...")]
            self.query_one(StatusPane).show_lines(full + mapping, compact + mapping)
            return
        key = self.query_one(SectionView).key()
        listed = [("heading", "FIELDS")] + [("note", f" {k}") for k in key] if key else []
        marked = [k.replace(":", "", 1) for k in key if ":" in k.split(" ", 1)[0]]     # not those too small to mark
        joined = [("note", "FIELDS " + "; ".join(marked))] if marked else []
        hint = [("note", ZOOM_HINT)] if marked and e.window == e.whole else []
        self.query_one(StatusPane).show_lines(full + listed, full + joined, compact + joined, full + hint,
                                              compact + hint, compact)

    def on_worker_state_changed(self, event: Worker.StateChanged) -> None:
        worker, e = event.worker, self.exploration
        view = self.query_one(SectionView)
        if event.state == WorkerState.ERROR and worker.group == "cooling":
            e.freezing[e.alloy_key()] = str(worker.error)
        elif event.state == WorkerState.ERROR:
            if worker.group == "isopleth":
                self._mapping = None
            self.query_one(StatusPane).show_lines([("warning", f" no answer here: {worker.error}")])
            return
        elif event.state != WorkerState.SUCCESS:
            return
        elif worker.group == "isopleth":
            key, mapped = worker.result
            if key == self._mapping:
                self._mapping = None
            e.keep(key, mapped)
            self._ask_changes()
        elif worker.group == "changes":
            key, changes = worker.result
            e.keep_changes(key, changes)
            self._ask_changes()
        elif worker.group == "cooling":
            key, result = worker.result
            e.freezing[key] = result
        elif worker.group == "triangle":
            T, section = worker.result
            if T == e.cursor.temperature_K:      # still the cursor's temperature
                e.triangle = section
        elif worker is self._point_worker:
            self._equilibrium, self._point_s = worker.result
            view.equilibrium = self._equilibrium
        else:
            return
        view.redraw()
        self._show_status()

    def on_section_view_drawn(self, event: SectionView.Drawn) -> None:
        """A new picture: its key of numbered fields goes into the status pane."""
        self._show_status()

    # -- keys ----------------------------------------------------------------------------------
    def action_move(self, columns: int, rows: int, fine: bool = False) -> None:
        self.exploration.move(columns, rows, fine)
        self._changed()

    def action_zoom(self, zoom_in: bool) -> None:
        self.exploration.zoom(zoom_in)
        self._changed()

    def action_whole(self) -> None:
        self.exploration.reset_zoom()
        self._changed()

    def action_vary(self) -> None:
        if not self.exploration.is_binary:
            self.exploration.vary_next()
            self._changed()

    def action_composition_unit(self) -> None:
        self.exploration.toggle_basis()
        self._changed()

    def action_help(self) -> None:
        e = self.exploration
        self.app.push_screen(HelpScreen(self.glyphs, e.system.name, e.system.safety, e.element, help_rows(e)))

    def screen_stem(self) -> str:
        return f"{self.exploration.system.name}-{self.exploration.view}"

    def action_write_point(self) -> None:
        e = self.exploration
        try:
            result = self._equilibrium or e.equilibrium()
        except (ValueError, ArithmeticError) as error:
            self.app.notify(f"nothing written: {error}", severity="error", markup=False)
            return
        unit = self.query_one(SectionView).unit
        x = e.x_at_cursor()
        shares = mass_from_mole(x, e.system.molar_mass) if e.basis == "wt" else x
        alloy = "-".join(f"{el}{percent(shares[i])}" for i, el in enumerate(e.system.elements) if i > 0)
        self.write_point(result, e.system, f"{e.system.name}-{kelvin_to(e.cursor.temperature_K, unit):.0f}{unit}-"
                                           f"{alloy}{e.basis}")

    def action_view(self, view: str) -> None:
        self.exploration.switch_view(view)
        self._changed()

    def action_temperature_unit(self) -> None:
        view = self.query_one(SectionView)
        view.unit = TEMPERATURE_UNITS[(TEMPERATURE_UNITS.index(view.unit) + 1) % len(TEMPERATURE_UNITS)]
        view.redraw()
        self.query_one("#title", Static).update(self._title())
        self._show_status()

    def action_go_to(self) -> None:
        self.query_one(PointEntry).open(self.exploration.element)

    def action_back(self) -> None:
        self.query_one(PointEntry).close()

    def on_input_submitted(self, event: Input.Submitted) -> None:
        event.stop()
        unit = self.query_one(SectionView).unit
        unit_text = self.glyphs.temperature_unit(unit)
        if self.query_one(PointEntry).submit(event.value, self.exploration.system,
                                             lambda point: self.exploration.jump(point, unit, unit_text)):
            self._changed()
