"""Text with units in, SI floats out: ``"68 kPa"`` → 68000.0 as a pressure.

Offset temperatures are handled by splitting the number from the unit and building
``Quantity(60, "degC")``: pint refuses ``Quantity("60 degC")`` arithmetic on offset units.
The number is read as people write it (:mod:`.numbers`: ``3/4``, ``1½``, ``180'-6"``,
``2,000`` with US customary units); trade spellings pint misreads or refuses (``cp`` in a
viscosity, ``ft hd``, ``US gpm``, ``in wc``, a bare ``C`` or ``F`` in a temperature field) are
turned into units it can read (:mod:`.aliases`); ``mil`` is ``thou`` (0.001 in; pint's own
``mil`` is an angle), ``"`` inches and ``'`` feet, as on drawings. A unit that reads as the wrong
kind of quantity is refused naming what pint read it as (``'cp' reads as a cup, a volume``).
"""

from __future__ import annotations

import math
import re
import threading
from typing import TYPE_CHECKING, Any

from ..errors import InputError, describe
from .aliases import alias_elsewhere, resolve
from .grammar import unit_expression
from .kinds import KINDS, Kind, spec_of
from .numbers import leading_number
from .registry import registry

if TYPE_CHECKING:
    import pint

# ---- reading ---------------------------------------------------------------------------------

US_CUSTOMARY = frozenset({
    "foot", "inch", "yard", "mile", "thou", "gallon", "imperial_gallon", "US_gallon_per_minute",
    "imperial_gallon_per_minute", "US_gallon_per_hour", "million_US_gallon_per_day",
    "cubic_foot_per_second", "pound_force_per_square_inch", "psi_differential", "pound",
    "pound_force", "degree_Fahrenheit", "foot_H2O", "inch_H2O", "degree_Rankine",
    "kip_per_square_inch", "barrel", "acre_foot",
})
"""pint's names of the US customary units: a thousands comma is read with these only (where no
one writes a decimal comma); ``2,000 m`` could be either and is refused."""


READ_CACHE_SIZE = 4096
"""How many (text, kind, default unit) readings are kept: the app reads the whole site on
every keystroke, and a site of a few hundred branches repeats the same few texts."""

_read: dict[tuple[type, object, str, str | None], float] = {}
_read_lock = threading.Lock()


def parse_quantity(
    text: object, kind: str, field: str, default_unit: str | None = None
) -> float:
    """The SI value of ``text`` as a ``kind`` (see :func:`read_quantity`), remembered.

    A text read once is not read again: the value depends only on the text, the kind and the
    default unit (the field path only names an error, and errors are never remembered, so that
    each names its own field). At most :data:`READ_CACHE_SIZE` readings are kept.
    """
    if not isinstance(text, (str, int, float)):
        return read_quantity(text, kind, field, default_unit)
    key = (type(text), text, kind, default_unit)  # the type: True is 1, 1 is 1.0 to a dict
    value = _read.get(key)
    if value is None:
        value = read_quantity(text, kind, field, default_unit)
        with _read_lock:
            if len(_read) >= READ_CACHE_SIZE:
                _read.clear()
            _read[key] = value
    return value


