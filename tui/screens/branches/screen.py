"""The Branches screen: every branch between the two headers, one row per series segment.

Cells are edited in place (Enter opens a one-line editor under the table) or in the branch form
(``e``). Branches are added, copied, removed (undo brings them back) and reordered. A reading
typed in a branch's Reading cell is kept beside the given (the Split screen compares it with
the answer; ``g`` there makes it the given); the cell of the given reading says so. The Flow
column is the present answer.
"""

from __future__ import annotations

from pathlib import Path

from rich.text import Text
from textual.app import ComposeResult
from textual.binding import Binding
from textual.containers import Vertical
from textual.widgets import DataTable, Input, Static

from branchwise.core.names import name_key
from branchwise.core.site.fields import FieldPath
from branchwise.core.site.spec import BranchSpec, Site

from ...quiet import put
from ...state.givens import (
    add_reading,
    clear_reading,
    given_of,
    remove_branch,
    weighs_all,
)
from ...state.marks import error_mark
from ...state.session import new_branch, rename_branch
from ...state.values import branch_name, text_of, with_unit
from ...theme import colour
from ...widgets.branchtable import BranchTable
from ..work_screen import WorkScreen
from .cell_editor import CellEditor
from .cells import (
    BRANCH_COLUMNS,
    COLUMNS,
    FIELD_COLUMNS,
    UNIT_KINDS,
    WIDE_COLUMNS,
    cell_text,
    edit_text,
    flow_cells,
    same_pipe,
    setter,
)
from .hints import reading_hint, reads_as_flow
from .understood import understood_lines

WIDE = 100
"""From this many terminal columns on, the table also shows the :data:`WIDE_COLUMNS` (the tag)."""


