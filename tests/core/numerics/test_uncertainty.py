"""Monte Carlo bands, the GUM linear estimate and the ranking, against analytic results.

References named beside each check:
- GUM, JCGM 100:2008: 4.3.7 (rectangular distribution, u = a/√3) and 5.1.2 (law of propagation).
- The fully rough limit of Colebrook (von Kármán–Prandtl rough-pipe law, Nikuradse 1933):
  1/√f = −2 log10(ε/(3.7 D)), so f does not depend on the flow and Q = C √Δp exactly.
- Hagen–Poiseuille: laminar Q ∝ Δp/μ; water viscosity from the `iapws` package (IAPWS-95 density,
  IAPWS 2008 viscosity).
- Sampling statistics: the standard error of a sample standard deviation of N normal values is
  about σ/√(2(N−1)); of the sample p-quantile, √(p(1−p)/N)/pdf(x_p).
"""

from __future__ import annotations

import json
import math

import numpy as np
import pytest
from networks import BRANCHES, test_header

from branchwise.core.errors import InputError
from branchwise.core.model import (
    FindFlows,
    FindUnknown,
    Fluid,
    MeasuredFlow,
    Network,
    PressureDrop,
    TotalFlow,
    branch,
)
from branchwise.core.numerics.sampling import build_plan
from branchwise.core.numerics.solve import solve
from branchwise.core.numerics.uncertainty import Thermal, Tolerances, monte_carlo

G = 9.80665
# ν and ρ slopes of water near 15 °C, of the right order (from memory; only used as a model)
WATER_NEAR_15C = Thermal(dln_nu_dt=-0.0265, dln_rho_dt=-1.5e-4)

NOTHING = Tolerances(gauge_percent=0, flow_meter_percent=0, roughness_factor=(1, 1),
                     diameter_percent=0, length_percent=0, temperature_k=0, fitting_k_percent=0,
                     valve_kv_percent=0)


def network(elevation: float = 1.5) -> Network:
    return test_header(elevation)


# Every direction the solver knows; targets chosen so that every draw has an answer.
CASES = {
    "dp-flows": (PressureDrop(60e3), None),
    "total-flows": (TotalFlow(0.03), None),
    "measured-flows": (MeasuredFlow("Coil 1", 0.008), None),
    "dp-length": (PressureDrop(60e3), FindUnknown("length", "Coil 2", 0.006)),
    "dp-diameter": (PressureDrop(60e3), FindUnknown("diameter", "Reducer run", 0.01, 1)),
    "total-diameter": (TotalFlow(0.03), FindUnknown("diameter", "Coil 2", 0.006)),
    "measured-roughness": (MeasuredFlow("Coil 1", 0.008),
                           FindUnknown("roughness", "Coil 2", 0.0031)),
}


@pytest.mark.parametrize("case", CASES)
def test_mc_spread_matches_the_gum_linear_estimate_for_small_tolerances(case):
    # For small tolerances the outputs are nearly linear in the inputs, so the Monte Carlo
    # standard deviation s must match the GUM law of propagation (JCGM 100:2008, 5.1.2) up to
    # sampling error. The standard error of s for N normal values is σ/√(2(N−1)); for sums of
    # uniform inputs (excess kurtosis between −1.2 and 0) it is smaller, so that is a safe
    # bound. We allow 4 of those (a chance of about 6e-5 to fail by bad luck per output, and
    # the seed is fixed) plus 1 % for the second-order terms the linear estimate leaves out:
    # with ±0.2–3 % inputs these are of the order of the tolerances squared over the first order
    # terms, well below 1 %.
    given, find = CASES[case]
    tol = Tolerances(gauge_percent=0.5, gauge_full_scale=100e3, flow_meter_percent=0.5,
                     roughness_factor=(0.97, 1.03), diameter_percent=0.2, length_percent=0.5,
                     temperature_k=0.5, fitting_k_percent=3.0, valve_kv_percent=1.0)
    n = 20_000
    res = monte_carlo(network(), given, find, tol, samples=n, seed=3, thermal=WATER_NEAR_15C)
    assert res.failed == 0
    bound = 4 / math.sqrt(2 * (n - 1)) + 0.01
    for name, band in res.outputs.items():
        if band.linear_sigma == 0:  # the given reading itself when it carries no tolerance
            assert band.std == 0, name
            continue
        assert abs(band.std / band.linear_sigma - 1) <= bound, (name, band)


