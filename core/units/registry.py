"""The one pint ``UnitRegistry`` of the program, with the trade units defined once.

It is created on first use (pint takes about a second to import) and never called from a solver:
fields are converted to SI floats before a network is built, results converted back for display.

Trade units that pint lacks, or defines differently:

* ``gpm``/``USgpm`` (US gallon per minute), ``igpm`` (imperial), ``lpm``, ``lps``;
* ``psid`` (pounds per square inch, differential: the same size as ``psi``);
* ``ftH2O``, ``inH2O``, ``mH2O`` (and ``cmH2O``, ``mmH2O``): pressure equal to that height of
  water at 39.2 °F (4 °C), 999.972 kg/m³, under standard gravity 9.80665 m/s². These are the
  "conventional" water columns of NIST SP 811 (2008), appendix B.8: foot of water (39.2 °F) =
  2988.98 Pa, inch of water (39.2 °F) = 249.082 Pa, centimeter of water (4 °C) = 98.0638 Pa.
  A water-column unit typed in a pressure field is therefore converted with that conventional
  density, not with the density of the liquid in the pipe.
"""

from __future__ import annotations

from functools import cache
from typing import TYPE_CHECKING, Any

if TYPE_CHECKING:
    import pint

WATER_COLUMN_DENSITY = 999.972
"""kg/m³: water at 39.2 °F (4 °C), the density behind NIST SP 811's "foot of water (39.2 °F)"."""

_TRADE_UNITS = (
    f"water_column_density = {WATER_COLUMN_DENSITY} kg/m^3",
    "meter_H2O = meter * water_column_density * g_0 = mH2O = m_H2O",
    "centimeter_H2O = centimeter * water_column_density * g_0 = cmH2O = cm_H2O",
    "millimeter_H2O = millimeter * water_column_density * g_0 = mmH2O = mm_H2O",
    "inch_H2O = inch * water_column_density * g_0 = inH2O = in_H2O = inchesH2O = inches_H2O",
    "foot_H2O = foot * water_column_density * g_0 = ftH2O = ft_H2O = feetH2O = feet_H2O",
    "US_gallon_per_minute = gallon / minute = gpm = USgpm = GPM",
    "imperial_gallon_per_minute = imperial_gallon / minute = igpm",
    "liter_per_minute = liter / minute = lpm = LPM",
    "liter_per_second = liter / second = lps",
    "psi_differential = pound_force_per_square_inch = psid",
    "cubic_foot_per_second = foot ** 3 / second = cfs",
    "cubic_foot_per_minute = foot ** 3 / minute = cfm = CFM",
    "US_gallon_per_hour = gallon / hour = gph = GPH",
    "million_US_gallon_per_day = 1e6 * gallon / day = MGD = mgd",
)


@cache
def registry() -> pint.UnitRegistry[Any]:
    """The one unit registry, built on first call with the trade units above."""
    import pint

    ureg: pint.UnitRegistry[Any] = pint.UnitRegistry(
        on_redefinition="ignore", autoconvert_offset_to_baseunit=False)
    for line in _TRADE_UNITS:
        ureg.define(line)
    return ureg
