"""The Split screen: what is given, what to find, and how the flow splits between the branches.

Top: the given condition (pressure drop across the header, total flow, or the reading on one
branch) and the find choice (the flows, or one branch's diameter, length or roughness for a
target flow). Below: one row per branch (and per further segment), the totals, the solved
value with the catalog size, the warnings, and the cautions one key away. While the site has an
error the last good answer stays on screen, greyed, and the error shows beside its field.
"""

from __future__ import annotations

from rich.text import Text
from textual.app import ComposeResult
from textual.binding import Binding
from textual.containers import Horizontal, Vertical
from textual.widgets import Input, Label, Static

from ...state.givens import given_of, given_text
from ...state.session import FIND_CHOICES, branch_name, find_of, locate, text_of
from ...widgets.choice import Choice
from ...widgets.quiet import put, show_text
from ...widgets.sharebar import share_bar
from ...widgets.texttable import TextTable
from ..warnings import fit_lines
from .inputs import GIVEN_PREFIX, GivenFindEdits
from .readings import reading_lines
from .views import PANEL_BINDINGS, PanelScreen

FIND_LABELS = {"flows": "the flows", "diameter": "the diameter", "length": "the length",
               "roughness": "the roughness"}
MAX_WARNING_LINES = 6
"""At most this many warning lines under the table; fewer when the branch rows need the room."""
REGIMES = {"laminar": "lam.", "transition": "trans.", "turbulent": "turb."}
BASE_GIVENS = [("Δp across the header", "pressure_drop"), ("Total flow", "total_flow")]
CAUTION_LINE = "Estimates only, not design: confirm on site.  ! cautions"


