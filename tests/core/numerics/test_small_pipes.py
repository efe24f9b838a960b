"""The small path's pipes: a network's constants worked out once and shared by later solves of
the same network, never changed by one of them (a found diameter, length or roughness is sought
on a pipe of its own).

The reference is a fresh, equal network solved first: the answers of a network solved again must
be the same to the last bit, whatever was sought on it in between.
"""

from __future__ import annotations

import numpy as np
import pytest

from branchwise.core.model import (
    Branch,
    FindFlows,
    FindUnknown,
    Fluid,
    Network,
    PressureDrop,
    Segment,
    TotalFlow,
)
from branchwise.core.numerics.small.branch import Pipe
from branchwise.core.numerics.small.heads import pipes_of
from branchwise.core.numerics.solve import solve

WATER = Fluid("water 20 °C", 998.2, 1.0016e-3, "water")
"""IAPWS values near 20 °C (see the field notes)."""


def network() -> Network:
    return Network(WATER, (
        Branch("a", (Segment(0.1, 40.0, 4.5e-5, 3.0), Segment(0.08, 10.0, 4.5e-5, 1.0))),
        Branch("b", (Segment(0.15, 60.0, 4.5e-5, 6.0),), 90.0),
        Branch("c", (Segment(0.05, 25.0, 1.5e-6, 0.0),)),
    ))


def same(a, b) -> None:
    assert a.driving_head == b.driving_head and a.total_flow == b.total_flow
    for name in ("flow", "velocity", "reynolds", "friction_factor", "major", "minor", "valve"):
        assert np.array_equal(getattr(a.arrays, name), getattr(b.arrays, name)), name
    assert a.convergence == b.convergence
    assert a.solved == b.solved
    assert [w.message for w in a.warnings] == [w.message for w in b.warnings]


@pytest.mark.parametrize(("quantity", "factor"),
                         [("diameter", 1.1), ("length", 0.9), ("roughness", 0.9)])
def test_a_network_solved_again_gives_the_same_answer(quantity, factor):
    net = network()
    given = PressureDrop(40e3)
    total = TotalFlow(0.04)
    first, by_total = solve(network(), given), solve(network(), total)  # the references
    find = FindUnknown(quantity, "a", float(first.flows[0]) * factor, 1)
    found = solve(network(), given, find)
    for _ in range(2):
        # Each solve of ``net`` follows one of another network, so that ``net`` is met both
        # as a new network (its pipes made) and as the last one (its pipes' constants reused).
        same(solve(net, given, find), found)
        same(solve(net, given, find), found)
        same(solve(net, given), first)
        same(solve(network(), total), by_total)
        same(solve(net, total), by_total)
    assert net == network()


def test_a_pipe_shares_its_constants_until_it_owns_them():
    net = network()
    shared = pipes_of(net)
    again = pipes_of(net)
    assert again[0] is not shared[0] and again[0].d is shared[0].d
    assert not again[0].owned
    with pytest.raises(ValueError, match="shares its constants"):
        again[0].set_segment(0, 0.2, 40.0, 4.5e-5)
    own = again[0].copy(own=True)
    own.set_segment(0, 0.2, 40.0, 4.5e-5)
    assert shared[0].d == [0.1, 0.08] and own.d == [0.2, 0.08]
    fresh = Pipe(net.branches[0], WATER.kinematic_viscosity, net.gravity, net.friction)
    assert fresh.owned and fresh.a3 == [4.5e-5 / 0.1 / 3.7, 4.5e-5 / 0.08 / 3.7]


def test_a_copy_starts_as_a_new_pipe():
    net = network()
    pipes = pipes_of(net)
    for p in pipes:
        p.flow_at(3.0)
    for old, new in zip(pipes, pipes_of(net), strict=True):
        made = Pipe(net.branches[pipes.index(old)], WATER.kinematic_viscosity, net.gravity,
                    net.friction)
        assert new.x == made.x == 0.0 and new.xs == made.xs
        assert new.flow_at(3.0) == made.flow_at(3.0) and new.q == made.q


def test_flows_are_the_default_find():
    net = network()
    same(solve(net, PressureDrop(1e4)), solve(net, PressureDrop(1e4), FindFlows()))


