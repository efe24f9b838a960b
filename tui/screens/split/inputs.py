"""The Split screen's top rows: the given condition and what to find, as one widget.

Switching the given (Δp, total flow, one branch's reading) keeps every reading in the site and
names the one solved from in ``conditions.given`` (see :mod:`...state.givens`); a reading the
app filled in from the answer and nobody touched goes again when the given moves on. Switching
the find choice keeps the branch and target aside in the session (``parked``), so that
switching back brings them again. A value typed in a field goes into the site at once
(keystrokes in one field are one undo step). An error on one of these fields shows under its
row.
"""

from __future__ import annotations

from typing import TYPE_CHECKING

from textual.app import ComposeResult
from textual.containers import Horizontal, Vertical
from textual.widget import Widget
from textual.widgets import Input, Label, Static

from branchwise.core.finds import FINDS
from branchwise.core.givens import GIVENS
from branchwise.core.names import name_key
from branchwise.core.site.reconcile import ALL
from branchwise.core.site.spec import Site

from ...quiet import put, show_text
from ...state.givens import (
    ALL_WORDS,
    given_label,
    given_of,
    given_text,
    held,
    make_given,
    set_reading,
    weigh_all,
    weighs_all,
)
from ...state.marks import error_mark
from ...state.session import find_of, set_find
from ...state.values import branch_name, text_of, with_unit
from ...widgets.choice import Choice
from ...widgets.value_input import ValueInput
from ...workspace import workspace

if TYPE_CHECKING:
    from ...workspace import Workspace

GIVEN_PREFIX = "measured:"
"""A given-kind choice value ``measured:<index>``: the reading on that branch."""
FIELDS = ("given-value", "lift-value", "find-target")
"""The typing fields in Enter order (Enter in the last goes back to the first)."""
HEADER_GIVENS = [(g.label, g.key) for g in GIVENS.values() if not g.on_branch]
"""The readings taken at the header, as the list of givens offers them."""


