"""Liquid properties from published models, in SI: K, Pa, kg/kg, kg/m³, Pa·s.

- :func:`water`: IAPWS-IF97 region 1 density, IAPWS 2008 viscosity.
- :func:`seawater`: Sharqawy, Lienhard & Zubair (2010).
- :func:`glycol`: ethylene/propylene glycol in water, from CoolProp tables shipped in
  ``presets/fluids/`` (read on first use).
- :func:`custom`: density plus a dynamic or kinematic viscosity.
- :func:`fluid_from_spec`: one entry point for saved sites and forms; every missing or
  unexpected input is an :class:`~branchwise.core.errors.InputError` naming its field.
"""

from __future__ import annotations

from ..errors import InputError
from ..model import Fluid
from ..units import describe
from .custom import custom
from .glycol import GLYCOL_KINDS, GlycolKind, freezing_point_k, glycol
from .seawater import seawater
from .water import STANDARD_ATMOSPHERE_PA, water

FLUID_KINDS: tuple[str, ...] = ("water", "seawater", *GLYCOL_KINDS, "custom")

# Field path of every input fluid_from_spec takes, and which inputs each kind requires/allows.
_FIELDS = {
    "temperature_k": "fluid.temperature",
    "pressure_pa": "fluid.pressure",
    "mass_fraction": "fluid.concentration",
    "salinity_kg_kg": "fluid.salinity",
    "density": "fluid.density",
    "viscosity": "fluid.viscosity",
    "kinematic_viscosity": "fluid.kinematic_viscosity",
    "name": "fluid.name",
}
_REQUIRED = {
    "water": ("temperature_k",),
    "seawater": ("temperature_k", "salinity_kg_kg"),
    "ethylene-glycol": ("temperature_k", "mass_fraction"),
    "propylene-glycol": ("temperature_k", "mass_fraction"),
    "custom": ("density",),
}
_OPTIONAL = {
    "water": ("pressure_pa",),
    "seawater": ("pressure_pa",),
    "ethylene-glycol": (),
    "propylene-glycol": (),
    "custom": ("viscosity", "kinematic_viscosity", "name"),
}


def fluid_from_spec(
    kind: str,
    *,
    temperature_k: float | None = None,
    pressure_pa: float | None = None,
    mass_fraction: float | None = None,
    salinity_kg_kg: float | None = None,
    density: float | None = None,
    viscosity: float | None = None,
    kinematic_viscosity: float | None = None,
    name: str | None = None,
) -> Fluid:
    """The :class:`Fluid` for ``kind`` (one of :data:`FLUID_KINDS`) from the inputs that kind
    takes; units as in the keyword names (K, Pa, kg/kg; kg/m³, Pa·s, m²/s).

    An input the kind needs but lacks, or one it does not use (a salinity for a glycol), is
    refused with an InputError on its field, so a form or a saved site never silently loses
    a value.
    """
    key = kind.strip().lower() if isinstance(kind, str) else kind
    if key not in FLUID_KINDS:
        raise InputError("fluid.kind", describe(kind), f"must be one of {', '.join(FLUID_KINDS)}")
    given = {
        "temperature_k": temperature_k,
        "pressure_pa": pressure_pa,
        "mass_fraction": mass_fraction,
        "salinity_kg_kg": salinity_kg_kg,
        "density": density,
        "viscosity": viscosity,
        "kinematic_viscosity": kinematic_viscosity,
        "name": name,
    }
    allowed = _REQUIRED[key] + _OPTIONAL[key]
    for arg, value in given.items():
        if value is not None and arg not in allowed:
            takes = ", ".join(_FIELDS[a].removeprefix("fluid.") for a in allowed)
            shown = f"{value:.6g}" if isinstance(value, float) else describe(value)
            raise InputError(_FIELDS[arg], shown, f"not used for {key} (it takes {takes})")
    for arg in _REQUIRED[key]:
        if given[arg] is None:
            raise InputError(_FIELDS[arg], "nothing", f"needed for {key}")
    pressure = STANDARD_ATMOSPHERE_PA if pressure_pa is None else pressure_pa
    if key == "water":
        return water(temperature_k, pressure)  # type: ignore[arg-type]
    if key == "seawater":
        return seawater(temperature_k, salinity_kg_kg, pressure)  # type: ignore[arg-type]
    if key == "custom":
        return custom(
            name or "Custom fluid",
            density,
            viscosity,  # type: ignore[arg-type]
            kinematic_viscosity,
        )
    return glycol(key, temperature_k, mass_fraction)  # type: ignore[arg-type]


__all__ = [
    "FLUID_KINDS",
    "GLYCOL_KINDS",
    "Fluid",
    "GlycolKind",
    "custom",
    "fluid_from_spec",
    "freezing_point_k",
    "glycol",
    "seawater",
    "water",
]
