"""Earlier visits in a site file: read, saved exactly, refused with the field named, closed.

Every text written is read back by Python's own TOML reader (``tomllib``, the standard
library's reference parser), so a saved visit is checked by something outside the project.
"""

from __future__ import annotations

import tomllib

import pytest
from site_texts import PUMP_ROOM

from branchwise.core.errors import InputError
from branchwise.core.site.read import demo_site, demo_text, load_site, parse_site
from branchwise.core.site.spec import VisitSpec
from branchwise.core.site.visits import (
    close_visit,
    rename_in_visits,
    visit_date,
    visit_site,
)
from branchwise.core.site.write import dump_site, save_site

VISIT = """
[[visits]]
date = 2024-11-05                  # a bare TOML date
technician = "K. Sample"
notes = "after the pump change"
pressure_drop = "70 kPa"           # the same gauge as today
measured = { "Condenser A" = "9.1 L/s" }
given = "pressure_drop"
temperature = "16 degC"
"""


def test_the_demo_keeps_two_earlier_visits():
    site = demo_site()
    assert [v.date for v in site.visits] == ["2024-09-18", "2025-01-15"]
    first = site.visits[0]
    assert first.pressure_drop == "10.3 psid" and first.total_flow == "628 gpm"
    assert first.measured == {"AHU-1 coil": "335 gpm", "AHU-3 coil": "77 gpm"}
    assert first.temperature == "43 degF" and "(demo)" in first.technician
    # Today's visit stays where it was: [conditions] and [record].
    assert site.conditions.pressure_drop == "10 psid" and site.record.date == "2025-03-12"


def test_a_site_without_visits_saves_byte_identical():
    site = parse_site(PUMP_ROOM)
    assert site.visits == []
    assert dump_site(site) == PUMP_ROOM
    assert "visits" not in tomllib.loads(dump_site(site))


def test_the_demo_saves_byte_identical():
    assert dump_site(demo_site()) == demo_text()


def test_a_bare_toml_date_reads_as_its_iso_text_and_stays_a_date():
    text = PUMP_ROOM + VISIT
    site = parse_site(text)
    assert site.visits[0].date == "2024-11-05"
    assert site.visits[0].measured == {"Condenser A": "9.1 L/s"}
    assert dump_site(site) == text  # unchanged, the comments and the bare date kept


def test_saving_keeps_earlier_visits_exactly(tmp_path):
    path = tmp_path / "demo.toml"
    path.write_text(demo_text(), encoding="utf-8")
    site = load_site(path)
    block = demo_text()[demo_text().index("[[visits]]"):]
    site.conditions.pressure_drop = "9.8 psid"
    site.branches[1].length = "185 ft"
    close_visit(site, "2025-03-12", "third visit")
    save_site(site, path)
    text = path.read_text(encoding="utf-8")
    assert block.rstrip("\n") in text  # the earlier visits, comments and all, as they were
    again = load_site(path)
    assert again.visits[:2] == demo_site().visits
    third = again.visits[2]
    assert third == VisitSpec(date="2025-03-12", technician="R. Example (demo)",
                              pressure_instrument=demo_site().record.pressure_instrument,
                              flow_instrument=demo_site().record.flow_instrument,
                              notes="third visit", pressure_drop="9.8 psid",
                              temperature="44 degF")
    assert tomllib.loads(text)["visits"][2]["pressure_drop"] == "9.8 psid"


def test_closing_a_visit_moves_today_and_clears_the_fields():
    site = demo_site()
    site.branches[2].measured_flow = "75 gpm"
    site.conditions.given = "AHU-3 coil"
    close_visit(site, "2025-03-12")
    v = site.visits[-1]
    assert (v.pressure_drop, v.given, v.measured) == ("10 psid", "AHU-3 coil",
                                                      {"AHU-3 coil": "75 gpm"})
    assert site.conditions.pressure_drop is None and site.conditions.given is None
    assert all(b.measured_flow is None for b in site.branches)
    assert site.record is None
    assert site.fluid.temperature == "44 degF"  # the liquid stays: only the readings clear
    with pytest.raises(InputError) as exc:
        close_visit(site, "2025-03-13")
    assert exc.value.field == "conditions"


def test_closing_refuses_a_date_that_is_no_date():
    site = demo_site()
    with pytest.raises(InputError):
        close_visit(site, "12 March")
    assert len(site.visits) == 2 and site.conditions.pressure_drop == "10 psid"


@pytest.mark.parametrize(("text", "field"), [
    ("2025-13-40", "visits[1].date"),
    ("March", "visits[1].date"),
    ("", "visits[1].date"),
])
def test_a_date_that_is_no_date_is_refused_with_the_field_named(tmp_path, text, field):
    bad = demo_text().replace('date = "2025-01-15"', f'date = "{text}"')
    path = tmp_path / "site.toml"
    path.write_bytes(bad.encode())
    with pytest.raises(InputError) as exc:
        load_site(path)
    assert exc.value.field == field
    assert path.read_bytes() == bad.encode()  # nothing lost: the file is only read


