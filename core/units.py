"""Units at the boundary: text with units in, SI floats out; SI floats in, display text out.

This module owns the one pint ``UnitRegistry`` of the program. It is created on first use (pint
takes about a second to import), and the solver never calls into it: fields are converted to SI
floats here before a network is built, and results are converted back here for display.

Trade units that pint lacks, or defines differently, are defined once in :func:`registry`:

* ``gpm``/``USgpm`` (US gallon per minute), ``igpm`` (imperial), ``lpm``, ``lps``;
* ``psid`` (pounds per square inch, differential: the same size as ``psi``);
* ``ftH2O``, ``inH2O``, ``mH2O`` (and ``cmH2O``, ``mmH2O``): pressure equal to that height of
  water at 39.2 °F (4 °C), 999.972 kg/m³, under standard gravity 9.80665 m/s². These are the
  "conventional" water columns of NIST SP 811 (2008), appendix B.8: foot of water (39.2 °F) =
  2988.98 Pa, inch of water (39.2 °F) = 249.082 Pa, centimeter of water (4 °C) = 98.0638 Pa.
  A water-column unit typed in a pressure field is therefore converted with that conventional
  density, not with the density of the liquid in the pipe;
* ``mil`` read as pint's ``thou`` = 0.001 in (for roughness; pint's own ``mil`` is an angle);
* ``"`` for inches and ``'`` for feet, as written on drawings.

Offset temperatures are handled by splitting the number from the unit and building
``Quantity(60, "degC")``: pint refuses ``Quantity("60 degC")`` arithmetic on offset units.
"""

from __future__ import annotations

import math
import re
from dataclasses import dataclass
from functools import cache
from typing import TYPE_CHECKING, Any

from .errors import InputError, describe, one_line
from .unitgrammar import unit_expression

if TYPE_CHECKING:
    from collections.abc import Mapping

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
    "US_gallon_per_hour = gallon / hour = gph = GPH",
    "million_US_gallon_per_day = 1e6 * gallon / day = MGD = mgd",
)

_WATER_COLUMN = re.compile(
    r"""^(?P<len>in|inch|inches|"|ft|feet|foot|mm|cm|m)\.?\s*(?:w\.?\s*[cg]\.?|h2o|water)$""",
    re.IGNORECASE)
"""Water-column spellings of the trade: ``in wc``, ``inWC``, ``"WC``, ``in. w.g.``, ``ft wc``,
``mm wc`` — heads of water at the conventional density, as ``inH2O`` and friends."""
_WATER_COLUMN_UNIT = {"in": "inH2O", "inch": "inH2O", "inches": "inH2O", '"': "inH2O",
                      "ft": "ftH2O", "feet": "ftH2O", "foot": "ftH2O", "mm": "mmH2O",
                      "cm": "cmH2O", "m": "mH2O"}
_BARE_TEMPERATURE = re.compile(r"^(?:deg(?:rees?)?\s*)?(?P<scale>[CF])$", re.IGNORECASE)
"""``5 C``, ``41 F``, ``5 deg C``: in a temperature field C and F can only mean the scales."""



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


@cache
def registry() -> pint.UnitRegistry:
    """The one unit registry, built on first call with the trade units above."""
    import pint

    ureg = pint.UnitRegistry(on_redefinition="ignore", autoconvert_offset_to_baseunit=False)
    for line in _TRADE_UNITS:
        ureg.define(line)
    return ureg


# ---- reading ---------------------------------------------------------------------------------

