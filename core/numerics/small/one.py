"""One segment under Colebrook in turbulent flow, its valve and fittings folded in: one equation
in x = 1/√f for the flow at a head.

With V² = 2 g H / (L/(D x²) + K) — the valve folded into the fittings' K, since
r_valve Q² = (2 g r_valve A²) V²/2g — Colebrook reads x = −2 log10(ε/3.7D + C √(L/D + K x²))
with C = 2.51 ν / (D √(2 g H)): explicit when K = 0, a few Newton steps otherwise. Here are
its constants, a row per branch; it is solved by a branch object
(:meth:`.branch.Pipe.colebrook_one_flow`) and, written out in its loop, by a network's flows
worked out straight from its branches (:mod:`.at_head`): the same steps in the same order, held
to the same numbers to the bit by tests/core/numerics/test_small_at_head.py.
"""

from __future__ import annotations

import math

from ..hydraulics import VALVE_HEAD_FACTOR

_sqrt = math.sqrt
_PI = math.pi

OneRow = tuple[float, float, float, float, float, float, float, float, float]
"""What :func:`one_row` gives for a one-segment branch (SI): ε/D, ε/3.7D, the bore's area,
L/D, the fittings' and valve's K together, 2.51 ν / (D √(2 g)), the fittings' K, the valve's r
and the bore."""
NO_ONE: OneRow = (math.nan,) * 9
"""The row of a branch of several segments (never solved as one)."""


def valve_resistance(kv: float | None, g: float) -> float:
    """The valve's r in h = r Q² (m per (m³/s)²; 0 without a valve), as ``hydraulics.Layout``."""
    return VALVE_HEAD_FACTOR / (kv**2 * g) if kv is not None else 0.0


def one_row(d: float, length: float, roughness: float, k: float, valve_r: float, nu: float,
            g: float) -> OneRow:
    """The constants of a one-segment branch (SI: bore, length, roughness, the fittings' K,
    the valve's r; the liquid's ν; g)."""
    rr = roughness / d
    area = _PI * d**2 / 4
    return (rr, rr / 3.7, area, length / d, k + 2 * g * valve_r * area * area,
            2.51 * nu / (d * _sqrt(2 * g)), k, valve_r, d)
