"""The app among the person's other tools: the theme kept, colours that follow it, the results
on the clipboard, screenshots in a folder that exists, the HTML report, and a line list opened
from the open dialog."""

from __future__ import annotations

import ast
import csv
import io
import re
import tomllib
from pathlib import Path

from branchwise.core.site.read import demo_site
from branchwise.core.site.write import save_site
from branchwise.tui.screens.warnings import WarningsScreen
from branchwise.tui.theme import colour

TUI = Path(__file__).resolve().parents[2] / "tui"
NAMED = re.compile(r"\b(?:bright_)?(?:red|yellow|green|cyan|magenta|blue|white|black)\b"
                   r"|\bgrey\d+\b|\bgray\d+\b")


def test_no_hard_coded_colour_in_the_app():
    """Every colour the app draws by hand comes from the theme (tui/theme.py); a named Rich
    colour in a string would turn pale or vanish on a light theme."""
    found = []
    for path in TUI.rglob("*.py"):
        tree = ast.parse(path.read_text(encoding="utf-8"))
        docstrings = {id(n.body[0].value) for n in ast.walk(tree)
                      if isinstance(n, ast.Module | ast.ClassDef | ast.FunctionDef)
                      and n.body and isinstance(n.body[0], ast.Expr)}
        for node in ast.walk(tree):
            if (isinstance(node, ast.Constant) and isinstance(node.value, str)
                    and id(node) not in docstrings and NAMED.search(node.value)
                    and len(node.value) < 40):
                found.append(f"{path.relative_to(TUI)}:{node.lineno}: {node.value!r}")
    assert not found, found


def test_the_theme_is_kept_and_the_colours_follow_it(ui, data_dir):
    async def choose() -> None:
        async with ui.started() as (app, pilot):
            dark = colour(app, "text-success")
            app.theme = "textual-light"
            await ui.settle(pilot)
            assert colour(app, "text-success") != dark  # the status line's ✓ follows it
            from branchwise.tui.widgets.status import StatusStrip

            line = app.screen.query_one(StatusStrip).content
            styles = {str(span.style) for span in getattr(line, "spans", [])}
            assert any(colour(app, "text-success").lower() in s.lower() for s in styles), styles

    async def again() -> None:
        async with ui.started() as (app, pilot):
            assert app.theme == "textual-light"

    ui.run(choose)
    saved = tomllib.loads((data_dir / "settings.toml").read_text(encoding="utf-8"))
    assert saved["theme"] == "textual-light"
    ui.run(again)


def test_copy_the_table_and_the_answer(ui):
    async def scenario() -> None:
        async with ui.started("f4") as (app, pilot):
            await pilot.press("y")
            rows = list(csv.reader(io.StringIO(app.clipboard), delimiter="\t"))
            assert rows[0][:4] == ["Branch", "Segment", "Tag", "Flow (L/s)"]
            assert len(rows) == 1 + 5  # the demo: five segments
            total = sum(float(r[3]) for r in rows[1:] if r[3])
            assert abs(total - app.outcome.solved.result.total_flow * 1e3) < 1e-9 * total
            await pilot.press("a")
            assert app.clipboard.startswith("Demo: chilled-water header, plant room B: ")
            assert "total flow 39.10 L/s" in app.clipboard

    ui.run(scenario)


def test_a_screenshot_goes_to_a_folder_that_exists_and_says_where(ui, data_dir):
    async def scenario() -> None:
        async with ui.started() as (app, pilot):
            saved = app.deliver_screenshot()
            await pilot.pause()
            assert saved is not None and Path(saved).parent == data_dir / "screenshots"
            assert Path(saved).read_text(encoding="utf-8").lstrip().startswith("<svg")
            said = [n.message for n in app._notifications]
            assert any("Screenshot saved" in m and str(Path(saved).name) in m for m in said)

    ui.run(scenario)


def test_the_html_report_from_the_split_screen(ui, data_dir):
    site = demo_site()
    site.name = "Pump room 3"
    path = save_site(site, data_dir / "sites" / "pump-room-3.toml")

    async def scenario() -> None:
        async with ui.started("f4", site=path) as (app, pilot):
            await pilot.press("h")
            assert app.screen.__class__.__name__ == "SaveAsScreen"
            await pilot.press("enter")
            await pilot.pause()
            written = list(path.parent.glob("pump-room-3-*.html"))
            assert len(written) == 1
            text = written[0].read_text(encoding="utf-8")
            assert text.startswith("<!DOCTYPE html>") and "Pump room 3" in text
            assert "39.10" in text  # the total flow the screen shows, L/s

    ui.run(scenario)


def test_a_line_list_opens_from_the_open_dialog(ui, tmp_path):
    good = tmp_path / "lines.csv"
    good.write_text("Name,Size,Length (m),Material,Kv,Service\n"
                    "North,4 in sch 40,60,commercial steel,160,CHW\n"
                    "South,3 in sch 40,40,commercial steel,110,CHW\n", encoding="utf-8")
    bad = tmp_path / "bad.csv"
    bad.write_text("Name,Size,Length (m),Material\nNorth,4 in sch 40,sixty,commercial steel\n",
                   encoding="utf-8")

    async def open_path(app, pilot, path: Path) -> None:
        await pilot.press("ctrl+o")
        await pilot.pause()
        await pilot.press("slash")
        await ui.type(pilot, str(path))
        await pilot.press("enter")
        await pilot.pause()

    async def scenario() -> None:
        async with ui.started() as (app, pilot):
            await open_path(app, pilot, bad)
            assert isinstance(app.screen, WarningsScreen)
            assert "line 2, column 'Length (m)'" in ui.text(app)
            await pilot.press("escape")
            assert app.site.title.startswith("Demo")  # nothing was opened
            await open_path(app, pilot, good)
            await ui.settle(pilot)
            assert [b.name for b in app.site.branches] == ["North", "South"]
            assert app.session.dirty and app.session.path is None

    ui.run(scenario)
