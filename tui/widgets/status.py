"""The strip under the title on every screen: what is given, what is sought, and the state.

It reads the app's reactive attributes (``revision``, ``outcome``, ``unit_system``) and redraws
itself when they change, so that the solve mode and the given condition are always in sight.
"""

from __future__ import annotations

from typing import TYPE_CHECKING

from rich.text import Text
from textual.widgets import Static

from ..session import branch_name, find_of, given_of, given_text, locate, text_of

if TYPE_CHECKING:
    from ..app import BranchwiseApp

GIVEN_LABELS = {"pressure_drop": "Δp across the header", "total_flow": "total flow"}
AREA_KEYS = {"fluid": "F2 Liquid", "branches": "F3 Branches", "conditions": "F4 Split",
             "solve": "F4 Split", "tolerances": "F4 Split, l tolerances", "site": "F3 Branches"}


class StatusStrip(Static):
    """Two lines: the given condition and the find choice; then the solver's state."""

    DEFAULT_CSS = """
    StatusStrip { height: 2; padding: 0 1; background: $boost; text-wrap: nowrap;
                  text-overflow: ellipsis; }
    """

    def on_mount(self) -> None:
        app: BranchwiseApp = self.app  # type: ignore[assignment]
        for name in ("revision", "outcome", "unit_system", "dirty"):
            self.watch(app, name, self._redraw, init=False)
        self._redraw()

    def _redraw(self, *_: object) -> None:
        app: BranchwiseApp = self.app  # type: ignore[assignment]
        text = describe(app, getattr(self.screen, "LISTS_WARNINGS", False))
        if self.content != text:
            self.update(text, layout=False)  # two lines, always: no new layout needed


def describe(app: BranchwiseApp, on_split: bool = False) -> Text:
    """The strip's text for the app's present state (``on_split``: the strip of the Split
    screen, where ``w`` lists the warnings)."""
    site = app.session.site
    kind, index = given_of(site)
    value = given_text(site) or "—"
    if kind == "measured_flow" and index is not None:
        given = f"reading on {branch_name(site, index)}"
    else:
        given = GIVEN_LABELS[kind]
    find = find_of(site)
    if find == "flows":
        sought = "the flow in every branch"
    else:
        solve = site.solve
        target = text_of(solve.target_flow if solve else None) or "—"
        branch = text_of(solve.branch if solve else None) or "—"
        sought = f"{find} of {branch} for {target}"
    line = Text()
    line.append("Given ", style="dim")
    line.append(f"{given} {value}", style="bold")
    line.append("  Find ", style="dim")
    line.append(sought, style="bold")
    line.append(f"  [{app.unit_system.upper()}]", style="dim")
    line.append("\n")
    outcome = app.outcome
    if outcome is None:  # (a later answer replaces this line; no flicker while typing)
        line.append("… solving", style="italic dim")
    elif outcome.error is not None:
        where = AREA_KEYS[locate(outcome.field).area]
        line.append(f"✗ {app.error_words(outcome.error)}", style="bold red")
        line.append(f"  ({where})", style="dim")
    else:
        n = len(outcome.solved.result.branches) if outcome.solved else 0
        line.append(f"✓ solved {n} branches in {outcome.seconds * 1000:.1f} ms", style="green")
        warnings = len(outcome.solved.result.warnings) if outcome.solved else 0
        if warnings:
            where = "w lists them" if on_split else "F4"
            line.append(f"  ⚠ {warnings} warning{'s' if warnings > 1 else ''} ({where})",
                        style="yellow")
    line.no_wrap = True
    line.overflow = "ellipsis"
    return line
