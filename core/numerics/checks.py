"""Warnings attached to a result: each with a stable code, the branch, and a plain message.

Every liquid gets them; the limits come from the field's rules of thumb (marked *common practice*)
and from the ranges the correlations' authors published (*from memory*, to be read as "about").

One rule says which warnings a segment earns (:class:`_Rule`) and one emission turns them into
:class:`SolveWarning` objects (:func:`_emit`), whatever the size of the network: a large one is
sifted with numpy first (only segments outside the usual case are looked at one by one), a small
one with plain floats. A warning holds its code and values; its text is written when first read.
"""

from __future__ import annotations

import math
from collections.abc import Sequence

import numpy as np

from ..messages import flow_text, limit_text, marked, reynolds_text, velocity_text
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


CODES = ("laminar-law-beyond", "laminar", "transition", "roughness-range", "reynolds-range",
         "velocity-high")
"""The warnings on a segment, in the order they are listed."""

Flag = tuple[str, int, int, float, float, float]
"""A flagged segment: (code, segment, branch, |Re|, ε/D, |V|)."""


class _Rule:
    """Which warnings a flowing segment earns under a network's model and velocity limit."""

    __slots__ = ("rough_max", "re_max", "sj", "limit", "laminar_law")

    def __init__(self, net: Network) -> None:
        model = net.friction
        self.rough_max = math.inf if model == "hazen-williams" else ROUGHNESS_RANGE
        self.re_max = (RE_RANGE_MAX if model in ("colebrook", "haaland", "swamee-jain")
                       else math.inf)
        self.sj = model == "swamee-jain"
        self.laminar_law = model == "laminar"  # f = 64/Re whatever Re: said wherever Re ≥ 2000
        self.limit = net.velocity_limit

    def usual(self, re: np.ndarray, rr: np.ndarray, speed: np.ndarray) -> np.ndarray:
        """True where a segment earns no warning (the sieve of a large network)."""
        if self.sj or self.laminar_law:
            return np.zeros(re.shape, dtype=bool)
        return ((re >= RE_TURBULENT) & (rr <= self.rough_max) & (re <= self.re_max)
                & (speed <= self.limit))

    def flag(self, found: dict[str, list[Flag]], s: int, b: int, re: float, rr: float,
             speed: float) -> None:
        """Adds segment ``s`` (of branch ``b``) to ``found`` under each code it earns."""
        rough_max, re_max, limit, sj = self.rough_max, self.re_max, self.limit, self.sj
        if re >= RE_TURBULENT and rr <= rough_max and re <= re_max and speed <= limit and (
                not sj) and not self.laminar_law:
            return  # the usual segment: nothing to say
        if self.laminar_law and re >= RE_LAMINAR:
            found.setdefault("laminar-law-beyond", []).append(
                ("laminar-law-beyond", s, b, re, rr, speed))
        if re < RE_LAMINAR:
            found.setdefault("laminar", []).append(("laminar", s, b, re, rr, speed))
        elif re < RE_TURBULENT:
            found.setdefault("transition", []).append(("transition", s, b, re, rr, speed))
        if rr > rough_max:
            found.setdefault("roughness-range", []).append(
                ("roughness-range", s, b, re, rr, speed))
        if re >= RE_TURBULENT and (re > re_max or (sj and (
                re < SWAMEE_JAIN_RANGE[0] or rr > SWAMEE_JAIN_RANGE[1]))):
            found.setdefault("reynolds-range", []).append(("reynolds-range", s, b, re, rr, speed))
        if speed > limit:
            found.setdefault("velocity-high", []).append(("velocity-high", s, b, re, rr, speed))


def collect_warnings(net: Network, a: Arrays, conv: Convergence) -> list[SolveWarning]:
    """The warnings of a solved network from its numpy arrays (any size)."""
    rr = np.array([s.roughness / s.diameter for b in net.branches for s in b.segments])
    speed = np.abs(a.velocity)
    re = np.abs(a.reynolds)
    seg_branch = a.seg_branch
    rule = _Rule(net)
    look = np.flatnonzero((a.flow[seg_branch] != 0) & ~rule.usual(re, rr, speed))
    found: dict[str, list[Flag]] = {}
    for s, b, re_s, rr_s, v_s in zip(look.tolist(), seg_branch[look].tolist(),
                                      re[look].tolist(), rr[look].tolist(),
                                      speed[look].tolist(), strict=True):
        rule.flag(found, s, b, re_s, rr_s, v_s)
    flow = a.flow
    reverse = [(b, float(flow[b])) for b in np.flatnonzero(flow < 0).tolist()]
    return _emit(net, found, reverse, conv)


def collect_warnings_small(
    net: Network, flow: Sequence[float], seg_branch: Sequence[int], velocity: Sequence[float],
    reynolds: Sequence[float], conv: Convergence,
) -> list[SolveWarning]:
    """The same warnings from plain lists, one entry a segment or a branch (``flow``): a
    network of a few branches, with no numpy call."""
    rr = [s.roughness / s.diameter for b in net.branches for s in b.segments]
    rule = _Rule(net)
    found: dict[str, list[Flag]] = {}
    for s, b in enumerate(seg_branch):
        if flow[b] != 0:
            rule.flag(found, s, b, abs(reynolds[s]), rr[s], abs(velocity[s]))
    reverse = [(b, q) for b, q in enumerate(flow) if q < 0]
    return _emit(net, found, reverse, conv)