def fully_rough_branch(dp_reading=200e3):
    # ε/D = 0.05 and a very thin test liquid: Re ~ 1e9, where the Re term of Colebrook is below
    # 1e-7 of the roughness term, so the friction factor is the fully rough one to ~1e-8.
    d, length, eps, rho = 0.1, 50.0, 5e-3, 1000.0
    net = Network(Fluid("thin test liquid", rho, 1e-7), (branch("Rough", d, length, eps),))
    f = (-2 * math.log10(eps / (3.7 * d))) ** -2  # von Kármán–Prandtl rough-pipe law
    area = math.pi * d * d / 4
    c = area * math.sqrt(2 * d / (rho * f * length))  # Q = C √Δp (Darcy–Weisbach, h = Δp/(ρg))
    return net, PressureDrop(dp_reading), c, f


def test_one_rough_branch_with_only_the_gauge_follows_q_proportional_to_root_dp():
    net, given, c, _ = fully_rough_branch()
    a = 0.02 * 300e3  # ±2 % of a 300 kPa gauge
    n = 10_000
    tol = Tolerances(**{**NOTHING.__dict__, "gauge_percent": 2.0, "gauge_full_scale": 300e3})
    res = monte_carlo(net, given, None, tol, samples=n, seed=11)
    q, dp = res.outputs["branch 'Rough' flow"], res.outputs["pressure drop"]
    # Quantiles map through monotone functions: the p-quantile of Q = C √Δp is C √(the
    # p-quantile of Δp), up to the interpolation between neighbouring draws (far below 1e-6).
    for p_q, p_dp in ((q.p5, dp.p5), (q.p50, dp.p50), (q.p95, dp.p95)):
        assert p_q == pytest.approx(c * math.sqrt(p_dp), rel=1e-6)
    # Against the exact distribution: Δp is uniform on [Δp0 − a, Δp0 + a] (rectangular, GUM
    # 4.3.7), so its P5/P95 are Δp0 ∓ 0.9 a. The sample quantile's standard error is
    # √(p(1−p)/N)/pdf = 2a √(0.0475/N); allow 4 of them, mapped through dQ/dΔp = C/(2√Δp).
    dp0 = given.value
    for got, exact_dp in ((q.p5, dp0 - 0.9 * a), (q.p95, dp0 + 0.9 * a)):
        se = 2 * a * math.sqrt(0.05 * 0.95 / n) * c / (2 * math.sqrt(exact_dp))
        assert abs(got - c * math.sqrt(exact_dp)) <= 4 * se
    # GUM linear: u(Q) = dQ/dΔp · a/√3 = C/(2√Δp0) · a/√3 (JCGM 100:2008, 4.3.7 and 5.1.2).
    assert q.linear_sigma == pytest.approx(c / (2 * math.sqrt(dp0)) * a / math.sqrt(3), rel=1e-6)
    assert res.ranking["branch 'Rough' flow"] == [("pressure gauge", pytest.approx(1.0))]


def test_ranking_shares_of_gauge_and_roughness_match_the_rough_pipe_law():
    # Fully rough: ln Q = ½ ln Δp − ½ ln f + const, and with x = 1/√f = −2 log10(ε/3.7D),
    # d ln f/d ln ε = 4/(ln 10 · x). So u²(ln Q) shares are (½ u(ln Δp))² against
    # (½ · 4/(ln10 x) · u(ln ε))², u = half-width/√3 in each (JCGM 100:2008, 4.3.7).
    net, given, c, f = fully_rough_branch()
    fields = {**NOTHING.__dict__, "gauge_percent": 1.0, "roughness_factor": (0.8, 1.25)}
    res = monte_carlo(net, given, None, Tolerances(**fields), samples=100, seed=0)
    x = 1 / math.sqrt(f)
    var_gauge = (0.5 * 0.01 / math.sqrt(3)) ** 2  # percent of the reading (no full scale given)
    var_rough = (0.5 * 4 / (math.log(10) * x) * math.log(1.25 / 0.8) / 2 / math.sqrt(3)) ** 2
    share = dict(res.ranking["branch 'Rough' flow"])
    assert share["branch 'Rough' roughness"] == pytest.approx(
        var_rough / (var_gauge + var_rough), rel=1e-4)
    assert share["pressure gauge"] == pytest.approx(var_gauge / (var_gauge + var_rough), rel=1e-4)
    assert any("percent of the reading" in note for note in res.notes)


