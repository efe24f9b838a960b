"""Reading single values of a site as typed: text, plain numbers, quantities with units.

Every failure is an :class:`~branchwise.core.errors.InputError` naming the field path.
"""

from __future__ import annotations

import math
import re
import threading
from typing import TYPE_CHECKING

from ..errors import InputError, describe
from ..units import parse_quantity
from ..units.numbers import plain_float
from .spec import Value

if TYPE_CHECKING:
    from ..catalogs import PipeSize

# ---- values --------------------------------------------------------------------------------

_BARE = re.compile(r"\s*[+-]?(?:\d+(?:\.\d*)?|\.\d+)(?:[eE][+-]?\d+)?\s*\Z")


def is_bare_number(value: Value) -> bool:
    """A number with no unit: a TOML number, or a text of one (``3``, ``"0.3"``)."""
    if isinstance(value, bool):
        return False
    return isinstance(value, int | float) or (isinstance(value, str)
                                              and _BARE.match(value) is not None)


def quantity(value: Value, kind: str, path: str) -> float:
    """The SI value of a quantity typed at ``path``, which must be there."""
    if value is None:
        raise InputError(path, "nothing", "is required")
    return parse_quantity(value, kind, path)


def optional_quantity(value: Value, kind: str, path: str) -> float | None:
    """The SI value of a quantity typed at ``path``, or None when it is not there."""
    return None if value is None else parse_quantity(value, kind, path)


SIZE_CACHE_SIZE = 1024
"""How many size texts are kept read (see :func:`size_or_bore`)."""

_sizes: dict[tuple[str, str | None], tuple[PipeSize | None, float]] = {}
_sizes_lock = threading.Lock()


def size_or_bore(text: str, path: str,
                 default_unit: str | None = None) -> tuple[PipeSize | None, float]:
    """:func:`read_size_or_bore`, remembered: a size text read once (the catalogs are shipped
    and read once) is not read again; errors are never remembered, so that each names its own
    field. At most :data:`SIZE_CACHE_SIZE` texts are kept."""
    key = (text, default_unit)
    found = _sizes.get(key)
    if found is None:
        found = read_size_or_bore(text, path, default_unit)
        with _sizes_lock:
            if len(_sizes) >= SIZE_CACHE_SIZE:
                _sizes.clear()
            _sizes[key] = found
    return found


def read_size_or_bore(text: str, path: str,
                      default_unit: str | None = None) -> tuple[PipeSize | None, float]:
    """A size field read as the site file reads it: (the catalog size, its bore in m), or
    (None, the bore) for a bore written as one (``ID 3 in``, ``bore 77.9 mm``) or a plain length
    that is no nominal size (``77.9 mm``). A plain length that is also a nominal size (``3 in``,
    ``80 mm``) is refused with the choices (:mod:`~branchwise.core.catalogs.bare_size`).
    default_unit: the unit of a bare number (the app's; a site file needs a unit)."""
    from ..catalogs import parse_size
    from ..catalogs.bare_size import bore_text, refusal

    bore = bore_text(text)
    if bore is not None:
        return None, parse_quantity(bore, "diameter", path, default_unit)
    size = parse_size(text, path)
    if size is not None:
        return size, size.inner_diameter_m
    error = refusal(text, path)
    if error is not None:
        raise error
    return None, parse_quantity(text, "diameter", path, default_unit)


def plain_number(value: Value, path: str) -> float | None:
    """A plain number (K, Kv, Cv, counts): a TOML number or text holding only a number; None
    when absent."""
    if value is None:
        return None
    return number(value, path)


def number(value: Value, path: str) -> float:
    """A plain number that must be there (see :func:`plain_number`)."""
    if value is None:
        raise InputError(path, "nothing", "is required")
    if isinstance(value, bool):
        raise InputError(path, describe(value), "must be a number")
    typed = value
    if isinstance(value, str):
        try:
            value = plain_float(value.strip())
        except ValueError:
            raise InputError(path, describe(typed), "must be a plain number") from None
    try:
        number = float(value)
    except OverflowError:  # a TOML integer has no size limit; a float stops near 1.8e308
        raise InputError(path, describe(typed), "must be a finite number") from None
    if not math.isfinite(number):  # quoted as typed ("1e400"), not as read ("inf")
        raise InputError(path, describe(typed), "must be a finite number")
    return number


def at_least(number: float | None, path: str, value: Value, low: float, strict: bool) -> None:
    """InputError unless ``number`` is ≥ ``low`` (> ``low`` when ``strict``); None passes."""
    if number is not None and (number < low or (strict and number == low)):
        raise InputError(path, describe(value), "must be positive" if strict and low == 0
                         else "must not be negative")


def text_value(value: Value, path: str) -> str | None:
    """Non-empty text, stripped (None when absent)."""
    if value is None:
        return None
    if not isinstance(value, str) or not value.strip():
        raise InputError(path, describe(value), "must be non-empty text")
    return value.strip()
