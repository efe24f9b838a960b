"""What the views of the Split screen's results area share (:class:`~.views.ResultViews`, with
the band of :mod:`.band` and the curve of :mod:`.curve`): which view is shown, each view's
widget (the band's and the curve's mounted when first shown), and a redraw when a worker's
answer comes in."""

from __future__ import annotations

from typing import TYPE_CHECKING

from textual.widget import Widget

from ...workspace import workspace
from ..work_screen import WorkScreen

if TYPE_CHECKING:
    from ...workspace import Workspace

VIEWS = {"table": "#results", "band": "#band-view", "curve": "#curve-view"}
"""Each view of the results area and its widget's id."""


class ViewsPart(Widget):
    """The part of the results area each view's part builds on."""

    view = "table"
    """The view shown: ``table``, ``band`` or ``curve``."""

    @property
    def bw(self) -> Workspace:
        return workspace(self.app)

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

    def show_view(self) -> None:
        """Draw the view shown (the results area's own)."""
        raise NotImplementedError

    def _panel_changed(self) -> None:
        """A worker's answer came in: draw it now, or when its screen is shown again."""
        if self.screen.is_current:
            self.show_view()
        else:
            screen = self.screen
            if isinstance(screen, WorkScreen):
                screen.redraw_on_return()