class SplitScreen(GivenFindEdits, PanelScreen):
    """Given, find, and the answer (or, in its place, the uncertainty band or the curve); the
    edits of the given and find rows are in :class:`~.splitedits.GivenFindEdits`."""

    AUTO_FOCUS = "#results"
    LISTS_WARNINGS = True
    """``w`` lists the warnings here (the status strip says so)."""

    BINDINGS = [
        Binding("escape", "focus('results')", "Done typing", id="split-table",
                key_display="Enter next · Esc",
                tooltip="Enter moves to the next field; Esc leaves the fields for the results, "
                        "and single letters are keys again"),
        Binding("g", "pick('given-kind')", "Given", id="split-given",
                tooltip="Choose the reading the head is solved from: Δp, total flow or one "
                        "branch's reading (the others are kept and compared)"),
        Binding("v", "focus('given-value')", "Value", id="split-value", show=False,
                tooltip="Type the value of the given condition"),
        Binding("f", "pick('find-kind')", "Find", id="split-find",
                tooltip="Choose what to find: the flows, or a diameter, length or roughness"),
        Binding("o", "pick('find-branch')", "Of branch", id="split-of", show=False,
                tooltip="Choose the branch whose diameter, length or roughness is found"),
        Binding("t", "focus('find-target')", "Target", id="split-target", show=False,
                tooltip="Type the target flow of the branch being sized"),
        Binding("z", "focus('lift-value')", "Lift", id="split-lift", show=False,
                tooltip="Type the elevation change between the headers, outlet minus inlet"),
        Binding("r", "export('markdown')", "Record", id="split-record",
                tooltip="Write the walkdown record (Markdown)"),
        Binding("c", "export('csv')", "CSV", id="split-csv", show=False,
                tooltip="Write the results table as CSV"),
        Binding("w", "warnings", "Warnings", id="split-warnings", show=False,
                tooltip="List every warning and note of the answer"),
        *PANEL_BINDINGS,
    ]

    def body(self) -> ComposeResult:
        seeking = find_of(self.bw.site) != "flows"
        with Vertical(id="split-inputs"):
            with Horizontal(classes="row"):
                yield Label("Given", classes="row-label")
                yield Choice(BASE_GIVENS, id="given-kind")
                yield Input(id="given-value", compact=True)
                yield Label("", id="given-unit", classes="unit", markup=False)
                yield Label("lift", id="lift-label")
                yield Input(id="lift-value", compact=True, placeholder="0",
                            tooltip="Elevation change, outlet minus inlet (z_out − z_in)")
                yield Label("", id="lift-unit", classes="unit", markup=False)
            yield _hidden(Static("", id="given-message", classes="message", markup=False))
            with Horizontal(classes="row"):
                yield Label("Find", classes="row-label")
                yield Choice([(FIND_LABELS[f], f) for f in FIND_CHOICES], "flows",
                             id="find-kind")
                parts = (Label(" of ", classes="find-part"),
                         Choice([], id="find-branch", prompt="branch", classes="find-part"),
                         Label(" for ", classes="find-part"),
                         Input(id="find-target", compact=True, placeholder="flow",
                               classes="find-part"),
                         Choice([], id="find-segment", prompt="segment",
                                classes="find-part"))
                for part in parts:
                    part.display = seeking  # as the site is, so that nothing moves at start
                    yield part
            yield _hidden(Static("", id="find-message", classes="message", markup=False))
        with Vertical(id="split-results"):
            yield TextTable(id="results")
            yield from self.panel_widgets()
            yield Static("", id="totals", markup=False)
            yield Static("", id="solved", markup=False)
            yield _hidden(Static("", id="warnings", markup=False))
        yield Static(CAUTION_LINE, id="caution-line", markup=False)

    # ---- drawing ---------------------------------------------------------------------------------

    def redraw(self) -> None:
        with self.prevent(Input.Changed):
            self._draw_inputs()
            self._draw_results()
        self.draw_panel()

    def draw_panel(self) -> None:
        super().draw_panel()
        self._draw_results()  # a band come in says whether each reading lies inside it

    def _draw_inputs(self) -> None:
        app, site = self.bw, self.bw.site
        kind, index = given_of(site)
        options = list(BASE_GIVENS)
        options += [(f"Reading on {branch_name(site, i)}", f"{GIVEN_PREFIX}{i}")
                    for i in range(len(site.branches))]
        value = kind if kind != "measured_flow" else f"{GIVEN_PREFIX}{index}"
        self.query_one("#given-kind", Choice).set_options(options, value)
        unit_kind = "pressure" if kind == "pressure_drop" else "flow"
        show_text(self.query_one("#given-value", Input), given_text(site))
        put(self.query_one("#given-unit", Label), f"[{app.unit_text(unit_kind)}]")
        show_text(self.query_one("#lift-value", Input),
                  text_of(site.conditions.elevation_change))
        put(self.query_one("#lift-unit", Label), f"[{app.unit_text('head')}]")

        find = find_of(site)
        self.query_one("#find-kind", Choice).value = find
        names = [(branch_name(site, i), branch_name(site, i)) for i in range(len(site.branches))]
        solve = site.solve
        chosen = text_of(solve.branch if solve else None)
        self.query_one("#find-branch", Choice).set_options(names, chosen)
        show_text(self.query_one("#find-target", Input),
                  text_of(solve.target_flow if solve else None))
        segments = self._segments_of(chosen)
        for part in self.query(".find-part"):
            show = find != "flows" and (part.id != "find-segment" or segments > 1)
            if part.display != show:
                part.display = show
        self.query_one("#find-segment", Choice).set_options(
            [(f"segment {j}", str(j)) for j in range(1, segments + 1)],
            text_of(solve.segment if solve else None) or "1")
        self._draw_messages()

    def _segments_of(self, name: str) -> int:
        for br in self.bw.site.branches:
            if text_of(br.name).strip().casefold() == name.strip().casefold():
                return len(br.segments)
        return 1

    def _draw_messages(self) -> None:
        outcome = self.bw.outcome
        given_msg = find_msg = ""
        if outcome is not None and outcome.error is not None:
            ref = locate(outcome.field)
            text = self.bw.error_words(outcome.error)
            if ref.area == "conditions" or ref.name == "measured_flow":
                given_msg = text
            elif ref.area == "tolerances":
                given_msg = f"{text}  (l to change)"
            elif ref.area == "solve":
                find_msg = text
        for ident, message in (("#given-message", given_msg), ("#find-message", find_msg)):
            box = self.query_one(ident, Static)
            put(box, f"✗ {message}" if message else "")
            if box.display != bool(message):
                box.display = bool(message)

    def _draw_results(self) -> None:
        app = self.bw
        outcome = app.outcome
        drawn = (outcome, app.good, app.unit_system, tuple(app.settings.display_units.items()),
                 app.latest_band, self.app.size.width >= 100)
        if getattr(self, "_drawn", None) == drawn:
            return  # the site changed but its answer has not arrived yet: nothing new to show
        self._drawn = drawn
        shown = outcome if outcome is not None and outcome.ok else app.good
        # Greyed only when the site has an error: a solve takes milliseconds, and greying the
        # table while it runs would only make it flicker as someone types.
        stale = outcome is not None and not outcome.ok and shown is not None
        self.query_one("#split-results").set_class(stale, "-stale")
        table = self.query_one("#results", TextTable)
        u = app.unit_text
        # Below 100 columns the share is a bare percentage, Re compact (180k) and each unit
        # under its heading, so that the losses stay on screen at 80×24, in US units too; the
        # table still scrolls sideways if names are long. The losses are the exports' own:
        # the pipe's (major), its fittings' (minor) and the valve's.
        wide = self.app.size.width >= 100
        sep = " " if wide else "\n"
        columns = [("Branch", False), (f"Flow{sep}{u('flow')}", True), ("Share", False),
                   (f"V{sep}{u('velocity')}", True), ("Re", True), ("f", True),
                   ("Regime" if wide else "Reg.", False),
                   *((f"{name}{sep}{u('head')}", True) for name in ("Major", "Minor", "Valve"))]
        totals = self.query_one("#totals", Static)
        solved = self.query_one("#solved", Static)
        warnings = self.query_one("#warnings", Static)
        if shown is None or shown.solved is None:
            table.show(columns, [])
            put(totals, "… solving" if outcome is None else "No answer yet: see the message "
                "above.", layout=False)
            put(solved, "", layout=False)
            if solved.display:
                solved.display = False
            self.warning_lines = self.screen_lines = []
            put(warnings, "")
            return
        result = shown.solved.result
        rows: list[list[str | Text]] = []
        for br in result.branches:
            for j, seg in enumerate(br.segments):
                first = j == 0
                rows.append([
                    br.name if first else f"  └ {'segment' if wide else 'seg.'} {j + 1}",
                    app.fmt(br.flow, "flow", unit=False) if first else "",
                    (share_bar(br.share, 6) if wide else _percent(br.share)) if first else "",
                    app.fmt(seg.velocity, "velocity", 3, unit=False),
                    f"{seg.reynolds:,.0f}" if wide else _compact(seg.reynolds),
                    f"{seg.friction_factor:.4f}",
                    REGIMES.get(seg.regime, seg.regime),
                    app.fmt(seg.major_loss, "head", 3, unit=False),
                    app.fmt(seg.minor_loss, "head", 3, unit=False),
                    app.fmt(br.valve_loss, "head", 3, unit=False)
                    if first and br.valve_loss else "",
                ])
        table.show(columns, rows)
        fluid = result.network.fluid
        put(totals,
            f"Total {app.fmt(result.total_flow, 'flow')}   "
            f"Δp {app.fmt(result.pressure_drop, 'pressure')}   "
            f"head loss {app.fmt(result.head_loss, 'head', 3)}\n{app.fluid_name(fluid)}: "
            f"{app.fmt(fluid.density, 'density')}, {app.fmt(fluid.viscosity, 'viscosity', 3)}",
            layout=False)  # always two lines: no new layout needed
        text = self._solved_text(shown)
        put(solved, text, layout=False)
        if solved.display != bool(text):
            solved.display = bool(text)
        lines = [f"⚠ {w.branch + ': ' if w.branch else ''}{app.say(w)}"
                 for w in result.warnings]
        lines += [f"• {app.say(note)}" for note in (*shown.solved.notes, *result.notes)]
        # The other readings against the answer first: on a walkdown they are the news.
        self.warning_lines = reading_lines(app, shown) + lines
        self.screen_lines = reading_lines(app, shown, short=not wide) + lines
        self._show_warnings(self._warning_room)
        self.call_after_refresh(self._fit_warnings)

    warning_lines: list[str] = []
    """The other readings against the answer, every warning and note of it (``w`` lists
    them); :attr:`screen_lines` the same, shorter below 100 columns, as many as fit."""
    screen_lines: list[str] = []
    _warning_room = MAX_WARNING_LINES

    def _show_warnings(self, room: int) -> None:
        lines = fit_lines(self.screen_lines, min(room, MAX_WARNING_LINES))
        warnings = self.query_one("#warnings", Static)
        put(warnings, "\n".join(lines))
        if warnings.display != bool(lines):
            warnings.display = bool(lines)

    def _fit_warnings(self) -> None:
        """After layout: give the warnings only the rows the table does not need, so that
        every branch row stays in sight (each warning is one line, cut at the edge)."""
        if not self.is_attached or not self.warning_lines:
            return
        shown = min(len(self.warning_lines), self._warning_room, MAX_WARNING_LINES)
        if self.view == "table":
            table = self.query_one("#results", TextTable)
            spare = table.scrollable_content_region.height - (len(table.rows) + table.header_lines)
        else:
            spare = 2 - shown  # the band and the curve take what is left: two lines
        room = max(1, min(MAX_WARNING_LINES, shown + spare))
        if room != self._warning_room:
            self._warning_room = room
            self._show_warnings(room)

    def _solved_text(self, shown: object) -> str:
        app = self.bw
        sr = shown.solved  # type: ignore[attr-defined]
        s = sr.result.solved
        if s is None:
            return ""
        kind = s.quantity
        text = (f"{kind.capitalize()} of {s.branch} for {app.fmt(s.target_flow, 'flow')}: "
                f"{app.fmt(s.value, kind)}")
        if sr.catalog is not None:
            c = sr.catalog
            text += (f"  → catalog size {c.size.label} (bore "
                     f"{app.fmt(c.size.inner_diameter_m, 'diameter')}) carries "
                     f"{app.fmt(c.flow, 'flow')}")
        return text

    # ---- keys ------------------------------------------------------------------------------------

    def action_focus(self, ident: str) -> None:
        widget = self.main_view() if ident == "results" else self.query_one(f"#{ident}")
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

    def action_warnings(self) -> None:
        from ..warnings import WarningsScreen

        self.app.push_screen(WarningsScreen(list(self.warning_lines)))

    def check_action(self, action: str, parameters: tuple[object, ...]) -> bool | None:
        if action == "export":
            outcome = self.bw.outcome
            return True if outcome is not None and outcome.ok else None
        if parameters in (("find-target",), ("find-branch",)):
            return True if find_of(self.bw.site) != "flows" else None
        if action == "focus" and parameters == ("results",):
            # Esc: shown (with Enter's meaning) while typing in a field, hidden otherwise.
            return self.focused is not None and self.focused is not self.main_view()
        return True

    def unavailable_reason(self, action: str, parameters: tuple[object, ...]) -> str:
        if action == "export":
            return "Nothing to write yet: the site does not solve (see the message above)."
        if action == "focus" and parameters == ("find-target",):
            return "No target flow while finding the flows: f chooses what to find."
        if action == "pick" and parameters == ("find-branch",):
            return "No branch to size while finding the flows: f chooses what to find."
        return ""


def _compact(number: float) -> str:
    """``180266`` → ``180k``, ``1234567`` → ``1.23M``: a Reynolds number in four cells or so."""
    if not number == number:  # NaN
        return "—"
    for scale, suffix in ((1e6, "M"), (1e3, "k")):
        if abs(number) >= scale:
            return f"{number / scale:.3g}{suffix}"
    return f"{number:.0f}"


def _percent(share: float) -> str:
    """A share of the total flow as ``53%`` or ``6.8%`` (a dash when there is none)."""
    if not share == share:  # NaN: no total flow
        return "—"
    percent = share * 100
    return f"{percent:.1f}%" if abs(percent) < 10 else f"{percent:.0f}%"


def _hidden(widget: Static) -> Static:
    widget.display = False
    return widget
