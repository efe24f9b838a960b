"""The kinds of quantity a field can hold: dimension, SI unit, display units, usual choices.

Plain data, no pint: the app reads it before pint has loaded.
"""

from __future__ import annotations

from dataclasses import dataclass


@dataclass(frozen=True)
class Kind:
    """A kind of quantity: its pint dimension, SI unit and display units per unit system."""

    dimension: str
    si: str
    display_si: str
    display_us: str
    choices: tuple[str, ...]


KINDS: dict[str, Kind] = {
    "pressure": Kind("[pressure]", "Pa", "kPa", "psi",
                     ("kPa", "bar", "psi", "Pa", "MPa", "mbar", "ftH2O", "mH2O", "inH2O")),
    "flow": Kind("[volume]/[time]", "m^3/s", "L/s", "gpm",
                 ("L/s", "m^3/h", "gpm", "L/min", "m^3/s")),
    "length": Kind("[length]", "m", "m", "ft", ("m", "ft", "mm", "in")),
    "diameter": Kind("[length]", "m", "mm", "in", ("mm", "in", "m")),
    "roughness": Kind("[length]", "m", "mm", "in", ("mm", "in", "um", "mil")),
    "head": Kind("[length]", "m", "m", "ft", ("m", "ft")),
    "velocity": Kind("[velocity]", "m/s", "m/s", "ft/s", ("m/s", "ft/s")),
    "temperature": Kind("[temperature]", "K", "degC", "degF", ("degC", "degF", "K")),
    "density": Kind("[density]", "kg/m^3", "kg/m^3", "lb/ft^3", ("kg/m^3", "lb/ft^3")),
    "viscosity": Kind("[viscosity]", "Pa*s", "cP", "cP", ("cP", "mPa*s", "Pa*s")),
    "kinematic_viscosity": Kind("[length]**2/[time]", "m^2/s", "cSt", "cSt", ("cSt", "m^2/s")),
    "acceleration": Kind("[acceleration]", "m/s^2", "m/s^2", "ft/s^2", ("m/s^2", "ft/s^2")),
    "fraction": Kind("[]", "", "%", "%", ("%",)),
    "salinity": Kind("[]", "", "g/kg", "g/kg", ("g/kg", "%")),
}
"""Every kind of quantity a field can hold. ``fraction`` and ``salinity`` are kg/kg."""

SYSTEMS = ("si", "us")


def spec_of(kind: str) -> Kind:
    """The :class:`Kind` called ``kind`` (a key of :data:`KINDS`); ValueError otherwise."""
    try:
        return KINDS[kind]
    except KeyError:
        raise ValueError(f"unknown kind {kind!r}; one of {', '.join(KINDS)}") from None
