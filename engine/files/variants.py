"""Variant files: a system file that names another file of the same folder and the phases to leave
out of it, so that a metastable diagram has a name of its own (`fe-fe3c`: the iron-carbon file
without graphite). The numbers stay in one file. The keys are described in systems/FORMAT.md
("Variants").
"""

from __future__ import annotations

from collections.abc import Callable
from dataclasses import replace
from pathlib import Path

from ..errors import SystemFileError
from .plain_text import without_controls

#: The key that makes a file a variant, and every key a variant file may hold.
VARIANT_KEY = "variant_of"
VARIANT_KEYS = {VARIANT_KEY, "without", "title", "notes", "check"}


def is_variant(doc: dict) -> bool:
    """True for the parsed document of a variant file."""
    return VARIANT_KEY in doc


def load_variant(path: Path, doc: dict, name: str | None, read: Callable[[Path], dict],
                 load: Callable[..., object]):
    """The System of the variant file `path` (parsed as `doc`): the system of the file it names,
    less the phases it names in `without`, under the variant's name (`name`, default the file's
    stem) and title. Its independent checks are the file's that name no phase left out, then
    the variant's own `[[check]]` list (facts of the metastable diagram only), numbered after the
    file's as in its `document` (the file's, with the variant's checks appended). `read(path)` parses
    a TOML file; `load(path, name=...)` loads a system file. Raises SystemFileError naming the
    variant file and the key."""
    from .facts import named_phases, parse_facts

    def fail(key: str, what: str) -> SystemFileError:
        return SystemFileError(f"{path.name}: {key}: {what}")

    for key in doc:
        if key not in VARIANT_KEYS:
            raise fail(key, f"unknown key in a variant file; expected one of {', '.join(sorted(VARIANT_KEYS))}")
    base_name = doc[VARIANT_KEY]
    if (not isinstance(base_name, str) or not base_name.endswith(".toml") or Path(base_name).name != base_name
            or base_name.startswith(".")):
        raise fail(VARIANT_KEY, "expected the name of a system file in the same folder, such as \"fe-c.toml\"")
    base = path.parent / base_name
    if base.resolve() == path.resolve():
        raise fail(VARIANT_KEY, "names the variant file itself")
    try:
        base_document = read(base)
    except SystemFileError as e:            # named as reached from the variant: through variant_of
        raise fail(VARIANT_KEY, str(e)) from None
    if is_variant(base_document):
        raise fail(VARIANT_KEY, f"{base_name} is a variant itself; name the file that holds the phases")
    without = doc.get("without")
    if not isinstance(without, list) or not without or not all(isinstance(p, str) and p for p in without):
        raise fail("without", "expected a list of the phases to leave out, such as [\"graphite\"]")
    texts = {}
    for key in ("title", "notes"):
        if key in doc:
            if not isinstance(doc[key], str) or not without_controls(doc[key]).strip():
                raise fail(key, "expected a non-empty text")
            texts[key] = without_controls(doc[key], keep_newlines=True)
    try:
        system = load(base, name=name or path.stem.lower())
    except SystemFileError as e:
        raise fail(VARIANT_KEY, str(e)) from None
    try:
        variant = system.without(tuple(without))
    except ValueError as e:
        raise fail("without", str(e)) from None
    kept = [f for f in variant.checks if not named_phases(f) & set(without)]
    own = [replace(f, index=f.index + len(system.checks))   # numbered after the file's own checks
           for f in parse_facts(doc.get("check", []), "check", variant, fail)]
    document = {**system.document, "check": list(system.document.get("check", [])) + list(doc.get("check", []))}
    return replace(variant, checks=kept + own, document=document, **texts)