class BranchesScreen(WorkScreen):
    """The branch table and its cell editor."""

    AUTO_FOCUS = "#branch-table"
    CSS_PATH = Path(__file__).parent / "branches.tcss"
    HINT_KEYS = (("m", "reading"), ("e", "form"))
    # Until the first draw (keys typed ahead can ask check_action before on_mount runs):
    _rows: list[tuple[int, int]] = []
    _keys: list[str] = [key for key, _ in COLUMNS if key not in WIDE_COLUMNS]
    """The keys of the columns shown, in order."""
    _editing: tuple[int, int, str] | None = None
    _editing_revision = 0

    BINDINGS = [
        Binding("enter", "edit_cell", "Edit", id="branches-edit",
                tooltip="Edit the highlighted cell in place"),
        Binding("e", "form", "Form", id="branches-form",
                tooltip="Edit the whole branch and its segments in a form"),
        Binding("a", "add", "Add", id="branches-add", tooltip="Add a branch"),
        Binding("c", "copy", "Copy", id="branches-copy",
                tooltip="Add a copy of the highlighted branch"),
        Binding("delete", "remove", "Remove", id="branches-remove",
                tooltip="Remove the highlighted branch (or segment); Ctrl+Z brings it back"),
        Binding("s", "add_segment", "Segment", id="branches-segment", show=False,
                tooltip="Add a series segment after the highlighted one"),
        Binding("shift+up,left_square_bracket", "move(-1)", "Up", id="branches-up",
                show=False, tooltip="Move the branch up"),
        Binding("shift+down,right_square_bracket", "move(1)", "Down", id="branches-down",
                show=False, tooltip="Move the branch down"),
        Binding("m", "edit_cell('reading')", "Reading", id="branches-reading", show=False,
                tooltip="Type a measured flow for the branch: kept beside the given"),
        Binding("escape", "cancel_edit", "Cancel", id="branches-cancel", show=False,
                tooltip="Close the cell editor without changing the cell"),
    ]

    def body(self) -> ComposeResult:
        with Vertical(id="branches"):
            table = BranchTable(id="branch-table", cursor_type="cell", zebra_stripes=True)
            table.fixed_columns = 1  # the names stay in sight as → scrolls to the valve
            yield table
            yield Static("", id="branch-understood", markup=False)
            yield Static("", id="branch-message", classes="message", markup=False)
            yield CellEditor(id="cell-editor")  # while a cell is edited: says so

    def on_mount(self) -> None:
        self._rows = []
        self._editing = None
        super().on_mount()

    # ---- drawing ---------------------------------------------------------------------------------

    def redraw(self) -> None:
        app, site = self.bw, self.bw.site
        if self._editing is not None and app.session.revision != self._editing_revision:
            self._close_editor()  # an undo or redo under the editor: its cell may be gone
            self.notify("The site changed while you typed (undo or redo): the cell was closed, "
                       "nothing written.", severity="warning")
        table = self.query_one("#branch-table", BranchTable)
        wide = self.app.size.width >= WIDE
        self._keys = [key for key, _ in COLUMNS if wide or key not in WIDE_COLUMNS]
        columns = []
        for key, label in COLUMNS:
            if key not in self._keys:
                continue
            unit = f" {app.unit_text(UNIT_KINDS[key])}" if key in UNIT_KINDS else ""
            columns.append((key, f"{label}{unit}"))
        outcome = app.outcome
        bad = (FieldPath.parse(outcome.field) if outcome is not None and outcome.error
               else None)
        wrong_style = f"bold reverse {colour(self.app, 'text-error')}".strip()
        bad_column = FIELD_COLUMNS.get(bad.name, "name") if bad and bad.area == "branches" \
            else None
        flows = flow_cells(app)
        stale = outcome is not None and outcome.error is not None  # the last good answer's
        given = given_of(site) if not weighs_all(site) else ("all", None)
        self._rows = []
        rows: list[tuple[str, list[object]]] = []
        for i, br in enumerate(site.branches):
            for j, seg in enumerate(br.segments):
                cells: list[object] = []
                for key in self._keys:
                    if j > 0 and key in BRANCH_COLUMNS:
                        text = f"  └ {j + 1}" if key == "name" else ""
                    elif key == "flow":
                        text = flows.get(i, "") if j == 0 else ""
                    elif key == "reading" and given == ("measured_flow", i):
                        text = f"{cell_text(br, seg, key)} ◂ given"
                    else:
                        text = cell_text(br, seg, key)
                    wrong = (bad is not None and bad.branch == i and key == bad_column
                             and (bad.segment or 0) == j)
                    cells.append(Text(text or "?", style=wrong_style) if wrong
                                 else Text(text, justify="right", style="dim" if stale else "")
                                 if key == "flow" else Text(text, justify="left"))
                rows.append((f"{i}.{j}", cells))
                self._rows.append((i, j))
        table.show(columns, rows)
        self._show_understood()
        message = self.query_one("#branch-message", Static)
        message.set_class(bad is None, "-hint")
        if bad is not None and outcome is not None and outcome.error is not None:
            put(message, f"{error_mark(outcome.error, site)} {app.error_words(outcome.error)}")
        else:
            put(message, reading_hint(site, given))

    def _show_understood(self) -> None:
        """The highlighted row as the core read it (bore, ε, ΣK, Kv; :mod:`.understood`)."""
        spot = self.here()
        outcome = self.bw.outcome
        built = outcome.built if outcome is not None else None
        lines = understood_lines(self.bw, self.bw.site, built, *spot[:2]) if spot else []
        put(self.query_one("#branch-understood", Static), "\n".join(lines))

    def on_data_table_cell_highlighted(self, event: DataTable.CellHighlighted) -> None:
        self._show_understood()

    def on_resize(self) -> None:
        # The tag column comes and goes as the terminal crosses WIDE columns.
        if (self.app.size.width >= WIDE) != (len(self._keys) == len(COLUMNS)):
            self.redraw()

    def here(self) -> tuple[int, int, str] | None:
        """(branch, segment, column key) under the cursor, or None for an empty table."""
        table = self.query_one("#branch-table", DataTable)
        if not self._rows:
            return None
        row = min(table.cursor_row, len(self._rows) - 1)
        i, j = self._rows[row]
        return i, j, self._keys[min(table.cursor_column, len(self._keys) - 1)]

    def _go(self, branch: int, segment: int = 0) -> None:
        """Put the cursor on a branch's row after the next redraw."""
        def move() -> None:
            if (branch, segment) in self._rows:
                table = self.query_one("#branch-table", DataTable)
                table.move_cursor(row=self._rows.index((branch, segment)), animate=False)
        self.call_after_refresh(move)

    # ---- in-place editing ------------------------------------------------------------------------

    def on_data_table_cell_selected(self, event: DataTable.CellSelected) -> None:
        event.stop()
        self.action_edit_cell()

    def action_edit_cell(self, column: str | None = None) -> None:
        spot = self.here()
        if spot is None:
            return
        i, j, key = spot
        key = column or key
        if key == "flow":
            self.notify("The flow is worked out. To fix this branch's flow, type a Reading "
                        "(m); to size it for a flow, use Find on the Split screen (F4).",
                        timeout=6)
            return
        if j > 0 and key in BRANCH_COLUMNS:
            j = 0
        if column is not None and column in self._keys:  # a key for a column: go there, so
            # that the cell edited is in sight (the table may be scrolled past it)
            self.query_one("#branch-table", DataTable).move_cursor(
                column=self._keys.index(column))
        br = self.bw.site.branches[i]
        seg = br.segments[j]
        label = dict(COLUMNS)[key]
        unit = f" [{self.bw.unit_text(UNIT_KINDS[key])}]" if key in UNIT_KINDS else ""
        where = branch_name(self.bw.site, i) + (f" segment {j + 1}" if len(br.segments) > 1
                                                and key not in BRANCH_COLUMNS else "")
        self._editing = (i, j, key)
        self._editing_revision = self.bw.session.revision
        doing = f"Renaming {where}" if key == "name" else f"Editing {where} · {label}"
        self.query_one("#branches").add_class("-editing")  # marks the cell, hides the key hint
        self.query_one(CellEditor).open(
            doing, f"{'Name' if key == 'name' else label}{unit}",
            edit_text(br, seg, key) if key != "name" else text_of(br.name))

    def on_input_submitted(self, event: Input.Submitted) -> None:
        if event.input.id != "cell-input" or self._editing is None:
            return
        event.stop()
        i, j, key = self._editing
        self._close_editor()
        self.commit(i, j, key, event.value)

    def action_cancel_edit(self) -> None:
        self._close_editor()

    def _close_editor(self) -> None:
        self._editing = None
        self.query_one(CellEditor).close()
        self.query_one("#branches").remove_class("-editing")
        self.query_one("#branch-table", DataTable).focus()

    def commit(self, i: int, j: int, key: str, text: str) -> None:
        """Write a typed cell into the site."""
        app = self.bw
        site = app.site
        name = branch_name(site, i)
        if key == "name":
            new = text.strip()
            if new and new != text_of(site.branches[i].name):
                app.edit(f"Rename {name}", lambda s: rename_branch(s, i, new))
            return
        if key == "reading":
            self._set_reading(i, text)
            return
        write = setter(key, app.unit)
        if write is None:
            return

        def change(s: Site) -> None:
            br = s.branches[i]
            write(br, br.segments[j], text)

        app.edit(f"{name} {dict(COLUMNS)[key].lower()}", change)

    def _set_reading(self, i: int, text: str) -> None:
        app = self.bw
        name = branch_name(app.site, i)
        value = with_unit(text, app.unit("flow"))
        if value:
            app.edit(f"Reading on {name}", lambda s: add_reading(s, i, value))
            if not reads_as_flow(value):
                return  # the error is said beside the field: no word that it was kept
            if given_of(app.site) == ("measured_flow", i) and not weighs_all(app.site):
                self.notify(f"The reading on {name} is the given condition.", timeout=4)
            else:
                self.notify(f"Reading on {name} kept beside the given: the Split screen (F4) "
                           "compares it with the answer; g there makes it the given.",
                           timeout=5)
        elif app.site.branches[i].measured_flow is not None:
            app.edit(f"Clear the reading on {name}",
                     lambda s: clear_reading(s, "measured_flow", i))

    # ---- branch actions --------------------------------------------------------------------------

    def action_add(self) -> None:
        from .form import BranchForm

        spot = self.here()
        site = self.bw.site
        like = site.branches[spot[0]] if spot else None
        draft = new_branch(site)
        note = ""
        if like is not None and spot is not None:  # the highlighted pipe, not its length
            draft.segments = [same_pipe(like.segments[0])]
            note = (f"Size and wall copied from {branch_name(site, spot[0])} (the highlighted "
                    "branch): change them, or clear them, for another pipe.")
        at = (spot[0] + 1) if spot else len(site.branches)

        def added(branch: BranchSpec | None) -> None:
            if branch is None:
                return
            self.bw.edit(f"Add {text_of(branch.name)}", lambda s: s.branches.insert(at, branch))
            self._go(at)

        self.app.push_screen(BranchForm(draft, self.bw.unit, title="New branch", note=note),
                             added)

    def action_form(self) -> None:
        from .form import BranchForm

        spot = self.here()
        if spot is None:
            return
        i, j, column = spot
        site = self.bw.site
        old_name = text_of(site.branches[i].name)

        def done(branch: BranchSpec | None) -> None:
            if branch is None:
                return

            def change(s: Site) -> None:
                new_name = text_of(branch.name)
                s.branches[i] = branch
                if new_name != old_name:
                    branch.name = old_name
                    rename_branch(s, i, new_name)

            self.bw.edit(f"Edit {old_name}", change)

        self.app.push_screen(BranchForm(site.branches[i], self.bw.unit, start=column,
                                        segment=j), done)

    def action_copy(self) -> None:
        spot = self.here()
        if spot is None:
            return
        i = spot[0]
        like = self.bw.site.branches[i]
        copy = new_branch(self.bw.site, like)
        self.bw.edit(f"Copy {branch_name(self.bw.site, i)}",
                     lambda s: s.branches.insert(i + 1, copy))
        self._go(i + 1)
        left = [w for w, v in (("tag", like.tag), ("reading", like.measured_flow)) if v]
        if left:
            self.notify(f"Copied as '{copy.name}', without the {' and '.join(left)} (they "
                        "belong to the line copied).", timeout=4)

    def action_remove(self) -> None:
        spot = self.here()
        if spot is None:
            return
        i, j, _ = spot
        site = self.bw.site
        name = branch_name(site, i)
        if j > 0:
            self.bw.edit(f"Remove segment {j + 1} of {name}",
                         lambda s: s.branches[i].segments.pop(j))
            self.notify(f"Removed segment {j + 1} of {name}. Ctrl+Z brings it back.")
            return
        if len(site.branches[i].segments) > 1:
            self.notify(f"{name} has {len(site.branches[i].segments)} segments: removing "
                        "the whole branch.", timeout=4)

        def change(s: Site) -> None:
            remove_branch(s, i)  # its reading too: the given moves on if it was that one
            if s.solve is not None and name_key(text_of(s.solve.branch)) == name_key(name):
                s.solve = None

        read_in = [text_of(v.date) for v in site.visits
                   if name_key(name) in {name_key(str(k)) for k in v.measured}]
        self.bw.edit(f"Remove {name}", change)
        if read_in:
            self.notify(f"Removed {name}. Earlier visits read it ({', '.join(read_in)}): "
                        "those readings now name no branch, and the history (F5) says so "
                        "until it is back. Ctrl+Z brings it back.", severity="warning",
                        timeout=10)
        else:
            self.notify(f"Removed {name}. Ctrl+Z brings it back.", timeout=5)

    def action_add_segment(self) -> None:
        spot = self.here()
        if spot is None:
            return
        i, j, _ = spot
        site = self.bw.site
        fresh = same_pipe(site.branches[i].segments[j])
        self.bw.edit(f"Add a segment to {branch_name(site, i)}",
                     lambda s: s.branches[i].segments.insert(j + 1, fresh))
        self._go(i, j + 1)
        self.call_after_refresh(lambda: self.action_edit_cell("length"))

    def action_move(self, step: int) -> None:
        spot = self.here()
        if spot is None:
            return
        i = spot[0]
        k = i + step
        if not 0 <= k < len(self.bw.site.branches):
            return

        def change(s: Site) -> None:
            s.branches[i], s.branches[k] = s.branches[k], s.branches[i]

        self.bw.edit(f"Move {branch_name(self.bw.site, i)}", change)
        self._go(k)

    def check_action(self, action: str, parameters: tuple[object, ...]) -> bool | None:
        if action == "cancel_edit":
            return True if self._editing is not None else None
        if action in ("edit_cell", "form", "copy", "remove", "add_segment", "move"):
            return True if self.bw.site.branches else None
        return True

