"""What the unknowns share: the sought segment over copies of a network, and the words of a
no-solution message (where the head comes from; the Kv a valve would need)."""

from __future__ import annotations

import math
from dataclasses import dataclass, replace
from functools import cached_property

import numpy as np

from ...messages import head_text, kv_text, pressure_text
from ...model import Branch, FindUnknown, Given, Network, PressureDrop
from ..hydraulics import Array, IntArray, Layout, branch_head
from ..variants import BoolArray, Variants


@dataclass(frozen=True)
class Sought:
    """One segment's unknown over copies of a network: segment ``segment`` of branch ``branch``
    must carry the target flow (``variants.target``, m³/s) at the driving head ``head`` (m, one
    per copy; NaN where a copy has no head)."""

    network: Network
    base: Layout
    variants: Variants
    branch: int
    segment: int
    head: Array
    alone: Layout | None = None
    """The branch alone as one copy, when the copies are the network itself (saves tiling)."""

    @classmethod
    def one(cls, network: Network, want: FindUnknown, index: int, head: float) -> Sought:
        """The network itself, as one copy."""
        base = Layout.from_network(network)
        v = Variants.nominal(network, target=want.target_flow, base=base)
        return cls(network, base, v, index, want.segment, np.array([float(head)]),
                   branch_layout(network, network.branches[index]))

    @property
    def target(self) -> Array:
        return self.variants.target

    @property
    def gravity(self) -> float:
        return self.network.gravity

    @cached_property
    def index(self) -> int:
        """The sought segment's index in the network's layout (the variants' segment columns)."""
        return int(np.flatnonzero(self.base.seg_branch == self.branch)[self.segment])

    @cached_property
    def _alone(self) -> tuple[Layout, IntArray, BoolArray]:
        """The copies of the branch alone, the sought segment's index in them per copy, and
        which segments of the network's layout are the branch's."""
        keep = np.arange(self.base.n_branches) == self.branch
        lay = self.alone if self.alone is not None else self.variants.layout(self.base, keep)
        per_copy = int(np.sum(self.base.seg_branch == self.branch))
        return lay, np.arange(self.variants.copies) * per_copy + self.segment, keep[
            self.base.seg_branch]

    def layout(self, **change: Array) -> tuple[Layout, IntArray]:
        """The copies of the branch alone (with ``change``d segment arrays, shape (copies,
        segments of the network)), and the sought segment's index in it for every copy.

        The branch's layout is built once; a change replaces only the arrays it names (a
        root finder asks for many)."""
        lay, k, mine = self._alone
        if change:
            lay = lay.with_segments(**{name: np.ascontiguousarray(values[:, mine]).ravel()
                                       for name, values in change.items()})
        return lay, k

    def column(self, name: str, value: float) -> Array:
        """A copy of the variants' segment array ``name`` with the sought segment set to
        ``value`` in every copy."""
        out: Array = getattr(self.variants, name).copy()
        out[:, self.index] = value
        return out


# ---- words for a no-solution message ---------------------------------------------------------

def with_value(br: Branch, j: int, quantity: str, value: float) -> Branch:
    """``br`` with segment ``j``'s ``quantity`` set to ``value``."""
    segs = list(br.segments)
    segs[j] = replace(segs[j], **{quantity: value})
    return replace(br, segments=tuple(segs))


def branch_layout(net: Network, br: Branch) -> Layout:
    """The layout of ``br`` alone in ``net``'s liquid."""
    return Layout.from_network(replace(net, branches=(br,)))


def where(given: Given, head: float) -> str:
    """Where the head comes from, in words: ``at 68 kPa``, or the head the network sets."""
    if isinstance(given, PressureDrop):
        return f"at {pressure_text(given.value)}"
    return f"at the driving head of {head_text(head)} the network sets"


def valve_hint(net: Network, br: Branch, q: float, head: float) -> str:
    """When a branch's valve takes more of the head than the rest of the branch leaves it, the
    Kv it would need (Δp ∝ (Q/Kv)²: Kv_needed = Kv·√(h_valve / (H − h_rest))); else ''."""
    if br.valve_kv is None:
        return ""
    lay = branch_layout(net, br)
    with np.errstate(all="ignore"):  # a target far beyond any pipe overflows: no hint then
        h_valve = float(lay.valve_r[0]) * q * abs(q)
        h_rest = float(branch_head(lay, np.array([q]))[0]) - h_valve
        if not (0 < h_valve < math.inf and h_rest < head):  # else no Kv would help
            return ""
        needed = three_figures_up(br.valve_kv * math.sqrt(h_valve / (head - h_rest)))
    if not math.isfinite(needed):
        return ""
    return (f"; its valve ({kv_text(br.valve_kv)}) alone loses {head_text(h_valve)} at that "
            f"flow: it would need {kv_text(needed)} or more")


def three_figures_up(x: float) -> float:
    """``x`` rounded up to three significant figures (a "needs at least" figure never reads
    below the need)."""
    if not (math.isfinite(x) and x > 0):
        return x
    step = 10.0 ** (math.floor(math.log10(x)) - 2)
    return math.ceil(x / step - 1e-9) * step
