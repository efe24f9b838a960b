"""The walkdown record and the branch tags, typed in the app: F8 (site and readings), the tag in
the branch form and the wide branch table; valves in series and glycol by volume as typed.

Each edit is checked on the site (the one truth), undone, and read back from the saved file
with the core's own reader (the site-file contract of ``core/sitefile.py``).
"""

from __future__ import annotations

import datetime
import math

import pytest
from textual.widgets import DataTable

from branchwise.core.site.read import load_site
from branchwise.tui.app import BranchwiseApp

SITE = """format = 1
name = "Test header"

[fluid]
kind = "water"
temperature = "20 degC"

[conditions]
pressure_drop = "30 kPa"

[[branches]]
name = "A"
diameter = "52.5 mm"
length = "20 m"
roughness = "0.045 mm"
valve_kv = 160

[[branches]]
name = "B"
diameter = "40.9 mm"
length = "30 m"
roughness = "0.045 mm"
"""


@pytest.fixture
def site_file(tmp_path):
    path = tmp_path / "header.toml"
    path.write_text(SITE, encoding="utf-8")
    return path


def test_site_and_readings_dialog(ui, site_file):
    async def scenario() -> None:
        app = BranchwiseApp(site_file)
        async with app.run_test(size=(80, 24)) as pilot:
            await ui.settle(pilot)
            assert app.site.record is None

            # Esc leaves everything as it was.
            await pilot.press("f8")
            await pilot.pause()
            await pilot.press("escape")
            await pilot.pause()
            assert app.site.record is None and not app.session.undo_stack

            await pilot.press("f8")
            await pilot.pause()
            await pilot.press("tab", *"J. Doe", "tab", "ctrl+d", "tab", *"DPG-14, 0-30 psid",
                              "tab", *"UFM-2 clamp-on")
            await pilot.press("enter")
            await ui.settle(pilot)
            record = app.site.record
            assert record is not None
            assert record.technician == "J. Doe"
            # Ctrl+D puts today's date as ISO 8601 text (what a TOML date reads back as).
            assert record.date == datetime.date.today().isoformat()
            assert record.pressure_instrument == "DPG-14, 0-30 psid"
            assert record.flow_instrument == "UFM-2 clamp-on"
            assert app.site.name == "Test header"

            # One undo step takes the whole record away; redo brings it back.
            await pilot.press("ctrl+z")
            await ui.settle(pilot)
            assert app.site.record is None
            await pilot.press("ctrl+y")
            await ui.settle(pilot)
            assert app.site.record == record

            # Clearing every field leaves no [record] at all.
            await pilot.press("f8")
            await pilot.pause()
            await pilot.press("tab", "ctrl+u", "tab", "ctrl+u", "tab", "ctrl+u", "tab",
                              "ctrl+u", "enter")
            await ui.settle(pilot)
            assert app.site.record is None
            # Blank fields are left out; the word "today" is today's date.
            await pilot.press("f8")
            await pilot.pause()
            # Enter moves field by field and keeps on the last (date, instruments, kept).
            await pilot.press("tab", "tab", *"today", "enter")
            assert app.focused is app.screen.query_one("#details-pressure_instrument").input
            await pilot.press("enter", "enter")
            await ui.settle(pilot)
            assert app.site.record is not None and app.site.record.technician is None
            assert app.site.record.date == datetime.date.today().isoformat()

            await pilot.press("ctrl+z", "ctrl+z", "ctrl+s")
            await ui.settle(pilot)
            assert not app.session.dirty
        saved = load_site(site_file)
        assert saved.record == record
        text = site_file.read_text(encoding="utf-8")
        assert "[record]" in text and 'technician = "J. Doe"' in text

    ui.run(scenario)


def test_branch_tag_in_the_form_and_the_wide_table(ui, site_file):
    async def scenario() -> None:
        async with ui.started("f3", (120, 40), site_file) as (app, pilot):
            table = app.screen.query_one("#branch-table", DataTable)
            labels = [str(c.label) for c in table.ordered_columns]
            assert labels[:2] == ["Branch", "Tag"]

            # The form: the tag under the name (the cursor starts in the column it came from,
            # Branch: the name); Enter field by field, and on the last field it applies.
            await pilot.press("e")
            await pilot.pause()
            assert app.focused is app.screen.query_one("#f-name").input
            await pilot.press("enter", *"CHW-R-104", *["enter"] * 8)
            await ui.settle(pilot)
            assert app.site.branches[0].tag == "CHW-R-104"
            assert "CHW-R-104" in ui.text(app)

            # In place, on the second branch's Tag cell.
            table.move_cursor(row=1, column=1)
            await pilot.press("enter", *"CHW-R-105", "enter")
            await ui.settle(pilot)
            assert app.site.branches[1].tag == "CHW-R-105"
            await pilot.press("ctrl+z")
            await ui.settle(pilot)
            assert app.site.branches[1].tag is None
            await pilot.press("ctrl+s")
            await ui.settle(pilot)

            # Below 100 columns the tag column gives way to the figures.
            await pilot.resize_terminal(80, 24)
            await ui.settle(pilot)
            labels = [str(c.label) for c in table.ordered_columns]
            assert "Tag" not in labels and labels[0] == "Branch"
        assert [b.tag for b in load_site(site_file).branches] == ["CHW-R-104", None]

    ui.run(scenario)


