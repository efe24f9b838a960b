"""One segment's diameter, length or roughness such that its branch carries a target flow.

Branch X must lose exactly the driving head H at the target flow Q_x: h_X(Q_x) = H.

* length: friction in the sought segment is f L/D · V²/2g with f independent of L, so
  L = (H − h_X(Q_x; L = 0)) / (f/D · V²/2g) — explicit and exact;
* roughness: the same balance gives the friction factor the segment must have; Colebrook is
  then explicit in ε (ε = 3.7 D [10^(−1/(2√f)) − 2.51/(Re √f)]); other models are inverted with
  Brent's method on ε/D, along which f is increasing;
* diameter: h_X decreases strictly with the diameter; Brent's method on ln D between
  ``DIAMETER_MIN`` and ``DIAMETER_MAX`` (the "sane bound").
"""

from __future__ import annotations

import math
from dataclasses import replace

import numpy as np

from . import friction
from .errors import InputError, NoSolutionError
from .hydraulics import Layout, RootInfo, branch_head, flows_at_head, segment_state
from .messages import diameter_text, flow_text, head_text, kv_text, length_text, pressure_text
from .model import MAX_LENGTH, Branch, FindUnknown, Given, Network, PressureDrop
from .results import Solved

DIAMETER_MIN = 1e-5
"""m; below any pipe that carries a liquid on a plant."""
DIAMETER_MAX = 10.0
"""m; the largest diameter considered when sizing (far above any branch off a header)."""


def find(
    net: Network, want: FindUnknown, index: int, head: float, given: Given
) -> tuple[Network, Solved, RootInfo]:
    """Solve for ``want.quantity``; returns the network with the value put in."""
    br = net.branches[index]
    solver = {"diameter": _diameter, "length": _length, "roughness": _roughness}[want.quantity]
    value = solver(net, br, want, head, given)
    new_branch = _with(br, want.segment, want.quantity, value)
    net = net.replace_branch(index, new_branch)
    check = _branch_layout(net, new_branch)
    h = float(branch_head(check, np.array([want.target_flow]))[0])
    residual = abs(h - head) / abs(head)
    solved = Solved(want.quantity, br.name, want.segment, value, want.target_flow)
    return net, solved, RootInfo(residual <= 1e-9, 1, residual)


def _with(br: Branch, j: int, quantity: str, value: float) -> Branch:
    segs = list(br.segments)
    segs[j] = replace(segs[j], **{quantity: value})
    return replace(br, segments=tuple(segs))


def _branch_layout(net: Network, br: Branch) -> Layout:
    return Layout.from_network(replace(net, branches=(br,)))


def _valve_hint(net: Network, br: Branch, q: float, head: float) -> str:
    """When a branch's valve takes more of the head than the rest of the branch leaves it, the
    Kv it would need (Δp ∝ (Q/Kv)²: Kv_needed = Kv·√(h_valve / (H − h_rest))); else ''."""
    if br.valve_kv is None:
        return ""
    lay = _branch_layout(net, br)
    with np.errstate(all="ignore"):  # a target far beyond any pipe overflows: no hint then
        h_valve = float(lay.valve_r[0]) * q * abs(q)
        h_rest = float(branch_head(lay, np.array([q]))[0]) - h_valve
        if not (0 < h_valve < math.inf and h_rest < head):  # else no Kv would help
            return ""
        needed = _three_figures_up(br.valve_kv * math.sqrt(h_valve / (head - h_rest)))
    if not math.isfinite(needed):
        return ""
    return (f"; its valve ({kv_text(br.valve_kv)}) alone loses {head_text(h_valve)} at that "
            f"flow: it would need {kv_text(needed)} or more")


def _three_figures_up(x: float) -> float:
    """``x`` rounded up to three significant figures (a "needs at least" figure never reads
    below the need)."""
    if not (math.isfinite(x) and x > 0):
        return x
    step = 10.0 ** (math.floor(math.log10(x)) - 2)
    return math.ceil(x / step - 1e-9) * step


def _where(given: Given, head: float) -> str:
    if isinstance(given, PressureDrop):
        return f"at {pressure_text(given.value)}"
    return f"at the driving head of {head_text(head)} the network sets"


def _length(net: Network, br: Branch, want: FindUnknown, head: float, given: Given) -> float:
    zero = _with(br, want.segment, "length", 0.0)
    lay = _branch_layout(net, zero)
    q = np.array([want.target_flow])
    h0 = float(branch_head(lay, q)[0])
    st = segment_state(lay, q)
    s = want.segment  # the one-branch layout holds only this branch
    per_metre = float(st.friction_factor[s] / lay.diameter[s] * st.velocity[s]
                      * abs(st.velocity[s]) / (2 * net.gravity))
    length = (head - h0) / per_metre
    if not length > 0:
        q0 = float(flows_at_head(lay, head)[0][0])
        raise NoSolutionError(
            f"branch '{br.name}' cannot pass {flow_text(want.target_flow)} {_where(given, head)} "
            f"with any length: at zero length its fittings"
            f"{' and valve' if br.valve_kv is not None else ''} alone allow {flow_text(q0)}"
            f"{_valve_hint(net, zero, want.target_flow, head)}", "solve.target_flow")
    if length > MAX_LENGTH:
        raise NoSolutionError(
            f"branch '{br.name}' would need {length_text(length)} of pipe to hold "
            f"{flow_text(want.target_flow)} {_where(given, head)}: more than any pipe run "
            f"({length_text(MAX_LENGTH)}); check the target flow", "solve.target_flow")
    return length


