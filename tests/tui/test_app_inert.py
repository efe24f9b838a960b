"""A site whose names, tags or record hold terminal escape codes cannot act on the terminal
through the app: every screen shows them escaped, and the app says so once."""

from __future__ import annotations

from branchwise.core.site.read import demo_text

NASTY = "\\u001b]0;PWNED\\u0007\\u001b[2J\\u001b[31m"


def _site(tmp_path):
    text = demo_text()
    text = text.replace('name = "AHU-1 coil"', f'name = "AHU-1{NASTY} coil"', 1)
    text = text.replace('tag = "CHW-101"', f'tag = "CHW{NASTY}-101"', 1)
    text = text.replace('technician = ', f'technician = "T{NASTY}" #', 1)
    text = text.replace('name = "Demo:', f'name = "X{NASTY} Demo:', 1)
    path = tmp_path / "nasty.toml"
    path.write_text(text, encoding="utf-8")
    return path


def _raw(text: str) -> list[str]:
    return [c for c in text if ord(c) < 0x20 and c not in "\n\t"]


def test_every_screen_shows_escape_codes_escaped(ui, tmp_path):
    path = _site(tmp_path)

    async def scenario() -> None:
        async with ui.started(site=path, size=(120, 40)) as (app, pilot):
            notes = " ".join(str(n.message) for n in app._notifications)
            assert "Control characters" in notes
            assert "\x1b" not in app.sub_title and "\\x1b" in app.sub_title
            for key in ("f4", "f3", "f2", "f4"):
                await pilot.press(key)
                await ui.settle(pilot)
                shown = ui.text(app)
                assert _raw(shown) == [], key
            await pilot.press("f3")
            await ui.settle(pilot)
            assert "AHU-1\\x1b]0;PWNED" in ui.text(app)
            await pilot.press("f8")  # the record's header: the technician
            await pilot.pause()
            assert _raw(ui.text(app)) == []
            assert app.site.record.technician.startswith("T\\x1b")

    ui.run(scenario)
