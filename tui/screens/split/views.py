"""The Split screen's results area: the flow table, or in its place the uncertainty band or
the system curve; the totals, the found value and the warnings under it.

* Table: one row per branch (and per further segment), the totals, the found value with the
  catalog size (the reports' own lines), the other readings against the answer, the warnings.
  While the site has an error the last good answer stays on screen, greyed.
* Band (``b``): Monte Carlo P5–P95 of every flow, the pressure drop and a found unknown, and
  what dominates the spread, worked out in a thread worker (10,000 draws, a fixed seed: the
  same site always shows the same band). A band belongs to one revision of the site: after an
  edit it is greyed and marked stale at once, and worked out again once typing pauses while the
  view is open (or when it is opened again). A site with an error shows no current band.
* Curve (``p``): Δp against the total flow and each branch's flow from zero to 1.5 × the
  operating point, the operating point marked (worked out in a worker for each new answer).
* Tolerances (``l``): the ± limits in use, changed in a dialog; one undoable edit of the site.
"""

from __future__ import annotations

import copy
import math
from collections.abc import Iterable
from typing import TYPE_CHECKING

from rich.text import Text
from textual import work
from textual.app import ComposeResult
from textual.containers import Vertical
from textual.message import Message
from textual.widget import Widget
from textual.widgets import Static
from textual.worker import get_current_worker

from ...drawing.share_bar import share_bar
from ...quiet import put
from ...theme import colour
from ...theme import series as theme_series
from ...widgets.texttable import TextTable
from ...workspace import workspace
from ..warnings import fit_lines
from ..work_screen import WorkScreen

if TYPE_CHECKING:
    from branchwise.core.numerics.curve import SystemCurve
    from branchwise.core.site.solve import SiteResult
    from branchwise.core.site.spec import Site, TolerancesSpec

    from ...state.outcome import Band, Outcome
    from ...widgets.curveplot import PlotData
    from ...workspace import Workspace

BAND_SAMPLES = 10_000
BAND_SEED = 0
"""A fixed seed (the CLI's default too): the app and ``branchwise solve --uncertainty`` agree."""
BAND_PAUSE = 0.6
"""Seconds of quiet after an edit before an open band is worked out again."""
CURVE_FACTOR = 1.5
VIEWS = {"table": "#results", "band": "#band-view", "curve": "#curve-view"}
MAX_WARNING_LINES = 6
"""At most this many warning lines under the table; fewer when the branch rows need the room."""
REGIMES = {"laminar": "lam.", "transition": "trans.", "turbulent": "turb.", "none": "—"}
MARK = "≈"
"""The mark in front of a reading's line (warnings carry ⚠, notes •)."""


class BandProgress(Message):
    """How far a long band has got (posted from its thread)."""

    def __init__(self, revision: int, done: int, total: int) -> None:
        super().__init__()
        self.revision, self.done, self.total = revision, done, total


class BandReady(Message):
    """A band worker finished (posted from its thread)."""

    def __init__(self, band: Band) -> None:
        super().__init__()
        self.band = band


class CurveReady(Message):
    """A curve worker finished: the curve of ``outcome``'s answer, or why there is none."""

    def __init__(self, outcome: Outcome, curve: SystemCurve | None, error: str) -> None:
        super().__init__()
        self.outcome, self.curve, self.error = outcome, curve, error


