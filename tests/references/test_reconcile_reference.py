"""Several readings weighed against each other, checked against general-purpose references.

The weighted-least-squares optimum is checked against `scipy.optimize.least_squares` on the same
whitened residuals L⁻¹(y − g(H)) (V = L Lᵀ, the covariance the result reports), with g(H) worked
out by hand: each branch's flow by `scipy.optimize.brentq` on Darcy–Weisbach with
`fluids.friction.Colebrook` (the reference of test_parallel_reference.py). The χ² tail is checked
against `scipy.stats.chi2.sf`. The test header is our own (tests/networks.py).
"""

from __future__ import annotations

import numpy as np
import pytest
from networks import BRANCHES, RHO, test_header
from scipy.linalg import cholesky, solve_triangular
from scipy.optimize import least_squares
from scipy.stats import chi2
from test_parallel_reference import G, ref_flows

from branchwise.core.numerics.reconcile import Observation, chi_square_p, reconcile
from branchwise.core.numerics.tolerances import Tolerances

TOL = Tolerances(gauge_percent=1.0, gauge_full_scale=100e3, flow_meter_percent=3.0)


def _readings(dp: float, total: float, clamp: dict[int, float]) -> list[Observation]:
    return [Observation("pressure_drop", None, dp), Observation("total_flow", None, total),
            *(Observation("measured_flow", b, q) for b, q in clamp.items())]


def _g_by_hand(obs: list[Observation], head: float) -> np.ndarray:
    flows = ref_flows(head, BRANCHES)
    return np.array([RHO * G * head if o.kind == "pressure_drop" else
                     sum(flows) if o.kind == "total_flow" else flows[o.branch] for o in obs])


@pytest.mark.parametrize(("dp", "total", "clamp"), [
    (40e3, 0.030, {0: 0.0105}),
    (40e3, 0.028, {0: 0.0105, 3: 0.0021}),
    (25e3, 0.030, {1: 0.0050, 2: 0.0090}),  # far apart: the optimum sits between them
])
def test_the_optimum_matches_least_squares(dp: float, total: float, clamp: dict[int, float]):
    obs = _readings(dp, total, clamp)
    rec = reconcile(test_header(), obs, TOL)
    cov = np.array(rec.covariance)
    low = cholesky(cov, lower=True)
    y = np.array([o.value for o in obs])

    def whitened(h: np.ndarray) -> np.ndarray:
        return solve_triangular(low, y - _g_by_hand(obs, float(h[0])), lower=True)

    ref = least_squares(whitened, x0=[dp / (RHO * G)], xtol=1e-15, ftol=1e-15, gtol=1e-15)
    # Both find the same minimum of a smooth one-dimensional sum of squares: the heads agree to
    # what the flows' own agreement (1e-8, test_parallel_reference) allows.
    assert rec.head_m == pytest.approx(ref.x[0], rel=1e-8)
    assert rec.chi_square == pytest.approx(float(ref.fun @ ref.fun), rel=1e-6, abs=1e-9)
    for fit, g in zip(rec.readings, _g_by_hand(obs, ref.x[0]), strict=True):
        assert fit.reconciled_si == pytest.approx(g, rel=1e-8)


@pytest.mark.parametrize("dof", [1, 2, 3, 4, 7, 12])
def test_the_chi_square_tail_matches_scipy(dof: int):
    for x in np.linspace(0.0, 60.0, 121):
        assert chi_square_p(x, dof) == pytest.approx(chi2.sf(x, dof), rel=1e-12, abs=1e-15)


def test_two_readings_cannot_name_the_one_at_fault():
    # With two readings the residual covariance has rank one: both normalised residuals are
    # equal in size (Narasimhan & Jordache 2000, 7.2), so no reading can be singled out.
    rec = reconcile(test_header(), _readings(40e3, 0.045, {}), TOL)
    a, b = rec.readings
    assert abs(a.normalised_residual) == pytest.approx(abs(b.normalised_residual), rel=1e-9)
    assert not rec.consistent and rec.suspect is None and rec.without_suspect is None
    assert "cannot tell which one is off" in rec.verdict


def test_the_normalised_residuals_have_unit_variance_under_the_model():
    # The definition: r_i / sqrt(V_r,ii) with V_r = V − J (Jᵀ V⁻¹ J)⁻¹ Jᵀ. Here checked by
    # its consequence: Σ over readings of r_i² / V_r,ii is not χ², but for a reading that the
    # head does not move (a large clamp-on σ would) r/σ and the normalised residual agree.
    obs = _readings(40e3, 0.030, {0: 0.0105})
    rec = reconcile(test_header(), obs, TOL)
    assert rec.degrees_of_freedom == 2 and len(rec.readings) == 3
    for fit in rec.readings:
        r = fit.measured_si - fit.reconciled_si
        assert abs(fit.normalised_residual) >= abs(r) / fit.sigma_si * (1 - 1e-12)
