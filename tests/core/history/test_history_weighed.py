"""Visits solved from all their readings weighed together: the bands of their indicators come
from that weighing, not from a gauge that may never have been read, and a visit whose readings
disagree says so.

References: the GUM (JCGM 100:2008) 4.3.7 — a ± a bound is rectangular, u = a/√3 — and
scipy's normal quantile for the 90 % band of a change between two independent visits,
± z₀.₉₅ √(u₁² + u₂²).
"""

from __future__ import annotations

import math

import pytest

from branchwise.core.history import history_of
from branchwise.core.site.read import parse_site

SITE = """format = 1
name = "Header with a plant meter and a clamp-on"

[fluid]
kind = "water"
temperature = "18 degC"

[conditions]
total_flow = "40 L/s"
given = "all"

[[branches]]
name = "Condenser A"
diameter = "102.26 mm"
length = "64 m"
roughness = "0.045 mm"
minor_k = 6.2
valve_kv = 120
measured_flow = "24.6 L/s"

[[branches]]
name = "Jacket loop"
diameter = "77.93 mm"
length = "55 m"
roughness = "0.045 mm"
minor_k = 4

[tolerances]
gauge_accuracy = "{gauge}"
flow_meter_accuracy = "3 %"

[[visits]]
date = "2025-02-10"
total_flow = "39 L/s"
measured = {{ "Condenser A" = "24.0 L/s" }}
given = "all"
"""
"""Our own invented header: no gauge is read on either day."""


def _visit_of_march(readings: str):
    """The history of SITE with a visit on 2025-03-01 holding ``readings`` (TOML lines), and
    that visit."""
    history = history_of(parse_site(SITE.format(gauge="1 %")
                                    + f'\n[[visits]]\ndate = "2025-03-01"\n{readings}\n'))
    return history, next(v for v in history.visits if v.date == "2025-03-01")


def _solved_flow_trend(gauge: str):
    history = history_of(parse_site(SITE.format(gauge=gauge)))
    return next(t for t in history.trends
                if t.branch == "Jacket loop" and t.indicator == "flow")


def test_a_gauge_never_read_does_not_set_the_band():
    # The band of a solved flow between two visits weighed from a meter and a clamp-on: the
    # gauge's accuracy (1 % or 20 %) must not move it; it was drawn on the weighed pressure
    # drop as if a gauge had read it.
    one, twenty = _solved_flow_trend("1 %"), _solved_flow_trend("20 %")
    assert one.since_first.band == pytest.approx(twenty.since_first.band, rel=1e-9)
    # At least the meters' own part: each visit's head rests on two 3 % meters weighed
    # together, at best u = (0.03/√3)/√2 of the flow (GUM 4.3.7; two equal readings), and two
    # visits' independent changes add: × √2. The model's part only widens it. (It was about
    # ±0.7 %.)
    from scipy.stats import norm

    per_visit = 0.03 / math.sqrt(3) / math.sqrt(2)
    floor = norm.ppf(0.95) * math.sqrt(2) * per_visit
    assert one.since_first.band >= floor, one.since_first.band
    # The model's part (roughness, bore, K… of the same lines) is shared by both visits and
    # cancels in the change: the band stays near the meters' own. Drawn as each day's own,
    # within the weighed head's whole σ, it was 2.4× that.
    assert one.since_first.band <= 1.5 * floor, one.since_first.band


def test_a_visit_whose_readings_disagree_says_its_bands_are_too_narrow():
    text = SITE.format(gauge="1 %").replace('measured = { "Condenser A" = "24.0 L/s" }',
                                            'measured = { "Condenser A" = "2.0 L/s" }')
    history = history_of(parse_site(text))
    old = next(v for v in history.visits if v.date == "2025-02-10")
    assert old.solved.solved.reconciliation is not None
    assert not old.solved.solved.reconciliation.consistent
    assert any("disagree" in n and "too narrow" in n for n in old.solved.notes)


