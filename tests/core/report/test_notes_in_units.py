"""Notes speak the reader's units: a quantity in a note is kept marked by the core and said in
SI, US or the units chosen, like a warning's; no marker ever reaches an output.

References: inch and foot by definition (NIST SP 811), the US gallon 231 in³; the notes'
numbers are read back from the solve's own SI values."""

from __future__ import annotations

import json

import pytest
from site_texts import demo_with, too_big_for_the_catalog

from branchwise.core.history import history_of
from branchwise.core.report import history_report
from branchwise.core.report.html_report import to_html
from branchwise.core.report.json_report import to_json
from branchwise.core.report.markdown import to_markdown
from branchwise.core.report.text_table import to_table
from branchwise.core.site.read import parse_site
from branchwise.core.site.solve import solve_site
from branchwise.core.units import Units

INCH = 0.0254  # m, by definition
MARKS = ("\ue000", "\ue001")  # the private-use characters of core.messages' markers


def _clean(text: str) -> str:
    assert not any(m in text for m in MARKS), "a marker reached the output"
    return text


@pytest.fixture(scope="module")
def big():
    return solve_site(parse_site(too_big_for_the_catalog()))


def test_the_catalog_note_says_the_bore_in_the_readers_units(big):
    bore = big.result.solved.value
    us = _clean(to_table(big, Units("us")))
    assert f"has a bore of {bore / INCH:.4g} in or more" in us
    si = _clean(to_table(big, Units("si")))
    assert f"has a bore of {bore * 1000:.4g} mm or more" in si  # in mm, as the tables give it
    chosen = _clean(to_table(big, Units("si", {"diameter": "ft"})))
    assert f"has a bore of {bore / 0.3048:.4g} ft or more" in chosen


@pytest.mark.parametrize("system", ["si", "us"])
def test_no_output_carries_a_marker(big, system):
    u = Units(system)
    _clean(to_table(big, u))
    _clean(to_markdown(big, u))
    _clean(to_html(big, u))
    doc = json.loads(_clean(to_json(big)))
    assert any("has a bore of" in n and " m" in n for n in doc["notes"])  # SI in JSON


def test_a_history_note_says_the_head_in_the_readers_units():
    """A visit whose head is too small to trend says that head in feet for a US reader."""
    text = demo_with(('pressure_drop = "10.1 psid"', 'pressure_drop = "0.0001 psid"'))
    history = history_of(parse_site(text))
    us = " ".join(_clean(history_report.to_text(history, Units("us"))).split())
    si = " ".join(_clean(history_report.to_text(history, Units("si"))).split())
    assert "ft of the liquid) is not clearly above zero" in us
    assert "m of the liquid) is not clearly above zero" in si
    assert "cannot carry 332.0 gpm at 0.0001000 psi" in us  # an error kept in a note
    for out in (history_report.to_markdown(history, "us"), history_report.to_csv(history, "us"),
                history_report.html_section(history, "us"), history_report.to_json(history)):
        _clean(out)


def test_the_app_says_a_note_in_its_units(big):
    u = Units("us")
    note = next(n for n in big.notes if "bore of" in n)
    assert " in or more" in _clean(u.say(note)) and MARKS[0] in note
