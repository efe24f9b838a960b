"""A notice that has gone leaves nothing behind: Textual takes it away but leaves it on the
terminal until something covers it, and since the app's state no longer repaints the whole
screen (a keystroke is faster for it) nothing did; the screen is drawn whole once the notice's
time is up."""

from __future__ import annotations

from branchwise.tui.app import NOTICE_GONE, BranchwiseApp


def test_the_screen_is_drawn_whole_once_a_notice_has_gone(ui, monkeypatch):
    drawn: list[float] = []
    real = BranchwiseApp.refresh

    def refresh(self, *args, **kwargs):
        drawn.append(1.0)
        return real(self, *args, **kwargs)

    async def scenario() -> None:
        async with ui.started() as (app, pilot):
            monkeypatch.setattr(BranchwiseApp, "refresh", refresh)
            app.notify("Nothing to undo.", timeout=0.2)
            await pilot.pause(0.1)
            assert drawn == []  # not while it is shown
            await pilot.pause(0.2 + NOTICE_GONE + 0.3)
            assert drawn  # once it has gone

    ui.run(scenario)
