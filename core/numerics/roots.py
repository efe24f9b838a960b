"""Bracketed root finding, vectorised over rows: every row its own equation and bracket.

Used where an unknown has no closed form (a diameter; a roughness under a friction model other
than Colebrook): each row of a Monte Carlo run, or the one row of a single solve.
"""

from __future__ import annotations

from collections.abc import Callable

import numpy as np
from numpy.typing import NDArray

Array = NDArray[np.float64]
BoolArray = NDArray[np.bool_]

FAST_TOL = 1e-12
"""|residual| at which a Monte Carlo row is done (relative, in head or friction factor): far
below the spread of any band."""
EXACT_TOL = 4 * 2.220446049250313e-16
"""A single solve stops when its residual is at round-off (or its bracket has collapsed)."""


def illinois(
    fun: Callable[[Array], Array], a: Array, b: Array, fa: Array, fb: Array, active: BoolArray,
    tol: float = FAST_TOL, max_iter: int = 200, floor: float = 1.0,
) -> Array:
    """The roots of ``fun`` row by row by the Illinois method (modified regula falsi; Dowell &
    Jarratt, BIT 11, 168–174, 1971), each row inside its bracket [a, b] with fa = fun(a) and
    fb = fun(b) of opposite signs.

    Only ``active`` rows are waited for; the others give values the caller masks. A row is done
    when |fun| ≤ ``tol`` or its bracket has collapsed to round-off: 4 ulp of the larger of |x|
    and ``floor`` (the size below which x no longer matters).
    """
    side = np.zeros_like(a)
    c = a
    for _ in range(max_iter):
        with np.errstate(invalid="ignore", divide="ignore"):
            c = np.where(fb != fa, (a * fb - b * fa) / (fb - fa), 0.5 * (a + b))
        c = np.where(np.isfinite(c), c, 0.5 * (a + b))
        fc = fun(c)
        collapsed = np.abs(b - a) <= 4 * np.finfo(float).eps * np.maximum(floor, np.abs(c))
        if np.all((np.abs(fc) <= tol) | (fc == 0) | collapsed | ~active):
            break
        move_b = fc * fb > 0
        move_a = ~move_b & (fc * fa > 0)
        fa = np.where(move_b & (side < 0), fa / 2, fa)
        fb = np.where(move_a & (side > 0), fb / 2, fb)
        b, fb = np.where(move_b, c, b), np.where(move_b, fc, fb)
        a, fa = np.where(move_a, c, a), np.where(move_a, fc, fa)
        side = np.where(move_b, -1.0, np.where(move_a, 1.0, side))
    return c
