"""The branch form: one branch with all its series segments, fittings and valve.

Works on a copy of the branch; Enter moves to the next field and, on the last, applies it;
Escape leaves it unchanged. Each value is checked as it is typed (units, numbers, fitting
names, a value the branch needs), and its message shows right under the field; the whole site
is checked once the form is applied.
"""

from __future__ import annotations

import copy
import re
from collections.abc import Callable, Mapping

from textual.app import ComposeResult
from textual.binding import Binding
from textual.containers import Vertical, VerticalScroll
from textual.widgets import Label, Static
from textual.widgets.input import Selection

from branchwise.core.errors import InputError
from branchwise.core.site.spec import BranchSpec, SegmentSpec

from ...modal import Dialog
from ...state.values import text_of, with_unit
from ...widgets.field import Field
from ...workspace import workspace
from ..catalog import (
    CatalogPicker,
    fitting_choices,
    fitting_problem,
    material_choices,
    material_problem,
)
from ..dialogs import FORM_HINT, FORM_KEYS
from .cells import (
    same_pipe,
    set_k,
    set_size,
    set_tag,
    set_valve,
    set_wall,
    size_text,
    valve_problem,
    valve_text,
    wall_text,
)

SEGMENT_FIELDS = (
    ("size", "Size or bore", "diameter"),
    ("length", "Length", "length"),
    ("wall", "ε or material", "roughness"),
    ("k", "Extra K", None),
    ("fittings", "Fittings", None),
)
PLACEHOLDERS = {"size": "4 in sch 40, DN80 sch 40, ID 77.9 mm",
                "length": "e.g. 62 m, 180 ft",
                "wall": "0.045 mm, or a material (Ctrl+L)",
                "fittings": "elbow-90 4, gate-valve 2 (Ctrl+L)", "k": "e.g. 2.5 (a plain number)"}
"""What an empty field takes; short enough to show whole in the form at 80 columns."""
_ITEM = re.compile(r"\s*(?:(\d+(?:\.\d*)?)\s*[x×*]?\s*([a-z][a-z0-9-]*)|([a-z][a-z0-9-]*)"
                   r"\s*[=: ]?\s*(\d+(?:\.\d*)?)?)\s*\Z", re.I)


def parse_fittings(text: str, field: str = "fittings") -> dict[str, float]:
    """``elbow-90 4, gate-valve 2`` (or ``4 elbow-90``, ``elbow-90=4``; items apart by commas
    or semicolons, as a line list writes them) → {key: count}."""
    out: dict[str, float] = {}
    for item in filter(None, (part.strip() for part in re.split(r"[,;]", text))):
        m = _ITEM.match(item)
        if m is None:
            raise InputError(field, item, "write each fitting as 'key count', such as "
                             "'elbow-90 4'")
        key = (m.group(2) or m.group(3)).lower()
        count = float(m.group(1) or m.group(4) or 1)
        out[key] = out.get(key, 0.0) + count
    return out


def fittings_text(fittings: Mapping[str, object]) -> str:
    return ", ".join(f"{key} {text_of(count)}" for key, count in fittings.items())


