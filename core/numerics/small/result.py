"""The :class:`Result` of a small network from its branches' last states, in plain floats.

The same numbers as :func:`..solve._result` computes from the arrays (the sign of each
branch's flow put back on its velocities and losses), the same last check — a branch beyond
the physical bounds is handed back to the vectorised path, which names it — and the same
warnings (:func:`..checks.collect_warnings_small`).
"""

from __future__ import annotations

import math
from collections.abc import Sequence
from functools import partial

from ...model import MAX_FLOW, Find, Given, Network
from ..checks import MAX_VELOCITY, collect_warnings_small
from ..results import Arrays, Convergence, Result, Solved
from .branch import Fallback, Pipe

_isfinite = math.isfinite


def numpy_sum(values: Sequence[float]) -> float:
    """Σ values added in numpy's order for a float64 array (pairwise, blocks of eight), so that
    a total is the vectorised path's to the last bit."""
    n = len(values)
    if n < 8:
        total = -0.0
        for v in values:
            total += v
        return total
    if n <= 128:
        r = list(values[:8])
        i = 8
        while i < n - (n % 8):
            for k in range(8):
                r[k] += values[i + k]
            i += 8
        total = ((r[0] + r[1]) + (r[2] + r[3])) + ((r[4] + r[5]) + (r[6] + r[7]))
        while i < n:
            total += values[i]
            i += 1
        return total
    half = n // 2
    half -= half % 8
    return numpy_sum(values[:half]) + numpy_sum(values[half:])


def build_result(
    network: Network, given: Given, find: Find, pipes: Sequence[Pipe], head: float,
    flows: list[float], solved: Solved | None, conv: Convergence,
) -> Result:
    if not _isfinite(head):
        raise Fallback("head")
    seg_branch: list[int] = []
    velocity: list[float] = []
    reynolds: list[float] = []
    friction: list[float] = []
    major: list[float] = []
    minor: list[float] = []
    valve: list[float] = []
    add_branch, add_velocity, add_re = seg_branch.append, velocity.append, reynolds.append
    add_f, add_major, add_minor = friction.append, major.append, minor.append
    add_valve = valve.append
    for b, (p, q) in enumerate(zip(pipes, flows, strict=True)):
        if not (abs(q) <= MAX_FLOW and q != 0):  # NaN fails too
            raise Fallback("bounds")
        if p.n == 1:
            v = q / p.area[0]
            if not abs(v) <= MAX_VELOCITY:
                raise Fallback("bounds")
            add_branch(b)
            add_velocity(v)
            add_re(p.re[0])
            add_f(p.f[0])
            if q > 0:
                add_major(p.major[0])
                add_minor(p.minor[0])
            else:
                add_major(-p.major[0])
                add_minor(-p.minor[0])
        else:
            for a in p.area:
                v = q / a
                if not abs(v) <= MAX_VELOCITY:
                    raise Fallback("bounds")
                add_velocity(v)
            seg_branch += [b] * p.n
            reynolds += p.re
            friction += p.f
            if q > 0:
                major += p.major
                minor += p.minor
            else:
                major += [-m for m in p.major]
                minor += [-m for m in p.minor]
        add_valve(p.valve_r * q * abs(q))
    arrays = Arrays(flow=flows, seg_branch=seg_branch, velocity=velocity, reynolds=reynolds,
                    friction_factor=friction, major=major, minor=minor, valve=valve)
    fl = network.fluid
    return Result.made(
        network=network, given=given, find=find,
        pressure_drop=fl.density * network.gravity * (head + network.elevation_change),
        driving_head=head, total_flow=numpy_sum(flows), arrays=arrays, solved=solved,
        warning_source=partial(collect_warnings_small, network, flows, seg_branch, velocity,
                               reynolds, conv),
        convergence=conv,
    )
