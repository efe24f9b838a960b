"""A parallel network of our own, solved independently in the test, in every direction.

The reference is the way one would do it by hand: for each branch a scalar
``scipy.optimize.brentq`` on Q with the Darcy friction factor from ``fluids.friction.Colebrook``
(the `fluids` library, PyPI), and brentq again on the head, diameter, length or roughness.
Nothing of branchwise's hydraulics is used by the reference. Agreement asked: ≤ 1e-8 relative.
"""

from __future__ import annotations

import math

import fluids.friction as ref
import pytest
from networks import BRANCHES, MU, RHO, test_header
from scipy.optimize import brentq

from branchwise.core.model import (
    FindUnknown,
    MeasuredFlow,
    Network,
    PressureDrop,
    TotalFlow,
)
from branchwise.core.numerics.solve import solve

G = 9.80665
RTOL = 1e-8



def network(elevation: float = 0.0) -> Network:
    """The shared test header (tests/networks.py: a header of our own with a two-size branch)."""
    return test_header(elevation)


# ---- the independent reference ------------------------------------------------------------

def ref_head(segs, kv, q):
    """Head loss of one branch at flow q by Darcy–Weisbach + K + IEC 60534 valve, scalar."""
    h = 0.0
    for d, length, eps, k in segs:
        area = math.pi * d * d / 4
        v = q / area
        re = RHO * v * d / MU
        f = ref.Colebrook(re, eps / d) if re > 4000 else 64 / re
        h += (f * length / d + k) * v * v / (2 * G)
    if kv:
        dp_bar = (RHO / 1000) * (q * 3600 / kv) ** 2  # IEC 60534: Q = Kv √(Δp / (ρ/ρ0))
        h += dp_bar * 1e5 / (RHO * G)
    return h


def ref_flow(segs, kv, head):
    return brentq(lambda q: ref_head(segs, kv, q) - head, 1e-9, 10.0, xtol=1e-16, rtol=1e-15)


def ref_flows(head, branches=BRANCHES):
    return [ref_flow(s, kv, head) for _, s, kv in branches]


def ref_head_for_total(total, branches=BRANCHES):
    return brentq(lambda h: sum(ref_flows(h, branches)) - total, 1e-6, 1e4, xtol=1e-14,
                  rtol=1e-15)


def close(a, b, rtol=RTOL):
    return abs(a - b) <= rtol * abs(b)


# ---- the checks ---------------------------------------------------------------------------

DP = 68e3


def test_flows_from_pressure_drop():
    res = solve(network(), PressureDrop(DP))
    expected = ref_flows(DP / (RHO * G))
    for got, want in zip(res.flows, expected, strict=True):
        assert close(got, want)


def test_flows_from_pressure_drop_with_lift():
    # Driving head = Δp/(ρg) − Δz (field notes).
    res = solve(network(elevation=2.5), PressureDrop(DP))
    expected = ref_flows(DP / (RHO * G) - 2.5)
    assert all(close(a, b) for a, b in zip(res.flows, expected, strict=True))


def test_flows_from_total_flow():
    total = 0.045
    res = solve(network(), TotalFlow(total))
    head = ref_head_for_total(total)
    assert close(res.driving_head, head)
    assert all(close(a, b) for a, b in zip(res.flows, ref_flows(head), strict=True))


def test_flows_from_measured_branch():
    q2 = 0.0071
    res = solve(network(), MeasuredFlow("Coil 2", q2))
    head = ref_head(BRANCHES[1][1], BRANCHES[1][2], q2)
    assert close(res.driving_head, head)
    assert all(close(a, b) for a, b in zip(res.flows, ref_flows(head), strict=True))


def _ref_unknown(quantity, index, target, head, segment=0):
    name, segs, kv = BRANCHES[index]

    def with_value(x):
        s = list(segs)
        d, length, eps, k = s[segment]
        s[segment] = {"diameter": (x, length, eps, k), "length": (d, x, eps, k),
                      "roughness": (d, length, x, k)}[quantity]
        return ref_head(s, kv, target) - head

    lo, hi = {"diameter": (0.005, 2.0), "length": (1e-6, 1e5), "roughness": (0.0, 0.004)}[quantity]
    return brentq(with_value, lo, hi, xtol=1e-18, rtol=1e-15)


GIVENS = {
    "pressure drop": (PressureDrop(DP), lambda target, i: DP / (RHO * G)),
    "total flow": (TotalFlow(0.05), lambda target, i: ref_head_for_total(
        0.05 - target, [b for j, b in enumerate(BRANCHES) if j != i])),
    "measured Coil 1": (MeasuredFlow("Coil 1", 0.0152),
                        lambda target, i: ref_head(BRANCHES[0][1], None, 0.0152)),
}


@pytest.mark.parametrize("given", list(GIVENS))
@pytest.mark.parametrize(("quantity", "branch", "factor", "segment"), [
    # target = factor × the branch's flow as built, so that an answer exists in each case
    ("diameter", "Coil 2", 1.2, 0),
    ("length", "Coil 2", 0.9, 0),
    ("roughness", "Coil 2", 0.97, 0),
    ("diameter", "Reducer run", 1.15, 1),
    ("length", "Reducer run", 0.95, 0),
])
def test_unknowns_in_every_direction(given, quantity, branch, factor, segment):
    g, head_of = GIVENS[given]
    index = [b[0] for b in BRANCHES].index(branch)
    as_built = solve(network(), g).flows[index]
    target = factor * as_built
    res = solve(network(), g, FindUnknown(quantity, branch, target, segment))
    head = head_of(target, index)
    assert close(res.driving_head, head)
    want = _ref_unknown(quantity, index, target, head, segment)
    assert close(res.solved.value, want), (res.solved.value, want)
    assert close(res.flows[index], target)
