"""A zero reading given in the app: every branch still, no 'inf' friction factor drawn (f =
64/Re has no value at Re = 0), and the note says why."""

from __future__ import annotations

from branchwise.core.site.read import demo_text


def test_a_zero_pressure_drop_draws_no_inf(ui, tmp_path):
    path = tmp_path / "still.toml"
    path.write_text(demo_text().replace('pressure_drop = "10 psid"', 'pressure_drop = "0 psid"'),
                    encoding="utf-8")

    async def scenario() -> None:
        async with ui.started(size=(120, 40), site=path) as (app, pilot):
            text = ui.text(app)
            assert "AHU-1 coil" in text
            assert "inf" not in text and "lam." not in text
            assert "Nothing flows" in text

    ui.run(scenario)
