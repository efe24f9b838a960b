"""Saving asks where it could lose or hide something: a field in error, a read-only file, the
branch form's edits on Esc; a site opened through a link is saved into the file it points to."""

from __future__ import annotations

import os
import stat

from branchwise.core.site.read import demo_site, load_site
from branchwise.core.site.write import save_site
from branchwise.tui.screens.dialogs import ChoiceScreen


async def _type_given(pilot, ui, text: str) -> None:
    await pilot.press("v", "ctrl+u")
    await ui.type(pilot, text)
    await ui.settle(pilot)


def test_saving_with_a_field_in_error_asks_and_says_what_is_kept(ui, tmp_path):
    path = save_site(demo_site(), tmp_path / "site.toml")

    async def scenario() -> None:
        async with ui.started(site=path) as (app, pilot):
            await _type_given(pilot, ui, "62 kPax")
            await pilot.press("ctrl+s")
            await pilot.pause()
            assert isinstance(app.screen, ChoiceScreen)
            assert "62 kPax" in app.screen.question
            await pilot.press("escape")  # go back and fix it: nothing written
            await pilot.pause()
            assert load_site(path).conditions.pressure_drop != "62 kPax"
            assert app.session.dirty
            # Quitting: Save, then the question; saving as it is keeps the text and quits.
            await pilot.press("ctrl+q")
            await pilot.pause()
            await pilot.press("s")
            await pilot.pause()
            assert isinstance(app.screen, ChoiceScreen)
            assert app.screen.title_text == "Save with a field in error?"
            await pilot.press("s")
            await pilot.pause()
        assert load_site(path).conditions.pressure_drop == "62 kPax"

    ui.run(scenario)


def test_a_read_only_site_asks_before_it_is_replaced_and_stays_read_only(ui, tmp_path):
    path = save_site(demo_site(), tmp_path / "site.toml")
    os.chmod(path, 0o444)

    async def scenario() -> None:
        async with ui.started(site=path) as (app, pilot):
            await _type_given(pilot, ui, "61 kPa")
            await pilot.press("ctrl+s")
            await pilot.pause()
            assert isinstance(app.screen, ChoiceScreen)
            assert app.screen.title_text == "Read-only file"
            await pilot.press("y")
            await pilot.pause()
            assert not app.session.dirty

    ui.run(scenario)
    assert load_site(path).conditions.pressure_drop == "61 kPa"
    assert stat.S_IMODE(path.stat().st_mode) == 0o444


def test_a_site_opened_through_a_link_is_saved_into_its_target(ui, tmp_path):
    real = save_site(demo_site(), tmp_path / "real" / "site.toml")
    os.chmod(real, 0o600)
    link = tmp_path / "link.toml"
    link.symlink_to(real)

    async def scenario() -> None:
        async with ui.started(site=link) as (app, pilot):
            await _type_given(pilot, ui, "63 kPa")
            await pilot.press("ctrl+s")
            await pilot.pause()
            assert not app.session.dirty

    ui.run(scenario)
    assert link.is_symlink() and link.resolve() == real.resolve()
    assert load_site(real).conditions.pressure_drop == "63 kPa"
    assert stat.S_IMODE(real.stat().st_mode) == 0o600
    assert (real.parent / "site.toml.bak").is_file()


def test_esc_in_the_branch_form_asks_before_dropping_edits(ui):
    async def scenario() -> None:
        async with ui.started("f3") as (app, pilot):
            name = app.site.branches[0].name
            await pilot.press("e")  # the form, the name selected
            await pilot.pause()
            await pilot.press("escape")  # nothing typed: it closes at once
            await pilot.pause()
            assert not isinstance(app.screen, ChoiceScreen)
            assert app.screen.__class__.__name__ == "BranchesScreen"

            await pilot.press("e")
            await ui.type(pilot, "Coil X")
            await pilot.press("escape")
            await pilot.pause()
            assert isinstance(app.screen, ChoiceScreen)
            assert "Name" in app.screen.question
            await pilot.press("escape")  # go on editing: the typing is still there
            await pilot.pause()
            assert app.screen.query_one("#f-name").text == "Coil X"
            await pilot.press("escape", "k")  # keep them
            await ui.settle(pilot)
            assert app.site.branches[0].name == "Coil X"

            await pilot.press("e")
            await ui.type(pilot, "Coil Y")
            await pilot.press("escape", "d")  # drop them
            await ui.settle(pilot)
            assert app.site.branches[0].name == "Coil X" != name

    ui.run(scenario)
