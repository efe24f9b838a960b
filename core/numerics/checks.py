"""Warnings attached to a result: each with a stable code, the branch, and a plain message.

Every liquid gets them; the limits come from the field's rules of thumb (marked *common practice*)
and from the ranges the correlations' authors published (*from memory*, to be read as "about").
"""

from __future__ import annotations

import math

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
MAX_VELOCITY = 300.0
"""m/s. A liquid is treated as incompressible, which holds well below its speed of sound (about
1500 m/s in water); no liquid line runs anywhere near this (common practice: 1–3 m/s). Beyond
it the last check on every answer refuses the branch (:func:`.solve.solve`)."""


CODES = ("laminar", "transition", "roughness-range", "reynolds-range", "velocity-high")
"""The warnings on a segment, in the order they are listed."""


def collect_warnings(
    net: Network, a: Arrays, regimes: np.ndarray, conv: Convergence
) -> list[SolveWarning]:
    """The warnings of a solved network, from its arrays (any size)."""
    rr = np.array([s.roughness / s.diameter for b in net.branches for s in b.segments])
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
    seg_branch = a.seg_branch
    flagged = [(code, int(s), int(seg_branch[s]), float(re[s]), float(rr[s]), float(speed[s]))
               for code in CODES for s in np.flatnonzero(masks[code])]
    reverse = [(int(b), float(a.flow[b])) for b in np.flatnonzero(a.flow < 0)]
    return _emit(net, flagged, reverse, conv)


def collect_warnings_small(
    net: Network, flow: list[float], seg_branch: list[int], velocity: list[float],
    reynolds: list[float], rr: list[float], conv: Convergence,
) -> list[SolveWarning]:
    """The same warnings from plain lists, one entry a segment (ε/D in ``rr``) or a branch
    (``flow``): a network of a few branches, with no numpy call."""
    model = net.friction
    hw = model == "hazen-williams"
    rough_max = math.inf if hw else ROUGHNESS_RANGE
    re_max = RE_RANGE_MAX if model in ("colebrook", "haaland", "swamee-jain") else math.inf
    sj = model == "swamee-jain"
    sj_re, sj_rr = SWAMEE_JAIN_RANGE
    limit = net.velocity_limit
    found: dict[str, list[tuple[str, int, int, float, float, float]]] = {}
    for s, b in enumerate(seg_branch):
        re = abs(reynolds[s])
        speed = abs(velocity[s])
        r = rr[s]
        if (re >= RE_TURBULENT and r <= rough_max and re <= re_max and speed <= limit
                and not sj) or flow[b] == 0:
            continue  # the usual segment: nothing to say
        if re < RE_LAMINAR:
            found.setdefault("laminar", []).append(("laminar", s, b, re, r, speed))
        elif re < RE_TURBULENT:
            found.setdefault("transition", []).append(("transition", s, b, re, r, speed))
        if r > rough_max:
            found.setdefault("roughness-range", []).append(("roughness-range", s, b, re, r, speed))
        if re >= RE_TURBULENT and (re > re_max or (sj and (re < sj_re or r > sj_rr))):
            found.setdefault("reynolds-range", []).append(("reynolds-range", s, b, re, r, speed))
        if speed > limit:
            found.setdefault("velocity-high", []).append(("velocity-high", s, b, re, r, speed))
    flagged = [row for code in CODES for row in found.get(code, ())]
    reverse = [(b, q) for b, q in enumerate(flow) if q < 0]
    return _emit(net, flagged, reverse, conv)


def _emit(
    net: Network, flagged: list[tuple[str, int, int, float, float, float]],
    reverse: list[tuple[int, float]], conv: Convergence,
) -> list[SolveWarning]:
    """The warnings, each text written when first read: (code, segment, branch, |Re|, ε/D,
    |V|) per flagged segment, (branch, flow) per reversed branch."""
    branches = net.branches
    out: list[SolveWarning] = []
    starts: list[int] = []
    for code, s, b, re, rr, speed in flagged:
        br = branches[b]
        where = ""
        if len(br.segments) > 1:
            if not starts:
                k = 0
                for x in branches:
                    starts.append(k)
                    k += len(x.segments)
            where = f"segment {s - starts[b] + 1}: "
        out.append(SolveWarning(code, br.name, _Detail(code, net, re, rr, speed, where)))
    temperature = net.fluid.temperature
    low, high = HAZEN_WILLIAMS_TEMPERATURES
    if net.friction == "hazen-williams" and temperature is not None and not (
            low <= temperature <= high):
        out.append(SolveWarning(
            "hazen-williams-range", None,
            "Hazen–Williams' C values were fitted to water at about "
            f"{limit_text('temperature', low)} to {limit_text('temperature', high)} "
            "(common practice); at "
            f"{marked('temperature', temperature)} its answer drifts from the Darcy models' "
            "(several percent): prefer colebrook here"))
    if reverse:
        why = ("the outlet pressure is above the inlet pressure — check the sign of the "
               "pressure drop" if net.elevation_change <= 0 else
               "the pressure difference is less than the static lift")
        for b, q in reverse:
            out.append(SolveWarning("reverse-flow", branches[b].name,
                                    f"reverse flow ({flow_text(q)}): {why}"))
    if not conv.converged:
        out.append(SolveWarning("not-converged", None,
                                f"the solver stopped at a relative residual of "
                                f"{conv.residual:.2g}"))
    return out


class _Detail:
    """A segment warning's text, written when first read."""

    __slots__ = ("code", "net", "re", "rr", "speed", "where")

    def __init__(self, code: str, net: Network, re: float, rr: float, speed: float,
                 where: str) -> None:
        self.code, self.net, self.re, self.rr, self.speed = code, net, re, rr, speed
        self.where = where

    def __call__(self) -> str:
        return self.where + _detail(self.code, self.net, self.re, self.rr, self.speed)


def _detail(code: str, net: Network, re: float, rr: float, speed: float) -> str:
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
        return f"ε/D = {rr:.3g} is above {ROUGHNESS_RANGE}, beyond the correlation's range"
    if code == "reynolds-range":
        if net.friction == "swamee-jain" and re <= RE_RANGE_MAX:
            lo, top = SWAMEE_JAIN_RANGE
            return (f"Re {re:.0f}, ε/D {rr:.3g}: Swamee–Jain was fitted for Re ≥ {lo:.0f} and "
                    f"ε/D ≤ {top:g}; colebrook holds here")
        return (f"Re {re:.3g} is above {RE_RANGE_MAX:.0e}, beyond the range the {net.friction} "
                "correlation was fitted to; the answer is extrapolated")
    if code == "velocity-high":
        return (f"velocity {velocity_text(speed)} is above "
                f"{limit_text('velocity', net.velocity_limit)} "
                "(common practice for liquid lines: expect noise and erosion)")
    raise ValueError(code)
