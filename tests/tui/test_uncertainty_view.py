"""The Split screen's band, curve and tolerances, by keys.

The band's numbers are compared with :func:`branchwise.core.site.solve.uncertainty_for_site` run
with the same seed (the core is checked against the GUM, JCGM 100:2008, in tests/core); the
curve's operating point with the solve; unit factors come from NIST SP 811. Snapshots of the
curve (80×24, 120×40) and the band (80×24) follow the scheme of test_app_snapshots.py.
"""

from __future__ import annotations

import re
import threading

import pytest
from app_waits import workers_done
from test_app_snapshots import FixedClock, shot

import branchwise.core.site.solve as sitesolve
import branchwise.tui.state.outcome as outcome_module
from branchwise.core.site.read import demo_text, load_site
from branchwise.core.storage.paths import sites_dir
from branchwise.core.units import format_number
from branchwise.tui.app import BranchwiseApp
from branchwise.tui.drawing.braille import BrailleCanvas
from branchwise.tui.screens.split.band import BAND_SAMPLES, BAND_SEED
from branchwise.tui.screens.tolerances import TolerancesScreen
from branchwise.tui.widgets.bandview import BandView
from branchwise.tui.widgets.curveplot import CurvePlot
from branchwise.tui.widgets.field import Field
from branchwise.tui.widgets.texttable import TextTable

LITRE = 1e-3  # m³ (SI, exact)
US_GPM = 3.785411784e-3 / 60  # m³/s per US gallon per minute (NIST SP 811, gallon exact)
PSI = 6894.757293168  # Pa per psi (NIST SP 811, appendix B.8)
ROW = re.compile(r"^\s+(.+?)\s+(\S+)\s+(\S+)\s+(\S+)\s+(\S+)\s+(L/s|kPa|gpm|psi)\b")


def band_rows(app) -> dict[str, tuple[str, str, str, str]]:
    """Label → (value, P5, P50, P95) as the band view shows them."""
    body = app.screen.query_one("#band-body").content
    rows = {}
    for line in str(body).splitlines():
        if m := ROW.match(line):
            rows[m[1]] = (m[2], m[3], m[4], m[5])
    return rows


async def until(pilot, done, seconds: float = 10.0, workers: bool = True) -> None:
    """Pause until ``done()``; ``workers=False`` does not wait on workers (one may be held)."""
    for _ in range(int(seconds / 0.02)):
        if done():
            return
        if workers:
            await workers_done(pilot.app)
        await pilot.pause(0.02)
    raise AssertionError("the app never reached the awaited state")


def check_band(app, ui) -> None:
    """The shown band is the core's for the present site, the same seed; P5 ≤ P50 ≤ P95 and
    the solve inside the band."""
    ref = sitesolve.uncertainty_for_site(app.site, BAND_SAMPLES, BAND_SEED)
    rows = band_rows(app)
    names = {f"branch '{b.name}' flow": b.name for b in app.outcome.solved.result.branches}
    names |= {"total flow": "Total flow", "pressure drop": "Δp"}
    for output, label in names.items():
        kind = "pressure" if output == "pressure drop" else "flow"
        b = ref.outputs[output]
        want = tuple(app.fmt(v, kind, unit=False) for v in (b.nominal, b.p5, b.p50, b.p95))
        assert rows[label] == want, label
        value, p5, p50, p95 = (float(v) for v in rows[label])
        assert p5 <= p50 <= p95 and p5 <= value <= p95, label
    table = {r[0]: r[1] for r in app.screen.query_one("#results", TextTable).text_rows()}
    assert rows["AHU-1 coil"][0] == table["AHU-1 coil"]  # the value is the solve's
    top, share = ref.ranking["total flow"][0]
    text = ui.text(app)
    assert "What dominates the spread of the total flow" in text
    # The top driver's line: its share first, then the bar, then its name.
    assert re.search(re.escape(f"{format_number(share * 100, 3)} %") + r" █.*"
                     + re.escape(top.replace("branch '", "").replace("'", "")), text)


