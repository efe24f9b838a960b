"""Warnings attached to a result: each with a stable code, the branch, and a plain message.

Every liquid gets them; the limits come from the field's rules of thumb (marked *common practice*)
and from the ranges the correlations' authors published (*from memory*, to be read as "about").
"""

from __future__ import annotations

import numpy as np

from ..messages import flow_text, limit_text, marked, velocity_text
from ..model import Network
from .friction import RE_LAMINAR, RE_TURBULENT
from .results import Arrays, Convergence, SolveWarning

ROUGHNESS_RANGE = 0.05
"""ε/D above which Colebrook-type correlations are extrapolated (commonly held limit)."""
RE_RANGE_MAX = 1e8
"""Re above which Colebrook, Haaland and Swamee–Jain were not fitted (the authors' stated
ranges end at about 10⁸; from memory)."""
SWAMEE_JAIN_RANGE = (5e3, 1e-2)
"""Swamee–Jain (1976) stated 5000 ≤ Re and ε/D ≤ 0.01 (from memory)."""
HAZEN_WILLIAMS_TEMPERATURES = (278.15, 298.15)
"""K: about 5–25 °C, the water Hazen–Williams' C values were fitted to (common practice)."""


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
    re = np.abs(a.reynolds)
    hw = net.friction == "hazen-williams"
    darcy = net.friction in ("colebrook", "haaland", "swamee-jain")
    turbulent = regimes == "turbulent"
    sj_re, sj_rr = SWAMEE_JAIN_RANGE
    masks = {
        "laminar": flowing & (regimes == "laminar"),
        "transition": flowing & (regimes == "transition"),
        "roughness-range": flowing & (rr > ROUGHNESS_RANGE) & (not hw),
        "reynolds-range": flowing & turbulent & (
            (darcy & (re > RE_RANGE_MAX))
            | ((net.friction == "swamee-jain") & ((re < sj_re) | (rr > sj_rr)))),
        "velocity-high": flowing & (speed > net.velocity_limit),
    }
    for code, mask in masks.items():
        for s in np.flatnonzero(mask):
            add(code, int(s), int(a.seg_branch[s]), _detail(code, net, a, rr, int(s)))
    temperature = net.fluid.temperature
    low, high = HAZEN_WILLIAMS_TEMPERATURES
    if hw and temperature is not None and not low <= temperature <= high:
        out.append(SolveWarning(
            "hazen-williams-range", None,
            "Hazen–Williams' C values were fitted to water at about "
            f"{limit_text('temperature', low)} to {limit_text('temperature', high)} "
            "(common practice); at "
            f"{marked('temperature', temperature)} its answer drifts from the Darcy models' "
            "(several percent): prefer colebrook here"))
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
    re = abs(a.reynolds[s])
    hw = net.friction == "hazen-williams"
    if code == "laminar":
        head = f"laminar flow (Re {re:.0f}): f = 64/Re, roughness has no effect"
        return head + ("; Hazen–Williams holds for turbulent flow only, so the laminar law was "
                       "used here" if hw else "")
    if code == "transition":
        used = ("a bridge from the laminar law to Hazen–Williams (Churchill's shape) was used"
                if hw else "no correlation is reliable there")
        return (f"Re {re:.0f} is in the transition zone ({RE_LAMINAR:.0f}–{RE_TURBULENT:.0f}): "
                f"{used}; treat this branch's figures as rough")
    if code == "roughness-range":
        return f"ε/D = {rr[s]:.3g} is above {ROUGHNESS_RANGE}, beyond the correlation's range"
    if code == "reynolds-range":
        if net.friction == "swamee-jain" and re <= RE_RANGE_MAX:
            lo, top = SWAMEE_JAIN_RANGE
            return (f"Re {re:.0f}, ε/D {rr[s]:.3g}: Swamee–Jain was fitted for Re ≥ {lo:.0f} and "
                    f"ε/D ≤ {top:g}; colebrook holds here")
        return (f"Re {re:.3g} is above {RE_RANGE_MAX:.0e}, beyond the range the {net.friction} "
                "correlation was fitted to; the answer is extrapolated")
    if code == "velocity-high":
        return (f"velocity {velocity_text(abs(a.velocity[s]))} is above "
                f"{limit_text('velocity', net.velocity_limit)} "
                "(common practice for liquid lines: expect noise and erosion)")
    raise ValueError(code)


def _segment_numbers(net: Network) -> list[int]:
    return [j for b in net.branches for j in range(len(b.segments))]
