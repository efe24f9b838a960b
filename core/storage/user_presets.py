"""The user's own liquids and materials, as a site file and the ``presets`` command use them.

User presets live in ``presets.toml`` in the data folder (see :mod:`.presets`);
values are kept as the user typed them (``"870 kg/m^3"``, ``"0.5 mm"``) and read through
:mod:`branchwise.core.units` when used. A user material overrides a shipped one with the same key.
"""

from __future__ import annotations

from collections.abc import Mapping
from typing import TYPE_CHECKING, Any

from ..errors import InputError
from ..fluids import INPUTS
from ..units import parse_quantity
from ..units.numbers import plain_float

if TYPE_CHECKING:
    from ..catalogs.materials import Material
    from .presets import PresetStore

FLUID_FIELDS = {key: i.quantity for key, i in INPUTS.items() if i.quantity is not None}
"""Quantities a liquid preset may hold (the liquids registry's inputs), with their units kind."""
TEXT_FIELDS = ("name", "kind", "source")
MATERIAL_FIELDS = {"roughness": "roughness", "aged_roughness": "roughness"}
"""Quantities a material preset may hold; plus ``hazen_williams_c`` (a plain number)."""

_POSITIVE = ("density", "viscosity", "kinematic_viscosity")
_NOT_NEGATIVE = ("roughness", "aged_roughness", "concentration", "salinity")

_cache: tuple[float, PresetStore] | None = None


def store() -> PresetStore:
    """The user's :class:`~.presets.PresetStore`, kept while its file is unchanged (the app
    solves on every keystroke; reading the file each time would cost more): read again only
    when the file changes."""
    global _cache
    from .paths import presets_path
    from .presets import PresetStore

    path = presets_path()
    stamp = path.stat().st_mtime_ns if path.exists() else -1.0
    if _cache is None or _cache[0] != stamp or _cache[1].path != path:
        _cache = (stamp, PresetStore(shipped={"materials": _shipped_materials}))
    return _cache[1]


def _shipped_materials() -> dict[str, dict[str, Any]]:
    from ..catalogs import materials

    return {m.key: {"name": m.name, "roughness": f"{m.roughness_m * 1000:g} mm"}
            for m in materials()}


def check_preset(kind: str, key: str, values: Mapping[str, Any]) -> dict[str, Any]:
    """``values`` checked as a ``fluids`` or ``materials`` preset (units read, names known);
    returns them as typed. Errors name ``<kind>.<key>.<field>``."""
    if kind == "fluids":
        known: Mapping[str, str] = FLUID_FIELDS
        extra: tuple[str, ...] = TEXT_FIELDS
    elif kind == "materials":
        known, extra = MATERIAL_FIELDS, ("name", "source", "hazen_williams_c")
    else:
        raise InputError("kind", kind, "must be fluids or materials")
    out: dict[str, Any] = {}
    for name, value in values.items():
        path = f"{kind}.{key}.{name}"
        if name in known:
            number = parse_quantity(value, known[name], path)
            if name in _POSITIVE and not number > 0:
                raise InputError(path, value, "must be more than zero")
            if name in _NOT_NEGATIVE and number < 0:
                raise InputError(path, value, "must not be negative")
        elif name == "hazen_williams_c":
            value = _hazen_williams_c(value, path)
        elif name not in extra:
            allowed = ", ".join((*known, *extra))
            raise InputError(path, value, f"unknown value; known: {allowed}")
        out[name] = value
    if kind == "fluids" and "density" in out and not (
        {"viscosity", "kinematic_viscosity"} & set(out)
    ):
        raise InputError(f"fluids.{key}.viscosity", "nothing",
                         "a liquid given by density also needs viscosity or kinematic_viscosity")
    if kind == "materials" and "roughness" not in out:
        raise InputError(f"materials.{key}.roughness", "nothing", "a material needs a roughness")
    return out


def _hazen_williams_c(value: Any, path: str) -> float:
    """A preset's Hazen–Williams C: a plain number between 0 and 1000 (not true, not "1_20")."""
    try:
        if isinstance(value, bool):
            raise TypeError
        number = plain_float(value)
    except (TypeError, ValueError, OverflowError):
        raise InputError(path, value, "must be a plain number") from None
    if not 0 < number < 1000:
        raise InputError(path, value, "must be between 0 and 1000")
    return number


def material_for(key: str, field: str) -> Material:
    """The user's material ``key`` if there is one, else the shipped one."""
    from ..catalogs import material
    from ..catalogs.materials import Material

    user = store()
    if not user.is_user("materials", key):
        try:
            return material(key, field)
        except InputError as exc:
            if not user.problems:
                raise
            raise InputError(exc.field, exc.marked_value, f"{exc.marked_reason} (your presets "
                             f"file could not be read: {'; '.join(user.problems)})") from None
    values = user.get("materials", key)
    path = f"materials.{key}"
    aged = values.get("aged_roughness")
    c = values.get("hazen_williams_c")
    return Material(
        key=key,
        name=str(values.get("name", key)),
        roughness_m=parse_quantity(values.get("roughness"), "roughness", f"{path}.roughness"),
        aged_roughness_m=(None if aged is None
                          else parse_quantity(aged, "roughness", f"{path}.aged_roughness")),
        hazen_williams_c=None if c is None else _hazen_williams_c(c, f"{path}.hazen_williams_c"),
        source=str(values.get("source", "your own preset")),
    )
