"""A whole walkdown in the app, by keys only, checked against outside references.

Open the demo; change the pressure drop and see every flow change; switch the given to the total
flow; type a clamp-on reading on one branch; size a branch for a target flow and see the catalog
size; save, quit, reopen and find the site as it was left; type nonsense and see a message while
the app carries on.
"""

from __future__ import annotations

import math

from textual.widgets import DataTable, Input, Static

from branchwise.core.errors import InputError
from branchwise.tui.app import BranchwiseApp
from branchwise.tui.widgets.texttable import TextTable

PSI = 6894.757293168  # Pa per psi (NIST SP 811, appendix B.8)
INCH = 0.0254  # m per inch (NIST SP 811, exact)
FOOT = 0.3048  # m per foot (NIST SP 811, exact)
US_GPM = 3.785411784e-3 / 60  # m³/s per US gallon per minute (NIST SP 811, gallon exact)


def ahu3_flow_by_hand(pressure_drop_pa: float) -> float:
    """The demo's 'AHU-3 coil' branch solved independently of branchwise, m³/s.

    The branch: inner diameter 2.067 in, 120 ft, roughness 0.0018 in, K 5, a valve of Cv 48,
    water at 44 °F, both headers at one height. Water properties from the `iapws` package
    (IAPWS-95); friction from `fluids.friction.Colebrook`; the valve by IEC 60534-2-1,
    Q[m³/h] = Kv √(Δp[bar] / (ρ/1000)) with Kv from Cv by `fluids.fittings.Cv_to_Kv` (the exact
    ratio from the units' definitions, 1.15610); the flow from scipy's
    brentq on the pressure balance.
    """
    from fluids.fittings import Cv_to_Kv
    from fluids.friction import Colebrook
    from iapws import IAPWS95
    from scipy.optimize import brentq

    water = IAPWS95(T=(44 - 32) / 1.8 + 273.15, P=0.101325)
    rho, mu = water.rho, water.mu
    d, length, eps, k, kv = 2.067 * INCH, 120 * FOOT, 0.0018 * INCH, 5.0, Cv_to_Kv(48)
    area = math.pi * d**2 / 4

    def balance(q: float) -> float:
        v = q / area
        f = Colebrook(rho * v * d / mu, eps / d)
        pipe = (f * length / d + k) * rho * v**2 / 2
        valve = 1e5 * (rho / 1000) * (q * 3600 / kv) ** 2
        return pipe + valve - pressure_drop_pa

    return brentq(balance, 1e-6, 1.0, xtol=1e-14)


def flows_on_screen(app) -> dict[str, float]:
    """Branch → flow as the results table shows it, in L/s (SI display)."""
    out = {}
    for name, flow, *_ in app.screen.query_one("#results", TextTable).text_rows():
        if flow.strip():
            out[name] = float(flow)
    return out


