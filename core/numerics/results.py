"""What a solve returns: plain objects in SI, built from the solver's arrays.

Per-branch objects are built on first access, so that a very large network (or a benchmark) pays
only for the arrays it asked for.
"""

from __future__ import annotations

from dataclasses import dataclass, field
from functools import cached_property

import numpy as np

from ..model import Find, Given, Network


@dataclass(frozen=True)
class SegmentResult:
    """One segment at the solved flow (SI): m/s, –, –, m, m."""

    diameter: float
    length: float
    roughness: float
    minor_k: float
    velocity: float
    reynolds: float
    friction_factor: float
    regime: str
    major_loss: float
    minor_loss: float


@dataclass(frozen=True)
class BranchResult:
    """One branch: signed flow m³/s, share of the total (–), its segments, valve loss m."""

    name: str
    flow: float
    share: float
    segments: tuple[SegmentResult, ...]
    valve_loss: float

    @property
    def head_loss(self) -> float:
        """Total loss through the branch, m (equals the network's head loss)."""
        return sum(s.major_loss + s.minor_loss for s in self.segments) + self.valve_loss

    @property
    def reverse(self) -> bool:
        return self.flow < 0


@dataclass(frozen=True)
class Solved:
    """The unknown that was found: quantity, branch, segment index, value (m) and target (m³/s)."""

    quantity: str
    branch: str
    segment: int
    value: float
    target_flow: float


@dataclass(frozen=True)
class SolveWarning:
    """Something the engineer should know. ``code`` is stable for scripts.

    ``marked`` is the text with its quantities marked (see ``core.messages``), for a boundary
    that states them in the user's units; ``message`` states them in SI (worked out when first
    read: a network of thousands of fast branches has thousands of warnings).
    """

    code: str
    branch: str | None
    marked: str

    @cached_property
    def message(self) -> str:
        from ..messages import render

        return render(self.marked)


@dataclass(frozen=True)
class Convergence:
    converged: bool
    iterations: int
    residual: float
    """Largest relative residual of the equations solved (head balance, flow balance)."""


@dataclass(frozen=True)
class Arrays:
    """The solver's per-branch and per-segment arrays (SI)."""

    flow: np.ndarray
    seg_branch: np.ndarray
    velocity: np.ndarray
    reynolds: np.ndarray
    friction_factor: np.ndarray
    major: np.ndarray
    minor: np.ndarray
    valve: np.ndarray


@dataclass(frozen=True)
class Result:
    """A solved network.

    network: the network as solved (with a found diameter, length or roughness put in);
    pressure_drop: p_in − p_out, Pa; driving_head: pressure head less the lift, m;
    head_loss: the loss through each branch, m (equal to the driving head);
    total_flow: m³/s.
    """

    network: Network
    given: Given
    find: Find
    pressure_drop: float
    driving_head: float
    total_flow: float
    arrays: Arrays
    solved: Solved | None
    warnings: tuple[SolveWarning, ...]
    convergence: Convergence
    notes: tuple[str, ...] = field(default=())

    @property
    def head_loss(self) -> float:
        return self.driving_head

    @property
    def flows(self) -> np.ndarray:
        return self.arrays.flow

    @cached_property
    def branches(self) -> tuple[BranchResult, ...]:
        a = self.arrays
        from .friction import regime

        regimes = regime(a.reynolds)
        out = []
        s = 0
        for i, br in enumerate(self.network.branches):
            segs = []
            for seg in br.segments:
                segs.append(
                    SegmentResult(
                        seg.diameter, seg.length, seg.roughness, seg.minor_k,
                        float(a.velocity[s]), float(a.reynolds[s]),
                        float(a.friction_factor[s]), str(regimes[s]),
                        float(a.major[s]), float(a.minor[s]),
                    )
                )
                s += 1
            flow = float(a.flow[i])
            share = flow / self.total_flow if self.total_flow != 0 else float("nan")
            out.append(BranchResult(br.name, flow, share, tuple(segs), float(a.valve[i])))
        return tuple(out)

    def branch(self, name: str) -> BranchResult:
        return self.branches[self.network.index_of(name, "branch")]
