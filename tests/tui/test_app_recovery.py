"""Recovery copies bring back exactly the work that was not saved, and only that.

An undo back to the saved state leaves no copy; each running instance keeps its own copy under
its own owner mark and deletes only its own; a copy is found by the resolved path of its site
however the site was opened; a copy older than the saved file says so before it is restored.
"""

from __future__ import annotations

import os
import time

from branchwise.core.site.read import demo_site, load_site
from branchwise.core.site.write import dump_site, save_site
from branchwise.core.storage.recovery import Keeper
from branchwise.tui.app import BranchwiseApp
from branchwise.tui.screens.dialogs import ChoiceScreen


def _copies(data_dir):
    return sorted((data_dir / "recovery").glob("*.toml"))


async def _type_lift(app, pilot, ui, text: str) -> None:
    await pilot.press("v", "enter", "ctrl+u")  # the given's field, Enter: the lift
    await ui.type(pilot, text)
    await ui.settle(pilot)
    app.files.write_recovery()  # what the timer does a second after typing stops
    await ui.workers_done(app)


def test_an_undo_back_to_the_saved_state_leaves_no_copy_to_offer(ui, data_dir, tmp_path):
    path = save_site(demo_site(), tmp_path / "site.toml")

    async def edit_then_undo() -> None:
        async with ui.started(site=path) as (app, pilot):
            await _type_lift(app, pilot, ui, "1.5")
            assert app.site.conditions.elevation_change == "1.5 m"
            assert len(_copies(data_dir)) == 1
            await pilot.press("escape", "ctrl+z")
            await ui.settle(pilot)
            assert not app.session.dirty
            assert _copies(data_dir) == []  # gone with the last unsaved change
            await pilot.press("ctrl+q")  # nothing unsaved: no question
            await pilot.pause()

    async def open_again() -> None:
        async with ui.started(site=path) as (app, pilot):
            await pilot.pause()
            assert not isinstance(app.screen, ChoiceScreen)
            assert "Recovered work" not in ui.text(app)

    ui.run(edit_then_undo)
    ui.run(open_again)


def test_each_instance_keeps_its_own_copy_and_deletes_only_its_own(ui, data_dir, tmp_path):
    path = save_site(demo_site(), tmp_path / "site.toml")
    other = Keeper()  # a second branchwise on the same site, still running

    async def scenario() -> None:
        async with ui.started(site=path) as (app, pilot):
            theirs = load_site(path)
            theirs.conditions.elevation_change = "2 m"
            their_copy = other.write(path, dump_site(theirs))
            await _type_lift(app, pilot, ui, "1.5")
            mine = app.files.recovery_file()
            assert mine != their_copy and mine.is_file() and their_copy.is_file()
            assert mine.read_text().startswith("# branchwise recovery copy: owner")
            # Don't save: this instance's copy goes, the other one's stays.
            await pilot.press("ctrl+q")
            await pilot.pause()
            await pilot.press("n")
            await pilot.pause()
        assert not mine.exists() and their_copy.is_file()

    async def while_the_other_runs() -> None:
        async with ui.started(site=path) as (app, pilot):
            await pilot.pause()
            # Its copy is not offered (it is its work, still open), only mentioned.
            assert not isinstance(app.screen, ChoiceScreen)
            assert any("Another branchwise" in str(n.message) for n in app._notifications)

    async def after_the_other_was_killed() -> None:
        async with ui.started(site=path) as (app, pilot):
            await pilot.pause()
            assert isinstance(app.screen, ChoiceScreen)
            await pilot.press("r")
            await ui.settle(pilot)
            assert app.site.conditions.elevation_change == "2 m"
            assert app.session.dirty
        # Restored: it lives on as this instance's copy; the one left behind is gone.
        assert [c.name.split(".")[1] for c in _copies(data_dir)] != [other.owner]

    ui.run(scenario)
    ui.run(while_the_other_runs)
    other.release()  # as when the other instance is killed: its lock goes with it
    ui.run(after_the_other_was_killed)


def test_two_new_sites_never_share_a_copy(ui, data_dir):
    one, two = Keeper(), Keeper()
    a = one.write(None, dump_site(demo_site()))
    b = two.write(None, dump_site(demo_site()))
    assert a != b and a.is_file() and b.is_file()
    two.drop(None)
    assert a.is_file() and not b.exists()
    one.release()
    two.release()


def test_a_copy_is_found_by_the_resolved_path(ui, data_dir, tmp_path):
    real = tmp_path / "plant" / "w"
    real.mkdir(parents=True)
    path = save_site(demo_site(), real / "site.toml")
    (tmp_path / "link").symlink_to(real)
    left = Keeper()
    site = load_site(path)
    site.conditions.elevation_change = "3 m"
    left.write(path, dump_site(site))
    left.release()  # it ended without saving

    async def scenario(opened_as) -> None:
        app = BranchwiseApp(opened_as)
        async with app.run_test(size=(80, 24)) as pilot:
            await ui.settle(pilot)
            await pilot.pause()
            assert isinstance(app.screen, ChoiceScreen), opened_as
            assert "Recovered work" in ui.text(app)

    cwd = os.getcwd()
    os.chdir(real)
    try:
        ui.run(lambda: scenario("../w/site.toml"))
    finally:
        os.chdir(cwd)
    ui.run(lambda: scenario(tmp_path / "link" / "site.toml"))


def test_a_copy_older_than_the_saved_file_says_so(ui, data_dir, tmp_path):
    path = save_site(demo_site(), tmp_path / "site.toml")
    left = Keeper()
    site = load_site(path)
    site.conditions.elevation_change = "3 m"
    copy = left.write(path, dump_site(site))
    left.release()
    old = time.time() - 3600
    os.utime(copy, (old, old))  # written an hour before the file was last saved

    async def scenario() -> None:
        async with ui.started(site=path) as (app, pilot):
            await pilot.pause()
            assert isinstance(app.screen, ChoiceScreen)
            assert "The file was saved after it" in app.screen.question
            await pilot.press("escape")  # decide later: the copy stays
            await pilot.pause()
        assert copy.is_file()

    ui.run(scenario)
