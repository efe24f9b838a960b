"""The title line of every work screen: the app and the site's title, centred, kept up to date
as the site is renamed or changed (● while unsaved), cut short on a narrow terminal, and ≡
opening the command palette on a click."""

from __future__ import annotations

from textual.command import CommandPalette

from branchwise.tui.widgets.title_bar import TitleBar


def test_the_title_line_follows_the_site_and_fits_the_width(ui):
    async def scenario() -> None:
        async with ui.started(size=(80, 24)) as (app, pilot):
            top = ui.text(app).splitlines()[0]
            assert top.startswith(" ≡ ") and f"branchwise — {app.site.title}" in top
            title = top.strip(" ≡")
            left = top.index("branchwise")
            assert abs(left - (80 - len(title)) // 2) <= 1  # centred
            app.edit("retitle", lambda s: setattr(s, "name", "North plant, loop 2"))
            await ui.settle(pilot)
            top = ui.text(app).splitlines()[0]
            assert "North plant, loop 2 ●" in top  # unsaved
            await pilot.resize_terminal(34, 24)
            await ui.settle(pilot)
            top = ui.text(app).splitlines()[0]
            assert len(top.rstrip()) <= 34 and top.rstrip().endswith("…")

    ui.run(scenario)


def test_a_click_on_the_icon_opens_the_command_palette_and_elsewhere_does_not(ui):
    async def scenario() -> None:
        async with ui.started(size=(80, 24)) as (app, pilot):
            await pilot.click(TitleBar, offset=(40, 0))
            await pilot.pause()
            assert not isinstance(app.screen, CommandPalette)
            await pilot.click(TitleBar, offset=(1, 0))
            await pilot.pause()
            assert isinstance(app.screen, CommandPalette)

    ui.run(scenario)
