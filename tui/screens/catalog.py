"""The materials and fittings a branch can name, as the branch form's pickers and help list them,
and the check of a typed material or fitting name against them.

Materials come new and, where the catalog has a figure, aged (``commercial-steel aged``); the
person's own materials (``branchwise presets``) are listed too. Fittings are listed by key with
their K rule (K = n·f_T, or a fixed K).
"""

from __future__ import annotations

from rich.table import Table
from rich.text import Text
from textual.app import ComposeResult
from textual.binding import Binding
from textual.containers import Vertical
from textual.widgets import Label, OptionList, Static

from branchwise.core.errors import InputError

from ..modal import Dialog


def _mm(metres: float) -> str:
    return f"{metres * 1000:g} mm"


def material_choices() -> list[tuple[str, str]]:
    """(label, text to type) for every material, new and aged, the person's own included."""
    from branchwise.core.catalogs import materials
    from branchwise.core.storage.user_presets import material_for, store

    out: list[tuple[str, str]] = []
    seen: set[str] = set()
    try:
        own = sorted(store().list("materials"))
        mine = {key for key in own if store().is_user("materials", key)}
    except (InputError, OSError):
        own, mine = [], set()
    keys = [m.key for m in materials()] + [k for k in own if k not in {m.key for m in
                                                                        materials()}]
    for key in keys:
        if key in seen:
            continue
        seen.add(key)
        try:
            m = material_for(key, "material")
        except InputError:
            continue
        yours = " (yours)" if key in mine else ""
        out.append((f"{key}  —  {m.name}{yours}, new: ε {_mm(m.roughness_m)}", key))
        if m.aged_roughness_m is not None:
            out.append((f"{key} aged  —  {m.name}{yours}, aged: ε {_mm(m.aged_roughness_m)}",
                        f"{key} aged"))
    return out


def fitting_rule(n: float | None, k: float | None, by_size: bool) -> str:
    if k is not None:
        return f"K = {k:g}"
    if by_size:
        return "K = n·f_T, n by size"
    return f"K = {n:.3g} f_T" if n is not None else ""


def fitting_choices() -> list[tuple[str, str]]:
    """(label, key) for every fitting of the catalog."""
    from branchwise.core.catalogs import fittings

    return [(f"{f.key}  —  {f.name} ({fitting_rule(f.n, f.k, bool(f.n_by_nps))})", f.key)
            for f in fittings()]


def material_problem(text: str) -> str | None:
    """What is wrong with a material typed as ``key`` or ``key aged`` / ``key new`` (None:
    it is one of the materials; a number is a roughness, checked elsewhere)."""
    from branchwise.core.storage.user_presets import material_for

    words = text.split()
    if not words or text[0].isdigit() or text[0] == ".":
        return None
    condition = words[-1].lower() if len(words) > 1 and words[-1].lower() in ("new",
                                                                                "aged") else None
    key = " ".join(words[:-1] if condition else words)
    try:
        found = material_for(key, "material")
    except InputError as exc:
        return f"no material '{key}'{_suggestion(exc.reason)} (Ctrl+L lists them all)"
    if condition == "aged" and found.aged_roughness_m is None:
        return f"{found.key} has no aged roughness in the catalog; type a roughness instead"
    return None


def fitting_problem(name: str) -> str | None:
    """What is wrong with a fitting key (None: a fitting of the catalog, or an earlier key)."""
    from branchwise.core.catalogs.fittings import fitting

    try:
        fitting(name, "fittings")
    except InputError as exc:
        if "; did you mean" not in exc.reason:
            return (f"no fitting '{name}' (Ctrl+L lists them all); a part the list does not "
                    "hold goes in as its K (Extra K)")
        return f"no fitting '{name}'{_suggestion(exc.reason)} (Ctrl+L lists them all)"
    return None


def _suggestion(reason: str) -> str:
    """``; did you mean …`` of a catalog's 'unknown' message ('' when it has none)."""
    _, found, rest = reason.partition("; did you mean")
    return f"; did you mean{rest}" if found else ""


def catalog_table() -> Table:
    """Every material (new and aged roughness) and every fitting (its K), for help (F1)."""
    table = Table.grid(padding=(0, 2))
    table.add_column(style="bold", no_wrap=True)
    table.add_column()
    table.add_row(Text("Materials (ε or material: a key, or key aged)", style="bold underline"),
                  "")
    for label, _value in material_choices():
        key, _, words = label.partition("  —  ")
        table.add_row(key, Text(words))
    table.add_row("", "")
    table.add_row(Text("Fittings (Fittings: key count, …)", style="bold underline"), "")
    for label, _value in fitting_choices():
        key, _, words = label.partition("  —  ")
        table.add_row(key, Text(words))
    return table


class CatalogPicker(Dialog[str | None]):
    """Pick one material or fitting from the whole list; Enter picks, Esc leaves."""

    BINDINGS = [Binding("escape", "cancel", "Cancel", id="picker-cancel")]
    CLOSE_HINT = "Enter picks, Esc cancels"
    DEFAULT_CSS = """
    CatalogPicker { align: center middle; }
    CatalogPicker > Vertical {
        width: 96; max-width: 100%; height: auto; max-height: 90%; border: thick $primary;
        background: $surface; padding: 0 1;
    }
    CatalogPicker .picker-title { text-style: bold; }
    CatalogPicker OptionList { height: auto; max-height: 1fr; }
    CatalogPicker .picker-keys { color: $text-muted; }
    """

    def __init__(self, title: str, choices: list[tuple[str, str]], current: str = "") -> None:
        super().__init__()
        self.title_text = title
        self.choices = choices
        self.current = current

    def compose(self) -> ComposeResult:
        with Vertical():
            yield Label(self.title_text, classes="picker-title", markup=False)
            yield OptionList(*[Text(label) for label, _ in self.choices])
            yield Static("↑↓: move   Enter: pick   Esc: cancel", classes="picker-keys",
                         markup=False)

    def on_mount(self) -> None:
        menu = self.query(OptionList)
        if not menu:
            return  # the app is closing
        values = [v for _, v in self.choices]
        if self.current in values:
            menu.first().highlighted = values.index(self.current)
        menu.first().focus()

    def on_option_list_option_selected(self, event: OptionList.OptionSelected) -> None:
        event.stop()
        self.dismiss(self.choices[event.option_index][1])

    def action_cancel(self) -> None:
        self.dismiss(None)
