"""A line list (CSV) opened from the app's open dialog: its branches become a new site,
unsaved, with water at 20 °C and the reading to set; a list with bad cells opens nothing and
lists every bad cell by its line and column."""

from __future__ import annotations

from pathlib import Path
from typing import TYPE_CHECKING

from branchwise.core.errors import InputError

if TYPE_CHECKING:
    from textual.app import App


def open_line_list(app: App[None], path: Path) -> bool:
    """Read ``path`` and make its site the app's; False (and the problems shown) if it does
    not read whole."""
    from branchwise.core.site.line_list import LineListError, read_line_list

    from .import_command import read_text
    from .screens.warnings import WarningsScreen
    from .workspace import workspace

    ws = workspace(app)
    try:
        listed = read_line_list(read_text(path, path.name), path.name)
    except LineListError as exc:
        n = len(exc.problems)
        app.push_screen(WarningsScreen(
            [str(p) for p in exc.problems],
            title=f"Nothing imported: {n} bad cell{'s' if n > 1 else ''} in {path.name}",
            keys="Esc closes.  Correct the list and open it again (Ctrl+O, /)."))
        return False
    except InputError as exc:
        app.notify(str(exc), title="Not imported", severity="error", timeout=10)
        return False
    ws.session.replace(listed.site(path.stem))
    ws.session.mark_unsaved()  # an import is unsaved work until it is saved as a site
    ws.good = None
    ws.latest_band = None
    ws.site_changed()
    left_out = f"\nColumns left out: {', '.join(listed.ignored)}" if listed.ignored else ""
    app.notify(f"Imported {len(listed.branches)} branches from {path.name}: set the liquid "
               f"(F2) and a reading (F4), then Ctrl+S.{left_out}", timeout=10)
    return True