def test_walkdown_by_keys(ui, data_dir):
    async def scenario() -> None:
        async with ui.started() as (app, pilot):
            assert app.site.title.startswith("Demo")
            before = flows_on_screen(app)
            assert set(before) == {"AHU-1 coil", "AHU-2 coil", "AHU-3 coil", "Bypass"}

            # Change the pressure drop from the demo's 10 psid to 20 psi.
            await pilot.press("v")
            assert app.focused.id == "given-value"
            await ui.type(pilot, "20 psi")
            await ui.settle(pilot)
            assert app.site.conditions.pressure_drop == "20 psi"
            after = flows_on_screen(app)
            for name, q in after.items():
                # Darcy–Weisbach: Q ∝ √(Δp/ (f L/D + K)); f falls a little as Re rises, so
                # doubling Δp raises every flow by a bit more than √2 (physics, not a fit).
                assert 1.40 < q / before[name] < 1.46, name
            # The AHU-3 branch against an independent solve (fluids, iapws, scipy); the table
            # shows four significant figures.
            by_hand = ahu3_flow_by_hand(20 * PSI) * 1000
            assert after["AHU-3 coil"] == pytest_approx(by_hand, 1e-3)

            # Make the total flow the given. One key (g) opens the list of givens. Its field
            # waits for the meter's reading: the answer is never written in as a reading (it
            # would be weighed and saved as if read); the placeholder shows the answer now.
            await pilot.press("escape", "g")
            await pilot.pause()
            assert app.screen.__class__.__name__ == "ChoiceMenu"
            await pilot.press("down", "enter")
            await ui.settle(pilot)
            assert app.site.conditions.total_flow is None
            # The gauge's reading stays in the site beside the total, which is now the given.
            assert app.site.conditions.pressure_drop == "20 psi"
            assert app.site.conditions.given == "total_flow"
            box = app.screen.query_one("#given-value", Input)
            assert box.value == "" and "answer now" in box.placeholder
            # Waiting for a value is not an error: marked ○ as a new site is, not ✗.
            assert "○ given total flow: needs a value" in ui.text(app)
            assert "✗" not in ui.text(app)
            await pilot.press("escape", "v")
            await ui.type(pilot, "150 gpm")
            await ui.settle(pilot)
            total = sum(flows_on_screen(app).values())
            assert total == pytest_approx(150 * US_GPM * 1000, 2e-3)
            assert "Given total flow 150 gpm" in ui.text(app)

            # A clamp-on reading on AHU-3: kept beside the given, then made the given (g).
            await pilot.press("f3")
            await ui.settle(pilot)
            table = app.screen.query_one("#branch-table", DataTable)
            table.focus()
            await pilot.press("down", "down")
            await pilot.press("m")
            assert app.focused.id == "cell-input"
            await ui.type(pilot, "6 L/s")
            await pilot.press("enter")
            await ui.settle(pilot)
            assert app.site.branches[2].measured_flow == "6 L/s"
            assert app.site.conditions.given == "total_flow"
            assert "Given total flow 150 gpm" in ui.text(app)
            await pilot.press("f4")
            await ui.settle(pilot)
            await pilot.press("escape", "g")
            await pilot.pause()
            await pilot.press("down", "down", "down", "enter")  # Δp, total, AHU-1, 2, 3
            await ui.settle(pilot)
            assert app.site.conditions.given == "AHU-3 coil"
            assert app.site.conditions.total_flow == "150 gpm"
            assert app.site.conditions.pressure_drop == "20 psi"
            assert "Given reading on AHU-3 coil 6 L/s" in ui.text(app)
            assert "Also read total: 9.464 L/s" in ui.text(app)  # 150 gpm (NIST SP 811)

            # Size AHU-1 (NPS 4 sch 40) for 25 L/s: the diameter and the catalog size.
            await pilot.press("escape", "f")
            await pilot.pause()
            await pilot.press("down", "enter")
            await ui.settle(pilot)
            assert app.site.solve.find == "diameter"
            assert app.site.solve.branch == "AHU-1 coil"
            await pilot.press("escape", "t")
            await ui.type(pilot, "25")  # a bare number takes the display unit, L/s
            await ui.settle(pilot)
            assert app.site.solve.target_flow == "25 L/s"
            solved = app.outcome.solved
            assert solved.result.solved is not None and solved.catalog is not None
            from fluids.piping import nearest_pipe

            # fluids: the smallest Schedule 40 pipe (ASME B36.10M) with a bore ≥ the one found.
            nps, di, _, _ = nearest_pipe(Di=solved.result.solved.value, schedule="40")
            assert solved.catalog.size.inner_diameter_m == pytest_approx(di, 1e-6)
            line = str(app.screen.query_one("#solved", Static).render())
            assert f"NPS {nps:g} sch 40" in line
            assert "Diameter of 'AHU-1 coil' to carry 25.00 L/s" in line  # the reports' own line

            # Save under a name of our own, then quit: nothing asks, nothing is lost.
            await pilot.press("ctrl+s")
            assert app.screen.__class__.__name__ == "SaveAsScreen"
            await pilot.press("ctrl+u")
            await ui.type(pilot, "north header")
            await pilot.press("enter")
            await ui.settle(pilot)
            saved = data_dir / "sites" / "north header.toml"
            assert saved.is_file() and not app.session.dirty
            await pilot.press("ctrl+q")
            await pilot.pause()
            kept_line = line
        assert app.return_code == 0

        again = BranchwiseApp()
        async with again.run_test(size=(80, 24)) as pilot:
            await ui.settle(pilot)
            site = again.site
            assert site.source == saved
            assert site.branches[2].measured_flow == "6 L/s"
            assert (site.conditions.pressure_drop, site.conditions.total_flow,
                    site.conditions.given) == ("20 psi", "150 gpm", "AHU-3 coil")
            assert (site.solve.find, site.solve.branch, site.solve.target_flow) == (
                "diameter", "AHU-1 coil", "25 L/s")
            assert str(again.screen.query_one("#solved", Static).render()) == kept_line

            # Nonsense in a field: a message beside it, the last answer kept greyed, no crash.
            await pilot.press("escape", "v")
            await ui.type(pilot, "lots")
            await ui.settle(pilot)
            error = again.outcome.error
            assert isinstance(error, InputError) and error.field == "branches[2].measured_flow"
            message = again.screen.query_one("#given-message", Static)
            # Worded as the command line words it: the branch by its name, the file's key.
            assert message.display and 'branch "AHU-3 coil" measured_flow' in str(message.render())
            assert again.screen.query_one("#split-results").has_class("-stale")
            assert flows_on_screen(again)  # the last good answer is still on screen
            assert again.screen.query_one("#given-value", Input).value == "lots"
            await pilot.press("ctrl+z")
            await ui.settle(pilot)
            assert again.outcome.ok and again.site.branches[2].measured_flow == "6 L/s"

    ui.run(scenario)


def pytest_approx(value: float, rel: float):
    import pytest

    return pytest.approx(value, rel=rel)
