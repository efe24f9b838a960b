"""The header's own total-flow meter weighed by its own accuracy
(``tolerances.total_flow_meter_accuracy``), the branches' clamp-ons by ``flow_meter_accuracy``.

References: GUM (JCGM 100:2008) 4.3.7 — a ± a bound with nothing more known is rectangular,
u = a/√3 — and 5.1.2: independent contributions add in quadrature, so a reading's spread is
its instrument's and the model's together, and only the instrument's part follows its meter.
A full-bore magnetic meter of ±0.5 % of reading is common practice (from memory); a clamp-on
ultrasonic meter ±2–5 % (field notes).
"""

from __future__ import annotations

import math
import sys
from pathlib import Path

import pytest

from branchwise.core.errors import InputError
from branchwise.core.model import FindFlows, TotalFlow
from branchwise.core.numerics.reconcile_result import ReadingFit
from branchwise.core.numerics.sampling import build_plan
from branchwise.core.site.build import build
from branchwise.core.site.read import parse_site
from branchwise.core.site.solve import solve_site, uncertainty_for_site
from branchwise.core.site.write import dump_site

sys.path.insert(0, str(Path(__file__).parent))
from test_reconcile_site import _site  # noqa: E402  (the demo with three readings)


def _with(accuracy: str | None, clamp_gpm: float = 90) -> str:
    text = _site(clamp_gpm)
    if accuracy is None:
        return text
    return text.replace('flow_meter_accuracy = "3 %"',
                        f'flow_meter_accuracy = "3 %"\ntotal_flow_meter_accuracy = "{accuracy}"')


def _fits(accuracy: str | None) -> dict[str, ReadingFit]:
    # readings that agree (77 gpm on the clamp-on): the model's part, taken at the weighed
    # state, then hardly moves with the meter
    rec = solve_site(parse_site(_with(accuracy, 77))).reconciliation
    assert rec is not None
    return {f.reading: f for f in rec.readings}


def test_absent_it_is_the_flow_meters_accuracy():
    tol = build(parse_site(_with(None))).tolerances
    assert tol is not None and tol.total_flow_meter_percent is None
    assert tol.total_flow_percent == tol.flow_meter_percent == 3.0
    assert tol.total_flow_percent == build(parse_site(_with("3 %"))).tolerances.total_flow_percent


def test_the_total_reading_is_weighed_by_its_own_meter_and_the_clamp_on_by_its_own():
    loose, tight = _fits(None), _fits("0.5 %")
    q = loose["total_flow"].measured_si
    # Only the instrument's part of the total's spread changes: σ² falls by
    # (a₃² − a₀.₅²)/3 with a the ± bound in m³/s (GUM 4.3.7 and 5.1.2).
    drop = ((0.03 * q) ** 2 - (0.005 * q) ** 2) / 3
    assert tight["total_flow"].sigma_si ** 2 == pytest.approx(
        loose["total_flow"].sigma_si ** 2 - drop, rel=1e-3)
    # The clamp-on keeps its 3 %: its spread is its own meter's and the model's as before.
    assert tight["measured_flow"].sigma_si == pytest.approx(loose["measured_flow"].sigma_si,
                                                            rel=1e-3)
    # A better meter is moved less by the weighing.
    moved = {k: abs(f["total_flow"].reconciled_si - q) for k, f in (("3", loose),
                                                                   ("0.5", tight))}
    assert moved["0.5"] < moved["3"]


def test_a_band_from_the_total_flow_draws_the_total_meter():
    site = parse_site(_with("0.5 %").replace('given = "pressure_drop"', 'given = "total_flow"'))
    built = build(site)
    assert isinstance(built.given, TotalFlow) and built.tolerances is not None
    plan = build_plan(built.network, built.given, FindFlows(), built.tolerances, None)
    meter = [i for i in plan.inputs if i.name == "flow meter (total flow)"]
    assert len(meter) == 1 and meter[0].half_width == pytest.approx(0.005, rel=1e-12)


@pytest.mark.parametrize(("typed", "reason"), [("0.5", "percent sign"),
                                               ("100 %", "below 100"),
                                               ("-1 %", "not below zero")])
def test_a_bad_total_meter_accuracy_names_its_field(typed, reason):
    with pytest.raises(InputError) as caught:
        build(parse_site(_with(typed)))
    assert caught.value.field == "tolerances.total_flow_meter_accuracy"
    assert reason in caught.value.reason


def test_it_survives_a_round_trip():
    site = parse_site(_with("0.5 %"))
    assert site.tolerances is not None and site.tolerances.total_flow_meter_accuracy == "0.5 %"
    again = parse_site(dump_site(site))
    assert again.tolerances is not None
    assert again.tolerances.total_flow_meter_accuracy == "0.5 %"
    assert math.isclose(build(again).tolerances.total_flow_percent, 0.5)


BAND_SITE = """format = 1
name = "Two lines off a header with its own meter"
[fluid]
kind = "water"
temperature = "20 degC"
[conditions]
total_flow = "30 L/s"
[[branches]]
name = "A"
diameter = "100 mm"
length = "40 m"
roughness = "0.045 mm"
[[branches]]
name = "B"
diameter = "80 mm"
length = "30 m"
roughness = "0.045 mm"
[tolerances]
flow_meter_accuracy = "3 %"
{total}roughness_factor = [1, 1]
diameter = "0 %"
length = "0 %"
fitting_k = "0 %"
valve_kv = "0 %"
temperature = "0 K"
"""


@pytest.mark.parametrize(("line", "a"), [('total_flow_meter_accuracy = "0.5 %"\n', 0.005),
                                         ("", 0.03)], ids=["own meter", "as the clamp-ons"])
def test_the_total_flows_band_is_its_meters_rectangle(line, a):
    # Only the total-flow reading is uncertain: the total drawn is the reading, uniform on
    # Q (1 ± a), whose P5 and P95 are Q (1 ∓ 0.9 a) (GUM 4.3.7: rectangular). Quantile
    # sampling sd ≈ √(0.05·0.95/4000) · 2a: 4 sd allowed.
    res = uncertainty_for_site(parse_site(BAND_SITE.format(total=line)), samples=4000, seed=7)
    q = res.outputs["total flow"]
    assert q.nominal == pytest.approx(0.030, rel=1e-12)
    allowed = 4 * math.sqrt(0.05 * 0.95 / 4000) * 2 * a
    assert q.p95 / q.nominal == pytest.approx(1 + 0.9 * a, abs=allowed)
    assert q.p5 / q.nominal == pytest.approx(1 - 0.9 * a, abs=allowed)
    assert res.ranking["total flow"] == [("flow meter (total flow)", pytest.approx(1.0))]