def test_temperature_band_of_a_laminar_branch_follows_the_water_viscosity_of_iapws():
    # Hagen–Poiseuille with Δp fixed: Q ∝ Δp/μ, so Q at the temperature's P95 (T0 + 0.9 ΔT,
    # uniform) is Q0 μ(T0)/μ(T0 + 0.9 ΔT). ν and ρ come from IAPWS through Thermal (ln-linear),
    # whose curvature error at 1.8 K is about 5e-4; the quantile's sampling error is about 2e-4.
    iapws = pytest.importorskip("iapws")

    def water(t_k):
        w = iapws.IAPWS95(T=t_k, P=0.101325)
        return Fluid("water", w.rho, w.mu, "water")

    t0, dt = 293.15, 2.0
    w0 = water(t0)
    net = Network(w0, (branch("Capillary", 0.004, 2.0, 0.0),), friction="laminar")
    tol = Tolerances(**{**NOTHING.__dict__, "temperature_k": dt})
    res = monte_carlo(net, PressureDrop(2e3), None, tol, samples=10_000, seed=5,
                      thermal=Thermal.from_fluid_at(water, t0))
    q = res.outputs["branch 'Capillary' flow"]
    assert q.p95 / q.nominal == pytest.approx(w0.viscosity / water(t0 + 0.9 * dt).viscosity,
                                              rel=2e-3)
    assert q.p5 / q.nominal == pytest.approx(w0.viscosity / water(t0 - 0.9 * dt).viscosity,
                                             rel=2e-3)


def test_thermal_slopes_are_exact_for_an_exponential_viscosity():
    # Central differences of ln ν are exact when ln ν is linear in T (Andrade form).
    def fluid_at(t_k):
        return Fluid("oil", 880.0 * (1 - 7e-4 * (t_k - 300)), 0.05 * math.exp(-0.03 * (t_k - 300)))

    th = Thermal.from_fluid_at(fluid_at, 300.0)
    rho_slope = (math.log(1 - 7e-4 * 0.5) - math.log(1 + 7e-4 * 0.5)) / 1.0
    assert th.dln_rho_dt == pytest.approx(rho_slope, rel=1e-12)
    assert th.dln_nu_dt == pytest.approx(-0.03 - rho_slope, rel=1e-12)


@pytest.mark.parametrize("case", CASES)
def test_drawn_rows_agree_with_the_deterministic_solve(case):
    # The vectorised path must give what solve() (checked against `fluids` in tests/references)
    # gives for the same drawn network, in every direction.
    given, find = CASES[case]
    plan = build_plan(network(), given, find or FindFlows(), Tolerances(), WATER_NEAR_15C)
    # Seed 9 draws four rows that all have an answer in every case (with the default ±10 % on
    # the valves some seeds draw a length no pipe can have); a row without one is NaN there.
    z = np.random.default_rng(9).uniform(-1, 1, size=(4, len(plan.inputs)))
    values, converged = plan.evaluate(z)
    assert converged
    for i, row in enumerate(z):
        expected = plan.outputs_of(solve(*plan.network_for(row)))
        for name, value in expected.items():
            assert values[name][i] == pytest.approx(value, rel=1e-10, abs=1e-15), name


@pytest.mark.parametrize("case", CASES)
def test_bands_are_ordered_and_hold_the_deterministic_answer(case):
    given, find = CASES[case]
    res = monte_carlo(network(), given, find, samples=2000, seed=1, thermal=WATER_NEAR_15C)
    for name, b in res.outputs.items():
        assert b.p5 <= b.p50 <= b.p95, name
        assert b.p5 <= b.nominal <= b.p95, name
        assert b.linear_sigma > 0 and b.std > 0, name
        shares = [s for _, s in res.ranking[name]]
        assert shares == sorted(shares, reverse=True)
        assert sum(shares) == pytest.approx(1.0, rel=1e-12)


def test_seeded_runs_repeat_and_other_seeds_differ():
    args = (network(), TotalFlow(0.03), None, Tolerances())
    one = monte_carlo(*args, samples=500, seed=42).to_dict()
    assert one == monte_carlo(*args, samples=500, seed=42).to_dict()
    other = monte_carlo(*args, samples=500, seed=43).to_dict()
    assert other["outputs"]["total flow"]["p5"] != one["outputs"]["total flow"]["p5"]


def test_to_dict_is_json_with_the_documented_shape():
    res = monte_carlo(network(), PressureDrop(60e3), FindUnknown("length", "Coil 2", 0.006),
                      samples=300)
    data = json.loads(json.dumps(res.to_dict()))
    assert data["samples"] == 300
    found = data["outputs"]["branch 'Coil 2' length (found)"]
    assert {"p5", "p50", "p95", "linear_sigma"} <= set(found)
    top = data["ranking"]["branch 'Coil 2' length (found)"][0]
    assert isinstance(top[0], str) and 0 < top[1] <= 1
    assert "temperature tolerance not applied" in " ".join(data["notes"])


