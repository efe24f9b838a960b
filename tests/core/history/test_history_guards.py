"""A site's history at the site's own inputs, and the figures a trend cannot take.

References: a direct ``branchwise solve`` of the same conditions (the command line, its JSON),
sums by hand, the ``fluids`` library's Colebrook with the ``iapws`` water, psi and gpm from
their definitions; what a zero, reversed or near-zero reading means is common practice."""

from __future__ import annotations

import json
import math
import re

import pytest
from site_texts import demo_with

from branchwise.core.errors import InputError
from branchwise.core.history import history_of
from branchwise.core.site.read import demo_text, parse_site
from branchwise.tui.cli import main

G = 9.80665  # standard gravity, m/s² (ISO 80000-3)
INCH, FOOT = 0.0254, 0.3048  # m, by definition
GPM = 231 * INCH**3 / 60  # m³/s: the US gallon is 231 in³, by definition
PSI = 0.45359237 * G / INCH**2  # Pa, by definition

VISIT_1 = ('pressure_drop = "10.3 psid"\ntotal_flow = "628 gpm"             # the plant\'s '
           'flow meter on the common supply\ngiven = "pressure_drop"')
FIRST_CLAMP_ONS = 'measured = { "AHU-1 coil" = "335 gpm", "AHU-3 coil" = "77 gpm" }'
SECOND_CLAMP_ONS = 'measured = { "AHU-1 coil" = "332 gpm", "AHU-3 coil" = "63 gpm" }'


def _factor(low: float, high: float) -> tuple[str, str]:
    return "roughness_factor = [0.5, 3]", f"roughness_factor = [{low}, {high}]"


def _solve_json(tmp_path, text: str, capsys) -> dict:
    """A direct ``branchwise solve`` of ``text``, its JSON."""
    path = tmp_path / "solve.toml"
    path.write_text(text, encoding="utf-8")
    capsys.readouterr()
    assert main(["solve", str(path), "--format", "json"]) == 0
    return json.loads(capsys.readouterr().out)


# ---- 1. the nominal values are the site's own -------------------------------------------

@pytest.mark.parametrize("factor", [(1, 1), (1, 10), (0.5, 3), (0.2, 1.5)],
                         ids=["1-1", "1-10", "demo-0.5-3", "0.2-1.5"])
def test_today_s_flows_are_the_solve_s_whatever_the_roughness_tolerance(tmp_path, capsys,
                                                                       factor):
    """Reference: ``branchwise solve`` of the same site (its JSON flows), to 1e-9; and the
    branch flows add up, by hand, to the visit's total flow."""
    text = demo_with(_factor(*factor))
    solved = {b["name"]: b["flow_m3_s"] for b in _solve_json(tmp_path, text, capsys)["branches"]}
    history = history_of(parse_site(text))
    today = history.visits[-1]
    assert today.today
    for b in today.solved.branches:
        assert b.flow.value == pytest.approx(solved[b.name], rel=1e-9), b.name
    doc = history.to_json()["visits"][-1]
    assert sum(b["flow_m3_s"] for b in doc["branches"]) == pytest.approx(
        doc["total_flow_m3_s"], rel=1e-9)
    for v in history.visits:  # every visit's solved flows make its total
        total = v.solved.solved.result.total_flow
        assert sum(b.solved_flow.value for b in v.solved.branches) == pytest.approx(total,
                                                                                   rel=1e-9)


def _total_flow_visit(factor: tuple[float, float] = (0.5, 3)) -> str:
    return demo_with((VISIT_1, 'total_flow = "628 gpm"\ngiven = "total_flow"'), _factor(*factor))


def _without_ahu_3_at(flow_gpm: float) -> str:
    """The demo's other three branches at 43 °F carrying ``flow_gpm``: the head at which
    they carry what the AHU-3 coil's clamp-on does not."""
    text = demo_text().split("# Earlier visits")[0]
    text = re.sub(r'\[\[branches\]\]\nname = "AHU-3 coil".*?(?=\[\[branches\]\])', "", text,
                  flags=re.S)
    assert "AHU-3" not in text.split("[[branches]]", 1)[1].split("[tolerances]")[0]
    return (text.replace('pressure_drop = "10 psid"', f'total_flow = "{flow_gpm} gpm"')
            .replace('temperature = "44 degF"', 'temperature = "43 degF"'))


@pytest.mark.parametrize("factor", [(0.5, 3), (1, 10)], ids=["demo", "1-10"])
def test_a_head_from_the_total_flow_meter_is_at_the_site_s_roughness(tmp_path, capsys, factor):
    """The AHU-3 coil's measured R when the head comes from the plant's meter: the head at
    which the other branches carry 628 − 77 gpm, from ``branchwise solve`` of those three
    branches alone, over (77 gpm)²; the same for any roughness tolerance."""
    ref = _solve_json(tmp_path, _without_ahu_3_at(628 - 77), capsys)
    hand = ref["driving_head_m"] / (77 * GPM) ** 2
    history = history_of(parse_site(_total_flow_visit(factor)))
    ahu3 = next(b for b in history.visits[0].solved.branches if b.name == "AHU-3 coil")
    assert ahu3.resistance.measured
    assert ahu3.resistance.value == pytest.approx(hand, rel=1e-9)