def test_a_visit_without_a_date_or_a_reading_is_refused():
    no_date = PUMP_ROOM + '\n[[visits]]\npressure_drop = "70 kPa"\n'
    with pytest.raises(InputError) as exc:
        parse_site(no_date)
    assert exc.value.field == "visits[0].date"
    no_reading = PUMP_ROOM + '\n[[visits]]\ndate = "2024-11-05"\ntechnician = "K. Sample"\n'
    with pytest.raises(InputError) as exc:
        parse_site(no_reading)
    assert exc.value.field == "visits[0]"
    assert "at least one reading" in exc.value.reason


@pytest.mark.parametrize(("extra", "field"), [
    ('pressure_dorp = "70 kPa"', "visits[0].pressure_dorp"),
    ('measured = "9 L/s"', "visits[0].measured"),
    ('measured = { "Condenser A" = [1, 2] }', 'visits[0].measured."Condenser A"'),
    ("technician = 7", "visits[0].technician"),
])
def test_a_visit_of_the_wrong_shape_is_refused(extra, field):
    text = PUMP_ROOM + f'\n[[visits]]\ndate = "2024-11-05"\npressure_drop = "70 kPa"\n{extra}\n'
    with pytest.raises(InputError) as exc:
        parse_site(text)
    assert exc.value.field == field


def test_a_reading_for_a_branch_that_does_not_exist_is_refused_with_the_field_named():
    site = parse_site(PUMP_ROOM + VISIT.replace('"Condenser A" = "9.1 L/s"',
                                                '"Condenser A" = "9.1 L/s", "AHU-9" = "3 L/s"'))
    with pytest.raises(InputError) as exc:
        visit_site(site, 0)
    assert exc.value.field == 'visits[0].measured."AHU-9"'
    assert "Condenser A" in exc.value.reason  # the branches it could have meant


def test_a_visit_is_today_s_site_with_that_day_s_readings():
    site = parse_site(PUMP_ROOM + VISIT)
    site.branches[1].measured_flow = "5 L/s"
    site.conditions.given = "pressure_drop"
    day = visit_site(site, 0)
    assert day.conditions.pressure_drop == "70 kPa" and day.conditions.given == "pressure_drop"
    assert [b.measured_flow for b in day.branches] == ["9.1 L/s", None]
    assert day.fluid.temperature == "16 degC" and day.record.technician == "K. Sample"
    assert day.branches[1].segments == site.branches[1].segments and day.visits == []
    today = visit_site(site, None)
    assert today.conditions.pressure_drop == "68 kPa" and today.fluid.temperature == "18 degC"


def test_several_readings_without_a_given_are_weighed_together():
    site = parse_site(PUMP_ROOM + VISIT.replace('given = "pressure_drop"\n', ""))
    assert visit_site(site, 0).conditions.given == "all"


def test_renaming_a_branch_renames_its_readings_in_the_visits():
    site = parse_site(PUMP_ROOM + VISIT.replace('given = "pressure_drop"', 'given = "Condenser A"'))
    rename_in_visits(site, "Condenser A", "Condenser A1")
    assert site.visits[0].measured == {"Condenser A1": "9.1 L/s"}
    assert site.visits[0].given == "Condenser A1"


@pytest.mark.parametrize("text", ["2025-03-12", "2025-03-12T08:30:00", " 2025-03-12 "])
def test_a_visit_date_is_an_iso_date(text):
    assert visit_date(text, "visits[0].date").isoformat() == "2025-03-12"


def test_a_visit_weighing_all_of_one_reading_is_told_it_is_a_visit():
    """`given = "all"` in a visit with one reading: the visit's field and 'this visit'."""
    from branchwise.core.history.timeline import history_of

    text = VISIT.replace('measured = { "Condenser A" = "9.1 L/s" }\n', "").replace(
        'given = "pressure_drop"', 'given = "all"')
    with pytest.raises(InputError) as caught:
        history_of(parse_site(PUMP_ROOM + text))
    assert caught.value.field == "visits[0].given"
    assert "this visit holds one" in caught.value.reason


def test_a_visit_reading_beyond_every_branch_names_the_visit_field():
    """A visit's total flow of 1e6 gpm: every branch beyond its bounds, said of
    visits[0].total_flow (it named today's conditions.total_flow)."""
    from branchwise.core.errors import NoSolutionError
    from branchwise.core.history.timeline import history_of

    text = VISIT.replace('pressure_drop = "70 kPa"           # the same gauge as today\n',
                         'total_flow = "1e6 gpm"\n').replace(
        'measured = { "Condenser A" = "9.1 L/s" }\n', "").replace(
        'given = "pressure_drop"', 'given = "total_flow"')
    with pytest.raises(NoSolutionError) as caught:
        history_of(parse_site(PUMP_ROOM + text))
    assert caught.value.field == "visits[0].total_flow"