class BranchForm(Dialog[BranchSpec | None]):
    """Edit one branch. ``unit`` gives the display unit of a kind of quantity."""

    BINDINGS = [
        Binding("escape", "cancel", "Cancel", id="form-cancel",
                tooltip="Close the form without changing the branch"),
        Binding("ctrl+n", "add_segment", "Add segment", id="form-add-segment",
                tooltip="Add a series segment after the one being edited"),
        Binding("ctrl+g", "remove_segment", "Remove segment", id="form-remove-segment",
                tooltip="Remove the segment being edited"),
        Binding("ctrl+l", "pick", "List", id="form-pick",
                tooltip="In the 'ε or material' field: every material, new and aged; in the "
                        "Fittings field: every fitting. Pick one with Enter"),
    ]
    CLOSE_HINT = FORM_HINT
    DEFAULT_CSS = """
    BranchForm { align: center middle; }
    BranchForm > Vertical {
        width: 90; max-width: 100%; height: 90%; border: thick $primary; background: $surface;
        padding: 0 1;
    }
    BranchForm .form-title { text-style: bold; }
    BranchForm .segment-title { margin-top: 1; color: $accent; text-style: bold; }
    BranchForm .form-keys { color: $text-muted; }
    BranchForm .form-note { color: $warning; }
    BranchForm .form-message { color: $error; }

    """

    def __init__(self, branch: BranchSpec, unit: Callable[[str], str],
                 title: str = "Branch", start: str = "name", segment: int = 0,
                 note: str = "") -> None:
        """start: the field the cursor starts in (a column key of the branch table: ``name``,
        ``size``, ``valve``…); segment: the segment of a segment's field; note: a line under
        the title (what a new branch was filled in from)."""
        super().__init__()
        self.note = note
        self.branch = copy.deepcopy(branch)
        self.unit = unit
        self.title_text = title
        self._focus_segment = segment
        self._start = start

    def compose(self) -> ComposeResult:
        br = self.branch
        with Vertical():
            yield Label(f"{self.title_text}: {text_of(br.name)}", classes="form-title",
                        markup=False)
            if self.note:
                yield Static(self.note, classes="form-note", markup=False)
            yield Static(f"{FORM_KEYS}\nCtrl+N: add a segment   Ctrl+G: remove this segment   "
                         "Ctrl+L: list materials or fittings", classes="form-keys",
                         markup=False)
            with VerticalScroll(id="form-fields"):
                yield Field("Name", "name", value=text_of(br.name), id="f-name")
                yield Field("Tag", "tag", value=text_of(br.tag), id="f-tag",
                            placeholder="line or valve tag, e.g. CHW-R-104")
                yield Field("Valve (Kv or Cv)", "valve", value=valve_text(br),
                            placeholder="Kv 160 or Cv 110; series: Kv 160 + 40", id="f-valve")
                yield Field("Note", "note", value=text_of(br.note), id="f-note")
                for j, seg in enumerate(br.segments):
                    yield Label(f"Segment {j + 1}", classes="segment-title")
                    for key, label, kind in SEGMENT_FIELDS:
                        yield Field(label, f"{j}.{key}", kind, value=self._seg_text(seg, key),
                                    id=f"f-{j}-{key}", placeholder=PLACEHOLDERS.get(key, ""))
            yield Static("", classes="form-message", markup=False)

    _typed_at_start: dict[str, str] | None = None
    """Each field's text as the form opened (to tell whether Esc would drop anything)."""
    _segments_changed = False

    def on_mount(self) -> None:
        if self._typed_at_start is None:
            self._typed_at_start = {f.path: f.text for f in self.query(Field)}
        for field in self.query(Field):
            if field.kind:
                field.set_unit(self.unit(field.kind))
        fields = {f.path: f for f in self.query(Field)}
        j = min(self._focus_segment, len(self.branch.segments) - 1)
        target = fields.get(self._start) or fields.get(f"{j}.{self._start}") or fields["name"]
        if self._rebuilding:  # a segment added or removed: its first field, scrolled to
            target = fields[f"{j}.size"]
            self.call_after_refresh(target.scroll_visible, top=True, animate=False)
        target.input.focus()
        if target.path == "name":  # typing replaces the name at once
            target.input.selection = Selection(0, len(target.text))

    @staticmethod
    def _seg_text(seg: SegmentSpec, key: str) -> str:
        return {"size": size_text(seg), "length": text_of(seg.length), "wall": wall_text(seg),
                "k": text_of(seg.minor_k), "fittings": fittings_text(seg.fittings)}[key]

    # ---- reading the fields back ----------------------------------------------------------------

    def collect(self) -> BranchSpec:
        """The branch as the fields now say (values checked by :meth:`check`)."""
        br = copy.deepcopy(self.branch)
        values = {f.path: f.text for f in self.query(Field)}
        br.name = values["name"].strip()
        set_tag(br, values["tag"])
        set_valve(br, values["valve"])
        br.note = values["note"].strip() or None
        for j, seg in enumerate(br.segments):
            set_size(seg, values[f"{j}.size"], self.unit("diameter"))
            seg.length = with_unit(values[f"{j}.length"], self.unit("length")) or None
            set_wall(seg, values[f"{j}.wall"], self.unit("roughness"))
            set_k(seg, values[f"{j}.k"])
            try:
                seg.fittings = dict(parse_fittings(values[f"{j}.fittings"]))
            except InputError:
                pass  # reported by check(); the fields keep what was typed
        return br

    def check(self, field: Field) -> str | None:
        """The message for ``field``'s text, or None when it reads well on its own."""
        from branchwise.core.units import parse_quantity

        text = field.text.strip()
        key = field.path.split(".")[-1]
        try:
            if key == "name" and not text:
                return "every branch needs a name"
            if key in ("size", "length") and not text:
                return ("required: a catalog size (4 in sch 40, DN80 sch 40) or the bore "
                        "(ID 77.9 mm)" if key == "size"
                        else "required: the pipe's length")
            if key == "wall" and not text and self._plain_bore(field):
                return "required for a bore: a roughness or a material"
            if key == "fittings" and text:
                for name in parse_fittings(text, "fittings"):
                    if (problem := fitting_problem(name)) is not None:
                        return problem
            if key == "wall" and text and (problem := material_problem(text)) is not None:
                return problem
            if key in ("length",) and text:
                if parse_quantity(text, "length", key, self.unit("length")) < 0:
                    return f"must not be negative, got {text}"
            if key == "size" and text:  # read as the site file reads it
                from branchwise.core.site.values import size_or_bore

                unit = self.unit("diameter")
                size_or_bore(with_unit(text, unit), key, unit)
            if key == "wall" and text and (text[0].isdigit() or text[0] == "."):
                parse_quantity(text, "roughness", key, self.unit("roughness"))
            if key == "valve" and text:
                return valve_problem(text)
            if key == "k" and text:
                from branchwise.core.units.numbers import plain_float

                k = plain_float(text)
                if not k >= 0 or k == float("inf"):
                    return f"must be a number of zero or more, got {text}"
        except InputError as exc:
            return workspace(self.app).reason_words(exc)
        except ValueError:
            return "must be a plain number"
        return None

    def _plain_bore(self, field: Field) -> bool:
        """True if the segment of ``field`` gives a bore (no catalog size, so no material)."""
        segment = field.path.split(".")[0]
        size = self.query_one(f"#f-{segment}-size", Field).text
        probe = SegmentSpec()
        try:
            set_size(probe, size, self.unit("diameter"))
        except InputError:
            return False
        return probe.diameter is not None

    def on_field_edited(self, event: Field.Edited) -> None:
        if not self._rebuilding:
            event.field.set_error(self.check(event.field))
            if event.field.path.endswith(".size"):  # a bore needs a roughness, a size not
                wall = self.query_one(f"#f-{event.field.path.split('.')[0]}-wall", Field)
                wall.set_error(self.check(wall))

    def on_field_done(self, event: Field.Done) -> None:
        """Enter: a field that reads wrong keeps the cursor, its message beside it; else
        the next field; on the last field the form applies."""
        # An Enter typed just before Ctrl+N/Ctrl+G can arrive while the fields are being
        # rebuilt (the branch already has its new segments, the fields not yet): the form
        # stays open on the new layout.
        if self._rebuilding:
            return
        message = self.check(event.field)
        event.field.set_error(message)
        if message is None and not self.next_field(event.field):
            self.apply()

    def apply(self) -> None:
        bad = [(f, m) for f in self.query(Field) if (m := self.check(f))]
        for field, message in bad:
            field.set_error(message)
        if bad:
            self.query_one(".form-message", Static).update(
                "Fix the marked fields, or Esc to leave the branch as it was.")
            bad[0][0].input.focus()
            return
        self.dismiss(self.collect())

    # ---- segments -------------------------------------------------------------------------------

    def _segment_in_focus(self) -> int:
        focused = self.focused
        for field in self.query(Field):
            if focused is not None and focused in field.query("Input"):
                head = field.path.split(".")[0]
                return int(head) if head.isdigit() else 0
        return 0

    _rebuilding = False
    """True while the fields are rebuilt for a segment added or removed."""

    async def action_add_segment(self) -> None:
        if self._rebuilding:
            return
        j = self._segment_in_focus()
        branch = self.collect()
        branch.segments.insert(j + 1, same_pipe(branch.segments[j]))
        await self._rebuild(branch, j + 1)

    async def action_remove_segment(self) -> None:
        if self._rebuilding:
            return
        if len(self.branch.segments) < 2:
            self.notify("A branch keeps at least one segment.", severity="warning")
            return
        j = self._segment_in_focus()
        branch = self.collect()
        branch.segments.pop(j)
        await self._rebuild(branch, max(0, j - 1))

    async def _rebuild(self, branch: BranchSpec, focus_segment: int) -> None:
        """Show ``branch`` (one more or one fewer segment) with the focus on a segment."""
        self._segments_changed = True
        self._rebuilding = True
        try:
            self.branch = branch
            self._focus_segment = focus_segment
            await self.recompose()
            self.on_mount()
        finally:
            self._rebuilding = False

    def action_pick(self) -> None:
        """Ctrl+L: every material (in the 'ε or material' field) or fitting (in Fittings)."""
        field = next((f for f in self.query(Field) if self.focused is f.input), None)
        what = field.path.split(".")[-1] if field is not None else ""
        if field is None or what not in ("wall", "fittings"):
            self.notify("Ctrl+L lists the materials in an 'ε or material' field and the "
                        "fittings in a Fittings field.", timeout=4)
            return
        if what == "wall":
            title, choices = "Materials: new, and aged where known", material_choices()
        else:
            title, choices = "Fittings (added to the list, one of each)", fitting_choices()

        def picked(value: str | None) -> None:
            if value is None:
                return
            if what == "wall":
                text = value
            else:
                counts = parse_fittings(field.text) if field.text.strip() and \
                    self.check(field) is None else {}
                counts[value] = counts.get(value, 0.0) + 1
                text = fittings_text(counts)
            field.show(text, force=True)
            field.set_error(self.check(field))
            field.input.focus()

        self.app.push_screen(CatalogPicker(title, choices, field.text.strip()), picked)

    def changed_fields(self) -> list[str]:
        """The labels of the fields typed into since the form opened (segments added or
        removed count as a change of their own)."""
        start = self._typed_at_start or {}
        changed = []
        for field in self.query(Field):
            if start.get(field.path, "") != field.text:
                head = field.path.split(".")[0]
                segment = f" (segment {int(head) + 1})" if head.isdigit() and len(
                    self.branch.segments) > 1 else ""
                changed.append(f"{field.label}{segment}")
        if self._segments_changed:
            changed.append("the segments")
        return changed

    def action_cancel(self) -> None:
        """Esc: leave at once when nothing was typed; else ask first, naming what would go."""
        from ..dialogs import ChoiceScreen

        changed = self.changed_fields()
        if not changed:
            self.dismiss(None)
            return
        valid = not any(self.check(f) for f in self.query(Field))
        choices = [("d", "drop", "Drop the changes")]
        if valid:
            choices.append(("k", "keep", "Keep them"))
        choices.append(("escape", "stay", "Go on editing"))
        names = ", ".join(changed[:6]) + (" …" if len(changed) > 6 else "")
        question = (f"You changed {names} of “{text_of(self.branch.name)}”. Leave the branch as "
                    "it was?" + ("" if valid else " (Some fields read wrong, so keeping needs a "
                                                  "fix first.)"))

        def answer(choice: str | None) -> None:
            if choice == "drop":
                self.dismiss(None)
            elif choice == "keep":
                self.apply()

        self.app.push_screen(ChoiceScreen("Drop the changes?", question, choices), answer)
