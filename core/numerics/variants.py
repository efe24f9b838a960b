"""Many variants of one network as arrays: copies of its branches side by side in one layout.

A :class:`~.hydraulics.Layout` may hold many independent parallel networks, one per
``branch_group``. :func:`tiled_layout` stacks copies of a network's branches that way, each copy
with its own sizes, viscosity and valve coefficients; :class:`Variants` holds the per-copy
inputs. :func:`.copies.solve_copies` solves them all at once, the system curve
(:mod:`.curve`) puts one copy per point.
"""

from __future__ import annotations

import math
from dataclasses import dataclass, replace

import numpy as np
from numpy.typing import NDArray

from ..model import Branch, Find, FindUnknown, Given, Network, Segment
from .hydraulics import Array, Layout

BoolArray = NDArray[np.bool_]


def tiled_layout(
    base: Layout, copies: int, keep: BoolArray | None = None, *, diameter: Array | None = None,
    length: Array | None = None, roughness: Array | None = None, minor_k: Array | None = None,
    nu: Array | None = None, valve_scale: Array | None = None,
) -> Layout:
    """``copies`` copies of the branches of ``base`` selected by ``keep``, one group per copy.

    Segment arrays are per copy, shape (copies, segments of ``base``): m for diameter, length
    and roughness, – for minor_k; None repeats the base values. ``nu``: kinematic viscosity per
    copy, m²/s. ``valve_scale``: per copy and branch of ``base``, a factor on each valve's Kv
    (its resistance goes as 1/Kv²). Copy c holds branches c·n_kept … c·n_kept + n_kept − 1 in the
    order of ``base``.
    """
    n_seg = len(base.diameter)
    keep = np.ones(base.n_branches, dtype=bool) if keep is None else keep
    seg_keep = keep[base.seg_branch]
    n_kept = int(keep.sum())
    local = (np.cumsum(keep) - 1)[base.seg_branch[seg_keep]]
    offsets = np.arange(copies, dtype=np.intp)[:, None] * n_kept

    def per_copy(values: Array | None, default: Array) -> Array:
        full = default[None, :] if values is None else values
        return np.broadcast_to(full, (copies, n_seg))[:, seg_keep].ravel()

    branch_nu = base.nu[keep][None, :] if nu is None else np.asarray(nu)[:, None]
    valve_r = np.tile(base.valve_r[keep], copies) if valve_scale is None else (
        base.valve_r[keep][None, :] / np.broadcast_to(valve_scale, (copies, base.n_branches))[
            :, keep] ** 2).ravel()
    return Layout(
        seg_branch=(offsets + local[None, :]).ravel(),
        diameter=per_copy(diameter, base.diameter), length=per_copy(length, base.length),
        roughness=per_copy(roughness, base.roughness), minor_k=per_copy(minor_k, base.minor_k),
        hw_c=per_copy(None, base.hw_c), valve_r=valve_r,
        branch_group=np.repeat(np.arange(copies, dtype=np.intp), n_kept),
        nu=np.broadcast_to(branch_nu, (copies, n_kept)).ravel().copy(),
        gravity=base.gravity, model=base.model,
    )


@dataclass(frozen=True)
class Variants:
    """Per-copy inputs of one network (SI). Segment arrays have shape (copies, segments) in the
    order of ``Layout.from_network``: diameter, length, roughness m; minor_k –. Per copy:
    nu m²/s, density kg/m³, reading (the given's value: Pa or m³/s), target (the sought
    unknown's target flow, m³/s; unused when the flows are sought). valve_scale: shape (copies,
    branches), a factor on each branch's valve Kv (None: the entered Kv)."""

    diameter: Array
    length: Array
    roughness: Array
    minor_k: Array
    nu: Array
    density: Array
    reading: Array
    target: Array
    valve_scale: Array | None = None

    @classmethod
    def nominal(cls, network: Network, reading: float = 0.0, target: float = math.nan,
                copies: int = 1, base: Layout | None = None) -> Variants:
        """``copies`` copies of ``network`` as it is (reading: Pa or m³/s; target: m³/s;
        base: the network's layout, when it is at hand)."""
        base = Layout.from_network(network) if base is None else base
        segments = {name: np.tile(getattr(base, name), (copies, 1))
                    for name in ("diameter", "length", "roughness", "minor_k")}
        return cls(nu=np.full(copies, network.fluid.kinematic_viscosity),
                   density=np.full(copies, network.fluid.density),
                   reading=np.full(copies, float(reading)), target=np.full(copies, float(target)),
                   **segments)

    @property
    def copies(self) -> int:
        return len(self.nu)

    def as_model(
        self, network: Network, given: Given, find: Find, copy: int = 0
    ) -> tuple[Network, Given, Find]:
        """Copy ``copy`` as plain model objects (for :func:`.solve.solve`)."""
        k = 0
        branches: list[Branch] = []
        for br in network.branches:
            segs: list[Segment] = []
            for sg in br.segments:
                segs.append(replace(
                    sg, diameter=float(self.diameter[copy, k]), length=float(self.length[copy, k]),
                    roughness=float(self.roughness[copy, k]), minor_k=float(self.minor_k[copy, k])))
                k += 1
            kv = br.valve_kv
            if kv is not None and self.valve_scale is not None:
                kv = kv * float(self.valve_scale[copy, len(branches)])
            branches.append(replace(br, segments=tuple(segs), valve_kv=kv))
        rho = float(self.density[copy])
        fluid = replace(network.fluid, density=rho, viscosity=float(self.nu[copy]) * rho)
        if isinstance(find, FindUnknown):
            find = replace(find, target_flow=float(self.target[copy]))
        given = replace(given, value=float(self.reading[copy]))
        return replace(network, fluid=fluid, branches=tuple(branches)), given, find

    def layout(self, base: Layout, keep: BoolArray | None = None, **change: Array) -> Layout:
        arrays = {"diameter": self.diameter, "length": self.length,
                  "roughness": self.roughness, "minor_k": self.minor_k} | change
        return tiled_layout(base, self.copies, keep, nu=self.nu, valve_scale=self.valve_scale,
                            **arrays)


__all__ = ["Variants", "tiled_layout"]
