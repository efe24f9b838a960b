"""The Branches screen says what the core read from the highlighted row: bore, ε, ΣK, Kv.

References: ASME B36.10M, NPS 3 schedule 40: OD 88.9 mm, wall 5.49 mm, so a bore of 77.92 mm;
NPS 4 schedule 40: OD 114.3 mm, wall 6.02 mm, bore 102.26 mm (the standard's metric columns);
Cv → Kv by `fluids.fittings.Cv_to_Kv` (the exact ratio from the US gallon and the psi). The
demo's AHU-2 coil is NPS 3 sch 40 with Cv 110; the valve and reading columns are beyond 80
terminal columns, so the lines under the table are where they show at 80×24.
"""

from __future__ import annotations

from fluids.fittings import Cv_to_Kv


def _understood(app) -> str:
    return str(app.screen.query_one("#branch-understood").render())


def test_the_highlighted_row_as_read_at_80x24(ui):
    async def scenario() -> None:
        async with ui.started("f3", size=(80, 24)) as (app, pilot):
            await pilot.press("down")  # AHU-2 coil
            await ui.settle(pilot)
            text = " ".join(_understood(app).split())
            assert f"bore {88.9 - 2 * 5.49:.2f} mm" in text, text
            assert f"Kv {Cv_to_Kv(110):.4g}" in text and "Cv 110" in text, text
            assert "ΣK 6.5" in text and "no reading" in text, text
            await pilot.press("up")  # AHU-1 coil: NPS 4 sch 40 and seven fittings
            await pilot.pause()
            text = " ".join(_understood(app).split())
            assert f"bore {114.3 - 2 * 6.02:.4g} mm" in text, text  # 4 figures, as the app shows
            assert "fittings)" in text and "ε 0.04500 mm" in text, text

    ui.run(scenario)


def test_in_us_units_the_bore_reads_in_inches(ui):
    async def scenario() -> None:
        async with ui.started("f3", size=(120, 40)) as (app, pilot):
            await pilot.press("ctrl+t")
            await pilot.press("down")
            await ui.settle(pilot)
            text = " ".join(_understood(app).split())
            assert "bore 3.068 in" in text, text  # ASME B36.10M: NPS 3 sch 40, 3.068 in

    ui.run(scenario)


def test_a_typed_gravity_is_said_on_the_split_screen(ui):
    # Surface gravity is about 9.76–9.84 m/s² anywhere on the Earth (from memory): a g typed
    # outside it (two digits swapped, 9.18) is questioned where the answer is read.
    async def scenario() -> None:
        async with ui.started("f4", size=(120, 40)) as (app, pilot):
            for typed, said in (("9.79 m/s^2", "g 9.79 m/s² as typed ("),
                                ("9.18 m/s^2", "g 9.18 m/s² as typed (not Earth's: check it)")):
                app.edit("gravity", lambda s, g=typed: setattr(s.conditions, "gravity", g))
                await ui.settle(pilot)
                text = " ".join(ui.text(app).split())
                assert said in text, text

    ui.run(scenario)


def test_a_branch_not_worked_out_does_not_say_not_read():
    # "not read yet" read as "no clamp-on reading on this branch" to a newcomer: the app
    # means the bore, ε, ΣK and valve it could not work out.
    from branchwise.core.site.read import demo_site
    from branchwise.tui.screens.branches.understood import understood_lines

    lines = understood_lines(None, demo_site(), None, 0, 0)  # (no app needed for this line)
    assert lines == ["AHU-1 coil: bore, ε, ΣK and valve not worked out yet (see the message "
                     "below)"]
