"""A read-only table drawn as one block of text: cheap to redraw on every keystroke.

The results change as a whole after every solve; a DataTable would re-render each of its cells
every time, which at twenty branches costs more than the solve itself. This draws the rows
once into a :class:`rich.text.Text` with aligned columns, inside a container that scrolls
sideways on a narrow terminal.
"""

from __future__ import annotations

from rich.cells import cell_len
from rich.text import Text
from textual.containers import ScrollableContainer
from textual.widgets import Static

Cell = str | Text


class TextTable(ScrollableContainer, can_focus=True):
    """Columns (label, right-aligned?) and rows of cells; ``rows`` keeps what is shown."""

    DEFAULT_CSS = """
    TextTable { height: 1fr; overflow-x: auto; overflow-y: auto; }
    TextTable > Static { width: auto; }
    TextTable:focus > Static { background: $boost; }
    """

    def __init__(self, *, id: str | None = None) -> None:
        super().__init__(id=id)
        self.columns: list[tuple[str, bool]] = []
        self.rows: list[list[Cell]] = []

    def compose(self):
        yield Static("", markup=False)

    def show(self, columns: list[tuple[str, bool]], rows: list[list[Cell]]) -> None:
        """Draw ``rows`` under ``columns`` (label, right-aligned)."""
        if columns == self.columns and [[str(c) for c in r] for r in rows] == [
                [str(c) for c in r] for r in self.rows]:
            return
        self.columns, self.rows = columns, rows
        widths = [cell_len(label) for label, _ in columns]
        for row in rows:
            for c, cell in enumerate(row):
                widths[c] = max(widths[c], cell_len(str(cell)))
        out = Text(no_wrap=True, overflow="crop")
        for c, (label, right) in enumerate(columns):
            out.append(" " + (label.rjust(widths[c]) if right else label.ljust(widths[c])) + " ",
                       style="bold reverse")
        for row in rows:
            out.append("\n")
            for c, cell in enumerate(row):
                piece = cell if isinstance(cell, Text) else Text(str(cell))
                pad = " " * (widths[c] - cell_len(piece.plain))
                out.append(" " + (pad if columns[c][1] else ""))
                out.append_text(piece)
                out.append(("" if columns[c][1] else pad) + " ")
        shape = (len(rows), sum(widths) + 2 * len(widths))
        # A new layout only when the table's size changes, not for new numbers in it.
        self.query_one(Static).update(out, layout=shape != getattr(self, "_shape", None))
        self._shape = shape

    def text_rows(self) -> list[list[str]]:
        """The cells as plain text (what a person reads)."""
        return [[str(cell) for cell in row] for row in self.rows]
