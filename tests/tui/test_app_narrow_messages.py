"""At 80x24 an error too long for the status line is wrapped there (its figures in sight) and
read whole where its field is; a cell being edited on the Branches screen says so plainly."""

from __future__ import annotations

from branchwise.core.errors import NoSolutionError
from branchwise.tui.state.session import set_find
from branchwise.tui.widgets.status import ERROR_LINES, StatusStrip

DEMO_ROWS = ("AHU-1 coil", "AHU-2 coil", "AHU-3 coil", "Bypass", "└ seg. 2")


def _status_lines(app) -> list[str]:
    return str(app.screen.query_one(StatusStrip).render()).splitlines()


def _words(text: str) -> str:
    return " ".join(text.split())


def test_long_errors_at_80x24(ui):
    async def scenario() -> None:
        async with ui.started() as (app, pilot):
            # A branch error longer than a line: wrapped in the status, the value typed in sight.
            long_name = "Chilled-water return to air handler AHU-1 coil (level 3)"
            app.edit("Rename", lambda s: setattr(s.branches[0], "name", long_name))
            app.edit("Length", lambda s: setattr(s.branches[0].segments[0], "length", "-2 m"))
            await ui.settle(pilot)
            message = app.error_words(app.outcome.error)
            assert "got -2 m" in message and len(message) > 80
            lines = _status_lines(app)
            assert 1 < len(lines) <= 1 + ERROR_LINES
            assert _words(" ".join(lines[1:])) == _words(f"✗ {message} (F3 Branches)")
            assert all(len(line) <= 78 for line in lines)  # 80 less the strip's padding

            # A no-solution too long for two lines: cut at the end with where to read it, and
            # read whole beside the Find row; every branch row of the demo stays in sight.
            app.edit("Back", lambda s: setattr(s.branches[0].segments[0], "length", "62 m"))
            app.edit("Name", lambda s: setattr(s.branches[0], "name", "AHU-1 coil"))
            app.edit("Find", lambda s: set_find(s, "diameter", "AHU-1 coil", "1000 L/s"))
            await ui.settle(pilot)
            assert isinstance(app.outcome.error, NoSolutionError)
            message = app.error_words(app.outcome.error)
            lines = _status_lines(app)
            assert len(lines) == 1 + ERROR_LINES
            assert lines[-1].endswith("…  (F4 Split)")
            assert "1000 L/s" in lines[1]  # the figure asked for is in sight
            screen = _words(ui.text(app))
            assert _words(message) in screen
            text = ui.text(app)
            for row in DEMO_ROWS:
                assert row in text, row

            # Fixed: the status takes one line again.
            await pilot.press("ctrl+z")
            await ui.settle(pilot)
            assert app.outcome.ok and len(_status_lines(app)) == 2

    ui.run(scenario)


def test_cell_editor_says_what_is_edited(ui):
    async def scenario() -> None:
        async with ui.started("f3") as (app, pilot):
            screen = app.screen
            box = screen.query_one("#branches")
            assert "Enter edit" in ui.text(app)
            await pilot.press("down", "enter")  # the name cell of AHU-2 coil
            await pilot.pause()
            text = ui.text(app)
            assert "✎ Renaming AHU-2 coil — Enter keeps · Esc cancels" in text
            assert "Enter edit" not in text  # the table's key hint would mislead here
            assert box.has_class("-editing")
            # The edited cell is drawn in the editing colour (not the plain blurred cursor).
            table = screen.query_one("#branch-table")
            warning = app.get_css_variables()["warning"].upper()

            def cursor_colour() -> str:
                return table.get_component_styles("datatable--fixed-cursor").background.hex

            assert cursor_colour() == warning
            # Arrows move in the text, not in the table; Esc leaves the name as it was.
            await pilot.press("left", "left", "x", "escape")
            await pilot.pause()
            assert app.site.branches[1].name == "AHU-2 coil"
            assert not box.has_class("-editing") and "Enter edit" in ui.text(app)
            assert cursor_colour() != warning
            assert "Renaming" not in ui.text(app)
            # A length: said by its column, kept by Enter.
            await pilot.press("right", "right", "right", "right", "enter")
            await pilot.pause()
            assert "✎ Editing AHU-2 coil · Length — Enter keeps · Esc cancels" in ui.text(app)
            await pilot.press("ctrl+u", *"170 ft", "enter")
            await ui.settle(pilot)
            assert app.site.branches[1].segments[0].length == "170 ft"
            assert not box.has_class("-editing")

    ui.run(scenario)
