"""Series segments under Colebrook on the small path: Newton on ln Q and every segment's
x = 1/√f together (``small.series.joint_newton``, through ``Pipe.colebrook_series_flow``).

The reference is outside the project: each segment's friction factor must be the one
``fluids.friction.Colebrook`` gives at that segment's Reynolds number and relative roughness, and
the losses (Darcy–Weisbach with the fittings' K and the valve, worked out here) must add up to
the head.
"""

from __future__ import annotations

import math

import pytest
from fluids.friction import Colebrook

from branchwise.core.model import Branch, Segment
from branchwise.core.numerics.small.branch import Pipe

G = 9.80665
NU = 1.0016e-3 / 998.2
"""Water near 20 °C (IAPWS values, see the field notes)."""


def pipe(*segments: Segment, kv: float | None = None) -> Pipe:
    return Pipe(Branch("s", tuple(segments), kv), NU, G, "colebrook")


CASES = [
    (pipe(Segment(0.1, 40.0, 4.5e-5, 3.0), Segment(0.08, 10.0, 4.5e-5, 1.0)), 5.0),
    (pipe(Segment(0.3, 200.0, 1.5e-6, 0.0), Segment(0.05, 2.0, 2e-4, 12.0),
          Segment(0.2, 30.0, 0.0, 0.5), kv=120.0), 8.0),
    (pipe(Segment(0.025, 150.0, 4.5e-5, 8.0), Segment(0.02, 5.0, 4.5e-5, 0.0)), 40.0),
]


@pytest.mark.parametrize(("p", "head"), CASES)
def test_series_segments_meet_colebrook_in_every_segment(p: Pipe, head: float):
    p = p.copy()
    assert p.colebrook_series_flow(head) > 0  # the joint Newton took it
    q = p.q
    h = 0.0
    for j in range(p.n):
        d = p.d[j]
        v = q / (math.pi * d * d / 4)
        re = v * d / NU
        f = Colebrook(re, p.eps[j] / d)  # the outside reference
        assert p.f[j] == pytest.approx(f, rel=1e-12)
        h += (f * p.length[j] / d + p.k[j]) * v * v / (2 * G)
    h += p.valve_r * q * q
    assert h == pytest.approx(head, rel=1e-12)


@pytest.mark.parametrize(("p", "head"), CASES)
def test_the_joint_newton_and_the_flow_newton_agree(p: Pipe, head: float):
    joint, by_flow = p.copy(), p.copy()
    joint.colebrook_series_flow(head)
    by_flow._newton(head, 0.0)
    assert joint.q == pytest.approx(by_flow.q, rel=1e-13)
    assert joint.s == pytest.approx(by_flow.s, rel=1e-12)


def test_laminar_flow_is_left_to_the_flow_newton():
    p = pipe(Segment(0.01, 50.0, 4.5e-5, 0.0), Segment(0.008, 5.0, 4.5e-5, 0.0))
    tiny = 1e-4  # m: Re of a few tens
    assert p.copy().colebrook_series_flow(tiny) == 0
    q = p.copy()
    assert q.flow_at(tiny) > 0
    assert q.h == pytest.approx(tiny, rel=1e-12)
    assert q.re[0] < 2000


def test_two_segments_written_out_take_the_loops_steps():
    """``joint_newton_two`` is the loop of ``joint_newton_any`` written out for two segments,
    the same sums in the same order: over random reducers and expanders — both segments in
    turbulent flow, or either one not, with and without fittings and a valve — the same
    iterations, flow and roots (those left behind on a failure too, where a branch's own
    Newton starts from them), bit for bit."""
    import random

    from branchwise.core.numerics.small.series import joint_newton_any, joint_newton_two

    rng = random.Random(7)
    taken = first_out = second_out = 0
    for _ in range(600):
        d = rng.uniform(0.01, 0.5)
        ratio = rng.choice([rng.uniform(0.3, 1.2), rng.uniform(2.0, 30.0)])
        p = pipe(Segment(d, rng.uniform(0.5, 300.0), rng.choice([0.0, 1.5e-6, 4.5e-5, 1e-3]),
                         rng.choice([0.0, rng.uniform(0, 20)])),
                 Segment(d * ratio, rng.uniform(0.5, 50.0), 4.5e-5, rng.uniform(0, 5)),
                 kv=rng.choice([None, rng.uniform(1.0, 500.0)]))
        head = 10 ** rng.uniform(-4, 2.5)
        xs_loop, xs_two = [0.0, 0.0], [0.0, 0.0]
        it_loop, q_loop = joint_newton_any(head, p.series, p.a3, xs_loop)
        it_two, q_two = joint_newton_two(head, p.series, p.a3, xs_two)
        assert (it_two, xs_two) == (it_loop, xs_loop)
        if it_loop:
            taken += 1
            assert q_two == q_loop
        else:
            assert math.isnan(q_two) and math.isnan(q_loop)
            # which segment left turbulent flow first (Re ∝ Q/D: the wider one, at a flow
            # near the start's)
            c = [k / math.sqrt(head / (p.series[2] + sum(p.series[1]) * 0.02))
                 for k in p.series[0]]
            first_out += c[0] > c[1]
            second_out += c[1] > c[0]
    assert taken > 100 and first_out > 20 and second_out > 20  # every kind of case was met
