"""Units at the boundary: text with units in, SI floats out; SI floats in, display text out.

One pint registry for the whole program (:mod:`.registry`, created on first use); the kinds of
quantity a field can hold (:mod:`.kinds`); reading text (:mod:`.parse`, after the unit grammar
of :mod:`.grammar`); writing values and messages for people (:mod:`.display`). pint is imported
only when a unit is first read or written, never by a solver.
"""

from typing import TYPE_CHECKING, Any

from .display import (
    Units,
    display_unit,
    fluid_name,
    format_number,
    format_quantity,
    from_unit,
    reason_and_value,
    restate,
    say,
    temperature_step,
    to_unit,
    unit_choices,
    unit_label,
    units_for,
)
from .kinds import KINDS, SYSTEMS, Kind, spec_of
from .registry import WATER_COLUMN_DENSITY, registry

if TYPE_CHECKING:
    from .parse import check_unit, parse_quantity


def __getattr__(name: str) -> Any:
    """The reader of typed values (:mod:`.parse`, with the number and unit grammars) loads when
    first asked for: the app's first screen shows text as typed and needs none of it."""
    if name in ("check_unit", "parse_quantity"):
        from . import parse

        return getattr(parse, name)
    raise AttributeError(f"module {__name__!r} has no attribute {name!r}")


__all__ = [
    "Units",
    "KINDS",
    "SYSTEMS",
    "WATER_COLUMN_DENSITY",
    "Kind",
    "check_unit",
    "display_unit",
    "fluid_name",
    "format_number",
    "format_quantity",
    "from_unit",
    "parse_quantity",
    "reason_and_value",
    "registry",
    "restate",
    "say",
    "spec_of",
    "temperature_step",
    "to_unit",
    "unit_choices",
    "unit_label",
    "units_for",
]
