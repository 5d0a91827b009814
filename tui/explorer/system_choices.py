"""The systems the picker offers: each with its title, source and checks, or why it cannot be
opened."""

from __future__ import annotations

from dataclasses import dataclass

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


def system_choices() -> list[SystemChoice]:
    """Every system the catalog knows, loaded; a file that fails to load says why."""
    choices = []
    for entry in list_systems():
        try:
            system = find_system(str(entry.path))
        except (SystemFileError, UnknownSystem, OSError) as error:
            choices.append(SystemChoice(entry.name, problem=str(error)))
            continue
        count = len(system.checks)
        checks = f"{count} handbook check{'s' if count != 1 else ''}" if count else "no checks"
        choices.append(SystemChoice(entry.name, system.title, system.source, system.safety, checks))
    return choices
