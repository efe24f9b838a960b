"""Property tests of the parallel solve (hypothesis) over the ranges a site can produce:
D 1 mm–3 m, L 0.1 m–50 km, ε/D 0–0.05, Δp 1 Pa–10 MPa, ν 1e-7–1e-3 m²/s, K 0–1000.

The physics they check (field notes): branches in parallel see the same head loss and their
flows add; series segments carry the same flow. Round trips must hold to ≤ 1e-9 relative and the
only exception allowed is the clear no-solution error.

The CI profile runs a modest number of examples; ``--hypothesis-profile=large`` (see conftest)
runs many more.
"""

from __future__ import annotations

import math
from dataclasses import replace

import numpy as np
from hypothesis import given, note, reject
from hypothesis import strategies as st

from branchwise.core.errors import NoSolutionError
from branchwise.core.model import (
    Branch,
    FindUnknown,
    Fluid,
    MeasuredFlow,
    Network,
    PressureDrop,
    Segment,
    TotalFlow,
)
from branchwise.core.numerics.hydraulics import Layout, branch_head
from branchwise.core.numerics.solve import solve

RTOL = 1e-9

# Every case adds to these; tests/conftest.py prints them at the end of the run.
# "ill-conditioned": a total flow given where the other branches carry a tiny share of it, so
# the data itself fixes the head to fewer digits (see test_found_unknown_reproduces_the_target).
STATS = {"cases": 0, "no_solution": 0, "worst_residual": 0.0, "ill_conditioned": 0,
         "worst_ill_conditioned": 0.0}


def record(residual: float | None = None, no_solution: bool = False,
           ill_conditioned: bool = False) -> None:
    STATS["cases"] += 1
    STATS["no_solution"] += int(no_solution)
    if residual is None:
        return
    if ill_conditioned:
        STATS["ill_conditioned"] += 1
        STATS["worst_ill_conditioned"] = max(STATS["worst_ill_conditioned"], residual)
    else:
        STATS["worst_residual"] = max(STATS["worst_residual"], residual)


def log_uniform(lo: float, hi: float):
    return st.floats(math.log(lo), math.log(hi)).map(math.exp)


@st.composite
def segments(draw):
    d = draw(log_uniform(1e-3, 3.0))
    rr = draw(st.one_of(st.just(0.0), log_uniform(1e-7, 0.05)))
    return Segment(
        diameter=d,
        length=draw(log_uniform(0.1, 5e4)),
        roughness=rr * d,
        minor_k=draw(st.one_of(st.just(0.0), log_uniform(1e-2, 1e3))),
    )


@st.composite
def networks(draw, min_branches=1):
    n = draw(st.integers(min_branches, 5))
    branches = tuple(
        Branch(f"b{i}", tuple(draw(st.lists(segments(), min_size=1, max_size=3))))
        for i in range(n)
    )
    nu = draw(log_uniform(1e-7, 1e-3))
    rho = draw(st.floats(700.0, 1300.0))
    model = draw(st.sampled_from(["colebrook", "colebrook", "haaland", "swamee-jain", "churchill"]))
    return Network(Fluid("fuzz", rho, nu * rho), branches, friction=model)


pressure_drops = log_uniform(1.0, 1e7)


def forward(net: Network, dp: float):
    """The flows at ``dp``; a network the last check refuses (a branch faster than any liquid
    line can run) is the clear no-solution error, counted and set aside."""
    try:
        return solve(net, PressureDrop(dp))
    except NoSolutionError:
        record(no_solution=True)
        reject()


def heads_of(net: Network, flows: np.ndarray) -> np.ndarray:
    return branch_head(Layout.from_network(net), flows)


@given(networks(), pressure_drops)
def test_every_branch_loses_the_driving_head(net, dp):
    res = forward(net, dp)
    assert res.convergence.converged
    h = heads_of(net, res.flows)
    record(float(np.max(np.abs(h / res.driving_head - 1))))
    np.testing.assert_allclose(h, res.driving_head, rtol=RTOL)
    assert np.all(res.flows > 0)


@given(networks(), pressure_drops)
def test_total_flow_round_trip(net, dp):
    first = forward(net, dp)
    back = solve(net, TotalFlow(first.total_flow))
    record(abs(back.pressure_drop / dp - 1))
    assert math.isclose(back.pressure_drop, dp, rel_tol=RTOL)
    np.testing.assert_allclose(back.flows, first.flows, rtol=RTOL)
    assert math.isclose(back.flows.sum(), first.total_flow, rel_tol=RTOL)


@given(networks(min_branches=2), pressure_drops, st.data())
def test_measured_branch_round_trip(net, dp, data):
    first = forward(net, dp)
    i = data.draw(st.integers(0, len(net.branches) - 1))
    back = solve(net, MeasuredFlow(net.branches[i].name, first.flows[i]))
    record(abs(back.pressure_drop / dp - 1))
    assert math.isclose(back.pressure_drop, dp, rel_tol=RTOL)
    np.testing.assert_allclose(back.flows, first.flows, rtol=RTOL)


@given(networks(), pressure_drops, st.data())
def test_found_unknown_reproduces_the_target(net, dp, data):
    """Every direction: Δp, total flow or a measured branch fixes the head; then D, L or ε."""
    quantity = data.draw(st.sampled_from(["diameter", "length", "roughness"]))
    i = data.draw(st.integers(0, len(net.branches) - 1))
    j = data.draw(st.integers(0, len(net.branches[i].segments) - 1))
    factor = data.draw(st.floats(0.5, 2.0))
    first = forward(net, dp)
    target = first.flows[i] * factor
    others = [k for k in range(len(net.branches)) if k != i]
    kinds = ["pressure drop"] + (["total flow", "measured"] if others else [])
    kind = data.draw(st.sampled_from(kinds))
    tol = RTOL
    if kind == "pressure drop":
        condition = PressureDrop(dp)
    elif kind == "total flow":
        total = first.total_flow - first.flows[i] + target
        condition = TotalFlow(total)
        # The others carry total − target: when they carry a tiny part of it, that subtraction
        # loses digits (condition number |total|/|rest|, times d ln H/d ln Q ≤ 2) whatever the
        # solver does. The tolerance widens by exactly that much.
        rest = abs(total - target)
        tol += 2 * 2 * np.finfo(float).eps * abs(total) / rest
    else:
        m = data.draw(st.sampled_from(others))
        condition = MeasuredFlow(net.branches[m].name, first.flows[m])
    note(f"{quantity} of branch {i} segment {j}, target {target}, given {condition}")
    try:
        res = solve(net, condition, FindUnknown(quantity, net.branches[i].name, target, j))
    except NoSolutionError:
        record(no_solution=True)
        return  # the clear error is an allowed outcome
    # The head is the one the as-built network had (the other branches are unchanged).
    assert math.isclose(res.driving_head, first.driving_head, rel_tol=tol)
    assert math.isclose(res.flows[i], target, rel_tol=RTOL)
    # Feed the value back into a fresh network and solve forward.
    segs = list(net.branches[i].segments)
    segs[j] = replace(segs[j], **{quantity: res.solved.value})
    fed = net.replace_branch(i, replace(net.branches[i], segments=tuple(segs)))
    again = solve(fed, PressureDrop(dp))
    record(abs(again.flows[i] / target - 1), ill_conditioned=tol > 2 * RTOL)
    assert math.isclose(again.flows[i], target, rel_tol=tol)
