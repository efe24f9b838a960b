"""The reconciled head: the least of S(H) = r(H)ᵀ W r(H) over heads of either sign.

With V fixed, S is a function of the one head H (:mod:`.reconcile`). Each reading is a
monotone function of H, so each one alone fixes a head, and the optimum lies near or between
those heads — on either side of zero: a gauge across a rise can read less than the rise while
the meters read a forward flow, or readings can differ in sign. S is smooth in H except at
H = 0, where a branch's flow goes as sign(H)·√|H|; in t = sign(H)·√|H| the flows are smooth
through zero, so the search runs in t. S is taken at those heads and a little beyond them; at
the lowest, the sign of dS/dt says on which side the least S lies, and the neighbour there
closes a bracket (else the span is widened, or scanned finer where S has more than one dip).
The root of dS/dt in the bracket is found by the Illinois method (modified regula falsi;
Dowell & Jarratt, BIT 11, 1971) to round-off. When no bracket is found the readings cannot be
weighed: NoSolutionError, never a head that merely stopped moving.
"""

from __future__ import annotations

import math
from collections.abc import Callable, Sequence

import numpy as np

from ..errors import NoSolutionError
from .hydraulics import Array

SCAN = 9
"""Points of a scan of S over a span of heads where its lowest point is not yet bracketed."""
WIDEN = 12
"""Times the span is widened or scanned again at most before the readings are given up."""

Values = Callable[[float], Array]
"""The model's value of every reading at a head (m): g(H)."""


def least_head(values: Values, slope: Values, y: Array, cov: Array, heads: Sequence[float],
               labels: Sequence[str]) -> float:
    """The head of least S over heads of either sign (module docstring).

    values, slope: g(H) and dg/dH; y: the readings; cov: V; heads: the head each reading gives
    alone and the head to start from (m); labels: the readings in words, for the error.
    """
    w: Array = np.asarray(np.linalg.inv(cov), dtype=np.float64)

    def s_of(t: float) -> float:
        r = y - values(math.copysign(t * t, t))
        return float(r @ w @ r)

    def down(t: float) -> float:
        """−½ dS/dt = (dg/dt)ᵀ W r, dg/dt = dg/dH · 2|t|: > 0 while S falls."""
        t = t if t != 0 else 1e-150  # the flows' slope at H = 0 is their limit from above
        head = math.copysign(t * t, t)
        return float(slope(head) * (2 * abs(t)) @ w @ (y - values(head)))

    ts = sorted({math.copysign(math.sqrt(abs(h)), h) for h in heads if math.isfinite(h)})
    if ts:
        pad = 0.5 * (ts[-1] - ts[0]) + 0.05 * max(abs(ts[0]), abs(ts[-1])) + 1e-3
        lo, hi = ts[0] - pad, ts[-1] + pad
        points = sorted({*ts, *np.linspace(lo, hi, 2 * SCAN + 1).tolist(), 0.0})
        s = [s_of(t) for t in points]
        # Readings of either sign can leave a dip of S on each side of zero: each dip among
        # the first points is followed down, and the lowest end wins (not merely the dip of
        # the lowest first point).
        ends = [t for i in _dips(s) if math.isfinite(t := _follow(points, s, i, s_of, down))]
        if ends:
            t = min(ends, key=s_of)
            if abs(t) <= 1e-9 * (hi - lo):  # zero to round-off (readings that cancel): zero,
                return 0.0                  # not a head of 1e-56 m and flows to match
            return math.copysign(t * t, t)
    raise NoSolutionError(f"the readings ({', '.join(labels)}) cannot be weighed together: no "
                          "driving head fits them best; check each reading's value, unit and "
                          "sign", "conditions.given")


def _dips(s: list[float]) -> list[int]:
    """The points where S is no higher than at either neighbour (the ends count), lowest
    first; none where S is not finite or the same everywhere."""
    if not all(math.isfinite(v) for v in s) or max(s) == min(s):
        return []
    n = len(s)
    low = [i for i in range(n) if (i == 0 or s[i] <= s[i - 1]) and (i == n - 1 or s[i] <= s[i + 1])]
    return sorted(low, key=s.__getitem__)


def _follow(points: list[float], s: list[float], i: int, s_of: Callable[[float], float],
            down: Callable[[float], float]) -> float:
    """The least S of the dip at ``points[i]`` (in t), widening or scanning finer as needed;
    NaN when it cannot be bracketed."""
    for _ in range(WIDEN):
        bracket = _bracket(points, s, down, i)
        if isinstance(bracket, tuple):
            return _illinois(down, *bracket)
        if not bracket:
            return math.nan
        points = bracket
        s = [s_of(t) for t in points]
        i = min(range(len(s)), key=s.__getitem__)
    return math.nan


def _bracket(points: list[float], s: list[float], down: Callable[[float], float], i: int
             ) -> tuple[float, float, float, float] | list[float]:
    """Around ``points[i]``, a low point of ``s``: a bracket (a, b, down(a) > 0,
    down(b) < 0) of the least S there, or the points to scan next (none: S is not finite
    there)."""
    if not all(math.isfinite(v) for v in s) or max(s) == min(s):
        return []  # S not finite, or the same at every head: no least
    t = points[i]
    d = down(t)
    span = points[-1] - points[0]
    if d > 0:  # S falls to the right of the lowest point
        if i == len(points) - 1:
            return [*points, t + span]
        b = points[i + 1]
        db = down(b)
        return (t, b, d, db) if db < 0 else list(np.linspace(t, b, SCAN))
    if d < 0:
        if i == 0:
            return [t - span, *points]
        a = points[i - 1]
        da = down(a)
        return (a, t, da, d) if da > 0 else list(np.linspace(a, t, SCAN))
    return (t, t, d, d)


def _illinois(fun: Callable[[float], float], a: float, b: float, fa: float, fb: float) -> float:
    """The root of ``fun`` in [a, b] (fa > 0 > fb, or a = b) by the Illinois method (modified
    regula falsi; Dowell & Jarratt, BIT 11, 1971) until the bracket is at round-off."""
    side = 0
    for _ in range(200):
        if abs(b - a) <= 4e-16 * max(abs(a), abs(b)) or fa == 0 or fb == 0:
            break
        c = (a * fb - b * fa) / (fb - fa)
        if not a < c < b:
            c = 0.5 * (a + b)
        fc = fun(c)
        if fc > 0:
            a, fa = c, fc
            if side == -1:
                fb *= 0.5
            side = -1
        elif fc < 0:
            b, fb = c, fc
            if side == 1:
                fa *= 0.5
            side = 1
        else:
            return c
    else:
        return math.nan
    return a if fa == 0 else b if fb == 0 else (a * fb - b * fa) / (fb - fa)
