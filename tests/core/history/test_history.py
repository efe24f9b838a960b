"""A site's history checked against outside references: R = h/Q² by hand from the gauge, the
IAPWS-IF97 density (the ``iapws`` package) and the units' definitions; the effective roughness
fed back through the ``fluids`` library's Colebrook reproduces the clamp-on; the band of a
change by hand from the GUM and scipy's normal quantile, and its coverage by simulating the
instruments' stated distributions."""

from __future__ import annotations

import math
import re
from pathlib import Path

import numpy as np
import pytest

from branchwise.core.errors import InputError
from branchwise.core.history import history_of
from branchwise.core.history.trends import K90
from branchwise.core.site.read import demo_site, parse_site

G = 9.80665  # standard gravity, m/s² (ISO 80000-3)
PSI = 0.45359237 * G / 0.0254**2  # Pa: the pound-force per square inch, by definition
GPM = 231 * 0.0254**3 / 60  # m³/s: the US gallon is 231 in³, by definition

SITE = """format = 1
name = "Cooling header"

[fluid]
kind = "water"
temperature = "18 degC"

[conditions]
pressure_drop = "68 kPa"

[[branches]]
name = "Condenser A"
diameter = "102.26 mm"
length = "64 m"
roughness = "0.045 mm"
minor_k = 6.2
valve_kv = 120

[[branches]]
name = "Jacket loop"
diameter = "77.93 mm"
length = "55 m"
roughness = "0.045 mm"
minor_k = 4

[tolerances]
gauge_accuracy = "1 %"
gauge_full_scale = "200 kPa"
flow_meter_accuracy = "3 %"

[[visits]]
date = "2024-11-05"
pressure_drop = "68 kPa"
measured = { "Condenser A" = "17.2 L/s" }
given = "pressure_drop"

[[visits]]
date = "2025-02-10"
pressure_drop = "70 kPa"
measured = { "Condenser A" = "15.0 L/s" }
given = "pressure_drop"
"""
"""Our own invented header: Condenser A's clamp-on falls from 17.2 to 15.0 L/s."""


def _rho(t_k: float) -> float:
    from iapws import IAPWS97

    return float(IAPWS97(T=t_k, P=0.101325).rho)  # IAPWS-IF97 region 1, 1 atm


@pytest.fixture(scope="module")
def cooling():
    return history_of(parse_site(SITE))


def test_resistance_is_head_over_flow_squared_by_hand(cooling):
    """R = h/Q², h = Δp/(ρ g) with ρ from the ``iapws`` package (IAPWS-IF97), Q as read."""
    rho = _rho(291.15)
    for visit, dp, q in ((0, 68e3, 17.2e-3), (1, 70e3, 15.0e-3)):
        branch = cooling.visits[visit].solved.branches[0]
        assert branch.resistance.measured
        assert branch.resistance.value == pytest.approx(dp / (rho * G) / q**2, rel=1e-9)
        assert branch.flow.value == pytest.approx(q, rel=1e-12)


def test_the_demo_resistance_by_hand_in_us_units():
    """The demo's AHU-3 clamp-on at 10.3 psid and 43 °F: psi and gpm from their definitions,
    ρ from ``iapws``."""
    history = history_of(demo_site())
    first = history.visits[0]
    ahu3 = next(b for b in first.solved.branches if b.name == "AHU-3 coil")
    rho = _rho((43 - 32) / 1.8 + 273.15)
    hand = 10.3 * PSI / (rho * G) / (77 * GPM) ** 2
    assert ahu3.resistance.value == pytest.approx(hand, rel=1e-9)


def test_a_solved_branch_has_the_model_s_resistance_at_that_head(cooling):
    visit = cooling.visits[0]
    result = visit.solved.solved.result
    jacket = visit.solved.branches[1]
    assert not jacket.resistance.measured and jacket.effective_roughness is None
    assert jacket.resistance.value == pytest.approx(
        result.driving_head / float(result.flows[1]) ** 2, rel=1e-9)