def test_the_effective_roughness_from_the_meter_s_head_fed_back_through_fluids(tmp_path,
                                                                            capsys):
    """The AHU-3 coil at 77 gpm with the effective roughness found: Darcy–Weisbach with
    ``fluids.friction.Colebrook``, K·V²/2g and the valve (Cv 48: 1 US gpm at 1 psi; head
    (Q/Cv)² psi over ρg) give the head of ``branchwise solve`` of the other branches."""
    from fluids.friction import Colebrook
    from iapws import IAPWS97

    head = _solve_json(tmp_path, _without_ahu_3_at(628 - 77), capsys)["driving_head_m"]
    water = IAPWS97(T=(43 - 32) / 1.8 + 273.15, P=0.101325)  # IAPWS-IF97 at 1 atm
    history = history_of(parse_site(_total_flow_visit()))
    ahu3 = next(b for b in history.visits[0].solved.branches if b.name == "AHU-3 coil")
    eps = ahu3.effective_roughness.value
    d, length, k, cv, q = 2.067 * INCH, 120 * FOOT, 5.0, 48.0, 77 * GPM
    v = q / (math.pi * d**2 / 4)
    f = Colebrook(v * d / (water.mu / water.rho), eps / d)
    valve = (77 / cv) ** 2 * PSI * (water.rho / 1000) / (water.rho * G)
    # Δp = (ρ/ρ₀)(Q/Cv)² psi, ρ₀ = 1000 kg/m³ as IEC 60534-1 takes it for Kv and Cv alike.
    assert (f * length / d + k) * v**2 / (2 * G) + valve == pytest.approx(head, rel=1e-7)


# ---- 2, 5. a still line, a head near zero: not trended, a note, no absurd number ---------

def _numbers_are_sane(history) -> None:
    doc = history.to_json()
    for t in doc["trends"]:
        for key in ("change", "band"):
            for x in t[key].values():
                assert x is None or (math.isfinite(x) and abs(x) < 1e3), t
    for v in doc["visits"]:
        for b in v["branches"]:
            for u in b["relative_uncertainty"].values():
                assert u is None or 0 <= u <= 10, b


def test_a_clamp_on_reading_zero_at_the_first_visit_is_not_trended_and_said():
    text = demo_with((FIRST_CLAMP_ONS, FIRST_CLAMP_ONS.replace('"335 gpm"', '"0 gpm"')))
    history = history_of(parse_site(text))  # no ZeroDivisionError
    notes = history.visits[0].solved.notes
    assert any("2024-09-18" in n and "AHU-1 coil" in n and "no flow" in n for n in notes), notes
    for t in history.trends:
        assert all(p.visit != 0 for p in t.points if t.branch == "AHU-1 coil"), t
    _numbers_are_sane(history)


def test_a_clamp_on_reading_zero_at_the_last_visit_is_no_minus_100_percent():
    text = demo_with((SECOND_CLAMP_ONS, SECOND_CLAMP_ONS.replace('"332 gpm"', '"0 gpm"')))
    history = history_of(parse_site(text))
    for t in history.trends:
        for c in (t.since_first, t.since_previous):
            assert c.value != -1 and not (c.flagged and c.band == 0), t
    notes = history.visits[1].solved.notes
    assert any("2025-01-15" in n and "AHU-1 coil" in n for n in notes), notes
    _numbers_are_sane(history)


@pytest.mark.parametrize("dp", ["0.0001 psid", "0.01 psid"], ids=["below-floor", "in-noise"])
def test_a_head_near_zero_gives_no_trend_and_no_absurd_number(dp):
    """0.0001 psi is 0.07 mm of water (under the floor); 0.01 psi on a 0-30 psid class 1
    gauge is 3 % of its ± 0.3 psi: R's uncertainty is thousands of percent (by hand:
    0.3/√3/0.01 ≈ 17)."""
    text = demo_with(('pressure_drop = "10.1 psid"', f'pressure_drop = "{dp}"'))
    history = history_of(parse_site(text))
    assert history.visits[1].solved.notes, "the visit says why it is not trended"
    for t in history.trends:
        if t.indicator == "resistance":
            assert all(p.visit != 1 for p in t.points), t
    _numbers_are_sane(history)


# ---- 3. a reversal ----------------------------------------------------------------------

