"""Several readings on the Split screen: the verdict in one line, each reading on x, and
"All readings, weighed" as one more given (the rule: Narasimhan & Jordache 2000, 7.2 — the
largest normalised residual names the reading at fault)."""

from __future__ import annotations

from branchwise.tui.state.givens import add_reading, set_reading, weigh_all


def test_the_verdict_the_readings_and_the_all_given(ui):
    async def scenario() -> None:
        async with ui.started("f4", size=(120, 40)) as (app, pilot):
            def readings(s) -> None:
                set_reading(s, "total_flow", "620 gpm")
                add_reading(s, 2, "100 gpm")  # AHU-3 coil, far off

            app.edit("Readings", readings)
            await ui.settle(pilot)
            lines = app.screen.views.warning_lines
            assert lines[0].startswith("⚖ The clamp-on on 'AHU-3 coil' disagrees"), lines
            await pilot.press("x")
            await pilot.pause()
            shown = " ".join(str(w.render()) for w in app.screen.query("Static"))
            assert "Reconciled: pressure drop" in shown, shown
            await pilot.press("escape")
            await pilot.pause()

            app.edit("Given: all readings, weighed", weigh_all)
            await ui.settle(pilot)
            rows = app.screen.query_one("GivenFindRows")
            assert rows.query_one("#given-kind").value == "all"
            assert not rows.query_one("#given-value").display
            rec = app.outcome.solved.reconciliation
            assert app.outcome.solved.result.pressure_drop == rec.pressure_drop_pa
            status = str(app.screen.query_one("StatusStrip").render())
            assert "all readings, weighed" in status, status

    ui.run(scenario)


def test_all_readings_weighed_stays_the_given_while_readings_change():
    """The person chose to weigh every reading: typing, retyping or clearing one clamp-on
    keeps that choice while two readings or more are left; with one left it is the given."""
    from branchwise.core.site.read import demo_site
    from branchwise.tui.state.givens import clear_reading, remove_branch, weighs_all

    site = demo_site()
    add_reading(site, 0, "335 gpm")
    weigh_all(site)
    add_reading(site, 2, "77 gpm")  # a new clamp-on
    assert weighs_all(site)
    add_reading(site, 2, "80 gpm")  # retyped
    assert weighs_all(site)
    clear_reading(site, "measured_flow", 2)
    assert weighs_all(site)  # the gauge and AHU-1's clamp-on are left
    remove_branch(site, 0)  # AHU-1 and its reading go: the gauge alone is the given
    assert not weighs_all(site) and site.conditions.given is None
    assert site.conditions.pressure_drop == "10 psid"


def test_readings_that_cannot_be_weighed_say_why_in_the_weighed_list(ui, tmp_path):
    """A zero clamp-on beside the gauge cannot be weighed (its tolerance is a share of the
    reading): x says why, naming the branch, not "No readings to weigh"."""
    from branchwise.core.site.read import demo_text

    path = tmp_path / "zero.toml"
    path.write_text(demo_text().replace('# measured_flow = "80 gpm"', 'measured_flow = "0 gpm"')
                    .replace('friction = "colebrook"', 'friction = "colebrook"\n'
                             'given = "pressure_drop"'), encoding="utf-8")

    async def scenario() -> None:
        async with ui.started(size=(120, 40), site=path) as (app, pilot):
            await pilot.press("x")
            await ui.settle(pilot)
            text = ui.text(app)
            assert "No readings to weigh" not in text
            assert 'branch "AHU-3 coil" measured_flow' in text

    ui.run(scenario)
