"""The uncertainty band as the Split screen shows it: P5–P95 of every branch flow, the total
flow, the pressure drop and a found unknown, then the inputs ranked by their part in the spread.

The numbers come from :func:`branchwise.core.site.solve.with_uncertainty` (run in a worker by the
screen); this module only lays them out in the app's display units. A band belongs to one
revision of the site: once the site changes it is drawn greyed under a line saying so, never as
if it were current.
"""

from __future__ import annotations

import re
import textwrap
from typing import TYPE_CHECKING

from rich.cells import cell_len
from rich.text import Text
from textual.app import ComposeResult
from textual.containers import ScrollableContainer
from textual.widgets import Static

from branchwise.core.finds import found_noun

from ..quiet import put
from ..theme import colour

if TYPE_CHECKING:
    from branchwise.core.site.solve import SiteResult

    from ..workspace import Workspace

RANK_BAR = 14
"""Cells of a full bar in the ranking (a share of 100 %); :data:`RANK_BAR_NARROW` below
:data:`WIDE` columns."""
RANK_BAR_NARROW = 6
WIDE = 100


class BandView(ScrollableContainer, can_focus=True):
    """A state line (current, stale, computing, or why there is no band), then the band and
    the ranking, greyed while stale. Scrolls both ways on a small terminal."""

    DEFAULT_CSS = """
    BandView { height: 1fr; overflow-x: auto; overflow-y: auto; padding: 0 1; }
    BandView > Static { width: auto; }
    BandView:focus > #band-body { background: $boost; }
    BandView.-stale > #band-body { opacity: 50%; }
    """

    def __init__(self, *, id: str | None = None) -> None:
        super().__init__(id=id)
        # Made here, so that the band can be shown the moment this view is mounted.
        self._head = Static("", id="band-head", markup=False)
        self._body = Static("", id="band-body", markup=False)

    def compose(self) -> ComposeResult:
        yield self._head
        yield self._body

    def show(self, head: Text, body: Text, stale: bool) -> None:
        put(self._head, head)
        put(self._body, body)
        self.set_class(stale, "-stale")


def short_name(name: str) -> str:
    """``branch 'AHU-1 coil' roughness`` → ``AHU-1 coil roughness``."""
    return re.sub(r"branch '(.*?)'", r"\1", name)


def _signed_percent(value: float) -> str:
    shown = round(value, 1) + 0.0  # no "−0.0 %" for a spread below a twentieth of a percent
    return f"{shown:+.1f} %".replace("-", "−")


HELD = "held: no spread"
"""The P5 … P95 cell of a value every draw gives alike (a design target, a reading drawn
with no tolerance)."""


def band_body(app: Workspace, sr: SiteResult, wide: bool) -> Text:
    """The band table and the ranking with bars, in the app's display units."""
    from branchwise.core.report import band as bandtext
    from branchwise.core.units import format_number

    u = sr.uncertainty
    if u is None:
        return Text()
    rows: list[list[str]] = []
    for name, b in u.outputs.items():
        kind = bandtext.kind_of(sr, name)
        if name.endswith("(found)") and sr.result.solved is not None:
            label = f"{found_noun(sr.result.solved.quantity)} of {sr.result.solved.branch}"
        elif name.startswith("branch '"):
            label = short_name(name).removesuffix(" flow")
        else:
            label = {"total flow": "Total flow", "pressure drop": "Δp"}.get(name, name)
        cells = [app.fmt(v, kind, unit=False) for v in (b.nominal, b.p5, b.p50, b.p95)]
        spread = ""
        if b.nominal != 0 and all(v == v for v in (b.p5, b.p95)):  # NaN: no draw answered
            low, high = (b.p5 / b.nominal - 1) * 100, (b.p95 / b.nominal - 1) * 100
            spread = (HELD if max(abs(low), abs(high)) < 1e-9 else
                      f"{_signed_percent(low)} … {_signed_percent(high)}")
        rows.append([label, *cells, app.unit_text(kind), spread])
    out = _table(["", "Value", "P5", "P50", "P95", "", "P5 … P95"],
                 [False, True, True, True, True, False, False], rows)
    focus = bandtext.focus(sr)
    if focus is not None:
        top, more, rest = bandtext.ranked(u, focus)
        what = {"total flow": "total flow", "pressure drop": "pressure drop"}.get(
            focus, "found " + (found_noun(sr.result.solved.quantity).lower() if sr.result.solved
                               else "value"))
        narrow = not wide
        # Below 100 columns (a 24-line terminal, most likely) the ranking starts right under
        # the table, so that more of it is in sight.
        out.append(f"\n{'' if narrow else chr(10)}What dominates the spread of the {what} — "
                   "measure these first:\n", style="bold")
        if not top:
            out.append(f"  no input tolerance moves the {what}", style="dim")
        limits = {i.name: bandtext.tolerance_text(i, app.unit_system) for i in u.inputs}
        name_w = max((cell_len(short_name(n)) for n, _ in top), default=0)
        # The share first, so that a long name or limit never pushes it off a narrow screen.
        for i, (name, share) in enumerate(top):
            out.append(("\n" if i else "") + f"  {format_number(share * 100, 3).rjust(5)} % ")
            out.append(bandtext.bar(share, RANK_BAR_NARROW if narrow else RANK_BAR),
                       style=colour(app, "text-primary"))
            out.append(f"  {short_name(name).ljust(name_w)}  {limits.get(name, '')}")
        if more:
            out.append(f"\n  … {more} more input{'s' if more > 1 else ''}, "
                       f"{format_number(rest * 100, 2)} % together", style="dim")
    return out


def _table(header: list[str], right: list[bool], rows: list[list[str]]) -> Text:
    widths = [max(cell_len(r[c]) for r in [header, *rows]) for c in range(len(header))]
    out = Text(no_wrap=True, overflow="crop")
    for c, label in enumerate(header):
        out.append(" " + (label.rjust(widths[c]) if right[c] else label.ljust(widths[c])) + " ",
                   style="bold reverse")
    for row in rows:
        out.append("\n")
        for c, cell in enumerate(row):
            out.append(" " + (cell.rjust(widths[c]) if right[c] else cell.ljust(widths[c])) + " ")
    return out


def band_notes(app: Workspace, sr: SiteResult, width: int = 0) -> Text:
    """Where the tolerances come from, and the notes of the computation, each note wrapped to
    ``width`` cells (0: one line each) so that its reason is in sight without scrolling."""
    u = sr.uncertainty
    source = ("the site's [tolerances], common practice where it is silent"
              if sr.site.tolerances is not None else "common-practice defaults")

    def wrapped(text: str) -> str:
        lines = textwrap.wrap(text, width - 2, break_on_hyphens=False) if width > 20 else [text]
        return "\n  ".join(lines)

    # (the head line too: unwrapped, it ran off the screen at 80 columns)
    out = Text("\n\n" + wrapped(f"Tolerances: {source}  (l: see and change them)"),
               style="dim")
    for note in u.notes if u is not None else ():
        out.append("\n• " + wrapped(app.say(note)), style=colour(app, "text-warning"))
    return out


__all__ = ["BandView", "band_body", "band_notes", "short_name"]
