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
    FOCUS_MARK = "▶"
    """Leads the header row while the table has the focus (so it shows without colour too);
    the header is then drawn in the theme's accent colour."""

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
        self._draw()

    def on_focus(self) -> None:
        self._draw(focused=True)  # has_focus is set only after this event

    def on_blur(self) -> None:
        self._draw(focused=False)

    def _draw(self, focused: bool | None = None) -> None:
        columns, rows = self.columns, self.rows
        focused = self.has_focus if focused is None else focused
        head = "bold reverse"
        if focused:
            accent = self.app.theme_variables.get("accent")
            head = f"bold reverse {accent}" if accent else head
        # A label may take several lines (``"Flow\nL/s"``: the unit under the name, where
        # the columns are narrow); the header's lines are aligned at the bottom.
        labels = [label.split("\n") for label, _ in columns]
        height = max((len(lines) for lines in labels), default=1)
        labels = [[""] * (height - len(lines)) + lines for lines in labels]
        widths = [max(map(cell_len, lines)) for lines in labels]
        for row in rows:
            for c, cell in enumerate(row):
                widths[c] = max(widths[c], cell_len(str(cell)))
        out = Text(no_wrap=True, overflow="crop")
        for line in range(height):
            if line:
                out.append("\n")
            for c, (_, right) in enumerate(columns):
                label = labels[c][line]
                lead = self.FOCUS_MARK if focused and c == 0 and line == height - 1 else " "
                out.append(lead + (label.rjust(widths[c]) if right else label.ljust(widths[c]))
                           + " ", style=head)
        for row in rows:
            out.append("\n")
            for c, cell in enumerate(row):
                piece = cell if isinstance(cell, Text) else Text(str(cell))
                pad = " " * (widths[c] - cell_len(piece.plain))
                out.append(" " + (pad if columns[c][1] else ""))
                out.append_text(piece)
                out.append(("" if columns[c][1] else pad) + " ")
        shape = (len(rows) + height, sum(widths) + 2 * len(widths))
        # A new layout only when the table's size changes, not for new numbers in it.
        self.query_one(Static).update(out, layout=shape != getattr(self, "_shape", None))
        self._shape = shape

    @property
    def header_lines(self) -> int:
        """How many lines the header takes."""
        return max((label.count("\n") + 1 for label, _ in self.columns), default=1)

    def text_rows(self) -> list[list[str]]:
        """The cells as plain text (what a person reads)."""
        return [[str(cell) for cell in row] for row in self.rows]
