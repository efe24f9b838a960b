"""Charts as SVG text, for the HTML walkdown report and ``--curve curve.svg``: the split as
horizontal bars (with the P5–P95 band as a whisker when there is one) and the system curve.

Plain SVG 1.1 with its styles as attributes: it shows in any browser, prints as vectors, and
needs no script, font file or network. Every text put in is escaped.
"""

from __future__ import annotations

import math
from dataclasses import dataclass
from html import escape

from ..numerics.curve import SystemCurve
from ..units import Units, format_number, units_for

FONT = "font-family=\"Helvetica, Arial, sans-serif\""
INK, GRID, TOTAL = "#1f2933", "#c7ccd1", "#1f2933"
SERIES = ("#1b6fb5", "#c25e00", "#2e8540", "#8e3fa8", "#b0005a", "#00838f", "#6d5d00",
          "#4a5a9c")
"""Colours that stay apart on paper and for the common colour-vision deficiencies (a blue,
orange, green, purple… sequence, darkened so that it prints on white)."""


def _t(text: str) -> str:
    return escape(text, quote=True)


@dataclass(frozen=True)
class Bar:
    """One branch in the split: its label, flow and share in the reader's unit, and the
    P5–P95 band of its flow (None without one)."""

    label: str
    value: float
    text: str
    band: tuple[float, float] | None = None


def bars_svg(bars: list[Bar], unit: str, width: int = 640, title: str = "") -> str:
    """Horizontal bars, one per branch, scaled to the largest flow (or band end); the value
    as text beside each bar; a reverse flow is drawn leftwards from the axis."""
    label_w, row_h, top = 170, 26, 28 if title else 8
    right = 150
    plot_w = width - label_w - right
    ends = [abs(b.value) for b in bars] + [abs(v) for b in bars if b.band for v in b.band]
    scale = max([e for e in ends if math.isfinite(e)] + [1e-30])
    negative = any(b.value < 0 or (b.band and min(b.band) < 0) for b in bars)
    zero = label_w + (plot_w / 2 if negative else 0)
    span = plot_w / 2 if negative else plot_w
    height = top + row_h * len(bars) + 26
    out = [f'<svg xmlns="http://www.w3.org/2000/svg" viewBox="0 0 {width} {height}" '
           f'width="100%" role="img" {FONT} font-size="12">']
    if title:
        out.append(f'<title>{_t(title)}</title>')
        out.append(f'<text x="0" y="16" font-weight="bold" fill="{INK}">{_t(title)}</text>')
    for i, b in enumerate(bars):
        y = top + i * row_h
        colour = SERIES[i % len(SERIES)]
        length = span * (abs(b.value) / scale if math.isfinite(b.value) else 0.0)
        x = zero - length if b.value < 0 else zero
        out.append(f'<text x="{label_w - 8}" y="{y + 17}" text-anchor="end" fill="{INK}">'
                   f'{_t(_short(b.label, 26))}</text>')
        out.append(f'<rect x="{x:.2f}" y="{y + 5}" width="{length:.2f}" height="16" '
                   f'fill="{colour}"><title>{_t(b.label)}: {_t(b.text)}</title></rect>')
        if b.band is not None and all(math.isfinite(v) for v in b.band):
            lo, hi = (zero + span * v / scale for v in sorted(b.band))
            out.append(f'<path d="M{lo:.2f} {y + 13}H{hi:.2f}M{lo:.2f} {y + 8}V{y + 18}'
                       f'M{hi:.2f} {y + 8}V{y + 18}" stroke="{INK}" stroke-width="1.5" '
                       'fill="none"/>')
        end = max(x + length, zero) + 6
        if b.band is not None:
            end = max(end, zero + span * max(b.band) / scale + 6)
        out.append(f'<text x="{end:.2f}" y="{y + 17}" fill="{INK}">{_t(b.text)}</text>')
    axis_y = top + row_h * len(bars) + 4
    out.append(f'<path d="M{zero:.2f} {top}V{axis_y}" stroke="{INK}" stroke-width="1"/>')
    out.append(f'<text x="{zero:.2f}" y="{axis_y + 16}" fill="{INK}" font-size="11">'
               f'0 {_t(unit)}</text>')
    out.append("</svg>")
    return "\n".join(out)


def _short(text: str, n: int) -> str:
    return text if len(text) <= n else text[: n - 1] + "…"


def nice_step(span: float, ticks: int = 5) -> float:
    """A round step (1, 2, 2.5 or 5 × 10ⁿ) giving about ``ticks`` intervals over ``span``."""
    if not math.isfinite(span) or span <= 0:
        return 1.0
    raw = span / ticks
    power = 10.0 ** math.floor(math.log10(raw))
    for m in (1.0, 2.0, 2.5, 5.0, 10.0):
        if raw <= m * power * (1 + 1e-9):
            return m * power
    return 10.0 * power


def _ticks(high: float) -> list[float]:
    step = nice_step(high)
    n = int(math.floor(high / step + 1e-9))
    return [k * step for k in range(n + 1)]