def test_the_effective_roughness_fed_back_reproduces_the_reading(cooling):
    """Head through Condenser A at its clamp-on flow with the roughness found, by hand:
    Darcy–Weisbach with ``fluids.friction.Colebrook``, K·V²/2g, and the valve by IEC 60534
    (Q[m³/h] = Kv √(Δp[bar]/(ρ/1000))); ν from ``iapws``. It equals the gauge's head."""
    from fluids.friction import Colebrook
    from iapws import IAPWS97

    water = IAPWS97(T=291.15, P=0.101325)
    nu = water.mu / water.rho
    d, length, k, kv = 0.10226, 64.0, 6.2, 120.0
    for visit, dp, q in ((0, 68e3, 17.2e-3), (1, 70e3, 15.0e-3)):
        eps = cooling.visits[visit].solved.branches[0].effective_roughness.value
        v = q / (math.pi * d**2 / 4)
        f = Colebrook(v * d / nu, eps / d)
        valve = (q * 3600 / kv) ** 2 * 1e5 / (1000 * G)
        head = (f * length / d + k) * v**2 / (2 * G) + valve
        assert head == pytest.approx(dp / (water.rho * G), rel=1e-7)


def test_the_band_of_a_change_by_hand(cooling):
    """Measured R from the gauge and the clamp-on: per visit u²(R)/R² = (u_gauge/Δp)² +
    (2 u_meter)² + (d ln ρ/dT · u_T)², u = a/√3 for each ± bound (GUM, JCGM 100:2008, 4.3.7);
    the two visits independent; the band ±z₀.₉₅ (scipy's normal quantile) times (1 + change)."""
    from scipy.stats import norm

    assert norm.ppf(0.95) == pytest.approx(K90, rel=1e-12)
    drho = (math.log(_rho(292.15)) - math.log(_rho(290.15))) / 2  # per K
    u_gauge, u_meter, u_t = 0.01 * 200e3 / math.sqrt(3), 0.03 / math.sqrt(3), 2 / math.sqrt(3)
    var = sum((u_gauge / dp) ** 2 + (2 * u_meter) ** 2 + (drho * u_t) ** 2
              for dp in (68e3, 70e3))
    trend = next(t for t in cooling.trends if t.indicator == "resistance")
    change = (70 / 68) * (17.2 / 15.0) ** 2 - 1
    assert trend.since_first.value == pytest.approx(change, rel=1e-9)
    assert trend.since_first.band == pytest.approx(norm.ppf(0.95) * (1 + change)
                                                   * math.sqrt(var), rel=1e-4)
    assert trend.flagged and trend.basis == "measured"


def test_the_band_covers_ninety_percent_of_simulated_visits_of_an_unchanged_line():
    """Draw the gauge and the clamp-on of two visits from their stated rectangular
    distributions around one true state; the change stays inside its band about 90 % of the
    time (the band's sum of rectangles is near normal: common practice; exact coverage of a
    triangular distribution at ±1.645σ is 89.2 %)."""
    site = parse_site(SITE.replace('"15.0 L/s"', '"17.2 L/s"').replace('"70 kPa"', '"68 kPa"'))
    trend = next(t for t in history_of(site).trends if t.indicator == "resistance")
    band = trend.since_first.band
    rng = np.random.default_rng(7)
    n = 20_000
    a_gauge, a_meter = 0.01 * 200e3, 0.03

    def r(size: int) -> np.ndarray:
        dp = 68e3 + rng.uniform(-a_gauge, a_gauge, size)
        q = 17.2e-3 * (1 + rng.uniform(-a_meter, a_meter, size))
        return dp / q**2

    outside = np.abs(r(n) / r(n) - 1) > band
    assert 0.08 < outside.mean() < 0.13, outside.mean()
    print(f"outside the band: {outside.mean():.3%}")


