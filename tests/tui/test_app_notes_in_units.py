"""A note on the Split screen speaks the person's units (its quantity was kept marked by the
core): the catalog note of a found bore in inches under US units, never a marker."""

from __future__ import annotations

from site_texts import too_big_for_the_catalog

MARKS = ("\ue000", "\ue001")  # the private-use characters of core.messages' markers


def test_the_split_screen_says_a_note_in_the_persons_units(ui, tmp_path):
    site = tmp_path / "big.toml"
    site.write_text(too_big_for_the_catalog(), encoding="utf-8")

    async def scenario() -> None:
        async with ui.started(size=(120, 40), site=site) as (app, pilot):
            shown = " ".join(ui.text(app).split())
            assert "has a bore of" in shown and not any(m in shown for m in MARKS)
            await pilot.press("ctrl+t")  # US units
            await ui.settle(pilot)
            shown = " ".join(ui.text(app).split())
            bore = app.outcome.solved.result.solved.value / 0.0254  # inch by definition
            assert f"has a bore of {bore:.4g} in or more" in shown, shown
            assert not any(m in shown for m in MARKS)

    ui.run(scenario)
