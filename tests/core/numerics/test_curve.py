"""The system curve and the tiled layouts under it.

References: the Darcy friction factor from the `fluids` library (``fluids.friction.Colebrook``,
PyPI) for the head loss of each branch at the curve's flows; Darcy–Weisbach for a K-only branch
(h = K V²/2g, so Δp = ρ K Q²/(2 A²) exactly); hydrostatics for the zero-flow point (Δp = ρ g Δz).
"""

from __future__ import annotations

import csv
import io
import math

import numpy as np
import pytest
from networks import BRANCHES as TEST_BRANCHES
from networks import MU, RHO, test_header

from branchwise.core.errors import InputError
from branchwise.core.model import Branch, Fluid, Network, PressureDrop, Segment, branch
from branchwise.core.numerics.curve import system_curve
from branchwise.core.numerics.hydraulics import Layout, flows_at_head
from branchwise.core.numerics.solve import solve
from branchwise.core.numerics.variants import tiled_layout
from branchwise.core.report.curve_csv import to_csv

G = 9.80665
BRANCHES = [(name, segments, None) for name, segments, _ in TEST_BRANCHES[:3]]
"""The test header's first three branches, without valves."""


def network(elevation: float = 1.5) -> Network:
    return test_header(elevation, BRANCHES)


def ref_head(segs, q):
    """Head loss of one branch at q: Darcy–Weisbach + K with f from fluids.friction.Colebrook."""
    ref = pytest.importorskip("fluids.friction")
    h = 0.0
    for d, length, eps, k in segs:
        v = q / (math.pi * d * d / 4)
        re = RHO * v * d / MU
        f = ref.Colebrook(re, eps / d) if re > 4000 else 64 / re
        h += (f * length / d + k) * v * v / (2 * G)
    return h


def test_curve_passes_through_the_operating_point_and_rises():
    op = solve(network(), PressureDrop(60e3))
    curve = system_curve(network(), points=50, operating=op)
    i = curve.operating_index
    assert curve.total_flow[i] == op.total_flow
    assert curve.pressure_drop[i] == pytest.approx(op.pressure_drop, rel=1e-10)
    np.testing.assert_allclose(curve.branch_flows[i], op.flows, rtol=1e-9)
    assert curve.total_flow[0] == 0 and curve.total_flow[-1] == pytest.approx(1.5 * op.total_flow)
    assert len(curve.total_flow) == 51  # 50 even points plus the operating point
    assert np.all(np.diff(curve.pressure_drop) > 0)
    assert np.all(np.diff(curve.branch_flows, axis=0) > 0)
    assert curve.operating_point == (op.total_flow, curve.pressure_drop[i])


def test_an_even_point_on_the_operating_flow_is_not_doubled():
    op = solve(network(), PressureDrop(60e3))
    curve = system_curve(network(), points=40, operating=op)  # 26/39 · 1.5 = 1: the same flow
    assert len(curve.total_flow) == 40 and np.all(np.diff(curve.total_flow) > 0)
    assert curve.total_flow[curve.operating_index] == op.total_flow


def test_curve_points_obey_equal_head_loss_with_fluids_colebrook():
    # Every branch loses the curve's driving head at its flow (parallel branches), and the
    # branch flows add up to the total (continuity); losses by Darcy–Weisbach with `fluids`.
    curve = system_curve(network(), total_flows=np.array([0.004, 0.02, 0.05]))
    for row in range(3):
        flows = curve.branch_flows[row]
        assert flows.sum() == pytest.approx(curve.total_flow[row], rel=1e-11)
        for (_, segs, _), q in zip(BRANCHES, flows, strict=True):
            assert ref_head(segs, q) == pytest.approx(curve.driving_head[row], rel=1e-8)
        # Δp = ρ g (h + Δz): the loss plus the lift.
        assert curve.pressure_drop[row] == pytest.approx(
            RHO * G * (curve.driving_head[row] + 1.5), rel=1e-12)
    assert curve.operating_index is None and curve.operating_point is None


def test_a_k_only_branch_gives_the_darcy_weisbach_parabola_over_the_static_lift():
    d, k, lift = 0.05, 12.0, 3.0
    net = Network(Fluid("test liquid", RHO, MU), (branch("Orifice run", d, 0.0, 0.0, k),),
                  elevation_change=lift)
    flows = np.linspace(0.0, 0.01, 11)
    curve = system_curve(net, total_flows=flows)
    area = math.pi * d * d / 4
    expected = RHO * k * flows**2 / (2 * area**2) + RHO * G * lift  # h = K V²/2g
    np.testing.assert_allclose(curve.pressure_drop, expected, rtol=1e-12)
    assert curve.pressure_drop[0] == pytest.approx(RHO * G * lift, rel=1e-15)  # hydrostatics


