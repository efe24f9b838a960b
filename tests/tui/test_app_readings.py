"""Several readings in one site, by keys: a clamp-on reading typed beside the gauge's Δp is kept
when the given is switched to it and back, compared with the answer on the Split screen, and
saved with ``conditions.given``; an old single-reading site saves byte for byte as it was.

The figures compared are checked against the demo's AHU-3 branch solved independently
(`fluids`, `iapws`, scipy: see test_app_walkdown.ahu3_flow_by_hand).
"""

from __future__ import annotations

import re

import pytest
from test_app_walkdown import PSI, US_GPM, ahu3_flow_by_hand
from textual.widgets import DataTable, Input

from branchwise.core.site.read import demo_text, load_site, parse_site
from branchwise.tui.app import BranchwiseApp
from branchwise.tui.state.givens import given_of, make_given, remove_branch, set_reading
from branchwise.tui.state.session import rename_branch


@pytest.fixture
def demo_file(tmp_path):
    path = tmp_path / "demo.toml"
    path.write_text(demo_text(), encoding="utf-8")
    return path


def reading_cell(app, row: int) -> str:
    table = app.screen.query_one("#branch-table", DataTable)
    column = [str(c.label) for c in table.ordered_columns].index(
        next(str(c.label) for c in table.ordered_columns if str(c.label).startswith("Reading")))
    return str(table.get_cell_at((row, column)))


def also_read(app) -> str:
    return "\n".join(line for line in app.screen.views.warning_lines if line.startswith("≈"))


def test_switching_the_given_keeps_both_readings(ui, demo_file):
    original = demo_file.read_bytes()

    async def scenario() -> None:
        # A clamp-on reading on AHU-3 in the branch table: kept beside the gauge's Δp.
        async with ui.started("f3", (120, 40), demo_file) as (app, pilot):
            app.screen.query_one("#branch-table", DataTable).move_cursor(row=2, column=0)
            await pilot.press("m")
            await ui.type(pilot, "80 gpm")
            await pilot.press("enter")
            await ui.settle(pilot)
            site = app.site
            assert site.branches[2].measured_flow == "80 gpm"
            assert (site.conditions.pressure_drop, site.conditions.given) == ("10 psid",
                                                                              "pressure_drop")
            assert reading_cell(app, 2) == "80 gpm"  # not the given: no mark

            # Split compares it with the answer: AHU-3 at 10 psid, solved independently.
            await pilot.press("f4")
            await ui.settle(pilot)
            by_hand = ahu3_flow_by_hand(10 * PSI)
            read = 80 * US_GPM
            line = also_read(app)
            assert f"measured flow in 'AHU-3 coil' {read * 1000:.4g} L/s" in line
            solved = float(re.search(r"the solve gives ([\d.]+) L/s", line).group(1)) / 1000
            assert solved == pytest.approx(by_hand, rel=1e-3)
            diff = float(re.search(r"\(([+-][\d.]+)%", line).group(1))
            assert diff == pytest.approx((by_hand - read) / read * 100, abs=0.06)
            assert "Also read: measured flow in 'AHU-3 coil'" in ui.text(app)  # wide: whole

            # g: the reading becomes the given, as one step; the Δp stays, now compared.
            await pilot.press("g")
            await pilot.pause()
            await pilot.press("down", "down", "down", "down", "enter")
            await ui.settle(pilot)
            c = app.site.conditions
            assert (c.given, c.pressure_drop) == ("AHU-3 coil", "10 psid")
            assert app.site.branches[2].measured_flow == "80 gpm"
            assert "Also read: pressure drop 68.95 kPa" in also_read(app)  # 10 psi, NIST
            await pilot.press("escape", "ctrl+z")
            await ui.settle(pilot)
            assert app.site.conditions.given == "pressure_drop"
            assert app.site.branches[2].measured_flow == "80 gpm"
            await pilot.press("ctrl+y")
            await ui.settle(pilot)
            assert app.site.conditions.given == "AHU-3 coil"

            # Typing the given's value edits that reading only.
            await pilot.press("v", "ctrl+u")
            await ui.type(pilot, "85 gpm")
            await ui.settle(pilot)
            assert app.site.branches[2].measured_flow == "85 gpm"
            assert app.site.conditions.pressure_drop == "10 psid"
            await pilot.press("f3")
            await ui.settle(pilot)
            assert reading_cell(app, 2) == "85 gpm ◂ given"

            # Save, reopen: both readings and the given.
            await pilot.press("ctrl+s")
            await ui.settle(pilot)
        again = load_site(demo_file)
        assert again.conditions.given == "AHU-3 coil"
        assert (again.conditions.pressure_drop, again.branches[2].measured_flow) == (
            "10 psid", "85 gpm")

        app = BranchwiseApp(demo_file)
        async with app.run_test(size=(80, 24)) as pilot:
            await ui.settle(pilot)
            assert given_of(app.site) == ("measured_flow", 2)
            text = ui.text(app)
            assert "Given reading on AHU-3 coil 85 gpm" in text
            # At 80×24 every branch row and the comparison are in sight (the short line).
            for name in ("AHU-1 coil", "AHU-2 coil", "AHU-3 coil", "Bypass", "seg. 2"):
                assert name in text
            assert re.search(r"≈ Also read Δp: 68\.95 kPa; solve [\d.]+ kPa \([+-]", text)

            # Back to the gauge, then the clamp-on reading cleared: the file as it was.
            await pilot.press("g")
            await pilot.pause()
            await pilot.press("home", "enter")
            await ui.settle(pilot)
            assert app.site.conditions.given == "pressure_drop"
            assert app.site.branches[2].measured_flow == "85 gpm"
            await pilot.press("escape", "f3")
            await ui.settle(pilot)
            app.screen.query_one("#branch-table", DataTable).move_cursor(row=2, column=0)
            await pilot.press("m", "ctrl+u", "enter")
            await ui.settle(pilot)
            assert app.site.conditions.given is None
            await pilot.press("ctrl+s")
            await ui.settle(pilot)
        assert demo_file.read_bytes() == original

    ui.run(scenario)


