"""A site's readings weighed together, end to end: site file in, reports and JSON out.

The demo header (our own) with the gauge's 10 psid, a total-flow meter and a clamp-on on
'AHU-3 coil'. The clamp-on is set 25 % high, far beyond its 3 % meter and the model's
uncertainty, so the test must name it (rule: the maximum normalised residual points at the
reading at fault, Narasimhan & Jordache 2000, 7.2); at what the demo solves to it must agree.
"""

from __future__ import annotations

import json

import pytest

from branchwise.core.errors import InputError
from branchwise.core.report import render
from branchwise.core.site.read import demo_text, parse_site
from branchwise.core.site.solve import solve_site


def _site(clamp_gpm: float | None, given: str = "pressure_drop", total: bool = True) -> str:
    text = demo_text().replace('friction = "colebrook"', 'friction = "colebrook"\n'
                               f'given = "{given}"' + ('\ntotal_flow = "620 gpm"' if total
                                                       else ""))
    if clamp_gpm is not None:
        text = text.replace('# measured_flow = "80 gpm"', f'measured_flow = "{clamp_gpm} gpm"')
    return text


def test_readings_that_agree_pass():
    plain = solve_site(parse_site(demo_text()))
    gpm = plain.result.branch("AHU-3 coil").flow / (231 * 0.0254**3 / 60)  # NIST SP 811
    rec = solve_site(parse_site(_site(round(gpm, 1)))).reconciliation
    assert rec is not None and rec.consistent and rec.suspect is None
    assert rec.degrees_of_freedom == 2 and "agree" in rec.verdict


def test_a_clamp_on_far_off_is_named():
    rec = solve_site(parse_site(_site(100))).reconciliation
    assert rec is not None and not rec.consistent
    assert rec.suspect is not None and rec.suspect.branch == "AHU-3 coil"
    assert rec.without_suspect is not None and rec.without_suspect[1] >= 0.05
    assert rec.verdict.startswith("The clamp-on on 'AHU-3 coil' disagrees with the other 2")


def test_given_all_solves_from_the_reconciled_head():
    weighed = solve_site(parse_site(_site(100, given="all")))
    rec = weighed.reconciliation
    assert rec is not None
    assert weighed.result.pressure_drop == pytest.approx(rec.pressure_drop_pa, rel=1e-12)
    assert weighed.result.total_flow == pytest.approx(rec.total_flow_m3_s, rel=1e-9)
    doc = json.loads(render(weighed, "json"))
    assert doc["given"]["quantity"] == "all"
    assert doc["reconciliation"]["suspect"]["branch"] == "AHU-3 coil"
    assert len(doc["reconciliation"]["readings"]) == 3
    table = render(weighed, "table", "us")
    assert "Readings weighed together" in table and "all 3 readings weighed" in table


def test_one_reading_is_said_to_have_nothing_to_weigh():
    one = solve_site(parse_site(demo_text()))
    assert one.reconciliation is None
    assert json.loads(render(one, "json"))["reconciliation"] is None
    assert "One reading only: nothing to weigh it against" in render(one, "table")
    with pytest.raises(InputError) as caught:
        solve_site(parse_site(_site(None, given="all", total=False)))
    assert caught.value.field == "conditions.given"


def test_a_reading_with_no_spread_is_named_and_does_not_stop_the_answer():
    """A gauge reading of 0 with no full scale given has a tolerance of zero (a share of the
    reading): it cannot be weighed. Beside another given the answer stands and a note says
    why the readings were not weighed; with given = "all" the reading itself is named."""
    text = _site(77, total=False).replace('pressure_drop = "10 psid"', 'pressure_drop = "0 psid"')
    text = text.replace('gauge_full_scale', '# gauge_full_scale')
    beside = solve_site(parse_site(text.replace('given = "pressure_drop"',
                                                'given = "AHU-3 coil"')))
    assert beside.reconciliation is None
    assert any("not weighed" in n and "conditions.pressure_drop" in n for n in beside.notes)
    assert beside.unweighed in beside.notes and "conditions.pressure_drop" in beside.unweighed
    assert one_reading_is_weighed_by_nothing(text)
    with pytest.raises(InputError) as caught:
        solve_site(parse_site(text.replace('given = "pressure_drop"', 'given = "all"')))
    assert caught.value.field == "conditions.pressure_drop"


def test_the_band_of_all_readings_weighed_draws_the_weighing_not_the_gauge():
    # Three readings weighed: the reconciled head is known better than from the gauge alone
    # (the WLS variance (Jᵀ V⁻¹ J)⁻¹ is at most any single reading's, Narasimhan & Jordache
    # 2000, ch. 3), and the band draws that spread under its own name.
    from branchwise.core.site.solve import with_uncertainty

    plain = solve_site(parse_site(demo_text()))
    gpm = plain.result.branch("AHU-3 coil").flow / (231 * 0.0254**3 / 60)  # NIST SP 811
    sr = with_uncertainty(solve_site(parse_site(_site(round(gpm, 1), given="all"))), 200)
    rec, band = sr.reconciliation, sr.uncertainty
    assert rec is not None and band is not None
    gauge = next(f for f in rec.readings if f.reading == "pressure_drop")
    assert rec.pressure_drop_sigma_pa < gauge.sigma_si
    dp = band.outputs["pressure drop"]
    assert dp.linear_sigma == pytest.approx(rec.pressure_drop_sigma_pa, rel=1e-6)
    names = [i.name for i in band.inputs]
    assert "readings weighed together" in names and "pressure gauge" not in names
    assert not any("disagree" in n for n in band.notes)


def one_reading_is_weighed_by_nothing(text: str) -> bool:
    """A site whose readings could be weighed (or that has one) says nothing unweighed."""
    fine = solve_site(parse_site(text.replace('pressure_drop = "0 psid"',
                                              'pressure_drop = "10 psid"')
                                 .replace('given = "pressure_drop"', 'given = "AHU-3 coil"')))
    return fine.unweighed == "" and solve_site(parse_site(demo_text())).unweighed == ""


def test_each_readings_sigma_says_which_spread_it_is():
    # The σ shown is the reading's spread before the weighing; the normalised residual divides
    # by the residual's own, smaller, spread after it: a reader divided the one by the other.
    table = render(solve_site(parse_site(_site(90))), "table")
    line = next(x for x in table.splitlines() if "clamp-on on 'AHU-3 coil': read" in x)
    assert "before" in line or "before weighing" in table
    assert "after weighing" in table