def curve_svg(curve: SystemCurve, reader: Units | str = "si", width: int = 640,
              height: int = 400, title: str = "System curve", standalone: bool = False) -> str:
    """The pressure drop against the total flow and against each branch's flow, the operating
    point marked, in the reader's units. ``standalone``: with an XML declaration, for a file
    of its own (``--curve curve.svg``)."""
    u = units_for(reader)
    flow_u, dp_u = u.label("flow"), u.label("pressure")
    totals = [u.value(float(q), "flow") for q in curve.total_flow]
    dps = [u.value(float(p), "pressure") for p in curve.pressure_drop]
    branches = [[u.value(float(row[j]), "flow") for row in curve.branch_flows]
                for j in range(len(curve.branch_names))]
    left, right, top, bottom = 70, 20, 36, 80 + 16 * ((len(branches) + 2) // 3)
    pw, ph = width - left - right, height - top - bottom
    finite = [v for v in totals + [v for b in branches for v in b] if math.isfinite(v)]
    x_lo = min([0.0, *finite])
    x_hi = max([*finite, 1e-30])
    y_vals = [v for v in dps if math.isfinite(v)]
    y_lo, y_hi = min([0.0, *y_vals]), max([*y_vals, 1e-30])
    x_ticks, y_ticks = _ticks(x_hi), _ticks(y_hi)
    x_hi, y_hi = max(x_hi, x_ticks[-1]), max(y_hi, y_ticks[-1])

    def px(v: float) -> float:
        return left + pw * (v - x_lo) / (x_hi - x_lo)

    def py(v: float) -> float:
        return top + ph * (1 - (v - y_lo) / (y_hi - y_lo))

    out = []
    if standalone:
        out.append('<?xml version="1.0" encoding="UTF-8"?>')
    size = f'width="{width}" height="{height}"' if standalone else 'width="100%"'
    out.append(f'<svg xmlns="http://www.w3.org/2000/svg" viewBox="0 0 {width} {height}" '
               f'{size} role="img" {FONT} font-size="12">')
    out.append(f"<title>{_t(title)}</title>")
    if standalone:
        out.append(f'<rect width="{width}" height="{height}" fill="white"/>')
    out.append(f'<text x="{left}" y="20" font-weight="bold" fill="{INK}">'
               f"{_t(_short(title, 52))}</text>")
    for v in x_ticks:
        out.append(f'<path d="M{px(v):.2f} {top}V{top + ph}" stroke="{GRID}" stroke-width="0.6"/>')
        out.append(f'<text x="{px(v):.2f}" y="{top + ph + 16}" text-anchor="middle" '
                   f'fill="{INK}" font-size="11">{_t(format_number(v, 3))}</text>')
    for v in y_ticks:
        out.append(f'<path d="M{left} {py(v):.2f}H{left + pw}" stroke="{GRID}" '
                   'stroke-width="0.6"/>')
        out.append(f'<text x="{left - 6}" y="{py(v) + 4:.2f}" text-anchor="end" '
                   f'fill="{INK}" font-size="11">{_t(format_number(v, 3))}</text>')
    out.append(f'<path d="M{left} {top}V{top + ph}H{left + pw}" stroke="{INK}" '
               'stroke-width="1" fill="none"/>')
    out.append(f'<text x="{left + pw / 2:.2f}" y="{top + ph + 34}" text-anchor="middle" '
               f'fill="{INK}">Flow ({_t(flow_u)})</text>')
    out.append(f'<text transform="translate(16 {top + ph / 2:.2f}) rotate(-90)" '
               f'text-anchor="middle" fill="{INK}">Pressure drop ({_t(dp_u)})</text>')
    series = [("Total", totals, TOTAL, "2.4")]
    series += [(name, branches[j], SERIES[j % len(SERIES)], "1.6")
               for j, name in enumerate(curve.branch_names)]
    for name, xs, colour, stroke in series:
        points = [(px(x), py(y)) for x, y in zip(xs, dps, strict=True)
                  if math.isfinite(x) and math.isfinite(y)]
        if len(points) > 1:
            d = "M" + " L".join(f"{a:.2f} {b:.2f}" for a, b in points)
            out.append(f'<path d="{d}" stroke="{colour}" stroke-width="{stroke}" fill="none">'
                       f"<title>{_t(name)}</title></path>")
    k = curve.operating_index
    if k is not None:
        for _name, xs, colour, _ in series:
            if math.isfinite(xs[k]) and math.isfinite(dps[k]):
                out.append(f'<circle cx="{px(xs[k]):.2f}" cy="{py(dps[k]):.2f}" r="4" '
                           f'fill="white" stroke="{colour}" stroke-width="2"/>')
        out.append(f'<text x="{left + pw}" y="20" text-anchor="end" fill="{INK}" '
                   f'font-size="11">○ operating point: {_t(format_number(totals[k]))} '
                   f'{_t(flow_u)}, {_t(format_number(dps[k]))} {_t(dp_u)}</text>')
    legend_y = top + ph + 52
    for n, (name, _, colour, stroke) in enumerate(series):
        x = left + (n % 3) * (pw / 3)
        y = legend_y + (n // 3) * 16
        out.append(f'<path d="M{x:.2f} {y - 4}h22" stroke="{colour}" stroke-width="{stroke}"/>')
        out.append(f'<text x="{x + 28:.2f}" y="{y}" fill="{INK}" font-size="11">'
                   f"{_t(_short(name, 28))}</text>")
    out.append("</svg>")
    return "\n".join(out) + ("\n" if standalone else "")