def test_the_demo_flags_the_ahu_3_coil_and_nothing_else():
    history = history_of(demo_site())
    assert [v.label for v in history.visits] == ["2024-09-18", "2025-01-15", "2025-03-12"]
    flagged = {(t.branch, t.indicator) for t in history.flagged}
    assert flagged == {("AHU-3 coil", "resistance"), ("AHU-3 coil", "flow")}
    messages = history.messages()
    assert any(m.startswith("AHU-3 coil: resistance +46 % from 2024-09-18 to 2025-01-15 "
                            "(band ± ") and m.endswith("fouling, a valve moved, or a strainer "
                                                       "filling") for m in messages), messages
    # A second reading of the same day is weighed: the fouled coil's clamp-on is named.
    rec = history.visits[1].solved.solved.reconciliation
    assert rec is not None and rec.suspect is not None and rec.suspect.branch == "AHU-3 coil"


def test_only_like_is_compared_with_like():
    """A branch measured at two visits is trended over those; solved values of today do not
    enter its trend, and a solved resistance is not trended at all."""
    history = history_of(demo_site())
    ahu3 = [t for t in history.trends if t.branch == "AHU-3 coil"]
    assert {t.basis for t in ahu3} == {"measured"}
    assert all(t.last.date == "2025-01-15" and not t.latest for t in ahu3)
    ahu2 = [t for t in history.trends if t.branch == "AHU-2 coil"]
    assert [(t.indicator, t.basis) for t in ahu2] == [("flow", "solved")]


@pytest.mark.parametrize(("old", "new", "field"), [
    ('"Condenser A" = "17.2 L/s"', '"Condenser B" = "17.2 L/s"',
     'visits[0].measured."Condenser B"'),
    ('"Condenser A" = "17.2 L/s"', '"Condenser A" = "17.2 L/ss"',
     'visits[0].measured."Condenser A"'),
    ('pressure_drop = "68 kPa"\nmeasured', 'pressure_drop = "68 kPaa"\nmeasured',
     "visits[0].pressure_drop"),
    ('given = "pressure_drop"\n\n[[visits]]', 'given = "Jacket loop"\n\n[[visits]]',
     "visits[0].given"),
    ('date = "2024-11-05"', 'date = "2024-11-05"\ntemperature = "120 degC"',
     "visits[0].temperature"),
])
def test_bad_visit_data_names_the_visit_s_field(old, new, field):
    text = SITE.replace(old, new, 1)
    assert text != SITE
    with pytest.raises(InputError) as exc:
        history_of(parse_site(text))
    assert exc.value.field == field


def test_a_site_with_nothing_to_look_back_on_says_so():
    site = parse_site(SITE.split("[[visits]]")[0])
    site.conditions.pressure_drop = None
    with pytest.raises(InputError) as exc:
        history_of(site)
    assert exc.value.field == "visits"


def test_visits_are_taken_in_date_order():
    first, second = SITE.split("[[visits]]")[1:]
    text = SITE.split("[[visits]]")[0] + "[[visits]]" + second + "\n[[visits]]" + first
    history = history_of(parse_site(text))
    assert [v.field for v in history.visits] == ["visits[1]", "visits[0]", "conditions"]


def test_a_trend_of_solved_flows_never_sets_a_clamp_on_against_a_solve():
    """Condenser A read once: its flow is trended as solved at every visit, the clamp-on's
    visit included (its solve from the gauge, not the meter's 17.2 L/s)."""
    text = SITE.replace('measured = { "Condenser A" = "15.0 L/s" }\n', "")
    history = history_of(parse_site(text))
    trend = next(t for t in history.trends if t.branch == "Condenser A" and
                 t.indicator == "flow")
    assert trend.basis == "solved" and len(trend.points) == 3
    first = history.visits[0].solved
    assert trend.first.indicator.value == pytest.approx(float(first.solved.result.flows[0]),
                                                        rel=1e-9)
    assert first.branches[0].flow.value == pytest.approx(17.2e-3)  # the visit shows the read
    assert not [t for t in history.trends if t.indicator == "resistance"]


