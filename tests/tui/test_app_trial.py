"""What a newcomer's trial (a hot-water header with three branches) stumbled on: where the
branch form starts, Enter in forms, the target flow carried into a find, the absolute pressure,
the 80×24 layouts in US units, focus that shows, the curve legend without colour, unsaved
changes that are not, and the folder a file is written to.
"""

from __future__ import annotations

import re
from pathlib import Path

import pytest

from branchwise.core.catalogs import parse_size
from branchwise.tui.app import BranchwiseApp
from branchwise.tui.screens.branches.form import BranchForm
from branchwise.tui.widgets.curveplot import MARKERS, PlotData, Series, draw
from branchwise.tui.widgets.field import Field


def test_branch_form_starts_where_the_person_was(ui):
    async def scenario() -> None:
        async with ui.started("f3") as (app, pilot):
            # A new branch: the name first, selected, so that typing replaces it.
            await pilot.press("a")
            await pilot.pause()
            form = app.screen
            assert isinstance(form, BranchForm)
            name = form.query_one("#f-name", Field)
            assert app.focused is name.input and name.input.selected_text == name.text
            await pilot.press("escape")
            await pilot.pause()
            # The form on the Valve cell of the bypass: the cursor in the valve field.
            table = app.screen.query_one("#branch-table")
            table.move_cursor(row=3, column=app.screen._keys.index("valve"))
            await pilot.press("e")
            await pilot.pause()
            assert app.focused is app.screen.query_one("#f-valve", Field).input
            await pilot.press("escape")
            # On the second segment's length: that segment's length field.
            table.move_cursor(row=4, column=app.screen._keys.index("length"))
            await pilot.press("e")
            await pilot.pause()
            assert app.focused is app.screen.query_one("#f-1-length", Field).input
            # A field's error shows beside it as it is typed, not on a line at the bottom.
            await pilot.press("ctrl+u", *"-3")
            await pilot.pause()
            length = app.screen.query_one("#f-1-length", Field)
            assert length.has_class("-error")
            assert "negative" in str(length.query_one(".field-message").render())
            assert "Enter: next field (keeps on the last)" in ui.text(app)

    ui.run(scenario)


@pytest.mark.parametrize("row", [0, 1, 3])
def test_find_diameter_prefilled_gives_back_the_installed_size(ui, row):
    """The demo's branches in NPS schedule 40 pipe: the flow each carries now, as the target of
    a found diameter (filled in as the results show it, four figures, rounded down), gives back
    a bore a hair under its own, so the catalog size is the installed size (the ASME B36.10M
    bore, from the catalog), never the next size up."""

    async def scenario() -> None:
        async with ui.started() as (app, pilot):
            site = app.site
            installed = parse_size(site.branches[row].segments[0].size, "size")
            flow = app.outcome.solved.result.branches[row].flow
            screen = app.screen
            screen.query_one("#find-kind").pick("diameter")
            await ui.settle(pilot)
            name = site.branches[row].name
            if app.site.solve.branch != name:
                await pilot.press("escape", "o")  # the 'of' picker has its own key
                await pilot.pause()
                assert app.screen.__class__.__name__ == "ChoiceMenu"
                await pilot.press("escape")
                screen.query_one("#find-branch").pick(name)
                await ui.settle(pilot)
            solved = app.outcome.solved
            target = solved.result.branches[row].flow
            assert target <= flow and target == pytest.approx(flow, rel=1e-3)
            typed = app.site.solve.target_flow.split()[0]
            assert len(typed.replace(".", "").lstrip("0")) <= 4  # the figures on screen
            found = solved.result.solved.value
            assert found <= installed.inner_diameter_m
            assert found == pytest.approx(installed.inner_diameter_m, rel=1e-2)
            assert solved.catalog.size.inner_diameter_m == installed.inner_diameter_m

    ui.run(scenario)


def test_liquid_pressure_says_absolute(ui):
    async def scenario() -> None:
        async with ui.started("f2") as (app, pilot):
            assert "Pressure (absolute)" in ui.text(app) and "[kPa abs]" in ui.text(app)
            await pilot.press("ctrl+t")
            await ui.settle(pilot)
            assert "[psi abs]" in ui.text(app)

    ui.run(scenario)


