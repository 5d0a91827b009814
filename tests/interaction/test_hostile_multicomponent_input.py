"""Input paths of multicomponent alloys and user systems hit as a hostile or careless person
would: FIFOs, links and folders where files are expected, a corrupted --resume state, a heat
list column naming an element the system lacks, markup and non-finite numbers typed into the
explorer or written in a system file. The bar (DEVELOPERS.md): one clear line naming the file,
key or value and what is expected, exit status 2; never a traceback, a hang or a wrong answer;
nothing from a file drives the terminal; a user's file is never overwritten unasked."""

from __future__ import annotations

import json
import os
import subprocess
import sys
from pathlib import Path

import pytest
from explorer_harness import SIZE, THEME, pilot_test, status_text, until

SHIPPED = Path(__file__).resolve().parents[2] / "systems"
#: Seconds a refused input may take; the defects here waited forever.
PROMPT_S = 60


def _ladle(*args: str, cwd: Path, env: dict | None = None) -> subprocess.CompletedProcess:
    return subprocess.run([sys.executable, "-m", "ladle.tui.cli", *args], capture_output=True, text=True,
                          stdin=subprocess.DEVNULL, cwd=cwd, env={**os.environ, **(env or {})}, timeout=PROMPT_S)


def _one_line_refusal(run: subprocess.CompletedProcess, *words: str) -> None:
    """Exit status 2 and one line on stderr holding every one of `words`, without a traceback."""
    assert run.returncode == 2, run.stderr
    lines = run.stderr.strip().splitlines()
    assert len(lines) == 1, run.stderr
    for word in words:
        assert word in lines[0], lines[0]


# -- FIFOs, links and folders where a file is read ------------------------------------------------

def test_a_fifo_in_the_users_folder_of_systems_is_refused_not_waited_on(tmp_path):
    folder = tmp_path / "systems"
    folder.mkdir()
    os.mkfifo(folder / "ag-zn.toml")
    run = _ladle("point", "ag-zn", "--temp", "250C", "--comp", "Zn=3wt%", cwd=tmp_path,
                 env={"LADLE_SYSTEMS": str(folder)})
    _one_line_refusal(run, "ag-zn.toml", "not a regular file", "FIFO")


@pytest.mark.parametrize("kind", ["fifo", "folder"])
def test_a_system_path_that_is_not_a_regular_file_says_what_it_is(tmp_path, kind):
    path = tmp_path / "mine.toml"
    os.mkfifo(path) if kind == "fifo" else path.mkdir()
    run = _ladle("point", str(path), "--temp", "250C", "--comp", "Ag=3wt%,Cu=0.5wt%", cwd=tmp_path)
    _one_line_refusal(run, "mine.toml", "not a regular file", "FIFO" if kind == "fifo" else "folder")
    assert "no such" not in run.stderr


def test_fit_refuses_a_fifo_for_its_measurements_file(tmp_path):
    os.mkfifo(tmp_path / "measured.toml")
    run = _ladle("fit", "measured.toml", "-o", "fitted.toml", cwd=tmp_path)
    _one_line_refusal(run, "measured.toml", "not a regular file")


def test_batch_refuses_a_fifo_for_its_heat_list(tmp_path):
    os.mkfifo(tmp_path / "heats.csv")
    run = _ladle("batch", "ag-cu-sn", "heats.csv", "--melt-only", "--workers", "1", cwd=tmp_path)
    _one_line_refusal(run, "heats.csv", "not a regular file")


@pytest.mark.parametrize("kind", ["fifo", "folder"])
def test_a_file_built_on_that_is_not_a_regular_file_is_refused_not_replaced_by_the_shipped_one(tmp_path, kind):
    (tmp_path / "sac.toml").write_text((SHIPPED / "ag-cu-sn.toml").read_text(encoding="utf-8"), encoding="utf-8")
    beside = tmp_path / "ag-cu.toml"                  # the person's own Ag-Cu, which sac.toml builds on
    os.mkfifo(beside) if kind == "fifo" else beside.mkdir()
    run = _ladle("point", "sac.toml", "--temp", "250C", "--comp", "Ag=3wt%,Cu=0.5wt%", cwd=tmp_path)
    _one_line_refusal(run, "ag-cu.toml", "not a regular file")


