"""Cubic-spline interpolation with not-a-knot ends, in numpy only.

The glycol tables are interpolated with a tensor-product cubic spline: a spline along the
temperature axis of every concentration row, then a spline across the rows at the queried
concentration. Writing the spline here (about forty lines) keeps scipy out of the import path.

The not-a-knot end condition (third derivative continuous at the second and the second-to-last
knot) is the one scipy's ``CubicSpline`` uses by default; it is more accurate at the ends of a
table than the "natural" condition, which forces a zero second derivative there.
"""

from __future__ import annotations

import numpy as np
from numpy.typing import NDArray

FloatArray = NDArray[np.float64]


def second_derivatives(knots: FloatArray, values: FloatArray) -> FloatArray:
    """Second derivatives of the not-a-knot cubic spline through ``values`` at ``knots``.

    knots: strictly increasing abscissae, shape (n,), n ≥ 4; values: shape (n,) or (n, k) for
    k splines on the same knots. Returns an array shaped like ``values``.
    """
    h = np.diff(knots)
    n = knots.size
    a = np.zeros((n, n))
    rhs = np.zeros(values.shape, dtype=float)
    slopes = np.diff(values, axis=0) / (h if values.ndim == 1 else h[:, None])
    for i in range(1, n - 1):
        a[i, i - 1] = h[i - 1]
        a[i, i] = 2.0 * (h[i - 1] + h[i])
        a[i, i + 1] = h[i]
        rhs[i] = 6.0 * (slopes[i] - slopes[i - 1])
    # Not-a-knot: the cubic on the first two intervals is one polynomial (same at the far end).
    a[0, :3] = (h[1], -(h[0] + h[1]), h[0])
    a[-1, -3:] = (h[-1], -(h[-2] + h[-1]), h[-2])
    return np.asarray(np.linalg.solve(a, rhs), dtype=np.float64)


def evaluate(knots: FloatArray, values: FloatArray, curvature: FloatArray, x: float) -> FloatArray:
    """The spline(s) at ``x``; ``curvature`` from :func:`second_derivatives`.

    ``x`` must lie within [knots[0], knots[-1]] (the callers check their ranges first).
    Returns a scalar array for 1-D ``values`` or shape (k,) for ``values`` of shape (n, k).
    """
    i = int(np.clip(np.searchsorted(knots, x, side="right") - 1, 0, knots.size - 2))
    h = knots[i + 1] - knots[i]
    left = knots[i + 1] - x
    right = x - knots[i]
    m0, m1 = curvature[i], curvature[i + 1]
    out: FloatArray = (
        m0 * left**3 / (6.0 * h)
        + m1 * right**3 / (6.0 * h)
        + (values[i] / h - m0 * h / 6.0) * left
        + (values[i + 1] / h - m1 * h / 6.0) * right
    )
    return out


def interpolate(knots: FloatArray, values: FloatArray, x: float) -> FloatArray:
    """One-shot spline through ``values`` at ``knots``, evaluated at ``x``."""
    return evaluate(knots, values, second_derivatives(knots, values), x)
