"""A field's own message (the line beside it) in the units the person reads, and the branch
form's valve check reading a valve as the site file does."""

from __future__ import annotations

import re

import pytest

from branchwise.core.errors import InputError
from branchwise.core.site.build import build
from branchwise.tui.app import BranchwiseApp
from branchwise.tui.screens.branches.cells import set_valve, valve_problem
from branchwise.tui.widgets.field import Field


def test_liquid_field_message_in_us_units(ui):
    async def scenario() -> None:
        async with ui.started() as (app, pilot):
            await pilot.press("ctrl+t")  # US customary
            await pilot.press("f2")
            await ui.settle(pilot)
            field = app.screen.query_one("#fluid-temperature", Field)
            field.input.focus()
            await pilot.press("ctrl+u")
            await ui.type(pilot, "20")  # a bare number: the field's unit, °F
            await ui.settle(pilot)
            assert app.site.fluid.temperature == "20 degF"
            assert field.has_class("-error")
            text = str(field.query_one(".field-message").render())
            assert "°C" not in text and "°F" in text, text
            # Pure water freezes at 0 °C = 32 °F at one atmosphere (T/°F = T/°C × 9/5 + 32,
            # NIST SP 811, B.8); the limit quoted is the freezing point, within 0.1 °F.
            limits = [float(x) for x in re.findall(r"(-?\d+(?:\.\d+)?) °F", text)]
            assert any(abs(x - 32) < 0.1 for x in limits), text

    ui.run(scenario)


def _site_refuses(text: str) -> str | None:
    """The site's own check of a valve typed ``text`` (None: the site takes it)."""
    app_site = BranchwiseApp().site
    set_valve(app_site.branches[0], text)
    try:
        build(app_site)
    except InputError as exc:
        assert "valve" in exc.field
        return exc.reason
    return None


def test_valve_check_agrees_with_the_site_file():
    # A flow coefficient is a finite positive number (IEC 60534-1 defines Kv as the flow in
    # m³/h at 1 bar; 0, negative and infinite values name no valve).
    for text in ("Kv inf", "Kv 0", "-5", "Kv 160 + 0", "Cv nan", "Kv 160 + abc", "Kv 1e30"):
        problem = valve_problem(text)
        assert problem is not None, text
        assert problem == _site_refuses(text), text
    for text in ("Kv 160", "Cv 110", "160 + 40", "Kv 160 + Cv 48", "1e+3"):
        assert valve_problem(text) is None, text
        assert _site_refuses(text) is None, text
    # The message names the term at fault.
    assert "term 2" in valve_problem("Kv 160 + 0")


def test_a_typed_number_is_quoted_back_as_typed():
    # "Cv 0" was kept as 0.0 and refused as "got 0.0": the person typed 0.
    app_site = BranchwiseApp().site
    set_valve(app_site.branches[0], "Cv 0")
    with pytest.raises(InputError) as caught:
        build(app_site)
    assert str(caught.value.value) == "0", caught.value
    assert "0.0" not in str(caught.value)
    set_valve(app_site.branches[0], "Cv 110")
    assert app_site.branches[0].valve_cv == 110  # still a number, saved as TOML's 110
    set_valve(app_site.branches[0], "Kv 95.5")
    assert app_site.branches[0].valve_kv == 95.5
    # A pasted run of digits stays a float (a 5,000-digit int raised in the app; a 25-digit
    # one was saved as an integer TOML's 64 bits cannot hold).
    set_valve(app_site.branches[0], "Kv " + "1" * 5000)
    assert app_site.branches[0].valve_kv == "1" * 5000  # kept as typed: no float holds it
    assert valve_problem("Kv " + "1" * 5000) is not None
    # Beyond a float: kept as typed, and refused quoting it (it said "got inf").
    set_valve(app_site.branches[0], "Kv 1e400")
    with pytest.raises(InputError) as caught:
        build(app_site)
    assert str(caught.value).endswith("got 1e400")
    set_valve(app_site.branches[0], "Kv 1e-400")  # below a float's least: not read as 0
    with pytest.raises(InputError) as caught:
        build(app_site)
    assert str(caught.value).endswith("got 1e-400")
    set_valve(app_site.branches[0], "Kv " + "9" * 25)
    assert isinstance(app_site.branches[0].valve_kv, float)


def test_split_losses_named_as_in_the_exports(ui):
    """The Split table's Major, Minor and Valve columns hold what the exports' "Major loss",
    "Minor loss" and "Valve loss" hold (the minor loss without the valve's)."""
    from branchwise.core.report.columns import COLUMNS
    from branchwise.tui.widgets.texttable import TextTable

    async def scenario() -> None:
        app = BranchwiseApp()
        for size in ((80, 24), (120, 40)):
            async with app.run_test(size=size) as pilot:
                await ui.settle(pilot)
                table = app.screen.query_one("#results", TextTable)
                labels = [label.split("\n")[0].split(" ")[0] for label, _ in table.columns]
                for key in ("major", "minor", "valve"):
                    assert COLUMNS[key].title.split()[0] in labels
                minor, valve = labels.index("Minor"), labels.index("Valve")
                rows = iter(table.text_rows())
                result = app.outcome.solved.result
                for br in result.branches:
                    for j, seg in enumerate(br.segments):
                        row = next(rows)
                        # Darcy–Weisbach minor loss K·v²/2g, as the core reports it (m).
                        assert float(row[minor]) == pytest.approx(seg.minor_loss, rel=6e-3)
                        if j == 0 and br.valve_loss:
                            assert float(row[valve]) == pytest.approx(br.valve_loss, rel=6e-3)
                        else:
                            assert row[valve] == ""
                # The demo's coils each have a valve: the column is not empty.
                assert any(row[valve] for row in table.text_rows())
            app = BranchwiseApp()

    ui.run(scenario)


def test_a_fitting_count_with_an_underscore_is_not_added_up_in_its_cell():
    from branchwise.core.site.spec import SegmentSpec
    from branchwise.tui.screens.branches.cells import k_text

    # "1_0" is no count (the site refuses it); the cell said "10 fittings"
    assert k_text(SegmentSpec(minor_k=2, fittings={"elbow-90": "1_0"})) == "2 + fittings"
    assert k_text(SegmentSpec(minor_k=2, fittings={"elbow-90": 4, "tee-run": "1"})) == (
        "2 + 5 fittings")
