"""Keys people can find: help built from the bindings, every action in the command palette,
unavailable actions greyed out, the SI/US toggle, the cautions one key away."""

from __future__ import annotations

import io

import pytest
from rich.console import Console
from textual.binding import Binding

from branchwise.tui.app import BranchwiseApp
from branchwise.tui.screens.branches.screen import BranchesScreen
from branchwise.tui.screens.liquid import LiquidScreen
from branchwise.tui.screens.split.screen import SplitScreen
from branchwise.tui.widgets.texttable import TextTable

US_GPM = 3.785411784e-3 / 60  # m³/s per US gallon per minute (NIST SP 811, gallon exact)


def described(bindings) -> list[Binding]:
    return [b for b in bindings if isinstance(b, Binding) and b.description]


def test_every_binding_has_an_id_and_a_short_description():
    for owner in (BranchwiseApp, SplitScreen, BranchesScreen, LiquidScreen):
        for binding in owner.BINDINGS:
            assert binding.id, (owner.__name__, binding.key)
            assert 0 < len(binding.description) <= 14, (owner.__name__, binding.description)
            assert binding.tooltip, (owner.__name__, binding.key)


def test_help_palette_greying_units_and_cautions(ui):
    async def scenario() -> None:
        async with ui.started() as (app, pilot):

            # Greyed, not hidden: nothing to undo yet, and the Split screen is the one shown.
            active = app.screen.active_bindings
            assert active["ctrl+z"].enabled is False
            assert active["f4"].enabled is False and active["f3"].enabled is True

            # Help lists every binding of this screen and of the app, from the bindings.
            await pilot.press("f1")
            assert "Split screen" in ui.text(app)  # it opens at the top, on this screen's keys
            console = Console(width=100, record=True, file=io.StringIO())
            console.print(app.screen.render_keys())
            help_text = console.export_text()
            for binding in described([*SplitScreen.BINDINGS, *BranchwiseApp.BINDINGS]):
                assert binding.description in help_text, binding.description
            await pilot.press("escape")
            assert isinstance(app.screen, SplitScreen)

            # The command palette offers every action of the screen and of the app.
            titles = [c.title for c in app.get_system_commands(app.screen)]
            for binding in described([*SplitScreen.BINDINGS, *BranchwiseApp.BINDINGS]):
                assert any(t.startswith(binding.description + " (") for t in titles), \
                    binding.description
            # ... and running one from there works: switch to the Branches screen.
            await pilot.press("ctrl+p")
            await ui.type(pilot, "Branches")
            await pilot.press("enter")
            await ui.settle(pilot)
            assert isinstance(app.screen, BranchesScreen)
            await pilot.press("f4")
            await ui.settle(pilot)

            # SI → US customary: the same flows in US gallons per minute.
            def first_flow() -> float:
                return float(app.screen.query_one("#results", TextTable).text_rows()[0][1])

            litres = first_flow()
            await pilot.press("ctrl+t")
            await ui.settle(pilot)
            assert app.unit_system == "us" and app.settings.unit_system == "us"
            assert app.screen.query_one("#results", TextTable).columns[1][0] == "Flow\ngpm"
            assert first_flow() == pytest.approx(litres / 1000 / US_GPM, rel=1e-3)
            assert app.screen.query_one("#given-unit").render().plain == "[psi]"

            # One quantity in a unit of one's own (US system, flows in L/s), kept in settings.
            await pilot.press("f6")
            # Enter keeps, as in every dialog; Space opens a unit's list.
            await pilot.press("tab", "tab", "space", "down", "enter", "enter")
            await ui.settle(pilot)
            assert app.settings.display_units == {"flow": "L/s"}
            labels = [label for label, _ in app.screen.query_one("#results", TextTable).columns]
            assert "Flow\nL/s" in labels and "V\nft/s" in labels
            assert first_flow() == pytest.approx(litres, rel=1e-3)

            # The cautions, one key away, and always a line on the screen (! opens them).
            assert "Estimates only" in ui.text(app) and "!" in ui.text(app)
            await pilot.press("exclamation_mark")
            text = ui.text(app)
            assert "licensed professional" in text and "estimates" in text
            await pilot.press("escape")

            # An edit makes undo available (no longer greyed) once typing pauses.
            await pilot.press("v")
            await ui.type(pilot, "9 psi")
            await ui.settle(pilot)
            await pilot.pause(0.4)
            assert app.screen.active_bindings["ctrl+z"].enabled is True

        # The unit system is remembered for next time.
        again = BranchwiseApp()
        assert again.unit_system == "us" and again.unit("flow") == "L/s"

    ui.run(scenario)
