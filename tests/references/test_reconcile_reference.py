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
from networks import BRANCHES, MU, RHO, test_header
from scipy.linalg import cholesky, solve_triangular
from scipy.optimize import least_squares
from scipy.stats import chi2
from test_parallel_reference import G, ref_flows

from branchwise.core.numerics.reconcile import reconcile
from branchwise.core.numerics.reconcile_result import Observation, chi_square_p
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


# ---- the optimum on either side of zero -----------------------------------------------------


def _signed_flows(head: float, branches=BRANCHES) -> list[float]:
    """Each branch's flow at a head of either sign: Q(H) is odd (Darcy–Weisbach by hand)."""
    if abs(head) < 1e-9:
        return [0.0] * len(branches)
    return [np.copysign(q, head) for q in ref_flows(abs(head), branches)]


def _reference_optimum(net, obs, cov):
    """The least of S over heads of either sign, by hand: S scanned over −40…40 m in
    t = sign(H)·√|H| (801 points), then `scipy.optimize.least_squares` from the lowest point
    on the whitened residuals, Δp = ρ g (H + Δz)."""
    low = cholesky(cov, lower=True)
    y = np.array([o.value for o in obs])

    def g(h: float) -> np.ndarray:
        flows = _signed_flows(h)
        return np.array([RHO * G * (h + net.elevation_change) if o.kind == "pressure_drop" else
                         sum(flows) if o.kind == "total_flow" else flows[o.branch]
                         for o in obs])

    def whitened(h: np.ndarray) -> np.ndarray:
        return solve_triangular(low, y - g(float(h[0])), lower=True)

    grid = [np.copysign(t * t, t) for t in np.linspace(-np.sqrt(40), np.sqrt(40), 801)]
    start = min(grid, key=lambda h: float(whitened(np.array([h])) @ whitened(np.array([h]))))
    ref = least_squares(whitened, x0=[start], xtol=1e-15, ftol=1e-15, gtol=1e-15)
    return float(ref.x[0]), float(ref.fun @ ref.fun), g(float(ref.x[0]))


@pytest.mark.parametrize(("elevation", "dp", "total", "clamp"), [
    (5.2, 50e3, 0.030, {0: 0.0105}),    # the gauge alone gives a small negative head
    (0.0, -50e3, 0.030, {0: 0.0105}),   # the gauge reads backwards, the meters forwards
    (0.0, 10e3, -0.030, {0: -0.0150}),  # the gauge reads forwards, the meters backwards
    (-3.0, -20e3, -0.025, {1: -0.006}),  # all of them backwards, with a fall
])
def test_the_optimum_crosses_zero_as_least_squares_does(elevation, dp, total, clamp):
    net = test_header(elevation)
    obs = _readings(dp, total, clamp)
    rec = reconcile(net, obs, TOL)
    head, chi2_ref, g = _reference_optimum(net, obs, np.array(rec.covariance))
    assert rec.head_m == pytest.approx(head, rel=1e-7)
    assert rec.chi_square == pytest.approx(chi2_ref, rel=1e-6)
    for fit, want in zip(rec.readings, g, strict=True):
        assert fit.reconciled_si == pytest.approx(want, rel=1e-7, abs=1e-12)


def _turbulent(head: float) -> bool:
    """Every segment above Re 4000 at ``head``: where the hand reference's Colebrook holds
    (below it the reference takes 64/Re and the model a transition: a different law)."""
    flows = _signed_flows(head)
    return all(4 * abs(q) * RHO / (np.pi * d * MU) > 4000
               for q, (_, segs, _) in zip(flows, BRANCHES, strict=True) for d, *_ in segs)


def test_random_readings_of_either_sign_find_the_least_squares_optimum():
    rng = np.random.default_rng(7)
    checked = 0
    while checked < 12:
        elevation = float(rng.uniform(-8.0, 8.0))
        dp = float(rng.uniform(-60e3, 90e3))
        total = float(rng.choice([-1, 1]) * rng.uniform(0.005, 0.05))
        clamp = {int(rng.integers(0, len(BRANCHES))): float(rng.uniform(-0.01, 0.02))}
        net, obs = test_header(elevation), _readings(dp, total, clamp)
        rec = reconcile(net, obs, TOL)
        head, chi2_ref, _ = _reference_optimum(net, obs, np.array(rec.covariance))
        if not _turbulent(head):
            continue
        checked += 1
        assert rec.head_m == pytest.approx(head, rel=1e-6, abs=1e-9), (elevation, dp, total)
        assert rec.chi_square == pytest.approx(chi2_ref, rel=1e-6)


R2 = """format = 1
name = "rec test"
[fluid]
kind = "water"
temperature = "20 degC"
[conditions]
pressure_drop = "{dp}"
total_flow = "30 L/s"
elevation_change = "{dz}"
given = "all"
[[branches]]
name = "A"
diameter = "100 mm"
length = "50 m"
roughness = "0.045 mm"
minor_k = 3
measured_flow = "22 L/s"
[[branches]]
name = "B"
diameter = "80 mm"
length = "40 m"
roughness = "0.045 mm"
minor_k = 2
[tolerances]
gauge_accuracy = "1 %"
gauge_full_scale = "100 kPa"
flow_meter_accuracy = "2 %"
roughness_factor = [1, 1]
diameter = "0 %"
length = "0 %"
temperature = "0 K"
fitting_k = "0 %"
valve_kv = "0 %"
"""


