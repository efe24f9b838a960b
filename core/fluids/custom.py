"""A liquid the user describes by its density and one viscosity (for oils, brines, slurries…)."""

from __future__ import annotations

from ..errors import InputError
from ..model import Fluid, positive


def custom(
    name: str,
    density: float,
    viscosity: float | None = None,
    kinematic_viscosity: float | None = None,
) -> Fluid:
    """A fluid from ``density`` (kg/m³) and either ``viscosity`` (dynamic, Pa·s) or
    ``kinematic_viscosity`` (m²/s), exactly one of the two: data sheets quote either, and
    μ = ν ρ converts between them.
    """
    if not isinstance(name, str) or not name.strip():
        raise InputError("fluid.name", repr(name), "must not be empty")
    rho = positive("fluid.density", density)
    if viscosity is not None and kinematic_viscosity is not None:
        raise InputError(
            "fluid.kinematic_viscosity",
            kinematic_viscosity,
            "give the dynamic or the kinematic viscosity, not both",
        )
    if viscosity is not None:
        mu = positive("fluid.viscosity", viscosity)
    elif kinematic_viscosity is not None:
        mu = positive("fluid.kinematic_viscosity", kinematic_viscosity) * rho
    else:
        raise InputError(
            "fluid.viscosity", "nothing", "needed: the dynamic or the kinematic viscosity"
        )
    return Fluid(
        name=name.strip(), density=rho, viscosity=mu, kind="custom", source="entered by the user"
    )