def test_band_by_keys(ui, monkeypatch):
    async def scenario() -> None:
        async with ui.started() as (app, pilot):
            screen = app.screen
            await pilot.press("b")
            await until(pilot, lambda: screen.views.band_panel.band_state() == "current")
            view = screen.query_one("#band-view", BandView)
            assert view.display and not screen.query_one("#results").display
            assert "P5 … P95" in ui.text(app) and not view.has_class("-stale")
            check_band(app, ui)

            # An edit greys the band at once and says so (the refresh waits for a pause).
            screen.views.band_panel.band_pause = 60.0
            await pilot.press("v")
            await ui.type(pilot, "12 psi")
            await ui.settle(pilot)
            assert screen.views.band_panel.band_state() == "stale" and view.has_class("-stale")
            assert "STALE" in ui.text(app)
            # b twice: back to the table, and to a band worked out at once.
            await pilot.press("escape", "b", "b")
            await until(pilot, lambda: screen.views.band_panel.band_state() == "current")
            check_band(app, ui)

            # While the band is worked out, typing goes on: hold the worker and type.
            gate = threading.Event()
            real = sitesolve.with_uncertainty

            def held(*args, **kwargs):
                gate.wait(20)
                return real(*args, **kwargs)

            monkeypatch.setattr(sitesolve, "with_uncertainty", held)
            screen.views.band_panel.band_pause = 0.05
            await pilot.press("v")
            await ui.type(pilot, "11 psi")
            await until(pilot, lambda: screen.views.band_panel.band_state() == "computing",
                        workers=False)
            assert "computing…" in ui.text(app)
            await ui.type(pilot, "d")  # "11 psid": the solve answers while the band waits
            await until(pilot, lambda: app.outcome.revision == app.session.revision
                        and app.outcome.ok, workers=False)
            assert app.site.conditions.pressure_drop == "11 psid"
            assert screen.views.band_panel.band_state() in ("stale", "computing")
            gate.set()
            await until(pilot, lambda: screen.views.band_panel.band_state() == "current")
            assert screen.views.band.revision == app.session.revision
            check_band(app, ui)

            # The walkdown record written now carries the band; after an edit it does not.
            await pilot.press("escape", "r", "enter")
            await until(pilot, lambda: any(sites_dir().glob("*.md")))
            record = next(sites_dir().glob("*.md"))
            assert "## Uncertainty" in record.read_text(encoding="utf-8")
            record.unlink()
            screen.views.band_panel.band_pause = 60.0
            await pilot.press("v")
            await ui.type(pilot, "13 psi")
            await ui.settle(pilot)
            await pilot.press("escape", "r", "enter")
            await until(pilot, lambda: any(sites_dir().glob("*.md")))
            text = next(sites_dir().glob("*.md")).read_text(encoding="utf-8")
            assert "13 psi" in text and "## Uncertainty" not in text

    ui.run(scenario)


def test_a_band_reopened_while_current_waits_for_a_pause_after_the_next_edit(ui):
    # Opening the view works a band out at once; opened again on a band that is still
    # current there is nothing to work out, and the next edit waits for typing to pause, as
    # every edit does (it once started at once).
    async def scenario() -> None:
        async with ui.started() as (app, pilot):
            screen = app.screen
            await pilot.press("b")
            await until(pilot, lambda: screen.views.band_panel.band_state() == "current")
            await pilot.press("b", "b")
            await ui.settle(pilot)
            panel = screen.views.band_panel
            assert panel.band_state() == "current"
            shown = panel.band.revision
            panel.band_pause = 60.0
            await pilot.press("v")
            await ui.type(pilot, "12 psi")
            await ui.settle(pilot)
            assert panel.band_state() == "stale"
            assert panel.band.revision == shown  # no band was started for any keystroke

    ui.run(scenario)


