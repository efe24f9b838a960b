"""The branch table of the Branches screen: a DataTable that keeps the name column in sight."""

from __future__ import annotations

from rich.cells import cell_len
from textual.coordinate import Coordinate
from textual.geometry import Size
from textual.widgets import DataTable


class BranchTable(DataTable[object]):
    """The branch table: scrolled sideways by whole columns, so that no cut-off column sits
    beside the fixed name column (a lone ``8`` there reads as a value)."""

    _shape: tuple[list[tuple[str, str]], list[str]] | None = None
    """The column keys and labels and the row keys shown: a redraw of the same shape updates
    only the cells that changed."""

    def show(self, columns: list[tuple[str, str]], rows: list[tuple[str, list[object]]]) -> None:
        """Show ``rows`` (key, cells) under ``columns`` (key, label).

        When the columns and row keys are those already shown, only the cells that changed are
        updated: rebuilding the table on every keystroke would make typing lag.
        """
        shape = ([(k, str(label)) for k, label in columns], [key for key, _ in rows])
        if self._shape != shape:
            row, column = self.cursor_coordinate
            self.clear(columns=True)
            for key, label in columns:
                self.add_column(label, key=key)
            for key, cells in rows:
                self.add_row(*cells, key=key)
            self._shape = shape
            if rows:
                self.move_cursor(row=min(row, len(rows) - 1), column=column, animate=False)
            return
        widths = [column.content_width for column in self.ordered_columns]
        for r, (_, cells) in enumerate(rows):
            old = self.get_row_at(r)
            for c, cell in enumerate(cells):
                if str(old[c]) != str(cell) or _style(old[c]) != _style(cell):
                    # Widening a column is cheap; narrowing it measures the whole column again,
                    # so a column only ever grows while the table keeps its shape.
                    wider = cell_len(str(cell)) > widths[c]
                    self.update_cell_at(Coordinate(r, c), cell, update_width=wider)

    def validate_virtual_size(self, size: Size) -> Size:
        # Room to scroll past the last column by up to one column, so that a scroll to a
        # column's edge is never held back (and a column cut) at the end of the table. Only
        # when the table is wider than the screen: a table that fits does not scroll.
        columns = self.ordered_columns[self.fixed_columns:]
        if not columns or size.width <= self.scrollable_content_region.width:
            return size
        return Size(size.width + max(c.get_render_width(self) for c in columns), size.height)

    def _scroll_cursor_into_view(self, animate: bool = False) -> None:
        super()._scroll_cursor_into_view(animate=False)
        columns = self.ordered_columns
        if not self.fixed_columns or not self.scroll_x:
            return
        start = 0
        for column in columns[self.fixed_columns:]:
            if start >= self.scroll_x:
                break
            start += column.get_render_width(self)
        if start != self.scroll_x:
            self.scroll_to(x=start, animate=False, force=True)


def _style(cell: object) -> str:
    return str(getattr(cell, "style", ""))
