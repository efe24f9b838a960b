"""What a new user needs is in sight: the cautions and the keys the footer has no room for on
every screen; every material and fitting in the branch form's lists and in help, an unknown
name refused in the form; a new branch says what it was filled in from; two saved sites of one
name are told apart; the sizing question stays in the saved site; the band says Cv where Cv
was given."""

from __future__ import annotations

import pytest

from branchwise.core.catalogs import fittings, materials
from branchwise.core.site.read import demo_site, load_site
from branchwise.core.site.write import save_site
from branchwise.tui.screens.catalog import CatalogPicker
from branchwise.tui.widgets.field import Field


@pytest.mark.parametrize("size", [(80, 24), (120, 40)])
def test_cautions_and_hidden_keys_on_every_screen(ui, size):
    async def scenario() -> None:
        async with ui.started(size=size) as (app, pilot):
            for key, keys in (("f4", ("o branch", "t target", "l tolerances")),
                              ("f3", ("m reading",)), ("f2", ("F8 site", "^T SI/US"))):
                await pilot.press(key)
                await ui.settle(pilot)
                text = ui.text(app)
                assert "Estimates only" in text and "confirm on site" in text, key
                for words in keys:
                    assert words in text, (key, words)
                assert "^T]" in text  # the unit system and its key, in the status strip
            if size[0] >= 120:
                await pilot.press("f3")
                await ui.settle(pilot)
                assert "^O open, new" in ui.text(app)

    ui.run(scenario)


def test_materials_and_fittings_checked_and_listed_in_the_form(ui):
    every_material = {m.key for m in materials()}
    aged = {f"{m.key} aged" for m in materials() if m.aged_roughness_m is not None}

    async def scenario() -> None:
        async with ui.started("f3") as (app, pilot):
            await pilot.press("e")
            form = app.screen
            wall = form.query_one("#f-0-wall", Field)
            wall.input.focus()
            await pilot.press("ctrl+u", *"unobtainium", "enter")
            await pilot.pause()
            assert wall.has_class("-error")  # refused here, the cursor kept
            assert "no material 'unobtainium'" in str(wall.query_one(".field-message").render())
            assert app.focused is wall.input
            await pilot.press("ctrl+l")
            await pilot.pause()
            picker = app.screen
            assert isinstance(picker, CatalogPicker)
            listed = {value for _, value in picker.choices}
            assert every_material | aged <= listed  # every material, new and aged
            await pilot.press("escape")
            await pilot.pause()
            wall.input.focus()
            await pilot.press("ctrl+u", *"cast iron aged")
            await pilot.pause()
            assert not wall.has_class("-error")
            await pilot.press("ctrl+u", *"pvc aged")  # PVC has no aged figure
            await pilot.pause()
            assert "no aged roughness" in str(wall.query_one(".field-message").render())

            fits = form.query_one("#f-0-fittings", Field)
            fits.input.focus()
            await pilot.press("ctrl+l")
            await pilot.pause()
            picker = app.screen
            assert {value for _, value in picker.choices} == {f.key for f in fittings()}
            index = [v for _, v in picker.choices].index("swing-check-valve-full-port")
            picker.query_one("OptionList").highlighted = index
            await pilot.press("enter")
            await pilot.pause()
            assert "swing-check-valve-full-port 1" in fits.text
            await pilot.press("end", *", elbow-91 2")
            await pilot.pause()
            assert "no fitting 'elbow-91'" in str(fits.query_one(".field-message").render())
            await pilot.press("ctrl+u", *"swing-check-valve-clearway 1")  # the earlier key
            await pilot.pause()
            assert not fits.has_class("-error")

    ui.run(scenario)


def test_help_lists_every_material_and_fitting(ui):
    async def scenario() -> None:
        async with ui.started(size=(140, 200)) as (app, pilot):  # tall: help shows whole
            await pilot.press("f1")
            await pilot.pause()
            text = ui.text(app)
            for m in materials():
                assert m.key in text, m.key
                if m.aged_roughness_m is not None:
                    assert f"{m.key} aged" in text
            for f in fittings():
                assert f.key in text, f.key

    ui.run(scenario)