def test_curve_and_tolerances(ui, tmp_path):
    site_file = tmp_path / "plant-b.toml"
    text = demo_text()
    assert 'flow_meter_accuracy = "3 %"' in text
    site_file.write_text(text.replace('flow_meter_accuracy = "3 %"', "# (meter: default)"),
                         encoding="utf-8")

    async def scenario() -> None:
        app = BranchwiseApp(site_file)
        async with app.run_test(size=(80, 24)) as pilot:
            await ui.settle(pilot)
            result = app.outcome.solved.result
            await pilot.press("p")
            await ui.settle(pilot)
            plot = app.screen.query_one("#curve-view", CurvePlot)
            assert plot.display and plot.data is not None
            q, dp = plot.data.point
            assert q == pytest.approx(result.total_flow / LITRE, rel=1e-12)  # L/s
            assert dp == pytest.approx(result.pressure_drop / 1000, rel=1e-12)  # kPa
            label = (f"total {app.fmt(result.total_flow, 'flow')} at Δp "
                     f"{app.fmt(result.pressure_drop, 'pressure')}")
            shown = ui.text(app)
            assert label in plot.data.point_label and label in shown
            assert "Δp kPa" in shown and "flow L/s" in shown
            assert sum(0x2800 <= ord(c) <= 0x28FF for c in shown) > 100  # braille dots drawn
            total = plot.data.series[-1]
            # No flow, no loss: the demo's headers are level, so the curve starts at (0, 0);
            # and Δp rises with the flow (every branch's loss grows with its flow).
            assert (total.x[0], total.y[0]) == (0.0, 0.0)
            assert all(b > a for a, b in zip(total.y, total.y[1:], strict=False))
            assert max(total.x) == pytest.approx(1.5 * q, rel=1e-12)

            # The same curve in US customary units.
            await pilot.press("ctrl+t")
            await ui.settle(pilot)
            q_us, dp_us = plot.data.point
            assert q_us == pytest.approx(result.total_flow / US_GPM, rel=1e-9)
            assert dp_us == pytest.approx(result.pressure_drop / PSI, rel=1e-9)
            assert "Δp psi" in ui.text(app) and "gpm" in plot.data.point_label
            await pilot.press("ctrl+t", "p")
            await ui.settle(pilot)
            assert app.screen.query_one("#results").display and not plot.display

            # Tolerances: the flow meter takes the common-practice default; make it 5 %.
            await pilot.press("l")
            dialog = app.screen
            assert isinstance(dialog, TolerancesScreen)
            meter = dialog.query_one("#tol-flow_meter_accuracy", Field)
            assert meter.text == "" and "common practice" in meter.input.placeholder
            assert "3 % · common practice" in ui.text(app)
            full = dialog.query_one("#tol-gauge_full_scale", Field)
            assert full.text == "30 psid"
            # no figure of common practice there: the hint says so, and fits at 80 columns
            assert full.input.placeholder == "none: % of the reading"
            await pilot.press("tab", "tab")
            assert app.focused is meter.input
            await ui.type(pilot, "5")
            # Enter goes field by field (a form); the last, the target flow's kind, keeps it.
            await pilot.press("enter")
            assert isinstance(app.screen, TolerancesScreen)
            # The header's own meter: as the flow meter unless typed (a magmeter's 0.5 %).
            total = dialog.query_one("#tol-total_flow_meter_accuracy", Field)
            assert app.focused is total.input and total.text == ""
            assert total.input.placeholder == "as the flow meter"
            await ui.type(pilot, "0.5")
            await pilot.press("enter")
            valve = dialog.query_one("#tol-valve_kv", Field)
            assert "10 % · common practice" in valve.input.placeholder  # core's default
            await pilot.press(*["enter"] * 6)
            assert app.focused is valve.input
            # A found unknown's target flow: a meter's reading unless called a design figure
            # (then not drawn in its band).
            await pilot.press("enter")
            target = dialog.query_one("#tol-target_flow_measured", Field)
            assert app.focused is target.input and target.text == ""
            assert target.input.placeholder == "a reading: drawn as the meter"
            await ui.type(pilot, "maybe")
            await pilot.press("enter")
            await ui.settle(pilot)
            assert target.has_class("-error") and app.focused is target.input
            assert "type reading (a meter's" in " ".join(ui.text(app).split())
            await pilot.press(*["backspace"] * 5)
            await ui.type(pilot, "design")
            await pilot.press("enter")
            await ui.settle(pilot)
            assert not isinstance(app.screen, TolerancesScreen)
            assert app.site.tolerances.flow_meter_accuracy == "5 %"
            assert app.site.tolerances.total_flow_meter_accuracy == "0.5 %"
            assert app.site.tolerances.target_flow_measured is False
            assert app.session.undo_stack[-1].label == "Tolerances"

            # Nonsense is refused beside its field, and the site keeps its values.
            await pilot.press("l")
            await ui.type(pilot, "lots")  # in the gauge accuracy field
            await pilot.press("enter")
            await pilot.pause()
            dialog = app.screen
            assert isinstance(dialog, TolerancesScreen)
            assert dialog.query_one("#tol-gauge_accuracy", Field).has_class("-error")
            assert "Gauge accuracy" in ui.text(app)
            await pilot.press("escape")
            assert app.site.tolerances.gauge_accuracy == "1 %"
            # A full scale below the pressure drop read on the gauge (10 psid) is refused too.
            await pilot.press("l", "tab")
            await ui.type(pilot, "5 psid")
            await pilot.press("enter")
            await pilot.pause()
            field = app.screen.query_one("#tol-gauge_full_scale", Field)
            assert field.has_class("-error") and "below the pressure drop" in ui.text(app)
            assert app.focused is field.input  # Enter stays on a value that reads wrong
            await pilot.press("escape")
            assert app.site.tolerances.gauge_full_scale == "30 psid"

            # Saved with the site, the file's comments kept.
            await pilot.press("ctrl+s")
            await ui.settle(pilot)
            saved = site_file.read_text(encoding="utf-8")
            assert 'flow_meter_accuracy = "5 %"' in saved
            assert "target_flow_measured = false" in saved
            assert "# of full scale: a class 1 differential gauge" in saved
            assert load_site(site_file).tolerances.flow_meter_accuracy == "5 %"
            await pilot.press("ctrl+z")
            await ui.settle(pilot)
            assert app.site.tolerances.flow_meter_accuracy is None

    ui.run(scenario)


