"""The roughness of one segment such that its branch carries the target flow at the driving head.

The head balance gives the friction factor the segment must have:

    f = (H − (h_X(Q_x) − h_major,s)) / (L/D · V|V|/2g)

Colebrook is then explicit in ε (ε = 3.7 D [10^(−1/(2√f)) − 2.51/(Re √f)]) in turbulent flow;
other models, and the transition zone, are inverted with a bracketed root finder on ε/D, along
which f is increasing. No answer in laminar flow (roughness has no effect there), or when the
needed f lies below that of a smooth pipe or above that of ε = D/2.
"""

from __future__ import annotations

import math

import numpy as np

from ...errors import InputError, NoSolutionError
from ...messages import flow_text, reynolds_text
from ...model import FindUnknown, Given, Network
from .. import friction
from ..hydraulics import Array, branch_head, segment_state
from ..roots import FAST_TOL, illinois
from .common import Sought, valve_hint, where, with_value

RR_MAX = 0.5 * (1 - 1e-12)
"""The roughest relative roughness tried: just below half the bore (ε = D/2 fills the pipe)."""
RR_FLOOR = 1e-18
"""Relative roughness below which a bracket counts as collapsed (far below any real pipe)."""


def check(net: Network, want: FindUnknown, index: int) -> None:
    """A roughness needs a Darcy friction model and a segment with a length."""
    if net.friction in ("hazen-williams", "laminar"):
        raise InputError("conditions.friction", net.friction,
                         "finding a roughness needs a Darcy friction model such as colebrook")
    if net.branches[index].segments[want.segment].length <= 0:
        raise InputError("solve.segment", want.segment,
                         "the segment has no length, so its roughness has no effect")


def _needed(s: Sought) -> tuple[Array, Array, Array]:
    """Per copy: the Reynolds number of the segment, its diameter (m), and the friction
    factor it must have."""
    lay, k = s.layout()
    st = segment_state(lay, s.target)
    re, d = st.reynolds[k], lay.diameter[k]
    coeff = lay.length[k] / d * st.velocity[k] * np.abs(st.velocity[k]) / (2 * s.gravity)
    with np.errstate(divide="ignore", invalid="ignore"):
        f_need = (s.head - (branch_head(lay, s.target) - st.major[k])) / coeff
    return re, d, f_need


def _limits(re: Array, model: str) -> tuple[Array, Array]:
    """The friction factor of a smooth pipe and of ε = D/2 at each Reynolds number."""
    with np.errstate(invalid="ignore", divide="ignore"):
        smooth = friction.darcy(re, np.zeros_like(re), model)[0]
        roughest = friction.darcy(re, np.full_like(re, RR_MAX), model)[0]
    return smooth, roughest


def solve(s: Sought, tol: float = FAST_TOL) -> Array:
    """The roughness ε per copy (m); NaN where there is none."""
    model = s.network.friction
    re, d, f_need = _needed(s)
    smooth, roughest = _limits(re, model)
    ok = (re >= friction.RE_LAMINAR) & (f_need > smooth) & (f_need <= roughest)
    turbulent = (re >= friction.RE_TURBULENT) & (model == "colebrook")
    with np.errstate(invalid="ignore", divide="ignore"):
        f_need = np.where(ok, f_need, smooth * 1.5)  # a harmless stand-in where there is none
        xs = 1 / np.sqrt(f_need)
        eps = 3.7 * d * (10 ** (-xs / 2) - 2.51 * xs / re)

    def excess(rr: Array) -> Array:
        return friction.darcy(re, rr, model)[0] / f_need - 1

    if not turbulent.all():
        lo, hi = np.zeros_like(re), np.full_like(re, RR_MAX)
        found = illinois(excess, lo, hi, excess(lo), excess(hi), ok & ~turbulent, tol,
                         floor=RR_FLOOR)
        eps = np.where(turbulent, eps, d * found)
    return np.where(ok, eps, np.nan)


def why_not(s: Sought, given: Given) -> NoSolutionError:
    """Why the one copy of ``s`` has no roughness."""
    br = s.network.branches[s.branch]
    q, head = float(s.target[0]), float(s.head[0])
    re_a, _, f_a = _needed(s)
    re, f_needed = float(re_a[0]), float(f_a[0])
    if re < friction.RE_LAMINAR:
        return NoSolutionError(
            f"branch '{br.name}' is laminar at {flow_text(q)} (Re {reynolds_text(re)}): "
            "roughness has no effect on its loss, so it cannot be found from a flow",
            "solve.target_flow")
    if not f_needed > 0:
        zero = with_value(br, s.segment, "length", 0.0)
        return NoSolutionError(
            f"branch '{br.name}' cannot carry {flow_text(q)} {where(given, head)} whatever the "
            "roughness: its fittings and other segments alone lose more than the available "
            f"head at that flow{valve_hint(s.network, zero, q, head)}", "solve.target_flow")
    smooth_a, roughest_a = _limits(re_a, s.network.friction)
    smooth, roughest = float(smooth_a[0]), float(roughest_a[0])
    if not f_needed > smooth:
        return NoSolutionError(
            f"branch '{br.name}' would need a roughness below zero to carry {flow_text(q)} "
            f"{where(given, head)}: even a smooth pipe needs f = {smooth:.4g}, and only "
            f"f = {f_needed:.4g} is available (check the reading, the length and the fittings)",
            "solve.target_flow")
    if math.isfinite(f_needed) and f_needed > roughest:
        return NoSolutionError(
            f"branch '{br.name}' cannot be rough enough to lose the head at {flow_text(q)}: "
            f"even ε = D/2 gives only f = {roughest:.4g}, f = {f_needed:.4g} is needed (look "
            "for a partly closed valve or a blockage)", "solve.target_flow")
    return NoSolutionError(f"branch '{br.name}': no roughness found for {flow_text(q)} "
                           f"{where(given, head)}", "solve.target_flow")