def test_switching_the_given_never_writes_the_answer_in_as_a_reading(ui, demo_file):
    """Δp → total flow → Δp: the total's field waited for a reading and nobody typed one, so
    the site is back to its one reading (nothing made up to be weighed or saved); a total
    typed by hand is kept."""
    original = demo_file.read_bytes()

    async def scenario() -> None:
        app = BranchwiseApp(demo_file)
        async with app.run_test(size=(80, 24)) as pilot:
            await ui.settle(pilot)
            for keys in (("home", "down"), ("home",)):  # total flow, then Δp again
                await pilot.press("g")
                await pilot.pause()
                await pilot.press(*keys, "enter")
                await ui.settle(pilot)
                await pilot.press("escape")
            assert given_of(app.site) == ("pressure_drop", None)
            assert app.site.conditions.total_flow is None and app.site.conditions.given is None
            assert not app.session.dirty  # undone by hand: nothing to save
            await pilot.press("g")
            await pilot.pause()
            await pilot.press("home", "down", "enter")
            await ui.settle(pilot)
            box = app.screen.query_one("#given-value", Input)
            await pilot.press("ctrl+u")
            await ui.type(pilot, "600 gpm")
            await ui.settle(pilot)
            assert box.value == "600 gpm"
            await pilot.press("escape", "g")
            await pilot.pause()
            await pilot.press("home", "enter")
            await ui.settle(pilot)
            c = app.site.conditions
            assert (c.total_flow, c.given, c.pressure_drop) == ("600 gpm", "pressure_drop",
                                                                "10 psid")
            assert "Also read total:" in ui.text(app)
            await pilot.press("ctrl+s")
            await ui.settle(pilot)
        assert demo_file.read_bytes() != original

    ui.run(scenario)


def two_readings():
    return parse_site(demo_text().replace('# measured_flow = "80 gpm"', 'measured_flow = "80 gpm"'))


def test_a_site_the_core_refuses_still_opens_on_a_given():
    site = two_readings()  # Δp and a reading, no given: the core says they contradict
    assert given_of(site) == ("pressure_drop", None)
    site.conditions.given = "AHU-3 coil"
    assert given_of(site) == ("measured_flow", 2)
    site.branches[2].measured_flow = None  # being retyped: it stays the given
    assert given_of(site) == ("measured_flow", 2)
    site.conditions.given = "no such branch"
    assert given_of(site) == ("pressure_drop", None)


def test_renaming_or_removing_the_given_branch_keeps_given_in_step():
    site = two_readings()
    make_given(site, "measured_flow", 2)
    rename_branch(site, 2, "AHU-3 coil (north)")
    assert site.conditions.given == "AHU-3 coil (north)"
    assert given_of(site) == ("measured_flow", 2)
    remove_branch(site, 2)  # its reading goes: the Δp alone is left, no given needed
    assert site.conditions.given is None and given_of(site) == ("pressure_drop", None)
    set_reading(site, "total_flow", "600 gpm")
    make_given(site, "total_flow")
    remove_branch(site, 0)  # no reading on it: the given stays
    assert site.conditions.given == "total_flow"


def test_a_given_being_retyped_says_so(ui, demo_file):
    """With a second reading held, clearing the given's field asks for its value instead of
    saying the site holds no such reading; the other reading stays."""
    demo_file.write_text(demo_text().replace('# measured_flow = "80 gpm"',
                                             'measured_flow = "80 gpm"').replace(
        'friction = "colebrook"', 'friction = "colebrook"\ngiven = "pressure_drop"'))

    async def scenario() -> None:
        app = BranchwiseApp(demo_file)
        async with app.run_test(size=(80, 24)) as pilot:
            await ui.settle(pilot)
            assert app.outcome.ok and also_read(app)
            await pilot.press("v", "ctrl+u")
            await ui.settle(pilot)
            assert app.outcome.error is not None
            message = str(app.screen.query_one("#given-message").render())
            assert "Δp across the header: needs a value" in message
            assert app.site.branches[2].measured_flow == "80 gpm"
            assert given_of(app.site) == ("pressure_drop", None)
            await ui.type(pilot, "12 psi")
            await ui.settle(pilot)
            assert app.outcome.ok and app.site.conditions.given == "pressure_drop"

    ui.run(scenario)


def test_m_brings_the_reading_cell_into_sight_from_a_table_scrolled_right(ui, demo_file):
    """At 80 columns, moved right to the Valve column, m edits the Reading cell and the table
    shows it (the cursor goes to the column edited)."""

    async def scenario() -> None:
        async with ui.started("f3", site=demo_file) as (app, pilot):
            await pilot.press(*["right"] * 7)  # the Valve column, the table scrolled right
            await pilot.pause()
            assert "Reading" not in ui.text(app).splitlines()[3]
            await pilot.press("m")
            await pilot.pause()
            assert app.screen.here()[2] == "reading"
            assert "Reading" in ui.text(app).splitlines()[3]
            await pilot.press("escape")

    ui.run(scenario)
