"""One segment under Colebrook in turbulent flow, its valve and fittings folded in: one equation
in x = 1/√f for the flow at a head.

With V² = 2 g H / (L/(D x²) + K) — the valve folded into the fittings' K, since
r_valve Q² = (2 g r_valve A²) V²/2g — Colebrook reads x = −2 log10(ε/3.7D + C √(L/D + K x²))
with C = 2.51 ν / (D √(2 g H)): explicit when K = 0, a few Newton steps otherwise. Used by a
branch object (:class:`.branch.Pipe`); a network's flows worked out straight from its branches
(:mod:`.at_head`) write it out, to the same numbers to the bit.
"""

from __future__ import annotations

import math

from ...model import Segment
from ..friction import RE_TURBULENT
from ..hydraulics import HEAD_RTOL, VALVE_HEAD_FACTOR
from .friction import LN10, TWO_LN10

_log = math.log
_log10 = math.log10
_sqrt = math.sqrt
_PI = math.pi

OneRow = tuple[float, float, float, float, float, float, float, float, float]
"""What :func:`one_row` gives for a one-segment branch (SI): ε/D, ε/3.7D, the bore's area,
L/D, the fittings' and valve's K together, 2.51 ν / (D √(2 g)), the fittings' K, the valve's r
and the bore."""
NO_ONE: OneRow = (math.nan,) * 9
"""The row of a branch of several segments (never solved as one)."""

OneState = tuple[int, float, float, float, float, float, float, float, float, float]
"""What :func:`colebrook_one` gives: the iterations (0: not taken), x = 1/√f, |Q| (m³/s),
h (m), d ln h / d ln Q, Re, f, d ln f / d ln Re, the major and the minor loss (m)."""


def valve_resistance(kv: float | None, g: float) -> float:
    """The valve's r in h = r Q² (m per (m³/s)²; 0 without a valve), as ``hydraulics.Layout``."""
    return VALVE_HEAD_FACTOR / (kv**2 * g) if kv is not None else 0.0


def one_row(seg: Segment, valve_r: float, nu: float, g: float) -> OneRow:
    """The constants of :func:`colebrook_one` for a one-segment branch."""
    d = seg.diameter
    rr = seg.roughness / d
    area = _PI * d**2 / 4
    k = seg.minor_k
    return (rr, rr / 3.7, area, seg.length / d, k + 2 * g * valve_r * area * area,
            2.51 * nu / (d * _sqrt(2 * g)), k, valve_r, d)


def colebrook_one(head: float, x0: float, row: OneRow, nu: float, g: float) -> OneState:
    """The flow of a one-segment branch (``row``: :func:`one_row`) at driving head ``head`` > 0
    (m) and its state, from the root ``x0`` of a nearby head (0: none); the iterations are 0
    (and the rest not to be used, but x) when the flow is not turbulent or misses the
    vectorised solver's test, |ln h − ln H| ≤ ``HEAD_RTOL``: the general solver takes it then.
    x is given back as found when the flow is turbulent (a start for the next call), else as
    ``x0``."""
    _, a, area, ld, ke, c0, minor_k, valve_r, d = row
    c0 = c0 / _sqrt(head)
    it = 1
    if ke == 0:
        x = -2.0 * _log10(a + c0 * _sqrt(ld))
    else:
        # One fixed-point pass from the last root (or from f = 0.02: x ≈ 7), then Newton
        # on g(x) = x + 2 log10(a + C R), R = √(L/D + K x²). Its error after a step s is
        # about |g''|/(2 g') s², and |g''|/(2 g') ≤ K/(ln 10 R²) (g' ≥ 1; R''s terms
        # bounded by K/R²): taken at 0.9 x, the next step would be below round-off once
        # that bound times s² is below 1e-16 x.
        x = x0 if x0 > 0 else 7.0
        x = -2.0 * _log10(a + c0 * _sqrt(ld + ke * x * x))
        kc = TWO_LN10 * c0 * ke
        curve = ke / (LN10 * (ld + 0.81 * ke * x * x))
        for it in range(1, 40):  # noqa: B007 (the count is reported)
            root = _sqrt(ld + ke * x * x)
            arg = a + c0 * root
            step = (x + TWO_LN10 * _log(arg)) / (1.0 + kc * x / (arg * root))
            x -= step
            if curve * step * step <= 1e-16 * x:
                break
    f = 1.0 / (x * x)
    vel_head = head / (ld * f + ke)  # V²/2g
    speed = _sqrt(2 * g * vel_head)
    re = speed * d / nu
    if not (re >= RE_TURBULENT and x > 0):
        return 0, x0, 0.0, 0.0, 0.0, 0.0, 0.0, 0.0, 0.0, 0.0
    q = speed * area
    c = 2.51 / re  # d ln f / d ln Re at the root, as friction.colebrook_slopes
    t = TWO_LN10 * c / (a + c * x)
    fs = -2.0 * t / (1.0 + t)
    major = f * ld * vel_head
    minor = minor_k * vel_head
    valve = valve_r * q * q
    h = major + minor + valve
    if not abs(h - head) <= HEAD_RTOL * head:  # |ln h − ln H| ≤ HEAD_RTOL, to first order
        return 0, x, 0.0, 0.0, 0.0, 0.0, 0.0, 0.0, 0.0, 0.0
    return (it, x, q, h, (major * (2 + fs) + 2 * minor + 2 * valve) / h, re, f, fs, major,
            minor)
