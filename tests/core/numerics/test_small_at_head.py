"""The flows at a given Δp under Colebrook worked out straight from the branches' numbers
(``small.at_head``) against the same network through the branch objects (``small.branch.Pipe``).

The second takes every other direction; both are held against the vectorised solver in
test_small_path.py. Here the two must agree to the last bit — the same steps on the same
inputs — or the first must step aside (None) or stop as the second does. They share the rows
of constants (``small.one.one_row``, ``small.series.series_constants``) and the result's
columns (``small.result.Columns``): a slip there would be in both, and is for
test_small_path.py and the benchmark's agreement with an earlier tree to find.
The rows a network's numbers give are kept for the last network met; a network solved after
another must never be given the other's.
"""

from __future__ import annotations

import math
import random

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
    # mostly thin liquids (every branch turbulent: the lane answers), some oils (a branch in
    # laminar or transition flow: the lane steps aside)
    nu = draw(st.one_of(*[log_uniform(3e-7, 1e-5)] * 4, log_uniform(1e-4, 1e-3)))
    rho = draw(st.floats(700.0, 1300.0))
    return Network(Fluid("test liquid", rho, nu * rho), tuple(branches),
                   elevation_change=draw(st.one_of(st.just(0.0), st.floats(-10.0, 10.0))),
                   gravity=draw(st.one_of(st.just(9.80665), st.floats(9.76, 9.84))))


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
    if lane is None:  # stepped aside: the branch objects' path answers (or falls back)
        return
    if isinstance(lane, type):  # stopped (a branch beyond the bounds): so does the other
        assert objects is lane
        return
    assert not isinstance(objects, type), objects
    assert_identical(lane, objects)


def _plain_network(rng: random.Random) -> Network:
    """A network of the property test's kind drawn from ``rng`` (its count below must not
    depend on which examples hypothesis draws: those move with the modules loaded)."""
    def lu(lo: float, hi: float) -> float:
        return math.exp(rng.uniform(math.log(lo), math.log(hi)))

    branches = []
    for i in range(rng.randint(1, 8)):
        bore = lu(0.01, 1.0)
        segs = tuple(Segment(bore * rng.uniform(0.5, 1.0), rng.choice([0.0, lu(0.5, 2e3)]),
                             rng.choice([0.0, lu(1e-7, 0.02)]) * bore,
                             rng.choice([0.0, lu(0.05, 100.0)]))
                     for _ in range(rng.randint(1, 3)))
        if all(s.length == 0 and s.minor_k == 0 for s in segs):
            segs = (Segment(segs[0].diameter, 10.0, segs[0].roughness, 1.0),)
        branches.append(Branch(f"b{i}", segs, rng.choice([None, lu(5.0, 1e3)])))
    nu = lu(3e-7, 1e-5) if rng.random() < 0.8 else lu(1e-4, 1e-3)
    return Network(Fluid("test liquid", 1000.0, nu * 1000.0), tuple(branches))


def test_most_cases_take_the_lane():
    """Not a speed test: proves that networks of the property test's kind are compared on two
    paths, most taking the lane and some stepping aside."""
    rng = random.Random(2026)
    taken = aside = 0
    for _ in range(200):
        net = _plain_network(rng)
        dp = math.exp(rng.uniform(math.log(5e3), math.log(2e6)))
        lane = outcome(at_head.flows_at_given_head, net, PressureDrop(dp), FLOWS,
                       _driving_head(net, dp))
        taken += lane is not None and not isinstance(lane, type)
        aside += lane is None
    assert taken >= 80 and aside >= 10, (taken, aside)


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


def test_a_network_at_the_address_of_one_gone_is_not_given_its_rows():
    """The rows are kept for the last network by a weak reference: once that network is
    collected the reference is dead and matches no network, so one made where it lived (an
    id would have matched) is met anew."""
    import gc

    given_ = PressureDrop(40e3)
    net = header(0.07)
    solve(net, given_)
    assert at_head._last is not None and at_head._last[0]() is net
    del net
    gc.collect()
    assert at_head._last[0]() is None
    for k in range(20):  # addresses are often taken again: the answers stay each network's
        net = header(0.06 + 0.001 * k)
        assert_identical(solve(net, given_), by_objects(net, given_))
        del net
        gc.collect()


def test_the_same_branches_under_another_liquid_or_gravity_are_met_anew():
    import dataclasses

    given_ = PressureDrop(40e3)
    net = header(0.1)
    lift = dataclasses.replace(net, elevation_change=3.0)  # g then moves the flows: ρ g Δz
    others = [net, lift, dataclasses.replace(lift, gravity=9.78),
              dataclasses.replace(net, fluid=Fluid("light oil", 850.0, 0.0085)), net]
    flows = []
    for other in others:
        result = solve(other, given_)
        assert_identical(result, by_objects(other, given_))
        flows.append(result.flows[0])
    assert len(set(flows)) == 4 and flows[0] == flows[-1]


def test_a_branch_in_laminar_flow_sends_the_network_to_the_branch_objects():
    # A heavy oil (ν 1e-3 m²/s): the narrow branch in laminar flow, the wide one turbulent.
    oil = Fluid("heavy oil", 900.0, 0.9)
    net = Network(oil, (Branch("wide", (Segment(0.5, 5.0, 4.5e-5, 2.0),)),
                        Branch("narrow", (Segment(0.02, 50.0, 4.5e-5, 2.0),))))
    given_ = PressureDrop(4e4)
    assert at_head.flows_at_given_head(net, given_, FLOWS, _driving_head(net, 4e4)) is None
    result = solve(net, given_)
    assert result.arrays.reynolds[1] < 2000 < result.arrays.reynolds[0]
    assert_identical(result, by_objects(net, given_))