def test_a_system_file_saved_with_a_byte_order_mark_is_read(tmp_path):
    """Windows editors may start a UTF-8 file with a byte-order mark; the refusal named line 1,
    column 1 and nothing the person could see."""
    text = (SHIPPED / "ag-cu-sn.toml").read_text(encoding="utf-8")
    (tmp_path / "sac.toml").write_bytes(b"\xef\xbb\xbf" + text.encode("utf-8"))
    (tmp_path / "plain.toml").write_text(text, encoding="utf-8")
    marked = _ladle("point", "sac.toml", "--temp", "250C", "--comp", "Ag=3wt%,Cu=0.5wt%", "--json", cwd=tmp_path)
    plain = _ladle("point", "plain.toml", "--temp", "250C", "--comp", "Ag=3wt%,Cu=0.5wt%", "--json", cwd=tmp_path)
    assert marked.returncode == 0, marked.stderr
    assert json.loads(marked.stdout)["phases"] == json.loads(plain.stdout)["phases"]


@pytest.mark.parametrize("invisible", ["\u200b", "\u200e", "\u2028", "\ufeff"],
                         ids=["zero-width space", "direction mark", "line separator", "byte-order mark"])
def test_an_alloy_name_with_an_invisible_character_is_refused(tmp_path, invisible):
    """'Sn96.5Ag3.0Cu0.5' with a zero-width space inside looks like the standard's name but is not."""
    text = (SHIPPED / "ag-cu-sn.toml").read_text(encoding="utf-8")
    assert 'name = "Sn96.5Ag3.0Cu0.5"' in text
    escaped = invisible.encode("unicode_escape").decode()
    (tmp_path / "sac.toml").write_text(text.replace('name = "Sn96.5Ag3.0Cu0.5"', f'name = "Sn96.5{escaped}Ag3.0Cu0.5"'),
                                       encoding="utf-8")
    run = _ladle("point", "sac.toml", "--temp", "250C", "--comp", "Ag=3wt%,Cu=0.5wt%", cwd=tmp_path)
    _one_line_refusal(run, "alloy[0].name", "control characters")


def test_invisible_characters_of_a_files_title_do_not_reach_the_terminal(tmp_path):
    text = (SHIPPED / "ag-cu-sn.toml").read_text(encoding="utf-8")
    marked = text.replace('title = "Tin-silver-copper', 'title = "Tin\\u2028\\u200fsilver-copper', 1)
    assert marked != text
    (tmp_path / "sac.toml").write_text(marked, encoding="utf-8")
    run = _ladle("point", "sac.toml", "--temp", "250C", "--comp", "Ag=3wt%,Cu=0.5wt%", cwd=tmp_path)
    assert run.returncode == 0, run.stderr
    assert run.stdout.startswith("Tinsilver-copper") and "\u2028" not in run.stdout and "\u200f" not in run.stdout


# -- heat lists: the output's partial file, its folder, and a --resume state ----------------------

HEATS = "heat,Ag wt%,Cu wt%\nH1,3.0,0.5\nH2,3.5,0.7\nH3,1.0,0.5\n"


def test_a_link_at_the_partial_results_path_is_refused_and_its_target_kept(tmp_path):
    (tmp_path / "heats.csv").write_text(HEATS, encoding="utf-8")
    precious = tmp_path / "precious.txt"
    precious.write_text("a person's own file\n", encoding="utf-8")
    (tmp_path / ".out.csv.ladle-partial").symlink_to(precious.name)
    run = _ladle("batch", "ag-cu-sn", "heats.csv", "--melt-only", "--workers", "1", "-o", "out.csv", cwd=tmp_path)
    _one_line_refusal(run, ".out.csv.ladle-partial", "not a regular file")
    assert precious.read_text(encoding="utf-8") == "a person's own file\n"
    assert not (tmp_path / "out.csv").exists()