class GivenFindRows(Vertical):
    """The given reading (its kind, value and the lift) and what to find (the flows, or a
    branch's diameter, length or roughness for a target flow), with their messages."""

    @property
    def bw(self) -> Workspace:
        return workspace(self.app)

    def compose(self) -> ComposeResult:
        seeking = find_of(self.bw.site) != "flows"
        with Horizontal(classes="row"):
            yield Label("Given", classes="row-label")
            yield Choice(HEADER_GIVENS, id="given-kind")
            yield _field("given-value")
            yield Label("", id="given-unit", classes="unit", markup=False)
            yield Label("lift", id="lift-label")
            yield _field("lift-value", placeholder="0",
                         tooltip="Elevation change, outlet minus inlet (z_out − z_in)")
            yield Label("", id="lift-unit", classes="unit", markup=False)
        yield _hidden(Static("", id="given-message", classes="message", markup=False))
        with Horizontal(classes="row", id="find-row"):
            yield Label("Find", classes="row-label")
            yield Choice([(f.label, f.key) for f in FINDS.values()], "flows", id="find-kind")
            if seeking:  # otherwise built when first needed (:func:`_find_parts`)
                yield from _find_parts()
        yield _hidden(Static("", id="find-message", classes="message", markup=False))

    # ---- drawing ---------------------------------------------------------------------------

    def show(self) -> None:
        """Show the site's given and find, and an error on either."""
        app, site = self.bw, self.bw.site
        kind, index = given_of(site)
        weighing = weighs_all(site)
        options = list(HEADER_GIVENS)
        options += [(given_label(site, "measured_flow", i), f"{GIVEN_PREFIX}{i}")
                    for i in range(len(site.branches))]
        if weighing or len(held(site)) >= 2:
            options.append((ALL_WORDS[0].upper() + ALL_WORDS[1:], ALL))
        value = ALL if weighing else (kind if not GIVENS[kind].on_branch
                                      else f"{GIVEN_PREFIX}{index}")
        self.query_one("#given-kind", Choice).set_options(options, value)
        for ident in ("#given-value", "#given-unit"):  # no one value when all are weighed
            box = self.query_one(ident)
            if box.display == weighing:
                box.display = not weighing
        given_box = self.query_one("#given-value", Input)
        show_text(given_box, given_text(site))
        now = "" if weighing else self._current(kind, index, digits=4)
        # the answer's figure (its unit is beside the field), short enough for 80 columns
        given_box.placeholder = f"answer now {now.split()[0]}" if now else "the reading"
        put(self.query_one("#given-unit", Label), f"[{app.unit_text(GIVENS[kind].quantity)}]")
        show_text(self.query_one("#lift-value", Input),
                  text_of(site.conditions.elevation_change))
        put(self.query_one("#lift-unit", Label), f"[{app.unit_text('head')}]")

        find = find_of(site)
        self.query_one("#find-kind", Choice).value = find
        if not self.query("#find-branch"):
            if find == "flows":
                self._show_messages()
                return  # the row's other parts are not built until a find needs them
            self.query_one("#find-row", Horizontal).mount(*_find_parts(), after="#find-kind")
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
        self._show_messages()

    def _segments_of(self, name: str) -> int:
        for br in self.bw.site.branches:
            if name_key(text_of(br.name)) == name_key(name):
                return len(br.segments)
        return 1

    def _show_messages(self) -> None:
        outcome = self.bw.outcome
        given_msg = find_msg = ""
        if outcome is not None and outcome.error is not None:
            from branchwise.core.site.fields import FieldPath  # loaded with the first answer

            path = FieldPath.parse(outcome.field)
            text = self.bw.error_words(outcome.error)
            if path.area == "conditions" or path.name == "measured_flow":
                given_msg = text
            elif path.area == "tolerances":
                given_msg = f"{text}  (l to change)"
            elif path.area == "solve":
                find_msg = text
        for ident, message in (("#given-message", given_msg), ("#find-message", find_msg)):
            box = self.query_one(ident, Static)
            mark = error_mark(outcome.error if outcome is not None else None, self.bw.site)
            put(box, f"{mark} {message}" if message else "")
            if box.display != bool(message):
                box.display = bool(message)

    # ---- edits -----------------------------------------------------------------------------

    def on_choice_changed(self, event: Choice.Changed) -> None:
        event.stop()
        ident = event.choice.id
        if ident == "given-kind":
            self._switch_given(str(event.value))
        elif ident == "find-kind":
            self._switch_find(str(event.value))
        elif ident == "find-branch":
            name = str(event.value)
            site = self.bw.site
            old = text_of(site.solve.branch if site.solve else None)
            if name != old:
                # A target still as filled in for the old branch follows to the new one
                # (its present flow); a target the person typed stays.
                names = [branch_name(site, i) for i in range(len(site.branches))]
                target = text_of(site.solve.target_flow if site.solve else None)
                if old in names and target == self._current("measured_flow", names.index(old),
                                                             down=True):
                    target = self._current("measured_flow", names.index(name), down=True)
                self.bw.edit(f"Find on {name}", lambda s: set_find(
                    s, find_of(s), branch=name, segment=1, target=target or None))
        elif ident == "find-segment":
            seg = int(str(event.value))
            self.bw.edit(f"Segment {seg}", lambda s: set_find(s, find_of(s), segment=seg))

    def on_input_changed(self, event: Input.Changed) -> None:
        event.stop()
        if not getattr(self.screen, "ready", False):
            return
        app = self.bw
        if event.input.id == "given-value":
            kind, index = given_of(app.site)
            unit = app.unit("pressure" if kind == "pressure_drop" else "flow")
            text = with_unit(event.value, unit)

            def retype(s: Site) -> None:  # that reading only: the others stay as they are
                set_reading(s, kind, text, index)
                make_given(s, kind, index)

            app.edit("Given value", retype, key="given")
        elif event.input.id == "lift-value":
            lift_text = with_unit(event.value, app.unit("head")) or None

            def lift(s: Site) -> None:
                s.conditions.elevation_change = lift_text

            app.edit("Lift", lift, key="lift")
        elif event.input.id == "find-target":
            text = with_unit(event.value, app.unit("flow"))
            app.edit("Target flow", lambda s: set_find(s, find_of(s), target=text),
                     key="target")

    def on_input_submitted(self, event: Input.Submitted) -> None:
        """Enter keeps the value (it is in the site already) and goes to the next field, as
        in a form: the focus stays in a field, so that letters typed next are not keys."""
        event.stop()
        fields = [box for ident in FIELDS for box in self.query(f"#{ident}").results(Input)]
        shown = [box for box in fields if box.display]
        if event.input in shown:
            shown[(shown.index(event.input) + 1) % len(shown)].focus()

    def _switch_given(self, value: str) -> None:
        app = self.bw
        site = app.site
        if value == ALL:
            if not weighs_all(site):
                app.edit("Given: all readings, weighed", weigh_all)
            return
        new_kind, new_index = ("measured_flow", int(value[len(GIVEN_PREFIX):])) \
            if value.startswith(GIVEN_PREFIX) else (value, None)
        old_kind, old_index = given_of(site)
        if (new_kind, new_index) == (old_kind, old_index) and not weighs_all(site):
            return
        # The new given keeps the value read for it, or waits for one: the answer is never
        # written in as a reading (it would be weighed and saved as if someone had read it).

        def change(s: Site) -> None:
            make_given(s, new_kind, new_index)

        label = ("the reading on " + branch_name(site, new_index) if new_index is not None
                 else new_kind.replace("_", " "))
        app.edit(f"Given: {label}", change)
        if not given_text(app.site):  # it waits for its reading: type it now
            self.query_one("#given-value", Input).focus()
        # (a reading already there keeps the keys as commands: v goes in to change it, and
        # a letter meant as a key never replaces the reading)

    def _current(self, kind: str, index: int | None, *, down: bool = False,
                 digits: int | None = None) -> str:
        """The present answer's value of a quantity about to become the given or the target
        (or ''), to :data:`CARRIED_DIGITS` figures so the answer stays the same; ``down``
        rounds toward zero (a target flow never above what the branch carries)."""
        good = self.bw.good
        if good is None or good.solved is None:
            return ""
        result = good.solved.result
        if kind == "pressure_drop":
            value, what = result.pressure_drop, "pressure"
        elif kind == "total_flow":
            value, what = result.total_flow, "flow"
        elif index is not None and index < len(result.branches):
            value, what = result.branches[index].flow, "flow"
        else:
            return ""
        return carried_text(value, what, self.bw.unit(what), down=down,
                            digits=digits or (TARGET_DIGITS if down else CARRIED_DIGITS))

    def _switch_find(self, find: str) -> None:
        app = self.bw
        site = app.site
        if find == find_of(site):
            return
        parked = app.session.parked
        if find == "flows":
            # The sizing question stays in the site (and its file) beside find = "flows", so
            # that it comes back when a diameter, length or roughness is sought again.
            app.edit("Find the flows", lambda s: set_find(s, "flows"))
            return
        solve = site.solve
        branch = text_of(solve.branch if solve else None) or parked.get("solve.branch", "")
        names = [branch_name(site, i) for i in range(len(site.branches))]
        if branch not in names:
            kind, index = given_of(site)
            candidates = [n for i, n in enumerate(names) if i != index] or names
            branch = candidates[0] if candidates else ""
        # The flow it carries now, rounded down: the installed size (or length, roughness)
        # comes back, not the next size up for a hair more flow than the branch carries.
        target = text_of(solve.target_flow if solve else None) or parked.get(
            "solve.target_flow", "") or self._current("measured_flow", names.index(branch)
                                                      if branch in names else None, down=True)
        app.edit(f"Find the {find}", lambda s: set_find(s, find, branch, target))
        self.query_one("#find-target", Input).focus()


