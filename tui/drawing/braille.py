"""A drawing surface of Unicode braille characters: 2 × 4 dots in every terminal cell.

A braille character (U+2800–U+28FF) has eight dots, each one bit, so a terminal of 80 columns
becomes 160 dots across and four times its rows down: enough for a smooth curve in any terminal
that shows Unicode, with no graphics protocol and no extra package. Each cell has one colour
(the last one drawn into it wins), and a cell can hold a whole character instead of dots (a
marker such as ◆).
"""

from __future__ import annotations

from rich.text import Text

BRAILLE_BASE = 0x2800
_DOT_BITS = ((0x01, 0x08), (0x02, 0x10), (0x04, 0x20), (0x40, 0x80))
"""The bit of each dot, by [row within the cell 0–3][column within the cell 0–1] (the Unicode
braille pattern numbering: dots 1–3 and 7 down the left, 4–6 and 8 down the right)."""


class BrailleCanvas:
    """``width`` × ``height`` cells; dot coordinates run from (0, 0) at the top left to
    (2·width − 1, 4·height − 1) at the bottom right. Dots outside are ignored."""

    def __init__(self, width: int, height: int) -> None:
        self.width = max(0, int(width))
        self.height = max(0, int(height))
        self._bits = [[0] * self.width for _ in range(self.height)]
        self._styles: list[list[str]] = [[""] * self.width for _ in range(self.height)]
        self._marks: dict[tuple[int, int], tuple[str, str]] = {}

    @property
    def dot_width(self) -> int:
        return 2 * self.width

    @property
    def dot_height(self) -> int:
        return 4 * self.height

    def dot(self, x: int, y: int, style: str = "") -> None:
        """Set the dot at (x, y) and give its cell ``style`` (a Rich style)."""
        if 0 <= x < self.dot_width and 0 <= y < self.dot_height:
            col, row = x // 2, y // 4
            self._bits[row][col] |= _DOT_BITS[y % 4][x % 2]
            if style:
                self._styles[row][col] = style

    def line(self, x0: int, y0: int, x1: int, y1: int, style: str = "", every: int = 1) -> None:
        """A straight line of dots from (x0, y0) to (x1, y1) (Bresenham's algorithm);
        ``every`` = 2 draws every other dot (a dotted line)."""
        dx, dy = abs(x1 - x0), -abs(y1 - y0)
        sx, sy = (1 if x0 < x1 else -1), (1 if y0 < y1 else -1)
        err, n = dx + dy, 0
        for _ in range(dx - dy + 1):  # at most that many steps; a safe bound
            if n % every == 0:
                self.dot(x0, y0, style)
            n += 1
            if x0 == x1 and y0 == y1:
                return
            e2 = 2 * err
            if e2 >= dy:
                err += dy
                x0 += sx
            if e2 <= dx:
                err += dx
                y0 += sy

    @property
    def marks(self) -> frozenset[tuple[int, int]]:
        """The cells (col, row) that hold a mark."""
        return frozenset(self._marks)

    def mark(self, col: int, row: int, char: str, style: str = "") -> None:
        """Put ``char`` in the cell (col, row) in place of its dots."""
        if 0 <= col < self.width and 0 <= row < self.height:
            self._marks[(col, row)] = (char, style)

    def row_text(self, row: int) -> Text:
        """Cell row ``row`` as styled text (blank cells as spaces)."""
        out = Text(no_wrap=True)
        for col in range(self.width):
            if (col, row) in self._marks:
                out.append(*self._marks[(col, row)])
            elif bits := self._bits[row][col]:
                out.append(chr(BRAILLE_BASE + bits), self._styles[row][col] or None)
            else:
                out.append(" ")
        return out


__all__ = ["BRAILLE_BASE", "BrailleCanvas"]
