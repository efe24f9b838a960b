"""A line plot in the terminal: curves drawn in braille dots, axes with tick labels and units,
one marked point with its label, and a legend; it fills whatever size it is given.

The Split screen draws the system curve with it (pressure drop against the total flow and each
branch's flow, the operating point marked). The data arrive already in display units: the
plot knows nothing of pint or of the site.
"""

from __future__ import annotations

import math
from collections.abc import Callable, Sequence
from dataclasses import dataclass

from rich.cells import cell_len
from rich.text import Text
from textual.widget import Widget

from ..drawing.braille import BrailleCanvas


@dataclass(frozen=True)
class PlotStyles:
    """The plot's own colours: the guides to the operating point, the axes, the point. The
    defaults are plain (any terminal); the widget passes the theme's
    (:mod:`branchwise.tui.theme`)."""

    guide: str = "dim"
    axis: str = ""
    point: str = "bold"


PLAIN = PlotStyles()
POINT_CHAR = "◆"
MARKERS = ("●", "○", "▲", "△", "■", "□", "+", "×")
"""One glyph per series, set on its line and in the legend, so the lines read apart without
colour too (after the eighth series the glyphs come round again)."""


@dataclass(frozen=True)
class Series:
    """One curve: x and y in display units, in drawing order, and its Rich style."""

    label: str
    x: Sequence[float]
    y: Sequence[float]
    style: str


@dataclass(frozen=True)
class PlotData:
    """What to draw. The series are drawn in order (the last one on top); ``point`` (x, y)
    is marked with ◆ and dotted guides to both axes, and ``point_label`` says what it is."""

    series: tuple[Series, ...]
    x_title: str
    y_title: str
    point: tuple[float, float] | None = None
    point_label: str = ""


def axis_range(values: Sequence[float]) -> tuple[float, float]:
    """The span an axis shows: from zero (or the lowest value below it) to a little above the
    highest value, never empty."""
    low, high = min(0.0, *values), max(0.0, *values)
    if high <= low:
        high = low + 1.0
    return low, high + 0.04 * (high - low)


def nice_ticks(low: float, high: float, most: int) -> tuple[float, float, float]:
    """(first tick, last tick, step) inside [low, high], at most about ``most`` steps of
    1, 2, 2.5 or 5 × 10ⁿ: the round numbers a person reads off an axis."""
    raw = (high - low) / max(1, most)
    power = 10.0 ** math.floor(math.log10(raw))
    step = next(m * power for m in (1, 2, 2.5, 5, 10) if m * power >= raw * (1 - 1e-9))
    first = math.ceil(low / step - 1e-9) * step
    last = math.floor(high / step + 1e-9) * step
    return first, last, step


def tick_text(value: float, step: float) -> str:
    """A tick value with just the decimals its step needs (2.5 needs one, 20 none)."""
    decimals = max(0, -math.floor(math.log10(step) + 1e-9))
    if not math.isclose(round(step, decimals), step, rel_tol=1e-9):
        decimals += 1
    text = f"{value:.{decimals}f}"
    return "0" if float(text) == 0 else text


def _ticks(first: float, last: float, step: float) -> list[float]:
    count = int(round((last - first) / step))
    return [first + i * step for i in range(count + 1)]