def test_two_visits_of_one_date_are_said_so_not_from_a_day_to_itself():
    # The demo's middle visit moved to the first one's date: the change is between two visits
    # of that day (taken in the file's order), not "from 2024-09-18 to 2024-09-18".
    from branchwise.core.site.read import DEMO_PATH

    text = Path(DEMO_PATH).read_text(encoding="utf-8")
    assert text.count("2025-01-15") == 1
    messages = history_of(parse_site(text.replace("2025-01-15", "2024-09-18"))).messages()
    coil = [m for m in messages if m.startswith("AHU-3 coil: resistance +46 % ")]
    assert coil and "between two visits on 2024-09-18 (band ± " in coil[0], messages
    assert not any("from 2024-09-18 to 2024-09-18" in m or
                   "between 2024-09-18 and 2024-09-18" in m for m in messages)


def test_two_changes_from_visits_of_one_date_say_which_visit():
    # A second visit on the demo's first date (the AHU-3 coil read at 70 gpm): the changes
    # since the first and since the previous both start on 2024-09-18, with different
    # figures; each says which visit of that day it starts from.
    from branchwise.core.site.read import DEMO_PATH

    text = Path(DEMO_PATH).read_text(encoding="utf-8")
    second = ('[[visits]]\ndate = "2024-09-18"\npressure_drop = "10.2 psid"\n'
              'given = "pressure_drop"\nmeasured = { "AHU-3 coil" = "70 gpm" }\n\n')
    assert text.count('[[visits]]\ndate = "2025-01-15"') == 1
    text = text.replace('[[visits]]\ndate = "2025-01-15"',
                        second + '[[visits]]\ndate = "2025-01-15"')
    messages = [m for m in history_of(parse_site(text)).messages()
                if m.startswith("AHU-3 coil: resistance")]
    assert len(messages) == 2, messages
    assert "from 2024-09-18 (visit 1 of 2 that day) to 2025-01-15" in messages[0]
    assert "from 2024-09-18 (visit 2 of 2 that day) to 2025-01-15" in messages[1]


def test_a_visit_s_values_are_at_its_own_temperature_when_the_tolerance_is_cut():
    # The demo near freezing, ± 10 K: the band's temperature is drawn over 0 °C – 11 °C (cut
    # where water freezes), about its middle; the visit's flows and resistances are still
    # those of the solve at its own 1 °C, to round-off (they were worked out at 5.5 °C).
    from branchwise.core.site.read import DEMO_PATH
    from branchwise.core.site.solve import solve_site

    text = (Path(DEMO_PATH).read_text(encoding="utf-8")
            .replace('temperature = "2 K"', 'temperature = "10 K"'))
    text = re.sub(r'temperature = "4[345] degF"', 'temperature = "1 degC"', text)
    site = parse_site(text)
    today = history_of(site).visits[-1]
    flows = solve_site(site).result.flows
    for branch, q in zip(today.solved.branches, flows, strict=True):
        assert branch.flow.value == pytest.approx(float(q), rel=1e-12)


def test_a_trend_of_two_visits_shows_no_previous_visit_of_its_own():
    # The demo: the AHU-3 coil's clamp-on read at two visits. The previous visit is the
    # first: its cells say so instead of repeating the first's figure and change (which
    # read as two earlier visits, and as a change flagged twice).
    from branchwise.core.report.history_report import AS_FIRST, TREND_TITLES, trend_cells
    from branchwise.core.units import units_for

    history = history_of(demo_site())
    two = next(t for t in history.trends
               if t.branch == "AHU-3 coil" and t.indicator == "resistance")
    assert len(two.points) == 2
    cells = dict(zip(TREND_TITLES, trend_cells(two, units_for("si")), strict=True))
    assert cells["Previous"] == cells["Since previous"] == AS_FIRST
    assert cells["Since first"].endswith("⚑")
    three = next(t for t in history.trends if len(t.points) == 3)  # a solved flow, every visit
    cells = dict(zip(TREND_TITLES, trend_cells(three, units_for("si")), strict=True))
    assert AS_FIRST not in cells.values()


