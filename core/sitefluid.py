"""The site's liquid: from the ``[fluid]`` table as typed (or a saved fluid preset) to a Fluid.

Part of :mod:`.sitebuild`; a glycol concentration may be given by volume (``"30 % vol"``).
"""

from __future__ import annotations

from collections.abc import Mapping
from typing import Any, Protocol

from .errors import InputError
from .model import Fluid
from .sitefile import Site, Value
from .units import KINDS, describe, parse_quantity


class PresetSource(Protocol):
    """Where saved presets come from (``store.PresetStore`` or a test's dict-backed stand-in)."""

    def get(self, kind: str, key: str) -> dict[str, Any]: ...


def text_value(value: Value, path: str) -> str | None:
    """Non-empty text, stripped (None when absent)."""
    if value is None:
        return None
    if not isinstance(value, str) or not value.strip():
        raise InputError(path, describe(value), "must be non-empty text")
    return value.strip()


# ---- the fluid -----------------------------------------------------------------------------

_FLUID_ARGS = {
    "temperature": ("temperature_k", "temperature"),
    "pressure": ("pressure_pa", "pressure"),
    "concentration": ("mass_fraction", "fraction"),
    "salinity": ("salinity_kg_kg", "salinity"),
    "density": ("density", "density"),
    "viscosity": ("viscosity", "viscosity"),
    "kinematic_viscosity": ("kinematic_viscosity", "kinematic_viscosity"),
}


def build_fluid(site: Site, presets: PresetSource | None = None) -> Fluid:
    """The site's liquid. ``kind`` is a built-in kind or the key of a user fluid preset, whose
    values the site's own values override (a preset's bare numbers are SI)."""
    from .fluids import fluid_from_spec

    kind, args = fluid_inputs(site, presets)
    return fluid_from_spec(kind, **args)


def fluid_inputs(site: Site, presets: PresetSource | None = None) -> tuple[str, dict[str, Any]]:
    """The built-in fluid kind of the site's liquid and the SI keyword arguments of
    :func:`~branchwise.core.fluids.fluid_from_spec` (so the same liquid can be rebuilt at
    another temperature, ``temperature_k`` in K)."""
    from .fluids import FLUID_KINDS

    spec = site.fluid
    kind = text_value(spec.kind, "fluid.kind") or "water"
    spelled = "-".join(kind.lower().replace("_", " ").split())  # "Propylene glycol" too
    kind = spelled if spelled in FLUID_KINDS else kind
    values: dict[str, tuple[Value, str | None]] = {}
    if kind not in FLUID_KINDS:
        preset = _fluid_preset(kind, presets, FLUID_KINDS)
        kind = str(preset.get("kind", "custom"))
        for key, value in preset.items():  # a preset's bare numbers are SI
            if key in _FLUID_ARGS:
                values[key] = (value, KINDS[_FLUID_ARGS[key][1]].si)
            elif key == "name":
                values[key] = (value, None)
    for key in (*_FLUID_ARGS, "name"):
        if getattr(spec, key) is not None:
            values[key] = (getattr(spec, key), None)
    args: dict[str, Any] = {}
    for key, (value, unit) in values.items():
        if key == "name":
            args["name"] = text_value(value, "fluid.name")
            continue
        arg, qkind = _FLUID_ARGS[key]
        if key == "concentration":
            args[arg] = _mass_fraction(kind, value, unit)
            continue
        args[arg] = parse_quantity(value, qkind, f"fluid.{key}", default_unit=unit)
    return kind, args


def _mass_fraction(kind: str, value: Value, unit: str | None) -> float:
    """A glycol concentration, by mass unless the text says by volume (``"30 % vol"``)."""
    from .fluids.concentration import PURE_DENSITY_20C, mass_fraction_from_volume, split_basis

    text, basis = split_basis(value) if isinstance(value, str) else (value, "mass")
    fraction = parse_quantity(text, "fraction", "fluid.concentration", default_unit=unit)
    if basis == "volume" and kind in PURE_DENSITY_20C:  # other kinds refuse it on their own
        return mass_fraction_from_volume(kind, fraction)
    return fraction


def _fluid_preset(kind: str, presets: PresetSource | None, kinds: tuple[str, ...]) -> dict:
    if presets is None:
        from .store import PresetStore

        presets = PresetStore()
    try:
        found = presets.get("fluids", kind)
    except InputError:
        raise InputError("fluid.kind", kind, f"must be one of {', '.join(kinds)} or the key of "
                         "a saved fluid preset") from None
    if not isinstance(found, Mapping):
        raise InputError("fluid.kind", kind, "the preset is not a table of values")
    return dict(found)
