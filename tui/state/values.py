"""Site values as the app shows and takes them: text in a field, a bare number with its unit,
a branch's name.

Nothing here imports Textual, numpy or pint, so the first screen can be drawn before they load.
"""

from __future__ import annotations

import math
import re
from dataclasses import fields, is_dataclass
from pathlib import Path

from branchwise.core.errors import inert
from branchwise.core.names import name_key
from branchwise.core.site.spec import Site

_BARE = re.compile(r"\s*[+-]?(?:\d+(?:\.\d*)?|\.\d+)(?:[eE][+-]?\d+)?\s*\Z")
_PLAIN_ID = re.compile(
    r"\s*(?:\d+(?:\.\d*)?|\.\d+)(?:[eE][+-]?\d+)?\s*(?:mm|cm|m|in|inch|inches|\"|ft|um|µm)?\s*\Z"
)


def is_bare_number(text: str) -> bool:
    """True for ``"64"`` or ``"-1.5e3"``: a number without a unit."""
    return bool(_BARE.match(text))


def bare_number(text: str) -> int | float | str:
    """A text :func:`is_bare_number` accepts, as a site file's TOML would hold it: an integer
    for digits alone (``0`` is kept, and quoted back in an error, as 0, not 0.0), else a
    float; one beyond a float (``1e400``, ``1e-400``) stays the text typed, so that its
    refusal quotes it (not "inf", not 0)."""
    text = text.strip()
    digits = text.lstrip("+-")
    # an integer only while a float holds it exactly (and TOML's 64-bit integers do): a pasted
    # run of digits stays a float, refused as too large where it is, not a 4,000-digit int
    if digits.isdigit() and len(digits) <= 15:
        return int(text)
    number = float(text)
    if number in (math.inf, -math.inf):
        return text
    if number == 0 and any(c in "123456789" for c in digits.lower().split("e")[0]):
        return text  # below a float's least (1e-400): kept as typed, not read as 0
    return number


def with_unit(text: str, unit: str) -> str:
    """``text`` as it should be kept: a bare number gets ``unit`` (the field's display unit)."""
    text = text.strip()
    return f"{text} {unit}" if unit and is_bare_number(text) else text


def is_plain_diameter(text: str) -> bool:
    """True when a size field holds an inner diameter (``77.9 mm``, ``3.068"``), not a catalog
    size (``3 in sch 40``, ``DN80``, ``1-1/2 type L``)."""
    return bool(_PLAIN_ID.match(text))


def text_of(value: object) -> str:
    """A site value as shown in a field: '' for nothing, numbers without a trailing '.0'."""
    if value is None:
        return ""
    if isinstance(value, float) and value.is_integer():
        return str(int(value))
    return str(value)


def shown_path(path: Path) -> str:
    """A path as a person reads it: absolute, with ``~`` for the home folder
    (``./site.toml`` → ``~/plant/site.toml``), control characters in a name shown escaped."""
    full = Path(path).expanduser().absolute()
    try:
        return inert(str(Path("~") / full.relative_to(Path.home())))
    except ValueError:
        return inert(str(full))


_NOT_VALUES = ("source", "origin")
"""Fields of a site that are not values typed (the file it came from, its text)."""


_FIELD_NAMES: dict[type, tuple[str, ...] | None] = {}


def field_names(kind: type) -> tuple[str, ...] | None:
    """The field names of a dataclass type, worked out once per type (an edit walks every
    object of a site, on every keystroke); None for any other type."""
    try:
        return _FIELD_NAMES[kind]
    except KeyError:
        names = tuple(item.name for item in fields(kind)) if is_dataclass(kind) else None
        _FIELD_NAMES[kind] = names
        return names


def make_inert(spec: object) -> bool:
    """Show every control character in the texts of a site (a dataclass tree) escaped, in
    place: a name, tag, note or record line from a file then cannot reach the terminal as a
    command (clear the screen, set the window title). True if anything was changed."""
    names = field_names(type(spec))
    if names is None:
        return False
    changed = False
    for name in names:
        if name in _NOT_VALUES:
            continue
        new, touched = _inert_value(getattr(spec, name))
        if touched:
            setattr(spec, name, new)
            changed = True
    return changed


def _inert_value(value: object) -> tuple[object, bool]:
    """``value`` with its texts made inert, and whether anything changed (a dataclass
    inside is changed in place)."""
    kind = type(value)
    if kind in _PLAIN:
        return value, False
    if isinstance(value, str):
        safe = inert(value)
        return safe, safe != value
    if field_names(kind) is not None:
        return value, make_inert(value)
    if isinstance(value, dict):
        pairs = [(_inert_value(k), _inert_value(v)) for k, v in value.items()]
        if not any(k[1] or v[1] for k, v in pairs):
            return value, False
        return {k[0]: v[0] for k, v in pairs}, True
    if isinstance(value, list):
        items = [_inert_value(v) for v in value]
        if not any(touched for _, touched in items):
            return value, False
        return [v for v, _ in items], True
    return value, False


_PLAIN = frozenset({int, float, bool, type(None)})
"""Values with no text in them."""


def branch_name(site: Site, index: int) -> str:
    """Branch ``index``'s name, or ``Branch 3`` for one without."""
    name = text_of(site.branches[index].name).strip()
    return name or f"Branch {index + 1}"


def unique_name(site: Site, stem: str) -> str:
    """``stem``, or ``stem 2``, ``stem 3``… whichever no branch uses yet."""
    taken = {name_key(text_of(b.name)) for b in site.branches}
    stem = stem.strip() or "Branch"
    if name_key(stem) not in taken:
        return stem
    base = re.sub(r"\s+\d+\Z", "", stem) or stem
    n = 2
    while name_key(f"{base} {n}") in taken:
        n += 1
    return f"{base} {n}"