def test_a_fifo_at_the_partial_results_path_is_refused(tmp_path):
    (tmp_path / "heats.csv").write_text(HEATS, encoding="utf-8")
    os.mkfifo(tmp_path / ".out.csv.ladle-partial")
    run = _ladle("batch", "ag-cu-sn", "heats.csv", "--melt-only", "--workers", "1", "-o", "out.csv", cwd=tmp_path)
    _one_line_refusal(run, ".out.csv.ladle-partial", "not a regular file", "FIFO")


def test_an_output_in_a_missing_folder_names_the_folder_not_resume(tmp_path):
    (tmp_path / "heats.csv").write_text(HEATS, encoding="utf-8")
    run = _ladle("batch", "ag-cu-sn", "heats.csv", "--melt-only", "--workers", "1", "-o", "nowhere/out.csv",
                 cwd=tmp_path)
    _one_line_refusal(run, "out.csv", "no folder nowhere")
    assert "--resume" not in run.stderr


FOUR_HEATS = HEATS + "H4,2.0,0.3\n"


@pytest.fixture(scope="module")
def uninterrupted(tmp_path_factory) -> str:
    """The output of one run over the four heats (computed once: a few seconds each time)."""
    folder = tmp_path_factory.mktemp("uninterrupted")
    (folder / "heats.csv").write_text(FOUR_HEATS, encoding="utf-8")
    done = _ladle("batch", "ag-cu-sn", "heats.csv", "--melt-only", "--workers", "1", cwd=folder)
    assert done.returncode == 0, done.stderr
    return done.stdout


def _interrupted_run(folder: Path, uninterrupted: str) -> dict:
    """A heat list of four heats, the partial output of its first two (from `uninterrupted`, the
    whole run's output) and the state an interrupted run leaves (as tui/heatlist_runs.py writes
    it), made directly: (state)."""
    from ladle.tui.heatlist import scan_heat_list

    (folder / "heats.csv").write_text(FOUR_HEATS, encoding="utf-8")
    written = "".join(uninterrupted.splitlines(keepends=True)[:3])        # header and two heats
    (folder / ".out.csv.ladle-partial").write_text(written, encoding="utf-8")
    scan = scan_heat_list(folder / "heats.csv", None)
    state = {"version": 1, "input": str(folder / "heats.csv"), "size": scan.size, "sha256": scan.sha256,
             "options": {"system": "ag-cu-sn", "without": [], "unit": "C", "superheat_K": None, "scheil": False,
                         "encoding": "utf-8"},
             "input_offset": len("".join(HEATS.splitlines(keepends=True)[:3])), "line": 4,
             "output_bytes": len(written.encode()),
             "totals": {"heats": 2, "problems": 0, "listed": [], "blank_ids": 0, "blank_listed": [],
                        "duplicates": 0, "duplicate_listed": [], "duplicate_check_full": False}}
    (folder / ".out.csv.ladle-state.json").write_text(json.dumps(state), encoding="utf-8")
    return state


def test_the_made_interrupted_run_resumes_to_the_uninterrupted_answer(tmp_path, uninterrupted):
    """The control for the corrupted states below: the state as made is accepted."""
    _interrupted_run(tmp_path, uninterrupted)
    run = _ladle("batch", "ag-cu-sn", "heats.csv", "--melt-only", "--workers", "1", "-o", "out.csv", "--resume",
                 cwd=tmp_path)
    assert run.returncode == 0, run.stderr
    assert (tmp_path / "out.csv").read_text(encoding="utf-8") == uninterrupted


CORRUPTIONS = {
    "heats a text": ("totals", "heats", "abc"),
    "heats negative": ("totals", "heats", -5),
    "heats a fraction": ("totals", "heats", 2.5),
    "problems a text": ("totals", "problems", "x"),
    "problems above heats": ("totals", "problems", 7),
    "listed not pairs": ("totals", "listed", [[1]]),
    "blank_listed a text": ("totals", "blank_listed", "abc"),
    "duplicate_check_full a text": ("totals", "duplicate_check_full", "yes"),
    "offset beyond the file": (None, "input_offset", 10 ** 12),
    "offset negative": (None, "input_offset", -100),
    "offset inside a row": (None, "input_offset", 33),
    "offset true": (None, "input_offset", True),
    "offset a fraction": (None, "input_offset", 41.5),
    "line negative": (None, "line", -1),
    "output before the header's end": (None, "output_bytes", 0),
    "output negative": (None, "output_bytes", -1),
}


