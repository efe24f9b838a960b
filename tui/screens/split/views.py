"""The Split screen's results area: the flow table, or in its place the uncertainty band or
the system curve; the totals, the found value and the warnings under it.

* Table: one row per branch (and per further segment), the totals, the found value with the
  catalog size (the reports' own lines), the other readings against the answer, the warnings.
  While the site has an error the last good answer stays on screen, greyed.
* Band (``b``, :mod:`.band`): Monte Carlo P5–P95 of the answer, worked out in a worker.
* Curve (``p``, :mod:`.curve`): Δp against the flows up to beyond the operating point.
* Tolerances (``l``): the ± limits in use, changed in a dialog; one undoable edit of the site.
"""

from __future__ import annotations

import copy
import math
from typing import TYPE_CHECKING

from rich.text import Text
from textual.app import ComposeResult
from textual.containers import Vertical
from textual.widget import Widget
from textual.widgets import Static

from branchwise.core.messages import reynolds_text
from branchwise.core.units import format_number

from ...drawing.share_bar import share_bar
from ...quiet import put
from ...theme import colour
from ...widgets.texttable import TextTable
from ...workspace import workspace
from ..warnings import fit_lines
from ..work_screen import WorkScreen

if TYPE_CHECKING:
    from branchwise.core.site.solve import SiteResult
    from branchwise.core.site.spec import TolerancesSpec

    from ...state.outcome import Band, Outcome
    from ...workspace import Workspace
    from .band import BandPanel

VIEWS = {"table": "#results", "band": "#band-view", "curve": "#curve-view"}
"""Each view of the results area and its widget's id."""
MAX_WARNING_LINES = 6
"""At most this many warning lines under the table; fewer when the branch rows need the room."""
REGIMES = {"laminar": "lam.", "transition": "trans.", "turbulent": "turb.", "none": "—"}
MARK = "≈"
"""The mark in front of a reading's line (warnings carry ⚠, notes •)."""