def test_what_the_bands_leave_out_is_said_at_each_visit():
    # The demo's gauge without its full scale: each visit's bands take the gauge's accuracy
    # as a percent of the reading (optimistic for a small reading on a big gauge), as
    # today's bands say; the history says it too, at each visit and in its reports.
    from branchwise.core.report.history_report import to_text
    from branchwise.core.site.read import DEMO_PATH

    text = Path(DEMO_PATH).read_text(encoding="utf-8")
    assert text.count('gauge_full_scale = "30 psid"') == 1
    said = "bands: pressure-gauge accuracy taken as a percent of the reading"
    assert not any(said in n for v in history_of(demo_site()).visits for n in v.solved.notes)
    history = history_of(parse_site(text.replace('gauge_full_scale = "30 psid"', "")))
    for v in history.visits:
        assert sum(said in n for n in v.solved.notes) == 1, v.solved.notes
    assert " ".join(to_text(history, "si").split()).count(f"Note: {said}") == 3
    # today's band alone speaks of its target flow (the history holds a clamp-on as its
    # target: a reading, as it is drawn)
    assert not any("target flow" in n for v in history.visits for n in v.solved.notes)


def test_the_history_does_not_call_its_changes_blind_to_aging_under_hazen_williams():
    # Under Hazen–Williams today's band leaves the lines' C undrawn and says so; in a
    # history C is the line's record, the same at every visit, and aging is what a trend
    # flags: that note is not repeated at its visits.
    from branchwise.core.numerics.sampling import CONDITION_NOT_DRAWN
    from branchwise.core.site.read import DEMO_PATH

    text = Path(DEMO_PATH).read_text(encoding="utf-8")
    assert text.count('friction = "colebrook"') == 1
    assert text.count('roughness = "0.0018 in"') == 1  # the AHU-3 coil: no material, no C
    text = text.replace('friction = "colebrook"', 'friction = "hazen-williams"').replace(
        'roughness = "0.0018 in"', 'roughness = "0.0018 in"\nhw_c = 120')
    history = history_of(parse_site(text))
    assert history.trends
    assert not any(CONDITION_NOT_DRAWN in n for v in history.visits for n in v.solved.notes)


def test_three_visits_of_one_date_say_which_two_a_change_is_between():
    # Every clamp-on visit on 2024-09-18 (the demo's second moved there, and a third with the
    # AHU-3 coil at 70 gpm): the changes since the first and since the previous are both of
    # that day, and each says between which of its visits.
    from branchwise.core.site.read import DEMO_PATH

    text = Path(DEMO_PATH).read_text(encoding="utf-8").replace("2025-01-15", "2024-09-18")
    third = ('\n[[visits]]\ndate = "2024-09-18"\npressure_drop = "10.2 psid"\n'
             'given = "pressure_drop"\nmeasured = { "AHU-3 coil" = "70 gpm" }\n')
    history = history_of(parse_site(text + third))
    coil = [m for m in history.messages() if m.startswith("AHU-3 coil: resistance")]
    assert any("between visits 1 and 3 of 2024-09-18" in m for m in coil), coil
    assert any("between visits 2 and 3 of 2024-09-18" in m for m in coil), coil
    assert not any("between two visits on" in m for m in coil), coil


def test_a_visit_of_a_day_of_several_is_headed_with_its_place():
    # The flags name "2024-09-18 (visit 2 of 2 that day)": the visit's own lines say the same.
    from branchwise.core.report.history_report import visit_lines
    from branchwise.core.site.read import DEMO_PATH
    from branchwise.core.units import units_for

    text = Path(DEMO_PATH).read_text(encoding="utf-8").replace("2025-01-15", "2024-09-18")
    history = history_of(parse_site(text))
    heads = [visit_lines(v, units_for("si"))[0] for v in history.visits]
    assert heads[0].startswith("2024-09-18 (visit 1 of 2 that day) · ")
    assert heads[1].startswith("2024-09-18 (visit 2 of 2 that day) · ")
    assert heads[2].startswith("2025-03-12 (today) · ")
    assert [v.date for v in history.visits][:2] == ["2024-09-18"] * 2  # the JSON's dates
    # the History screen's list of visits, in few words (it fits 80 columns)
    assert [v.short for v in history.visits] == [
        "2024-09-18 (1 of 2)", "2024-09-18 (2 of 2)", "2025-03-12 (today)"]
