"""Typing figures safely, and keys that always answer: what a newcomer and a random-key run
stumbled on.

Enter in a value field moves to the next field (a form), so a stray letter after it lands in a
field, never on a single-letter key; g and f open their lists at once; an app key pressed
under a dialog either closes the dialog and acts, or says how to close it; a greyed key says
why; the footer says how typing ends; at 80×24 the Split screen keeps every branch row in sight
however many warnings there are, and its status line never wraps.
"""

from __future__ import annotations

from textual.widgets import Input

from branchwise.tui.screens.warnings import fit_lines
from branchwise.tui.state.givens import set_given
from branchwise.tui.widgets.texttable import TextTable


def notices(app) -> list[str]:
    return [n.message for n in app._notifications]


def footer_text(app) -> str:
    from textual.widgets import Footer

    footer = app.screen.query_one(Footer)
    return " ".join(str(item.render()) for item in footer.query("*"))


def test_enter_in_a_value_moves_to_the_next_field_and_letters_stay_in_fields(ui):
    async def scenario() -> None:
        async with ui.started() as (app, pilot):
            await pilot.press("v", "ctrl+u")
            await ui.type(pilot, "12")
            await pilot.press("enter")
            await ui.settle(pilot)
            assert app.site.conditions.pressure_drop == "12 kPa"
            assert app.focused.id == "lift-value"  # the next field, as in a form
            # The stray letters of the report: they type into the field (a visible, undoable
            # error), and no save dialog opens.
            await pilot.press("r", "c")
            await ui.settle(pilot)
            assert app.screen.__class__.__name__ == "SplitScreen"
            assert app.screen.query_one("#lift-value", Input).value == "rc"
            await pilot.press("ctrl+u", "0", "enter")
            await ui.settle(pilot)
            assert app.focused.id == "given-value"  # round to the first field
            # The footer says how typing ends while in a field, and not once out of it.
            app.key_rules.refresh_now()
            await pilot.pause()
            assert "Enter next · Esc" in footer_text(app)
            await pilot.press("escape")
            await pilot.pause()
            assert isinstance(app.focused, TextTable)
            assert "Enter next · Esc" not in footer_text(app)

    ui.run(scenario)


def test_liquid_enter_goes_round_the_fields_shown(ui):
    async def scenario() -> None:
        async with ui.started("f2") as (app, pilot):
            await pilot.press("tab")  # the temperature (water: temperature, pressure)
            assert app.focused.parent.parent.id == "fluid-temperature"
            assert "Enter next · Esc" in footer_text(app)
            await pilot.press("enter")
            assert app.focused.parent.parent.id == "fluid-pressure"
            await pilot.press("enter")
            assert app.focused.parent.parent.id == "fluid-temperature"
            await pilot.press("k")  # a letter, typed into the field, not the Kind key
            assert isinstance(app.focused, Input)

    ui.run(scenario)


def test_g_and_f_open_their_lists_at_once(ui):
    async def scenario() -> None:
        async with ui.started() as (app, pilot):
            await pilot.press("g")
            await pilot.pause()
            assert app.screen.__class__.__name__ == "ChoiceMenu"
            await pilot.press("down", "enter")  # total flow
            await ui.settle(pilot)
            assert app.site.conditions.given == "total_flow"  # waiting for its reading
            assert app.focused.id == "given-value"
            await pilot.press("escape", "f")
            await pilot.pause()
            assert app.screen.__class__.__name__ == "ChoiceMenu"
            await pilot.press("down", "enter")
            await ui.settle(pilot)
            assert app.site.solve.find == "diameter"

    ui.run(scenario)