def _roughness(net: Network, br: Branch, want: FindUnknown, head: float, given: Given) -> float:
    seg = br.segments[want.segment]
    if net.friction in ("hazen-williams", "laminar"):
        raise InputError("conditions.friction", net.friction,
                         "finding a roughness needs a Darcy friction model such as colebrook")
    if seg.length <= 0:
        raise InputError("solve.segment", want.segment,
                         "the segment has no length, so its roughness has no effect")
    lay = _branch_layout(net, br)
    q = np.array([want.target_flow])
    st = segment_state(lay, q)
    s = want.segment
    re = float(st.reynolds[s])
    if re < friction.RE_LAMINAR:
        raise NoSolutionError(
            f"branch '{br.name}' is laminar at {flow_text(want.target_flow)} (Re {re:.0f}): "
            "roughness has no effect on its loss, so it cannot be found from a flow",
            "solve.target_flow")
    total = float(branch_head(lay, q)[0])
    coeff = seg.length / seg.diameter * st.velocity[s] * abs(st.velocity[s]) / (2 * net.gravity)
    f_needed = (head - (total - float(st.major[s]))) / float(coeff)
    if not f_needed > 0:
        raise NoSolutionError(
            f"branch '{br.name}' cannot carry {flow_text(want.target_flow)} {_where(given, head)} "
            "whatever the roughness: its fittings and other segments alone lose more than the "
            "available head at that flow"
            f"{_valve_hint(net, _with(br, s, 'length', 0.0), want.target_flow, head)}",
            "solve.target_flow")
    smooth = float(friction.darcy(np.array([re]), np.array([0.0]), net.friction)[0][0])
    if not f_needed > smooth:
        raise NoSolutionError(
            f"branch '{br.name}' would need a roughness below zero to carry "
            f"{flow_text(want.target_flow)} {_where(given, head)}: even a smooth pipe needs "
            f"f = {smooth:.4g}, and only f = {f_needed:.4g} is available "
            "(check the reading, the length and the fittings)", "solve.target_flow")
    rr_max = 0.5 * (1 - 1e-12)
    roughest = float(friction.darcy(np.array([re]), np.array([rr_max]), net.friction)[0][0])
    if f_needed > roughest:
        raise NoSolutionError(
            f"branch '{br.name}' cannot be rough enough to lose the head at "
            f"{flow_text(want.target_flow)}: even ε = D/2 gives only f = {roughest:.4g}, "
            f"f = {f_needed:.4g} is needed (look for a partly closed valve or a blockage)",
            "solve.target_flow")
    if net.friction == "colebrook" and re >= friction.RE_TURBULENT:
        x = 1 / math.sqrt(f_needed)
        return 3.7 * seg.diameter * (10 ** (-x / 2) - 2.51 * x / re)
    from scipy.optimize import brentq

    def excess(rr: float) -> float:
        return float(friction.darcy(np.array([re]), np.array([rr]), net.friction)[0][0]) - f_needed

    rr = brentq(excess, 0.0, rr_max, xtol=1e-18, rtol=4 * np.finfo(float).eps, maxiter=500)
    return rr * seg.diameter


def _diameter(net: Network, br: Branch, want: FindUnknown, head: float, given: Given) -> float:
    seg = br.segments[want.segment]
    q = np.array([want.target_flow])
    lo = max(DIAMETER_MIN, 2 * seg.roughness * (1 + 1e-9))

    def log_excess(ln_d: float) -> float:
        trial = _with(br, want.segment, "diameter", math.exp(ln_d))
        return math.log(abs(float(branch_head(_branch_layout(net, trial), q)[0]))) - math.log(
            abs(head))

    at_max = log_excess(math.log(DIAMETER_MAX))
    if at_max > 0:
        widest = _with(br, want.segment, "diameter", DIAMETER_MAX)
        q_max = float(flows_at_head(_branch_layout(net, widest), head)[0][0])
        raise NoSolutionError(
            f"branch '{br.name}' cannot pass {flow_text(want.target_flow)} {_where(given, head)} "
            f"with any diameter up to {diameter_text(DIAMETER_MAX)}: at that size it carries "
            f"{flow_text(q_max)} (the rest of the branch loses too much)"
            f"{_valve_hint(net, widest, want.target_flow, head)}", "solve.target_flow")
    if log_excess(math.log(lo)) < 0:
        raise NoSolutionError(
            f"branch '{br.name}' carries {flow_text(want.target_flow)} even at "
            f"{diameter_text(lo)}: check the target flow", "solve.target_flow")
    from scipy.optimize import brentq

    ln_d = brentq(log_excess, math.log(lo), math.log(DIAMETER_MAX), xtol=1e-15,
                  rtol=4 * np.finfo(float).eps, maxiter=500)
    return math.exp(ln_d)
