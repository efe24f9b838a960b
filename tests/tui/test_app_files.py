"""Nothing is lost: the recovery copy after a crash, the question on quitting, the site list,
and the walkdown record and CSV written from the results."""

from __future__ import annotations

import csv
import io

import pytest

import branchwise.tui.state.outcome as outcome_module
from branchwise.core.site.read import demo_site
from branchwise.core.site.write import save_site
from branchwise.tui.app import BranchwiseApp
from branchwise.tui.screens.dialogs import ChoiceScreen


def test_recovery_copy_after_a_crash_and_the_question_on_quitting(ui, data_dir):
    async def crash() -> None:
        async with ui.started() as (app, pilot):
            await pilot.press("v")
            await ui.type(pilot, "7.5 psi")
            await ui.settle(pilot)
            app.files.write_recovery()  # what the timer does a second after typing stops
            await ui.workers_done(app)
            assert app.files.recovery_file().is_file()
            assert app.files.recovery_file().name.startswith("untitled.")  # this instance's
            app.exit()  # no question asked: as if the terminal were closed

    async def come_back() -> None:
        async with ui.started() as (app, pilot):
            await pilot.pause()
            assert isinstance(app.screen, ChoiceScreen)
            assert "Unsaved changes" in ui.text(app)
            await pilot.press("r")
            await ui.settle(pilot)
            assert app.site.conditions.pressure_drop == "7.5 psi"
            assert app.session.dirty and "●" in app.sub_title

            # Quitting asks; Escape stays; "Don't save" quits and drops the recovery copy.
            await pilot.press("ctrl+q")
            await pilot.pause()
            assert isinstance(app.screen, ChoiceScreen)
            await pilot.press("escape")
            await pilot.pause()
            assert app.is_running and not isinstance(app.screen, ChoiceScreen)
            await pilot.press("ctrl+q")
            await pilot.pause()
            await pilot.press("n")
            await pilot.pause()
        assert not list((data_dir / "recovery").glob("*.toml"))  # restored, then dropped

    ui.run(crash)
    ui.run(come_back)


def test_open_from_the_site_list_and_export(ui, data_dir):
    site = demo_site()
    site.name = "Pump room 2"
    site.conditions.pressure_drop = "55 kPa"
    path = save_site(site, data_dir / "sites" / "pump-room-2.toml")

    async def scenario() -> None:
        async with ui.started() as (app, pilot):
            await pilot.press("ctrl+o")
            listing = ui.text(app)
            assert "Pump room 2" in listing and "pump-room-2.toml" in listing
            assert "Demo: chilled-water header" in listing and "New empty site" in listing
            await pilot.press("enter")  # the first row: the saved site
            await ui.settle(pilot)
            assert app.site.source == path and app.site.title == "Pump room 2"
            assert app.settings.last_site == path

            # The walkdown record (Markdown), next to the site file.
            await pilot.press("r")
            assert app.screen.__class__.__name__ == "SaveAsScreen"
            await pilot.press("enter")
            await pilot.pause()
            records = list(path.parent.glob("pump-room-2-*.md"))
            assert len(records) == 1
            text = records[0].read_text(encoding="utf-8")
            assert text.startswith("# Walkdown record: Pump room 2")
            assert "55 kPa" in text and "## Cautions" in text

            # The CSV: one row per segment, a header with units.
            await pilot.press("c", "enter")
            await pilot.pause()
            rows = list(csv.reader(io.StringIO(
                next(path.parent.glob("pump-room-2-*.csv")).read_text(encoding="utf-8"))))
            assert rows[0][0].startswith("Branch") and any("(L/s)" in c for c in rows[0])
            # Tidy data: the header, then one row per segment and nothing else.
            assert len(rows) == 1 + 5  # four branches, the bypass in two segments
            assert {len(r) for r in rows} == {len(rows[0])}

            # A fault in the solver itself (simulated): said on screen, the app carries on.
            real = outcome_module.compute

            def broken(site, revision, presets=None):
                raise RuntimeError("simulated fault")

            outcome_module.compute = broken
            try:
                await pilot.press("v")
                await ui.type(pilot, "1")
                await ui.settle(pilot)
            finally:
                outcome_module.compute = real
            assert "internal error while solving" in ui.text(app)
            await pilot.press("ctrl+z")
            await ui.settle(pilot)
            assert app.outcome.ok and app.site.conditions.pressure_drop == "55 kPa"
            assert not app.session.dirty  # undone back to the file: nothing unsaved
            await pilot.press("end", "ctrl+u", *"60", "enter")  # a change that is not saved
            await ui.settle(pilot)

            # A new empty site: the first thing missing is named beside its field.
            await pilot.press("escape", "ctrl+o")
            table = app.screen.query_one("DataTable")
            table.move_cursor(row=table.row_count - 1)
            await pilot.press("enter")
            await pilot.pause()
            assert isinstance(app.screen, ChoiceScreen)  # the 60 kPa is not saved
            await pilot.press("n")
            await ui.settle(pilot)
            assert app.site.title == "New site" and not app.outcome.ok
            assert "Branch 1" in ui.text(app)

    ui.run(scenario)


