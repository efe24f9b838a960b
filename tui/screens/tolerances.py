"""The ± limits behind the uncertainty band: see every one in use, and change the main ones.

Each field shows the site's own value where its ``[tolerances]`` table has one; an empty field
takes the common-practice default, shown greyed and marked so (no standard fixes these). Enter
moves to the next field, as in every form; on the last field it keeps: the values are checked
with the core's own reader of the table and a new
:class:`~branchwise.core.site.read.TolerancesSpec` goes back; the screen that asked puts it into
the site as one undoable edit, and it is saved with the site.
"""

from __future__ import annotations

import copy
from typing import TYPE_CHECKING

from textual.app import ComposeResult
from textual.binding import Binding
from textual.containers import Vertical
from textual.widgets import Label, Static

from branchwise.core.errors import InputError
from branchwise.core.site.spec import TolerancesSpec, Value

from ..modal import Dialog
from ..state.values import text_of, with_unit
from ..widgets.field import Field
from ..workspace import workspace
from .dialogs import FORM_HINT, FORM_KEYS

if TYPE_CHECKING:
    from branchwise.core.site.spec import Site

PERCENT = ("gauge_accuracy", "flow_meter_accuracy", "total_flow_meter_accuracy", "diameter",
           "length", "fitting_k", "valve_kv")
ROWS = (
    # site key, label, what a bare number means
    ("gauge_accuracy", "Gauge accuracy", "% of full scale"),
    ("gauge_full_scale", "Gauge full scale", ""),
    ("flow_meter_accuracy", "Flow meter", "% of reading"),
    ("total_flow_meter_accuracy", "Total-flow meter", "% of reading"),
    ("roughness_low", "Roughness × from", "× table ε"),
    ("roughness_high", "Roughness × to", "× table ε"),
    ("diameter", "Bore diameter ±", "%"),
    ("length", "Length ±", "%"),
    ("temperature", "Temperature ±", "K"),
    ("fitting_k", "Fitting K ±", "%"),
    ("valve_kv", "Valve Kv/Cv ±", "%"),
    ("target_flow_measured", "Target flow is", "reading/design"),
)
NO_FIGURE = frozenset({"gauge_full_scale", "total_flow_meter_accuracy", "target_flow_measured"})
"""Rows whose default is no common-practice figure: none at all (the gauge's full scale),
another row's value (the total-flow meter's), or a choice (a found unknown's target flow, a
reading or a design figure): their hint says only that, and fits at 80×24."""
TARGET_WORDS = {True: "reading", False: "design"}
"""How the form writes ``target_flow_measured``: a reading (drawn with the flow meter's
tolerance in the band of a found unknown) or a design figure (not drawn)."""
INTRO = ("± limits on the readings and the records: they set the band (b) and weigh the "
         "readings against each other. Grey values are common practice, not a standard: type "
         "the site's own to replace them.")


def defaults() -> dict[str, str]:
    """The common-practice default of every row, as text (from the core's Tolerances)."""
    from branchwise.core.numerics.uncertainty import Tolerances

    d = Tolerances()
    return {
        "gauge_accuracy": f"{d.gauge_percent:g} %",
        "gauge_full_scale": "none: % of the reading",
        "flow_meter_accuracy": f"{d.flow_meter_percent:g} %",
        "total_flow_meter_accuracy": "as the flow meter",
        "roughness_low": f"{d.roughness_factor[0]:g}",
        "roughness_high": f"{d.roughness_factor[1]:g}",
        "diameter": f"{d.diameter_percent:g} %",
        "length": f"{d.length_percent:g} %",
        "temperature": f"{d.temperature_k:g} K",
        "fitting_k": f"{d.fitting_k_percent:g} %",
        "valve_kv": f"{d.valve_kv_percent:g} %",
        "target_flow_measured": f"a {TARGET_WORDS[d.target_flow_measured]}: drawn as the meter",
    }


