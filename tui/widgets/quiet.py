"""Setting a widget's value from the site without it reporting the change as an edit."""

from __future__ import annotations

from typing import TYPE_CHECKING

from rich.cells import cell_len
from textual.coordinate import Coordinate
from textual.widgets import Input, Static

if TYPE_CHECKING:
    from textual.widgets import DataTable


def show_text(box: Input, text: str) -> None:
    """Put ``text`` in ``box`` unless the person is typing there."""
    if box.value != text and not box.has_focus:
        with box.prevent(Input.Changed):
            box.value = text


def fill_table(table: DataTable, columns: list[tuple[str, str]],
               rows: list[tuple[str, list[object]]]) -> None:
    """Show ``rows`` (key, cells) under ``columns`` (key, label).

    When the columns and row keys are those already shown, only the cells that changed are
    updated: rebuilding the table on every keystroke would make typing lag.
    """
    shape = ([(k, str(label)) for k, label in columns], [key for key, _ in rows])
    if getattr(table, "_bw_shape", None) != shape:
        row, column = table.cursor_coordinate
        table.clear(columns=True)
        for key, label in columns:
            table.add_column(label, key=key)
        for key, cells in rows:
            table.add_row(*cells, key=key)
        table._bw_shape = shape  # type: ignore[attr-defined]
        if rows:
            table.move_cursor(row=min(row, len(rows) - 1), column=column, animate=False)
        return
    widths = [column.content_width for column in table.ordered_columns]
    for r, (_, cells) in enumerate(rows):
        old = table.get_row_at(r)
        for c, cell in enumerate(cells):
            if str(old[c]) != str(cell) or _style(old[c]) != _style(cell):
                # Widening a column is cheap; narrowing it measures the whole column again,
                # so a column only ever grows while the table keeps its shape.
                wider = cell_len(str(cell)) > widths[c]
                table.update_cell_at(Coordinate(r, c), cell, update_width=wider)


def _style(cell: object) -> str:
    return str(getattr(cell, "style", ""))


def put(static: Static, content: object, *, layout: bool = True) -> None:
    """``static.update(content)`` only when the content changes (an update lays the screen
    out again, which is the slow part of redrawing while someone types)."""
    if static.content != content:
        static.update(content, layout=layout)  # type: ignore[arg-type]
