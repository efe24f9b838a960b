"""The History screen (F5) on the demo's visits at 80×24 and 120×40, its keys, and closing a
visit: asked first, one step for Ctrl+Z, the fields cleared for the next visit."""

from __future__ import annotations

import pytest

from branchwise.core.site.read import demo_text
from branchwise.tui.state.session import rename_branch

BRAILLE = {chr(c) for c in range(0x2801, 0x2900)}


def _line(text: str, start: str) -> str:
    return next(line for line in text.splitlines() if line.strip().startswith(start))


@pytest.mark.parametrize("size", [(80, 24), (120, 40)], ids=["80x24", "120x40"])
def test_the_history_screen_shows_the_trends_the_flags_and_the_cautions(ui, size):
    async def scenario() -> None:
        async with ui.started("f5", size) as (app, pilot):
            await ui.settle(pilot)
            text = ui.text(app)
            assert app.current_mode == "history"
            assert "Visits: 2024-09-18 · 2025-01-15 · 2025-03-12 (today)" in text
            assert "Resistance R = h/Q² (m/(L/s)²)" in text
            row = _line(text, "AHU-3 coil")
            assert "+46 % ± 13 % ⚑" in row and BRAILLE & set(row)  # a braille trend
            assert "⚑ AHU-3 coil: resistance +46 % from 2024-09-18" in text
            assert "Estimates only" in text and "confirm on site" in text  # long or short form
            assert "F5" in text  # the screen's key in the footer
            for line in text.splitlines():
                assert len(line.rstrip()) <= size[0]

    ui.run(scenario)


def test_i_steps_through_the_indicators_and_t_shows_each_visit(ui):
    async def scenario() -> None:
        async with ui.started("f5") as (app, pilot):
            await pilot.press("i")
            assert "Flow (L/s)" in ui.text(app)
            assert "solved" in _line(ui.text(app), "AHU-2 coil")  # from the header's reading
            await pilot.press("i")
            assert "Effective roughness (mm)" in ui.text(app)
            await pilot.press("t")
            text = ui.text(app)
            assert "at each visit" in text
            assert _line(text, "2024-09-18").count("*") == 2  # AHU-1 and AHU-3 clamp-ons
            await pilot.press("t", "i")
            assert "Resistance" in ui.text(app)

    ui.run(scenario)


def test_closing_the_visit_asks_first_and_is_one_undoable_step(ui):
    async def scenario() -> None:
        async with ui.started("f5") as (app, pilot):
            before = app.session.revision
            await pilot.press("v")
            assert "Close today's visit?" in ui.text(app)
            assert "pressure drop 10 psid" in ui.text(app)
            await pilot.press("escape")  # Esc: nothing changes
            await ui.settle(pilot)
            assert app.session.revision == before and len(app.site.visits) == 2
            await pilot.press("v", "enter")  # Enter in the date (the record's) moves to notes
            await ui.type(pilot, "gauge re-zeroed")
            await pilot.press("enter")
            await ui.settle(pilot)
            site = app.site
            assert len(site.visits) == 3 and site.visits[-1].date == "2025-03-12"
            assert site.visits[-1].notes == "gauge re-zeroed"
            assert site.conditions.pressure_drop is None and site.record is None
            assert "Visits: 2024-09-18 · 2025-01-15 · 2025-03-12" in ui.text(app)
            assert app.session.dirty
            await pilot.press("ctrl+z")
            await ui.settle(pilot)
            assert len(app.site.visits) == 2 and app.site.conditions.pressure_drop == "10 psid"
            assert not app.session.dirty

    ui.run(scenario)


def test_a_closed_visit_saves_without_asking_and_keeps_the_new_visit(ui, tmp_path):
    """After closing the visit the site has no reading yet: that is no field typed wrong, so
    Ctrl+S saves at once (no "field in error" question) and the file holds the new visit."""
    path = tmp_path / "site.toml"
    path.write_text(demo_text(), encoding="utf-8")

    async def scenario() -> None:
        async with ui.started("f5", site=path) as (app, pilot):
            await pilot.press("v", "enter")
            await ui.type(pilot, "strainer cleaned")
            await pilot.press("enter")
            await ui.settle(pilot)
            await pilot.press("ctrl+s")
            await ui.settle(pilot)
            assert "field in error" not in ui.text(app)
            assert not app.session.dirty

    ui.run(scenario)
    saved = path.read_text(encoding="utf-8")
    assert saved.count("\n[[visits]]\n") == 3 and 'notes = "strainer cleaned"' in saved
    assert 'pressure_drop = "10 psid"' in saved.split("[[visits]]")[-1]


def test_the_close_dialog_refuses_a_date_that_is_no_date(ui):
    async def scenario() -> None:
        async with ui.started("f5") as (app, pilot):
            await pilot.press("v", "ctrl+u")
            await ui.type(pilot, "12 March")
            await pilot.press("enter")
            await pilot.pause()
            assert "must be a date" in ui.text(app)
            assert len(app.site.visits) == 2
            await pilot.press("escape")

    ui.run(scenario)


