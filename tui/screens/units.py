"""Choose the display unit of each kind of quantity (remembered in the settings)."""

from __future__ import annotations

from textual.app import ComposeResult
from textual.binding import Binding
from textual.containers import Horizontal, Vertical, VerticalScroll
from textual.widgets import Label, Static

from branchwise.core.units import display_unit, unit_choices, unit_label

from ..modal import Dialog
from ..widgets.choice import Choice

QUANTITIES = ("pressure", "flow", "length", "diameter", "roughness", "head", "velocity",
              "temperature", "density", "viscosity", "kinematic_viscosity")


class UnitsScreen(Dialog[dict[str, str] | None]):
    """One picker per quantity; returns the chosen units that differ from the system's.

    Keys as in every dialog: Enter keeps, Esc cancels. ←/→ step a unit, Space lists them."""

    BINDINGS = [
        Binding("escape", "cancel", "Cancel", id="units-cancel"),
        Binding("enter", "keep", "Keep", id="units-keep", priority=True),
    ]
    DEFAULT_CSS = """
    UnitsScreen { align: center middle; }
    UnitsScreen > Vertical {
        width: 60; max-width: 100%; height: 90%; border: thick $primary;
        background: $surface; padding: 0 1;
    }
    UnitsScreen Horizontal { height: 1; }
    UnitsScreen .unit-label { width: 22; }
    UnitsScreen Choice { width: 1fr; }
    """

    def __init__(self, system: str, chosen: dict[str, str]) -> None:
        super().__init__()
        self.system = system
        self.chosen = chosen

    def compose(self) -> ComposeResult:
        with Vertical():
            yield Label(f"Display units ({self.system.upper()}; Ctrl+T switches the system)")
            with VerticalScroll():
                for kind in QUANTITIES:
                    default = display_unit(kind, self.system)
                    choices = list(dict.fromkeys((default, *unit_choices(kind))))
                    with Horizontal():
                        yield Label(kind.replace("_", " ").capitalize(), classes="unit-label")
                        yield Choice([(unit_label(c), c) for c in choices],
                                     self.chosen.get(kind, default), id=f"unit-{kind}")
            yield Static("←/→: change   Space: list   Enter: keep   Esc: cancel", markup=False)

    def action_keep(self) -> None:
        out = {}
        for kind in QUANTITIES:
            value = self.query_one(f"#unit-{kind}", Choice).value
            if value != display_unit(kind, self.system):
                out[kind] = value
        self.dismiss(out)

    def action_cancel(self) -> None:
        self.dismiss(None)
