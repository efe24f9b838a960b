"""Choosing a given that already holds its reading leaves the keys as commands: a letter
pressed next (a key meant for the screen) never replaces the reading (found in a trial: `v`
after picking the gauge's reading wrote 'v' over '5.6 psi')."""

from __future__ import annotations

from textual.widgets import Input


def test_a_given_with_its_reading_is_not_opened_for_typing(ui):
    async def scenario() -> None:
        async with ui.started() as (app, pilot):
            # The total flow waits for its reading: its field is opened for it.
            await pilot.press("g")
            await pilot.pause()
            await pilot.press("down", "enter")
            await ui.settle(pilot)
            assert app.site.conditions.given == "total_flow"
            assert app.focused is not None and app.focused.id == "given-value"
            await ui.type(pilot, "600 gpm")
            await pilot.press("escape")
            await ui.settle(pilot)
            # Back to the gauge, which holds 10 psid: the field is not opened, so the next
            # letters are keys (here the band, twice) and the reading stays.
            await pilot.press("g")
            await pilot.pause()
            await pilot.press("up", "enter")
            await ui.settle(pilot)
            assert app.site.conditions.given == "pressure_drop"
            assert not isinstance(app.focused, Input)
            await pilot.press("b")
            await ui.settle(pilot)
            await pilot.press("b")
            await ui.settle(pilot)
            assert app.site.conditions.pressure_drop == "10 psid"

    ui.run(scenario)


def test_undo_while_typing_shows_the_value_undone_in_the_field(ui):
    """v, 7, Ctrl+Z: the answer went back to 10 psid but the field still showed 7 until
    Enter or Esc (found in a trial)."""
    async def scenario() -> None:
        async with ui.started() as (app, pilot):
            await pilot.press("v")
            await pilot.press("ctrl+u")
            await ui.type(pilot, "7 psi")
            await ui.settle(pilot)
            assert app.site.conditions.pressure_drop == "7 psi"
            await pilot.press("ctrl+z")
            await ui.settle(pilot)
            assert app.site.conditions.pressure_drop == "10 psid"
            box = app.screen.query_one("#given-value", Input)
            assert box.value == "10 psid"

    ui.run(scenario)
