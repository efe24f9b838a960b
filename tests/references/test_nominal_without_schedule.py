"""A nominal size with no schedule is refused with the choices; sizes as line lists write them.

``size = "3 in"`` was read as a bore of 3.000 in, while NPS 3 in schedule 40 has 3.068 in: the
demo's AHU-2 flow moved from 10.74 to 10.30 L/s with no note (the figures of the report that
found it, the program's own output then). Bores are checked against ASME B36.10M as the PyPI
``fluids`` package tabulates it (``fluids.piping.nearest_pipe``; NPS 3 sch 40: OD 3.500 in,
wall 0.216 in, bore 3.068 in), and against ISO 4427-2 as manufacturers reproduce it (110 mm SDR 11:
e_min 10.0 mm). ASME B36.10M pairs DN 80 with NPS 3 and DN 40 with NPS 1-1/2.
"""

from __future__ import annotations

import math
import re

import fluids.piping as ref
import pytest
from hypothesis import given
from hypothesis import strategies as st

from branchwise.core.catalogs import parse_size
from branchwise.core.errors import InputError
from branchwise.core.site.read import demo_text, parse_site
from branchwise.core.site.solve import solve_site
from branchwise.core.site.values import size_or_bore

INCH_M = 0.0254  # exact (NIST SP 811 B.8)


def _fluids_bore(nps: float, schedule: str) -> float:
    return ref.nearest_pipe(NPS=nps, schedule=schedule)[1]


def _refused(text: str) -> InputError:
    with pytest.raises(InputError) as caught:
        size_or_bore(text, "branches[1].size")
    assert caught.value.field == "branches[1].size"
    assert caught.value.value == text
    return caught.value


def test_nps_3_sch_40_is_a_3_068_in_bore():
    size = parse_size("NPS 3 sch 40")
    assert size.inner_diameter_m == pytest.approx(_fluids_bore(3, "40"), abs=1e-7)
    assert size.inner_diameter_m / INCH_M == pytest.approx(3.068, abs=5e-4)  # B36.10M table


def test_3_in_alone_is_refused_with_the_choices_and_their_bores():
    reason = _refused("3 in").reason
    assert reason.startswith("is a nominal size without a schedule")
    stated = float(re.search(r"NPS 3 sch 40 has a ([\d.]+) in bore", reason)[1])
    assert stated == pytest.approx(_fluids_bore(3, "40") / INCH_M, abs=5e-4)
    assert 'write "NPS 3 sch 40"' in reason
    assert 'for a 3.000 in bore "ID 3 in"' in reason and 'diameter = "3 in"' in reason


@pytest.mark.parametrize("text", ['3"', "3.0 in", "3 inch", '3/4"', "1½\"", "1-1/2 in", "¾ in",
                                  "80 mm", "110 mm", "50 mm", "5/8 in"])
def test_every_plain_nominal_size_is_refused(text):
    assert "is a nominal size without" in _refused(text).reason


def test_a_pe_outside_diameter_alone_names_its_sdr_bore():
    reason = _refused("110 mm").reason
    # ISO 4427-2: 110 mm SDR 11 has e_min 10.0 mm, so a 90.0 mm bore
    assert "without an SDR" in reason and "110 mm SDR 11 has a 90.00 mm bore" in reason


@pytest.mark.parametrize(("text", "bore_m"), [
    ("77.9 mm", 0.0779), ("3.068 in", 3.068 * INCH_M),  # no nominal size: a bore
    ("ID 3 in", 3 * INCH_M), ("bore 3 in", 3 * INCH_M), ("3 in ID", 3 * INCH_M),
    ("I.D. 80 mm", 0.080), ("id: 1½\"", 1.5 * INCH_M),
])
def test_a_bore_is_a_bore(text, bore_m):
    size, bore = size_or_bore(text, "size")
    assert size is None and bore == pytest.approx(bore_m, rel=1e-12)


@pytest.mark.parametrize(("text", "nps", "schedule"), [
    ("80 NB sch 40", 3, "40"), ("NB 80 sch 40", 3, "40"), ("80NB sch 40", 3, "40"),
    ("80 mm NB sch 40", 3, "40"), ('3" NB sch 40', 3, "40"), ("NB 3 in sch 80", 3, "80"),
    ("DN80 PN16 sch 40", 3, "40"), ("PN 16 DN 80 sch 40", 3, "40"),
    ("1½\" sch 40", 1.5, "40"), ("1 ½ in sch 80", 1.5, "80"), ("40 NB sch 40", 1.5, "40"),
])
def test_sizes_as_line_lists_write_them(text, nps, schedule):
    size = parse_size(text)
    assert size.standard == "ASME B36.10M"
    assert size.inner_diameter_m == pytest.approx(_fluids_bore(nps, schedule), abs=1e-7)


def test_pn_is_a_pressure_class_and_never_gives_the_bore():
    with pytest.raises(InputError) as caught:
        parse_size("DN80 PN16", "size")
    assert "PN 16 is a pressure class" in caught.value.reason
    assert "needs a schedule" in caught.value.reason
    # beside an SDR it changes nothing: ISO 4427-2, 110 mm SDR 11 has e_min 10.0 mm
    assert parse_size("110 mm SDR 11 PN16").inner_diameter_m == pytest.approx(0.090, abs=1e-9)


def test_nb_without_a_unit_is_a_dn_in_whole_millimetres():
    with pytest.raises(InputError) as caught:
        parse_size("NB 2.5 sch 40", "size")
    assert "DN in mm" in caught.value.reason


def _ahu2(text: str) -> float:
    site = solve_site(parse_site(text)).result
    return next(b.flow for b in site.branches if b.name == "AHU-2 coil")


def test_the_demo_refuses_3_in_and_reads_nps_3_sch_40_as_before():
    demo = demo_text()
    assert 'size = "3 in sch 40"' in demo
    with pytest.raises(InputError) as caught:
        solve_site(parse_site(demo.replace('size = "3 in sch 40"', 'size = "3 in"')))
    assert caught.value.field == "branches[1].size"
    as_shipped = _ahu2(demo)
    assert _ahu2(demo.replace('size = "3 in sch 40"', 'size = "NPS 3 sch 40"')) == as_shipped
    assert as_shipped * 1000 == pytest.approx(10.74, abs=0.005)  # the report's figure
    # the 3.000 in bore is still there for whoever means it, written as a bore
    bore = _ahu2(demo.replace('size = "3 in sch 40"', 'diameter = "3 in"'))
    assert bore * 1000 == pytest.approx(10.30, abs=0.005)  # the report's figure
    assert _ahu2(demo.replace('size = "3 in sch 40"', 'size = "ID 3 in"')) == bore


@given(st.text(st.sampled_from(list("0123456789./- \"'½¾NBDPSnbdpschinmIDboreLtype")),
               max_size=16))
def test_any_size_text_reads_or_is_refused_naming_the_field(text):
    # Robustness, no outside reference: never a traceback, never a bore that is not finite.
    try:
        size, bore = size_or_bore(text, "branches[0].size")
    except InputError as exc:
        assert exc.field == "branches[0].size" and "\n" not in str(exc)
    else:
        assert math.isfinite(bore) and (size is None or size.inner_diameter_m == bore)