class ResultViews(Vertical):
    """The results area of the Split screen: the table, the band (:mod:`.band`) or the curve
    (:mod:`.curve`), and the lines under it."""

    view = "table"
    """The view shown: ``table``, ``band`` or ``curve``."""
    warning_lines: list[str] = []
    """The other readings against the answer, every warning and note of it (``w`` lists
    them); :attr:`screen_lines` the same, shorter below 100 columns, as many as fit."""
    screen_lines: list[str] = []
    _warning_room = MAX_WARNING_LINES
    _drawn: tuple[object, ...] | None = None

    def compose(self) -> ComposeResult:
        # The band and the curve are built when first asked for (:meth:`_view`).
        yield TextTable(id="results")
        yield Static("", id="totals", markup=False)
        yield Static("", id="solved", markup=False)
        warnings = Static("", id="warnings", markup=False)
        warnings.display = False
        yield warnings

    @property
    def bw(self) -> Workspace:
        return workspace(self.app)

    def main_view(self) -> Widget | None:
        """The focusable widget of the view shown (the curve has none)."""
        return None if self.view == "curve" else self._view(self.view)

    def _view(self, name: str) -> Widget:
        """The widget of view ``name``; the band and the curve are mounted in the table's
        place the first time they are shown (most visits never open them)."""
        found = self.query(VIEWS[name])
        if found:
            return found.first()
        if name == "band":
            from .band import BandPanel

            widget: Widget = BandPanel(id="band-view")
        else:
            from .curve import CurvePanel

            widget = CurvePanel(id="curve-view")
        widget.display = False
        self.mount(widget, before=self.query_one("#totals"))
        return widget

    @property
    def band_panel(self) -> BandPanel:
        """The band's view, with its band (mounted if it was not yet)."""
        from .band import BandPanel

        panel = self._view("band")
        assert isinstance(panel, BandPanel)
        return panel

    @property
    def band(self) -> Band | None:
        """The newest band worked out here (None before the band was first shown)."""
        from .band import BandPanel

        found = self.query(BandPanel)
        return found.first().band if found else None

    def toggle(self, name: str) -> None:
        """Show the ``name`` view (``band``, ``curve``) in the table's place, or the table
        again if it is shown already."""
        self.view = "table" if self.view == name else name
        self._view(self.view).display = True
        for view, ident in VIEWS.items():
            if view != self.view:
                for widget in self.query(ident):
                    widget.display = False
        for totals in self.query("#totals"):  # the band has its own total and Δp rows:
            totals.display = self.view != "band" or self.app.size.height >= 30  # room for it
        main = self.main_view()
        if main is not None:
            main.focus()
        else:
            self.screen.set_focus(None)
        if self.view == "band":
            self.band_panel.now = True  # just opened: worked out at once, not after a pause
        self.show_view()

    def show(self) -> None:
        """Show the present answer (or the last good one, greyed) and the view open."""
        self._draw_results()
        self.show_view()

    def on_resize(self) -> None:
        # Crossing 100 columns changes the table's columns (share bars, whole Re): draw again
        # (the drawn key says whether anything changed).
        if self.is_attached:
            self.show()

    def show_view(self) -> None:
        if self.view == "band":
            band = self.band_panel
            band.schedule()
            band.draw()
        elif self.view == "curve":
            from .curve import CurvePanel

            curve = self._view("curve")
            assert isinstance(curve, CurvePanel)
            curve.draw()
        self._draw_results()  # a band come in says whether each reading lies inside it

    def on_band_panel_changed(self) -> None:
        self._panel_changed()

    def on_curve_panel_changed(self) -> None:
        self._panel_changed()

    def _panel_changed(self) -> None:
        """A worker's answer came in: draw it now, or when the screen is shown again."""
        if self.screen.is_current:
            self.show_view()
        else:
            screen = self.screen
            if isinstance(screen, WorkScreen):
                screen.redraw_on_return()

    # ---- the table ---------------------------------------------------------------------------

    def _draw_results(self) -> None:
        app = self.bw
        outcome = app.outcome
        drawn = (outcome, app.good, app.unit_system, tuple(app.settings.display_units.items()),
                 app.latest_band, self.app.size.width >= 100, self.app.theme)
        if self._drawn == drawn:
            return  # the site changed but its answer has not arrived yet: nothing new to show
        self._drawn = drawn
        shown = outcome if outcome is not None and outcome.ok else app.good
        # Greyed only when the site has an error: a solve takes milliseconds, and greying the
        # table while it runs would only make it flicker as someone types.
        stale = outcome is not None and not outcome.ok and shown is not None
        self.set_class(stale, "-stale")
        table = self.query_one("#results", TextTable)
        u = app.unit_text
        # Below 100 columns the share is a bare percentage, Re compact (180k) and each unit
        # under its heading, so that the losses stay on screen at 80×24, in US units too; the
        # table still scrolls sideways if names are long. The losses are the exports' own:
        # the pipe's (major), its fittings' (minor) and the valve's.
        wide = self.app.size.width >= 100
        sep = " " if wide else "\n"
        columns = [("Branch", False), (f"Flow{sep}{u('flow')}", True), ("Share", False),
                   (f"V{sep}{u('velocity')}", True), ("Re", True), ("f", True),
                   ("Regime" if wide else "Reg.", False),
                   *((f"{name}{sep}{u('head')}", True) for name in ("Major", "Minor", "Valve"))]
        totals = self.query_one("#totals", Static)
        solved = self.query_one("#solved", Static)
        warnings = self.query_one("#warnings", Static)
        if shown is None or shown.solved is None:
            table.show(columns, [])
            put(totals, "… solving" if outcome is None else "No answer yet: see the message "
                "above.", layout=False)
            put(solved, "", layout=False)
            if solved.display:
                solved.display = False
            self.warning_lines = self.screen_lines = []
            put(warnings, "")
            return
        from branchwise.core.report.lines import solved_lines  # after the first screen: numpy

        result = shown.solved.result
        rows: list[list[str | Text]] = []
        number = app.units.number  # (the reader's units, looked up once for every cell)
        bar = (colour(self.app, "text-primary"), f"bold {colour(self.app, 'text-error')}")
        valves = [b.valve_kv is not None for b in result.network.branches]
        for br, valve in zip(result.branches, valves, strict=True):
            for j, seg in enumerate(br.segments):
                first = j == 0
                rows.append([
                    br.name if first else f"  └ {'segment' if wide else 'seg.'} {j + 1}",
                    number(br.flow, "flow") if first else "",
                    (share_bar(br.share, 6, *bar) if wide else _percent(br.share)) if first else "",
                    number(seg.velocity, "velocity", 3),
                    reynolds_text(seg.reynolds, grouped=True) if wide else _compact(seg.reynolds),
                    _friction(seg.friction_factor),
                    REGIMES.get(seg.regime, seg.regime),
                    number(seg.major_loss, "head", 3),
                    number(seg.minor_loss, "head", 3),
                    number(br.valve_loss, "head", 3) if first and valve else "",
                ])
        table.show(columns, rows)
        fluid = result.network.fluid
        put(totals,
            f"Total {app.fmt(result.total_flow, 'flow')}   "
            f"Δp {app.fmt(result.pressure_drop, 'pressure')}   "
            f"head loss {app.fmt(result.head_loss, 'head', 3)}\n{app.fluid_name(fluid)}: "
            f"{app.fmt(fluid.density, 'density')}, {app.fmt(fluid.viscosity, 'viscosity', 3)}",
            layout=False)  # always two lines: no new layout needed
        text = "\n".join(solved_lines(shown.solved, app.units, short=True))
        put(solved, text, layout=False)
        if solved.display != bool(text):
            solved.display = bool(text)
        lines = [f"⚠ {w.branch + ': ' if w.branch else ''}{app.say(w)}"
                 for w in result.warnings]
        rec = shown.solved.reconciliation
        weighed = [f"⚖ {rec.verdict}  (x: each reading)"] if rec is not None else []
        lines += [f"• {app.say(note)}" for note in (*shown.solved.notes, *result.notes)]
        lines += assumed_line(app, shown.solved)
        # The other readings against the answer first: on a walkdown they are the news.
        self.warning_lines = weighed + self._reading_lines(shown) + lines
        self.screen_lines = weighed + self._reading_lines(shown, short=not wide) + lines
        self._show_warnings(self._warning_room)
        self.call_after_refresh(self._fit_warnings)

    def _show_warnings(self, room: int) -> None:
        lines = fit_lines(self.screen_lines, min(room, MAX_WARNING_LINES))
        warnings = self.query_one("#warnings", Static)
        put(warnings, "\n".join(lines))
        if warnings.display != bool(lines):
            warnings.display = bool(lines)

    def _fit_warnings(self) -> None:
        """After layout: give the warnings only the rows the table does not need, so that
        every branch row stays in sight (each warning is one line, cut at the edge)."""
        if not self.is_attached or not self.warning_lines:
            return
        shown = min(len(self.warning_lines), self._warning_room, MAX_WARNING_LINES)
        if self.view == "table":
            table = self.query_one("#results", TextTable)
            spare = table.scrollable_content_region.height - (len(table.rows) + table.header_lines)
        else:
            spare = 2 - shown  # the band and the curve take what is left: two lines
        room = max(1, min(MAX_WARNING_LINES, shown + spare))
        if room != self._warning_room:
            self._warning_room = room
            self._show_warnings(room)

    def _reading_lines(self, shown: Outcome, short: bool = False) -> list[str]:
        """The readings kept beside the given, against the answer (with the band's verdict
        once a band for this answer has been worked out)."""
        from branchwise.core.errors import InputError
        from branchwise.core.report.lines import readings_lines

        sr = shown.solved
        band = self.bw.latest_band
        if band is not None and band.solved is not None and band.revision == shown.revision:
            sr = band.solved  # the same answer, with its P5–P95 band
        if sr is None:
            return []
        try:
            return [f"{MARK} {line}" for line in readings_lines(sr, self.bw.units, short)]
        except InputError:
            return []  # the site's own check says why (it is shown beside the given)

    def edit_tolerances(self) -> None:
        from ..tolerances import TolerancesScreen

        app = self.bw

        def chosen(spec: TolerancesSpec | None) -> None:
            if spec is not None:
                app.edit("Tolerances", lambda s: setattr(s, "tolerances", copy.deepcopy(spec)))
                self.notify("Tolerances changed (Ctrl+Z undoes it; Ctrl+S saves the site)",
                            timeout=4)

        self.app.push_screen(TolerancesScreen(app.site, app.unit("pressure")), chosen)


