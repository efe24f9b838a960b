"""The parallel solve in every direction.

Exactly one *given* fixes the driving head H between the common nodes:

* a pressure drop Δp:        H = Δp/(ρ g) − (z_out − z_in);
* the total flow Q_t:        H is the one head at which Σ Q_i(H) = Q_t (Σ Q_i is increasing);
* one branch's flow Q_m:     H = h_m(Q_m), explicit.

Then one *find*: the flows (every branch at H), or, for branch X and a target flow Q_x, one
segment's diameter, length or roughness such that h_X(Q_x) = H. With a total flow given, the other
branches carry Q_t − Q_x, which fixes H first. All equations are solved to round-off; when no
answer exists a :class:`NoSolutionError` states the limit that was hit.
"""

from __future__ import annotations

import math
import weakref
from dataclasses import replace
from functools import partial

import numpy as np

from ..errors import InputError, NoSolutionError
from ..finds import UNKNOWNS
from ..fluids import liquid
from ..messages import flow_text, head_text, velocity_text
from ..model import (
    MAX_FLOW,
    MIN_FLOW,
    Find,
    FindFlows,
    FindUnknown,
    Given,
    MeasuredFlow,
    Network,
    PressureDrop,
    TotalFlow,
    at_most,
    finite,
)
from . import unknowns
from .checks import MAX_VELOCITY, collect_warnings
from .hydraulics import Layout, RootInfo, branch_head, flows_at_head, head_for_total_flow
from .hydraulics import segment_state as _segment_state
from .results import Arrays, Convergence, Result, Solved
from .small import SMALL_BRANCHES, try_solve

_FLOWS = FindFlows()
"""The default find (a frozen value: one serves every solve)."""


def solve(network: Network, given: Given, find: Find | None = None) -> Result:
    """Solve ``network`` for ``find`` (default: the flows) with ``given`` fixing the head."""
    find = _FLOWS if find is None else find
    _check_network(network)
    _check_given(network, given)
    infos: list[RootInfo] = []
    solved: Solved | None = None
    target_index = None
    if isinstance(find, FindUnknown):
        target_index = _check_find(network, given, find)
    if len(network.branches) <= SMALL_BRANCHES:
        fast = try_solve(network, given, find, target_index)
        if fast is not None:
            return fast
    if isinstance(find, FindUnknown):
        assert target_index is not None
        head = _head_for_unknown(network, given, find, target_index, infos)
        network, solved, info = unknowns.find(network, find, target_index, head, given)
        infos.append(info)
        guess = None
    else:
        head, guess = _head_for_flows(network, given, infos)
    lay = Layout.from_network(network)
    # With a total flow given, the flows found with the head start this last solve, which
    # then only confirms them.
    flows, info = flows_at_head(lay, head, guess)
    infos.append(info)
    if isinstance(given, MeasuredFlow):
        flows[network.index_of(given.branch, "conditions.measured_flow")] = given.value
    return _result(network, given, find, lay, head, flows, solved, infos)


def driving_head(network: Network, pressure_drop: float) -> float:
    """H = Δp/(ρ g) − Δz, m."""
    fl = network.fluid
    return pressure_drop / (fl.density * network.gravity) - network.elevation_change


def pressure_drop_for(network: Network, head: float) -> float:
    """Δp = ρ g (H + Δz), Pa."""
    return network.fluid.density * network.gravity * (head + network.elevation_change)


# ---- what the network allows ---------------------------------------------------------------

_passed: weakref.ref[Network] | None = None
"""The last network that passed :func:`_check_network` (a weak reference: it is not kept
alive): a network is frozen, so a later solve of the same object need not check it again."""


def _check_network(network: Network) -> None:
    global _passed
    if _passed is not None and _passed() is network:
        return
    _check_friction(network)
    _check_resistance(network)
    _passed = weakref.ref(network)


def _check_friction(network: Network) -> None:
    """Hazen–Williams is an empirical fit for water: refused for any other liquid."""
    if network.friction != "hazen-williams":
        return
    kind = liquid(network.fluid.kind)
    if kind is None or not kind.hazen_williams:
        what = (kind.label.lower() if kind is not None and kind.required != ("density",)
                else "a liquid entered by its density and viscosity")
        raise InputError(
            "conditions.friction", network.friction,
            f"Hazen–Williams is an empirical fit for water at ordinary temperatures and does "
            f"not hold for {what}; use colebrook (Darcy–Weisbach)")


