"""The branch table by keys: edit in place, the branch form, add, copy, remove with undo,
reorder, series segments. Each step is checked on the site (the one truth) and on screen."""

from __future__ import annotations

import pytest
from textual.widgets import DataTable

FOOT = 0.3048  # m per foot (NIST SP 811, exact)


def names(app) -> list[str]:
    return [str(b.name) for b in app.site.branches]


def test_branch_table_by_keys(ui):
    async def scenario() -> None:
        async with ui.started("f3") as (app, pilot):
            table = app.screen.query_one("#branch-table", DataTable)
            assert app.focused is table

            # Edit in place: AHU-2's length, a bare number in the column's unit (m in SI).
            flow_180ft = app.outcome.solved.result.branches[1].flow
            await pilot.press("down", "right", "right", "right", "right", "enter")
            assert app.focused.id == "cell-input"
            assert app.focused.value == "180 ft"
            await ui.type(pilot, "50")
            await pilot.press("enter")
            await ui.settle(pilot)
            assert app.site.branches[1].segments[0].length == "50 m"
            assert "50 m" in ui.text(app)
            # Shorter pipe, same Δp: more flow (Darcy–Weisbach, h_f ∝ L).
            assert app.outcome.solved.result.branches[1].flow > flow_180ft

            # Copy it, then remove the copy; Ctrl+Z brings it back, Ctrl+Y removes it again.
            await pilot.press("c")
            await ui.settle(pilot)
            assert names(app) == ["AHU-1 coil", "AHU-2 coil", "AHU-2 coil 2", "AHU-3 coil",
                                  "Bypass"]
            assert table.cursor_row == 2  # the cursor follows the copy
            await pilot.press("delete")
            await ui.settle(pilot)
            assert "AHU-2 coil 2" not in names(app)
            await pilot.press("ctrl+z")
            await ui.settle(pilot)
            assert "AHU-2 coil 2" in names(app)
            await pilot.press("ctrl+y")
            await ui.settle(pilot)
            assert "AHU-2 coil 2" not in names(app)

            # Reorder: AHU-2 up to the top.
            table.move_cursor(row=1, column=0)
            await pilot.press("shift+up")
            await ui.settle(pilot)
            assert names(app)[:2] == ["AHU-2 coil", "AHU-1 coil"]

            # A series segment on AHU-3, then its length in feet.
            table.move_cursor(row=2, column=0)
            await pilot.press("s")
            await ui.settle(pilot)
            assert app.focused.id == "cell-input"  # the new segment's length, ready to type
            await pilot.press("ctrl+u")
            await ui.type(pilot, "30 ft")
            await pilot.press("enter")
            await ui.settle(pilot)
            segs = app.site.branches[2].segments
            assert len(segs) == 2 and segs[1].length == "30 ft"
            assert segs[1].diameter == segs[0].diameter  # same pipe, carried over
            assert "└ 2" in ui.text(app)
            lengths = [s.length for s in app.outcome.solved.result.branches[2].segments]
            assert lengths[1] == pytest.approx(30 * FOOT, rel=1e-12)

            # Add a branch through the form; Enter applies it.
            table.move_cursor(row=0, column=0)
            await pilot.press("a")
            assert app.screen.__class__.__name__ == "BranchForm"
            form = app.screen
            fields = {f.path: f for f in form.query("Field")}
            # Typed as a person would: the cursor starts in Name (its text selected, so typing
            # replaces it) and Enter goes field by field; Enter on the last field applies.
            assert app.focused is fields["name"].input
            await ui.type(pilot, "Drain line")
            await pilot.press(*["enter"] * 5)  # tag, valve, note, size (carried), length
            assert app.focused is fields["0.length"].input
            await pilot.press("enter")  # no length yet: said beside the field, cursor stays
            assert app.focused is fields["0.length"].input
            assert "required" in str(fields["0.length"].query_one(".field-message").render())
            await ui.type(pilot, "12")
            await pilot.press("enter", "enter", "enter")  # wall, K, fittings
            assert app.focused is fields["0.fittings"].input
            await ui.type(pilot, "elbow-90 2, gate-valve 1")
            await pilot.press("enter")
            await ui.settle(pilot)
            new = app.site.branches[1]
            assert new.name == "Drain line" and new.segments[0].length == "12 m"
            assert new.segments[0].fittings == {"elbow-90": 2.0, "gate-valve": 1.0}
            assert new.segments[0].size == app.site.branches[0].segments[0].size
            assert app.outcome.ok

            # A fitting the catalog does not have: refused beside the field, form stays open.
            await pilot.press("e")
            form = app.screen
            fields = {f.path: f for f in form.query("Field")}
            fields["0.fittings"].input.value = "elbow-91 2"
            await pilot.pause()
            assert fields["0.fittings"].has_class("-error")
            assert "no fitting 'elbow-91'" in str(
                fields["0.fittings"].query_one(".field-message").render())
            fields["0.fittings"].input.focus()
            await pilot.press("enter")
            assert app.screen is form
            await pilot.press("escape")
            await ui.settle(pilot)
            assert app.site.branches[1].segments[0].fittings == {"elbow-90": 2.0,
                                                                "gate-valve": 1.0}

    ui.run(scenario)


