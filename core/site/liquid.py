"""The site's liquid: from the ``[fluid]`` table as typed (or a saved fluid preset) to a Fluid.

``fluid.kind`` names a built-in kind of the liquids registry (:mod:`branchwise.core.fluids`) in
any capitals, spaces or underscores, or the key of a saved fluid preset, whose values the site's
own override. A glycol concentration may be given by volume (``"30 % vol"``).
"""

from __future__ import annotations

from collections.abc import Mapping
from typing import TYPE_CHECKING, Any

from ..errors import InputError
from ..fluids import INPUTS, LIQUIDS, fluid_from_spec, liquid
from ..model import Fluid
from ..units import KINDS, parse_quantity
from .spec import Site, Value
from .values import text_value

if TYPE_CHECKING:
    from ..storage.presets import PresetSource


def build_fluid(site: Site, presets: PresetSource | None = None) -> Fluid:
    """The site's liquid (see :func:`fluid_inputs`)."""
    kind, args = fluid_inputs(site, presets)
    return fluid_from_spec(kind, **args)


def fluid_inputs(site: Site, presets: PresetSource | None = None) -> tuple[str, dict[str, Any]]:
    """The built-in kind of the site's liquid and the SI keyword arguments of
    :func:`~branchwise.core.fluids.fluid_from_spec` (so that the same liquid can be rebuilt at
    another temperature, ``temperature_k`` in K). A preset's bare numbers are SI."""
    spec = site.fluid
    typed = text_value(spec.kind, "fluid.kind") or "water"
    built_in = liquid(typed)
    values: dict[str, tuple[Value, str | None]] = {}
    if built_in is None:
        preset = _fluid_preset(typed, presets)
        kind = str(preset.get("kind", "custom"))
        for key, value in preset.items():
            if key in INPUTS:
                quantity = INPUTS[key].quantity
                values[key] = (value, KINDS[quantity].si if quantity else None)
    else:
        kind = built_in.key
    for key in INPUTS:
        if getattr(spec, key) is not None:
            values[key] = (getattr(spec, key), None)
    args: dict[str, Any] = {}
    for key, (value, unit) in values.items():
        item = INPUTS[key]
        if item.quantity is None:
            args[item.arg] = text_value(value, f"fluid.{key}")
        elif key == "concentration":
            args[item.arg] = _mass_fraction(kind, value, unit)
        else:
            args[item.arg] = parse_quantity(value, item.quantity, f"fluid.{key}",
                                            default_unit=unit)
    return kind, args


def _mass_fraction(kind: str, value: Value, unit: str | None) -> float:
    """A glycol concentration, by mass unless the text says by volume (``"30 % vol"``)."""
    from ..fluids.concentration import PURE_DENSITY_20C, mass_fraction_from_volume, split_basis

    text, basis = split_basis(value) if isinstance(value, str) else (value, "mass")
    fraction = parse_quantity(text, "fraction", "fluid.concentration", default_unit=unit)
    if basis == "volume" and kind in PURE_DENSITY_20C:  # other kinds refuse it on their own
        return mass_fraction_from_volume(kind, fraction)
    return fraction


def _fluid_preset(kind: str, presets: PresetSource | None) -> dict[str, Any]:
    if presets is None:
        from ..storage.presets import PresetStore

        presets = PresetStore()
    try:
        found = presets.get("fluids", kind)
    except InputError:
        problems = getattr(presets, "problems", None)  # a presets file that did not load
        broken = f" (your presets file could not be read: {'; '.join(problems)})" \
            if problems else ""
        raise InputError("fluid.kind", kind, f"must be one of {', '.join(LIQUIDS)} or the key "
                         f"of a saved fluid preset{broken}") from None
    if not isinstance(found, Mapping):
        raise InputError("fluid.kind", kind, "the preset is not a table of values")
    return dict(found)