def test_80x24_in_us_units_keeps_what_matters(ui):
    async def scenario() -> None:
        async with ui.started() as (app, pilot):
            await pilot.press("ctrl+t")
            await ui.settle(pilot)
            text = ui.text(app)
            # The three losses, each in ft (on the line under the headings at 80 columns).
            head = next(line for line in text.splitlines() if "Minor" in line)
            under = text.splitlines()[text.splitlines().index(head) + 1]
            assert all(w in head for w in ("Major", "Minor", "Valve")), head
            assert under.split()[-3:] == ["ft", "ft", "ft"], under
            assert "[ft]" in text
            # Branches: moving right to the Valve column keeps the names in sight, and no
            # cut-off column sits beside them.
            await pilot.press("f3")
            await ui.settle(pilot)
            await pilot.press(*["right"] * 7)
            await pilot.pause()
            lines = ui.text(app).splitlines()
            row = next(line for line in lines if "AHU-1 coil" in line)
            assert "Kv 160" in row
            assert row.split("AHU-1 coil")[1].startswith("  ")  # no stray digit after it
            # The band: every driver's share in sight.
            await pilot.press("f4", "escape", "b")
            for _ in range(100):
                await ui.settle(pilot)
                if app.screen.views.band is not None and app.screen.views.band.solved is not None:
                    break
            await pilot.pause()
            text = ui.text(app)
            # Each driver: its share first (never pushed off the screen), bar, name, limit.
            drivers = [line for line in text.splitlines()
                       if re.match(r"\s+\d+(\.\d+)? % [ █▏▎▍▌▋▊▉]", line)]
            assert len(drivers) >= 5, text

    ui.run(scenario)


def test_focus_is_plain_to_see(ui):
    async def scenario() -> None:
        async with ui.started() as (app, pilot):
            kind = app.screen.query_one("#find-kind")
            kind.focus()
            await pilot.pause()
            assert "reverse" in str(kind.rich_style)
            await pilot.press("tab")  # to the results, which say so at their first column
            await ui.settle(pilot)
            assert app.focused.id == "results"
            header = next(line for line in ui.text(app).splitlines() if "Branch" in line)
            assert header.startswith("▶Branch")

    ui.run(scenario)


def test_curve_legend_reads_without_colour():
    data = PlotData(series=tuple(Series(name, [0, 1, 2], [0, k + 1, 4 * (k + 1)], "white")
                                 for k, name in enumerate(("A", "B", "C"))),
                    x_title="flow", y_title="Δp")
    text = draw(data, 60, 16).plain
    for marker, name in zip(MARKERS, "ABC", strict=False):
        assert f"━{marker}━ {name}" in text  # the legend gives each its glyph
        assert text.count(marker) >= 2  # and the glyph sits on the line too


def test_undo_back_to_the_saved_site_is_not_unsaved(ui, data_dir):
    async def scenario() -> None:
        async with ui.started() as (app, pilot):
            await pilot.press("v", "end", "ctrl+u", *"12", "escape")
            await ui.settle(pilot)
            assert app.session.dirty and "●" in app.sub_title
            await pilot.press("ctrl+z")
            await ui.settle(pilot)
            assert not app.session.dirty and "●" not in app.sub_title
            await pilot.press("ctrl+q")
            await pilot.pause()
            assert app.screen.__class__.__name__ != "ChoiceScreen"  # no question: quits
        assert app.return_code == 0 or app._exit_renderables == []

    ui.run(scenario)


def test_export_dialog_shows_the_real_folder(ui, data_dir, tmp_path, monkeypatch):
    from branchwise.core.site.read import demo_site
    from branchwise.core.site.write import save_site

    folder = tmp_path / "plant"
    save_site(demo_site(), folder / "header.toml")
    monkeypatch.chdir(folder)

    async def scenario() -> None:
        app = BranchwiseApp(Path("header.toml"))  # as `branchwise header.toml` starts it
        async with app.run_test(size=(80, 24)) as pilot:
            await ui.settle(pilot)
            await pilot.press("c")
            for _ in range(20):
                await pilot.pause()
                if app.screen.__class__.__name__ == "SaveAsScreen":
                    break
            where = str(app.screen.query_one(".save-folder").render())
            assert where == f"in {folder.resolve()}/ (or type a full path)" or \
                where.startswith("in ~/") and where.endswith("plant/ (or type a full path)")
            await pilot.press("enter")
            await pilot.pause()
            written = list(folder.glob("*.csv"))
            assert len(written) == 1
            message = app._notifications
            assert any(written[0].name in n.message and "\nin " in n.message
                       for n in message)

    ui.run(scenario)
