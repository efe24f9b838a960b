"""A network's flows at a given head under Colebrook, worked out straight from its branches.

The commonest question — the flows at a given Δp, under the default friction model — needs no
object per branch: a branch's constants are a row worked out once from its numbers (kept for
the last network met, which is frozen); a one-segment branch is one equation in 1/√f
(:mod:`.one`), its steps those of :meth:`.branch.Pipe.colebrook_one_flow` written out here; a
branch of several segments is solved as :class:`.branch.Pipe` solves it
(:func:`.series.series_flow`); each answer goes into the result's columns at once. This spares
a network met for the first time (the app builds one for each edit) the making of an object for
every branch, and every solve the calls per branch.

The numbers are those of :func:`.heads.flows_at` through the branch objects to the bit: the
same steps on the same inputs, each branch from no earlier root (a test holds the two
together). Where that path would go on to the general solver (a flow not turbulent, a test not
met), None is returned and the network takes the branch objects' path from the start; a branch
beyond the bounds raises :class:`.branch.Fallback`, as there.
"""

from __future__ import annotations

import math
import weakref

from ...model import Branch, Find, Network, PressureDrop
from ..friction import RE_TURBULENT
from ..hydraulics import HEAD_RTOL
from ..results import Result
from .friction import LN10, TWO_LN10
from .one import OneRow, one_row, valve_resistance
from .result import Columns, convergence
from .series import SeriesConstants, series_constants, series_flow

_log = math.log
_log10 = math.log10
_sqrt = math.sqrt


class SeriesRow:
    """A branch of several segments: :func:`.series.series_constants` (the constants, each
    ε/3.7D, each bore's area) and the valve's r, never changed once made (rows are shared)."""

    __slots__ = ("consts", "a3", "areas", "valve_r")

    def __init__(self, consts: SeriesConstants, a3: list[float], areas: list[float],
                 valve_r: float) -> None:
        self.consts, self.a3, self.areas, self.valve_r = consts, a3, areas, valve_r


Row = OneRow | SeriesRow

_last: tuple[weakref.ref[Network], list[Row]] | None = None
"""The last network met (not kept alive) and its rows, for a network solved again (at other
heads, say): a network is frozen, and its rows are never written to."""


def _row(br: Branch, nu: float, g: float) -> Row:
    kv = br.valve_kv  # (most branches have no valve: the call is spared them)
    valve_r = 0.0 if kv is None else valve_resistance(kv, g)
    segs = br.segments
    if len(segs) == 1:
        s = segs[0]
        return one_row(s.diameter, s.length, s.roughness, s.minor_k, valve_r, nu, g)
    return SeriesRow(*series_constants(segs, valve_r, nu, g), valve_r)


def _rows(network: Network, nu: float, g: float) -> list[Row]:
    global _last
    last = _last
    if last is not None and last[0]() is network:
        return last[1]
    rows = [_row(br, nu, g) for br in network.branches]
    _last = (weakref.ref(network), rows)
    return rows


def flows_at_given_head(network: Network, given: PressureDrop, find: Find,
                        head: float) -> Result | None:
    """The Result of the flows at driving head ``head`` (m) of a network under Colebrook, or
    None when the branch objects' path must take it (module docstring)."""
    if not (head != 0 and math.isfinite(head)) or network.friction != "colebrook":
        return None
    sign = 1.0 if head > 0 else -1.0
    t = abs(head)
    root_t = _sqrt(t)
    nu = network.fluid.kinematic_viscosity
    g = network.gravity
    two_g = 2 * g
    columns = Columns()
    add_one = columns.add_one
    iterations = 0
    nan = math.nan
    for row in _rows(network, nu, g):
        if isinstance(row, SeriesRow):
            a3 = row.a3
            n = len(a3)
            state = ([nan] * n, [nan] * n, [nan] * n, [nan] * n, [nan] * n)
            it, q, _, _ = series_flow(t, row.consts, a3, [0.0] * n, state, row.valve_r)
            if not it:
                return None
            re_l, f_l, _, major_l, minor_l = state
            columns.add_series(sign * q, row.areas, re_l, f_l, major_l, minor_l, row.valve_r)
        else:
            # Pipe.colebrook_one_flow from no earlier root, written out (a call per branch
            # costs a tenth of its solve here): the same steps in the same order
            # (tests/core/numerics/test_small_at_head.py holds the two to the bit)
            _, a, area, ld, ke, c0, minor_k, valve_r, d = row
            c0 = c0 / root_t
            it = 1
            if ke == 0:
                x = -2.0 * _log10(a + c0 * _sqrt(ld))
            else:
                x = -2.0 * _log10(a + c0 * _sqrt(ld + ke * 7.0 * 7.0))  # from x = 7
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
            vel_head = t / (ld * f + ke)
            speed = _sqrt(two_g * vel_head)
            re = speed * d / nu
            if not (re >= RE_TURBULENT and x > 0):
                return None
            q = speed * area
            major = f * ld * vel_head
            minor = minor_k * vel_head
            if not abs(major + minor + valve_r * q * q - t) <= HEAD_RTOL * t:
                return None
            add_one(sign * q, area, re, f, major, minor, valve_r)
        if it > iterations:
            iterations = it
    return columns.result(network, given, find, head, None,
                          convergence([(True, iterations, 0.0)]))
