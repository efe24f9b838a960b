"""Each uncertain input nudged by ± δ on its own, with memory bounded whatever the network's size.

The first-order spread of a model value (JCGM 100:2008, 5.1.2) asks for the network solved with
each input moved alone, up and down: 2 · (number of inputs) copies. An input moves one branch
(its roughness, bore, length, K or valve), or all of them (the temperature), so only the
branches moved are solved again; the rest keep their flow. The copies are made in chunks of
inputs sized by a memory budget (as :mod:`.draws` does for the Monte Carlo draws), and of each
chunk only the moved branches are kept: the memory grows with the branches moved, not with
(inputs × branches).
"""

from __future__ import annotations

from dataclasses import dataclass, replace

import numpy as np
import numpy.typing as npt

from .draws import WORK_BYTES, chunks
from .hydraulics import Array, Layout, flows_at_head, subset
from .sampling import InputTolerance, SamplingPlan

IntArray = npt.NDArray[np.intp]

BYTES_PER_ROW_SEGMENT = 160
"""Bytes one copy of a segment takes while a chunk's copies are made (the four segment arrays,
the tiled layout's eleven, the mask; measured on 3,000 branches)."""


@dataclass(frozen=True)
class Nudges:
    """The branches each input moves, up (row j) and down (row n_inputs + j), as one layout.

    layout: the moved branches, one group per row; row, branch: the row and the network's
    branch of each of them; rho_g: ρ g per row (N/m³: the temperature moves ρ)."""

    layout: Layout
    row: IntArray
    branch: IntArray
    rho_g: Array
    n_inputs: int

    def flow_changes(self, head: float, flows: Array) -> Array:
        """Each moved branch's flow at ``head`` minus its flow ``flows`` there unmoved (m³/s);
        Newton starts from the unmoved flows."""
        start = flows[self.branch]
        return np.asarray(flows_at_head(self.layout, head, np.abs(start))[0] - start,
                          dtype=float)

    def total_flow(self, changes: Array) -> Array:
        """The change of the total flow per row (m³/s)."""
        return np.asarray(np.bincount(self.row, weights=changes, minlength=2 * self.n_inputs),
                          dtype=float)

    def branch_flow(self, changes: Array, branch: int) -> Array:
        """The change of ``branch``'s flow per row (m³/s)."""
        out = np.zeros(2 * self.n_inputs)
        hit = self.branch == branch
        out[self.row[hit]] = changes[hit]
        return out


def moved_branches(inp: InputTolerance, base: Layout) -> list[int]:
    """The branches ``inp`` moves (all of them for the temperature)."""
    if inp.kind == "temperature":
        return list(range(base.n_branches))
    if inp.kind == "valve Kv":
        return list(inp.segments)  # a valve's segments hold its branch
    return sorted({int(b) for b in base.seg_branch[list(inp.segments)]})


def nudges(plan: SamplingPlan, base: Layout, step: float, gravity: float,
           budget: int = WORK_BYTES) -> Nudges:
    """Every input of ``plan`` nudged by ± ``step`` of its half-width (``base``: the network's
    layout), made ``budget`` bytes of copies at a time."""
    inputs, n_in = plan.inputs, len(plan.inputs)
    per_row = BYTES_PER_ROW_SEGMENT * max(len(base.diameter), 1) + base.n_branches
    size = max(1, budget // per_row // 2)
    parts: list[Layout] = []
    rows: list[IntArray] = []
    branches: list[IntArray] = []
    rho_g = np.full(2 * n_in, plan.network.fluid.density * gravity)
    for start, stop in chunks(n_in, size):
        c = stop - start
        part = replace(plan, inputs=inputs[start:stop])
        z = np.zeros((2 * c, c))
        z[np.arange(c), np.arange(c)] = step
        z[c + np.arange(c), np.arange(c)] = -step
        v = part.variants(z, base)
        moved = np.zeros((2 * c, base.n_branches), dtype=bool)
        for j, inp in enumerate(inputs[start:stop]):
            moved[np.ix_([j, c + j], moved_branches(inp, base))] = True
        parts.append(subset(v.layout(base), moved.ravel()))
        r, b = np.nonzero(moved)  # row-major: the order subset keeps
        rows.append(np.where(r < c, start + r, n_in + start + r - c).astype(np.intp))
        branches.append(b.astype(np.intp))
        rho_g[start:stop] = v.density[:c] * gravity
        rho_g[n_in + start:n_in + stop] = v.density[c:] * gravity
    return Nudges(_joined(parts, base), np.concatenate(rows), np.concatenate(branches),
                  rho_g, n_in)


def _joined(parts: list[Layout], base: Layout) -> Layout:
    """Layouts side by side: their branches and groups numbered on."""
    if not parts:
        return subset(base, np.zeros(base.n_branches, dtype=bool))
    branch_at = np.cumsum([0] + [p.n_branches for p in parts[:-1]])
    group_at = np.cumsum([0] + [p.n_groups for p in parts[:-1]])

    def cat(name: str) -> Array:
        return np.concatenate([getattr(p, name) for p in parts])

    return Layout(
        seg_branch=np.concatenate([p.seg_branch + o for p, o in zip(parts, branch_at,
                                                                     strict=True)]),
        diameter=cat("diameter"), length=cat("length"), roughness=cat("roughness"),
        minor_k=cat("minor_k"), hw_c=cat("hw_c"), valve_r=cat("valve_r"),
        branch_group=np.concatenate([p.branch_group + o for p, o in zip(parts, group_at,
                                                                         strict=True)]),
        nu=cat("nu"), gravity=base.gravity, model=base.model,
    )