class ResultViews(Vertical):
    """The results area of the Split screen: the table, the band or the curve, and the lines
    under it."""

    view = "table"
    band: Band | None = None
    """The newest band worked out (maybe for an earlier revision: then it is shown as stale)."""
    band_pause = BAND_PAUSE
    warning_lines: list[str] = []
    """The other readings against the answer, every warning and note of it (``w`` lists
    them); :attr:`screen_lines` the same, shorter below 100 columns, as many as fit."""
    screen_lines: list[str] = []
    _warning_room = MAX_WARNING_LINES
    _band_running: int | None = None
    _band_share = 0.0
    """How much of the running band is done (0 until it has run a second)."""
    _band_now = False
    _band_timer = None
    _curve_for: Outcome | None = None
    _curve: tuple[Outcome, SystemCurve | None, str] | None = None
    _plot_key: tuple[object, ...] | None = None
    _drawn: tuple[object, ...] | None = None

    @property
    def bw(self) -> Workspace:
        return workspace(self.app)

    def compose(self) -> ComposeResult:
        # The band and the curve are built when first asked for (:meth:`_view`).
        yield TextTable(id="results")
        yield Static("", id="totals", markup=False)
        yield Static("", id="solved", markup=False)
        warnings = Static("", id="warnings", markup=False)
        warnings.display = False
        yield warnings

    def main_view(self) -> Widget | None:
        """The focusable widget of the view shown (the curve has none)."""
        return None if self.view == "curve" else self._view(self.view)

    def _view(self, name: str) -> Widget:
        """The widget of view ``name``; the band and the curve are mounted in the table's
        place the first time they are shown (most visits never open them)."""
        found = self.query(VIEWS[name])
        if found:
            return found.first()
        from ...widgets.bandview import BandView
        from ...widgets.curveplot import CurvePlot

        widget: Widget = BandView(id="band-view") if name == "band" else CurvePlot(id="curve-view")
        widget.display = False
        self.mount(widget, before=self.query_one("#totals"))
        return widget

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
        self._band_now = self.view == "band"
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
            self._schedule_band()
            self._draw_band()
        elif self.view == "curve":
            self._draw_curve()
        self._draw_results()  # a band come in says whether each reading lies inside it

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
        for br in result.branches:
            for j, seg in enumerate(br.segments):
                first = j == 0
                rows.append([
                    br.name if first else f"  └ {'segment' if wide else 'seg.'} {j + 1}",
                    number(br.flow, "flow") if first else "",
                    (share_bar(br.share, 6, *bar) if wide else _percent(br.share)) if first else "",
                    number(seg.velocity, "velocity", 3),
                    f"{seg.reynolds:,.0f}" if wide else _compact(seg.reynolds),
                    f"{seg.friction_factor:.4f}" if math.isfinite(seg.friction_factor)
                    else "—",
                    REGIMES.get(seg.regime, seg.regime),
                    number(seg.major_loss, "head", 3),
                    number(seg.minor_loss, "head", 3),
                    number(br.valve_loss, "head", 3)
                    if first and br.valve_loss else "",
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

    # ---- the band ------------------------------------------------------------------------------

    def _band_wanted(self) -> bool:
        app = self.bw
        rev, outcome = app.session.revision, app.outcome
        return (self.view == "band" and self._band_running != rev
                and (self.band is None or self.band.revision != rev)
                and outcome is not None and outcome.revision == rev and outcome.ok)

    def _schedule_band(self) -> None:
        if self._band_timer is not None:
            self._band_timer.stop()
            self._band_timer = None
        if not self._band_wanted():
            return
        if self._band_now:
            self._start_band()
        else:
            self._band_timer = self.set_timer(self.band_pause, self._start_band)

    def _start_band(self) -> None:
        self._band_timer = None
        if not self._band_wanted():
            return
        self._band_now = False
        app = self.bw
        if app.outcome is None or app.outcome.solved is None:
            return
        self._band_running = app.session.revision
        self._band_share = 0.0
        self._compute_band(app.session.site, app.session.revision, app.outcome.solved,
                           app.unit_system, dict(app.settings.display_units))
        self._draw_band()

    @work(thread=True, exclusive=True, exit_on_error=False, group="band")
    def _compute_band(self, site: Site, revision: int, solved: SiteResult, system: str,
                      units: dict[str, str]) -> None:
        from branchwise.core.errors import BranchwiseError
        from branchwise.core.site.fields import error_text
        from branchwise.core.site.solve import with_uncertainty
        from branchwise.core.units import Units

        from ...state.outcome import Band, BandStopped, band_progress

        worker = get_current_worker()

        def report(done: int, total: int) -> None:
            self.post_message(BandProgress(revision, done, total))

        progress = band_progress(lambda: worker.is_cancelled, report)
        try:
            band = Band(revision, with_uncertainty(solved, BAND_SAMPLES, BAND_SEED,
                                                   progress=progress))
        except BandStopped:
            return  # the app closes, or a newer band took over: nothing to show
        except BranchwiseError as exc:
            band = Band(revision, None, error_text(exc, Units(system, units),
                                           [b.name for b in site.branches]),
                        getattr(exc, "field", "") or "")
        except Exception as exc:  # a bug, not bad input: shown, and the app carries on
            self.log.error(f"band failed: {exc!r}")
            band = Band(revision, None, f"internal error ({type(exc).__name__}: {exc}); "
                        "please report it")
        if not get_current_worker().is_cancelled:
            self.post_message(BandReady(band))

    def on_band_progress(self, message: BandProgress) -> None:
        if self._band_running == message.revision:
            self._band_share = message.done / message.total if message.total else 0.0
            if self.view == "band" and self.screen.is_current:
                self._draw_band()

    def on_band_ready(self, message: BandReady) -> None:
        band = message.band
        if self._band_running == band.revision:
            self._band_running = None
        if self.band is None or band.revision >= self.band.revision:
            self.band = band
            self.bw.latest_band = band  # the exports include it while it is current
        self._panel_changed()

    def _panel_changed(self) -> None:
        if self.screen.is_current:
            self.show_view()
        else:
            screen = self.screen
            if isinstance(screen, WorkScreen):
                screen.redraw_on_return()

    def band_state(self) -> str:
        """``current``, ``computing``, ``error`` (no band for these inputs, see its message),
        ``broken`` (the site has no answer: bad input, or readings no flow fits), ``stale``
        or ``none``."""
        app = self.bw
        rev, band, outcome = app.session.revision, self._own_band(), app.outcome
        if self._band_running == rev:
            return "computing"
        if band is not None and band.revision == rev:
            return "error" if band.solved is None else "current"
        if outcome is not None and outcome.revision == rev and not outcome.ok:
            return "broken"
        return "none" if band is None else "stale"

    def _own_band(self) -> Band | None:
        """The last band worked out, unless it was for a site opened before this one."""
        band = self.band
        return band if band is not None and band.revision >= self.bw.session.opened else None

    def _draw_band(self) -> None:
        from ...widgets.bandview import WIDE, BandView, band_body, band_notes

        app, band, state = self.bw, self._own_band(), self.band_state()
        warn = f"bold {colour(self.app, 'text-warning')}".strip()
        draws = f"{BAND_SAMPLES:,} Monte Carlo draws"
        head = {
            "computing": Text(f"computing… {draws} (seed {BAND_SEED})"
                              + (f", {self._band_share:.0%} done" if self._band_share else ""),
                              style="italic"),
            "current": Text(f"P5 … P95: the middle 90 % of {draws} (seed {BAND_SEED})",
                            style="dim"),
            "broken": Text("No band: this site has no answer now (see the message above)",
                           style=warn),
            "stale": Text("STALE: the inputs changed since this band; it is worked out "
                          "again when typing pauses", style=warn),
            "none": Text("No band yet: it is worked out once the site solves", style="dim"),
        }.get(state)
        if head is None:  # error: the band of these inputs says why it has no figures
            head = Text(f"✗ No band: {band.error if band else ''}",
                        style=f"bold {colour(self.app, 'text-error')}".strip())
            if band is not None and band.field.startswith("tolerances"):
                head.append("  (l: tolerances)", style="dim")
        elif state in ("computing", "broken") and band is not None and band.solved is not None:
            head.append("; below, the band of earlier inputs", style="dim")
        body = Text()
        if band is not None and band.solved is not None:
            wide = self.app.size.width >= WIDE
            # the screen's width, less the view's padding and a scroll bar
            notes = band_notes(app, band.solved, max(self.app.size.width - 4, 0))
            body = band_body(app, band.solved, wide) + notes
        view = self._view("band")
        assert isinstance(view, BandView)
        view.show(head, body, stale=state != "current")

    # ---- the curve -----------------------------------------------------------------------------

    def _draw_curve(self) -> None:
        from ...widgets.curveplot import CurvePlot

        app = self.bw
        outcome = app.outcome
        shown = outcome if outcome is not None and outcome.ok else app.good
        plot = self._view("curve")
        assert isinstance(plot, CurvePlot)
        if shown is None or shown.solved is None:
            plot.show(None, "The system curve shows once the site solves.")
            return
        if self._curve_for is not shown:
            self._curve_for = shown
            self._compute_curve(shown)
        ready = self._curve
        if ready is None:
            plot.show(None, "computing the system curve…")
            return
        owner, curve, error = ready
        key = (owner, app.unit("flow"), app.unit("pressure"),  # an Outcome compares by identity
               self.app.theme)
        if key != self._plot_key:
            self._plot_key = key
            plot.show(self.plot_data(curve) if curve is not None else None,
                      f"No system curve: {error}")

    @work(thread=True, exclusive=True, exit_on_error=False, group="curve")
    def _compute_curve(self, outcome: Outcome) -> None:
        from branchwise.core.errors import BranchwiseError
        from branchwise.core.numerics.curve import system_curve

        sr = outcome.solved
        curve, error = None, ""
        try:
            if sr is not None:  # only an answer is drawn
                curve = system_curve(sr.built.network, max_factor=CURVE_FACTOR,
                                     operating=sr.result)
        except BranchwiseError as exc:
            error = getattr(exc, "reason", "") or str(exc)
        except Exception as exc:  # a bug, not bad input: shown, and the app carries on
            self.log.error(f"curve failed: {exc!r}")
            error = f"internal error ({type(exc).__name__}: {exc}); please report it"
        if not get_current_worker().is_cancelled:
            self.post_message(CurveReady(outcome, curve, error))

    def on_curve_ready(self, message: CurveReady) -> None:
        if message.outcome is self._curve_for:
            self._curve = (message.outcome, message.curve, message.error)
            self._panel_changed()

    def plot_data(self, curve: SystemCurve) -> PlotData:
        """The curve in the app's display units: each branch, then the total on top."""
        from branchwise.core.units import to_unit

        from ...widgets.curveplot import PlotData, Series

        app = self.bw
        flow_unit, dp_unit = app.unit("flow"), app.unit("pressure")

        def flows(values: Iterable[float]) -> tuple[float, ...]:
            return tuple(to_unit(float(v), "flow", flow_unit) for v in values)

        dp = tuple(to_unit(float(v), "pressure", dp_unit) for v in curve.pressure_drop)
        series = [Series(name, flows(curve.branch_flows[:, i]), dp, theme_series(self.app, i))
                  for i, name in enumerate(curve.branch_names)]
        series.append(Series("total flow", flows(curve.total_flow), dp, "bold"))
        point, label = None, ""
        if curve.operating_point is not None:
            q, p = curve.operating_point
            point = (to_unit(q, "flow", flow_unit), to_unit(p, "pressure", dp_unit))
            label = (f"Operating point: total {app.fmt(q, 'flow')} at Δp "
                     f"{app.fmt(p, 'pressure')}   (curve to {CURVE_FACTOR:g} × the flow)")
        return PlotData(tuple(series), f"flow {app.unit_text('flow')}",
                        f"Δp {app.unit_text('pressure')}", point, label)

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
"""Short words for the site-wide assumptions on the Split screen (the reports say them whole)."""


def assumed_line(app: Workspace, solved: SiteResult) -> list[str]:
    """One line: the site-wide defaults taken, and where the rest of what was read is shown."""
    from branchwise.core.messages import limit_text

    limit = app.units.restate(limit_text("velocity", solved.result.network.velocity_limit))
    words = [ASSUMED_WORDS[a.code].format(limit=limit) for a in solved.assumptions
             if a.branch is None and a.code in ASSUMED_WORDS]
    per_branch = sum(1 for a in solved.assumptions if a.branch is not None)
    if not words and not per_branch:
        return []
    more = " (bores, ε, K as read: F3)"
    return [f"ℹ assumed: {', '.join(words) or 'nothing site-wide'}{more if per_branch else ''}"]


def _compact(number: float) -> str:
    """``180266`` → ``180k``, ``1234567`` → ``1.23M``: a Reynolds number in four cells or so."""
    if not number == number:  # NaN
        return "—"
    for scale, suffix in ((1e6, "M"), (1e3, "k")):
        if abs(number) >= scale:
            return f"{number / scale:.3g}{suffix}"
    return f"{number:.0f}"


def _percent(share: float) -> str:
    """A share of the total flow as ``53%`` or ``6.8%`` (a dash when there is none)."""
    if not share == share:  # NaN: no total flow
        return "—"
    percent = share * 100
    return f"{percent:.1f}%" if abs(percent) < 10 else f"{percent:.0f}%"