def draw(data: PlotData | None, width: int, height: int, empty: str = "",
         styles: PlotStyles = PLAIN) -> Text:
    """The whole plot as ``height`` lines of at most ``width`` cells."""
    if data is None or width < 20 or height < 6:
        return Text(empty or "(no room for the plot)", style="dim")
    lines: list[Text] = []
    if data.point_label:
        lines.append(Text.assemble((f"{POINT_CHAR} ", styles.point), (data.point_label, "bold")))
    lines += _legend(data, width, styles.axis)
    xs = [v for s in data.series for v in s.x if math.isfinite(v)]
    ys = [v for s in data.series for v in s.y if math.isfinite(v)]
    if data.point is not None:
        xs.append(data.point[0])
        ys.append(data.point[1])
    rows = height - len(lines) - 2  # the x axis and its labels below the plot
    if rows < 3 or not xs:
        lines.append(Text(empty or "(no room for the plot)", style="dim"))
        return Text("\n").join(lines[:height])
    y0, y1 = axis_range(ys)
    y_ticks = _ticks(*nice_ticks(y0, y1, max(2, rows // 2)))
    ystep = y_ticks[1] - y_ticks[0] if len(y_ticks) > 1 else 1.0
    gutter = max(cell_len(tick_text(v, ystep)) for v in y_ticks) + 1
    cols = width - gutter - 1
    x0, x1 = axis_range(xs)
    canvas = BrailleCanvas(cols, rows)

    def px(x: float) -> int:
        return round((x - x0) / (x1 - x0) * (canvas.dot_width - 1))

    def py(y: float) -> int:
        return round((y1 - y) / (y1 - y0) * (canvas.dot_height - 1))

    if data.point is not None:
        ox, oy = px(data.point[0]), py(data.point[1])
        canvas.line(ox, canvas.dot_height - 1, ox, oy, styles.guide, every=2)
        canvas.line(0, oy, canvas.dot_width - 1, oy, styles.guide, every=2)
    for s in data.series:
        points = [(px(x), py(y)) for x, y in zip(s.x, s.y, strict=False)
                  if math.isfinite(x) and math.isfinite(y)]
        for (a, b), (c, d) in zip(points, points[1:], strict=False):
            canvas.line(a, b, c, d, s.style)
        if len(points) == 1:
            canvas.dot(*points[0], s.style)
    for k, s in enumerate(data.series):
        points = [(px(x), py(y)) for x, y in zip(s.x, s.y, strict=False)
                  if math.isfinite(x) and math.isfinite(y)]
        _mark_series(canvas, points, MARKERS[k % len(MARKERS)], s.style,
                     (k + 1) / (len(data.series) + 1))
    if data.point is not None:
        canvas.mark(ox // 2, oy // 4, POINT_CHAR, styles.point)

    labels = {py(v) // 4: tick_text(v, ystep) for v in y_ticks}
    for row in range(rows):
        label = labels.get(row)
        line = Text((label or "").rjust(gutter - 1) + " ", style=styles.axis, no_wrap=True)
        line.append("┤" if label is not None else "│", styles.axis)
        line.append_text(canvas.row_text(row))
        lines.append(line)
    lines += _x_axis(nice_ticks(x0, x1, max(2, cols // 10)), gutter, cols, px, data.x_title,
                     styles.axis)
    return Text("\n").join(lines)


def _mark_series(canvas: BrailleCanvas, points: list[tuple[int, int]], marker: str,
                 style: str, where: float) -> None:
    """Set ``marker`` on a series' line: at the point ``where`` (0…1) along it, staggered from
    one series to the next so that marks on lines that run close do not cover each other,
    and at its right end; never over another series' mark (the operating point, drawn
    after, goes over it)."""
    if not points:
        return
    ends = sorted(points)
    for x, y in {ends[round(where * (len(ends) - 1))], ends[-1]}:
        at = (x // 2, y // 4)
        if 0 <= at[0] < canvas.width and 0 <= at[1] < canvas.height and \
                at not in canvas.marks:
            canvas.mark(*at, marker, f"bold {style}")


def _legend(data: PlotData, width: int, axis: str = "") -> list[Text]:
    """The y-axis title, then one entry per series, with its line's glyph; on two lines at
    most (then "…")."""
    lines = [Text(data.y_title, style=f"bold {axis}".strip(), no_wrap=True)]
    for k, s in enumerate(data.series):
        marker = MARKERS[k % len(MARKERS)]
        entry = Text.assemble((f"━{marker}━ ", f"bold {s.style}"), (s.label, ""))
        if cell_len(lines[-1].plain) + 2 + entry.cell_len > width:
            if len(lines) == 2:
                lines[-1].append(" …")
                break
            lines.append(Text(no_wrap=True))
        else:
            lines[-1].append("  ")
        lines[-1].append_text(entry)
    return lines


def _x_axis(ticks: tuple[float, float, float], gutter: int, cols: int,
            px: Callable[[float], int],
            title: str, axis: str = "") -> list[Text]:
    rule = ["─"] * cols
    under = [" "] * (gutter + 1 + cols)
    room = gutter + 1 + cols - cell_len(title) - 1  # the title keeps the right end
    step = ticks[2]
    for value in _ticks(*ticks):
        col = px(value) // 2
        rule[min(col, cols - 1)] = "┬"
        text = tick_text(value, step)
        start = max(0, gutter + 1 + col - len(text) // 2)
        end = start + len(text)
        if end <= room and all(c == " " for c in under[max(0, start - 1):end + 1]):
            under[start:end] = list(text)
    under[room + 1:] = list(title)
    return [Text(" " * gutter + "└" + "".join(rule), style=axis, no_wrap=True),
            Text("".join(under), style=axis, no_wrap=True)]


class CurvePlot(Widget):
    """Draws a :class:`PlotData` to fit its own size; :meth:`show` replaces what is drawn."""

    DEFAULT_CSS = """
    CurvePlot { height: 1fr; min-height: 8; padding: 0 1; }
    """

    def __init__(self, *, id: str | None = None) -> None:
        super().__init__(id=id)
        self.data: PlotData | None = None
        self.empty = ""

    def show(self, data: PlotData | None, empty: str = "") -> None:
        """Draw ``data`` (None: the ``empty`` message instead)."""
        if data is not self.data or empty != self.empty:
            self.data, self.empty = data, empty
            self.refresh()

    def render(self) -> Text:
        from ..theme import colour, muted

        size = self.content_size
        styles = PlotStyles(guide=muted(self.app), axis=muted(self.app, 0.25),
                            point=f"bold {colour(self.app, 'text-error')}".strip())
        return draw(self.data, size.width, size.height, self.empty, styles)


__all__ = ["CurvePlot", "PlotData", "PlotStyles", "Series", "axis_range", "draw", "nice_ticks",
           "tick_text"]
