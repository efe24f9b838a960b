"""The Split screen: what is given, what to find, and how the flow splits between the branches.

Top (:class:`~.inputs.GivenFindRows`): the given condition (pressure drop across the header,
total flow, or the reading on one branch) and the find choice (the flows, or one branch's
diameter, length or roughness for a target flow). Below (:class:`~.views.ResultViews`): one
row per branch (and per further segment), the totals, the solved value with the catalog size,
the warnings — or in the table's place the uncertainty band or the system curve; the cautions
one key away.
"""

from __future__ import annotations

from pathlib import Path

from textual.app import ComposeResult
from textual.binding import Binding
from textual.widgets import Input

from ...state.session import find_of
from ...widgets.choice import Choice
from ..work_screen import WorkScreen
from .inputs import GivenFindRows
from .views import ResultViews


class SplitScreen(WorkScreen):
    """Given, find, and the answer (or, in its place, the uncertainty band or the curve)."""

    AUTO_FOCUS = "#results"
    CSS_PATH = Path(__file__).parent / "split.tcss"
    LISTS_WARNINGS = True
    """``w`` lists the warnings here (the status strip says so)."""
    HINT_KEYS = (("o", "branch"), ("t", "target"), ("l", "tolerances"), ("p", "curve"))
    """Find of which branch, for which target; the tolerances; the system curve."""

    BINDINGS = [
        Binding("escape", "field('results')", "Done typing", id="split-table",
                key_display="Enter next · Esc",
                tooltip="Enter moves to the next field; Esc leaves the fields for the results, "
                        "and single letters are keys again"),
        Binding("g", "pick('given-kind')", "Given", id="split-given",
                tooltip="Choose the reading the head is solved from: Δp, total flow or one "
                        "branch's reading (the others are kept and compared)"),
        Binding("v", "field('given-value')", "Value", id="split-value", show=False,
                tooltip="Type the value of the given condition"),
        Binding("f", "pick('find-kind')", "Find", id="split-find",
                tooltip="Choose what to find: the flows, or a diameter, length or roughness"),
        Binding("o", "pick('find-branch')", "Of branch", id="split-of", show=False,
                tooltip="Choose the branch whose diameter, length or roughness is found"),
        Binding("t", "field('find-target')", "Target", id="split-target", show=False,
                tooltip="Type the target flow of the branch being sized"),
        Binding("z", "field('lift-value')", "Lift", id="split-lift", show=False,
                tooltip="Type the elevation change between the headers, outlet minus inlet"),
        Binding("r", "export('markdown')", "Record", id="split-record",
                tooltip="Write the walkdown record (Markdown)"),
        Binding("c", "export('csv')", "CSV", id="split-csv", show=False,
                tooltip="Write the results table as CSV"),
        Binding("h", "export('html')", "Report", id="split-html", show=False,
                tooltip="Write the walkdown report as one HTML file (opens in any browser, "
                        "prints on A4 or Letter)"),
        Binding("y", "copy('table')", "Copy table", id="split-copy-table", show=False,
                tooltip="Copy the results table to the clipboard (tab-separated, for a "
                        "spreadsheet)"),
        Binding("a", "copy('answer')", "Copy answer", id="split-copy-answer", show=False,
                tooltip="Copy the answer line (Δp, total flow, a found value) to the "
                        "clipboard"),
        Binding("x", "weighed", "Readings", id="split-weighed", show=False,
                tooltip="Every reading weighed against the others: which agree, which is off"),
        Binding("w", "warnings", "Warnings", id="split-warnings", show=False,
                tooltip="List every warning and note of the answer"),
        Binding("b", "view('band')", "Band", id="split-band",
                tooltip="P5–P95 band of every flow from the tolerances, and what dominates it "
                        "(b again: back to the table)"),
        Binding("p", "view('curve')", "Curve", id="split-curve", show=False,
                tooltip="System curve: Δp against the total and branch flows, operating point "
                        "marked (p again: back to the table)"),
        Binding("l", "tolerances", "Tolerances", id="split-tolerances", show=False,
                tooltip="See and change the ± limits on the readings and records"),
    ]

    def body(self) -> ComposeResult:
        yield GivenFindRows(id="split-inputs")
        yield ResultViews(id="split-results")

    @property
    def views(self) -> ResultViews:
        """The results area (table, band or curve)."""
        return self.query_one(ResultViews)

    def redraw(self) -> None:
        with self.prevent(Input.Changed):
            self.query_one(GivenFindRows).show()
        self.views.show()

    # ---- keys ------------------------------------------------------------------------------------

    def action_view(self, name: str) -> None:
        self.views.toggle(name)

    def action_tolerances(self) -> None:
        self.views.edit_tolerances()

    def action_field(self, ident: str) -> None:
        """Put the cursor in a field (or, for ``results``, on the table, band or curve)."""
        widget = self.views.main_view() if ident == "results" else self.query_one(f"#{ident}")
        if widget is None:
            self.set_focus(None)  # the curve: nothing to type into, keys work from the screen
        elif widget.display:
            widget.focus()

    def action_pick(self, ident: str) -> None:
        """Open a picker's list at once (g, f): one key, as a person expects."""
        choice = self.query_one(f"#{ident}", Choice)
        choice.focus()
        choice.action_open()

    def action_export(self, fmt: str) -> None:
        self.bw.export(fmt)

    def action_copy(self, what: str) -> None:
        from ...copying import copy

        copy(self.app, what)

    def action_warnings(self) -> None:
        from ..warnings import WarningsScreen

        self.app.push_screen(WarningsScreen(list(self.views.warning_lines)))

    def action_weighed(self) -> None:
        from ...core_loading import core_imports
        from ..warnings import WarningsScreen

        with core_imports():
            from branchwise.core.report.weighed import TITLE, weighed_lines

        outcome = self.bw.outcome
        if outcome is None or outcome.solved is None:
            return
        why = outcome.solved.unweighed
        unweighed = [self.bw.units.restate(why)] if why else []
        lines = weighed_lines(outcome.solved, self.bw.units) or unweighed or [
            "No readings to weigh: give the pressure drop, the total flow or a branch's reading."]
        self.app.push_screen(WarningsScreen(
            lines, title=TITLE,
            keys="Esc closes.  g → \"all readings\" solves from them all; the report (h, r) "
                 "lists them too."))

    def check_action(self, action: str, parameters: tuple[object, ...]) -> bool | None:
        if action == "weighed":
            outcome = self.bw.outcome
            return True if outcome is not None and outcome.ok else None
        if action in ("export", "copy"):
            outcome = self.bw.outcome
            return True if outcome is not None and outcome.ok else None
        if parameters in (("find-target",), ("find-branch",)):
            return True if find_of(self.bw.site) != "flows" else None
        if action == "field" and parameters == ("results",):
            # Esc: shown (with Enter's meaning) while typing in a field, hidden otherwise.
            return self.focused is not None and self.focused is not self.views.main_view()
        return True

    def unavailable_reason(self, action: str, parameters: tuple[object, ...]) -> str:
        if action in ("export", "copy"):
            return "Nothing to write yet: the site does not solve (see the message above)."
        if action == "field" and parameters == ("find-target",):
            return "No target flow while finding the flows: f chooses what to find."
        if action == "pick" and parameters == ("find-branch",):
            return "No branch to size while finding the flows: f chooses what to find."
        return ""