@pytest.mark.parametrize("corruption", CORRUPTIONS, ids=list(CORRUPTIONS))
def test_resume_refuses_a_corrupted_state_file_in_one_line(tmp_path, corruption, uninterrupted):
    state = _interrupted_run(tmp_path, uninterrupted)
    table, key, value = CORRUPTIONS[corruption]
    (state[table] if table else state)[key] = value
    (tmp_path / ".out.csv.ladle-state.json").write_text(json.dumps(state), encoding="utf-8")
    run = _ladle("batch", "ag-cu-sn", "heats.csv", "--melt-only", "--workers", "1", "-o", "out.csv", "--resume",
                 cwd=tmp_path)
    _one_line_refusal(run, ".out.csv.ladle-state.json", "run without --resume")
    assert not (tmp_path / "out.csv").exists()


def test_resume_refuses_an_infinite_offset(tmp_path, uninterrupted):
    state = _interrupted_run(tmp_path, uninterrupted)
    path = tmp_path / ".out.csv.ladle-state.json"
    path.write_text(json.dumps(state).replace(f'"input_offset": {state["input_offset"]}', '"input_offset": Infinity'),
                    encoding="utf-8")
    assert "Infinity" in path.read_text(encoding="utf-8")
    run = _ladle("batch", "ag-cu-sn", "heats.csv", "--melt-only", "--workers", "1", "-o", "out.csv", "--resume",
                 cwd=tmp_path)
    _one_line_refusal(run, ".out.csv.ladle-state.json", "run without --resume")


# -- a heat list's columns ------------------------------------------------------------------------

def test_a_column_naming_an_element_the_system_lacks_is_named_on_stderr(tmp_path):
    """Sn-3Ag-0.5Cu with 1 wt% Pb is not the alloy computed (ag-cu-sn has no lead): the person is
    told which column is left out of every alloy."""
    (tmp_path / "heats.csv").write_text("heat,Ag wt%,Cu wt%,Pb wt%\nH1,3.0,0.5,1.0\n", encoding="utf-8")
    run = _ladle("batch", "ag-cu-sn", "heats.csv", "--melt-only", "--workers", "1", cwd=tmp_path)
    assert run.returncode == 0, run.stderr
    notes = [line for line in run.stderr.splitlines() if "Pb wt%" in line]
    assert len(notes) == 1 and "Pb" in notes[0] and "not in ag-cu-sn" in notes[0], run.stderr


# -- leaving phases out ---------------------------------------------------------------------------

@pytest.mark.parametrize("command", [("melt", "--comp", "Ag=3wt%,Cu=0.5wt%"), ("cool", "--comp", "Ag=3wt%,Cu=0.5wt%"),
                                     ("batch", "heats.csv", "--melt-only", "--workers", "1")], ids=lambda c: c[0])
def test_melting_or_freezing_without_the_liquid_is_refused_as_such(tmp_path, command):
    """With the liquid left out, cool said the alloy 'is not all liquid at 6000 K', melt that its
    liquidus is 'not inside the scanned range' and batch that each heat is 'not fully solid at the
    bottom of the window': none of which is the reason."""
    (tmp_path / "heats.csv").write_text(HEATS, encoding="utf-8")
    run = _ladle(command[0], "ag-cu-sn", *command[1:], "--without", "liquid", cwd=tmp_path)
    _one_line_refusal(run, "ag-cu-sn has no liquid phase")


# -- typed values and names -----------------------------------------------------------------------

@pytest.mark.parametrize("text", ["1e400", "1e400C", "-1e400K"])
def test_a_temperature_beyond_any_number_is_refused_as_such(text):
    from ladle.tui.parsing import parse_temperature

    with pytest.raises(ValueError, match="not a finite number"):
        parse_temperature(text)


