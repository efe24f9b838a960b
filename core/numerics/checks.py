"""Warnings attached to a result: each with a stable code, the branch, and a plain message."""

from __future__ import annotations

import numpy as np

from ..fluids import liquid
from ..messages import flow_text, velocity_text
from ..model import Network
from .friction import RE_LAMINAR, RE_TURBULENT
from .results import Arrays, Convergence, SolveWarning

ROUGHNESS_RANGE = 0.05
"""ε/D above which Colebrook-type correlations are extrapolated (commonly held limit)."""


def collect_warnings(
    net: Network, a: Arrays, regimes: np.ndarray, conv: Convergence
) -> list[SolveWarning]:
    out: list[SolveWarning] = []
    names = [b.name for b in net.branches]
    seg_index = _segment_numbers(net)
    rr = np.array([s.roughness / s.diameter for b in net.branches for s in b.segments])
    # A per-branch list of names and segment numbers is built once; only flagged items loop.

    def add(code: str, seg: int | None, branch: int | None, detail: str) -> None:
        name = names[branch] if branch is not None else None
        where = ""
        if seg is not None and branch is not None and len(net.branches[branch].segments) > 1:
            where = f"segment {seg_index[seg] + 1}: "
        out.append(SolveWarning(code, name, f"{where}{detail}"))

    flowing = a.flow[a.seg_branch] != 0
    speed = np.abs(a.velocity)
    hw = net.friction == "hazen-williams"
    masks = {
        "laminar": flowing & (regimes == "laminar"),
        "transition": flowing & (regimes == "transition"),
        "roughness-range": flowing & (rr > ROUGHNESS_RANGE) & (not hw),
        "velocity-high": flowing & (speed > net.velocity_limit) & _water_based(net),
        "hazen-williams-range": flowing & hw & (
            (regimes != "turbulent") | (net.fluid.kind not in ("water", "seawater"))),
    }
    for code, mask in masks.items():
        for s in np.flatnonzero(mask):
            add(code, int(s), int(a.seg_branch[s]), _detail(code, net, a, rr, int(s)))
    why = ("the outlet pressure is above the inlet pressure — check the sign of the pressure "
           "drop" if net.elevation_change <= 0 else
           "the pressure difference is less than the static lift")
    for b in np.flatnonzero(a.flow < 0):
        add("reverse-flow", None, int(b), f"reverse flow ({flow_text(a.flow[b])}): {why}")
    if not conv.converged:
        out.append(SolveWarning("not-converged", None,
                           f"the solver stopped at a relative residual of {conv.residual:.2g}"))
    return out


def _detail(code: str, net: Network, a: Arrays, rr: np.ndarray, s: int) -> str:
    re = a.reynolds[s]
    if code == "laminar":
        return f"laminar flow (Re {re:.0f}): f = 64/Re, roughness has no effect"
    if code == "transition":
        return (f"Re {re:.0f} is in the transition zone ({RE_LAMINAR:.0f}–{RE_TURBULENT:.0f}): "
                "no correlation is reliable there; treat this branch's figures as rough")
    if code == "roughness-range":
        return f"ε/D = {rr[s]:.3g} is above {ROUGHNESS_RANGE}, beyond the correlation's range"
    if code == "velocity-high":
        return (f"velocity {velocity_text(abs(a.velocity[s]))} is above "
                f"{velocity_text(net.velocity_limit)} "
                "(common practice for water lines: expect noise and erosion)")
    return "Hazen–Williams is meant for water in turbulent flow; use a Darcy model here"


def _water_based(net: Network) -> bool:
    """Whether the liquid is water or a water solution (the velocity rule of thumb is theirs)."""
    kind = liquid(net.fluid.kind)
    return kind is not None and kind.water_based


def _segment_numbers(net: Network) -> list[int]:
    return [j for b in net.branches for j in range(len(b.segments))]