def _check_resistance(network: Network) -> None:
    """A branch with nothing in it (no length, no fittings, no valve) cannot carry a finite
    flow at any head: refused by name rather than solved to zero or to an overflow."""
    for i, br in enumerate(network.branches):
        if br.valve_kv is not None:
            continue
        for s in br.segments:
            if s.length != 0 or s.minor_k != 0:
                break
        else:
            raise InputError(
                f"branches[{i}].length", "0",
                "this branch has no resistance (no length, no fittings, no valve), so no flow "
                "can be worked out for it; give its length")


# ---- the head --------------------------------------------------------------------------------

def _check_given(network: Network, given: Given) -> None:
    if isinstance(given, PressureDrop):
        finite("conditions.pressure_drop", given.value)
    elif isinstance(given, TotalFlow):
        at_most("conditions.total_flow", finite("conditions.total_flow", given.value), MAX_FLOW,
                "m³/s", "pipe flow")
    elif isinstance(given, MeasuredFlow):
        i = network.index_of(given.branch, "conditions.measured_flow")
        value = at_most(f"branches[{i}].measured_flow",
                        finite(f"branches[{i}].measured_flow", given.value), MAX_FLOW, "m³/s",
                        "pipe flow")
        if 0 < abs(value) < MIN_FLOW:
            raise InputError(f"branches[{i}].measured_flow", given.value,
                             f"is below any measurable flow (give 0 or at least {MIN_FLOW:g} "
                             "m³/s)")
    else:
        raise InputError("conditions", repr(given), "needs a pressure drop, a total flow or a "
                         "measured branch flow")


def _head_for_flows(
    network: Network, given: Given, infos: list[RootInfo]
) -> tuple[float, np.ndarray | None]:
    """The driving head the given condition fixes, and the flows found on the way (if any)."""
    if isinstance(given, PressureDrop):
        return driving_head(network, given.value), None
    if isinstance(given, MeasuredFlow):
        i = network.index_of(given.branch, "conditions.measured_flow")
        return _head_of_branch(network, i, given.value), None
    head, flows, info = head_for_total_flow(Layout.from_network(network), given.value)
    infos.append(info)
    return float(head[0]), flows


def _head_of_branch(network: Network, index: int, flow: float) -> float:
    one = Layout.from_network(replace(network, branches=(network.branches[index],)))
    return float(branch_head(one, np.array([flow]))[0])


def _check_find(network: Network, given: Given, find: FindUnknown) -> int:
    if find.quantity not in UNKNOWNS:
        raise InputError(
            "solve.find", find.quantity, f"must be flows or one of {', '.join(UNKNOWNS)}")
    index = network.index_of(find.branch, "solve.branch")
    n_seg = len(network.branches[index].segments)
    if not 0 <= find.segment < n_seg:
        raise InputError("solve.segment", find.segment, f"branch has segments 0 to {n_seg - 1}")
    target = at_most("solve.target_flow", finite("solve.target_flow", find.target_flow),
                     MAX_FLOW, "m³/s", "pipe flow")
    if target == 0:
        raise InputError("solve.target_flow", find.target_flow, "must not be zero")
    if isinstance(given, MeasuredFlow) and network.index_of(given.branch) == index:
        raise InputError(
            "solve.branch", find.branch,
            "its measured flow is the given condition, so nothing fixes the head; give the "
            "pressure drop (or the total flow) and put the reading in solve.target_flow",
        )
    return index


def _head_for_unknown(
    network: Network, given: Given, find: FindUnknown, index: int, infos: list[RootInfo]
) -> float:
    """The head branch X must match: from Δp, from a measured branch, or from the others."""
    if isinstance(given, TotalFlow):
        rest = given.value - find.target_flow
        name = network.branches[index].name
        if len(network.branches) == 1:
            raise NoSolutionError(
                f"branch '{name}' is the only branch, so the total flow is its flow and nothing "
                "fixes the head: give the pressure drop instead", "conditions.total_flow")
        if math.copysign(1, given.value) != math.copysign(1, find.target_flow):
            raise NoSolutionError(
                f"the target {flow_text(find.target_flow)} for branch '{name}' runs against "
                f"the total flow {flow_text(given.value)}: no head drives a branch one way "
                "and the header the other (a meter set the other way round?)",
                "solve.target_flow")
        if rest == 0 or math.copysign(1, rest) != math.copysign(1, find.target_flow):
            raise NoSolutionError(
                f"the total flow {flow_text(given.value)} is not more than the target "
                f"{flow_text(find.target_flow)} for branch '{name}': the other branches "
                "would carry nothing or flow backwards", "solve.target_flow")
        others = replace(network, branches=tuple(
            b for i, b in enumerate(network.branches) if i != index))
        head, _, info = head_for_total_flow(Layout.from_network(others), rest)
        infos.append(info)
        h = float(head[0])
    else:
        h = _head_for_flows(network, given, infos)[0]
    if h == 0 or math.copysign(1, h) != math.copysign(1, find.target_flow):
        raise NoSolutionError(
            f"branch '{network.branches[index].name}' cannot carry {flow_text(find.target_flow)}: "
            f"the driving head is {head_text(h)}, so flow runs "
            f"{'nowhere' if h == 0 else ('forward' if h > 0 else 'in reverse')}",
            "solve.target_flow")
    return h


