"""Text with units in, SI floats out: ``"68 kPa"`` → 68000.0 as a pressure.

Offset temperatures are handled by splitting the number from the unit and building
``Quantity(60, "degC")``: pint refuses ``Quantity("60 degC")`` arithmetic on offset units.
Spellings of the trade that pint cannot parse (``in wc``, ``"WC``, a bare ``C`` or ``F`` in a
temperature field) are turned into units it can; ``mil`` is read as pint's ``thou`` (0.001 in;
pint's own ``mil`` is an angle), ``"`` as inches and ``'`` as feet, as on drawings
(:mod:`.grammar`).
"""

from __future__ import annotations

import math
import re

from ..errors import InputError, describe
from .grammar import unit_expression
from .kinds import Kind, spec_of
from .registry import registry

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
    spec = spec_of(kind)
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
        raise InputError(field, shown, wrong_dimension(kind, spec))
    value = float(value)
    if not math.isfinite(value):
        raise InputError(field, shown, "is too large to represent")
    return value


def wrong_dimension(kind: str, spec: Kind) -> str:
    examples = ", ".join(spec.choices[:4])
    hint = {
        "pressure": " (for a water column use ftH2O, inH2O or mH2O)",
        "head": " (a head is a height of the liquid itself)",
    }.get(kind, "")
    return f"is not a {kind.replace('_', ' ')}: use a unit such as {examples}{hint}"


def check_unit(unit: str, kind: str, field: str = "unit") -> str:
    """``unit`` if it can express a ``kind`` (for settings and column headers), else InputError."""
    parse_quantity(f"1 {unit}", kind, field)
    return unit
