"""The small-network path (plain floats) against the vectorised path (numpy), on random networks.

``solve`` takes a network of up to ``SMALL_BRANCHES`` branches through ``numerics.small``; here
every case is solved both ways and must give the same Result: the same outcome (the same
error, word for word, or an answer), the same flows, head, arrays and found value to round-off,
and the same warnings word for word. The cases cover every friction model (Hazen–Williams and
laminar included), series segments, valves, elevation, reverse flow, and every direction
(Δp, total flow, a branch reading; the flows, a diameter, a length, a roughness).

The reference here is the project's own vectorised solver, itself checked against ``fluids``
and scipy in tests/references; this test proves the two paths agree, not the physics.
"""

from __future__ import annotations

import math
from contextlib import contextmanager

import numpy as np
from hypothesis import given, note
from hypothesis import strategies as st

from branchwise.core.errors import BranchwiseError
from branchwise.core.model import (
    FRICTION_MODELS,
    Branch,
    FindFlows,
    FindUnknown,
    Fluid,
    MeasuredFlow,
    Network,
    PressureDrop,
    Segment,
    TotalFlow,
)
from branchwise.core.numerics import solve as solve_module
from branchwise.core.numerics.small import try_solve
from branchwise.core.numerics.small.result import numpy_sum
from branchwise.core.numerics.solve import solve

RTOL = 1e-11
"""Agreement asked of every number. Both paths stop on the same tests (|ln h − ln H| ≤ 1e-13
per branch, |ln ΣQ − ln Q_t| ≤ 1e-13 for a total flow), so a head found from a total flow may
differ by about 2 × 1e-13 relative and a flow by half that; a diameter found on a segment that
takes a small share of its branch's head magnifies that (2.6e-12 measured on the medium
profile); worst over a run: see STATS (printed with -s)."""

STATS = {"cases": 0, "small": 0, "errors": 0, "worst": 0.0}


def log_uniform(lo: float, hi: float):
    return st.floats(math.log(lo), math.log(hi)).map(math.exp)


@st.composite
def segments(draw, hazen: bool):
    d = draw(log_uniform(1e-3, 3.0))
    rr = draw(st.one_of(st.just(0.0), log_uniform(1e-7, 0.05)))
    return Segment(
        diameter=d,
        length=draw(st.one_of(st.just(0.0), log_uniform(0.1, 5e4))),
        roughness=rr * d,
        minor_k=draw(st.one_of(st.just(0.0), log_uniform(1e-2, 1e3))),
        hw_c=draw(st.floats(60.0, 150.0)) if hazen else None,
    )


@st.composite
def networks(draw, min_branches: int = 1):
    model = draw(st.sampled_from(FRICTION_MODELS))
    hazen = model == "hazen-williams"
    n = draw(st.integers(min_branches, 5))
    branches = []
    for i in range(n):
        segs = tuple(draw(st.lists(segments(hazen), min_size=1, max_size=3)))
        kv = draw(st.one_of(st.none(), log_uniform(0.1, 1e4)))
        if kv is None and all(s.length == 0 and s.minor_k == 0 for s in segs):
            segs = (Segment(segs[0].diameter, 10.0, segs[0].roughness, 1.0, segs[0].hw_c),)
        branches.append(Branch(f"b{i}", segs, kv))
    if hazen:  # an empirical fit for water: water's viscosity about 0–100 °C
        nu, rho = draw(log_uniform(2.9e-7, 1.8e-6)), draw(st.floats(958.0, 1000.0))
        fluid = Fluid("water", rho, nu * rho, "water",
                      temperature=draw(st.floats(274.0, 370.0)))
    else:
        nu, rho = draw(log_uniform(1e-7, 1e-3)), draw(st.floats(700.0, 1300.0))
        fluid = Fluid("fuzz", rho, nu * rho)
    elevation = draw(st.one_of(st.just(0.0), st.floats(-30.0, 30.0)))
    return Network(fluid, tuple(branches), elevation_change=elevation, friction=model)


@contextmanager
def vectorised():
    """Every network through the vectorised path."""
    old = solve_module.SMALL_BRANCHES
    solve_module.SMALL_BRANCHES = 0
    try:
        yield
    finally:
        solve_module.SMALL_BRANCHES = old


def outcome(net, condition, find):
    try:
        return solve(net, condition, find)
    except BranchwiseError as exc:
        return exc


