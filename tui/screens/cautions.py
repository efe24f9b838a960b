"""The cautions, one key away from every screen."""

from __future__ import annotations

from textual.app import ComposeResult
from textual.binding import Binding
from textual.containers import Vertical
from textual.widgets import Label, Static

from ..modal import Dialog

CAUTIONS = (
    "Pressurised, hot or hazardous lines can injure. Keep clear of them unless the owner's "
    "procedures allow the work; never open, isolate or modify a line on these numbers alone.",
    "The figures are estimates for planning and troubleshooting, from readings and catalog "
    "data that may be off: a gauge reads to a percent of its full scale, a clamp-on meter to a "
    "few percent, an old pipe is rougher and narrower than new. Confirm with site measurements.",
    "Follow local codes, the owner's procedures and the engineer of record.",
    "A licensed professional decides design and safety questions.",
)


class CautionsScreen(Dialog[None]):
    BINDINGS = [Binding("escape,q,exclamation_mark,f7", "close", "Close", id="cautions-close")]
    PASS_KEYS = True
    DEFAULT_CSS = """
    CautionsScreen { align: center middle; }
    CautionsScreen > Vertical {
        width: 76; max-width: 100%; height: auto; border: thick $warning;
        background: $surface; padding: 1 2;
    }
    CautionsScreen Label { text-style: bold; color: $warning; }
    CautionsScreen Static { margin-top: 1; }
    """

    def compose(self) -> ComposeResult:
        with Vertical():
            yield Label("Cautions")
            for text in CAUTIONS:
                yield Static(f"• {text}", markup=False)
            yield Static("Esc closes.", markup=False)

    def action_close(self) -> None:
        self.dismiss(None)