def test_a_changed_segment_is_the_new_branchs():
    """A one-segment branch's folded constants (L/D, the fittings' and valve's K) follow a
    change of its segment."""
    net = network()
    nu = WATER.kinematic_viscosity
    own = Pipe(net.branches[1], nu, net.gravity, net.friction)
    own.set_segment(0, 0.12, 30.0, 1e-4)
    changed = Branch("b", (Segment(0.12, 30.0, 1e-4, 6.0),), 90.0)
    made = Pipe(changed, nu, net.gravity, net.friction)
    assert own.one == made.one
    assert own.flow_at(3.0) == made.flow_at(3.0) and own.q == made.q and own.h == made.h


def test_a_solved_network_is_not_kept_alive():
    import gc
    import weakref

    net = network()
    solve(net, PressureDrop(1e4))
    solve(net, PressureDrop(1e4))
    gone = weakref.ref(net)
    del net
    gc.collect()
    assert gone() is None


def test_pipes_held_by_one_solve_are_copied_for_another():
    """A solve borrows the network's kept pipes; another solve of the same network meanwhile
    (a second thread) gets copies, and the held pipes are not touched."""
    from branchwise.core.numerics.small.heads import give_back, lend

    reference = solve(network(), PressureDrop(2e4))
    net = network()
    solve(net, PressureDrop(1e4))  # its pipes made and kept
    held, loan = lend(net)
    assert loan is not None
    assert all(p.q != p.q for p in held)  # as new (NaN)
    same(solve(net, PressureDrop(2e4)), reference)
    assert all(p.q != p.q for p in held)  # the other solve worked on copies
    again, second = lend(net)
    assert second is None and not any(a is b for a, b in zip(again, held, strict=True))
    give_back(loan)
    same(solve(net, PressureDrop(2e4)), reference)


def test_threads_solving_one_network_agree():
    import threading

    net = network()
    givens = [PressureDrop(1e4), TotalFlow(0.04), PressureDrop(3e4)]
    references = [solve(network(), g) for g in givens]
    failures: list[str] = []

    def work(offset: int) -> None:
        for i in range(300):
            k = (i + offset) % len(givens)
            try:
                same(solve(net, givens[k]), references[k])
            except AssertionError as e:  # pragma: no cover - reported below
                failures.append(f"{givens[k]}: {e}")

    import sys

    threads = [threading.Thread(target=work, args=(k,)) for k in range(3)]
    interval = sys.getswitchinterval()
    sys.setswitchinterval(1e-6)  # threads switch inside solves
    try:
        for t in threads:
            t.start()
        for t in threads:
            t.join()
    finally:
        sys.setswitchinterval(interval)
    assert failures == []


def _random_network(rng: np.random.Generator) -> Network:
    branches = []
    for i in range(int(rng.integers(2, 7))):
        segs = tuple(Segment(float(rng.uniform(0.02, 0.3)), float(rng.uniform(5, 500)),
                             float(rng.uniform(1e-6, 1e-3)), float(rng.uniform(0.1, 20)))
                     for _ in range(int(rng.choice([1, 1, 2, 3]))))
        kv = None if rng.random() < 0.5 else float(rng.uniform(5, 500))
        branches.append(Branch(f"b{i}", segs, kv))
    return Network(WATER, tuple(branches))


def test_pipes_made_for_a_solve_are_not_used_by_another_meanwhile(monkeypatch):
    """A network met anew: its pipes are made and lent at once. Another thread solving the same
    network in between (forced here: a second solve right after the pipes are made) must not
    get them, or it would leave its state in them as the first solve's Newton start (the last
    bit of about one answer in five moved)."""
    from branchwise.core.numerics.small import heads

    made = heads._kept

    def another_solve_between(net: Network):  # the thread switch, made to happen
        out = made(net)
        if out[2]:  # made just now
            solve(net, PressureDrop(7e4))
        return out

    rng = np.random.default_rng(5)
    cases = [(_random_network(rng), given) for given in
             [PressureDrop(float(rng.uniform(1e3, 1e6))) for _ in range(30)]
             + [TotalFlow(float(rng.uniform(1e-3, 0.5))) for _ in range(30)]]
    references = [solve(Network(n.fluid, n.branches), g) for n, g in cases]
    monkeypatch.setattr(heads, "_kept", another_solve_between)
    for (net, given), reference in zip(cases, references, strict=True):
        same(solve(net, given), reference)
