"""The site's liquid: from the ``[fluid]`` table as typed (or a saved fluid preset) to a Fluid.

``fluid.kind`` names a built-in kind of the liquids registry (:mod:`branchwise.core.fluids`) in
any capitals, spaces or underscores, or the key of a saved fluid preset, whose values the site's
own override. A glycol concentration may be given by volume (``"30 % vol"``).
"""

from __future__ import annotations

from collections.abc import Mapping
from typing import TYPE_CHECKING, Any

from ..errors import InputError, describe
from ..fluids import INPUTS, LIQUIDS, fluid_from_spec, liquid
from ..model import Fluid
from ..units import KINDS, parse_quantity
from .spec import Site, Value
from .values import is_bare_number, text_value

if TYPE_CHECKING:
    from ..storage.presets import PresetSource


def build_fluid(site: Site, presets: PresetSource | None = None) -> Fluid:
    """The site's liquid (see :func:`fluid_inputs`). An error on a value the site typed quotes
    it as typed (``44 degF``), not as the model's SI number."""
    kind, args = fluid_inputs(site, presets)
    try:
        return fluid_from_spec(kind, **args)
    except InputError as exc:
        key = exc.field.removeprefix("fluid.")
        typed = getattr(site.fluid, key, None) if key in INPUTS else None
        if typed is None or key == "concentration":  # a % vol is not what the model read
            raise
        raise InputError(exc.field, describe(typed), exc.marked_reason) from None


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
    takes = LIQUIDS[kind].inputs if kind in LIQUIDS else tuple(INPUTS)
    for key in INPUTS:
        typed = getattr(spec, key)
        if typed is None:
            continue
        if key not in takes:  # refused before it is read, quoting it as typed
            raise InputError(f"fluid.{key}", describe(typed),
                             f"not used for {kind} (it takes {', '.join(takes)})")
        values[key] = (typed, None)
    args: dict[str, Any] = {}
    for key, (value, unit) in values.items():
        item = INPUTS[key]
        if item.quantity is None:
            args[item.arg] = text_value(value, f"fluid.{key}")
        elif key == "concentration":
            arg, fraction = _concentration(value, unit)
            args[arg] = fraction
        else:
            args[item.arg] = parse_quantity(value, item.quantity, f"fluid.{key}",
                                            default_unit=unit)
    return kind, args


def _concentration(value: Value, unit: str | None) -> tuple[str, float]:
    """A glycol concentration: (``"mass_fraction"``, kg/kg) unless the text says by volume
    (``"30 % vol"``: ``"volume_fraction"``, m³/m³), each read from its own data set."""
    from ..fluids.concentration import split_basis

    text, basis = split_basis(value) if isinstance(value, str) else (value, "mass")
    fraction = parse_quantity(text, "fraction", "fluid.concentration", default_unit=unit)
    # "30" meant as a percent, read as a fraction of one (3000 %)
    if unit is None and fraction > 1 and is_bare_number(text):
        raise InputError("fluid.concentration", describe(value),
                         f"a number alone is a fraction of one here ({fraction * 100:g} %); "
                         f"for a percent write it: '{text} %'")
    return ("volume_fraction" if basis == "volume" else "mass_fraction"), fraction


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