class TolerancesScreen(Dialog[TolerancesSpec | None]):
    """The form; dismisses with the new table (None: cancelled, or nothing changed).

    site: the site as it is now (its table, and the readings a tolerance is checked against,
    such as a gauge's full scale against the pressure drop read on it); pressure_unit: the
    unit a bare full-scale number takes.
    """

    BINDINGS = [
        Binding("escape", "cancel", "Cancel", id="tolerances-cancel"),
    ]
    CLOSE_HINT = FORM_HINT
    DEFAULT_CSS = """
    TolerancesScreen { align: center middle; }
    TolerancesScreen > Vertical {
        width: 78; max-width: 100%; height: auto; max-height: 100%; border: thick $primary;
        background: $surface; padding: 0 1;
    }
    TolerancesScreen .tol-rows { height: auto; }
    TolerancesScreen .tol-title { text-style: bold; }
    TolerancesScreen .tol-intro, TolerancesScreen .tol-kept { color: $text-muted; }
    TolerancesScreen Field .field-label { width: 18; }
    TolerancesScreen Field .field-unit { width: 18; }
    TolerancesScreen Field .field-message { padding-left: 18; }
    TolerancesScreen .tol-message { color: $error; }
    """

    def __init__(self, site: Site, pressure_unit: str) -> None:
        super().__init__()
        self.site = site
        self.spec = site.tolerances
        self.pressure_unit = pressure_unit

    def compose(self) -> ComposeResult:
        from branchwise.core.units import unit_label

        spec = self.spec or TolerancesSpec()
        pair = spec.roughness_factor or [None, None]
        typed = {key: text_of(getattr(spec, key, None)) for key, _, _ in ROWS}
        typed["roughness_low"], typed["roughness_high"] = (text_of(v) for v in (pair + [None])[:2])
        measured = spec.target_flow_measured
        typed["target_flow_measured"] = (TARGET_WORDS[measured] if isinstance(measured, bool)
                                         else text_of(measured))
        base = defaults()
        with Vertical():
            yield Label("Tolerances", classes="tol-title")
            yield Static(INTRO, classes="tol-intro", markup=False)
            with Vertical(classes="tol-rows"):
                for key, label, meaning in ROWS:
                    hint = base[key] if key in NO_FIGURE else f"{base[key]} · common practice"
                    field = Field(label, f"tolerances.{key}", value=typed[key],
                                  placeholder=hint, id=f"tol-{key}")
                    field.meaning = (unit_label(self.pressure_unit) if key == "gauge_full_scale"
                                     else meaning)
                    yield field
            if spec.roughness_range:
                kept = ", ".join(f"{name} {text_of(a)} … {text_of(b)}"
                                 for name, (a, b) in spec.roughness_range.items())
                yield Static(f"Roughness ranges kept from the site file: {kept}",
                             classes="tol-kept", markup=False)
            yield Static("", classes="tol-message", markup=False)
            yield Static(FORM_KEYS, classes="tol-keys", markup=False)

    def on_mount(self) -> None:
        if not self.children:  # the app is closing: nothing was composed
            return
        for field in self.query(Field):
            field.set_unit(getattr(field, "meaning", ""))
        self.query_one("#tol-gauge_accuracy", Field).input.focus()

    # ---- reading the form ----------------------------------------------------------------------

    def _text(self, key: str) -> str:
        return self.query_one(f"#tol-{key}", Field).text.strip()

    def collect(self) -> TolerancesSpec:
        """The table as the form now says (raises InputError naming the field at fault)."""
        from branchwise.core.site.tolerances import percent, temperature_difference
        from branchwise.core.site.values import number
        from branchwise.core.units import parse_quantity

        spec = copy.deepcopy(self.spec) if self.spec is not None else TolerancesSpec()
        for key in PERCENT:
            text = with_unit(self._text(key), "%") or None
            if text is not None:
                percent(text, f"tolerances.{key}")
            setattr(spec, key, text)
        full = with_unit(self._text("gauge_full_scale"), self.pressure_unit) or None
        if full is not None:
            parse_quantity(full, "pressure", "tolerances.gauge_full_scale")
        spec.gauge_full_scale = full
        temperature = with_unit(self._text("temperature"), "K") or None
        if temperature is not None:
            temperature_difference(temperature, "tolerances.temperature")
        spec.temperature = temperature
        low, high = self._text("roughness_low"), self._text("roughness_high")
        if bool(low) != bool(high):
            empty = "roughness_low" if not low else "roughness_high"
            raise InputError(f"tolerances.{empty}", "", "give both ends of the factor, or neither")
        spec.target_flow_measured = _target(self._text("target_flow_measured"))
        spec.roughness_factor = None
        if low:
            factor: list[Value] = [_tidy(number(text, f"tolerances.roughness_{end}"))
                                   for text, end in ((low, "low"), (high, "high"))]
            spec.roughness_factor = factor
        self._check_with_site(spec)
        return spec

    def _check_with_site(self, spec: TolerancesSpec) -> None:
        """Read the table as the solve will, with the site as it is now. Only a complaint
        about the tolerances is this form's business; anything else wrong with the site is
        shown where it belongs (and the table is read again at the next solve)."""
        from branchwise.core.site.build import build

        trial = copy.deepcopy(self.site)
        trial.tolerances = spec
        try:
            build(trial)
        except InputError as exc:
            if exc.field.startswith("tolerances"):
                raise

    def _show_error(self, exc: InputError | None) -> None:
        fields = {f.path: f for f in self.query(Field)}
        for field in fields.values():
            field.set_error(None)
        message = ""
        if exc is not None:
            path, reason = self._path_of(exc), self._reason(exc)
            if path in fields:  # said beside the field
                fields[path].set_error(reason)
                fields[path].input.focus()
            else:
                message = f"✗ {exc.field}: {reason}"
        self.query_one(".tol-message", Static).update(message)

    # ---- keys ----------------------------------------------------------------------------------

    def action_keep(self) -> None:
        try:
            spec = self.collect()
        except InputError as exc:
            self._show_error(exc)
            return
        unchanged = spec == (self.spec or TolerancesSpec())
        self.dismiss(None if unchanged else spec)

    def on_field_done(self, event: Field.Done) -> None:
        """Enter: a value that reads wrong keeps the cursor, its message beside it; else the
        next field; on the last field the form keeps."""
        event.stop()
        if self._field_error(event.field) is None and not self.next_field(event.field):
            self.action_keep()

    def on_field_edited(self, event: Field.Edited) -> None:
        event.stop()
        self._field_error(event.field)

    def _field_error(self, field: Field) -> InputError | None:
        """Check the form as far as ``field`` goes and say what is wrong with it beside it
        (other fields keep their messages until they are edited)."""
        try:
            self.collect()
        except InputError as exc:
            if self._path_of(exc) == field.path:
                field.set_error(self._reason(exc))
                return exc
        field.set_error(None)
        return None

    @staticmethod
    def _path_of(exc: InputError) -> str:
        return exc.field.replace("roughness_factor[0]", "roughness_low").replace(
            "roughness_factor[1]", "roughness_high").replace("roughness_factor", "roughness_low")

    def _reason(self, exc: InputError) -> str:
        return workspace(self.app).reason_words(exc)

    def action_cancel(self) -> None:
        self.dismiss(None)


def _target(text: str) -> bool | None:
    """The target-flow row: 'reading' or 'design' (as the file's true or false), '' for the
    default; anything else refused, naming the field."""
    word = text.strip().casefold()
    if not word:
        return None
    for measured, name in TARGET_WORDS.items():
        if name.startswith(word) or word == str(measured).casefold():
            return measured
    raise InputError("tolerances.target_flow_measured", text,
                     "type reading (a meter's, drawn with its tolerance) or design (a figure "
                     "to size to, not drawn)")


def _tidy(number: float) -> float | int:
    """3.0 → 3 so the file reads as typed; other numbers as they are."""
    return int(number) if float(number).is_integer() else float(number)


__all__ = ["TolerancesScreen", "defaults"]
