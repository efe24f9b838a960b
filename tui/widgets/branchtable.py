"""The branch table of the Branches screen: a DataTable that keeps the name column in sight."""

from __future__ import annotations

from textual.geometry import Size
from textual.widgets import DataTable


class BranchTable(DataTable):
    """The branch table: scrolled sideways by whole columns, so that no cut-off column sits
    beside the fixed name column (a lone ``8`` there reads as a value)."""

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