def test_a_new_branch_says_what_it_was_filled_in_from(ui):
    async def scenario() -> None:
        async with ui.started("f3") as (app, pilot):
            await pilot.press("a")
            await pilot.pause()
            assert "Size and wall copied from AHU-1 coil" in ui.text(app)
            assert app.screen.query_one("#f-0-size", Field).text == "4 in sch 40"

    ui.run(scenario)


def test_two_saved_sites_of_one_name_show_their_files(ui, data_dir):
    for stem in ("north", "north-old"):
        site = demo_site()
        site.name = "North header"
        save_site(site, data_dir / "sites" / f"{stem}.toml")

    async def scenario() -> None:
        async with ui.started() as (app, pilot):
            await pilot.press("ctrl+o")
            await pilot.pause()
            text = ui.text(app)
            assert "North header (north.toml)" in text
            assert "North header (north-old.toml)" in text

    ui.run(scenario)


def test_the_sizing_question_stays_in_the_saved_site(ui, tmp_path):
    path = save_site(demo_site(), tmp_path / "site.toml")

    async def scenario() -> None:
        async with ui.started(site=path) as (app, pilot):
            app.screen.query_one("#find-kind").pick("diameter")
            await ui.settle(pilot)
            target = app.site.solve.target_flow
            app.screen.query_one("#find-kind").pick("flows")  # back to the flows
            await ui.settle(pilot)
            assert app.outcome.ok
            await pilot.press("ctrl+s")
            await pilot.pause()
        saved = load_site(path).solve
        assert (saved.find, saved.branch, saved.target_flow) == ("flows", "AHU-1 coil",
                                                                 target)

    async def reopen() -> None:
        async with ui.started(site=path) as (app, pilot):
            app.screen.query_one("#find-kind").pick("diameter")
            await ui.settle(pilot)
            assert app.site.solve.branch == "AHU-1 coil" and app.outcome.ok

    ui.run(scenario)
    ui.run(reopen)


def test_the_band_says_cv_where_cv_was_given(ui):
    async def scenario() -> None:
        async with ui.started(size=(120, 40)) as (app, pilot):
            await pilot.press("b")
            for _ in range(200):
                await pilot.pause(0.05)
                band = app.latest_band
                if band is not None and band.solved is not None:
                    break
            names = [i.name for i in app.latest_band.solved.uncertainty.inputs]
            assert "branch 'AHU-2 coil' valve Cv" in names  # given as Cv 110
            assert "branch 'AHU-1 coil' valve Kv" in names  # given as Kv 160

    ui.run(scenario)


def test_the_form_refuses_a_negative_k_and_shows_a_new_segment(ui):
    """Extra K below zero is refused in the form, as typed (not after it closes); Ctrl+N at
    80×24 scrolls to the new segment's first field, where the typing goes."""
    async def scenario() -> None:
        async with ui.started("f3", size=(80, 24)) as (app, pilot):
            await pilot.press("e")
            form = app.screen
            k = form.query_one("#f-0-k", Field)
            k.input.focus()
            await pilot.press("ctrl+u", *"-1", "enter")
            await pilot.pause()
            assert k.has_class("-error") and app.focused is k.input
            assert "got -1" in str(k.query_one(".field-message").render())
            await pilot.press("ctrl+u", "ctrl+n")
            await ui.settle(pilot)
            size = app.screen.query_one("#f-1-size", Field)
            assert app.focused is size.input
            shown = app.screen.query_one("#form-fields").region  # the form's scrolled part
            for ident in ("#f-1-size", "#f-1-length"):  # the new segment, not just its edge
                box = app.screen.query_one(ident, Field).input.region
                assert shown.y <= box.y and box.bottom <= shown.bottom, (ident, box, shown)
            await pilot.press("escape")
            await pilot.pause()

    ui.run(scenario)
