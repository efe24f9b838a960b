"""The grammar a unit must follow before pint reads it.

pint's parser accepts Python-like expressions; a damaged file or a stray keystroke can ask it
for a power of a power or a thousand names. :func:`unit_expression` reads the unit with a small
grammar of its own first and hands pint only names and operators.
"""

from __future__ import annotations

import re
from typing import TYPE_CHECKING, Any

from ..errors import InputError, describe
from .aliases import NAME_ALIASES

if TYPE_CHECKING:
    import pint

GAUGE = {"psig": "psi", "barg": "bar", "kpag": "kPa"}
"""Gauge-pressure spellings, refused in a pressure difference, with the unit to write instead."""
ABSOLUTE = {"psia": "psi", "bara": "bar", "kpaa": "kPa"}
"""Absolute-pressure spellings, likewise: the unit alone says it where a pressure is absolute."""

_TOKEN = re.compile(
    r"\s*(?:(\*\*|\^)|([*/·()])|([^\W\d][\w°µ]*|°[CF]|[℃℉″”′’%\"'])|([+-]?\d+)|(\S))")
_SUPERSCRIPT = str.maketrans({"²": "^2", "³": "^3", "⁻": "^-", "¹": "1"})
_POWER_SUFFIX = re.compile(r"([A-Za-z]+)([23])\Z")


MAX_UNIT_NAMES, MAX_UNIT_PARENTHESES, MAX_UNIT_NAME_LENGTH = 12, 4, 48
"""Caps on one unit: names (``kg/m^3`` has two), parentheses inside each other, and letters
in a name (pint's longest has 41); beyond them the text is refused unread."""


def unit_expression(ureg: pint.UnitRegistry[Any], text: str, field: str, value: object) -> str:
    """Check ``text`` against a small unit grammar and return it in pint's syntax.

    Grammar: names joined by ``*``, ``/``, ``·`` or spaces, each optionally raised to a whole
    power with ``^`` or ``**``, with parentheses. ``m3`` means ``m^3``. Checking first keeps
    pint's parser (which accepts arbitrary Python-like expressions) away from junk; the caps
    on names and parentheses keep it below its recursion limit, which a damaged file can
    otherwise reach (``m*m*m*...`` a few hundred times).
    """
    out: list[str] = []
    depth = names = 0
    expect_operand = True
    text = text.translate(_SUPERSCRIPT)
    pos = 0
    while pos < len(text):
        m = _TOKEN.match(text, pos)
        if m is None:  # only trailing blanks remain
            break
        pos = m.end()
        power, op, name, integer, junk = m.groups()
        if junk is not None:
            raise InputError(field, value, f"{describe(junk)!r} cannot appear in a unit")
        if name is not None:
            name = NAME_ALIASES.get(name, name)
            if not is_unit(ureg, name):
                stem = _POWER_SUFFIX.match(name)
                if stem and is_unit(ureg, stem.group(1)):
                    name = f"{stem.group(1)}**{stem.group(2)}"
                else:
                    raise InputError(field, value,
                                     f"unknown unit '{describe(name, 40)}'{hint(name, field)}")
            if not expect_operand:
                out.append("*")
            out.append(name)
            expect_operand = False
            names += 1
            if names > MAX_UNIT_NAMES:
                raise InputError(field, value, f"the unit is too long (more than "
                                 f"{MAX_UNIT_NAMES} unit names)")
        elif op == "(":
            if not expect_operand:
                out.append("*")
            out.append("(")
            depth += 1
            expect_operand = True
            if depth > MAX_UNIT_PARENTHESES:
                raise InputError(field, value, f"parentheses in the unit are nested more than "
                                 f"{MAX_UNIT_PARENTHESES} deep")
        elif op == ")":
            depth -= 1
            if depth < 0 or expect_operand:
                raise InputError(field, value, "unbalanced parentheses in the unit")
            out.append(")")
        elif op is not None or power is not None:
            if expect_operand:
                raise InputError(field, value, "a unit operator has nothing on its left")
            if power is not None:
                if out[-1].startswith("**"):  # m^9^9^9 would have pint compute 9^387420489
                    raise InputError(field, value, "a unit power cannot be raised to a power")
                exp = _TOKEN.match(text, pos)
                digits = exp.group(4) if exp is not None else None
                if (exp is None or digits is None or len(digits) > 3
                        or not 0 < abs(int(digits)) <= 9):
                    raise InputError(field, value, "a unit power must be a whole number, "
                                     "-9 to 9, not 0")
                pos = exp.end()
                out.append(f"**{int(digits)}")
            else:
                out.append("*" if op == "·" else op)
                expect_operand = True
        else:
            raise InputError(field, value, "a number can only follow the unit as a power (m^3)")
    if depth != 0 or (expect_operand and out):
        raise InputError(field, value, "the unit is incomplete")
    return "".join(out)


def is_unit(ureg: pint.UnitRegistry[Any], name: str) -> bool:
    """Whether pint knows ``name``; names pint keeps private ("_x", "x__") are not units, nor
    is text its parser cannot read as one name (``¼`` is a word character to a regular
    expression but not a Python identifier, and trips an assertion inside pint)."""
    if name.startswith("_") or name.endswith("__") or not (name.isidentifier() or name == "%"):
        return False
    if len(name) > MAX_UNIT_NAME_LENGTH:  # pint's preprocessing takes time growing as length²
        return False
    import pint

    try:
        return name in ureg
    except (ValueError, AttributeError, pint.errors.PintError):  # "nan", "inf"; "mdegC"
        return False


ATMOSPHERE = {"psi": "14.696 psi", "bar": "1.01325 bar", "kPa": "101.325 kPa"}
"""The standard atmosphere (101 325 Pa, by definition) in each gauge unit's own unit."""


def hint(name: str, field: str = "") -> str:
    """A short suggestion for an unknown unit name ('' when there is none); ``field``: where
    it was typed (an absolute pressure is told to add the atmosphere)."""
    key = name.casefold()
    if key in GAUGE or key in ABSOLUTE:
        unit = GAUGE.get(key) or ABSOLUTE[key]
        if field.endswith("pressure") and not field.endswith("pressure_drop"):  # absolute
            if key in ABSOLUTE:
                return f" (this pressure is absolute already: write {unit})"
            return (f" (a gauge reading; this pressure is absolute: add the atmosphere, "
                    f"{ATMOSPHERE[unit]}, and write {unit})")
        return (f" (a pressure difference has no gauge offset: write {unit}; an absolute "
                "pressure needs the atmosphere added)")
    from .kinds import KINDS

    known = {c for k in KINDS.values() for c in k.choices} | {"psid", "gpm", "degC", "degF"}
    close = [c for c in sorted(known) if c.casefold() == name.casefold()]
    return f" (did you mean '{close[0]}'?)" if close else ""
