"""The systems the picker offers: each with its title, source and checks, or why it cannot be
opened; and which screen draws a system (its traced diagram, or an isopleth)."""

from __future__ import annotations

from dataclasses import dataclass, replace

from ladle.engine import SystemFileError, UnknownSystem, find_system, list_systems
from ladle.tui.quote import one_line


@dataclass(frozen=True)
class SystemChoice:
    """One line of the picker. `problem` is set (and the rest may be empty) for a bad file."""

    name: str
    title: str = ""
    source: str = ""
    safety: str = ""
    checks: str = ""
    problem: str = ""
    alloys: tuple[str, ...] = ()     # the file's alloy shorthands as listed: 'Sn96.5Ag3.0Cu0.5 (SAC305)'

    def matches(self, query: str, by_alloys: bool = True) -> bool:
        """Whether every word of the query occurs in the name, title, source or (`by_alloys`) an
        alloy's name (any case)."""
        haystack = f"{self.name} {self.title} {self.source} {' '.join(self.alloys) if by_alloys else ''}".lower()
        return all(word in haystack for word in query.lower().split())

    def alloys_named(self, query: str) -> tuple[str, ...]:
        """Where only its alloys' names made the query match (a search by 'SAC305' or 'A356'),
        the alloys whose names hold a word of it; else ()."""
        if self.matches(query, by_alloys=False):
            return ()
        words = query.lower().split()
        return tuple(alloy for alloy in self.alloys if any(word in alloy.lower() for word in words))

    def rank(self, query: str) -> int:
        """Where the choice stands among those matching `query`: 0 when the query is its name,
        1 when its name holds every word, 2 otherwise (so that typing a name and Enter opens it)."""
        words = query.lower().split()
        if " ".join(words) == self.name.lower():
            return 0
        return 1 if all(word in self.name.lower() for word in words) else 2


def opens_as_section(system) -> bool:
    """Whether the explorer draws `system` as an isopleth (three or more elements, or a binary
    with sublattice phases, such as Fe-C, which the tie-line tracer does not map) rather than as
    its traced binary diagram."""
    from ladle.engine.diagrams.mappable import unmapped_phases

    return len(system.elements) != 2 or bool(unmapped_phases(system))


def system_choices() -> list[SystemChoice]:
    """Every system the catalog knows, loaded; a file that fails to load says why."""
    from ladle.engine.checking.measure import independent_checks

    choices = []
    for entry in list_systems():
        try:
            system = find_system(str(entry.path))
        except (SystemFileError, UnknownSystem, OSError) as error:
            choices.append(SystemChoice(entry.name, problem=one_line(str(error))))   # no file text drives the screen
            continue
        choices.append(SystemChoice(entry.name, system.title, system.source, system.safety,
                                    checks_text(None, len(independent_checks(system)), len(system.measured)),
                                    alloys=tuple(alloy.shown_name for alloy in system.alloys)))
    return choices


def checks_text(passed: int | None, total: int, fit_targets: int = 0) -> str:
    """'12 independent checks (checking ...)' while the picker evaluates them, then 'independent
    checks passed: 11 of 12' (checks the model was not fitted to; melting points are not
    counted), then how many fit targets the file holds, which are not counted: '; 4 fit targets
    not counted'."""
    if not total:
        text = "no independent checks"
    elif passed is None:
        text = f"{total} independent check{'s' if total != 1 else ''} (checking ...)"
    else:
        text = f"independent checks passed: {passed} of {total}"
    if fit_targets:
        text += f"; {fit_targets} fit target{'s' if fit_targets != 1 else ''} not counted"
    return text


def with_check_result(choice: SystemChoice) -> SystemChoice:
    """The choice with how many independent checks pass (evaluated by the engine, remembered in
    the user's cache, so slow only the first time a system file is seen)."""
    from ladle.engine.checking.cache import check_counts

    if choice.problem:
        return choice
    system = find_system(choice.name)
    passed, total = check_counts(system)
    return replace(choice, checks=checks_text(passed, total, len(system.measured)))
