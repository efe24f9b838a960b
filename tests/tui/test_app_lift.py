"""Conditions typed in the app: the lift between the headers (z_out − z_in) and the site name.

The flows it gives are checked against the core solve of the same site with the lift written
into the file, and the driving head against H = Δp/(ρ g) − Δz (Bernoulli with losses; the
field notes' relation).
"""

from __future__ import annotations

import pytest

from branchwise.core.site.read import demo_site
from branchwise.core.site.solve import solve_site


def test_lift_typed_on_the_split_screen(ui):
    async def scenario() -> None:
        async with ui.started() as (app, pilot):
            before = app.outcome.solved.result
            await pilot.press("z")
            await ui.type(pilot, "3")  # a bare number takes the display unit, m
            await ui.settle(pilot)
            assert app.site.conditions.elevation_change == "3 m"
            result = app.outcome.solved.result
            site = demo_site()
            site.conditions.elevation_change = "3 m"
            expected = solve_site(site).result
            assert list(result.flows) == pytest.approx(list(expected.flows), rel=1e-12)
            g, rho = 9.80665, result.network.fluid.density
            assert result.driving_head == pytest.approx(before.pressure_drop / (rho * g) - 3.0)
            assert all(q < q0 for q, q0 in zip(result.flows, before.flows, strict=True))
            await pilot.press("ctrl+z")
            await ui.settle(pilot)
            assert app.site.conditions.elevation_change in ("0 m", None)

    ui.run(scenario)


def test_site_name_by_key_and_kept_in_the_saved_file(ui, data_dir):
    from branchwise.core.site.read import load_site

    async def scenario() -> None:
        async with ui.started() as (app, pilot):
            await pilot.press("f8")
            # The old name is selected: typing replaces it. Enter goes through the record's
            # four fields and keeps on the last.
            await pilot.press(*"Plant B header", *["enter"] * 5)
            await ui.settle(pilot)
            assert app.site.name == "Plant B header"
            assert "Plant B header" in ui.text(app)
            await pilot.press("ctrl+r", "enter")
            await ui.settle(pilot)
        saved = next((data_dir / "sites").glob("*.toml"))
        assert load_site(saved).name == "Plant B header"

    ui.run(scenario)


def test_an_export_never_replaces_a_file(ui, data_dir):
    async def scenario() -> None:
        async with ui.started() as (app, pilot):
            for _ in range(2):  # the same minute: the same proposed name
                await pilot.press("r", "enter")
                await ui.settle(pilot)
            records = sorted((data_dir / "sites").glob("*.md"))
            assert len(records) == 2  # the second went to "…-2.md" (or a new minute's name)
            assert all(r.read_text(encoding="utf-8").startswith("# Walkdown record")
                       for r in records)

    ui.run(scenario)