ASSUMED_WORDS = {
    "pressure-default": "pressure 1 atm", "friction-default": "Colebrook",
    "elevation-default": "headers level", "gravity-default": "standard g",
    "velocity-limit-default": "velocity limit {limit}",
}
"""Short words for the site-wide assumptions on the Split screen (the reports say them whole);
a typed gravity is said beside them."""


def assumed_line(app: Workspace, solved: SiteResult) -> list[str]:
    """One line: the site-wide defaults taken, and where the rest of what was read is shown."""
    from branchwise.core.messages import limit_text
    from branchwise.core.site.assumptions import on_earth

    net = solved.result.network
    limit = app.units.restate(limit_text("velocity", net.velocity_limit))
    words = [ASSUMED_WORDS[a.code].format(limit=limit) for a in solved.assumptions
             if a.branch is None and a.code in ASSUMED_WORDS]
    if any(a.code == "gravity-typed" for a in solved.assumptions):  # a typed g is said too
        words.append(f"g {net.gravity:.5g} m/s² as typed"
                     + ("" if on_earth(net.gravity) else " (not Earth's: check it)"))
    per_branch = sum(1 for a in solved.assumptions if a.branch is not None)
    if not words and not per_branch:
        return []
    more = " (bores, ε, K as read: F3)"
    return [f"ℹ assumed: {', '.join(words) or 'nothing site-wide'}{more if per_branch else ''}"]


def _compact(number: float) -> str:
    """``180266`` → ``180k``, ``1234567`` → ``1.23M``, ``1.39e11`` → ``139G``: a Reynolds
    number in four cells or so."""
    if not number == number:  # NaN
        return "—"
    for scale, suffix in ((1e9, "G"), (1e6, "M"), (1e3, "k")):
        if abs(number) >= scale:
            return f"{number / scale:.3g}{suffix}"
    return reynolds_text(number)


def _friction(f: float) -> str:
    """A friction factor to four decimals (``0.0189``); a creeping flow's f of 64/Re, up to
    1e29 and more, to four significant figures rather than thirty digits."""
    if not math.isfinite(f):
        return "—"
    if abs(f) < 10:
        return f"{f:.4f}"
    return format_number(f, 4)


def _percent(share: float) -> str:
    """A share of the total flow as ``53%`` or ``6.8%`` (a dash when there is none)."""
    if not share == share:  # NaN: no total flow
        return "—"
    percent = share * 100
    return f"{percent:.1f}%" if abs(percent) < 10 else f"{percent:.0f}%"
