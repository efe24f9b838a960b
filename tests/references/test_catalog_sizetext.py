"""Reading pipe sizes as people write them, checked against the standards' own dimensions.

Dimension references: fluids.piping.nearest_pipe (ASME B36.10M/B36.19M, ASTM D1785, PyPI
`fluids`); the Hydraulic Institute Engineering Data Book ASTM B88-22 table (copper); ISO 4427-2 as
reproduced in manufacturers' tables (110 mm SDR 11: e_min 10.0 mm); fluids' ASTM F2619 table for
IPS PE by DR (same OD/DR rule as ASTM F714: NPS 4 DR 17 wall 6.731 mm).
"""

from __future__ import annotations

import fluids.piping as ref
import pytest

from branchwise.core.catalogs import parse_size, sizes, smallest_at_least
from branchwise.core.errors import InputError

INCH_M = 0.0254


def _fluids_id(nps: float, schedule: str) -> float:
    return ref.nearest_pipe(NPS=nps, schedule=schedule)[1]


# text -> (standard, nominal, schedule, expected inner diameter in m from the outside reference)
CASES = {
    "3 in sch 40": ("ASME B36.10M", "3", "40", _fluids_id(3, "40")),
    "NPS 3 Sch 80": ("ASME B36.10M", "3", "80", _fluids_id(3, "80")),
    "DN80 sch 40": ("ASME B36.10M", "3", "40", _fluids_id(3, "40")),
    "DN 150 sch XS": ("ASME B36.10M", "6", "XS", _fluids_id(6, "XS")),
    "2 1/2 in sch 80": ("ASME B36.10M", "2-1/2", "80", _fluids_id(2.5, "80")),
    '2.5" sch80': ("ASME B36.10M", "2-1/2", "80", _fluids_id(2.5, "80")),
    "NPS 1-1/4 schedule 160": ("ASME B36.10M", "1-1/4", "160", _fluids_id(1.25, "160")),
    "3/4 inch STD": ("ASME B36.10M", "3/4", "STD", _fluids_id(0.75, "STD")),
    "12 in sch std": ("ASME B36.10M", "12", "STD", _fluids_id(12, "STD")),
    "4 in 10S": ("ASME B36.19M", "4", "10S", _fluids_id(4, "10S")),
    "NPS 2 sch 40S": ("ASME B36.19M", "2", "40S", _fluids_id(2, "40S")),
    "1 in sch 80 stainless": ("ASME B36.19M", "1", "80S", _fluids_id(1, "80S")),
    "6 in sch 40 PVC": ("ASTM D1785", "6", "40", _fluids_id(6, "40D1785")),
    "pvc 1-1/2 in sch 80": ("ASTM D1785", "1-1/2", "80", _fluids_id(1.5, "80D1785")),
    # Hydraulic Institute data book, ASTM B88-22: ID 1.505 in (1-1/2 L), 0.745 in (3/4 K).
    '1-1/2" type L': ("ASTM B88", "1-1/2", "L", 1.505 * INCH_M),
    "3/4 in type K": ("ASTM B88", "3/4", "K", 0.745 * INCH_M),
    "1 in copper type M": ("ASTM B88", "1", "M", 1.055 * INCH_M),
    # ISO 4427-2 (manufacturers' reproductions): 110 SDR 11 e_min 10.0 mm; 63 SDR 17 3.8 mm.
    "110 mm SDR 11": ("ISO 4427", "110", "SDR 11", 0.090),
    "63mm sdr17 PE100": ("ISO 4427", "63", "SDR 17", 0.0554),
    "DN 110 SDR 11": ("ISO 4427", "110", "SDR 11", 0.090),
    # fluids DR17F2619IPS: NPS 4 OD 114.3 mm, wall 6.731 mm.
    "4 in SDR 17": ("ASTM F714", "4", "DR 17", 0.1143 - 2 * 0.006731),
    "NPS 4 DR 17 HDPE": ("ASTM F714", "4", "DR 17", 0.1143 - 2 * 0.006731),
}


@pytest.mark.parametrize("text", list(CASES))
def test_parses_what_people_write(text):
    standard, nominal, schedule, inner = CASES[text]
    p = parse_size(text)
    assert (p.standard, p.nominal, p.schedule) == (standard, nominal, schedule)
    assert p.inner_diameter_m == pytest.approx(inner, abs=1e-7)
    assert parse_size(p.label) == p


@pytest.mark.parametrize(
    "variant",
    [
        "3 in sch 40",
        "3IN SCH40",
        "  nps   3   SCHEDULE 40 ",
        "3 In Sch 40",
        '3" sch 40',
        "3 inch sch. 40",
        "NPS3 sch 40",
        "dn 80 SCH 40",
        "3 in sch 40 steel pipe",
    ],
)
def test_case_and_space_insensitive(variant):
    assert parse_size(variant) == parse_size("NPS 3 sch 40")


def test_material_hints_are_for_default_roughness():
    assert parse_size("3 in sch 40").material_hint == "commercial-steel"
    assert parse_size("4 in 10S").material_hint == "stainless"
    assert parse_size("1 in type L").material_hint == "copper"
    assert parse_size("6 in sch 40 PVC").material_hint == "pvc"
    assert parse_size("110 mm SDR 11").material_hint == "pe"


@pytest.mark.parametrize("text", ["3 in", "80 mm", "77.92 mm", "3.068 in", "0.078 m", "", "  "])
def test_plain_diameters_are_left_to_the_caller(text):
    assert parse_size(text) is None


