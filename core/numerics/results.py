"""What a solve returns: plain objects in SI, built from the solver's arrays.

Per-branch objects are built on first access, so that a very large network (or a benchmark) pays
only for the arrays it asked for.
"""

from __future__ import annotations

from collections.abc import Callable, Sequence
from dataclasses import dataclass, field
from functools import cached_property

import numpy as np

from ..model import Find, Given, Network
from .bulk import no_collection


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


@dataclass(frozen=True, eq=False)
class SolveWarning:
    """Something the engineer should know. ``code`` is stable for scripts.

    ``marked`` is the text with its quantities marked (see ``core.messages``), for a boundary
    that states them in the user's units; ``message`` states them in SI. Both are worked out
    when first read (a network of thousands of fast branches has thousands of warnings): the
    third argument may be the text or a function that writes it.
    """

    code: str
    branch: str | None
    text: str | Callable[[], str] = field(repr=False)

    @cached_property
    def marked(self) -> str:
        return self.text if isinstance(self.text, str) else self.text()

    @cached_property
    def message(self) -> str:
        from ..messages import render

        return render(self.marked)

    def __eq__(self, other: object) -> bool:
        if not isinstance(other, SolveWarning):
            return NotImplemented
        return (self.code, self.branch, self.marked) == (other.code, other.branch, other.marked)

    def __hash__(self) -> int:
        return hash((self.code, self.branch, self.marked))

    def __repr__(self) -> str:
        return f"SolveWarning(code={self.code!r}, branch={self.branch!r}, marked={self.marked!r})"


@dataclass(frozen=True)
class Convergence:
    converged: bool
    iterations: int
    residual: float
    """Largest relative residual of the equations solved (head balance, flow balance)."""


Column = Sequence[float] | np.ndarray
"""An array of :class:`Arrays`, or the plain list it is made from."""
_ARRAY_NAMES = ("flow", "seg_branch", "velocity", "reynolds", "friction_factor", "major",
                "minor", "valve")


class Arrays:
    """The solver's per-branch and per-segment arrays (SI): flow and valve per branch, the
    others per segment (``seg_branch`` the branch of each). Each may be handed over as a plain
    list (a small network's solve) and becomes a numpy array when first read."""

    __slots__ = ("_values",)

    def __init__(self, *, flow: Column, seg_branch: Column, velocity: Column, reynolds: Column,
                 friction_factor: Column, major: Column, minor: Column, valve: Column) -> None:
        self._values: dict[str, object] = {
            "flow": flow, "seg_branch": seg_branch, "velocity": velocity, "reynolds": reynolds,
            "friction_factor": friction_factor, "major": major, "minor": minor, "valve": valve}

    def _get(self, name: str) -> np.ndarray:
        value = self._values[name]
        if not isinstance(value, np.ndarray):
            value = np.array(value, dtype=np.intp if name == "seg_branch" else float)
            self._values[name] = value
        return value

    def __repr__(self) -> str:
        return "Arrays(" + ", ".join(f"{k}={self._get(k)!r}" for k in _ARRAY_NAMES) + ")"

    @property
    def flow(self) -> np.ndarray:
        return self._get("flow")

    @property
    def seg_branch(self) -> np.ndarray:
        return self._get("seg_branch")

    @property
    def velocity(self) -> np.ndarray:
        return self._get("velocity")

    @property
    def reynolds(self) -> np.ndarray:
        return self._get("reynolds")

    @property
    def friction_factor(self) -> np.ndarray:
        return self._get("friction_factor")

    @property
    def major(self) -> np.ndarray:
        return self._get("major")

    @property
    def minor(self) -> np.ndarray:
        return self._get("minor")

    @property
    def valve(self) -> np.ndarray:
        return self._get("valve")


@dataclass(frozen=True)
class Result:
    """A solved network (its warnings, and each warning's text, are written when first read).

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
    warning_source: Callable[[], Sequence[SolveWarning]] = field(repr=False, compare=False)
    """Writes the warnings from the solve's codes and values (``checks``), when first read."""
    convergence: Convergence
    notes: tuple[str, ...] = field(default=())

    @cached_property
    def warnings(self) -> tuple[SolveWarning, ...]:
        """What the engineer should know of this answer, in a stable order (``checks``)."""
        with no_collection():
            return tuple(self.warning_source())

    @property
    def head_loss(self) -> float:
        return self.driving_head

    @property
    def flows(self) -> np.ndarray:
        return self.arrays.flow

    @cached_property
    def branches(self) -> tuple[BranchResult, ...]:
        with no_collection():
            return self._branches()

    def _branches(self) -> tuple[BranchResult, ...]:
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

    @classmethod
    def made(cls, network: Network, given: Given, find: Find, pressure_drop: float,
             driving_head: float, total_flow: float, arrays: Arrays, solved: Solved | None,
             warning_source: Callable[[], Sequence[SolveWarning]], convergence: Convergence,
             notes: tuple[str, ...] = ()) -> Result:
        """The same Result as the constructor's, its fields set at once: a frozen dataclass's
        constructor sets each through ``object.__setattr__``, a few per cent of a small
        network's whole solve (a test keeps these parameters the fields)."""
        made = object.__new__(cls)
        made.__dict__.update(
            network=network, given=given, find=find, pressure_drop=pressure_drop,
            driving_head=driving_head, total_flow=total_flow, arrays=arrays, solved=solved,
            warning_source=warning_source, convergence=convergence, notes=notes)
        return made