def test_draws_without_an_answer_are_counted_and_left_out():
    # A target flow near what the smooth pipe allows: in some draws even ε = 0 is too rough.
    net = network()
    smooth = solve(net.replace_branch(3, branch("Bypass", 0.0409, 8.0, 0.0, 9.0, 18.0)),
                   MeasuredFlow("Coil 1", 0.008))
    target = 0.985 * float(smooth.flows[3])
    res = monte_carlo(net, MeasuredFlow("Coil 1", 0.008),
                      FindUnknown("roughness", "Bypass", target), samples=2000)
    assert 0 < res.failed < 2000
    assert np.isnan(res.draws["branch 'Bypass' roughness (found)"]).sum() == res.failed
    assert any("no solution" in note for note in res.notes)
    assert res.outputs["branch 'Bypass' roughness (found)"].p5 > 0


@pytest.mark.parametrize(("fields", "path"), [
    ({"gauge_percent": -1}, "tolerances.gauge_accuracy"),
    ({"flow_meter_percent": 100}, "tolerances.flow_meter_accuracy"),
    ({"roughness_factor": (2, 1)}, "tolerances.roughness_factor"),
    ({"roughness_factor": (1, 400)}, "tolerances.roughness_factor"),
    ({"roughness_m": {"Nowhere": (1e-5, 1e-4)}}, 'tolerances.roughness_range."Nowhere"'),
    ({"gauge_full_scale": 0}, "tolerances.gauge_full_scale"),
])
def test_bad_tolerances_name_the_field(fields, path):
    with pytest.raises(InputError) as err:
        monte_carlo(network(), PressureDrop(60e3), tol=Tolerances(**fields), samples=100)
    assert err.value.field == path


def test_too_few_samples_is_an_input_error():
    with pytest.raises(InputError, match="uncertainty.samples"):
        monte_carlo(network(), PressureDrop(60e3), samples=5)


def test_valve_kv_tolerance_is_drawn_for_branches_with_a_valve_only():
    plan = build_plan(network(), PressureDrop(60e3), FindFlows(), Tolerances(), WATER_NEAR_15C)
    valves = [i for i in plan.inputs if i.kind == "valve Kv"]
    with_valve = [name for name, _, kv in BRANCHES if kv is not None]
    assert sorted(i.name for i in valves) == sorted(f"branch '{n}' valve Kv" for n in with_valve)
    # A Kv drawn 10 % high is that valve's Kv × 1.1 in the plain model (Kv's definition,
    # IEC 60534: the valve passes 10 % more at the same Δp).
    z = np.zeros(len(plan.inputs))
    z[plan.inputs.index(valves[0])] = 1.0
    net, _, _ = plan.network_for(z)
    b = next(i for i, (n, _, _) in enumerate(BRANCHES) if f"'{n}'" in valves[0].name)
    assert net.branches[b].valve_kv == pytest.approx(BRANCHES[b][2] * 1.1, rel=1e-12)


def test_a_target_drawn_as_a_meter_s_reading_is_said_and_a_design_figure_is_not_drawn():
    """A target flow is drawn with the flow meter's tolerance unless the site says it is a
    design figure (``target_flow_measured = false``); either way the band says which."""
    find = FindUnknown("diameter", "Coil 2", 0.006)
    read = build_plan(network(), PressureDrop(60e3), find, Tolerances(), WATER_NEAR_15C)
    assert [i.kind for i in read.inputs].count("target") == 1
    band = monte_carlo(network(), PressureDrop(60e3), find, Tolerances(), samples=50,
                       thermal=WATER_NEAR_15C)
    assert any("target flow of 'Coil 2' is drawn as a meter's reading (± 3 %)" in n
               and "target_flow_measured = false" in n for n in band.notes), band.notes
    design = Tolerances(target_flow_measured=False)
    assert "target" not in [i.kind for i in build_plan(network(), PressureDrop(60e3), find,
                                                        design, WATER_NEAR_15C).inputs]
    band = monte_carlo(network(), PressureDrop(60e3), find, design, samples=50,
                       thermal=WATER_NEAR_15C)
    assert not any("target flow" in n for n in band.notes), band.notes
    exact = Tolerances(flow_meter_percent=0)  # a reading, but nothing drawn: nothing said
    band = monte_carlo(network(), PressureDrop(60e3), find, exact, samples=50,
                       thermal=WATER_NEAR_15C)
    assert not any("target flow" in n for n in band.notes), band.notes