def test_varying_the_only_element_held_says_what_to_hold(tmp_path):
    """The old line spoke of 'Ag at 0wt%' and naming 'all but one', which the person had not typed."""
    run = _ladle("diagram", "ag-cu-sn", "--comp", "Ag=3wt%", "--vary", "Ag=0..2wt%", cwd=tmp_path)
    _one_line_refusal(run, "--vary Ag leaves Sn and Cu unnamed", "--comp holds every element but Ag and the balance")


def test_a_typed_alloy_outside_a_binary_sections_cover_names_the_range():
    """Fe-C is drawn as a section; the refusal of C=30wt% ended in empty brackets '()'."""
    from ladle.engine import find_system
    from ladle.tui.explorer.entry import parse_point
    from ladle.tui.explorer.launch import exploration_for

    system = find_system("fe-fe3c")
    exploration = exploration_for(system)
    with pytest.raises(ValueError, match=r"covers \(0-6.69 wt% C, 0-25 at% C\)$"):   # the screen's wt% first
        exploration.jump(parse_point("C=30wt%", system.elements, system.molar_mass, system.alloys))


@pytest.mark.parametrize("typed", ["Ag=3wt% Cu=0.5wt%", "Ag=3wt%;Cu=0.5wt%"])
def test_contents_not_separated_by_commas_are_told_to_be(tmp_path, typed):
    run = _ladle("point", "ag-cu-sn", "--temp", "250C", "--comp", typed, cwd=tmp_path)
    _one_line_refusal(run, repr(typed), "separate the contents with commas")


def test_an_unknown_alloy_name_with_escapes_is_echoed_escaped_once(tmp_path):
    run = _ladle("point", "ag-cu-sn", "--temp", "250C", "--alloy", "x\x1b[31m", cwd=tmp_path)
    _one_line_refusal(run, "unknown alloy 'x\\x1b[31m'")


def test_the_system_picker_shows_a_files_problem_without_its_control_characters(tmp_path, monkeypatch):
    from ladle.tui.explorer.system_choices import system_choices

    folder = tmp_path / "own"
    folder.mkdir()
    text = (SHIPPED / "ag-cu-sn.toml").read_text(encoding="utf-8")
    (folder / "my-sac.toml").write_text(text.replace('"ag-cu.toml"]', '"a\\u001b[2J.toml"]'), encoding="utf-8")
    monkeypatch.setenv("LADLE_SYSTEMS", str(folder))
    [choice] = [c for c in system_choices() if c.name == "my-sac"]
    assert "a\\x1b[2J.toml" in choice.problem and "\x1b" not in choice.problem


# -- the explorer: markup typed or written in a file is shown as text ----------------------------

MARKUP = "[/]Lead [bold]is[/bold] toxic"


@pytest.fixture
def ternary_app(monkeypatch):
    """The invented ideal ternary eutectic of tests/unit/ideal_ternaries.py on the section screen,
    its title and safety text holding console markup."""
    sys.path.insert(0, str(Path(__file__).resolve().parents[1] / "unit"))
    import ideal_ternaries as it

    from ladle.engine.diagrams import isopleth
    from ladle.tui.explorer import section_exploration
    from ladle.tui.explorer.app import ExplorerApp
    from ladle.tui.explorer.glyphs import glyphs_for

    system = it.eutectic_system()
    system.phases = system.models
    system.title, system.safety = MARKUP, MARKUP + ". Wear a face shield."
    solve = it.equilibrate_for(system)
    monkeypatch.setattr(isopleth, "equilibrate", solve)
    monkeypatch.setattr(section_exploration, "equilibrate", solve)
    app = ExplorerApp(section_exploration.SectionExploration(system, temperature_K=700.0), glyphs_for(False), None)
    app.theme = THEME
    return app


@pilot_test
async def test_markup_in_a_systems_safety_text_is_shown_as_written_on_the_section_screen(ternary_app):
    app = ternary_app
    async with app.run_test(size=SIZE) as pilot:
        await until(pilot, lambda: app.screen.exploration.isopleth is not None, "the isopleth")
        assert app.is_running
        assert "[/]Lead [bold]is[/bold]" in str(app.screen.query_one("#caution").render())