_NUMBER = re.compile(r"\s*([+-]?(?:\d+(?:\.\d*)?|\.\d+)(?:[eE][+-]?\d+)?)(.*)\Z", re.S)
def parse_quantity(
    text: object, kind: str, field: str, default_unit: str | None = None
) -> float:
    """The SI value of ``text`` (``"68 kPa"``, ``"3.068 in"``, ``"18 degC"``) as a ``kind``.

    text: a string with a number and a unit, or a bare number (``int``/``float``/``"12.5"``),
    which takes ``default_unit`` (None: a bare number is an error, except for the dimensionless
    kinds ``fraction`` and ``salinity``, where it is the kg/kg value itself).
    kind: a key of :data:`KINDS`; the unit must have its dimension.
    field: the field path for errors (``branches[1].length``).

    Returns SI: Pa, m³/s, m, m/s, K, kg/m³, Pa·s, m²/s, m/s², kg/kg. Every failure (empty
    text, no number, NaN, infinity, overflow, unknown unit, wrong dimension) is an InputError
    naming ``field`` and the text.
    """
    spec = _kind(kind)
    shown = describe(text)
    if isinstance(text, bool) or not isinstance(text, (str, int, float)):
        raise InputError(field, shown, "must be a number with a unit, in quotes")
    if isinstance(text, (int, float)):
        try:
            number = float(text)
        except OverflowError:  # an int beyond the float range (TOML integers have no limit)
            raise InputError(field, shown, "is too large to represent") from None
        number, unit = _bare(number, field, shown), ""
    else:
        if not text.strip():
            raise InputError(field, "''", "is empty")
        m = _NUMBER.match(text)
        if m is None:
            raise InputError(field, shown,
                             f"must start with a number, such as '12 {spec.display_si}'")
        number, unit = _bare(float(m.group(1)), field, shown), m.group(2).strip()
        if unit.startswith(",") and unit[1:2].isdigit():
            raise InputError(field, shown, "use a decimal point, not a comma")
    if not unit:
        if default_unit is None and spec.dimension != "[]":
            raise InputError(field, shown, f"needs a unit, such as '{number:g} {spec.display_si}'")
        unit = default_unit or ""
    unit = _trade_spelling(unit, kind)
    return _to_si(number, unit, spec, kind, field, shown)


def _trade_spelling(unit: str, kind: str) -> str:
    """Spellings of the trade pint cannot parse, turned into units it can (or left as typed)."""
    if m := _WATER_COLUMN.match(unit):
        return _WATER_COLUMN_UNIT[m.group("len").lower()]
    if kind == "temperature" and (m := _BARE_TEMPERATURE.match(unit)):
        return f"deg{m.group('scale').upper()}"
    return unit


def _bare(number: float, field: str, shown: str) -> float:
    if not math.isfinite(number):
        raise InputError(field, shown, "must be a finite number")
    return number


def _to_si(number: float, unit: str, spec: Kind, kind: str, field: str, shown: str) -> float:
    import pint

    ureg = registry()
    expression = unit_expression(registry(), unit, field, shown)
    try:
        # The grammar above leaves pint only names and operators; what pint still refuses
        # (a name it reads as a number, such as "nan") comes back as PintError or ValueError.
        units = ureg.parse_units(expression) if expression else ureg.dimensionless
        matches = units.dimensionality == ureg.get_dimensionality(spec.dimension)
        value = (ureg.Quantity(number, units).to(spec.si or ureg.dimensionless).magnitude
                 if matches else None)
    except (pint.errors.PintError, ValueError, OverflowError, ZeroDivisionError) as exc:
        raise InputError(field, shown, f"cannot read the unit: {exc}") from None
    if value is None:
        raise InputError(field, shown, _wrong_dimension(kind, spec))
    value = float(value)
    if not math.isfinite(value):
        raise InputError(field, shown, "is too large to represent")
    return value


def _wrong_dimension(kind: str, spec: Kind) -> str:
    examples = ", ".join(spec.choices[:4])
    hint = {
        "pressure": " (for a water column use ftH2O, inH2O or mH2O)",
        "head": " (a head is a height of the liquid itself)",
    }.get(kind, "")
    return f"is not a {kind.replace('_', ' ')}: use a unit such as {examples}{hint}"


def _kind(kind: str) -> Kind:
    try:
        return KINDS[kind]
    except KeyError:
        raise ValueError(f"unknown kind {kind!r}; one of {', '.join(KINDS)}") from None


def check_unit(unit: str, kind: str, field: str = "unit") -> str:
    """``unit`` if it can express a ``kind`` (for settings and column headers), else InputError."""
    parse_quantity(f"1 {unit}", kind, field)
    return unit


# ---- writing ---------------------------------------------------------------------------------

@cache
def _affine(unit: str, kind: str) -> tuple[float, float]:
    """(scale, offset) such that value_in_unit = scale · value_si + offset."""
    spec = _kind(kind)
    ureg = registry()
    expression = unit_expression(ureg, unit, "unit", unit)
    units = ureg.parse_units(expression) if expression else ureg.dimensionless
    if units.dimensionality != ureg.get_dimensionality(spec.dimension):
        raise InputError("unit", unit, _wrong_dimension(kind, spec))
    si = spec.si or ureg.dimensionless
    zero = float(ureg.Quantity(0.0, si).to(units).magnitude)
    one = float(ureg.Quantity(1.0, si).to(units).magnitude)
    return one - zero, zero