def close(a, b, what: str, scale=None) -> None:
    """Relative agreement; ``scale``: what the difference is relative to, when the value is a
    difference itself (Δp = ρ g (H + Δz) with H ≈ −Δz)."""
    a, b = np.asarray(a, dtype=float), np.asarray(b, dtype=float)
    assert a.shape == b.shape, what
    same = (a == b) | (np.isnan(a) & np.isnan(b))
    if scale is None:
        scale = np.maximum(np.abs(a), np.abs(b))
    with np.errstate(invalid="ignore"):
        rel = np.where(same, 0.0, np.abs(a - b) / np.where(scale > 0, scale, 1.0))
    worst = float(np.max(rel, initial=0.0))
    STATS["worst"] = max(STATS["worst"], worst)
    assert worst <= RTOL, f"{what}: {worst:.2e}"


def assert_same(fast, slow) -> None:
    if isinstance(slow, BranchwiseError) or isinstance(fast, BranchwiseError):
        STATS["errors"] += 1
        assert type(fast) is type(slow), (fast, slow)
        assert str(fast) == str(slow)
        return
    close(fast.flows, slow.flows, "flows")
    for name in ("driving_head", "total_flow"):
        close(getattr(fast, name), getattr(slow, name), name)
    net = slow.network
    rho_g = net.fluid.density * net.gravity
    close(fast.pressure_drop, slow.pressure_drop, "pressure_drop",
          rho_g * (abs(slow.driving_head) + abs(net.elevation_change)))
    for name in ("velocity", "reynolds", "friction_factor", "major", "minor", "valve"):
        close(getattr(fast.arrays, name), getattr(slow.arrays, name), name)
    assert list(fast.arrays.seg_branch) == list(slow.arrays.seg_branch)
    assert (fast.solved is None) == (slow.solved is None)
    if fast.solved is not None:
        close(fast.solved.value, slow.solved.value, "found value")
        assert fast.solved.target_flow == slow.solved.target_flow
    assert fast.convergence.converged == slow.convergence.converged
    assert [(w.code, w.branch, w.message) for w in fast.warnings] == [
        (w.code, w.branch, w.message) for w in slow.warnings]
    assert [b.name for b in fast.branches] == [b.name for b in slow.branches]


@given(networks(), st.data())
def test_the_small_path_gives_the_vectorised_result(net, data):
    sign = data.draw(st.sampled_from([1.0, 1.0, 1.0, -1.0]))
    dp = sign * data.draw(log_uniform(1.0, 1e7))
    with vectorised():
        first = outcome(net, PressureDrop(dp), FindFlows())
    kinds = ["pressure drop"]
    if not isinstance(first, BranchwiseError) and np.all(first.flows != 0):
        kinds += ["total flow"] + (["measured"] if len(net.branches) > 1 else [])
    kind = data.draw(st.sampled_from(kinds))
    if kind == "pressure drop":
        condition = PressureDrop(dp)
    elif kind == "total flow":
        condition = TotalFlow(first.total_flow)
    else:
        m = data.draw(st.integers(0, len(net.branches) - 1))
        condition = MeasuredFlow(net.branches[m].name, float(first.flows[m]))
    find = FindFlows()
    quantity = data.draw(st.sampled_from(["flows", "diameter", "length", "roughness"]))
    if quantity != "flows" and not isinstance(first, BranchwiseError):
        i = data.draw(st.integers(0, len(net.branches) - 1))
        j = data.draw(st.integers(0, len(net.branches[i].segments) - 1))
        target = float(first.flows[i]) * data.draw(st.floats(0.5, 2.0))
        find = FindUnknown(quantity, net.branches[i].name, target or 1e-3, j)
    note(f"{condition} {find}")
    fast = outcome(net, condition, find)
    with vectorised():
        slow = outcome(net, condition, find)
    STATS["cases"] += 1
    if not isinstance(fast, BranchwiseError):
        index = net.index_of(find.branch) if isinstance(find, FindUnknown) else None
        STATS["small"] += try_solve(net, condition, find, index) is not None
    assert_same(fast, slow)


@given(st.lists(st.floats(-1e3, 1e3), min_size=0, max_size=300))
def test_a_total_is_added_in_numpys_order(values):
    assert numpy_sum(values) == float(np.sum(np.array(values, dtype=float)))


def test_the_bounds_are_the_last_checks():
    from branchwise.core.numerics.checks import MAX_VELOCITY

    assert solve_module.MAX_VELOCITY == MAX_VELOCITY


def test_most_cases_take_the_small_path():
    """Not a speed test: proves the comparison above compared two paths (run after it)."""
    if STATS["cases"] >= 30:
        assert STATS["small"] >= 0.4 * (STATS["cases"] - STATS["errors"]), STATS


def teardown_module() -> None:
    print(f"\nsmall path: {STATS}")
