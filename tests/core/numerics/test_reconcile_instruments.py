"""The instruments' part of the weighed pressure drop's uncertainty, against inverse-variance
weighting: with no model uncertainty, two independent readings of one head weigh as
1/σ² = 1/σ₁² + 1/σ₂² (the weighted mean's variance; any statistics text), each flow reading's
σ carried to the pressure drop by the slope dΔp/dQ, here from two solves either side (a
central difference, not the code's own slope)."""

from __future__ import annotations

import math

import pytest

from branchwise.core.model import Branch, Fluid, Network, PressureDrop, Segment
from branchwise.core.numerics.reconcile import reconcile
from branchwise.core.numerics.reconcile_result import Observation
from branchwise.core.numerics.solve import solve
from branchwise.core.numerics.tolerances import Tolerances

WATER = Fluid("water 20 °C", 998.2, 1.0016e-3, "water")  # IAPWS values, from memory
NET = Network(WATER, (Branch("A", (Segment(0.1, 40.0, 4.5e-5, 3.0),)),
                      Branch("B", (Segment(0.08, 30.0, 4.5e-5, 2.0),))))
NO_MODEL = Tolerances(gauge_percent=1.0, gauge_full_scale=200e3, flow_meter_percent=2.0,
                      roughness_factor=(1.0, 1.0), diameter_percent=0.0, length_percent=0.0,
                      temperature_k=0.0, fitting_k_percent=0.0, valve_kv_percent=0.0)


def _total(dp: float) -> float:
    return float(solve(NET, PressureDrop(dp)).total_flow)


def test_with_no_model_uncertainty_the_two_parts_are_the_inverse_variance_weighting():
    dp = 60e3
    q = _total(dp)
    obs = [Observation("pressure_drop", None, dp), Observation("total_flow", None, q)]
    rec = reconcile(NET, obs, NO_MODEL)
    u_gauge = 0.01 * 200e3 / math.sqrt(3)  # GUM 4.3.7: a/√3
    step = dp * 1e-4
    dq_ddp = (_total(dp + step) - _total(dp - step)) / (2 * step)
    u_meter_as_dp = 0.02 * q / math.sqrt(3) / dq_ddp
    expected = 1 / math.sqrt(1 / u_gauge**2 + 1 / u_meter_as_dp**2)
    assert rec.pressure_drop_sigma_instruments_pa == pytest.approx(expected, rel=1e-5)
    assert rec.pressure_drop_sigma_pa == pytest.approx(expected, rel=1e-5)


def test_the_model_part_is_left_out_of_the_instruments_part():
    dp = 60e3
    obs = [Observation("pressure_drop", None, dp), Observation("total_flow", None, _total(dp))]
    with_model = reconcile(NET, obs, Tolerances(gauge_full_scale=200e3, flow_meter_percent=2.0))
    bare = reconcile(NET, obs, NO_MODEL)
    assert with_model.pressure_drop_sigma_pa > with_model.pressure_drop_sigma_instruments_pa
    # Inverse-variance weights give the least variance of the instruments' part; the model's
    # uncertainty moves the weights away from them, so that part can only grow.
    assert with_model.pressure_drop_sigma_instruments_pa >= bare.pressure_drop_sigma_pa * (
        1 - 1e-9)


def test_a_p_value_that_underflows_is_said_as_a_bound():
    # χ² of 3,000 on 1 degree of freedom: p ≈ 1e-650 (scipy's chi2.sf gives 0.0 in floats)
    from scipy.stats import chi2

    from branchwise.core.numerics.reconcile_result import p_said

    assert chi2.sf(3000.0, 1) == 0.0
    assert p_said(0.0) == "< 1e-300" and p_said(3.3e-224) == "= 3.3e-224"
