"""The Liquid screen: live properties, an impossible state refused beside its field, kinds."""

from __future__ import annotations

import pytest

from branchwise.tui.widgets.field import Field


def field(app, name: str) -> Field:
    return app.screen.query_one(f"#fluid-{name}", Field)


def message(app, name: str) -> str:
    return str(field(app, name).query_one(".field-message").render())


def test_liquid_by_keys(ui):
    async def scenario() -> None:
        async with ui.started("f2") as (app, pilot):
            assert app.focused.id == "liquid-kind-select"

            # Water boils at 99.97 °C at one standard atmosphere (IAPWS-IF97 saturation line,
            # as CoolProp's IF97::Water gives: 373.1243 K at 101.325 kPa). 101 °C is refused
            # beside the temperature field; the app carries on with the last good answer.
            await pilot.press("tab")
            assert app.focused is field(app, "temperature").input
            await ui.type(pilot, "101")  # a bare number: the field's unit, °C
            await ui.settle(pilot)
            assert app.site.fluid.temperature == "101 degC"
            assert field(app, "temperature").has_class("-error")
            assert "boils" in message(app, "temperature")
            assert app.screen.query_one("#liquid-props").has_class("-stale")
            await pilot.press("ctrl+u")
            await ui.type(pilot, "99 degC")
            await ui.settle(pilot)
            assert app.outcome.ok and not field(app, "temperature").has_class("-error")

            # Propylene glycol, 30 % by mass at 44 °F: density against CoolProp's INCOMP::MPG.
            await pilot.press("ctrl+u")
            await ui.type(pilot, "44 degF")
            await pilot.press("shift+tab", "enter")
            for _ in range(3):
                await pilot.press("down")
            await pilot.press("enter")
            await ui.settle(pilot)
            assert app.site.fluid.kind == "propylene-glycol"
            assert field(app, "concentration").display and not field(app, "pressure").display
            assert "needed for propylene-glycol" in message(app, "concentration")
            field(app, "concentration").input.focus()
            await ui.type(pilot, "30")
            await ui.settle(pilot)
            assert app.site.fluid.concentration == "30 %"
            import CoolProp.CoolProp as CP

            reference = CP.PropsSI("D", "T", (44 - 32) / 1.8 + 273.15, "P", 101325,
                                   "INCOMP::MPG[0.3]")
            shown = str(app.screen.query_one("#liquid-values").render())
            line = next(x for x in shown.splitlines() if x.startswith("Density"))
            assert float(line.split()[2]) == pytest.approx(reference, rel=1e-4)

            # Back to water: the temperature stays, the glycol fraction is put aside.
            await pilot.press("shift+tab", "shift+tab", "enter", "home", "enter")
            await ui.settle(pilot)
            assert app.site.fluid.kind == "water"
            assert app.site.fluid.concentration is None
            assert app.site.fluid.temperature == "44 degF"
            assert app.outcome.ok

    ui.run(scenario)
