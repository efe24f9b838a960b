"""The Liquid screen: what flows in the pipes, at what state, and the properties that follow.

Only the fields the chosen kind uses are shown; a value another kind needs is kept aside (not
lost) when the kind changes, and comes back when it changes back. The properties panel shows
density, dynamic and kinematic viscosity and the model they come from; a state the model
refuses (frozen, boiling, out of its range) shows its message beside the field at fault.
"""

from __future__ import annotations

from pathlib import Path

from textual.app import ComposeResult
from textual.binding import Binding
from textual.containers import Horizontal, Vertical, VerticalScroll
from textual.widgets import Input, Label, Static

from branchwise.core.fluids import INPUTS, LIQUIDS, liquid
from branchwise.core.site.fields import FieldPath
from branchwise.core.site.spec import Site

from ..quiet import put
from ..state.values import is_bare_number, text_of, with_unit
from ..widgets.choice import Choice
from ..widgets.field import Field
from .work_screen import WorkScreen


class LiquidScreen(WorkScreen):
    """Kind, state, and the resulting properties of the liquid."""

    AUTO_FOCUS = "#liquid-kind-select"
    CSS_PATH = Path(__file__).parent / "liquid.tcss"

    BINDINGS = [
        Binding("escape", "leave_field", "Done typing", id="liquid-leave",
                key_display="Enter next · Esc",
                tooltip="Enter moves to the next field; Esc stops typing, so that single "
                        "letters are keys again"),
        Binding("k", "focus_kind", "Kind", id="liquid-kind",
                tooltip="Choose water, seawater, a glycol, a custom liquid or a saved one"),
    ]

    def body(self) -> ComposeResult:
        with Horizontal(id="liquid"):
            with VerticalScroll(id="liquid-form"):
                with Horizontal(classes="row"):
                    yield Label("Kind", classes="row-label")
                    self._options = self._kind_options()
                    yield Choice(self._options, self.kind(), id="liquid-kind-select")
                for item in INPUTS.values():
                    yield Field(item.label, f"fluid.{item.key}", item.quantity,
                                id=f"fluid-{item.key}", placeholder=item.hint)
                yield Static("", id="liquid-hint", markup=False)
            with Vertical(id="liquid-props"):
                yield Label("Properties", classes="panel-title")
                yield Static("", id="liquid-values", markup=False)

    def _kind_options(self) -> list[tuple[str, str]]:
        options = [(kind.label, key) for key, kind in LIQUIDS.items()]
        try:
            from branchwise.core.storage.presets import PresetStore

            saved = PresetStore().list("fluids")
        except (OSError, ValueError) as exc:
            self.notify(f"Saved liquids not read: {exc}", severity="warning")
            saved = {}
        options += [(f"Saved: {key}", key) for key in sorted(saved) if key not in LIQUIDS]
        self._saved = {key: values for key, values in saved.items() if key not in LIQUIDS}
        return options

    def on_mount(self) -> None:
        super().on_mount()

    def kind(self) -> str:
        return text_of(self.bw.site.fluid.kind).strip().lower() or "water"

    def uses(self, kind: str) -> tuple[str, ...]:
        """The inputs a kind of liquid takes (a saved one: those of the kind it is based on)."""
        known = liquid(kind) or liquid(str(self._saved.get(kind, {}).get("kind", "custom")))
        return (known or LIQUIDS["custom"]).inputs

    # ---- drawing ---------------------------------------------------------------------------------

    def redraw(self) -> None:
        app, spec = self.bw, self.bw.site.fluid
        kind = self.kind()
        options = self._options
        if kind not in [v for _, v in options]:
            options = [*options, (f"Saved: {kind}", kind)]
        self.query_one("#liquid-kind-select", Choice).set_options(options, kind)
        uses = self.uses(kind)
        outcome = app.outcome
        error = outcome.error if outcome is not None else None
        ref = FieldPath.parse(outcome.field) if outcome is not None and error else None
        for name, item in INPUTS.items():
            qkind = item.quantity
            field = self.query_one(f"#fluid-{name}", Field)
            field.display = name in uses
            field.show(text_of(getattr(spec, name)))
            unit = app.unit_text(qkind) if qkind else ""
            field.set_unit(f"{unit} abs" if name == "pressure" else unit)  # not gauge
            wrong = ref is not None and ref.area == "fluid" and ref.name == name
            field.set_error(app.reason_words(error) if wrong else None)
        hint = self.query_one("#liquid-hint", Static)
        if error is not None and ref is not None and ref.area == "fluid" and ref.name not in uses:
            put(hint, f"✗ {app.error_words(error)}")
        else:
            put(hint, "A bare number takes the unit in brackets; or type any unit: 65 degF, "
                "12 cP, 1.2 cSt.")
        self._draw_properties()

    def _draw_properties(self) -> None:
        app = self.bw
        outcome = app.outcome
        fluid = outcome.fluid if outcome is not None else None
        stale = False
        if fluid is None and app.good is not None:
            fluid, stale = app.good.fluid, True
        panel = self.query_one("#liquid-values", Static)
        self.query_one("#liquid-props").set_class(stale, "-stale")
        if fluid is None:
            put(panel, "… working it out" if outcome is None else "—")
            return
        nu = fluid.viscosity / fluid.density
        put(panel, "\n".join([
            app.fluid_name(fluid),
            "",
            f"Density ρ    {app.fmt(fluid.density, 'density', 5)}",
            f"Viscosity μ  {app.fmt(fluid.viscosity, 'viscosity', 4)}",
            f"Kinematic ν  {app.fmt(nu, 'kinematic_viscosity', 4)}",
            "",
            f"Model: {fluid.source}",
        ]))

    # ---- edits -----------------------------------------------------------------------------------

    def on_choice_changed(self, event: Choice.Changed) -> None:
        new = event.value
        old = self.kind()
        if new == old:
            return
        parked = self.bw.session.parked
        spec = self.bw.site.fluid
        keep = self.uses(new)
        for name in INPUTS:
            value = text_of(getattr(spec, name))
            if value and name not in keep:
                parked[f"fluid.{name}"] = value
        restore = {name: parked.get(f"fluid.{name}") for name in keep}

        def change(site: Site) -> None:
            fluid = site.fluid
            fluid.kind = new
            for name in INPUTS:
                if name not in keep:
                    setattr(fluid, name, None)
                elif getattr(fluid, name) is None and restore.get(name):
                    setattr(fluid, name, restore[name])

        known = liquid(new)
        self.bw.edit(f"Liquid: {known.label if known else new}", change)

    def on_field_edited(self, event: Field.Edited) -> None:
        if not self.ready:
            return
        field = event.field
        name = field.path.split(".", 1)[1]
        text = with_unit(event.text, self.bw.unit(field.kind)) if field.kind else event.text
        if name == "concentration":
            text = _with_basis_unit(event.text, self.bw.unit("fraction"))
        value = text.strip() or None

        def change(site: Site) -> None:
            setattr(site.fluid, name, value)

        self.bw.edit(f"Liquid {name.replace('_', ' ')}", change, key=field.path)

    def on_field_done(self, event: Field.Done) -> None:
        """Enter: the next field shown, round to the first (the focus stays in a field, so
        that letters typed next are not keys)."""
        shown = [f for f in self.query(Field) if f.display]
        if event.field in shown:
            shown[(shown.index(event.field) + 1) % len(shown)].input.focus()

    def check_action(self, action: str, parameters: tuple[object, ...]) -> bool | None:
        if action == "leave_field":  # shown (with Enter's meaning) while typing only
            return isinstance(self.focused, Input)
        return True

    def action_focus_kind(self) -> None:
        self.query_one("#liquid-kind-select").focus()

    def action_leave_field(self) -> None:
        self.query_one("#liquid-kind-select").focus()


def _with_basis_unit(text: str, unit: str) -> str:
    """A concentration as kept: a bare number takes the field's unit, also before a basis
    word (``30 vol`` → ``30 % vol``), since a bare number in the site file is kg/kg."""
    from branchwise.core.fluids.concentration import split_basis

    rest, basis = split_basis(text)
    if rest.strip() != text.strip() and is_bare_number(rest) and unit:
        return f"{rest.strip()} {unit} {'vol' if basis == 'volume' else 'by mass'}"
    return with_unit(text, unit)
