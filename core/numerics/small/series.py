"""Series segments under Colebrook in turbulent flow, in plain floats: one Newton on ln Q and
every segment's x = 1/√f together.

With V_j = Q/A_j, h = Q² (Σ (L/D)_j/(2 g A_j²) / x_j² + Σ K_j/(2 g A_j²) + r_valve) and each
segment's Colebrook equation G_j = x_j + 2 log10(ε/3.7D + 2.51 x_j/Re_j) = 0, Re_j ∝ Q: the step
of each x_j follows from its own equation once the step in ln Q is known, so the joint Newton
step needs one pass over the segments for the sums and one for the steps. Started from each
segment's Swamee–Jain x at the flow f = 0.02 would give; three steps are usual.
"""

from __future__ import annotations

import math
from collections.abc import Sequence

from ...model import Segment
from ..friction import RE_TURBULENT
from ..hydraulics import HEAD_RTOL
from .friction import TWO_LN10

_log = math.log
_log10 = math.log10
_exp = math.exp
_sqrt = math.sqrt

SeriesConstants = tuple[list[float], list[float], float, list[float]]
"""What :func:`series_constants` gives: 2.51 Q/Re and (L/D)/(2 g A²) per segment, the fittings'
and valve's resistance together, and each segment's fittings' K/(2 g A²)."""
NO_SERIES: SeriesConstants = ([], [], 0.0, [])
"""The constants of a one-segment branch (the series solve never takes one)."""
RE_TURBULENT_C = 2.51 / RE_TURBULENT
"""2.51/Re at the start of turbulent flow (Colebrook's c, which falls as Re rises)."""


def series_constants(segs: Sequence[Segment], valve_r: float, nu: float,
                     g: float) -> tuple[SeriesConstants, list[float], list[float]]:
    """For :func:`joint_newton`, from the segments and the valve's r (SI): per segment
    2.51 Q/Re and (L/D)/(2 g A²), the fittings' and valve's resistance together
    (h = Q² (Σ (L/D)/(2 g A²) f + that)), and per segment the fittings' K/(2 g A²); then each
    segment's ε/3.7D and bore area (m²)."""
    crk: list[float] = []
    ldw: list[float] = []
    kws: list[float] = []
    a3: list[float] = []
    areas: list[float] = []
    kw = valve_r
    two_g = 2 * g
    for s in segs:
        dj = s.diameter
        a = math.pi * dj**2 / 4
        areas.append(a)
        a3.append(s.roughness / dj / 3.7)
        crk.append(2.51 * a * nu / dj)  # 2.51/Re = that/Q
        ldw.append(s.length / dj / (two_g * a * a))
        w = s.minor_k / (two_g * a * a)
        kws.append(w)
        kw += w
    return (crk, ldw, kw, kws), a3, areas


def joint_newton(head: float, consts: SeriesConstants, a3: list[float],
                 xs: list[float]) -> tuple[int, float]:
    """The iterations and |Q| (m³/s) at driving head ``head`` > 0 (m): Newton on ln Q and every
    segment's x = 1/√f together (``xs``, written in place; ``a3`` each ε/3.7D), from each
    segment's Swamee–Jain x at the flow f = 0.02 would give, until the next step would be
    below round-off. (0, NaN) when a segment is not in turbulent flow or Newton does not
    settle. Two segments take :func:`joint_newton_two`, any other number the loop
    :func:`joint_newton_any`."""
    if len(xs) == 2:
        return joint_newton_two(head, consts, a3, xs)
    return joint_newton_any(head, consts, a3, xs)


def joint_newton_any(head: float, consts: SeriesConstants, a3: list[float],
                     xs: list[float]) -> tuple[int, float]:
    """:func:`joint_newton` for any number of segments, in loops over them."""
    n = len(xs)
    crk, ldw, kw, _ = consts
    ln_t = _log(head)
    r = kw
    for j in range(n):
        r += ldw[j] * 0.02
    q = _sqrt(head / r)  # every f = 0.02, then each x as Swamee–Jain's at that flow
    r = kw
    for j in range(n):
        x = xs[j] = -2.0 * _log10(a3[j] + 5.74 * (q / crk[j] * 2.51) ** -0.9)
        r += ldw[j] / (x * x)
    u = 0.5 * (ln_t - _log(r))
    q = _exp(u)
    gs = [0.0] * n
    gus = [0.0] * n
    igxs = [0.0] * n
    lim = RE_TURBULENT_C
    it = 0
    while True:
        it += 1
        if it > 30:
            return 0, math.nan
        num = 2.0 * u + _log(r) - ln_t
        den = 2.0
        fr2 = -2.0 / r
        qi = 1.0 / q
        for j in range(n):
            x = xs[j]
            c = crk[j] * qi  # 2.51/Re
            if not c <= lim:
                return 0, math.nan
            arg = a3[j] + c * x
            t = TWO_LN10 * c / arg
            igx = 1.0 / (1.0 + t)
            gu = -t * x
            gj = x + TWO_LN10 * _log(arg)
            w = fr2 * ldw[j] / (x * x * x) * igx  # d ln h / d x over dG/dx
            num -= w * gj
            den -= w * gu
            gs[j], gus[j], igxs[j] = gj, gu, igx
        du = -num / den
        worst = abs(du)
        r = kw
        for j in range(n):
            step = (gs[j] + gus[j] * du) * igxs[j]
            x = xs[j] = xs[j] - step
            r += ldw[j] / (x * x)
            if abs(step) > worst * x:
                worst = abs(step) / x
        u += du
        q = _exp(u)
        if worst <= 1e-8:  # the errors square each step: the next would be round-off
            break
    return it, q