# ---- the result ------------------------------------------------------------------------------

UNSETTLED = 1e-6
"""A relative residual above which an answer that did not converge is refused, not warned of."""


def _check_bounds(network: Network, lay: Layout, head: float, flows: np.ndarray,
                  velocity: np.ndarray, losses: np.ndarray, given: Given | None = None) -> None:
    """The last check on every answer: no inf or NaN and no flow beyond the physical bounds
    reaches an output. When every branch of several breaks them, the given reading is named
    (a pressure drop typed in the wrong unit makes every line too fast); else the first
    branch that breaks them."""
    if math.isfinite(head):
        with np.errstate(invalid="ignore"):
            bad_seg = ~(np.isfinite(velocity) & np.isfinite(losses)) | (
                np.abs(velocity) > MAX_VELOCITY)
            bad = ~np.isfinite(flows) | (np.abs(flows) > MAX_FLOW)
        bad[lay.seg_branch[bad_seg]] = True
        if not bad.any():
            return
        b = int(np.argmax(bad))
        everywhere = bool(bad.all()) and len(network.branches) > 1
    else:
        b, everywhere = 0, len(network.branches) > 1
    segs = lay.seg_branch == b
    q = float(flows[b])
    fast = float(np.max(np.abs(velocity[segs]), initial=0.0))
    finite_all = math.isfinite(q) and bool(np.all(np.isfinite(velocity[segs]))) and bool(
        np.all(np.isfinite(losses[segs])))
    shown = (f"run at {velocity_text(fast)} ({flow_text(q)})"
             if finite_all and math.isfinite(head) else "carry no finite flow")
    limit = (f"beyond what a liquid line can carry (incompressible flow holds well below "
             f"{velocity_text(MAX_VELOCITY)})")
    reading = _given_field(network, given) if everywhere else None
    if reading is not None:
        raise NoSolutionError(
            f"every branch would be beyond its bounds ('{network.branches[b].name}' would "
            f"{shown}): {limit}; check this reading's value and unit", reading)
    raise NoSolutionError(
        f"this branch would {shown}: {limit}; check its length, fittings and valve, and the "
        "given condition", f"branches[{b}].length")


def _given_field(network: Network, given: Given | None) -> str | None:
    """The field of the reading that fixes the head (None when no reading does)."""
    if isinstance(given, PressureDrop):
        return "conditions.pressure_drop"
    if isinstance(given, TotalFlow):
        return "conditions.total_flow"
    if isinstance(given, MeasuredFlow):
        return f"branches[{network.index_of(given.branch)}].measured_flow"
    return None


def _result(
    network: Network, given: Given, find: Find, lay: Layout, head: float, flows: np.ndarray,
    solved: Solved | None, infos: list[RootInfo],
) -> Result:
    st = _segment_state(lay, flows)
    valve = lay.valve_r * flows * np.abs(flows)
    _check_bounds(network, lay, head, flows, st.velocity, st.major + st.minor, given)
    arrays = Arrays(
        flow=flows, seg_branch=lay.seg_branch, velocity=st.velocity, reynolds=st.reynolds,
        friction_factor=st.friction_factor, major=st.major, minor=st.minor, valve=valve,
    )
    conv = Convergence(
        converged=all(i.converged for i in infos),
        iterations=sum(i.iterations for i in infos),
        residual=max((i.residual for i in infos), default=0.0),
    )
    if not conv.converged and not conv.residual <= UNSETTLED:
        raise NoSolutionError(
            f"the solve did not settle (relative residual {conv.residual:.2g}): the inputs are "
            "beyond what it can resolve; check for a branch with almost no resistance",
            "conditions")
    return Result(
        network=network, given=given, find=find,
        pressure_drop=pressure_drop_for(network, head), driving_head=head,
        total_flow=float(flows.sum()), arrays=arrays, solved=solved,
        warning_source=partial(collect_warnings, network, arrays, conv), convergence=conv,
    )
