"""The reconciled head: the least of S(H) = r(H)ᵀ W r(H) over heads of either sign.

With V fixed, S is a function of the one head H (:mod:`.reconcile`). Each reading is a
monotone function of H, so each one alone fixes a head, and the optimum lies near or between
those heads — on either side of zero: a gauge across a rise can read less than the rise while
the meters read a forward flow, or readings can differ in sign. S is smooth in H except at
H = 0, where a branch's flow goes as sign(H)·√|H|; in t = sign(H)·√|H| the flows are smooth
through zero, so S is scanned in t over the span the readings give (widened while its lowest
point sits at an end), the lowest point narrowed by golden sections (Kiefer 1953; Press et al.,
*Numerical Recipes*, 3rd ed., 10.2) and polished by Gauss–Newton in H (ΔH = Jᵀ W r / Jᵀ W J,
each step kept only while S does not grow) to round-off. When no lowest point is found the
readings cannot be weighed: NoSolutionError, never a head that merely stopped moving.
"""

from __future__ import annotations

import math
from collections.abc import Callable, Sequence

import numpy as np

from ..errors import NoSolutionError
from .hydraulics import Array

GRID = 41
"""Points of each scan of S over the span of heads."""
WIDEN = 12
"""Times the span is widened at most while its lowest point sits at an end."""
GOLDEN = (math.sqrt(5.0) - 1) / 2

Values = Callable[[float], Array]
"""The model's value of every reading at a head (m): g(H)."""


def least_head(values: Values, slope: Values, y: Array, cov: Array, heads: Sequence[float],
               labels: Sequence[str]) -> float:
    """The head of least S over heads of either sign (module docstring).

    values, slope: g(H) and dg/dH; y: the readings; cov: V; heads: the head each reading gives
    alone and the head to start from (m); labels: the readings in words, for the error.
    """
    w: Array = np.asarray(np.linalg.inv(cov), dtype=np.float64)

    def s_at(head: float) -> float:
        r = y - values(head)
        return float(r @ w @ r)

    def s_of(t: float) -> float:
        return s_at(math.copysign(t * t, t))

    ts = [math.copysign(math.sqrt(abs(h)), h) for h in heads if math.isfinite(h)]
    if ts:
        low, high = min(ts), max(ts)
        pad = 0.5 * (high - low) + 0.05 * max(abs(low), abs(high)) + 1e-3
        low, high = low - pad, high + pad
        for _ in range(WIDEN):
            grid = np.linspace(low, high, GRID)
            scan = np.array([s_of(float(t)) for t in grid])
            if not np.all(np.isfinite(scan)):
                break
            i = int(np.argmin(scan))
            if 0 < i < GRID - 1:
                head, s = _golden(s_of, float(grid[i - 1]), float(grid[i + 1]))
                head = _polish(values, slope, y, w, s_at, head, s)
                if math.isfinite(head):
                    return head
                break
            span = high - low
            low, high = (low - span, high) if i == 0 else (low, high + span)
    raise NoSolutionError(f"the readings ({', '.join(labels)}) cannot be weighed together: no "
                          "driving head fits them best; check each reading's value, unit and "
                          "sign", "conditions.given")


def _golden(s_of: Callable[[float], float], a: float, b: float) -> tuple[float, float]:
    """The head of least S for t in [a, b] by golden sections, and S there."""
    c, d = b - GOLDEN * (b - a), a + GOLDEN * (b - a)
    fc, fd = s_of(c), s_of(d)
    while abs(b - a) > 1e-9 * max(abs(a), abs(b), 1e-6):
        if fc <= fd:
            b, d, fd = d, c, fc
            c = b - GOLDEN * (b - a)
            fc = s_of(c)
        else:
            a, c, fc = c, d, fd
            d = a + GOLDEN * (b - a)
            fd = s_of(d)
    t, s = (c, fc) if fc <= fd else (d, fd)
    return math.copysign(t * t, t), s


def _polish(values: Values, slope: Values, y: Array, w: Array,
            s_at: Callable[[float], float], head: float, s: float) -> float:
    """Gauss–Newton in H from next to the optimum, each step kept only when S does not grow."""
    for _ in range(30):
        if head == 0:
            return head
        j = slope(head)
        info = float(j @ w @ j)
        if not info > 0:
            return head
        step = float(j @ w @ (y - values(head))) / info
        trial = head + step
        s_new = s_at(trial)
        if not s_new <= s + 1e-12 * (1 + s):
            return head  # as close as S can tell
        head, s = trial, s_new
        if abs(step) <= 4e-16 * abs(head):
            break
    return head
