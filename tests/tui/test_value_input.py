"""A keystroke repaints what changed, not the whole screen: typing in a value field neither lays
the screen out again (its width is fixed; :class:`ValueInput`) nor repaints it all (the app's
own state changes repaint nothing themselves), and a value longer than its field still scrolls
to keep the cursor in sight. Measured by tests/perf/bench_app_recompute.py: at 120×40 a
whole-screen update was about a third of a keystroke's time."""

from __future__ import annotations

from textual.widgets import Input

from branchwise.tui.app import BranchwiseApp
from branchwise.tui.widgets.value_input import ValueInput


def test_a_keystroke_neither_lays_out_nor_repaints_the_whole_screen(ui, monkeypatch):
    app_repaints: list[object] = []
    layouts: list[object] = []
    real_app_refresh = BranchwiseApp.refresh
    real_refresh = Input.refresh

    def app_refresh(self, *args, **kwargs):
        app_repaints.append(kwargs)
        return real_app_refresh(self, *args, **kwargs)

    def refresh(self, *regions, **kwargs):
        if kwargs.get("layout"):
            layouts.append(self.id)
        return real_refresh(self, *regions, **kwargs)

    async def scenario() -> None:
        async with ui.started(size=(120, 40)) as (app, pilot):
            await pilot.press("v", "ctrl+u")
            await ui.settle(pilot)
            monkeypatch.setattr(BranchwiseApp, "refresh", app_refresh)
            monkeypatch.setattr(Input, "refresh", refresh)
            await ui.type(pilot, "12 psi")
            await ui.settle(pilot)
            assert app.site.conditions.pressure_drop == "12 psi"
            assert app.outcome.ok and app.outcome.revision == app.session.revision
            assert layouts == [] and app_repaints == []

    ui.run(scenario)


def test_a_long_value_scrolls_to_keep_the_cursor_in_sight(ui):
    async def scenario() -> None:
        async with ui.started() as (app, pilot):
            await pilot.press("v", "ctrl+u")
            box = app.focused
            assert isinstance(box, ValueInput)
            await ui.type(pilot, "68.947572931683613 kPa")  # longer than the field
            await ui.settle(pilot)
            width = box.content_region.width
            assert box.scroll_x > 0
            shown = "".join(seg.text for seg in box.render_line(0))
            assert shown.rstrip().endswith("kPa")
            assert box.scroll_x == box.max_scroll_x or shown.rstrip().endswith("kPa")
            assert len(shown) <= width + 1
            await pilot.press("home")
            await ui.settle(pilot)
            assert box.scroll_x == 0
            assert "".join(seg.text for seg in box.render_line(0)).startswith("68.94")

    ui.run(scenario)