def test_branchwise_open_site_then_plain_branchwise_comes_back_to_it(ui, data_dir):
    site = demo_site()
    site.name = "Cooling tower loop"
    path = save_site(site, data_dir / "elsewhere" / "tower.toml")

    async def scenario() -> None:
        app = BranchwiseApp(path)  # as `branchwise open tower.toml` starts it
        async with app.run_test(size=(80, 24)) as pilot:
            await ui.settle(pilot)
            assert app.site.source == path
            assert "Cooling tower loop" in ui.text(app)

    ui.run(scenario)
    again = BranchwiseApp()  # as a plain `branchwise` starts it
    assert again.site.source == path and again.site.title == "Cooling tower loop"


def test_exports_say_each_quantity_in_the_unit_the_person_chose(ui, data_dir):
    # SI, with the flow chosen in m³/h: the CSV and the record give the flows in m³/h, as the
    # screen and the HTML report do (1 L/s = 3.6 m³/h: the units' definitions).
    site = demo_site()
    site.name = "Pump room 3"
    path = save_site(site, data_dir / "sites" / "pump-room-3.toml")

    async def scenario() -> None:
        async with ui.started(site=path) as (app, pilot):
            app.settings.display_units = {"flow": "m³/h"}
            app.unit_system = "si"
            await ui.settle(pilot)
            litres = float(app.outcome.solved.result.total_flow) * 1000
            await pilot.press("c", "enter")
            await pilot.pause()
            rows = list(csv.reader(io.StringIO(
                next(path.parent.glob("pump-room-3-*.csv")).read_text(encoding="utf-8"))))
            flow = rows[0].index("Flow (m3/h)")  # ASCII units in a CSV header
            total = sum(float(r[flow]) for r in rows[1:] if r[flow])
            assert total == pytest.approx(litres * 3.6, rel=1e-9)
            await pilot.press("r", "enter")
            await pilot.pause()
            record = next(path.parent.glob("pump-room-3-*.md")).read_text(encoding="utf-8")
            assert "m³/h" in record and "L/s" not in record.split("## Cautions")[0]

    ui.run(scenario)


def test_a_name_typed_with_its_extension_is_not_given_a_second_one(ui, data_dir, tmp_path):
    # The dialog selects the name's stem; typing "bldg7.toml" over it left ".toml" after the
    # selection, and the site was saved as bldg7.toml.toml.
    from branchwise.tui.screens.dialogs import SaveAsScreen

    box = SaveAsScreen(tmp_path, "site.toml")
    assert box.target("bldg7.toml.toml") == tmp_path / "bldg7.toml"
    assert box.target(f"{tmp_path}/b.TOML.toml") == tmp_path / "b.TOML"
    assert box.target("bldg7") == tmp_path / "bldg7.toml"
    assert SaveAsScreen(tmp_path, "r.md", suffix=".md").target("rec.md.md") == tmp_path / "rec.md"

    async def scenario() -> None:
        async with ui.started() as (app, pilot):
            await ui.settle(pilot)
            await pilot.press("ctrl+r")
            await pilot.pause()
            assert app.screen.__class__.__name__ == "SaveAsScreen"
            await ui.type(pilot, str(tmp_path / "bldg7.toml"))
            await pilot.press("enter")
            await ui.settle(pilot)
            assert (tmp_path / "bldg7.toml").is_file()
            assert not (tmp_path / "bldg7.toml.toml").exists()

    ui.run(scenario)