def display_unit(kind: str, system: str = "si") -> str:
    """The unit a ``kind`` is shown in for ``system`` (``si`` or ``us``), as parseable text."""
    spec = _kind(kind)
    if system not in SYSTEMS:
        raise InputError("units", system, "must be si or us")
    return spec.display_us if system == "us" else spec.display_si


def unit_choices(kind: str) -> tuple[str, ...]:
    """Units offered for a ``kind``, most common first (for a picker)."""
    return _kind(kind).choices


def to_unit(value_si: float, kind: str, unit: str) -> float:
    """``value_si`` (SI, see :func:`parse_quantity`) expressed in ``unit``."""
    scale, offset = _affine(unit, kind)
    return value_si * scale + offset


def from_unit(value: float, kind: str, unit: str) -> float:
    """The SI value of ``value`` given in ``unit`` (inverse of :func:`to_unit`)."""
    scale, offset = _affine(unit, kind)
    return (value - offset) / scale


_LABELS = (("degC", "°C"), ("degF", "°F"), ("^2", "²"), ("^3", "³"), ("*", "·"), ("um", "µm"))


def unit_label(unit: str) -> str:
    """``unit`` as printed in tables: ``m^3/h`` → ``m³/h``, ``degC`` → ``°C``."""
    for plain, pretty in _LABELS:
        unit = unit.replace(plain, pretty)
    return unit


def format_number(value: float, digits: int = 4) -> str:
    """``value`` with ``digits`` significant figures, without an exponent for everyday sizes."""
    if not math.isfinite(value):
        return "—"
    if value == 0:
        return "0"
    value = float(f"{value:.{digits - 1}e}")  # round first: 0.99999 → 1.000, not 0.9999x
    magnitude = math.floor(math.log10(abs(value)))
    if magnitude >= 7 or magnitude < -4:
        return f"{value:.{digits - 1}e}"
    decimals = max(0, digits - 1 - magnitude)
    text = f"{value:.{decimals}f}"
    return "0" if float(text) == 0 else text


def format_quantity(
    value_si: float, kind: str, system: str = "si", unit: str | None = None, digits: int = 4
) -> str:
    """Display text for an SI value: ``format_quantity(68000, "pressure")`` → ``"68.00 kPa"``.

    unit: show in this unit instead of the system's display unit.
    """
    unit = unit or display_unit(kind, system)
    return f"{format_number(to_unit(value_si, kind, unit), digits)} {unit_label(unit)}".strip()


def restate(text: str, system: str = "si", units: Mapping[str, str] | None = None) -> str:
    """Marked message text (see ``core.messages``) with its quantities in the user's units.

    system: ``si`` keeps the core's own SI wording unless ``units`` names a unit for the kind;
    ``us`` uses the US display units. units: a unit per kind (the user's display choices).
    """
    from .messages import render, si_text

    chosen = units or {}

    def show(value_si: float, kind: str) -> str:
        unit = chosen.get(kind)
        if kind == "valve" and system == "us":
            from .model import CV_PER_KV

            return f"Cv {value_si * CV_PER_KV:.3g}"
        if kind not in KINDS or (system == "si" and unit is None):
            return si_text(value_si, kind)
        return format_quantity(value_si, kind, system, unit)

    return render(text, show)


def say(item: object, system: str = "si", units: Mapping[str, str] | None = None) -> str:
    """What to show for a warning or an error: its marked text restated, else its own text."""
    text = getattr(item, "marked", "") or (item.message if hasattr(item, "message") else "")
    return one_line(restate(text, system, units)) if text else str(item)


def reason_and_value(
    error: Any, system: str = "si", units: Mapping[str, str] | None = None
) -> tuple[str, object]:
    """An InputError's reason and value (as shown after "got") with the quantities the core
    marked in them restated, for a boundary that words the field its own way."""
    value = error.marked_value
    return (restate(error.marked_reason, system, units),
            restate(value, system, units) if isinstance(value, str) else value)


def fluid_name(fluid: Any, system: str = "si", unit: str | None = None) -> str:
    """A fluid's name with its temperature in ``system``'s unit (or ``unit``): the names the
    fluid models build say "at 6.7 °C"; in US units that reads "at 44.0 °F"."""
    from .fluids._format import celsius

    t = getattr(fluid, "temperature", None)
    if t is None or (system == "si" and unit in (None, "degC")):
        return fluid.name
    shown = format_quantity(t, "temperature", system, unit, digits=3)
    return fluid.name.replace(f" at {celsius(t)} °C", f" at {shown}", 1)
