"""What the app puts on the clipboard and where it keeps screenshots.

The results table goes as tab-separated values (the CSV's rows: one per segment, full
precision, so that it pastes into a spreadsheet as cells), the answer as one line of text;
both through Textual's own copy (the terminal's clipboard, OSC 52). A screenshot is saved in
the data folder (or, when that cannot be made, the current folder), and the app says where.
"""

from __future__ import annotations

from datetime import datetime
from pathlib import Path
from typing import TYPE_CHECKING

from .core_loading import core_imports
from .workspace import workspace

if TYPE_CHECKING:
    from textual.app import App

    from branchwise.core.site.solve import SiteResult


def _answer(app: App[None]) -> SiteResult | None:
    outcome = workspace(app).outcome
    return outcome.solved if outcome is not None and outcome.ok else None


def table_text(app: App[None]) -> str | None:
    """The results table as TSV in the person's units, or None without an answer."""
    with core_imports():
        from branchwise.core.report.csv_report import to_tsv

    solved = _answer(app)
    return None if solved is None else to_tsv(solved, workspace(app).units)


def answer_text(app: App[None]) -> str | None:
    """The answer on one line: Δp, head loss and total flow, and a found unknown with its
    catalog size (the reports' own words), or None without an answer."""
    with core_imports():
        from branchwise.core.report.lines import solved_lines, summary_lines

    solved = _answer(app)
    if solved is None:
        return None
    u = workspace(app).units
    parts = [f"{solved.site.title}: {summary_lines(solved, u)[2]}",
             *solved_lines(solved, u, short=True)]
    parts.append("estimates only: confirm on site before acting")
    return "; ".join(" ".join(p.split()) for p in parts)


def copy(app: App[None], what: str) -> None:
    """Copy the results ``table`` or the ``answer`` line, and say so."""
    text = table_text(app) if what == "table" else answer_text(app)
    if text is None:
        app.notify("Nothing to copy: the site does not solve yet.", severity="warning")
        return
    app.copy_to_clipboard(text)
    if what == "table":
        rows = text.count("\n") - 1
        app.notify(f"Copied the results table: {rows} rows, tab-separated, to paste into a "
                   "spreadsheet", timeout=4)
    else:
        app.notify(f"Copied: {text}", timeout=5)


def screenshot_folder() -> Path:
    """The data folder (made if missing), or the current folder when it cannot be made."""
    from branchwise.core.storage.paths import data_dir

    folder = data_dir() / "screenshots"
    try:
        folder.mkdir(parents=True, exist_ok=True)
        return folder
    except OSError:
        return Path.cwd()


def save_screenshot(app: App[None]) -> Path | None:
    """Save the screen as SVG in :func:`screenshot_folder` and say where (None: not saved)."""
    from .files import file_and_folder

    folder = screenshot_folder()
    name = f"branchwise-{datetime.now():%Y%m%d-%H%M%S}.svg"
    try:
        path = Path(app.save_screenshot(name, str(folder)))
    except OSError as exc:
        app.notify(f"Screenshot not saved in {folder}: {exc.strerror or exc}",
                   severity="error", timeout=8)
        return None
    app.notify(f"Screenshot saved: {file_and_folder(path)}", timeout=6)
    return path
