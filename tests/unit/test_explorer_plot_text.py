"""The explorer's fast reader of plotext's coloured text gives what Rich's ANSI decoder gives."""

from rich.text import Text

from ladle.tui.explorer.widgets.plot_text import styled_plot_text


def _style_per_character(text: Text) -> list:
    styles = [None] * len(text.plain)
    for span in text.spans:
        for index in range(span.start, span.end):
            styles[index] = str(span.style)
    return styles


def test_same_text_and_styles_as_rich():
    sample = ("   ┌────┐\x1b[0m\n400┤\x1b[0m\x1b[38;5;12m⠑⢤\x1b[0m  \x1b[0m"
              "\x1b[48;5;15m\x1b[38;5;10mliquid\x1b[0m│\x1b[0m\n"
              "\x1b[38;2;10;20;30m\x1b[48;2;1;2;3m x \x1b[0mend")
    ours, rich = styled_plot_text(sample), Text.from_ansi(sample)
    assert ours.plain == rich.plain
    assert _style_per_character(ours) == _style_per_character(rich)
