"""The :class:`Result` of a small network in plain floats: its columns filled a branch at a time
(from a branch object's last state, or straight from a branch's answer, :mod:`.at_head`).

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


class Columns:
    """The arrays of a :class:`Result` in plain lists, a branch at a time in network order,
    each flow's sign put back on its velocities and losses; a branch beyond the physical
    bounds raises :class:`Fallback` (the vectorised path names it)."""

    __slots__ = ("flow", "seg_branch", "velocity", "reynolds", "friction", "major", "minor",
                 "valve")

    def __init__(self) -> None:
        self.flow: list[float] = []
        self.seg_branch: list[int] = []
        self.velocity: list[float] = []
        self.reynolds: list[float] = []
        self.friction: list[float] = []
        self.major: list[float] = []
        self.minor: list[float] = []
        self.valve: list[float] = []

    def add_one(self, q: float, area: float, re: float, f: float, major: float, minor: float,
                valve_r: float) -> None:
        """A one-segment branch carrying ``q`` (m³/s, signed); its losses are for |q|."""
        if not (abs(q) <= MAX_FLOW and q != 0):  # NaN fails too
            raise Fallback("bounds")
        v = q / area
        if not abs(v) <= MAX_VELOCITY:
            raise Fallback("bounds")
        self.seg_branch.append(len(self.flow))
        self.flow.append(q)
        self.velocity.append(v)
        self.reynolds.append(re)
        self.friction.append(f)
        if q > 0:
            self.major.append(major)
            self.minor.append(minor)
        else:
            self.major.append(-major)
            self.minor.append(-minor)
        self.valve.append(valve_r * q * abs(q))

    def add_pipe(self, p: Pipe, q: float) -> None:
        """A branch's pipe in its last state, at ``q`` (m³/s, signed)."""
        if p.n == 1:
            self.add_one(q, p.area[0], p.re[0], p.f[0], p.major[0], p.minor[0], p.valve_r)
        else:
            self.add_series(q, p.area, p.re, p.f, p.major, p.minor, p.valve_r)

    def add_series(self, q: float, area: list[float], re: list[float], f: list[float],
                   major: list[float], minor: list[float], valve_r: float) -> None:
        """A branch of several segments (per segment: A, Re, f and the losses for |q|)."""
        if not (abs(q) <= MAX_FLOW and q != 0):
            raise Fallback("bounds")
        for a in area:
            v = q / a
            if not abs(v) <= MAX_VELOCITY:
                raise Fallback("bounds")
            self.velocity.append(v)
        self.seg_branch += [len(self.flow)] * len(area)
        self.flow.append(q)
        self.reynolds += re
        self.friction += f
        if q > 0:
            self.major += major
            self.minor += minor
        else:
            self.major += [-m for m in major]
            self.minor += [-m for m in minor]
        self.valve.append(valve_r * q * abs(q))

    def result(self, network: Network, given: Given, find: Find, head: float,
               solved: Solved | None, conv: Convergence) -> Result:
        """The Result at driving head ``head`` (m), its warnings built when first read."""
        if not _isfinite(head):
            raise Fallback("head")
        flows = self.flow
        arrays = Arrays(flow=flows, seg_branch=self.seg_branch, velocity=self.velocity,
                        reynolds=self.reynolds, friction_factor=self.friction, major=self.major,
                        minor=self.minor, valve=self.valve)
        fl = network.fluid
        return Result.made(
            network=network, given=given, find=find,
            pressure_drop=fl.density * network.gravity * (head + network.elevation_change),
            driving_head=head, total_flow=numpy_sum(flows), arrays=arrays, solved=solved,
            warning_source=partial(collect_warnings_small, network, flows, self.seg_branch,
                                   self.velocity, self.reynolds, conv),
            convergence=conv,
        )


def build_result(
    network: Network, given: Given, find: Find, pipes: Sequence[Pipe], head: float,
    flows: list[float], solved: Solved | None, conv: Convergence,
) -> Result:
    """The Result from each branch's pipe in its last state, carrying ``flows`` (signed)."""
    columns = Columns()
    for p, q in zip(pipes, flows, strict=True):
        columns.add_pipe(p, q)
    return columns.result(network, given, find, head, solved, conv)


_EXACT = tuple(Convergence(converged=True, iterations=i, residual=0.0) for i in range(64))
"""The common answers of :func:`convergence`, made once (a Convergence is frozen)."""


def convergence(infos: list[tuple[bool, int, float]]) -> Convergence:
    """Every part converged, the iterations added up, the largest residual (one part, the
    common case, as it is)."""
    if len(infos) == 1:
        ok, iterations, residual = infos[0]
        if ok and residual == 0.0 and iterations < len(_EXACT):
            return _EXACT[iterations]
        return Convergence(converged=ok, iterations=iterations, residual=residual)
    return Convergence(converged=all(i[0] for i in infos),
                       iterations=sum(i[1] for i in infos),
                       residual=max((i[2] for i in infos), default=0.0))