@pytest.mark.parametrize(("dp", "dz", "head_by_hand"), [
    ("50 kPa", "5.2 m", 2.209),  # the gauge alone: a head of −0.09 m; the meters: forwards
    ("50 kPa", "5.0 m", 2.274),
    ("-50 kPa", "0 m", 1.093),   # the gauge reads backwards
])
def test_a_two_branch_site_with_no_model_uncertainty_matches_wls_by_hand(dp, dz, head_by_hand):
    # No model uncertainty: V is the instruments' alone, diagonal, σ = a/√3 (GUM 4.3.7) — a
    # weighted least squares anyone can set up: each flow by brentq on Darcy–Weisbach with
    # `fluids.friction.Colebrook`, the minimum by `scipy.optimize.least_squares` from the lowest
    # of a scan. The liquid's ρ and μ are the site's (the subject here is the optimum).
    import fluids.friction as fr
    from scipy.optimize import brentq

    from branchwise.core.site.read import parse_site
    from branchwise.core.site.solve import solve_site

    sr = solve_site(parse_site(R2.format(dp=dp, dz=dz)))
    rec = sr.reconciliation
    fl = sr.result.network.fluid
    rho, mu = fl.density, fl.viscosity
    pipes = [(0.100, 50.0, 4.5e-5, 3.0), (0.080, 40.0, 4.5e-5, 2.0)]

    def flow(d, length, eps, k, head):
        def loss(q):
            v = q / (np.pi * d * d / 4)
            f = fr.Colebrook(rho * v * d / mu, eps / d)
            return (f * length / d + k) * v * v / (2 * G) - abs(head)
        return float(np.copysign(brentq(loss, 1e-7, 5.0, xtol=1e-16, rtol=1e-15), head))

    dz_m, dp_pa = float(dz.split()[0]), float(dp.split()[0]) * 1e3
    y = np.array([dp_pa, 0.030, 0.022])
    sigma = np.array([0.01 * 100e3, 0.02 * 0.030, 0.02 * 0.022]) / np.sqrt(3)

    def whitened(h):
        qa, qb = (flow(*p, float(h[0])) for p in pipes)
        return (y - np.array([rho * G * (float(h[0]) + dz_m), qa + qb, qa])) / sigma

    grid = np.linspace(-6.0, 6.0, 120)  # either sign; 0 itself not on it
    start = min(grid, key=lambda h: float(whitened([h]) @ whitened([h])))
    ref = least_squares(whitened, x0=[start], xtol=1e-15, ftol=1e-15, gtol=1e-15)
    assert rec is not None
    assert rec.head_m == pytest.approx(ref.x[0], rel=1e-7)
    assert rec.head_m == pytest.approx(head_by_hand, abs=1e-3)  # the review's hand WLS
    assert rec.chi_square == pytest.approx(float(ref.fun @ ref.fun), rel=1e-6)
    assert sr.result.pressure_drop == pytest.approx(rho * G * (ref.x[0] + dz_m), rel=1e-7)
    # The head's standard uncertainty: (Jᵀ J)^(−½) of the whitened residuals at the optimum,
    # J from least_squares' own finite-difference Jacobian (Gauss–Newton covariance).
    sigma_ref = float(np.sqrt(1 / (ref.jac.T @ ref.jac)[0, 0]))
    assert rec.head_sigma_m == pytest.approx(sigma_ref, rel=1e-4)
    assert rec.pressure_drop_sigma_pa == pytest.approx(rho * G * sigma_ref, rel=1e-4)


def test_the_band_of_a_site_solved_from_all_readings_is_the_weighing_s():
    # No gauge at all: the band must not name one; the pressure drop's GUM linear u is the
    # weighed head's own (Gauss–Newton covariance of least_squares, as above) times ρ g, as
    # nothing else moves the given pressure drop.
    from branchwise.core.site.read import parse_site
    from branchwise.core.site.solve import solve_site, with_uncertainty

    text = (R2.format(dp="0 kPa", dz="0 m").replace('pressure_drop = "0 kPa"\n', "")
            .replace("roughness_factor = [1, 1]", "roughness_factor = [0.5, 2]")
            .replace('diameter = "0 %"', 'diameter = "1 %"'))
    sr = with_uncertainty(solve_site(parse_site(text)), samples=200)
    rec, band = sr.reconciliation, sr.uncertainty
    assert rec is not None and band is not None and len(rec.readings) == 2
    names = [n for rows in band.ranking.values() for n, _ in rows]
    assert "readings weighed together" in names
    assert not any("gauge" in n for n in names)
    assert band.outputs["pressure drop"].linear_sigma == pytest.approx(
        rec.pressure_drop_sigma_pa, rel=1e-6)


def test_readings_of_opposite_signs_find_the_lower_of_two_dips():
    """A gauge that says forward and meters that say reverse leave S a dip on each side of
    zero: the weighed head is the lower one (the search once followed the dip of its lowest
    first point, a local minimum in about 1 of 500 random sites of this kind). Reference:
    the 801-point scan and least_squares above."""
    rng = np.random.default_rng(11)
    checked = 0
    while checked < 16:
        sign = float(rng.choice([-1, 1]))
        dp = sign * float(rng.uniform(5e3, 90e3))
        total = -sign * float(rng.uniform(0.005, 0.05))
        clamp = {int(rng.integers(0, len(BRANCHES))): -sign * float(rng.uniform(0.001, 0.02))}
        net, obs = test_header(float(rng.uniform(-3.0, 3.0))), _readings(dp, total, clamp)
        rec = reconcile(net, obs, TOL)
        head, chi2_ref, _ = _reference_optimum(net, obs, np.array(rec.covariance))
        if not _turbulent(head):
            continue
        checked += 1
        assert rec.chi_square == pytest.approx(chi2_ref, rel=1e-6), (dp, total, clamp)
        assert rec.head_m == pytest.approx(head, rel=1e-6, abs=1e-9), (dp, total, clamp)
