"""The number in front of a unit, as people write it.

``12.5``, ``-3``, ``1e-3``; fractions as drawings write them: ``3/4``, ``1-1/2``, ``1 1/2``,
``1½``; a thousands comma, ``2,000`` (marked, for the caller to read only with US customary
units, where no one writes a decimal comma); and feet with inches, ``180'-6"``, ``180' 6"``,
``180 ft 6 in``, ``6' 4-1/2"``, read as inches. A decimal comma (``2,5``) is not read here: the
caller refuses it.
"""

from __future__ import annotations

import re
from dataclasses import dataclass
from fractions import Fraction

from ..errors import InputError

VULGAR = {
    "½": Fraction(1, 2), "⅓": Fraction(1, 3), "⅔": Fraction(2, 3), "¼": Fraction(1, 4),
    "¾": Fraction(3, 4), "⅕": Fraction(1, 5), "⅖": Fraction(2, 5), "⅗": Fraction(3, 5),
    "⅘": Fraction(4, 5), "⅙": Fraction(1, 6), "⅚": Fraction(5, 6), "⅛": Fraction(1, 8),
    "⅜": Fraction(3, 8), "⅝": Fraction(5, 8), "⅞": Fraction(7, 8),
}
"""The vulgar-fraction characters of Unicode a drawing's text may hold, and their values."""

_V = "[" + "".join(VULGAR) + "]"
_DECIMAL = r"(?:\d+(?:\.\d*)?|\.\d+)(?:[eE][+-]?\d+)?"
_GROUPED = r"\d{1,3}(?:,\d{3})+(?:\.\d+)?(?!\d)"
_FRACTION = rf"(?:\d+\s*[- ]\s*\d+\s*/\s*\d+|\d+\s*/\s*\d+|\d*\s*{_V})"
_LEADING = re.compile(
    rf"\s*(?P<sign>[+-]?)(?:(?P<fraction>{_FRACTION})|(?P<grouped>{_GROUPED})|"
    rf"(?P<decimal>{_DECIMAL}))(?P<rest>.*)\Z", re.S)
_FEET_INCHES = re.compile(
    rf"\s*(?P<ft>{_GROUPED}|{_DECIMAL})\s*(?:'|′|’|ft\.?|feet|foot)\s*(?:-\s*)?"
    rf"(?P<inch>{_FRACTION}|{_DECIMAL})\s*(?:\"|″|”|''|in\.?|inch|inches)\s*\Z", re.I)
MAX_DIGITS = 40
"""Digits in a fraction's parts; more is no measurement (and would make a huge Fraction)."""


@dataclass(frozen=True)
class Leading:
    """A text's leading number and the rest (its unit). grouped: written with a thousands
    comma; feet_inches: a feet-and-inches length, the value in inches and the unit ``in``."""

    value: float
    unit: str
    grouped: bool = False
    feet_inches: bool = False


def plain_float(value: str | float) -> float:
    """``float(value)`` for a number as a person writes it (a number, as it is). Python also
    reads its own digit separator in a text, the underscore, which no one writes in a
    measurement: ``6_5`` would be 65. Such a text is refused (a ValueError, as any text that is
    no number), not read."""
    if isinstance(value, str) and "_" in value:
        raise ValueError(f"not a plain number: {value!r}")
    return float(value)


def leading_number(text: str, field: str, shown: str) -> Leading | None:
    """The number ``text`` starts with (None: it starts with none). InputError for a fraction
    over zero, or inches of 12 or more in a feet-and-inches length."""
    if m := _FEET_INCHES.match(text):
        feet = Fraction(m["ft"].replace(",", ""))
        inches = _exact(m["inch"], field, shown)
        if inches >= 12:
            raise InputError(field, shown, "has 12 inches or more after the feet: write "
                             f"{feet} ft {_plain(inches)} in as {_plain(feet * 12 + inches)} in")
        return Leading(float(feet * 12 + inches), "in", "," in m["ft"], True)
    m = _LEADING.match(text)
    if m is None:
        return None
    sign = -1 if m["sign"] == "-" else 1
    if m["fraction"] is not None:
        return Leading(sign * float(_exact(m["fraction"], field, shown)), m["rest"].strip())
    if m["grouped"] is not None:
        return Leading(sign * float(m["grouped"].replace(",", "")), m["rest"].strip(), True)
    return Leading(sign * float(m["decimal"]), m["rest"].strip())


def _exact(text: str, field: str, shown: str) -> Fraction:
    """``1-1/2``, ``1 1/2``, ``3/4``, ``1½``, ``½``, ``6.5`` as an exact Fraction."""
    text = " ".join(text.split())
    if sum(c.isdigit() for c in text) > MAX_DIGITS:
        raise InputError(field, shown, "has too many digits")
    if text[-1] in VULGAR:
        whole = text[:-1].strip()
        return (Fraction(int(whole)) if whole else Fraction(0)) + VULGAR[text[-1]]
    mixed = re.fullmatch(r"(\d+)\s*[- ]\s*(\d+)\s*/\s*(\d+)", text)
    top, _, bottom = (mixed[2], "/", mixed[3]) if mixed else text.partition("/")
    if bottom and int(bottom) == 0:
        raise InputError(field, shown, "has a fraction over zero")
    part = Fraction(int(top), int(bottom)) if bottom else Fraction(top)
    return int(mixed[1]) + part if mixed else part


def _plain(value: Fraction) -> str:
    return f"{float(value):g}"
