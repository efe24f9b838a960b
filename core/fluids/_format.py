"""How fluid states read in names and error messages (°C, %, g/kg for people; SI inside)."""

from __future__ import annotations

import re

ZERO_CELSIUS_K = 273.15
"""0 °C in kelvin (ITS-90 / SI definition of the Celsius scale)."""


def celsius(temperature_k: float, digits: int = 1) -> str:
    """``temperature_k`` (K) as a Celsius number with ``digits`` decimals, never "-0.0"."""
    text = f"{temperature_k - ZERO_CELSIUS_K:.{digits}f}"
    return text[1:] if text.startswith("-") and float(text) == 0 else text


def percent(fraction: float) -> str:
    """A mass fraction (kg/kg) as a percentage without trailing zeros: 0.3 → "30"."""
    return f"{fraction * 100:.4g}"


def at_pressure(pressure_pa: float) -> str:
    """What a liquid's name adds for its pressure: nothing at 1 atm (within 1 Pa), else
    ", 250 kPa" (up to six digits, never an exponent: ", 10000 kPa")."""
    if abs(pressure_pa - 101325.0) <= 1.0:
        return ""
    return f", {pressure_pa / 1e3:.6g} kPa"


PRESSURE_IN_NAME = re.compile(r", ([0-9.]+) kPa$")
"""What :func:`at_pressure` added to a name, read back (group 1: the kPa), so that a display
in other units can restate it."""


def state(temperature_k: float) -> str:
    """A temperature as the value of an error message ("-5 °C"; "23 °F" in US units)."""
    from ..messages import temperature_text

    return temperature_text(temperature_k)
