"""Several readings in one site: which one the head is solved from, and the others compared.

The comparisons are checked against the solver itself run the other way round (a reading that
agrees with the solve must show a zero difference); the solver is checked against `fluids` in
tests/references.
"""

from __future__ import annotations

import pytest

from branchwise.core.errors import InputError
from branchwise.core.report.json_report import to_dict
from branchwise.core.site.read import demo_text, parse_site
from branchwise.core.site.readings import chosen, compare
from branchwise.core.site.solve import solve_site
from branchwise.core.site.write import dump_site

CLAMP_ON = ('# measured_flow = "80 gpm"', 'measured_flow = "80 gpm"')  # the demo's clamp-on


def site(given: str | None = None, measured: str = "80 gpm"):
    text = demo_text().replace(*CLAMP_ON).replace('"80 gpm"', f'"{measured}"')
    if given is not None:
        text = text.replace('friction = "colebrook"', f'friction = "colebrook"\ngiven = "{given}"')
    return parse_site(text)


def _solved(site_):
    sr = solve_site(site_)
    return sr.site, sr.result, sr.uncertainty


def test_two_readings_need_to_say_which_one_is_given():
    with pytest.raises(InputError) as caught:
        chosen(site())
    assert caught.value.field == "branches[2].measured_flow"
    assert "conditions.given" in caught.value.reason
    assert '"all"' in caught.value.reason  # weighing them together is one of the choices


@pytest.mark.parametrize(("given", "kind"), [("pressure_drop", "pressure_drop"),
                                             ("AHU-3 coil", "measured_flow"),
                                             ("measured_flow", "measured_flow")])
def test_given_picks_the_reading(given, kind):
    reading, others = chosen(site(given))
    assert reading.kind == kind and len(others) == 1 and others[0].kind != kind


@pytest.mark.parametrize(("given", "words"), [("total_flow", "no such reading"),
                                              ("AHU-1 coil", "no measured_flow"),
                                              ("gauge", "must be pressure_drop")])
def test_given_naming_nothing_held_is_refused(given, words):
    with pytest.raises(InputError) as caught:
        solve_site(site(given))
    assert caught.value.field == "conditions.given" and words in caught.value.reason
    if words.startswith("must be"):
        assert '"all"' in caught.value.reason


def test_two_readings_weighed_are_both_readings():
    from branchwise.core.report.lines import given_text

    assert given_text(solve_site(site("all"))).startswith("both readings weighed together")


def test_a_reading_that_agrees_with_the_solve_shows_no_difference():
    flow = float(solve_site(site("pressure_drop", "1 gpm")).result.flows[2])  # AHU-3, gauge
    agreeing = site("pressure_drop", f"{flow!r} m^3/s")
    (c,) = compare(*_solved(agreeing))
    assert c.kind == "measured_flow" and c.branch == "AHU-3 coil"
    assert c.difference == pytest.approx(0.0, abs=1e-9)
    # and the other way round: solved from that flow, the gauge reading is met
    (back,) = compare(*_solved(site("AHU-3 coil", f"{flow!r} m^3/s")))
    assert back.kind == "pressure_drop" and back.difference == pytest.approx(0.0, abs=1e-8)


def test_the_readings_and_given_survive_a_save_and_reach_the_json():
    s = site("AHU-3 coil")
    again = parse_site(dump_site(s))
    assert again.conditions.given == "AHU-3 coil"
    assert again.branches[2].measured_flow == "80 gpm" and again.conditions.pressure_drop
    doc = to_dict(solve_site(again))
    assert doc["given"]["quantity"] == "measured_flow"
    (other,) = doc["other_readings"]
    assert other["quantity"] == "pressure_drop" and other["solved_si"] > 0
    assert set(other) == {"quantity", "branch", "value_si", "solved_si", "difference",
                          "within_band"}


@pytest.mark.parametrize(("measured", "words"), [
    ("80 psi", "is not a flow"), ("80", "needs a unit"), ("abc", "must start with a number"),
    ("1e400 gpm", "finite")])
def test_a_reading_beside_the_given_that_is_no_reading_is_refused_by_its_field(measured, words):
    """Not the given, but still a reading: it would otherwise drop out of the comparison and
    the weighing with no more than a note (exit 0)."""
    with pytest.raises(InputError) as caught:
        solve_site(site("pressure_drop", measured))
    assert caught.value.field == "branches[2].measured_flow" and words in caught.value.reason


@pytest.mark.parametrize(("measured", "words"), [
    ("0 gpm", "the reading is zero"), ("-80 gpm", "the other direction")])
def test_a_zero_or_reversed_reading_is_said_in_words_not_as_a_ratio(measured, words):
    """(solved − read)/read is no figure for a zero reading (it was printed as +nan%), nor
    for a reading of the other sign (−196 %)."""
    from branchwise.core.report.lines import readings_lines

    lines = " ".join(readings_lines(solve_site(site("pressure_drop", measured))))
    assert words in lines and "nan" not in lines and "%" not in lines


def test_a_reading_that_cannot_be_weighed_is_named_by_its_branch():
    """All readings weighed, one a zero clamp-on (its tolerance, a share of the reading, is
    zero): the error names the branch as the file does, not "branch 3 (no name)"."""
    text = demo_text().replace(*CLAMP_ON).replace('"80 gpm"', '"0 gpm"').replace(
        'friction = "colebrook"', 'friction = "colebrook"\ntotal_flow = "600 gpm"\ngiven = "all"')
    with pytest.raises(InputError) as caught:
        solve_site(parse_site(text))
    assert caught.value.field == "branches[2].measured_flow"
    assert caught.value.names[2] == "AHU-3 coil"  # what the command line and the app name it by
