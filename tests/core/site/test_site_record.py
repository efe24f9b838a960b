"""The walkdown record in a site file: ``[record]`` (who took the readings, when, with what) and
each branch's ``tag``: read, checked for type, kept on saves, absent from files without them."""

from __future__ import annotations

import datetime as dt
import tomllib

import pytest
from site_texts import PUMP_ROOM

from branchwise.core.errors import InputError
from branchwise.core.site.read import demo_text, parse_site
from branchwise.core.site.spec import RecordSpec
from branchwise.core.site.write import dump_site

PLAIN = (PUMP_ROOM.replace('name = "Pump room"', 'name = "Pump room"  # no record, no tags')
         .replace("minor_k = 6.2\n", "")
         .replace('size = "3 in sch 40"', 'size = "3 in sch 40"   # the pipe as bought'))
"""The shared pump room with comments of its own (a save must keep them as they are)."""

RECORD = """
[record]
technician = "J. Doe"
date = {date}
pressure_instrument = "DPG-14, 0-30 psid"
flow_instrument = "clamp-on meter UFM-2"
"""


def test_the_demo_carries_a_record_and_tags():
    site = parse_site(demo_text(), "demo-site.toml")
    # the same values a TOML reader finds in the file (tomllib, Python's TOML 1.0 parser)
    doc = tomllib.loads(demo_text())
    assert site.record == RecordSpec(**doc["record"])
    assert [b.tag for b in site.branches] == [b["tag"] for b in doc["branches"]]


def test_a_site_without_record_or_tags_saves_byte_identical():
    site = parse_site(PLAIN)
    assert site.record is None and all(b.tag is None for b in site.branches)
    assert dump_site(site) == PLAIN
    assert dump_site(parse_site(demo_text())) == demo_text()  # and the demo with them


@pytest.mark.parametrize(("date", "as_text"), [
    ('"2025-03-12"', "2025-03-12"),
    ('"12 March, morning round"', "12 March, morning round"),
    # TOML 1.0 local date / local date-time / offset date-time (RFC 3339), kept as ISO 8601
    ("2025-03-12", "2025-03-12"),
    ("2025-03-12T09:30:00", "2025-03-12T09:30:00"),
    ("2025-03-12T09:30:00+01:00", "2025-03-12T09:30:00+01:00"),
])
def test_record_date_is_text_or_a_toml_date_and_saves_as_written(date, as_text):
    text = PLAIN + RECORD.format(date=date)
    site = parse_site(text)
    assert site.record is not None and site.record.date == as_text
    assert site.record.technician == "J. Doe"
    assert dump_site(site) == text  # a TOML date is not rewritten as a string
    # the ISO text is what Python's own reading of the TOML date says
    value = tomllib.loads(text)["record"]["date"]
    assert as_text == (value.isoformat() if isinstance(value, dt.date) else value)


def test_record_and_tag_added_in_the_app_are_saved_and_read_back():
    site = parse_site(PLAIN)
    site.record = RecordSpec(technician="A. Tech", date="2025-04-01",
                             flow_instrument="UFM-9")
    site.branches[1].tag = "CW-204"
    text = dump_site(site)
    assert "size = \"3 in sch 40\"   # the pipe as bought" in text  # comments kept
    doc = tomllib.loads(text)  # valid TOML (Python's tomllib)
    assert doc["record"] == {"technician": "A. Tech", "date": "2025-04-01",
                             "flow_instrument": "UFM-9"}
    assert doc["branches"][1]["tag"] == "CW-204" and "tag" not in doc["branches"][0]
    again = parse_site(text)
    assert again.record == site.record and again.branches[1].tag == "CW-204"


def test_a_changed_record_date_is_written_and_a_removed_record_goes():
    site = parse_site(PLAIN + RECORD.format(date="2025-03-12"))
    assert site.record is not None
    site.record.date = "2025-03-13"
    assert tomllib.loads(dump_site(site))["record"]["date"] == "2025-03-13"
    site.record = None
    assert "record" not in tomllib.loads(dump_site(site))


@pytest.mark.parametrize(("change", "field"), [
    ('technician = "J. Doe"', "record.technician"),
    ('pressure_instrument = "DPG-14, 0-30 psid"', "record.pressure_instrument"),
    ('flow_instrument = "clamp-on meter UFM-2"', "record.flow_instrument"),
])
@pytest.mark.parametrize("bad", ["14", "true", "[\"a\"]", "{ id = 1 }", "2025-03-12"])
def test_record_values_must_be_text(change, field, bad):
    text = (PLAIN + RECORD.format(date='"x"')).replace(change, f"{change.split(' = ')[0]} = {bad}")
    with pytest.raises(InputError) as caught:
        parse_site(text)
    assert caught.value.field == field and "must be text in quotes" in caught.value.reason


@pytest.mark.parametrize(("text", "field"), [
    (PLAIN + RECORD.format(date="20250312"), "record.date"),      # a number is no date
    (PLAIN + RECORD.format(date="true"), "record.date"),
    (PLAIN + RECORD.format(date='"x"') + 'tecnician = "B"\n', "record.tecnician"),
    (PLAIN.replace('name = "Pump room"', 'name = "Pump room"\nrecord = "J. Doe"'), "record"),
    (PLAIN.replace('name = "Jacket loop"', 'name = "Jacket loop"\ntag = 204'),
     "branches[1].tag"),
    (PLAIN.replace('name = "Jacket loop"', 'name = "Jacket loop"\ntag = ["a"]'),
     "branches[1].tag"),
])
def test_bad_record_shapes_name_their_field(text, field):
    with pytest.raises(InputError) as caught:
        parse_site(text)
    assert caught.value.field == field, caught.value