def test_valves_in_series_typed_in_the_form(ui, site_file):
    async def scenario() -> None:
        app = BranchwiseApp(site_file)
        async with app.run_test(size=(80, 24)) as pilot:
            await ui.settle(pilot)
            await pilot.press("f3")
            await ui.settle(pilot)
            await pilot.press("e")
            await pilot.pause()
            await pilot.press("enter", "enter", "ctrl+u", *"Kv 160 + 4O")  # name, tag, valve
            await pilot.pause()
            form = app.screen
            valve = form.query_one("#f-valve")
            assert valve.has_class("-error")  # a letter O for a zero
            await pilot.press("enter")
            await pilot.pause()
            assert app.screen is form  # not applied
            await pilot.press("ctrl+u", *"Kv 160 + Kv 40", *["enter"] * 7)
            await ui.settle(pilot)
            assert app.site.branches[0].valve_kv == "160 + 40"
            flows = app.outcome.solved.result.flows

        # Valves in series pass one flow and their drops add; with Δp = (Q/Kv)² (the Kv of
        # IEC 60534-1), 1/Kv² = 1/160² + 1/40²: the same answer as one valve of that Kv.
        from branchwise.core.site.read import parse_site
        from branchwise.core.site.solve import solve_site

        one = 1 / math.sqrt(1 / 160**2 + 1 / 40**2)
        expected = solve_site(parse_site(SITE.replace("valve_kv = 160", f"valve_kv = {one!r}")))
        assert list(flows) == pytest.approx(list(expected.result.flows), rel=1e-9)

    ui.run(scenario)


def test_glycol_by_volume_on_the_liquid_screen(ui, site_file):
    from CoolProp.CoolProp import PropsSI

    async def scenario() -> None:
        app = BranchwiseApp(site_file)
        async with app.run_test(size=(120, 40)) as pilot:
            await ui.settle(pilot)
            app.edit("Glycol", lambda s: setattr(s.fluid, "kind", "ethylene-glycol"))
            await pilot.press("f2")
            await ui.settle(pilot)
            field = app.screen.query_one("#fluid-concentration")
            assert "unless vol" in field.input.placeholder
            field.input.focus()
            await pilot.press(*"30 vol")  # a bare number takes the field's %, before "vol"
            await ui.settle(pilot)
            assert app.site.fluid.concentration == "30 % vol"
            name = app.outcome.fluid.name
            assert "30 % by volume" in name
            # ASHRAE data by volume (CoolProp INCOMP::AEG) at 20 °C, which the app reads for a
            # volume concentration; the bound is the table's interpolation error (see
            # tests/references/test_glycol_volume.py).
            reference = PropsSI("D", "T", 293.15, "P", 101325.0, "INCOMP::AEG[0.3]")
            assert app.outcome.fluid.density == pytest.approx(reference, rel=4e-7)

    ui.run(scenario)


def test_record_of_unsaved_changes_says_so(ui, site_file):
    """A record written while the site holds changes not yet saved cites the file with that
    said: the file alone would not give back the figures (the readings differ)."""
    async def scenario() -> None:
        app = BranchwiseApp(site_file)
        async with app.run_test(size=(80, 24)) as pilot:
            await ui.settle(pilot)
            # F8 points at where the instruments' accuracy is typed (it sets the band).
            await pilot.press("f8")
            await pilot.pause()
            assert "accuracy sets the band: l (Tolerances) on Split" in ui.text(app)
            await pilot.press("escape")
            await pilot.pause()

            def record() -> str:
                found = sorted(site_file.parent.glob("*.md"), key=lambda p: p.stat().st_mtime)
                return found[-1].read_text(encoding="utf-8")

            await pilot.press("r", "enter")
            await pilot.pause()
            saved = next(line for line in record().splitlines() if "Site file" in line)
            assert saved.endswith(f"`{site_file}`")  # just the file: it holds these figures

            app.edit("Given value", lambda s: setattr(s.conditions, "pressure_drop", "40 kPa"))
            await ui.settle(pilot)
            assert app.session.dirty
            await pilot.press("r", "enter")
            await pilot.pause()
            text = record()
            line = next(line for line in text.splitlines() if "Site file" in line)
            assert str(site_file) in line and line.endswith("` (with unsaved changes)")
            assert "40 kPa" in text  # the figures are those of the site as it now is
            # and the notice says so too
            assert any("unsaved changes" in n.message for n in app._notifications)

    ui.run(scenario)


def test_the_record_date_must_be_a_day_that_exists(ui):
    """2025-02-30 and 12/03/2025 are refused beside the date field (a report would print a
    day that does not exist, or one read two ways); a real date is kept."""
    async def scenario() -> None:
        async with ui.started(None) as (app, pilot):
            for bad in ("2025-02-30", "12/03/2025"):
                await pilot.press("f8")
                await pilot.pause()
                await pilot.press("tab", "tab", "ctrl+u", *bad, "enter")
                await pilot.pause()
                assert "must be a date" in ui.text(app), bad
                assert app.focused is app.screen.query_one("#details-date").input
                await pilot.press("tab", "tab", "enter")  # Enter on the last field: refused
                await pilot.pause()
                assert app.focused is app.screen.query_one("#details-date").input
                await pilot.press("escape")
                await pilot.pause()
            await pilot.press("f8")
            await pilot.pause()
            await pilot.press("tab", "tab", "ctrl+u", *"2025-02-28", "enter", "enter", "enter")
            await ui.settle(pilot)
            assert app.site.record is not None and app.site.record.date == "2025-02-28"

    ui.run(scenario)
