"""A nominal size without a schedule typed in the app: refused beside the cell or field with the
choices; a bore written as one (``ID 3 in``) is read as a bore; a trade spelling of a unit is
read in the Liquid screen's fields.

Bores: ASME B36.10M as the PyPI ``fluids`` package tabulates it (NPS 3 sch 40, 3.068 in); the
flows 10.74 and 10.30 L/s are the demo's figures in the report that found the misreading (the
program's own output then: a regression check, not a reference).
"""

from __future__ import annotations

import fluids.piping as ref
import pytest

from branchwise.tui.widgets.field import Field

INCH_M = 0.0254  # exact (NIST SP 811)


async def _type_in_size_cell(ui, pilot, text: str) -> None:
    """AHU-2's Size/ID cell (row 2, the fourth column at 80 columns), typed over."""
    table = pilot.app.screen.query_one("#branch-table")
    table.move_cursor(row=1, column=0)
    await pilot.press("right", "right", "right", "enter")
    assert pilot.app.focused.id == "cell-input"
    await pilot.press("ctrl+u")
    await ui.type(pilot, text)
    await pilot.press("enter")
    await ui.settle(pilot)


def _ahu2_flow(app) -> float:
    return app.outcome.solved.result.branches[1].flow


def test_size_cell_refuses_a_bare_nominal_size_and_reads_a_bore(ui):
    async def scenario() -> None:
        async with ui.started("f3") as (app, pilot):
            assert _ahu2_flow(app) * 1000 == pytest.approx(10.74, abs=0.005)

            await _type_in_size_cell(ui, pilot, "3 in")
            assert app.site.branches[1].segments[0].size == "3 in"
            assert not app.outcome.ok
            assert app.outcome.error.field == "branches[1].size"
            words = " ".join(app.error_words(app.outcome.error).split())
            bore = ref.nearest_pipe(NPS=3, schedule="40")[1] / INCH_M
            assert f"NPS 3 sch 40 has a {bore:.3f} in bore" in words
            assert '"ID 3 in"' in words
            assert "is a nominal size without a schedule" in " ".join(ui.text(app).split())

            # Written as a bore it is one: 3.000 in, and the cell reads back the same.
            await _type_in_size_cell(ui, pilot, "ID 3 in")
            seg = app.site.branches[1].segments[0]
            assert (seg.size, seg.diameter) == (None, "3 in")
            assert app.outcome.ok
            assert app.outcome.solved.result.branches[1].segments[0].diameter == pytest.approx(
                3 * INCH_M, rel=1e-12)
            assert _ahu2_flow(app) * 1000 == pytest.approx(10.30, abs=0.005)
            assert "ID 3 in" in ui.text(app)

            # With its schedule, the catalog bore again.
            await _type_in_size_cell(ui, pilot, "NPS 3 sch 40")
            assert app.outcome.ok
            assert _ahu2_flow(app) * 1000 == pytest.approx(10.74, abs=0.005)

            # A bare number in the column's unit (mm here) that is a DN: refused likewise.
            await _type_in_size_cell(ui, pilot, "80")
            assert app.site.branches[1].segments[0].size == "80 mm"
            assert "DN80 sch 40 has a" in app.error_words(app.outcome.error)

    ui.run(scenario)


def test_branch_form_refuses_a_bare_nominal_size_beside_the_field(ui):
    async def scenario() -> None:
        async with ui.started("f3") as (app, pilot):
            app.screen.query_one("#branch-table").move_cursor(row=1, column=0)
            await pilot.press("e")
            form = app.screen
            size = next(f for f in form.query(Field) if f.path == "0.size")
            size.input.value = "3 in"
            await pilot.pause()
            message = " ".join(str(size.query_one(".field-message").render()).split())
            assert size.has_class("-error") and "nominal size without a schedule" in message
            size.input.value = "bore 3 in"
            await pilot.pause()
            assert not size.has_class("-error")
            size.input.value = '3" NB sch 40'
            await pilot.pause()
            assert not size.has_class("-error")
            await pilot.press("escape")

    ui.run(scenario)


def test_liquid_screen_reads_cp_as_centipoise(ui):
    async def scenario() -> None:
        async with ui.started("f2") as (app, pilot):
            app.edit("Custom", lambda s: (setattr(s.fluid, "kind", "custom"),
                                          setattr(s.fluid, "temperature", None),
                                          setattr(s.fluid, "density", "870 kg/m3")))
            await ui.settle(pilot)
            viscosity = app.screen.query_one("#fluid-viscosity", Field)
            viscosity.input.focus()
            await ui.type(pilot, "120 cp")  # as a person types it: centipoise, not a cup
            await ui.settle(pilot)
            assert app.site.fluid.viscosity == "120 cp"
            assert app.outcome.ok and not viscosity.has_class("-error")
            # centipoise = 1.0 E-03 Pa·s (NIST SP 811 B.8)
            fluid = app.outcome.solved.built.network.fluid
            assert fluid.viscosity == pytest.approx(0.120, rel=1e-12)
            await pilot.press("ctrl+u")
            kinematic = app.screen.query_one("#fluid-kinematic_viscosity", Field)
            kinematic.input.focus()
            await ui.type(pilot, "5 cp")
            await ui.settle(pilot)
            message = " ".join(str(kinematic.query_one(".field-message").render()).split())
            assert "'cp' reads as a cup, a volume; centipoise is 'cP'" in message

    ui.run(scenario)
