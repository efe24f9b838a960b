"""Series segments under Colebrook on the small path: Newton on ln Q and every segment's
x = 1/√f together (``small.series.joint_newton``, through ``Pipe._colebrook_series``).

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
    assert p._colebrook_series(head) > 0  # the joint Newton took it
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
    joint._colebrook_series(head)
    by_flow._newton(head, 0.0)
    assert joint.q == pytest.approx(by_flow.q, rel=1e-13)
    assert joint.s == pytest.approx(by_flow.s, rel=1e-12)


def test_laminar_flow_is_left_to_the_flow_newton():
    p = pipe(Segment(0.01, 50.0, 4.5e-5, 0.0), Segment(0.008, 5.0, 4.5e-5, 0.0))
    tiny = 1e-4  # m: Re of a few tens
    assert p.copy()._colebrook_series(tiny) == 0
    q = p.copy()
    assert q.flow_at(tiny) > 0
    assert q.h == pytest.approx(tiny, rel=1e-12)
    assert q.re[0] < 2000
