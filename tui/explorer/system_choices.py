"""The systems the picker offers: each with its title, source and checks, or why it cannot be
opened."""

from __future__ import annotations

from dataclasses import dataclass, replace

from ladle.engine import SystemFileError, UnknownSystem, find_system, list_systems


@dataclass(frozen=True)
class SystemChoice:
    """One line of the picker. `problem` is set (and the rest may be empty) for a bad file."""

    name: str
    title: str = ""
    source: str = ""
    safety: str = ""
    checks: str = ""
    problem: str = ""

    def matches(self, query: str) -> bool:
        """Whether every word of the query occurs in the name, title or source (any case)."""
        haystack = f"{self.name} {self.title} {self.source}".lower()
        return all(word in haystack for word in query.lower().split())


def not_explorable(system) -> str | None:
    """Why the picker cannot switch to `system` (three or more elements: the explorer opens
    their isopleth when started on them), or the explorer cannot draw it (sublattice phases),
    in one line, or None."""
    n = len(system.elements)
    if n != 2:
        return f"{system.name}: {n} elements; open its isopleth with: ladle {system.name}"
    from ladle.engine.diagrams.mappable import unmapped_phases

    unmapped = unmapped_phases(system)
    if unmapped:
        return (f"{system.name}: sublattice phases ({', '.join(unmapped)}); the explorer draws diagrams of solutions "
                "and compounds only so far (see ladle transitions, ladle point)")
    return None


def system_choices() -> list[SystemChoice]:
    """Every system the catalog knows, loaded; a file that fails to load says why."""
    from ladle.engine.checking.measure import independent_checks

    choices = []
    for entry in list_systems():
        try:
            system = find_system(str(entry.path))
        except (SystemFileError, UnknownSystem, OSError) as error:
            choices.append(SystemChoice(entry.name, problem=str(error)))
            continue
        problem = not_explorable(system)
        if problem:
            choices.append(SystemChoice(entry.name, system.title, system.source, system.safety, problem=problem))
            continue
        choices.append(SystemChoice(entry.name, system.title, system.source, system.safety,
                                    checks_text(None, len(independent_checks(system)), len(system.measured))))
    return choices


def checks_text(passed: int | None, total: int, fit_targets: int = 0) -> str:
    """'12 independent checks', or 'independent checks passed: 11 of 12' once they are evaluated
    (checks the model was not fitted to; melting points are not counted), then how many fit
    targets the file holds, which are not counted: '; 4 fit targets not counted'."""
    if not total:
        text = "no independent checks"
    elif passed is None:
        text = f"{total} independent check{'s' if total != 1 else ''}"
    else:
        text = f"independent checks passed: {passed} of {total}"
    if fit_targets:
        text += f"; {fit_targets} fit target{'s' if fit_targets != 1 else ''} not counted"
    return text


def with_check_results(choices: list[SystemChoice]) -> list[SystemChoice]:
    """The choices with how many independent checks pass (evaluated by the engine, remembered in the user's
    cache, so slow only the first time a system file is seen)."""
    from ladle.engine.checking.cache import check_counts

    out = []
    for choice in choices:
        if choice.problem:
            out.append(choice)
            continue
        system = find_system(choice.name)
        passed, total = check_counts(system)
        out.append(replace(choice, checks=checks_text(passed, total, len(system.measured))))
    return out
