"""A read-only table drawn line by line: only the rows in sight are drawn, only changed rows
again.

The results change after every solve; a DataTable would re-render each of its cells every time,
and one block of text holding every row is drawn whole (at two hundred branches that costs more
than the solve). This keeps the rows and draws a line of aligned columns when it comes into
view, and after a new answer redraws only the rows whose text changed; it scrolls sideways on a
narrow terminal and down on a long site.
"""

from __future__ import annotations

from rich.cells import cell_len
from rich.text import Text
from textual.geometry import Size
from textual.scroll_view import ScrollView
from textual.strip import Strip

Cell = str | Text


class TextTable(ScrollView, can_focus=True):
    """Columns (label, right-aligned?) and rows of cells; ``rows`` keeps what is shown."""

    DEFAULT_CSS = """
    TextTable { height: 1fr; overflow-x: auto; overflow-y: auto; }
    TextTable > .text-table--focused { background: $boost; }
    """
    COMPONENT_CLASSES = {"text-table--focused"}
    FOCUS_MARK = "▶"
    """Leads the header row while the table has the focus (so it shows without colour too);
    the header is then drawn in the theme's accent colour."""

    def __init__(self, *, id: str | None = None) -> None:
        super().__init__(id=id)
        self.columns: list[tuple[str, bool]] = []
        self.rows: list[list[Cell]] = []
        self._plain: list[list[str]] = []
        self._labels: list[list[str]] = []
        self._widths: list[int] = []
        self._strips: dict[int, Strip] = {}
        """Lines drawn (header lines first, then the rows), by index, until they change."""
        self._focused = False

    def show(self, columns: list[tuple[str, bool]], rows: list[list[Cell]]) -> None:
        """Draw ``rows`` under ``columns`` (label, right-aligned)."""
        plain = [[str(c) for c in r] for r in rows]
        if columns == self.columns and plain == self._plain:
            return
        same_shape = columns == self.columns and len(plain) == len(self._plain)
        old_plain, old_widths = self._plain, self._widths
        self.columns, self.rows, self._plain = columns, rows, plain
        self._measure()
        if same_shape and self._widths == old_widths:
            # The same columns and widths: only the rows whose text changed are drawn again.
            height = self.header_lines
            changed = False
            for r, (new, old) in enumerate(zip(plain, old_plain, strict=True)):
                if new != old:
                    self._strips.pop(height + r, None)
                    changed = True
            if changed:
                self.refresh()  # one repaint of the lines in sight (drawn again if dropped)
            return
        self._strips.clear()
        self.virtual_size = Size(sum(self._widths) + 2 * len(self._widths),
                                 len(rows) + self.header_lines)
        self.refresh()

    def _measure(self) -> None:
        # A label may take several lines (``"Flow\nL/s"``: the unit under the name, where
        # the columns are narrow); the header's lines are aligned at the bottom.
        labels = [label.split("\n") for label, _ in self.columns]
        height = max((len(lines) for lines in labels), default=1)
        self._labels = [[""] * (height - len(lines)) + lines for lines in labels]
        widths = [max(map(cell_len, lines)) for lines in self._labels]
        for row in self._plain:
            for c, cell in enumerate(row):
                widths[c] = max(widths[c], cell_len(cell))
        self._widths = widths

    def on_focus(self) -> None:
        self._focus_changed(True)  # has_focus is set only after this event

    def on_blur(self) -> None:
        self._focus_changed(False)

    def _focus_changed(self, focused: bool) -> None:
        self._focused = focused
        self._strips.clear()
        self.refresh()

    def notify_style_update(self) -> None:
        super().notify_style_update()
        self._strips.clear()  # a new theme: new colours

    def render_line(self, y: int) -> Strip:
        scroll_x, scroll_y = self.scroll_offset
        index = scroll_y + y
        width = self.size.width
        base = self.rich_style
        if index >= len(self.rows) + self.header_lines:
            return Strip.blank(width, base)
        strip = self._strips.get(index)
        if strip is None:
            style = base
            if self._focused:
                style = base + self.get_component_rich_style("text-table--focused")
            text = self._line(index)
            strip = Strip(text.render(self.app.console), text.cell_len).apply_style(style)
            self._strips[index] = strip
        return strip.crop_extend(scroll_x, scroll_x + width, base).apply_offsets(scroll_x, index)

    def _line(self, index: int) -> Text:
        """Line ``index`` of the table (the header's lines first) as text."""
        columns, widths = self.columns, self._widths
        height = self.header_lines
        out = Text(no_wrap=True, overflow="crop", end="")
        if index < height:
            head = "bold reverse"
            if self._focused:
                accent = self.app.theme_variables.get("accent")
                head = f"bold reverse {accent}" if accent else head
            for c, (_, right) in enumerate(columns):
                label = self._labels[c][index]
                lead = self.FOCUS_MARK if self._focused and c == 0 and index == height - 1 else " "
                out.append(lead + (label.rjust(widths[c]) if right else label.ljust(widths[c]))
                           + " ", style=head)
            return out
        for c, cell in enumerate(self.rows[index - height]):
            piece = cell if isinstance(cell, Text) else Text(str(cell))
            pad = " " * (widths[c] - cell_len(piece.plain))
            out.append(" " + (pad if columns[c][1] else ""))
            out.append_text(piece)
            out.append(("" if columns[c][1] else pad) + " ")
        return out

    @property
    def header_lines(self) -> int:
        """How many lines the header takes."""
        return max((label.count("\n") + 1 for label, _ in self.columns), default=1)

    def text_rows(self) -> list[list[str]]:
        """The cells as plain text (what a person reads)."""
        return [[str(cell) for cell in row] for row in self.rows]