def test_nothing_to_close_says_so(ui, tmp_path):
    text = demo_text().replace('pressure_drop = "10 psid"', "# no reading yet")
    path = tmp_path / "site.toml"
    path.write_text(text, encoding="utf-8")

    async def scenario() -> None:
        async with ui.started(None, site=path) as (app, pilot):
            await pilot.press("f5")
            await ui.settle(pilot)
            await pilot.press("v")
            await pilot.pause()
            assert any("Nothing to close" in n.message for n in app._notifications)
            assert len(app.screen_stack) == 1
            # The two earlier visits still have their history without a reading today.
            assert "Visits: 2024-09-18 · 2025-01-15" in ui.text(app)

    ui.run(scenario)


def test_a_bad_visit_is_named_on_the_screen(ui, tmp_path):
    text = demo_text().replace('"AHU-1 coil" = "335 gpm"', '"AHU-9" = "335 gpm"')
    path = tmp_path / "site.toml"
    path.write_text(text, encoding="utf-8")

    async def scenario() -> None:
        async with ui.started("f5", site=path) as (app, pilot):
            await ui.settle(pilot)
            assert 'visits[0].measured."AHU-9": no branch of that name' in ui.text(app)
            assert app.outcome.ok  # today's answer stands

    ui.run(scenario)


def test_renaming_a_branch_keeps_its_earlier_readings():
    from branchwise.core.site.read import demo_site

    site = demo_site()
    rename_branch(site, 2, "AHU-3 coil (new)")
    assert "AHU-3 coil (new)" in site.visits[0].measured
    assert "AHU-3 coil" not in site.visits[1].measured


@pytest.mark.parametrize(("old", "new", "seen", "unseen"), [
    ('"AHU-1 coil" = "335 gpm"', '"AHU-1 coil" = "0 gpm"', "Visits: 2024-09-18",
     "division by zero"),
    ('"AHU-1 coil" = "335 gpm"', '"AHU-1 coil" = "-335 gpm"', "reversed ⚑", "-199 %"),
], ids=["zero-reading", "reversed"])
def test_a_still_or_reversed_line_shows_plainly_at_80x24(ui, tmp_path, old, new, seen, unseen):
    """A clamp-on reading 0 (a line shut or a meter fault) is no "✗" on the screen; a flow
    that reversed (-335 → +332 gpm: by hand no percentage) says so."""
    path = tmp_path / "site.toml"
    path.write_text(demo_text().replace(old, new), encoding="utf-8")

    async def scenario() -> None:
        async with ui.started("f5", site=path) as (app, pilot):
            await ui.settle(pilot)
            if seen == "reversed ⚑":
                await pilot.press("i")  # the flow
            text = ui.text(app)
            assert seen in text and unseen not in text and "✗" not in text, text
            assert "+46 % ± 13 % ⚑" in text or "Flow" in text

    ui.run(scenario)


def test_a_branch_read_twice_but_not_trended_says_to_see_the_notes(ui, tmp_path):
    """AHU-1's clamp-on reads 0 at the first visit and 330 gpm at the second: two clamp-ons,
    so not 'no 2 clamp-ons' (found in a trial) but the notes' reason."""
    path = tmp_path / "site.toml"
    path.write_text(demo_text().replace('"AHU-1 coil" = "335 gpm"', '"AHU-1 coil" = "0 gpm"'),
                    encoding="utf-8")

    async def scenario() -> None:
        async with ui.started("f5", size=(120, 40), site=path) as (app, pilot):
            await ui.settle(pilot)
            line = next(x for x in ui.text(app).splitlines() if x.strip().startswith("AHU-1"))
            assert "not trended: see the notes" in line and "no 2 clamp-ons" not in line

    ui.run(scenario)


def test_every_flag_can_be_read_at_80x24(ui, monkeypatch):
    # Six flags showed four at 80×24 (the area was cut at 8 lines, with no sign of more): the
    # flags now scroll with the visits' lines.
    from textual.containers import VerticalScroll
    from textual.widgets import Static

    from branchwise.core.history.timeline import History

    many = [f"Branch {i}: flow +{i + 5} % since 2024-09-18 (band ± 3 %): the head across the "
            "header changed" for i in range(12)]
    monkeypatch.setattr(History, "messages", lambda self: many)

    async def scenario() -> None:
        async with ui.started("f5", (80, 24)) as (app, pilot):
            await ui.settle(pilot)
            flags = app.screen.query_one("#history-flags", Static)
            assert flags.size.height >= 24  # twelve flags of two lines each, none cut
            more = app.screen.query_one("#history-more", VerticalScroll)
            assert flags in more.children and more.max_scroll_y > 0  # scrolled to, not lost
            seen = set()
            for _ in range(40):  # scrolled down line by line, every flag comes into view
                seen |= {i for i in range(12) if f"Branch {i}: flow" in ui.text(app)}
                more.scroll_down(animate=False)
                await pilot.pause()
            assert seen == set(range(12))

    ui.run(scenario)
