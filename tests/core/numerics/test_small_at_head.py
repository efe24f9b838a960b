"""The flows at a given Δp under Colebrook worked out straight from the branches' numbers
(``small.at_head``) against the same network through the branch objects (``small.branch.Pipe``).

The second is the small path as it stood before the first was added; both are held against the
vectorised solver in test_small_path.py. Here the two must agree to the last bit — the same
functions on the same inputs — or the first must step aside (None) or stop as the second does.
The rows a network's numbers give are kept for the last network met; a network solved after
another must never be given the other's.
"""

from __future__ import annotations

import math

import numpy as np
from hypothesis import given, note
from hypothesis import strategies as st

from branchwise.core.model import Branch, FindFlows, Fluid, Network, PressureDrop, Segment
from branchwise.core.numerics.small import at_head
from branchwise.core.numerics.small.branch import Fallback
from branchwise.core.numerics.small.heads import give_back, lend
from branchwise.core.numerics.small.solve import _driving_head, _solve_with
from branchwise.core.numerics.solve import solve

FLOWS = FindFlows()
STATS = {"cases": 0, "taken": 0}


def log_uniform(lo: float, hi: float):
    return st.floats(math.log(lo), math.log(hi)).map(math.exp)


@st.composite
def segments(draw, bore: float):
    d = bore * draw(st.floats(0.5, 1.0))  # in series: reducers, as in a plant
    return Segment(
        diameter=d,
        length=draw(st.one_of(st.just(0.0), log_uniform(0.5, 2e3))),
        roughness=draw(st.one_of(st.just(0.0), log_uniform(1e-7, 0.02))) * d,
        minor_k=draw(st.one_of(st.just(0.0), log_uniform(0.05, 100.0))),
    )


@st.composite
def networks(draw):
    branches = []
    for i in range(draw(st.integers(1, 8))):
        bore = draw(log_uniform(0.01, 1.0))
        segs = tuple(draw(st.lists(segments(bore), min_size=1, max_size=3)))
        kv = draw(st.one_of(st.none(), log_uniform(5.0, 1e3)))
        if kv is None and all(s.length == 0 and s.minor_k == 0 for s in segs):
            segs = (Segment(segs[0].diameter, 10.0, segs[0].roughness, 1.0),)
        branches.append(Branch(f"b{i}", segs, kv))
    nu, rho = draw(log_uniform(3e-7, 1e-5)), draw(st.floats(700.0, 1300.0))
    return Network(Fluid("test liquid", rho, nu * rho), tuple(branches),
                   elevation_change=draw(st.one_of(st.just(0.0), st.floats(-10.0, 10.0))))


def by_objects(net: Network, given: PressureDrop):
    """The flows through a pipe per branch (the path this lane stands beside)."""
    pipes, loan = lend(net)
    try:
        return _solve_with(pipes, net, given, FLOWS, None)
    finally:
        give_back(loan)


def outcome(fn, *args):
    try:
        return fn(*args)
    except (Fallback, ArithmeticError, ValueError) as exc:
        return type(exc)


def assert_identical(a, b) -> None:
    assert (a.driving_head, a.pressure_drop, a.total_flow) == (
        b.driving_head, b.pressure_drop, b.total_flow)
    for name in ("flow", "seg_branch", "velocity", "reynolds", "friction_factor", "major",
                 "minor", "valve"):
        assert np.array_equal(getattr(a.arrays, name), getattr(b.arrays, name)), name
    assert a.convergence == b.convergence
    assert [(w.code, w.branch, w.message) for w in a.warnings] == [
        (w.code, w.branch, w.message) for w in b.warnings]


@given(networks(), st.sampled_from([1.0, 1.0, 1.0, -1.0]), log_uniform(5e3, 2e6))
def test_the_lane_gives_the_branch_objects_answer_to_the_bit(net, sign, dp):
    given_ = PressureDrop(sign * dp)
    head = _driving_head(net, given_.value)
    note(f"head {head}")
    lane = outcome(at_head.flows_at_given_head, net, given_, FLOWS, head)
    objects = outcome(by_objects, net, given_)
    STATS["cases"] += 1
    if lane is None:  # stepped aside: the branch objects' path answers (or falls back)
        return
    if isinstance(lane, type):  # stopped (a branch beyond the bounds): so does the other
        assert objects is lane
        return
    STATS["taken"] += 1
    assert not isinstance(objects, type), objects
    assert_identical(lane, objects)


def test_most_cases_take_the_lane():
    """Not a speed test: proves the comparison above compared two paths (run after it)."""
    if STATS["cases"] >= 30:
        assert STATS["taken"] >= 0.5 * STATS["cases"], STATS


WATER = Fluid("water 20 °C", 998.2, 1.0016e-3, "water")
"""IAPWS values near 20 °C (see the field notes)."""


def header(first_bore: float) -> Network:
    return Network(WATER, (
        Branch("a", (Segment(first_bore, 40.0, 4.5e-5, 3.0), Segment(0.08, 10.0, 4.5e-5, 1.0))),
        Branch("b", (Segment(0.15, 60.0, 4.5e-5, 6.0),), 90.0),
        Branch("c", (Segment(0.05, 25.0, 1.5e-6, 0.0),)),
    ))


def test_a_network_is_never_given_the_last_networks_rows():
    wide, narrow = header(0.1), header(0.09)
    given_ = PressureDrop(40e3)
    references = {}
    for net in (wide, narrow):
        at_head._last = None  # nothing kept: the rows made for this network alone
        references[id(net)] = solve(net, given_)
    for net in (wide, narrow, narrow, wide, wide):  # met anew, then again, in turns
        result = solve(net, given_)
        assert at_head._last is not None and at_head._last[0]() is net
        assert_identical(result, references[id(net)])
    assert references[id(wide)].flows[0] != references[id(narrow)].flows[0]


def test_only_colebrook_takes_the_lane():
    net = Network(WATER, header(0.1).branches, friction="swamee-jain")
    assert at_head.flows_at_given_head(net, PressureDrop(4e4), FLOWS, 4.0) is None


def test_threads_share_the_rows_and_never_each_others_answers():
    """Rows are shared, never written to; each solve's state is its own."""
    from concurrent.futures import ThreadPoolExecutor

    nets = [header(0.1), header(0.09), header(0.11)]
    given_ = PressureDrop(40e3)
    references = []
    for net in nets:
        at_head._last = None
        references.append(solve(net, given_))

    def solve_many(k: int) -> list:
        return [(i, solve(nets[i], given_)) for i in ([k % 3] * 5 + [0, 1, 2]) * 20]

    with ThreadPoolExecutor(3) as pool:
        for answers in pool.map(solve_many, range(3)):
            for i, result in answers:
                assert_identical(result, references[i])