def _error(text: str, field: str = "size") -> InputError:
    with pytest.raises(InputError) as info:
        parse_size(text, field)
    assert info.value.field == field
    assert info.value.value == text
    return info.value


def test_unknown_schedule_for_a_size_lists_the_valid_ones():
    # ASME B36.10M has no Schedule 40 in NPS 22; the reason names every schedule listed for NPS 22.
    # Reference for that list: the schedules in fluids.piping whose NPS lists contain 22.
    err = _error("NPS 22 sch 40")
    ours = ["10", "20", "30", "STD", "40", "60", "XS", "80", "100", "120", "140", "160", "XXS"]
    listed_by_fluids = [s for s in ours if 22.0 in ref.schedule_lookup[s][0]]
    assert "40" not in listed_by_fluids
    for schedule in listed_by_fluids:
        assert f" {schedule}," in err.reason or f" {schedule} for" in err.reason, schedule
    assert "NPS 20 or NPS 24" in err.reason


def test_errors_name_nearest_sizes_and_schedules():
    assert "NPS 2-1/2 or NPS 3" in _error("2.75 in sch 40").reason
    assert "DN 80 or DN 90" in _error("DN 85 sch 40").reason
    assert "DR 11, DR 13.5, DR 17" in _error("4 in SDR 13.6").reason  # F714: 13.5; ISO: 13.6
    assert "63 mm or 75 mm" in _error("70 mm SDR 11").reason
    assert "10, 20, 30" in _error("3 in sch 70").reason
    reason = _error("5/8 in type M").reason  # no type M in 5/8 (HI data book lists none)
    assert "K, L" in reason and "1/2 in or 3/4 in" in reason
    assert "mm" in _error("110 sdr 11").reason  # hints at the metric form
    # ISO 4427 lists SDR 26 from OD 50 only (thinner walls would fall below 2.0 mm).
    reason = _error("20 mm SDR 26").reason
    assert "SDR 7.4, SDR 9, SDR 11 for that size" in reason and "with SDR 26: 50 mm" in reason


def test_size_without_schedule_lists_schedules():
    reason = _error("NPS 3").reason
    assert "needs a schedule" in reason and "40" in reason and "160" in reason
    assert "needs a schedule" in _error("DN 80").reason


@pytest.mark.parametrize(
    "text",
    [
        "1 in type L pvc",
        "3 in sch 40 pe",
        "1 in sch 40S pvc",
        "abc sch 40",
        "NPS 3 4 in sch 40",
        "3 mm sch 40",
        "1 in type Q sch 40 stainless pvc",
        "110 mm sch 40",
        "1 in type x",
        "3 in sch abc",
        "sch 40 sch 80 3 in",
    ],
)
def test_contradictions_and_garbage_raise_input_error(text):
    err = _error(text, field="branches[1].segments[0].size")
    assert str(err).startswith("branches[1].segments[0].size: ")


def test_stainless_word_turns_a_schedule_into_its_s_form():
    assert parse_size("4 in sch 10 stainless").schedule == "10S"
    assert parse_size("4 in sch 10 ss") == parse_size("4 in 10S")


def test_every_b3610_size_reads_in_the_common_spellings():
    # Each size of each B36.10M schedule, written "<nominal> in sch <s>" and "DN <dn> sch <s>".
    for schedule in ["10", "40", "XS", "160"]:
        for p in sizes("ASME B36.10M", schedule):
            assert parse_size(f"{p.nominal} in sch {schedule}") == p
            assert parse_size(f"DN{p.dn} schedule {schedule.lower()}") == p


def test_a_size_written_by_dn_is_shown_by_dn_and_reads_back():
    # ASME B36.10M pairs DN 65 with NPS 2-1/2 and DN 80 with NPS 3 (its size tables).
    p = parse_size("DN65 sch 40")
    assert p.label == "DN65 sch 40" and parse_size(p.label) == p == parse_size("2-1/2 in sch 40")
    bigger = smallest_at_least(p.inner_diameter_m * 1.01, p)
    assert bigger is not None and bigger.label == "DN80 sch 40"
    assert smallest_at_least(p.inner_diameter_m * 1.01, parse_size("NPS 2-1/2 sch 40")).label \
        == "NPS 3 sch 40"


@pytest.mark.parametrize("digits", [17, 10, 7])
@pytest.mark.parametrize("name", ["AHU-1 coil", "AHU-2 coil"])
def test_sizing_a_branch_for_the_flow_it_carries_gives_back_its_own_size(name, digits):
    # The round trip a site engineer does first: the found bore for today's flow must give the
    # installed catalog size (ASME B36.10M), not the next one up.
    from branchwise.core.site.read import demo_site
    from branchwise.core.site.solve import solve_site
    from branchwise.core.site.spec import SolveSpec

    site = demo_site()
    flows = solve_site(site).result
    q = float(flows.flows[[b.name for b in flows.network.branches].index(name)])
    # the flow as read off a screen: to 7, 10 or all its figures, rounded either way
    site.solve = SolveSpec(find="diameter", branch=name, target_flow=f"{q:.{digits}g} m^3/s")
    solved = solve_site(site)
    installed = parse_size(next(b for b in site.branches if b.name == name).segments[0].size)
    assert solved.catalog is not None and solved.catalog.size == installed
