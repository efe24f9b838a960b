"""Open a site: the saved sites (name, last changed), recent ones, the demo, or a new one."""

from __future__ import annotations

from collections import Counter
from datetime import datetime
from pathlib import Path

from rich.text import Text
from textual.app import ComposeResult
from textual.binding import Binding
from textual.containers import Vertical
from textual.widgets import DataTable, Input, Label, Static

from branchwise.core.errors import inert
from branchwise.core.storage.paths import list_sites, sites_dir

from ..modal import Dialog


def _cell(text: str) -> Text:
    """A name or path as a table cell: shown as it is (brackets are not markup), control
    characters escaped."""
    return Text(inert(text), no_wrap=True, overflow="ellipsis")


def _when(seconds: float) -> str:
    return datetime.fromtimestamp(seconds).strftime("%Y-%m-%d %H:%M")


class SitesScreen(Dialog[Path | str | None]):
    """Pick a site; returns a path, ``"demo"``, ``"new"``, or None."""

    BINDINGS = [
        Binding("escape", "cancel", "Cancel", id="sites-cancel"),
        Binding("slash", "type_path", "Type a path", id="sites-path",
                tooltip="Open a file that is not in the list"),
    ]
    PASS_KEYS = True
    DEFAULT_CSS = """
    SitesScreen { align: center middle; }
    SitesScreen > Vertical {
        width: 100; max-width: 100%; height: 90%; border: thick $primary;
        background: $surface; padding: 0 1;
    }
    SitesScreen .sites-title { text-style: bold; }
    SitesScreen DataTable { height: 1fr; }
    SitesScreen .sites-note { color: $text-muted; }
    SitesScreen Input { display: none; }
    SitesScreen Input.-shown { display: block; }
    """

    def __init__(self, recent: list[Path], current: Path | None) -> None:
        super().__init__()
        self.recent = recent
        self.current = current

    def compose(self) -> ComposeResult:
        with Vertical():
            yield Label("Open a site", classes="sites-title")
            yield DataTable(id="sites", cursor_type="row", zebra_stripes=True)
            yield Input(placeholder="path to a site file, then Enter", id="sites-path-input")
            yield Static("", classes="sites-note", markup=False)

    def on_mount(self) -> None:
        if not self.children:  # the app is closing: nothing was composed
            return
        table = self.query_one(DataTable)
        table.add_columns("Site", "Last changed", "File")
        listing = list_sites()
        seen: set[Path] = set()
        names = Counter(entry.name.casefold() for entry in listing)
        for entry in listing:
            seen.add(entry.path.absolute())
            # Two sites of one name: the file says which is which, in the name's own column
            # (the File column may be out of sight on a narrow terminal).
            name = (f"{entry.name} ({entry.path.name})" if names[entry.name.casefold()] > 1
                    else entry.name)
            table.add_row(_cell(name), _when(entry.modified), _cell(entry.path.name),
                          key=str(entry.path))
        for path in self.recent:
            if path.absolute() in seen:
                continue
            seen.add(path.absolute())
            try:
                changed = _when(path.stat().st_mtime)
            except OSError:
                changed = "missing"
            table.add_row(_cell(f"(recent) {path.stem}"), changed, _cell(str(path)),
                          key=str(path))
        table.add_row("Import a line list (CSV)…", "", "—", key="import")
        table.add_row("Demo: chilled-water header", "bundled", "—", key="demo")
        table.add_row("New empty site", "", "—", key="new")
        note = (f"Saved sites live in {inert(str(sites_dir()))}.  Enter: open   /: type a path "
                "(a site, or a line list .csv to import)   Esc: cancel")
        if listing.problems:
            note += "\nNot listed: " + "; ".join(listing.problems)
        self.query_one(".sites-note", Static).update(note)
        table.focus()

    def on_data_table_row_selected(self, event: DataTable.RowSelected) -> None:
        key = event.row_key.value
        if key == "import":
            self.action_type_path()
            self.query_one(Input).placeholder = "path to a line list (CSV), then Enter"
            return
        if key in ("demo", "new"):
            self.dismiss(key)
        elif key is not None:
            path = Path(key)
            if not path.exists():
                self.notify(f"{path} is gone.", severity="warning")
                return
            self.dismiss(path)

    def action_type_path(self) -> None:
        box = self.query_one(Input)
        box.add_class("-shown")
        box.focus()

    def on_input_submitted(self, event: Input.Submitted) -> None:
        path = Path(event.value.strip()).expanduser()
        if not event.value.strip():
            return
        if not path.is_file():
            self.query_one(".sites-note", Static).update(f"No file {path}.")
            return
        self.dismiss(path)

    def action_cancel(self) -> None:
        self.dismiss(None)