def test_braille_dots_follow_the_unicode_braille_patterns():
    # The Unicode Standard, Braille Patterns block (U+2800–U+28FF): dot n sets bit n − 1;
    # dots 1, 2, 3, 7 run down the left column of the cell, dots 4, 5, 6, 8 down the right.
    dots = {(0, 0): 1, (0, 1): 2, (0, 2): 3, (1, 0): 4, (1, 1): 5, (1, 2): 6, (0, 3): 7,
            (1, 3): 8}
    every = BrailleCanvas(1, 1)
    for (x, y), n in dots.items():
        one = BrailleCanvas(1, 1)
        one.dot(x, y)
        assert one.row_text(0).plain == chr(0x2800 + (1 << (n - 1))), (x, y)
        every.dot(x, y)
    assert every.row_text(0).plain == "\u28ff"  # all eight dots
    line = BrailleCanvas(4, 1)
    line.line(0, 1, 7, 1)  # the second dot row across four cells: dots 2 and 5 in each
    assert line.row_text(0).plain == "\u2812" * 4


def test_snapshots_of_curve_and_band(ui, monkeypatch):
    monkeypatch.setattr(outcome_module, "time", FixedClock())
    problems: list[str] = []

    async def scenario() -> None:
        async with ui.started() as (app, pilot):
            await pilot.press("p")
            await shot(pilot, ui, "curve-80x24", problems)
            await pilot.press("b")
            await shot(pilot, ui, "band-80x24", problems)
        async with ui.started(size=(120, 40)) as (app, pilot):
            await pilot.press("p")
            await shot(pilot, ui, "curve-120x40", problems)

    ui.run(scenario)
    assert not problems, "\n\n".join(problems)