def read_quantity(
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
    naming ``field`` and the text as typed.
    """
    spec = spec_of(kind)
    shown = describe(text)
    grouped = False
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
        lead = leading_number(text, field, shown)
        if lead is None:
            raise InputError(field, shown,
                             f"must start with a number, such as '12 {spec.display_si}'")
        number, unit, grouped = _bare(lead.value, field, shown), lead.unit, lead.grouped
        if unit.startswith(",") and unit[1:2].isdigit():
            pointed = describe(text.strip().replace(",", ".", 1), 30)
            raise InputError(field, shown, f"use a decimal point, not a comma: write {pointed}")
    if not unit:
        if default_unit is None and spec.dimension != "[]":
            raise InputError(field, shown, f"needs a unit, such as '{number:g} {spec.display_si}'")
        unit = default_unit or ""
    return _to_si(number, resolve(unit, kind), spec, kind, field, shown, unit, grouped)


def _bare(number: float, field: str, shown: str) -> float:
    if not math.isfinite(number):
        raise InputError(field, shown, "must be a finite number")
    return number


def _to_si(number: float, unit: str, spec: Kind, kind: str, field: str, shown: str,
           typed: str = "", grouped: bool = False) -> float:
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
        raise InputError(field, shown, wrong_dimension(kind, spec, typed, units))
    if kind == "temperature" and "delta_" in expression:  # read as kelvins above 0 K
        raise InputError(field, shown, "is a temperature difference, not a temperature: write "
                         "degC, degF or K")
    if grouped and not _us_customary(ureg, expression):
        raise InputError(field, shown, "has a comma that may group thousands or mark decimals; "
                         "with metric units write the number without it (2000, or 2.000)")
    value = float(value) + 0.0  # -0 m is 0 m (no minus sign carried to an output)
    if not math.isfinite(value):
        raise InputError(field, shown, "is too large to represent")
    return value


def _us_customary(ureg: pint.UnitRegistry[Any], expression: str) -> bool:
    names = re.findall(r"[^\W\d]\w*", expression)
    return any(ureg.get_name(name) in US_CUSTOMARY for name in names)


_DIMENSIONS = {
    "[length] ** 3": "a volume", "[length] ** 2": "an area", "[time]": "a time",
    "[mass]": "a mass", "1 / [time]": "a rate per time",
    "dimensionless": "a pure number or an angle",
    "[mass] / [length] ** 2": "a mass per area", "[length] * [time]": "a length × time",
    "[length] * [mass] / [time] ** 2": "a force", "[mass] / [time]": "a mass flow",
    "[length] ** 2 * [mass] / [time] ** 2": "an energy",
}
_KIND_WORDS = {"viscosity": "dynamic viscosity", "diameter": "length", "roughness": "length",
               "head": "length", "fraction": "pure number", "salinity": "pure number"}


def dimension_words(dimensionality: object) -> str:
    """A dimension as people name it: ``a volume``, ``a pressure``, ``a length``."""
    ureg = registry()
    for kind, spec in KINDS.items():
        if spec.dimension != "[]" and ureg.get_dimensionality(spec.dimension) == dimensionality:
            word = _KIND_WORDS.get(kind, kind.replace("_", " "))
            return f"a {word}"
    text = str(dimensionality)
    return _DIMENSIONS.get(text, f"of dimension {text}")


def wrong_dimension(kind: str, spec: Kind, typed: str = "", units: object = None) -> str:
    """The reason for a unit of the wrong dimension: what it was read as, the unit a trade
    spelling of it means elsewhere, and units that would do."""
    examples = ", ".join(spec.choices[:4])
    hint = {
        "pressure": " (for a water column use ftH2O, inH2O or mH2O)",
        "head": " (a head is a height of the liquid itself)",
    }.get(kind, "")
    read = ""
    if typed and units is not None:
        dimension = dimension_words(getattr(units, "dimensionality", ""))
        name = (str(units).replace(" * ", "·").replace(" ** ", "^").replace(" / ", "/")
                .replace("_", " "))  # US_gallon_per_minute: the registry's name, in words
        read = f"'{describe(typed, 30)}' reads as {_article(name)}{name}, {dimension}"
        other = alias_elsewhere(typed, kind)
        if other is not None and other.unit.replace(" ", "") != typed.replace(" ", ""):
            ureg = registry()
            means = dimension_words(ureg.parse_units(other.unit).dimensionality)
            read += f"; {other.meaning} is '{other.unit}', {means}"
        read = f": {read};"
    else:
        read = ":"
    what = kind.replace("_", " ")
    return f"is not {_article(what)}{what}{read} use a unit such as {examples}{hint}"


def _article(name: str) -> str:
    """'a '/'an ' before a single unit's name (a cup, an inch); none before a compound."""
    if not name[:1].isalpha() or any(c in name for c in "·/^"):
        return ""
    return "an " if name[0] in "aeiou" or name.startswith("hour") else "a "


def check_unit(unit: str, kind: str, field: str = "unit") -> str:
    """``unit`` if it can express a ``kind`` (for settings and column headers), else InputError."""
    parse_quantity(f"1 {unit}", kind, field)
    return unit