def test_a_visit_with_a_clamp_on_reading_zero_is_solved_from_its_other_reading():
    # A line shut at a visit (0 L/s on its clamp-on) beside the gauge, no given written: the
    # zero has no spread to weigh by (a share of 0), so the visit is solved from the gauge and
    # the zero noted, not the whole history refused.
    _, shut = _visit_of_march('pressure_drop = "60 kPa"\nmeasured = { "Condenser A" = "0 L/s" }')
    sr = shut.solved.solved
    assert sr.result.pressure_drop == pytest.approx(60e3, rel=1e-12)  # from the gauge
    assert sr.reconciliation is None
    assert "cannot be weighed" in sr.unweighed  # said beside the answer
    assert any("reads no flow" in n for n in shut.solved.notes)


def test_a_shut_line_beside_a_total_flow_is_not_solved_from_that_total():
    # The model would share the total with the shut line: the other lines' solved flows would
    # be wrong (10.76 L/s for a line carrying all 25). Beside another clamp-on,
    # the visit is solved from that clamp-on's head; with only the total, it is refused naming
    # the zero reading.
    visit = '''
[[visits]]
date = "2025-03-01"
total_flow = "25 L/s"
measured = {{ "Condenser A" = "0 L/s"{other} }}
'''
    text = SITE.format(gauge="1 %") + visit.format(other=', "Jacket loop" = "25 L/s"')
    history = history_of(parse_site(text))
    shut = next(v for v in history.visits if v.date == "2025-03-01")
    jacket = shut.solved.solved.result.branch("Jacket loop")
    assert jacket.flow == pytest.approx(0.025, rel=1e-9)  # from its own clamp-on's head
    from branchwise.core.errors import InputError

    with pytest.raises(InputError) as caught:
        history_of(parse_site(SITE.format(gauge="1 %") + visit.format(other="")))
    assert caught.value.field == 'visits[1].measured."Condenser A"'


def test_a_tolerance_refused_for_one_visits_reading_names_that_visit():
    # A visit's gauge read past today's full scale: the whole history is refused, and the
    # message said nothing of which visit (the site's own solve passes).
    from branchwise.core.errors import InputError
    from branchwise.core.site.read import demo_text

    text = demo_text() + '\n[[visits]]\ndate = "2025-02-10"\npressure_drop = "35 psid"\n'
    with pytest.raises(InputError) as caught:
        history_of(parse_site(text))
    assert caught.value.field == "tolerances.gauge_full_scale"
    assert "at the visit of 2025-02-10 (visits[2])" in str(caught.value)


def test_a_visit_with_every_flow_reading_zero_is_a_header_off_not_a_refusal():
    # The whole header off that day (a total of 0, a clamp-on of 0): it refused the history.
    # A head of 0: the visit is noted and not trended (the guard of a head not above zero).
    _, off = _visit_of_march('total_flow = "0 L/s"\nmeasured = { "Condenser A" = "0 L/s" }')
    assert off.solved.solved.result.driving_head == 0
    from branchwise.core.messages import render

    notes = [render(n) for n in off.solved.notes]
    assert any("not clearly above zero" in n and "no figure" in n for n in notes), notes


def test_a_visits_own_temperature_is_said_in_the_text_too():
    # It was said only in the JSON (temperature_k); 50 °F = 10 °C (NIST SP 811, exact).
    from branchwise.core.report.history_report import visit_lines
    from branchwise.core.site.read import demo_text
    from branchwise.core.units import Units

    text = demo_text() + '\n[[visits]]\ndate = "2025-02-10"\npressure_drop = "10 psid"\n' \
        'temperature = "50 degF"\n'
    history = history_of(parse_site(text))
    visit = next(v for v in history.visits if v.date == "2025-02-10")
    lines = visit_lines(visit, Units("si"))
    assert any(line.startswith("Liquid that day:") and "10.0 °C" in line for line in lines), lines
    today = next(v for v in history.visits if v.today)
    assert not any(line.startswith("Liquid that day:") for line in visit_lines(today, Units("si")))
