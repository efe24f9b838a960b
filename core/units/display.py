"""SI floats in, display text out: a value in the user's unit, restated messages.

The display unit of each kind of quantity depends on the unit system (``si`` or ``us``) or on
the user's own choice; quantities the core marked inside a message (``core.messages``) are
restated here in those units.
"""

from __future__ import annotations

import math
from collections.abc import Mapping
from dataclasses import dataclass, field
from functools import cache
from typing import Any

from ..errors import InputError, one_line
from .kinds import KINDS, SYSTEMS, spec_of
from .registry import registry

# ---- writing ---------------------------------------------------------------------------------


@cache
def _affine(unit: str, kind: str) -> tuple[float, float]:
    """(scale, offset) such that value_in_unit = scale · value_si + offset."""
    from .aliases import resolve  # the unit grammar loads with pint, after the first screen
    from .grammar import unit_expression
    from .parse import wrong_dimension

    spec = spec_of(kind)
    ureg = registry()
    expression = unit_expression(ureg, resolve(unit, kind), "unit", unit)
    units = ureg.parse_units(expression) if expression else ureg.dimensionless
    if units.dimensionality != ureg.get_dimensionality(spec.dimension):
        raise InputError("unit", unit, wrong_dimension(kind, spec))
    si = spec.si or ureg.dimensionless
    zero = float(ureg.Quantity(0.0, si).to(units).magnitude)
    one = float(ureg.Quantity(1.0, si).to(units).magnitude)
    return one - zero, zero


def display_unit(kind: str, system: str = "si") -> str:
    """The unit a ``kind`` is shown in for ``system`` (``si`` or ``us``), as parseable text."""
    spec = spec_of(kind)
    if system not in SYSTEMS:
        raise InputError("units", system, "must be si or us")
    return spec.display_us if system == "us" else spec.display_si


def unit_choices(kind: str) -> tuple[str, ...]:
    """Units offered for a ``kind``, most common first (for a picker)."""
    return spec_of(kind).choices


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


def temperature_step(unit: str) -> tuple[float, str]:
    """How a difference of temperatures is shown beside temperatures shown in ``unit``: the
    size of one kelvin in that unit's degrees, and the label — kelvins for kelvins and degrees
    Celsius (a degree Celsius is a kelvin), else the unit's own (1 K = 1.8 °F, by the scales'
    definitions)."""
    try:
        scale, _ = _affine(unit, "temperature")
    except (InputError, ValueError):  # a unit that does not read: the SI words
        return 1.0, "K"
    return (1.0, "K") if math.isclose(scale, 1.0) else (scale, unit_label(unit))


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
    from ..messages import base_kind, render, si_text, trade_round

    chosen = units or {}

    def show(value_si: float, marked_kind: str) -> str:
        kind, limit = base_kind(marked_kind)
        unit = chosen.get(kind)
        if kind == "valve" and system == "us":
            from ..model import CV_PER_KV

            return f"Cv {value_si * CV_PER_KV:.3g}"
        if kind == "temperature_difference":  # in the degrees temperatures are shown in
            scale, label = temperature_step(chosen.get("temperature")
                                            or display_unit("temperature", system))
            return f"{value_si * scale:.3g} {label}"
        if kind not in KINDS or (system == "si" and unit is None):
            return si_text(value_si, kind)
        if limit:  # a limit in another unit: rounded as the trade quotes it
            shown = unit or display_unit(kind, system)
            number = trade_round(to_unit(value_si, kind, shown))
            return f"{number:g} {unit_label(shown)}".strip()
        return format_quantity(value_si, kind, system, unit)

    return render(text, show)


def say(item: object, system: str = "si", units: Mapping[str, str] | None = None) -> str:
    """What to show for a warning, an error or a note (text that may hold marked quantities):
    its marked text restated, else its own text."""
    if isinstance(item, str):  # a note: its quantities may be marked
        return one_line(restate(item, system, units))
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
    from ..fluids._format import PRESSURE_IN_NAME, celsius

    t = getattr(fluid, "temperature", None)
    name = str(fluid.name)
    if system != "si":  # the pressure a model names (", 250 kPa") in the reader's system too
        at = PRESSURE_IN_NAME.search(name)
        if at is not None:
            shown_p = format_quantity(float(at[1]) * 1e3, "pressure", system, digits=4)
            name = f"{name[:at.start()]}, {shown_p}"
    if t is None or (system == "si" and unit in (None, "degC")):
        return name
    shown = format_quantity(t, "temperature", system, unit, digits=3)
    return name.replace(f" at {celsius(t)} °C", f" at {shown}", 1)


@dataclass(frozen=True)
class Units:
    """How one reader wants quantities shown: a unit system and, per kind of quantity, any
    unit chosen instead of the system's (the app's display settings; a report's ``--units``).

    Every text for people — the CLI's table, the CSV, the walkdown record and the app's
    screens — formats its quantities through one of these, so that they all agree.
    """

    system: str = "si"
    chosen: Mapping[str, str] = field(default_factory=dict)

    def unit(self, kind: str) -> str:
        """The unit a ``kind`` is shown in (and a bare number typed for it is read in)."""
        return self.chosen.get(kind) or display_unit(kind, self.system)

    def label(self, kind: str) -> str:
        """That unit as printed: ``m³/h``, ``°C``."""
        return unit_label(self.unit(kind))

    def value(self, value_si: float, kind: str) -> float:
        """``value_si`` in this reader's unit."""
        return to_unit(value_si, kind, self.unit(kind))

    def number(self, value_si: float, kind: str, digits: int = 4) -> str:
        """The number alone, in this reader's unit: ``68.00``."""
        return format_number(self.value(value_si, kind), digits)

    def quantity(self, value_si: float, kind: str, digits: int = 4) -> str:
        """The number and its unit: ``68.00 kPa``."""
        return format_quantity(value_si, kind, self.system, self.unit(kind), digits)

    def say(self, item: object) -> str:
        """A warning's or an error's text, its marked quantities in this reader's units."""
        return say(item, self.system, self.chosen)

    def restate(self, text: str) -> str:
        """Marked message text with its quantities in this reader's units."""
        return restate(text, self.system, self.chosen)

    def fluid_name(self, fluid: Any) -> str:
        """A liquid's name, its temperature in this reader's temperature unit."""
        return fluid_name(fluid, self.system, self.unit("temperature"))


def units_for(reader: Units | str) -> Units:
    """``reader`` as :class:`Units`: a unit system's name (``si``, ``us``) stands for that
    system with no unit chosen."""
    return reader if isinstance(reader, Units) else Units(reader)