def test_band_of_a_site_without_an_answer(ui):
    """A site with no answer (here: no length of pipe carries the target flow) has no band;
    the band view says so as it is, and keeps the earlier band below, greyed."""
    from branchwise.core.errors import NoSolutionError
    from branchwise.tui.state.session import set_find

    async def scenario() -> None:
        async with ui.started() as (app, pilot):
            screen = app.screen
            await pilot.press("b")
            await until(pilot, lambda: screen.views.band_panel.band_state() == "current")
            # 1000 L/s through a 4 in coil branch: a velocity near 120 m/s, far past what 69 kPa
            # drives even with no pipe at all (Bernoulli: v = √(2Δp/ρ) ≈ 12 m/s, common practice).
            app.edit("Find", lambda s: set_find(s, "length", "AHU-1 coil", "1000 L/s"))
            await ui.settle(pilot)
            assert isinstance(app.outcome.error, NoSolutionError)
            assert screen.views.band_panel.band_state() == "broken"
            text = ui.text(app)
            assert "No band: this site has no answer now" in text
            assert "STALE" not in text and "has an error" not in text
            assert screen.query_one("#band-view", BandView).has_class("-stale")

    ui.run(scenario)


def test_a_band_of_another_site_is_not_shown_after_opening_a_line_list(ui, tmp_path):
    """With the band open, a line list opened (Ctrl+O) showed 'No band: … below, the band
    of earlier inputs' and under it the band of the site before, its branches and all (found in
    a trial): a band belongs to the site it was worked out for."""
    lines = tmp_path / "lines.csv"
    lines.write_text("Name,Bore (mm),Length (m),Roughness (mm)\nLoop A,80,40,0.045\n"
                     "Loop B,50,30,0.045\n", encoding="utf-8")

    async def scenario() -> None:
        async with ui.started() as (app, pilot):
            screen = app.screen
            await pilot.press("b")
            await until(pilot, lambda: screen.views.band_panel.band_state() == "current")
            assert "AHU-1 coil" in ui.text(app)
            app.files.open_choice(lines)
            await ui.settle(pilot)
            assert app.site.branches[0].name == "Loop A"
            text = ui.text(app)
            assert "AHU-1 coil" not in text and "earlier inputs" not in text
            assert app.latest_band is None

    ui.run(scenario)


def test_a_band_cut_at_freezing_says_so_in_full_at_80_columns(ui, tmp_path):
    # Water at 0.5 °C with the demo's ± 2 K: the band is drawn over 0 °C – 2.5 °C
    # (water freezes at 0 °C at atmospheric pressure), and its note is wrapped to the screen,
    # its reason in sight without scrolling sideways.
    path = tmp_path / "cold.toml"
    path.write_text(demo_text().replace('temperature = "44 degF"', 'temperature = "0.5 degC"'),
                    encoding="utf-8")

    async def scenario() -> None:
        async with ui.started(site=path, size=(80, 24)) as (app, pilot):
            screen = app.screen
            await pilot.press("b")
            await until(pilot, lambda: screen.views.band_panel.band_state() == "current")
            body = str(screen.query_one("#band-body").content)
            note = body[body.index("• temperature drawn"):]
            assert all(len(line) <= 76 for line in note.splitlines())
            flat = " ".join(note.split())
            assert "temperature drawn over 0 °C – 2.5 °C only" in flat and "freezes at 0 °C" in flat

    ui.run(scenario)


def test_a_spread_below_what_is_shown_is_no_minus_zero():
    """A flow every draw gives alike (a design target) read "−0.0 % … −0.0 %": a round-off
    below a twentieth of a percent is "+0.0 %", and no spread at all is said so."""
    from branchwise.tui.widgets.bandview import HELD, _signed_percent

    assert _signed_percent(-1.7e-16) == _signed_percent(-0.04) == "+0.0 %"
    assert _signed_percent(-2.74) == "−2.7 %" and _signed_percent(2.74) == "+2.7 %"
    assert HELD == "held: no spread"
