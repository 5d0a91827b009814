"""The reactions view: a table of the system's invariant reactions and melting points."""

from __future__ import annotations

from rich.text import Text
from textual.message import Message
from textual.widgets import DataTable

from ..reaction_rows import ReactionRow


class ReactionsView(DataTable):
    """One row per reaction; Enter on a row asks for the cursor to go there."""

    class Chosen(Message):
        """A row was chosen: move the cursor to its temperature (K) and composition (x_B)."""

        def __init__(self, row: ReactionRow) -> None:
            super().__init__()
            self.row = row

    def __init__(self, *, id: str | None = None) -> None:
        super().__init__(id=id, cursor_type="row", zebra_stripes=False)
        self._rows: list[ReactionRow] = []

    def show_rows(self, rows: list[ReactionRow], composition_heading: str) -> None:
        """Replace the table's rows; `composition_heading` names the unit, e.g. "Sn wt%"."""
        self.clear(columns=True)
        self.add_columns("reaction", "T", f"phases, {composition_heading}")
        self._rows = rows
        for row in rows:
            cells = (Text(row.kind), Text(row.temperature), Text(row.phases))   # phase names as written, never markup
            self.add_row(*cells, height=row.phases.count("\n") + 1)

    def on_data_table_row_selected(self, event: DataTable.RowSelected) -> None:
        event.stop()
        self.post_message(self.Chosen(self._rows[event.cursor_row]))
