"""Every key of the explorer in one table: the bindings, the key bar and the help screen all
come from here, so they cannot disagree."""

from __future__ import annotations

from dataclasses import dataclass

from .glyphs import Glyphs


@dataclass(frozen=True)
class KeyUse:
    """One use of one or more keys.

    `keys`: Textual key names, comma-separated; `label`: how the help names the keys, with
    {up} {down} {left} {right} standing for the arrow glyphs; `bar`: the short form on the key
    bar ("" to leave it off the bar).
    """

    keys: str
    action: str
    label: str
    description: str
    bar: str = ""


MAIN_KEYS: tuple[KeyUse, ...] = (
    KeyUse("up,k", "move(1, 0)", "{up} k", "hotter by one step", "{left}{right}{up}{down}"),
    KeyUse("down,j", "move(-1, 0)", "{down} j", "colder by one step"),
    KeyUse("right,l", "move(0, 1)", "{right} l", "more of the second element by one step"),
    KeyUse("left,h", "move(0, -1)", "{left} h", "less of the second element by one step"),
    KeyUse("shift+up,K", "move(1, 0, True)", "shift+{up} K", "hotter by a tenth of a step"),
    KeyUse("shift+down,J", "move(-1, 0, True)", "shift+{down} J", "colder by a tenth of a step"),
    KeyUse("shift+right,L", "move(0, 1, True)", "shift+{right} L",
           "more of the second element by a tenth of a step"),
    KeyUse("shift+left,H", "move(0, -1, True)", "shift+{left} H",
           "less of the second element by a tenth of a step"),
    KeyUse("g", "go_to", "g", "go to a typed point: 650C 12wt%, 923K 20at%, {element}=12wt%",
           "g go"),
    KeyUse("1", "view('diagram')", "1", "diagram view", "1-4 view"),
    KeyUse("2", "view('energy')", "2", "free-energy view at the cursor's temperature"),
    KeyUse("3", "view('reactions')", "3", "reactions view (Enter on a row moves the cursor)"),
    KeyUse("4", "view('cooling')", "4",
           "cooling view: how the cursor's alloy freezes, at equilibrium and by Scheil"),
    KeyUse("s", "app.systems", "s", "choose another system", "s system"),
    KeyUse("u", "composition_unit", "u", "compositions in wt% or at%", "u t unit"),
    KeyUse("t", "temperature_unit", "t", "temperatures in C, K or F"),
    KeyUse("plus,equals_sign", "zoom(True)", "+", "zoom in about the cursor", "+-0 zoom"),
    KeyUse("minus", "zoom(False)", "-", "zoom out"),
    KeyUse("0", "whole", "0", "show the whole system again"),
    KeyUse("w", "write_point", "w", "write this point's result as JSON to a file (and copy it)",
           "w p save"),
    KeyUse("p", "write_screen", "p", "save the screen as text and SVG files"),
    KeyUse("question_mark,f1", "help", "? F1", "this help", "? help"),
    KeyUse("q", "app.quit", "q", "quit (the point and units are remembered)", "q quit"),
)


def key_label(use: KeyUse, glyphs: Glyphs, text: str | None = None) -> str:
    """A key's label (or its bar text) with the arrow glyphs filled in."""
    return (use.label if text is None else text).format(
        up=glyphs.up, down=glyphs.down, left=glyphs.left, right=glyphs.right)


def key_bar_text(glyphs: Glyphs, width: int) -> str:
    """The one-line key bar for a terminal `width` cells wide: the short forms, two spaces
    apart, in the table's order; those that do not fit are left off (help and quit never)."""
    items = [key_label(use, glyphs, use.bar) for use in MAIN_KEYS if use.bar]
    *optional, help_item, quit_item = items
    chosen: list[str] = []
    room = width - 2 - len(help_item) - len(quit_item) - 4
    for item in optional:
        if len(item) + 2 <= room:
            chosen.append(item)
            room -= len(item) + 2
    return " " + "  ".join(chosen + [help_item, quit_item])


def help_rows(glyphs: Glyphs, element: str) -> list[tuple[str, str]]:
    """(keys, what they do) for every key, in the table's order; examples of a typed point
    name `element` (the open system's second element)."""
    return [(key_label(use, glyphs), use.description.replace("{element}", element))
            for use in MAIN_KEYS]
