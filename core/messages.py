"""Quantities inside messages raised from the core, kept so a boundary can state them in its units.

The core works in SI and knows nothing of the user's units. A message that quotes a quantity
therefore carries it *marked*: ``flow_text(0.012)`` returns the flow as a marker holding the
kind and the exact SI value. :func:`render` turns marked text into words — by default the SI
units a site engineer reads most easily (flows in L/s, heads in m, pressures in kPa, diameters
in mm) — and ``branchwise.core.units.restate`` turns the same text into US or any other units.
Errors and warnings keep the marked text (``NoSolutionError.marked``, ``SolveWarning.marked``) and
show the SI rendering as their plain message, so nothing prints a marker.
"""

from __future__ import annotations

import re
from collections.abc import Callable

_OPEN, _CLOSE = "\ue000", "\ue001"  # private-use characters: never typed, never printed
_MARK = re.compile(f"{_OPEN}([a-z_]+~?) ([-+]?(?:[0-9.]+(?:[eE][-+]?[0-9]+)?|inf|nan)){_CLOSE}")
"""A marker as :func:`marked` writes it; anything else between the characters is left as it is."""


def marked(kind: str, value_si: float) -> str:
    """A quantity of ``kind`` (a key of ``units.KINDS``) as a marker inside message text."""
    return f"{_OPEN}{kind} {float(value_si)!r}{_CLOSE}"


def is_marked(text: str) -> bool:
    """Whether ``text`` holds a marked quantity (to be said in its reader's units)."""
    return _OPEN in text


def limit_text(kind: str, value_si: float) -> str:
    """A limit of ``kind`` (a rule of thumb, a sane bound) as a marker: stated in another unit it
    is rounded as the trade quotes it (:func:`trade_round`: 3 m/s reads "10 ft/s", not 9.843)."""
    return marked(f"{kind}~", value_si)


def trade_round(value: float) -> float:
    """``value`` to one significant figure where that moves it by 2 % at most (9.843 → 10,
    4.921 → 5), else to two (7.2 → 7.2): how a limit converted to other units is quoted."""
    if value == 0 or value != value or value in (float("inf"), float("-inf")):
        return value
    one = float(f"{value:.0e}")
    return one if abs(one / value - 1) <= 0.02 else float(f"{value:.1e}")


def has_marks(text: object) -> bool:
    """Whether ``text`` holds a marked quantity."""
    return isinstance(text, str) and _OPEN in text


def render(text: str, show: Callable[[float, str], str] | None = None) -> str:
    """``text`` with every marked quantity written out by ``show(value_si, kind)``.

    show: None writes the SI text of :func:`si_text`.
    """
    if _OPEN not in text:
        return text
    show = show or si_text
    return _MARK.sub(lambda m: show(float(m.group(2)), m.group(1)), text)


def base_kind(kind: str) -> tuple[str, bool]:
    """A marker's kind without its limit mark, and whether it is a limit (``velocity~``)."""
    return (kind[:-1], True) if kind.endswith("~") else (kind, False)


def si_text(value_si: float, kind: str) -> str:
    """The SI words for a quantity: L/s, m, kPa, mm (a diameter in m from 10 m on), m/s; km
    beyond 10 km; Kv."""
    kind, _ = base_kind(kind)  # an SI limit is stated as set
    if kind == "flow":
        return f"{value_si * 1000:.4g} L/s"
    if kind == "pressure":
        return f"{value_si / 1000:.4g} kPa"
    if kind == "roughness":
        return f"{value_si * 1000:.4g} mm"
    if kind == "diameter":  # in mm as the tables give bores, to the search's 10 m bound
        return f"{value_si * 1000:.4g} mm" if value_si < 10 else f"{value_si:.4g} m"
    if kind == "length" and abs(value_si) >= 10_000:
        return f"{value_si / 1000:.4g} km"
    if kind == "velocity":
        return f"{value_si:.3g} m/s"
    if kind in ("length", "head"):
        return f"{value_si:.4g} m"
    if kind == "valve":
        return f"Kv {value_si:.3g}"
    if kind == "temperature_difference":  # a difference of temperatures: kelvins
        return f"{value_si:.3g} K"
    if kind == "temperature":  # K in, °C out, to 0.01 K without trailing zeros
        text = f"{value_si - 273.15:.2f}".rstrip("0").rstrip(".")
        return f"{'0' if text == '-0' else text} °C"
    return f"{value_si:.4g}"


def flow_text(q_m3_s: float) -> str:
    return marked("flow", q_m3_s)


def head_text(h_m: float) -> str:
    return marked("head", h_m)


def pressure_text(p_pa: float) -> str:
    return marked("pressure", p_pa)


def diameter_text(d_m: float) -> str:
    return marked("diameter", d_m)


def length_text(length_m: float) -> str:
    return marked("length", length_m)


def velocity_text(v_m_s: float) -> str:
    return marked("velocity", v_m_s)


def kv_text(kv_m3_h: float) -> str:
    """A valve's flow coefficient, Kv in m³/h at 1 bar (restated as Cv in US units)."""
    return marked("valve", kv_m3_h)


def temperature_text(t_k: float) -> str:
    """A temperature, K (said in °C, or °F in US units)."""
    return marked("temperature", t_k)


def temperature_difference_text(dt_k: float) -> str:
    """A difference of temperatures, K (said in K, or °F where temperatures are in °F:
    1 K = 1.8 °F, by the scales' definitions)."""
    return marked("temperature_difference", dt_k)


def reynolds_text(re: float, grouped: bool = False) -> str:
    """A Reynolds number as a whole number (``grouped``: with thousands commas), or to two
    significant figures below 10: a creeping flow's Re of 3.7e-28 is not 0, nor is 0.52."""
    if not re == re:  # NaN
        return "—"
    if abs(re) >= 10:
        return f"{re:,.0f}" if grouped else f"{re:.0f}"
    return "0" if re == 0 else f"{re:.2g}"
