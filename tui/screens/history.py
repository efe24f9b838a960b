"""The History screen: every visit solved from its own readings, and how each branch changed.

One indicator at a time (``i`` steps through flow, resistance R = h/Q² and effective
roughness): per branch its first and last value, the change since the first and the previous
visit with its band (⚑ where the change lies outside it), and a braille line of its course over
the visits; under the table, the flagged changes in words. ``t`` shows the values visit by
visit instead; ``v`` closes today's visit (asked first; Ctrl+Z brings it back). The history is
worked out in a worker whenever the site changes (:func:`branchwise.core.history.history_of`).
"""

from __future__ import annotations

from pathlib import Path
from typing import TYPE_CHECKING

from rich.text import Text
from textual import work
from textual.app import ComposeResult
from textual.binding import Binding
from textual.containers import VerticalScroll
from textual.message import Message
from textual.widgets import Static
from textual.worker import get_current_worker

from branchwise.core.site.spec import Site

from ..core_loading import core_imports
from ..drawing.sparkline import sparkline
from ..quiet import put
from ..theme import colour
from ..widgets.texttable import Cell, TextTable
from .work_screen import WorkScreen

if TYPE_CHECKING:
    from branchwise.core.history import History
    from branchwise.core.history.trends import Change
    from branchwise.core.units import Units

INDICATOR_ORDER = ("resistance", "flow", "effective_roughness")
"""The order ``i`` steps through (resistance first: the one that says a line has changed)."""
WORDS = {"flow": "Flow", "resistance": "Resistance R = h/Q²",
         "effective_roughness": "Effective roughness"}
NO_TREND = {"flow": "one visit only", "resistance": "no 2 clamp-ons",
            "effective_roughness": "no 2 clamp-ons"}
"""Why a branch has no trend of an indicator (a resistance or a roughness is trended from the
branch's own clamp-on at two visits: the model's own is no news)."""
TREND_CELLS = 8
"""Width of a branch's braille trend, in cells (16 dots across)."""