@pytest.mark.parametrize("typed", ["[/]", "[link=http://x]y[/link]", "B=[red]20at%"])
@pilot_test
async def test_markup_typed_at_the_go_to_prompt_is_echoed_as_typed(ternary_app, typed):
    from ladle.tui.explorer.widgets.point_entry import PointEntry

    app = ternary_app
    async with app.run_test(size=SIZE) as pilot:
        await until(pilot, lambda: app.screen.exploration.isopleth is not None and "computing" not in status_text(app),
                    "the isopleth and the point")
        await pilot.press("g")
        app.screen.query_one(PointEntry).query_one("Input").value = typed
        await pilot.press("enter")
        assert app.is_running
        problem = str(app.screen.query_one("#point-problem").render())
        assert problem.startswith("not used: ") and typed.split("=")[-1].removesuffix("20at%") in problem


@pilot_test
async def test_markup_in_a_binarys_safety_text_is_shown_as_written(tmp_path):
    from ladle.engine import find_system
    from ladle.tui.explorer.app import ExplorerApp
    from ladle.tui.explorer.glyphs import glyphs_for
    from ladle.tui.explorer.launch import exploration_for

    text = (SHIPPED / "pb-sn.toml").read_text(encoding="utf-8")
    assert '\nsafety = "' in text
    (tmp_path / "my-pb-sn.toml").write_text(text.replace('\nsafety = "', f'\nsafety = "{MARKUP}. '), encoding="utf-8")
    app = ExplorerApp(exploration_for(find_system(str(tmp_path / "my-pb-sn.toml"))), glyphs_for(False), None)
    app.theme = THEME
    async with app.run_test(size=SIZE) as pilot:
        await pilot.pause(0.2)
        assert app.is_running
        assert "[/]Lead [bold]is[/bold]" in str(app.screen.query_one("#caution").render())


@pilot_test
async def test_a_written_files_notice_shows_its_folder_as_it_is(tmp_path, monkeypatch):
    """A working folder called '[bold]work' was shown as 'work': the notice read the path as markup."""
    from textual.widgets._toast import Toast

    from explorer_harness import make_app

    folder = tmp_path / "[bold]work"
    folder.mkdir()
    monkeypatch.chdir(folder)
    app = make_app(T_K=458.15, x_B=0.5)
    async with app.run_test(size=SIZE) as pilot:
        await pilot.press("w")
        await pilot.pause(0.2)
        shown = [str(Toast(n).render()) for n in app._notifications]
    assert any("[bold]work" in text and "wrote" in text for text in shown), shown


@pilot_test
async def test_phase_names_with_brackets_are_shown_in_the_reactions_view(tmp_path):
    """A file's phase called 'b[/]ct' crashed the explorer's reactions table (read as markup)."""
    import re

    from ladle.engine import find_system
    from ladle.tui.explorer.app import ExplorerApp
    from ladle.tui.explorer.glyphs import glyphs_for
    from ladle.tui.explorer.launch import exploration_for
    from ladle.tui.explorer.widgets.reactions_view import ReactionsView

    lines = []
    for line in (SHIPPED / "pb-sn.toml").read_text(encoding="utf-8").splitlines():
        if line.startswith("[fit") or line.startswith("free ="):
            break                                  # the fit's paths name the phase; not needed here
        line = '[phase."b[/]ct"]' if line == "[phase.bct]" else re.sub(r'(?<![\w"])bct(?=\s*=)', '"b[/]ct"', line)
        lines.append(line)
    (tmp_path / "pb-sn-marked.toml").write_text("\n".join(lines) + "\n", encoding="utf-8")
    system = find_system(str(tmp_path / "pb-sn-marked.toml"))
    assert "b[/]ct" in system.phases
    app = ExplorerApp(exploration_for(system), glyphs_for(False), None)
    app.theme = THEME
    async with app.run_test(size=SIZE) as pilot:
        await pilot.press("3")
        await pilot.pause(0.5)
        assert app.is_running
        table = app.screen.query_one(ReactionsView)
        cells = [str(table.get_cell_at((r, 2))) for r in range(table.row_count)]
    assert any("b[/]ct" in cell for cell in cells), cells