CARRIED_DIGITS = 7
"""Significant figures of a value carried from the answer into a field: enough that the answer
does not move (a 4-figure flow as the target of a found diameter lands a hair off the installed
bore), few enough to read."""


TARGET_DIGITS = 4
"""Significant figures of a target flow filled in from the answer: those the results show (a
target reads as the flow on screen, not 2.437927 L/s); rounded down, the installed size still
comes back as the next catalog size."""


def carried_text(value_si: float, kind: str, unit: str, *, down: bool = False,
                 digits: int = CARRIED_DIGITS) -> str:
    """``value_si`` as field text in ``unit`` to ``digits`` significant figures; ``down``
    rounds toward zero."""
    import math

    from branchwise.core.units import format_number, to_unit

    value = to_unit(value_si, kind, unit)
    if down and value and math.isfinite(value):
        step = 10.0 ** (math.floor(math.log10(abs(value))) - digits + 1)
        value = math.copysign(math.floor(abs(value) / step) * step, value)
    return f"{format_number(value, digits)} {unit}"


def _find_parts() -> tuple[Widget, ...]:
    """The find row past its choice: of which branch, for which target flow, which segment
    (shown only while a diameter, length or roughness is found)."""
    return (Label(" of ", classes="find-part"),
            Choice([], id="find-branch", prompt="branch", classes="find-part"),
            Label(" for ", classes="find-part"),
            _field("find-target", placeholder="flow", classes="find-part"),
            Choice([], id="find-segment", prompt="segment", classes="find-part"))


def _field(ident: str, *, placeholder: str = "", tooltip: str | None = None,
           classes: str = "") -> Input:
    """A compact typing field. It starts with the class Textual gives a field that is valid
    (it has no validators), so that setting it as the value arrives is no change: otherwise
    that restyles the field and its four parts once more as the screen is built."""
    return ValueInput(id=ident, compact=True, placeholder=placeholder, tooltip=tooltip,
                      classes=f"{classes} -valid".strip())


def _hidden(widget: Static) -> Static:
    widget.display = False
    return widget
