"""The system curve of the Split screen's results area (``p``): Δp against the total flow and
each branch's flow from zero to 1.5 × the operating point, the operating point marked, worked
out in a thread worker for each new answer.

Loaded when the curve is first shown.
"""

from __future__ import annotations

from collections.abc import Iterable
from dataclasses import dataclass
from typing import TYPE_CHECKING

from textual import work
from textual.message import Message
from textual.worker import get_current_worker

from ...core_loading import core_imports
from ...theme import series as theme_series
from ...widgets.curveplot import CurvePlot, PlotData, Series
from ...workspace import workspace

if TYPE_CHECKING:
    from branchwise.core.numerics.curve import SystemCurve

    from ...state.outcome import Outcome
    from ...workspace import Workspace

CURVE_FACTOR = 1.5
"""The curve runs to this many times the operating point's flow."""


class CurvePanel(CurvePlot):
    """The plot with the curve it shows: the curve of the answer on screen (the last good one
    while the site has an error), worked out once per answer. Tells its parent when a curve
    has come in (:class:`Changed`)."""

    @dataclass
    class Ready(Message):
        """A curve worker finished: the curve of ``outcome``'s answer, or why there is none."""

        outcome: Outcome
        curve: SystemCurve | None
        error: str

    class Changed(Message):
        """A curve came in: what shows it may need drawing again."""

    _curve_for: Outcome | None = None
    _curve: tuple[Outcome, SystemCurve | None, str] | None = None
    _plot_key: tuple[object, ...] | None = None

    @property
    def bw(self) -> Workspace:
        return workspace(self.app)

    def draw(self) -> None:
        """The curve of the answer on screen, once worked out (asked for here the first
        time)."""
        app = self.bw
        outcome = app.outcome
        shown = outcome if outcome is not None and outcome.ok else app.good
        if shown is None or shown.solved is None:
            self.show(None, "The system curve shows once the site solves.")
            return
        if self._curve_for is not shown:
            self._curve_for = shown
            self._compute(shown)
        ready = self._curve
        if ready is None:
            self.show(None, "computing the system curve…")
            return
        owner, curve, error = ready
        key = (owner, app.unit("flow"), app.unit("pressure"),  # an Outcome compares by identity
               self.app.theme)
        if key != self._plot_key:
            self._plot_key = key
            self.show(self.plot_data(curve) if curve is not None else None,
                      f"No system curve: {error}")

    @work(thread=True, exclusive=True, exit_on_error=False, group="curve",
          description="curve")  # not the repr of its arguments (the whole site)
    def _compute(self, outcome: Outcome) -> None:
        with core_imports():  # throughout: a curve takes milliseconds
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
            self.post_message(self.Ready(outcome, curve, error))

    def on_curve_panel_ready(self, message: Ready) -> None:
        if message.outcome is self._curve_for:
            self._curve = (message.outcome, message.curve, message.error)
            self.post_message(self.Changed())

    def plot_data(self, curve: SystemCurve) -> PlotData:
        """The curve in the app's display units: each branch, then the total on top."""
        from branchwise.core.units import to_unit

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