def test_reverse_operating_point_gives_a_curve_down_to_it():
    op = solve(network(elevation=0.0), PressureDrop(-20e3))
    curve = system_curve(network(elevation=0.0), points=10, operating=op)
    assert curve.total_flow[0] == pytest.approx(1.5 * op.total_flow) and curve.total_flow[-1] == 0
    assert np.all(np.diff(curve.pressure_drop) > 0)
    assert curve.pressure_drop[curve.operating_index] == pytest.approx(-20e3, rel=1e-10)


GPM = 231 * 0.0254**3 / 60  # m³/s per US gpm: gallon = 231 in³, inch = 0.0254 m (NIST SP 811)
PSI = 0.45359237 * 9.80665 / 0.0254**2  # Pa per lbf/in² (NIST SP 811, ≈ 6.894 757 E+03)


@pytest.mark.parametrize(("system", "titles", "flow", "pressure", "head"), [
    ("si", ("Total flow (L/s)", "Pressure drop (kPa)", "Driving head (m)"), 1e-3, 1e3, 1.0),
    ("us", ("Total flow (gpm)", "Pressure drop (psi)", "Driving head (ft)"), GPM, PSI, 0.3048),
])
def test_csv_gives_the_arrays_in_display_units(system, titles, flow, pressure, head):
    # Factors from NIST SP 811 (litre, kPa, US gallon, psi, foot = 0.3048 m exactly).
    op = solve(network(), PressureDrop(60e3))
    curve = system_curve(network(), points=5, operating=op)
    rows = list(csv.reader(io.StringIO(to_csv(curve, system))))
    assert tuple(rows[0][:3]) == titles
    unit = titles[0].split("(")[1]
    assert rows[0][3] == f"Flow Coil 1 ({unit}" and rows[0][-1] == "Operating point"
    body = np.array([[float(v) for v in r] for r in rows[1:]])
    rel = 1e-9  # written to 10 significant figures
    np.testing.assert_allclose(body[:, 0] * flow, curve.total_flow, rtol=rel)
    np.testing.assert_allclose(body[:, 1] * pressure, curve.pressure_drop, rtol=rel)
    np.testing.assert_allclose(body[:, 2] * head, curve.driving_head, rtol=rel)
    np.testing.assert_allclose(body[:, 3:-1] * flow, curve.branch_flows, rtol=rel)
    assert body[:, -1].tolist().count(1.0) == 1 and body[curve.operating_index, -1] == 1


@pytest.mark.parametrize(("kwargs", "field"), [
    ({}, "curve.total_flows"),
    ({"total_flows": [0.01, float("nan")]}, "curve.total_flows"),
    ({"total_flows": []}, "curve.total_flows"),
])
def test_bad_curve_requests_name_the_field(kwargs, field):
    with pytest.raises(InputError) as err:
        system_curve(network(), **kwargs)
    assert err.value.field == field


def test_tiled_copies_are_independent_networks():
    # Each copy with its own diameters and viscosity solves as the same network built alone.
    base = Layout.from_network(network())
    scale = np.array([[1.0], [0.9], [1.1]])
    nu = np.array([1.0e-6, 1.3e-6, 0.8e-6])
    lay = tiled_layout(base, 3, diameter=scale * base.diameter[None, :], nu=nu)
    q, info = flows_at_head(lay, 4.0)
    assert info.converged
    for c in range(3):
        segs = tuple(Branch(n, tuple(Segment(s[0] * scale[c, 0], *s[1:]) for s in ss))
                     for n, ss, _ in BRANCHES)
        alone = Network(Fluid("t", 1000.0, nu[c] * 1000.0), segs)
        expected, _ = flows_at_head(Layout.from_network(alone), 4.0)
        np.testing.assert_allclose(q[3 * c:3 * c + 3], expected, rtol=1e-12)
    keep = np.array([False, True, True])
    sub = tiled_layout(base, 2, keep)
    assert sub.n_branches == 4 and sub.branch_group.tolist() == [0, 0, 1, 1]
    assert len(sub.diameter) == 2 * 3  # Coil 2 and the two segments of the reducer run
