"""Keys typed in a burst arrive whole and in order.

A terminal hands over a quick typist's keys (or a paste of keys from a script) in one read.
Textual lets a field use a letter at once while a key such as Ctrl+K or Enter bubbles through
every container above it before it acts, so the letters typed after it overtook it: "62 kPa"
typed right after Ctrl+A Ctrl+K came out "" (the clear ran last), and Enter on the branch table
followed by "7 in sch 40" sent the letters to the table as keys (adding and copying branches).
Here the keys go to the app all at once, with no pause between them, as from a terminal.
"""

from __future__ import annotations

from textual import events
from textual.widgets import Input


def burst(app, keys: list[str]) -> None:
    """Send ``keys`` to the app in one go, as a terminal delivers a quick burst."""
    for key in keys:
        char = key if len(key) == 1 else None
        name = {" ": "space", "/": "slash", ".": "full_stop", "-": "minus"}.get(key, key)
        event = events.Key(name, char)
        event.set_sender(app)
        app._driver.send_message(event)


def typed(text: str) -> list[str]:
    return list(text)


async def until_handled(pilot, ui) -> None:
    app = pilot.app
    for _ in range(400):
        await pilot.pause(0.01)
        if app.key_gate.settled():
            break
    await ui.settle(pilot)


def test_a_burst_after_clearing_the_given_lands_whole(ui):
    async def scenario() -> None:
        async with ui.started() as (app, pilot):
            await pilot.press("v")  # the given's value field
            for n in range(8):
                burst(app, ["ctrl+a", "ctrl+k", *typed(f"6{n} kPa")])
                await until_handled(pilot, ui)
                assert app.focused.value == f"6{n} kPa"
                assert app.site.conditions.pressure_drop == f"6{n} kPa"
            # Backspace over a typo, typed as fast: the same field, in order.
            burst(app, ["ctrl+u", *typed("62 kPx"), "backspace", "a", "enter", *typed("1.5")])
            await until_handled(pilot, ui)
            assert app.site.conditions.pressure_drop == "62 kPa"
            # Enter moved on to the lift before "1.5" was typed.
            assert app.site.conditions.elevation_change == "1.5 m"

    ui.run(scenario)


def test_a_burst_on_the_branch_table_goes_to_the_cell_editor_it_opens(ui):
    async def scenario() -> None:
        async with ui.started("f3") as (app, pilot):
            await pilot.press("right", "right", "right")  # the Size/ID column
            assert app.screen.here()[2] == "size"
            count = len(app.site.branches)
            burst(app, ["enter", "ctrl+a", "ctrl+k", *typed("7 in sch 40"), "enter", "down",
                        "enter", "ctrl+u", *typed("6 in sch 80"), "enter"])
            await until_handled(pilot, ui)
            assert len(app.site.branches) == count  # no letter acted as a key
            assert app.site.branches[0].segments[0].size == "7 in sch 40"
            assert app.site.branches[1].segments[0].size == "6 in sch 80"

    ui.run(scenario)


def test_a_burst_in_the_liquid_fields_and_the_branch_form(ui):
    async def scenario() -> None:
        async with ui.started("f2") as (app, pilot):
            burst(app, ["tab", "ctrl+a", "ctrl+k", *typed("12 degC"), "enter", "ctrl+u",
                        *typed("3 bar")])
            await until_handled(pilot, ui)
            assert app.site.fluid.temperature == "12 degC"
            assert app.site.fluid.pressure == "3 bar"
            burst(app, ["f3", "e", "ctrl+u", *typed("Coil A"), "enter", "enter", "enter", "enter",
                        "enter", "ctrl+u", *typed("30 m")])
            await until_handled(pilot, ui)
            form = app.screen
            assert form.query_one("#f-name").text == "Coil A"
            assert isinstance(app.focused, Input)
            assert form.query_one("#f-0-length").text == "30 m"

    ui.run(scenario)