def test_a_copied_branch_leaves_the_tag_and_the_reading_behind():
    """A plant tag names one line (two lines tagged CHW-101 would confuse every record), and a
    reading was taken on the line copied: the copy keeps the pipe, not those."""
    from branchwise.core.site.read import demo_site
    from branchwise.tui.state.session import new_branch

    site = demo_site()
    like = site.branches[0]
    like.measured_flow = "335 gpm"
    copy = new_branch(site, like)
    assert like.tag and copy.tag is None and copy.measured_flow is None
    assert copy.segments == like.segments and copy.name != like.name


def test_fittings_typed_as_a_line_list_writes_them():
    """Semicolons between fittings, as a line list's cell has them, read as commas do."""
    from branchwise.tui.screens.branches.form import parse_fittings

    assert parse_fittings("3 elbow-90; 1 swing-check-valve") == parse_fittings(
        "elbow-90 3, swing-check-valve 1") == {"elbow-90": 3.0, "swing-check-valve": 1.0}


def test_two_rows_of_one_name_show_no_flow_and_a_stale_flow_is_dimmed(ui):
    """Renaming the bypass 'AHU-1 coil' showed AHU-1's last flow on the bypass row, at full
    brightness (found in a trial): a flow goes only to a row whose name is its own alone, and
    the last good answer's flows are dimmed while the site is in error."""
    from branchwise.tui.screens.branches.cells import flow_cells

    async def scenario() -> None:
        async with ui.started(key="f3") as (app, pilot):
            table = app.screen.query_one("DataTable")
            table.move_cursor(row=3, column=0)  # the bypass (AHU-1..3 above it)
            await pilot.press("enter")
            await ui.settle(pilot)
            assert app.focused.id == "cell-input"
            await pilot.press("ctrl+u")
            await ui.type(pilot, "AHU-1 coil")
            await pilot.press("enter")
            await ui.settle(pilot)
            assert app.outcome.error is not None  # duplicate names
            flows = flow_cells(app)
            assert 0 not in flows and 3 not in flows and 1 in flows
            cell = table.get_row_at(1)[1]  # AHU-2's flow, from the last good answer
            assert "dim" in str(cell.style)

    ui.run(scenario)


def test_a_refused_reading_is_not_said_to_be_kept(ui):
    """`inf gpm` as a clamp-on: the error beside the field, and no toast saying the reading
    was kept beside the given (found in a trial)."""
    async def scenario() -> None:
        async with ui.started(key="f3") as (app, pilot):
            said: list[str] = []
            screen = app.screen
            screen.notify = lambda message, **kw: said.append(str(message))
            table = screen.query_one("DataTable")
            for text, kept in (("inf gpm", False), ("80 gpm", True)):
                table.move_cursor(row=2, column=0)
                await pilot.press("m")
                await ui.settle(pilot)
                await pilot.press("ctrl+u")
                await ui.type(pilot, text)
                await pilot.press("enter")
                await ui.settle(pilot)
                assert any("kept beside the given" in s for s in said) == kept, text
            assert app.outcome.error is None

    ui.run(scenario)


def test_removing_a_branch_earlier_visits_read_warns_with_their_dates(ui):
    """The demo's visits read AHU-3's clamp-on: removing AHU-3 says so, with the dates."""
    async def scenario() -> None:
        async with ui.started(key="f3") as (app, pilot):
            said: list[str] = []
            app.screen.notify = lambda message, **kw: said.append(str(message))
            app.screen.query_one("DataTable").move_cursor(row=2, column=0)
            await pilot.press("delete")
            await ui.settle(pilot)
            assert [b.name for b in app.site.branches].count("AHU-3 coil") == 0
            assert any("Earlier visits read it (2024-09-18, 2025-01-15)" in s for s in said)

    ui.run(scenario)