def _emit(
    net: Network, found: dict[str, list[Flag]], reverse: list[tuple[int, float]],
    conv: Convergence,
) -> list[SolveWarning]:
    """The warnings in their order (segments by code, then the liquid, reversed branches and
    the solve), each holding its values; ``reverse`` is (branch, flow) per reversed branch."""
    branches = net.branches
    out: list[SolveWarning] = []
    starts: list[int] = []
    for code in CODES:
        if code not in found:
            continue
        for _, s, b, re, rr, speed in found[code]:
            br = branches[b]
            segment = 0
            if len(br.segments) > 1:
                if not starts:
                    k = 0
                    for x in branches:
                        starts.append(k)
                        k += len(x.segments)
                segment = s - starts[b] + 1
            out.append(SolveWarning(code, br.name, _Text(code, net, (re, rr, speed, segment))))
    temperature = net.fluid.temperature
    low, high = HAZEN_WILLIAMS_TEMPERATURES
    if net.friction == "hazen-williams" and temperature is not None and not (
            low <= temperature <= high):
        out.append(SolveWarning("hazen-williams-range", None,
                                _Text("hazen-williams-range", net, (temperature,))))
    for b, q in reverse:
        out.append(SolveWarning("reverse-flow", branches[b].name,
                                _Text("reverse-flow", net, (q,))))
    if not conv.converged:
        out.append(SolveWarning("not-converged", None,
                                _Text("not-converged", net, (conv.residual,))))
    return out


class _Text:
    """A warning's text from its code and values, written when first read."""

    __slots__ = ("code", "net", "values")

    def __init__(self, code: str, net: Network, values: tuple[float, ...]) -> None:
        self.code, self.net, self.values = code, net, values

    def __call__(self) -> str:
        code, net, values = self.code, self.net, self.values
        if code in CODES:
            re, rr, speed, segment = values
            where = f"segment {segment:.0f}: " if segment else ""
            return where + _segment_text(code, net, re, rr, speed)
        if code == "hazen-williams-range":
            low, high = HAZEN_WILLIAMS_TEMPERATURES
            return ("Hazen–Williams' C values were fitted to water at about "
                    f"{limit_text('temperature', low)} to {limit_text('temperature', high)} "
                    "(common practice); at "
                    f"{marked('temperature', values[0])} its answer drifts from the Darcy "
                    "models' (several percent): prefer colebrook here")
        if code == "reverse-flow":
            why = ("the outlet pressure is above the inlet pressure — check the sign of the "
                   "pressure drop, or of the reading solved from (a clamp-on mounted the other "
                   "way reads a negative flow)" if net.elevation_change <= 0 else
                   "the pressure difference is less than the static lift")
            return f"reverse flow ({flow_text(values[0])}): {why}"
        if code == "not-converged":
            return f"the solver stopped at a relative residual of {values[0]:.2g}"
        raise ValueError(code)


def _segment_text(code: str, net: Network, re: float, rr: float, speed: float) -> str:
    hw = net.friction == "hazen-williams"
    if code == "laminar-law-beyond":
        return (f"Re {reynolds_text(re)} is above {RE_LAMINAR:.0f}, yet the friction model is "
                "the laminar law (f = 64/Re): the flow here is not laminar, so its friction is "
                "too low and this branch's figures are wrong — choose colebrook")
    if code == "laminar":
        head = f"laminar flow (Re {reynolds_text(re)}): f = 64/Re, roughness has no effect"
        return head + ("; Hazen–Williams holds for turbulent flow only, so the laminar law was "
                       "used here" if hw else "")
    if code == "transition":
        used = ("a bridge from the laminar law to Hazen–Williams (Churchill's shape) was used"
                if hw else "no correlation is reliable there")
        return (f"Re {reynolds_text(re)} is in the transition zone "
                f"({RE_LAMINAR:.0f}–{RE_TURBULENT:.0f}): {used}; treat this branch's figures "
                "as rough")
    if code == "roughness-range":
        return f"ε/D = {rr:.3g} is above {ROUGHNESS_RANGE}, beyond the correlation's range"
    if code == "reynolds-range":
        if net.friction == "swamee-jain" and re <= RE_RANGE_MAX:
            lo, top = SWAMEE_JAIN_RANGE
            return (f"Re {reynolds_text(re)}, ε/D {rr:.3g}: Swamee–Jain was fitted for "
                    f"Re ≥ {lo:.0f} and ε/D ≤ {top:g}; colebrook holds here")
        return (f"Re {re:.3g} is above {RE_RANGE_MAX:.0e}, beyond the range the {net.friction} "
                "correlation was fitted to; the answer is extrapolated")
    if code == "velocity-high":
        return (f"velocity {velocity_text(speed)} is above "
                f"{limit_text('velocity', net.velocity_limit)} "
                "(common practice for liquid lines: expect noise and erosion)")
    raise ValueError(code)
