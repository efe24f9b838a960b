"""The app's workers are named, not described by the repr of their arguments: Textual would
write out the whole site (about 1 ms at 200 branches) for every solve, every keystroke."""

from __future__ import annotations

from branchwise.core.site.spec import Site


def test_no_worker_writes_out_the_site(ui, monkeypatch):
    written: list[str] = []
    real = Site.__repr__

    def counted(self: Site) -> str:
        written.append("site")
        return real(self)

    monkeypatch.setattr(Site, "__repr__", counted)

    async def scenario() -> None:
        async with ui.started() as (app, pilot):
            await pilot.press("v")
            await ui.type(pilot, "12 psi")  # a solve for each keystroke
            await ui.settle(pilot)
            await pilot.press("escape", "b")  # the band's worker
            await ui.settle(pilot)
            await pilot.press("p")  # the curve's
            await ui.settle(pilot)
            await pilot.press("f5")  # the history's
            await ui.settle(pilot)
            assert app.site.conditions.pressure_drop == "12 psi"
        assert written == []

    ui.run(scenario)