def test_app_keys_under_a_dialog_act_or_say_why(ui):
    async def scenario() -> None:
        async with ui.started() as (app, pilot):
            # A dialog that only shows something: the key closes it and acts.
            await pilot.press("f1")
            await pilot.pause()
            assert app.screen.__class__.__name__ == "HelpScreen"
            await pilot.press("f3")
            await ui.settle(pilot)
            assert app.screen.__class__.__name__ == "BranchesScreen"
            await pilot.press("f4", "exclamation_mark")
            await pilot.pause()
            assert app.screen.__class__.__name__ == "CautionsScreen"
            await pilot.press("f2")
            await ui.settle(pilot)
            assert app.screen.__class__.__name__ == "LiquidScreen"
            # A dialog holding values: it stays, and a notice says how to close it first.
            await pilot.press("f4")
            await ui.settle(pilot)
            await pilot.press("l")
            await pilot.pause()
            assert app.screen.__class__.__name__ == "TolerancesScreen"
            for key in ("f3", "ctrl+s", "ctrl+z"):
                await pilot.press(key)
                await pilot.pause()
                assert app.screen.__class__.__name__ == "TolerancesScreen", key
            said = notices(app)
            assert any("Close this dialog first" in m and "F3" in m for m in said), said
            assert any("Ctrl+S: Save" in m for m in said), said
            await pilot.press("escape")
            await pilot.pause()
            assert app.screen.__class__.__name__ == "SplitScreen"

    ui.run(scenario)


def test_units_dialog_keeps_on_enter_like_every_dialog(ui):
    async def scenario() -> None:
        async with ui.started() as (app, pilot):
            await pilot.press("f6")
            await pilot.pause()
            await pilot.press("tab", "tab", "right")  # flow: the next unit of the list
            await pilot.press("ctrl+s")  # not "keep" here: it says how the dialog closes
            await pilot.pause()
            assert app.screen.__class__.__name__ == "UnitsScreen"
            assert any("Enter keeps" in m for m in notices(app))
            await pilot.press("enter")
            await ui.settle(pilot)
            assert app.screen.__class__.__name__ == "SplitScreen"
            assert set(app.settings.display_units) == {"flow"}

    ui.run(scenario)


def test_greyed_keys_say_why(ui):
    async def scenario() -> None:
        async with ui.started() as (app, pilot):
            await pilot.press("ctrl+z")
            await pilot.pause()
            assert "Nothing to undo." in notices(app)
            await pilot.press("ctrl+y")
            await pilot.pause()
            assert "Nothing to redo." in notices(app)
            await pilot.press("v", "ctrl+z")  # in a field too
            await pilot.pause()
            assert notices(app).count("Nothing to undo.") == 2

    ui.run(scenario)


def test_fit_lines_says_how_many_are_left_out():
    lines = [f"warning {i}" for i in range(5)]
    assert fit_lines(lines, 5) == lines
    assert fit_lines(lines, 3) == ["warning 0", "warning 1", "… +3 more — w lists them"]
    assert fit_lines(lines, 0) == ["… +5 more — w lists them"]


def test_split_at_80x24_keeps_every_branch_row_with_many_warnings(ui):
    async def scenario() -> None:
        async with ui.started() as (app, pilot):
            # A tiny pressure drop: laminar flow in every segment (five warnings), and a
            # diameter to find (two more lines for the answer).
            app.edit("Given value", lambda s: set_given(s, "pressure_drop", "0.002 kPa"))
            await ui.settle(pilot)
            await pilot.press("f")
            await pilot.pause()
            await pilot.press("down", "enter")
            await ui.settle(pilot)
            await pilot.press("escape")
            for _ in range(3):
                await pilot.pause()
            text = ui.text(app)
            lines = text.splitlines()
            for name in ("AHU-1 coil", "AHU-2 coil", "AHU-3 coil", "Bypass", "seg. 2"):
                assert name in text, name
            assert "Total" in text and "Diameter of 'AHU-1 coil'" in text
            warnings = app.screen.views.warning_lines
            assert len(warnings) >= 5
            shown = [ln for ln in lines if ln.lstrip().startswith(("⚠", "•", "…"))]
            assert 1 <= len(shown) <= len(warnings)
            if len(shown) < len(warnings):
                assert "w lists them" in shown[-1]
            # The status line is two lines, cut rather than wrapped.
            assert lines[2].lstrip().startswith("✓ solved")
            # w lists every warning.
            await pilot.press("w")
            await pilot.pause()
            assert app.screen.__class__.__name__ == "WarningsScreen"
            listed = ui.text(app)
            assert listed.count("laminar flow") >= 5
            await pilot.press("escape")

    ui.run(scenario)
