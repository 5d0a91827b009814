"""The safety cautions the help screen shows (the README carries the same ones), and the line
under the status pane that gives the open system's own caution."""

import re
import textwrap

#: Characters the line under the status pane may take (two of its lines at 80x24).
CAUTION_ROOM = 60
#: Cells of one row under the status pane (the pane's width less its border and padding).
CAUTION_WIDTH = 30
#: Words before a long clause's first comma that make a statement of their own (a subject, its
#: verb and what it does), kept where the rest of the clause does not fit.
STATEMENT_WORDS = 5
#: Where the full text is, at the end of the caution line; kept on one row.
MORE = "(? more)"

GENERAL_CAUTIONS: tuple[str, ...] = (
    "Molten metal burns, and it explodes on contact with water: preheat and dry every tool, "
    "mould and charge that touches the melt; wear a face shield, leather and flame-resistant "
    "clothing; keep the floor dry.",
    "Fumes from melting, soldering, brazing and fluxes (zinc, cadmium, lead, fluorides) harm "
    "lungs and nerves: work under extraction.",
    "Lead and cadmium are poisons: no eating, drinking or smoking where they are handled; wash "
    "hands; keep dust down; follow the local rules for exposure and waste.",
    "Every number here is an estimate computed from a model. Defer to the alloy's "
    "specification, certified data, local codes and licensed practice.",
)


def caution_line(safety: str) -> str:
    """The line under the status pane for a system's safety note: its first clause ("Lead is
    toxic") and where the full text is; empty where the system has none. A clause longer than
    CAUTION_ROOM loses its remarks in brackets, then what follows its first comma where that
    keeps at least half its words or STATEMENT_WORDS (its main statement: "Molten iron and steel
    explode on contact with water", "Molten iron explodes on contact with water" before a list of
    what else makes it explode; not "Magnesium melts")."""
    if not safety:
        return ""
    for stop in (":", ";", "."):
        safety = safety.split(stop)[0]
    clause = safety.strip()
    if len(f"! {clause} {MORE}") > CAUTION_ROOM:
        clause = re.sub(r"\s*\([^)]*\)", "", clause).strip()
    head = clause.split(",")[0]
    words = len(head.split())
    if len(f"! {clause} {MORE}") > CAUTION_ROOM and (2 * words >= len(clause.split()) or words >= STATEMENT_WORDS):
        clause = head.strip()
    return f"! {clause} {MORE}"


def caution_rows(line: str, width: int = CAUTION_WIDTH) -> str:
    """`line` (caution_line's) broken into rows of `width` cells at its words, its closing
    "(? more)" kept whole on one row (a row ending '(?' above 'more)' reads as a stray mark)."""
    glued = MORE.replace(" ", "\0")
    return "\n".join(textwrap.wrap(line.replace(MORE, glued), width)).replace(glued, MORE)
