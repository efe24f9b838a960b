"""``branchwise presets``: list, add and delete the user's own liquids and materials."""

from __future__ import annotations

from typing import TextIO

from branchwise.core.errors import InputError
from branchwise.core.fluids import LIQUIDS


def run_presets(action: str, kind: str | None, key: str | None, values: list[str],
                out: TextIO) -> int:
    from branchwise.core.storage.user_presets import check_preset, store

    presets = store()
    if presets.problems:
        for problem in presets.problems:
            print(f"problem: {problem}", file=out)
    if action == "list":
        for k in ((kind,) if kind else ("fluids", "materials")):
            _list(k, presets, out)
        return 0
    if kind is None or key is None:
        raise InputError("presets", action, "give a kind (fluids or materials) and a key")
    if action == "delete":
        if values:
            raise InputError("presets", " ".join(values), "delete takes no values")
        presets.delete(kind, key)
        print(f"deleted {kind} preset '{key}'", file=out)
        return 0
    pairs = {}
    for item in values:
        name, sep, value = item.partition("=")
        if not sep or not name.strip():
            raise InputError(f"{kind}.{key}", item, "values are written NAME=VALUE")
        pairs[name.strip()] = value.strip()
    if not pairs:
        raise InputError(f"{kind}.{key}", "nothing", "give at least one NAME=VALUE")
    if kind == "fluids" and key in LIQUIDS:
        raise InputError(f"{kind}.{key}", key, "is a built-in liquid, which a site always takes "
                         "over a preset; give yours another key (such as site-" + key + ")")
    checked = check_preset(kind, key, pairs)
    if kind == "fluids":
        _try_liquid(key, checked, pairs)
    replaced = presets.is_user(kind, key)
    presets.put(kind, key, checked)
    print(f"{'replaced' if replaced else 'saved'} {kind} preset '{key}' in {presets.path}",
          file=out)
    return 0


def _try_liquid(key: str, values: dict[str, object], typed: dict[str, str]) -> None:
    """Work the liquid out once, as a site using it would (at the temperature it gives, or
    20 °C), so that a value it refuses is said now, under the preset's own name and quoted
    as ``typed`` (not in SI)."""
    from branchwise.core.site.liquid import build_fluid
    from branchwise.core.site.spec import FluidSpec, Site

    class _Only:
        problems: list[str] = []

        def get(self, kind: str, name: str) -> dict[str, object]:
            if kind == "fluids" and name == key:
                return dict(values)
            raise InputError(f"{kind}.{name}", name, "no such preset")

    from branchwise.core.fluids import liquid

    base = liquid(str(values.get("kind", "custom")))
    needs_warmth = base is not None and "temperature" in base.inputs
    site = Site(fluid=FluidSpec(kind=key, temperature="20 degC" if needs_warmth
                                and "temperature" not in values else None))
    try:
        build_fluid(site, _Only())
    except InputError as exc:
        field = exc.field.removeprefix("fluid.")
        shown = typed[field] if field in typed else exc.marked_value
        raise InputError(f"fluids.{key}.{field}", shown, exc.marked_reason) from None


def _list(kind: str, presets, out: TextIO) -> None:
    from branchwise.core.catalogs import materials

    print(f"{kind}:", file=out)
    rows = []
    if kind == "materials":
        for m in materials():
            if not presets.is_user("materials", m.key):
                rows.append((m.key, "shipped", f"{m.name}, ε {m.roughness_m * 1000:g} mm"))
    else:
        for key, built_in in LIQUIDS.items():
            rows.append((key, "built in", f"{built_in.label}: {', '.join(built_in.inputs)}"))
    for key, values in presets.list(kind).items():
        if presets.is_user(kind, key):
            text = ", ".join(f"{n} {v}" for n, v in values.items())
            rows.append((key, "yours", text))
    width = max(len(r[0]) for r in rows)
    for key, origin, text in rows:
        print(f"  {key:<{width}}  {origin:<8}  {text}", file=out)
