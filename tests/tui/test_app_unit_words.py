"""Warnings, no-solution errors and the liquid's name in the units the person reads.

The core marks the quantities in its messages; the app restates them in the unit system
(Ctrl+T) and the per-quantity display units (F6). With US units nothing on the Split screen's
warnings, fluid line or messages may speak SI.
"""

from __future__ import annotations

import re

import pytest

from branchwise.tui.state.givens import set_given
from branchwise.tui.state.session import set_find

FOOT = 0.3048  # m per foot (NIST SP 811, exact)
SI_WORDS = ("m/s", "L/s", "°C", "kPa")


def _numbers_before(unit: str, text: str) -> list[float]:
    return [float(m) for m in re.findall(rf"(-?\d+(?:\.\d+)?) {re.escape(unit)}", text)]


def test_us_units_on_the_split_screen(ui):
    async def scenario() -> None:
        async with ui.started(size=(120, 40)) as (app, pilot):
            await pilot.press("ctrl+t")  # US customary
            # 28 psid across the demo's header drives every coil above 3 m/s.
            app.edit("Given value", lambda s: set_given(s, "pressure_drop", "28 psi"))
            await ui.settle(pilot)
            result = app.outcome.solved.result
            assert result.warnings and all(w.code == "velocity-high" for w in result.warnings)

            screen = app.screen
            warnings = "\n".join(screen.views.warning_lines)
            totals = str(screen.query_one("#totals").render())
            for word in SI_WORDS:
                assert word not in warnings, warnings
                assert word not in totals, totals
            # The limit: 3 m/s (common practice) is 9.843 ft/s (1 ft = 0.3048 m, NIST SP 811),
            # quoted as the trade quotes it: 10 ft/s (common practice).
            assert 3 / FOOT == pytest.approx(9.843, abs=5e-4)
            assert _numbers_before("ft/s", warnings)[1] == 10
            # Each velocity quoted is the branch's own, in ft/s.
            velocities = {b.name: b.segments[0].velocity for b in result.branches}
            for w in result.warnings[:3]:
                line = next(x for x in screen.views.warning_lines if x.startswith(f"⚠ {w.branch}"))
                shown = _numbers_before("ft/s", line)[0]
                assert shown == pytest.approx(velocities[w.branch] / FOOT, rel=5e-4)

            # The liquid's name gives its temperature in °F: T/°F = T/K × 9/5 − 459.67
            # (NIST SP 811, B.8).
            fluid = result.network.fluid
            fahrenheit = fluid.temperature * 9 / 5 - 459.67
            assert f"at {fahrenheit:.1f} °F:" in totals
            text = ui.text(app)
            assert "°F" in text and "°C" not in text

            # `w` lists the same words.
            await pilot.press("w")
            await pilot.pause()
            listed = ui.text(app)
            assert "ft/s" in listed and "m/s" not in listed.replace("ft/s", "")
            await pilot.press("escape")

            # A no-solution error: the total flow below the target, stated in gpm.
            def impossible(site) -> None:
                set_given(site, "total_flow", "100 gpm")
                set_find(site, "diameter", "AHU-1 coil", "200 gpm")

            app.edit("Impossible", impossible)
            await ui.settle(pilot)
            assert app.outcome.error is not None and "L/s" in str(app.outcome.error)
            text = ui.text(app)
            status = text.splitlines()[2]
            assert "✗" in status and "gpm" in status and "L/s" not in status
            message = str(screen.query_one("#find-message").render())
            assert "L/s" not in message
            assert _numbers_before("gpm", message)[:2] == pytest.approx([100, 200], rel=1e-3)

            # The Liquid screen names the liquid in °F too; back in SI it says °C again.
            await pilot.press("f2")
            await ui.settle(pilot)
            panel = str(app.screen.query_one("#liquid-values").render())
            assert panel.splitlines()[0].endswith(f"at {fahrenheit:.1f} °F")
            await pilot.press("ctrl+t")
            await ui.settle(pilot)
            panel = str(app.screen.query_one("#liquid-values").render())
            celsius = fluid.temperature - 273.15
            assert panel.splitlines()[0].endswith(f"at {celsius:.1f} °C")

    ui.run(scenario)


def test_a_chosen_display_unit_is_used_in_warnings(ui):
    """SI with velocities in ft/s chosen (F6): warnings follow the choice."""

    async def scenario() -> None:
        async with ui.started(size=(120, 40)) as (app, pilot):
            app.settings.display_units = {"velocity": "ft/s"}
            app.edit("Given value", lambda s: set_given(s, "pressure_drop", "28 psi"))
            await ui.settle(pilot)
            warnings = "\n".join(app.screen.views.warning_lines)
            assert "ft/s" in warnings and "m/s" not in warnings
            shown = _numbers_before("ft/s", warnings)
            assert shown[1] == 10  # 3 m/s = 9.843 ft/s, quoted as 10 ft/s (common practice)

    ui.run(scenario)
