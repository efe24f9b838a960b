"""A trend in one line of braille: a few values over time, drawn in a handful of cells.

Each value is a dot, at its place in time across the width (2 dots per cell) and at its height
between the smallest and the largest value (4 dots in a cell's height); consecutive dots are
joined. The line says which way a value went and how far, not its size: the figures are beside
it.
"""

from __future__ import annotations

from collections.abc import Sequence

from rich.text import Text

from .braille import BrailleCanvas


def sparkline(points: Sequence[tuple[float, float]], width: int, style: str = "",
              span: float = 0.0) -> Text:
    """``points`` as (place 0…1 along the width, value) drawn in ``width`` cells; a flat
    series lies along the middle. ``span``: the least range of values the height stands for
    (centred on the values'), so that a change smaller than it stays small on the line.
    No point draws blank cells."""
    canvas = BrailleCanvas(width, 1)
    if not points or width <= 0:
        return canvas.row_text(0) if width > 0 else Text()
    values = [v for _, v in points]
    low, high = min(values), max(values)
    if high - low < span:
        middle = (high + low) / 2
        low, high = middle - span / 2, middle + span / 2
    last_x = canvas.dot_width - 1
    dots = []
    for place, value in points:
        x = round(min(1.0, max(0.0, place)) * last_x)
        share = 0.5 if high == low else (value - low) / (high - low)
        y = round((1 - share) * (canvas.dot_height - 1))
        dots.append((x, y))
    for (x0, y0), (x1, y1) in zip(dots, dots[1:], strict=False):
        canvas.line(x0, y0, x1, y1, style)
    for x, y in dots:
        canvas.dot(x, y, style)
    return canvas.row_text(0)


__all__ = ["sparkline"]