class HistoryScreen(WorkScreen):
    """Each branch's indicators over the visits, the flagged changes, and closing a visit."""

    AUTO_FOCUS = "#history-table"
    CSS_PATH = Path(__file__).parent / "history.tcss"
    HELP_WIDGETS = ()

    BINDINGS = [
        Binding("i", "indicator", "Indicator", id="history-indicator",
                tooltip="Show the next indicator: resistance R = h/Q², flow, effective "
                        "roughness"),
        Binding("t", "table", "By visit", id="history-table-view",
                tooltip="Show the values visit by visit, or the trend of each branch (t "
                        "again)"),
        Binding("v", "close_visit", "Close visit", id="history-close-visit",
                tooltip="Keep today's readings and record as a visit, dated, and clear them "
                        "for the next one (asks first; Ctrl+Z brings them back)"),
    ]

    class Worked(Message):
        """A history worked out (or its error) for one revision of the site."""

        def __init__(self, revision: int, history: History | None,
                     error: BaseException | None) -> None:
            super().__init__()
            self.revision, self.history, self.error = revision, history, error

    indicator = "resistance"
    by_visit = False
    _history: History | None = None
    _error: BaseException | None = None
    _revision = -1

    def body(self) -> ComposeResult:
        yield Static("", id="history-visits", markup=False)
        yield Static("", id="history-what", markup=False)
        yield TextTable(id="history-table")
        with VerticalScroll(id="history-more"):  # the flags scroll too: all of them are read
            yield Static("", id="history-flags", markup=False)
            yield Static("", id="history-details", markup=False)

    # ---- working it out ------------------------------------------------------------------------

    def redraw(self) -> None:
        revision = self.bw.session.revision
        if revision != self._revision:
            self._revision = revision
            self._work(self.bw.site, revision)
        self._draw()

    @work(thread=True, exclusive=True, exit_on_error=False, group="history",
          description="history")  # not the repr of its arguments (the whole site)
    def _work(self, site: Site, revision: int) -> None:
        with core_imports():  # (and the words the screen then draws with, loaded here)
            import branchwise.core.report.history_report  # noqa: F401
            from branchwise.core.errors import BranchwiseError
            from branchwise.core.history import history_of

        history: History | None = None
        error: BaseException | None = None
        try:
            history = history_of(site)
        except BranchwiseError as exc:
            error = exc
        except Exception as exc:  # a bug: said on screen, the app stays up
            self.log.error(f"history failed: {exc!r}")
            error = exc
        if not get_current_worker().is_cancelled:
            self.post_message(self.Worked(revision, history, error))

    def on_history_screen_worked(self, message: Worked) -> None:
        if message.revision != self.bw.session.revision:
            return
        self._history, self._error = message.history, message.error
        self._draw()

    # ---- drawing ------------------------------------------------------------------------------

    def _draw(self) -> None:
        visits = self.query_one("#history-visits", Static)
        what = self.query_one("#history-what", Static)
        table = self.query_one("#history-table", TextTable)
        flags = self.query_one("#history-flags", Static)
        h, u = self._history, self.bw.units
        stale = self._revision != self.bw.session.revision or (h is None and self._error is None)
        self.query_one("#history-table").set_class(stale and h is not None, "-stale")
        if self._error is not None and not stale:
            put(visits, "Visits: —")
            put(what, "")
            table.show([("", False)], [])
            put(flags, Text(f"✗ {self.bw.error_words(self._error)}",
                            style=colour(self.app, "text-error")))
            return
        if h is None:
            put(visits, "Visits: … working them out")
            return
        put(visits, "Visits: " + " · ".join(v.short for v in h.visits))
        if self.by_visit:
            self._by_visit(h, u, table, what)
        else:
            self._trends(h, u, table, what)
        messages = h.messages()
        warn = colour(self.app, "text-warning")
        text = Text()
        for m in messages:
            text.append(("\n" if text else "") + f"⚑ {m}", style=warn)
        if not messages:
            text.append("No change beyond its band." if h.trends
                        else "No trend yet: a trend needs the same reading at two visits.")
        put(flags, text)
        put(self.query_one("#history-details", Static), self._details(h, u))

    def _details(self, h: History, u: Units) -> str:
        """Each visit in a line or two: who, what was read, how the readings agree, notes."""
        from branchwise.core.report.history_report import visit_lines

        out = []
        for v in reversed(h.visits):  # the latest first: the one a person looks for
            lines = visit_lines(v, u)
            rest = [x if x.endswith(".") else x + "." for x in lines[1:]]
            out.append(f"{lines[0]}: {' '.join(rest)}")
        return "\n".join(out)

    def _title(self, u: Units) -> str:
        from branchwise.core.report.history_report import unit_of

        return f"{WORDS[self.indicator]} ({unit_of(self.indicator, u)})"

    def _no_trend(self, h: History, name: str) -> str:
        """Why ``name`` has no trend of the indicator shown: too few clamp-ons, or (with two
        or more) figures a trend cannot take, which the visits' notes name."""
        if self.indicator == "flow":
            return NO_TREND["flow"]
        read = sum(1 for v in h.visits for b in v.solved.branches
                   if b.name == name and b.flow is not None and b.flow.measured)
        return NO_TREND[self.indicator] if read < 2 else "not trended: see the notes"

    def _trends(self, h: History, u: Units, table: TextTable, what: Static) -> None:
        from branchwise.core.report.history_report import AS_FIRST, number

        put(what, f"{self._title(u)}; ⚑ a change beyond its band")
        warn = colour(self.app, "text-warning")
        trends = {t.branch: t for t in h.trends if t.indicator == self.indicator}
        rows: list[list[Cell]] = []
        names = [b.name for b in h.visits[-1].solved.branches]
        last = max(1, len(h.visits) - 1)
        for name in names:
            t = trends.get(name)
            if t is None:
                rows.append([name, "—", "—", "—", "—", Text(self._no_trend(h, name),
                                                            style="dim")])
                continue

            def change(c: Change) -> Cell:
                return Text(c.words(), style=f"bold {warn}") if c.flagged else c.words()

            band = t.since_first.band * abs(t.first.indicator.value)
            line = sparkline([(p.visit / last, p.indicator.value) for p in t.points],
                             TREND_CELLS, warn if t.flagged else "",
                             span=band if band == band else 0.0)  # a change within its band
            # draws within the line's height; NaN (no band): the values' own range
            solved = Text(" solved", style="dim") if t.basis == "solved" else ""
            rows.append([name, number(self.indicator, t.first.indicator.value, u),
                         number(self.indicator, t.last.indicator.value, u),
                         change(t.since_first),
                         change(t.since_previous) if t.has_previous else Text(
                             AS_FIRST, style="dim"),
                         Text.assemble(line, solved)])
        table.show([("Branch", False), ("First", True), ("Last", True), ("Since first", True),
                    ("Since prev.", True), ("Trend", False)], rows)

    def _by_visit(self, h: History, u: Units, table: TextTable, what: Static) -> None:
        from branchwise.core.report.history_report import number

        put(what, f"{self._title(u)} at each visit (* from the branch's own clamp-on)")
        names = [b.name for b in h.visits[-1].solved.branches]
        rows: list[list[Cell]] = []
        for v in h.visits:
            cells: list[Cell] = [v.heading]
            for name in names:
                b = next((x for x in v.solved.branches if x.name == name), None)
                ind = b.get(self.indicator) if b is not None else None
                mark = "*" if ind is not None and ind.measured else " "
                cells.append(number(self.indicator, ind.value if ind else None, u) + mark)
            rows.append(cells)
        table.show([("Visit", False), *((n, True) for n in names)], rows)

    # ---- keys ---------------------------------------------------------------------------------

    def action_indicator(self) -> None:
        at = INDICATOR_ORDER.index(self.indicator)
        self.indicator = INDICATOR_ORDER[(at + 1) % len(INDICATOR_ORDER)]
        self._draw()

    def action_table(self) -> None:
        self.by_visit = not self.by_visit
        self._draw()

    def check_action(self, action: str, parameters: tuple[object, ...]) -> bool | None:
        """Closing a visit is greyed out while today holds no reading."""
        from branchwise.core.site.visits import today_has_reading

        if action == "close_visit" and not today_has_reading(self.bw.site):
            return None
        return True

    def unavailable_reason(self, action: str, parameters: tuple[object, ...]) -> str:
        if action == "close_visit":
            return ("Nothing to close: today holds no reading (F4 Split, or a branch's "
                    "measured flow on F3).")
        return ""

    def action_close_visit(self) -> None:
        from .close_visit import ask_close_visit

        ask_close_visit(self.bw, self.app)
