"""One segment's diameter, length or roughness for a target flow, in plain floats.

The equations of :mod:`branchwise.core.numerics.unknowns` for the one network: the length is
explicit; the diameter is Newton on ln h against ln D with the exact slope,
d ln h_major / d ln D = −5 − d ln f/d ln Re − d ln f/d ln(ε/D) (the minor losses −4;
Hazen–Williams −4.8704), inside the same bracket as the vectorised finder; the roughness is
explicit under Colebrook in turbulent flow and found by the same Illinois steps otherwise.
Whenever the vectorised finder would have no answer, :class:`.branch.Fallback` hands the case
back to it, so that it words the reason.
"""

from __future__ import annotations

import math
from collections.abc import Callable

from ...model import MAX_LENGTH, MIN_LENGTH
from ..friction import HW_D_EXP, RE_LAMINAR, RE_TURBULENT
from ..roots import EXACT_TOL
from ..unknowns.diameter import DIAMETER_MAX, DIAMETER_MIN
from ..unknowns.roughness import RR_FLOOR, RR_MAX
from . import friction as fr
from .branch import Fallback, Pipe

EPS = 2.220446049250313e-16


def length(pipe: Pipe, j: int, q: float, head: float) -> float:
    """The length of segment ``j`` (m) so that ``pipe`` carries |q| at |head|."""
    pipe.set_segment(j, pipe.d[j], 0.0, pipe.eps[j])
    h = pipe.evaluate(abs(q))
    v = abs(q) / pipe.area[j]
    per_metre = pipe.f[j] / pipe.d[j] * v * v / (2 * pipe.g)
    found = (abs(head) - h) / per_metre
    if not (MIN_LENGTH <= found <= MAX_LENGTH):  # none, or one the check refuses: the
        raise Fallback("no length")             # vectorised path words it
    return found


def _ln_h_slope(pipe: Pipe, j: int, ln_d: float, q: float) -> tuple[float, float]:
    """ln h and d ln h / d ln D of segment ``j`` at diameter e^ln_d and flow q."""
    pipe.set_segment(j, _exp(ln_d), pipe.length[j], pipe.eps[j])
    h = pipe.evaluate(q)
    re = pipe.re[j]
    model = pipe.model
    if model == "hazen-williams" and re >= RE_TURBULENT:
        d_major = -HW_D_EXP
    elif model == "hazen-williams" and re >= RE_LAMINAR:  # the bridge: central difference
        step = 1e-6
        up = _log(_probe(pipe, j, ln_d + step, q))
        down = _log(_probe(pipe, j, ln_d - step, q))
        pipe.set_segment(j, _exp(ln_d), pipe.length[j], pipe.eps[j])
        pipe.evaluate(q)
        return _log(h), (up - down) / (2 * step)
    else:
        d_major = -5.0 - pipe.fs[j] - fr.darcy_rr(re, pipe.rr[j], model)
    return _log(h), (pipe.major[j] * d_major - 4.0 * pipe.minor[j]) / h


def _probe(pipe: Pipe, j: int, ln_d: float, q: float) -> float:
    pipe.set_segment(j, _exp(ln_d), pipe.length[j], pipe.eps[j])
    return pipe.evaluate(q)


_exp = math.exp
_log = math.log


ILL_CONDITIONED = 1e-3
"""|d ln h / d ln D| of the branch below which its head hardly depends on the bore (a valve or
other segments take nearly all of it): many bores then carry the target, and the vectorised
path, which words that case, decides."""


def _settled(ln_d: float, slope: float) -> float:
    """The diameter at a root, unless it lies at an end of the search or barely moves the
    head: those go back to the vectorised path (the same answer and wording either way)."""
    d = _exp(ln_d)
    if not abs(slope) >= ILL_CONDITIONED or not (
            DIAMETER_MIN * (1 + 1e-9) < d < DIAMETER_MAX * (1 - 1e-9)):
        raise Fallback("a diameter at an end of the search, or one the head barely feels")
    return d


def diameter(pipe: Pipe, j: int, q: float, head: float) -> float:
    """The diameter of segment ``j`` (m) so that ``pipe`` carries |q| at |head|."""
    q = abs(q)
    ln_head = _log(abs(head))
    lo = _log(max(DIAMETER_MIN, 2 * pipe.eps[j] * (1 + 1e-9)))
    hi = _log(DIAMETER_MAX)
    u = min(max(_log(pipe.d[j]), lo), hi)
    for _ in range(100):
        ln_h, slope = _ln_h_slope(pipe, j, u, q)
        r = ln_h - ln_head
        if abs(r) <= EXACT_TOL:
            return _settled(u, slope)
        if r > 0:
            lo = u
        else:
            hi = u
        trial = u - r / slope if slope < 0 else math.nan
        if not lo < trial < hi:
            trial = 0.5 * (lo + hi)
        if abs(trial - u) <= 4 * EPS * max(1.0, abs(u)):
            if abs(r) <= 1e-14:  # at the root to round-off
                return _settled(u, slope)
            break  # pressed against an end of the search: no diameter there
        u = trial
    raise Fallback("no diameter")


def _illinois(f: Callable[[float], float], a: float, b: float, fa: float, fb: float,
              tol: float, floor: float) -> float:
    """:func:`..roots.illinois` for one row."""
    side = 0.0
    c = a
    for _ in range(200):
        c = (a * fb - b * fa) / (fb - fa) if fb != fa else 0.5 * (a + b)
        if not math.isfinite(c):
            c = 0.5 * (a + b)
        fc = f(c)
        if abs(fc) <= tol or fc == 0 or abs(b - a) <= 4 * EPS * max(floor, abs(c)):
            return c
        move_b = fc * fb > 0
        move_a = not move_b and fc * fa > 0
        if move_b and side < 0:
            fa = fa / 2
        if move_a and side > 0:
            fb = fb / 2
        if move_b:
            b, fb = c, fc
            side = -1.0
        elif move_a:
            a, fa = c, fc
            side = 1.0
    return c


def roughness(pipe: Pipe, j: int, q: float, head: float) -> float:
    """The roughness of segment ``j`` (m) so that ``pipe`` carries |q| at |head|."""
    model = pipe.model
    h = pipe.evaluate(abs(q))
    re, d = pipe.re[j], pipe.d[j]
    v = abs(q) / pipe.area[j]
    coeff = pipe.length[j] / d * v * v / (2 * pipe.g)
    f_need = (abs(head) - (h - pipe.major[j])) / coeff
    smooth = fr.darcy(re, 0.0, model)[0]
    roughest = fr.darcy(re, RR_MAX, model)[0]
    if not (re >= RE_LAMINAR and f_need > smooth and f_need <= roughest):
        raise Fallback("no roughness")
    if re >= RE_TURBULENT and model == "colebrook":
        xs = 1 / math.sqrt(f_need)
        return 3.7 * d * (10 ** (-xs / 2) - 2.51 * xs / re)

    def excess(rr: float) -> float:
        return fr.darcy(re, rr, model)[0] / f_need - 1

    lo, hi = 0.0, RR_MAX
    return d * _illinois(excess, lo, hi, excess(lo), excess(hi), EXACT_TOL, RR_FLOOR)