State = tuple[list[float], list[float], list[float], list[float], list[float]]
"""Per segment: Re, f, d ln f / d ln Re, the major and the minor loss (m)."""


def series_flow(head: float, consts: SeriesConstants, a3: list[float], xs: list[float],
                state: State, valve_r: float) -> tuple[int, float, float, float]:
    """The iterations, |Q| (m³/s), h (m) and d ln h / d ln Q of series segments at driving head
    ``head`` > 0 (m) (:func:`joint_newton`, then :func:`series_state` into ``state``, the
    valve's r added), tested as the vectorised solver tests a flow. The iterations are 0 when
    that test is not met (the rest as reached) or a segment is not in turbulent flow (the
    rest NaN)."""
    it, q = joint_newton(head, consts, a3, xs)
    if not it:
        return 0, math.nan, math.nan, math.nan
    h, dh = series_state(q, xs, consts, a3, state)
    valve = valve_r * q * q
    h += valve
    dh += 2 * valve
    s = dh / h if h != 0 else 2.0
    if abs(_log(h) - _log(head)) > HEAD_RTOL:
        return 0, q, h, s
    return it, q, h, s


def series_state(q: float, xs: list[float], consts: SeriesConstants, a3: list[float],
                 state: State) -> tuple[float, float]:
    """Each segment's Re, f, d ln f / d ln Re, major and minor loss (m) at |Q| = q from its
    Colebrook root in ``xs``, written into the lists of ``state`` in that order; returns the
    segments' h and d h / d ln Q (m; the valve's part left to the caller)."""
    crk, ldw, _, kws = consts
    re_l, f_l, fs_l, ma_l, mi_l = state
    qi = 1.0 / q
    q2 = q * q
    h = dh = 0.0
    for j in range(len(xs)):
        x = xs[j]
        c = crk[j] * qi  # 2.51/Re
        re = 2.51 / c
        t = TWO_LN10 * c / (a3[j] + c * x)
        f = 1.0 / (x * x)
        fs = -2.0 * t / (1.0 + t)  # d ln f / d ln Re, as friction.colebrook_slopes
        major = f * ldw[j] * q2
        minor = kws[j] * q2
        h += major + minor
        dh += major * (2 + fs) + 2 * minor
        re_l[j], f_l[j], fs_l[j], ma_l[j], mi_l[j] = re, f, fs, major, minor
    return h, dh


def joint_newton_two(head: float, consts: SeriesConstants, a3: list[float],
                     xs: list[float]) -> tuple[int, float]:
    """:func:`joint_newton` for two segments (a reducer; the common case): the loops of
    :func:`joint_newton_any` written out over two sets of locals — the same start, steps,
    test and sums in the same order — in about 60 % of its time (at this size the lists and
    loops cost more than the arithmetic; tests/core/numerics/test_small_series.py holds the
    two together)."""
    crk, ldw, kw, _ = consts
    c1, c2 = crk
    w1, w2 = ldw
    a1, a2 = a3
    ln_t = _log(head)
    q = _sqrt(head / (kw + w1 * 0.02 + w2 * 0.02))
    x1 = -2.0 * _log10(a1 + 5.74 * (q / c1 * 2.51) ** -0.9)
    x2 = -2.0 * _log10(a2 + 5.74 * (q / c2 * 2.51) ** -0.9)
    r = kw + w1 / (x1 * x1) + w2 / (x2 * x2)
    u = 0.5 * (ln_t - _log(r))
    q = _exp(u)
    lim = RE_TURBULENT_C
    for it in range(1, 31):
        qi = 1.0 / q
        e1 = c1 * qi  # 2.51/Re
        e2 = c2 * qi
        if not (e1 <= lim and e2 <= lim):
            break
        arg1 = a1 + e1 * x1
        arg2 = a2 + e2 * x2
        t1 = TWO_LN10 * e1 / arg1
        t2 = TWO_LN10 * e2 / arg2
        i1 = 1.0 / (1.0 + t1)
        i2 = 1.0 / (1.0 + t2)
        g1 = x1 + TWO_LN10 * _log(arg1)
        g2 = x2 + TWO_LN10 * _log(arg2)
        fr2 = -2.0 / r
        v1 = fr2 * w1 / (x1 * x1 * x1) * i1  # d ln h / d x over dG/dx
        v2 = fr2 * w2 / (x2 * x2 * x2) * i2
        du = -(2.0 * u + _log(r) - ln_t - v1 * g1 - v2 * g2) / (
            2.0 + v1 * (t1 * x1) + v2 * (t2 * x2))
        s1 = (g1 - t1 * x1 * du) * i1
        s2 = (g2 - t2 * x2 * du) * i2
        x1 -= s1
        x2 -= s2
        r = kw + w1 / (x1 * x1) + w2 / (x2 * x2)
        u += du
        q = _exp(u)
        worst = abs(du)
        if abs(s1) > worst * x1:
            worst = abs(s1) / x1
        if abs(s2) > worst * x2:
            worst = abs(s2) / x2
        if worst <= 1e-8:  # the errors square each step: the next would be round-off
            xs[0], xs[1] = x1, x2
            return it, q
    xs[0], xs[1] = x1, x2
    return 0, math.nan
