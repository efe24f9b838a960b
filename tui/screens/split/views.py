"""The Split screen's other views, in the place of the results table: the uncertainty band and
the system curve; and the tolerances dialog behind the band.

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
from typing import TYPE_CHECKING

from rich.text import Text
from textual import work
from textual.binding import Binding
from textual.message import Message
from textual.widget import Widget
from textual.worker import get_current_worker

from ...widgets.bandview import Band, BandView, band_body, band_notes
from ...widgets.curveplot import CurvePlot, PlotData, Series
from ..work_screen import WorkScreen

if TYPE_CHECKING:
    from branchwise.core.numerics.curve import SystemCurve
    from branchwise.core.site.solve import SiteResult
    from branchwise.core.site.spec import Site, TolerancesSpec

    from ...state.outcome import Outcome

BAND_SAMPLES = 10_000
BAND_SEED = 0
"""A fixed seed (the CLI's default too): the app and ``branchwise solve --uncertainty`` agree."""
BAND_PAUSE = 0.6
"""Seconds of quiet after an edit before an open band is worked out again."""
CURVE_FACTOR = 1.5
TOTAL_STYLE = "bold bright_yellow"
BRANCH_STYLES = ("cyan", "green", "magenta", "blue", "bright_cyan", "bright_green",
                 "bright_magenta", "bright_blue")
VIEWS = {"table": "#results", "band": "#band-view", "curve": "#curve-view"}

PANEL_BINDINGS = [
    Binding("b", "view('band')", "Band", id="split-band",
            tooltip="P5–P95 band of every flow from the tolerances, and what dominates it "
                    "(b again: back to the table)"),
    Binding("p", "view('curve')", "Curve", id="split-curve", show=False,
            tooltip="System curve: Δp against the total and branch flows, operating point "
                    "marked (p again: back to the table)"),
    Binding("l", "tolerances", "Tolerances", id="split-tolerances", show=False,
            tooltip="See and change the ± limits on the readings and records"),
]


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


class PanelScreen(WorkScreen):
    """A work screen whose results area can show the table, the band or the curve.

    Subclasses put :meth:`panel_widgets` after their ``#results`` table and call
    :meth:`draw_panel` at the end of their ``redraw``."""

    view = "table"
    band: Band | None = None
    """The newest band worked out (maybe for an earlier revision: then it is shown as stale)."""
    band_pause = BAND_PAUSE
    _band_running: int | None = None
    _band_now = False
    _band_timer = None
    _curve_for: Outcome | None = None
    _curve: tuple[Outcome, SystemCurve | None, str] | None = None
    _plot_key: tuple[object, ...] | None = None

    def panel_widgets(self) -> list[Widget]:
        band, curve = BandView(id="band-view"), CurvePlot(id="curve-view")
        band.display = curve.display = False
        return [band, curve]

    def main_view(self) -> Widget | None:
        """The focusable widget of the view shown (the curve has none)."""
        return None if self.view == "curve" else self.query_one(VIEWS[self.view])

    def action_view(self, name: str) -> None:
        self.view = "table" if self.view == name else name
        for view, ident in VIEWS.items():
            self.query_one(ident).display = view == self.view
        for totals in self.query("#totals"):  # the band has its own total and Δp rows:
            totals.display = self.view != "band" or self.app.size.height >= 30  # room for it
        main = self.main_view()
        if main is not None:
            main.focus()
        else:
            self.set_focus(None)
        self._band_now = self.view == "band"
        self.draw_panel()

    def draw_panel(self) -> None:
        if self.view == "band":
            self._schedule_band()
            self._draw_band()
        elif self.view == "curve":
            self._draw_curve()

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
        self._band_running = app.session.revision
        self._compute_band(app.session.site, app.session.revision, app.outcome.solved,
                           app.unit_system, dict(app.settings.display_units))
        self._draw_band()

    @work(thread=True, exclusive=True, exit_on_error=False, group="band")
    def _compute_band(self, site: Site, revision: int, solved: SiteResult, system: str,
                      units: dict[str, str]) -> None:
        from branchwise.core.errors import BranchwiseError
        from branchwise.core.site.solve import with_uncertainty

        from ...state.session import error_text

        try:
            band = Band(revision, with_uncertainty(solved, BAND_SAMPLES, BAND_SEED))
        except BranchwiseError as exc:
            band = Band(revision, None, error_text(exc, site, system, units),
                        getattr(exc, "field", "") or "")
        except Exception as exc:  # a bug, not bad input: shown, and the app carries on
            self.log.error(f"band failed: {exc!r}")
            band = Band(revision, None, f"internal error ({type(exc).__name__}: {exc}); "
                        "please report it")
        if not get_current_worker().is_cancelled:
            self.post_message(BandReady(band))

    def on_band_ready(self, message: BandReady) -> None:
        band = message.band
        if self._band_running == band.revision:
            self._band_running = None
        if self.band is None or band.revision >= self.band.revision:
            self.band = band
            self.bw.latest_band = band  # the exports include it while it is current
        self._panel_changed()

    def _panel_changed(self) -> None:
        if self.is_current:
            self.draw_panel()
        else:
            self._stale_view = True  # drawn when the screen comes back into view

    def band_state(self) -> str:
        """``current``, ``computing``, ``error`` (no band for these inputs, see its message),
        ``broken`` (the site has no answer: bad input, or readings no flow fits), ``stale``
        or ``none``."""
        app = self.bw
        rev, band, outcome = app.session.revision, self.band, app.outcome
        if self._band_running == rev:
            return "computing"
        if band is not None and band.revision == rev:
            return "error" if band.solved is None else "current"
        if outcome is not None and outcome.revision == rev and not outcome.ok:
            return "broken"
        return "none" if band is None else "stale"

    def _draw_band(self) -> None:
        app, band, state = self.bw, self.band, self.band_state()
        draws = f"{BAND_SAMPLES:,} Monte Carlo draws"
        head = {
            "computing": Text(f"computing… {draws} (seed {BAND_SEED})", style="italic"),
            "current": Text(f"P5 … P95: the middle 90 % of {draws} (seed {BAND_SEED})",
                            style="dim"),
            "broken": Text("No band: this site has no answer now (see the message above)",
                           style="bold yellow"),
            "stale": Text("STALE: the inputs changed since this band; it is worked out "
                          "again when typing pauses", style="bold yellow"),
            "none": Text("No band yet: it is worked out once the site solves", style="dim"),
        }.get(state)
        if head is None:  # error
            head = Text(f"✗ No band: {band.error}", style="bold red")  # type: ignore[union-attr]
            if band is not None and band.field.startswith("tolerances"):
                head.append("  (l: tolerances)", style="dim")
        elif state in ("computing", "broken") and band is not None and band.solved is not None:
            head.append("; below, the band of earlier inputs", style="dim")
        body = Text()
        if band is not None and band.solved is not None:
            body = band_body(app, band.solved) + band_notes(app, band.solved)
        self.query_one("#band-view", BandView).show(head, body, stale=state != "current")

    # ---- the curve -----------------------------------------------------------------------------

    def _draw_curve(self) -> None:
        app = self.bw
        outcome = app.outcome
        shown = outcome if outcome is not None and outcome.ok else app.good
        plot = self.query_one("#curve-view", CurvePlot)
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
        key = (owner, app.unit("flow"), app.unit("pressure"))  # an Outcome compares by identity
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
            curve = system_curve(sr.built.network, max_factor=CURVE_FACTOR,  # type: ignore
                                 operating=sr.result)  # type: ignore[union-attr]
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

        app = self.bw
        flow_unit, dp_unit = app.unit("flow"), app.unit("pressure")

        def flows(values: object) -> tuple[float, ...]:
            return tuple(float(v) for v in to_unit(values, "flow", flow_unit))  # type: ignore

        dp = tuple(float(v) for v in to_unit(curve.pressure_drop, "pressure", dp_unit))
        series = [Series(name, flows(curve.branch_flows[:, i]), dp,
                         BRANCH_STYLES[i % len(BRANCH_STYLES)])
                  for i, name in enumerate(curve.branch_names)]
        series.append(Series("total flow", flows(curve.total_flow), dp, TOTAL_STYLE))
        point, label = None, ""
        if curve.operating_point is not None:
            q, p = curve.operating_point
            point = (to_unit(q, "flow", flow_unit), to_unit(p, "pressure", dp_unit))
            label = (f"Operating point: total {app.fmt(q, 'flow')} at Δp "
                     f"{app.fmt(p, 'pressure')}   (curve to {CURVE_FACTOR:g} × the flow)")
        return PlotData(tuple(series), f"flow {app.unit_text('flow')}",
                        f"Δp {app.unit_text('pressure')}", point, label)

    # ---- tolerances ----------------------------------------------------------------------------

    def action_tolerances(self) -> None:
        from ..tolerances import TolerancesScreen

        app = self.bw

        def chosen(spec: TolerancesSpec | None) -> None:
            if spec is not None:
                app.edit("Tolerances", lambda s: setattr(s, "tolerances", copy.deepcopy(spec)))
                app.notify("Tolerances changed (Ctrl+Z undoes it; Ctrl+S saves the site)",
                           timeout=4)

        app.push_screen(TolerancesScreen(app.site, app.unit("pressure")), chosen)
