"""Valves, strainers and coils in series on one branch, as typed: ``"160 + 40"``,
``"Kv 160 + Cv 48"``.

Each passes the same flow and their pressure drops add; with Δp ∝ (Q/Kv)² (IEC 60534-1) that is
1/Kv² = Σ 1/Kv_i², one Kv for the lot.
"""

from __future__ import annotations

import math
import re

from ..errors import InputError, describe
from ..model import MAX_KV, MIN_KV, kv_from_cv
from ..units.numbers import plain_float

SERIES = re.compile(r"(?<=[\d.\s])\+")
"""A plus sign between two numbers (not the one of an exponent, 1e+3)."""
_COEFFICIENT = re.compile(r"\s*(kv|cv)\s*[:=]?\s*(.*)\Z", re.IGNORECASE | re.DOTALL)
_HOW = "several valves in series read like 160 + 40, or Kv 160 + Cv 48"


def series_kv(value: object, path: str, unit: str = "kv") -> float | None:
    """One Kv (m³/h at 1 bar) for ``value``: a number, or text of terms joined by ``+``, each a
    number in ``unit`` (``kv`` or ``cv``) or one that names its own (``Cv 48``). None for None.

    Every failure is an InputError on ``path`` quoting the whole text as typed and naming the
    term at fault; each term must be a valve's Kv (1e-6 to 1e7 m³/h) on its own.
    """
    if value is None:
        return None
    if isinstance(value, bool) or not isinstance(value, str | int | float):
        raise InputError(path, describe(value), "must be a number, or text such as '160 + 40'")
    shown = describe(value)
    terms = SERIES.split(value.strip()) if isinstance(value, str) else [value]
    if isinstance(value, str) and len(terms) == 1 and "," in value:
        raise InputError(path, shown, f"use a decimal point; {_HOW}")
    kvs = []
    for n, term in enumerate(terms, start=1):
        which = f"term {n} " if len(terms) > 1 else ""
        kind, text = unit, term
        if isinstance(term, str):
            written = term
            if m := _COEFFICIENT.match(term):
                kind, written = m.group(1).lower(), m.group(2)
            if not written.strip():
                raise InputError(path, shown, f"{which}has no number; {_HOW}")
            text = written.strip()
        try:
            number = plain_float(text)
        except (ValueError, OverflowError):
            raise InputError(path, shown, f"{which}is not a plain number; {_HOW}") from None
        if not (math.isfinite(number) and number > 0):
            raise InputError(path, shown, f"{which}must be a positive number")
        kv = kv_from_cv(number) if kind == "cv" else number
        if not MIN_KV <= kv <= MAX_KV:
            raise InputError(path, shown, f"{which}is not a valve's flow coefficient "
                             f"({MIN_KV:g} to {MAX_KV:g} m³/h as Kv)")
        kvs.append(kv)
    if len(kvs) == 1:
        return kvs[0]
    return 1 / math.hypot(*(1 / kv for kv in kvs))
