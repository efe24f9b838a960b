"""The help screen, built from the bindings themselves so that it cannot drift from the keys."""

from __future__ import annotations

from typing import Any

from rich.table import Table
from rich.text import Text
from textual.app import App, ComposeResult
from textual.binding import Binding
from textual.containers import VerticalScroll
from textual.widgets import Static

from ..modal import Dialog

ABOUT = (
    "Values: every field takes a number with any unit (250 ft, 76 m, 12 psi, 400 gpm, 65 degF;"
    " 180'-6\", 1½\", 2,000 ft; cP or cp, PSI, LPS, US gpm, ℃); a bare number takes the unit "
    "shown in brackets or in the column header. A head in a pressure (12 ft hd, 3 m head, "
    "ftH2O) is a column of water at 4 °C (NIST SP 811), not of the liquid in the pipe. A size "
    "takes a catalog size (3 in sch 40, DN80 sch 40, 80 NB sch 40, 1-1/2 type L, 110 mm SDR "
    "11) or a bore (ID 3 in, 77.9 mm); a bare nominal size (3 in, 80 mm) is refused, as it "
    "names no wall."
    "\nThe answer is worked out again after every change; while something is wrong the last "
    "good answer stays, greyed, and the message shows beside the field at fault."
    "\nCtrl+P lists every action by name."
)


class HelpScreen(Dialog[None]):
    """Keys by screen, then the app-wide keys, from the live binding lists."""

    BINDINGS = [Binding("escape,f1,q,question_mark", "close", "Close", id="help-close")]
    PASS_KEYS = True
    DEFAULT_CSS = """
    HelpScreen { align: center middle; }
    HelpScreen > VerticalScroll {
        width: 96; max-width: 100%; height: 95%; border: thick $primary;
        background: $surface; padding: 0 1;
    }
    """

    def __init__(self, sections: list[tuple[str, list[Binding]]]) -> None:
        super().__init__()
        self.sections = sections

    def compose(self) -> ComposeResult:
        from .catalog import catalog_table

        with VerticalScroll():
            yield Static(self.render_keys())
            yield Static(Text(ABOUT, style="dim"))
            yield Static("")
            yield Static(catalog_table())

    def render_keys(self) -> Table:
        table = Table.grid(padding=(0, 2))
        table.add_column(justify="right", style="bold", no_wrap=True)
        table.add_column()
        for title, bindings in self.sections:
            table.add_row(Text(title, style="bold underline"), "")
            for binding in bindings:
                if not binding.description:
                    continue
                keys = " / ".join(_key_text(self.app, k, binding)
                                  for k in binding.key.split(","))
                table.add_row(keys, Text(f"{binding.description}: "
                                         f"{binding.tooltip or binding.description}"))
            table.add_row("", "")
        return table

    def action_close(self) -> None:
        self.dismiss(None)


def _key_text(app: App[Any], key: str, binding: Binding) -> str:
    """How a key is written in help: F1, Ctrl+S, ?, Esc."""
    if key.startswith("f") and key[1:].isdigit():
        return key.upper()
    shown = app.get_key_display(Binding(key, binding.action))
    if shown.startswith("^"):
        return "Ctrl+" + shown[1:].upper()
    return shown[:1].upper() + shown[1:] if len(shown) > 1 else shown