def test_a_flow_that_reverses_is_said_in_words_not_as_a_percentage():
    text = demo_with((FIRST_CLAMP_ONS, FIRST_CLAMP_ONS.replace('"335 gpm"', '"-335 gpm"')))
    history = history_of(parse_site(text))
    ahu1 = {t.indicator: t for t in history.trends if t.branch == "AHU-1 coil"}
    for indicator in ("flow", "resistance"):
        change = ahu1[indicator].since_first
        assert change.reversed and change.flagged and change.words() == "reversed ⚑"
        assert math.isnan(change.value)
    messages = [m for m in history.messages() if m.startswith("AHU-1 coil")]
    assert messages and all("%" not in m for m in messages), messages
    assert any("flow reversed between 2024-09-18 and 2025-01-15" in m for m in messages)
    doc = next(t for t in history.to_json()["trends"]
               if t["branch"] == "AHU-1 coil" and t["indicator"] == "flow")
    assert doc["reversed"]["since_first"] and doc["change"]["since_first"] is None
    _numbers_are_sane(history)
    # the visit itself says why its R is negative (common practice: a line with no pump of its
    # own cannot flow against the head across the header)
    first, second = (v.solved.notes for v in history.visits[:2])
    assert any(n.startswith("AHU-1 coil: its clamp-on reads a flow against the way the "
                            "pressure drop drives the header: a meter mounted or set the other "
                            "way round? Its R is given with that sign") for n in first), first
    assert not any("against the way" in n for n in first if not n.startswith("AHU-1")), first
    assert not any("against the way" in n for n in second), second


def test_a_clamp_on_against_the_total_flow_is_said_and_not_worked_out():
    # The head from the plant's meter (+628 gpm) and AHU-1's clamp-on at -335 gpm: no state of
    # the line fits (common practice: a meter set the other way round), said once, plainly.
    visit = (VISIT_1, 'total_flow = "628 gpm"\ngiven = "total_flow"')
    text = demo_with(visit, (FIRST_CLAMP_ONS, FIRST_CLAMP_ONS.replace('"335 gpm"', '"-335 gpm"')))
    notes = history_of(parse_site(text)).visits[0].solved.notes
    ahu1 = [n for n in notes if n.startswith("AHU-1 coil")]
    assert ahu1 == ["AHU-1 coil: its clamp-on reads a flow against the way the total flow "
                    "drives the header: a meter mounted or set the other way round?"], notes


def test_two_clamp_ons_that_disagree_in_direction_each_name_the_other():
    # No gauge, no plant meter: each clamp-on's head comes from the other one, so either
    # meter may be the one set the other way round.
    visit = (VISIT_1, 'given = "AHU-3 coil"')
    text = demo_with(visit, (FIRST_CLAMP_ONS, FIRST_CLAMP_ONS.replace('"335 gpm"', '"-335 gpm"')))
    notes = history_of(parse_site(text)).visits[0].solved.notes
    for name, other in (("AHU-1 coil", "AHU-3 coil"), ("AHU-3 coil", "AHU-1 coil")):
        assert any(n.startswith(f"{name}: its clamp-on reads a flow against the way the "
                                f"measured flow in '{other}' drives the header: either "
                                "clamp-on mounted or set the other way round?")
                   for n in notes), notes


# ---- 4. a visit after today ---------------------------------------------------------------

def test_a_visit_dated_after_today_s_record_is_refused_naming_it():
    text = demo_with(('date = "2025-01-15"', 'date = "2026-01-01"'))
    with pytest.raises(InputError) as exc:
        history_of(parse_site(text))
    assert exc.value.field == "visits[1].date"
    assert "after today's record date (2025-03-12" in str(exc.value)


@pytest.mark.parametrize("record", ['date = "early March"', "# no date"],
                         ids=["free-text", "absent"])
def test_without_a_dated_record_a_late_visit_is_taken_in_date_order(record):
    text = demo_with(('date = "2025-01-15"', 'date = "2026-01-01"'),
                 ('date = "2025-03-12" ', record + " "))
    history = history_of(parse_site(text))
    assert [v.field for v in history.visits] == ["visits[0]", "visits[1]", "conditions"]


@pytest.mark.parametrize("record", ['date = "early March"', "# no date"],
                         ids=["free-text", "absent"])
def test_without_a_dated_record_a_visit_in_the_future_is_refused(record):
    """No record date to compare with: the calendar's today is (a visit in 2099 is a typo)."""
    text = demo_with(('date = "2025-01-15"', 'date = "2099-01-15"'),
                 ('date = "2025-03-12" ', record + " "))
    with pytest.raises(InputError) as exc:
        history_of(parse_site(text))
    assert exc.value.field == "visits[1].date" and "is after today" in exc.value.reason


def test_no_figure_trended_is_not_called_too_few_visits():
    """Two visits whose header heads are zero: no figure can be trended, and the report says
    that, not "a trend needs two visits" (and claims no change within a band)."""
    from branchwise.core.report.history_report import to_markdown, to_text

    text = demo_text().replace('pressure_drop = "10 psid"', 'pressure_drop = "0 psid"')
    text = text.replace('pressure_drop = "10.3 psid"', 'pressure_drop = "0 psid"').replace(
        'pressure_drop = "10.1 psid"', 'pressure_drop = "0 psid"')
    h = history_of(parse_site(text))
    assert not h.trends
    for out in (" ".join(to_text(h, "si").split()), to_markdown(h, "si")):
        assert "needs two visits" not in out and "every change lies within its band" not in out
        assert "no figure could be trended" in out
