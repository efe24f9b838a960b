"""A valve loss is shown for a branch with a valve, whatever its value, and left blank for a
branch without one — in the table, Markdown and HTML reports alike (the CSV's own test is in
tests/cli/test_cli_csv.py). A 0 beside a branch with no valve would read as a valve that loses
nothing; a blank beside a valve at no flow would hide that it is there."""

from __future__ import annotations

from branchwise.core.report.columns import segment_rows
from branchwise.core.site.read import demo_text, parse_site
from branchwise.core.site.solve import solve_site


def _cells(pressure_drop: str) -> dict[str, str]:
    text = demo_text()
    assert text.count("valve_kv = 12 ") == 1 and text.count('pressure_drop = "10 psid"') == 1
    text = text.replace("valve_kv = 12 ", "# valve_kv = 12 ").replace(
        'pressure_drop = "10 psid"', f'pressure_drop = "{pressure_drop}"')
    sr = solve_site(parse_site(text))
    return {b.name: cells["valve"] for b, j, cells in segment_rows(sr, "si") if j == 0}


def test_a_valve_at_no_flow_shows_its_zero_and_no_valve_shows_nothing():
    flowing, still = _cells("10 psid"), _cells("0 psid")
    assert flowing["Bypass"] == still["Bypass"] == ""  # its balancing valve taken out
    for name in ("AHU-1 coil", "AHU-2 coil", "AHU-3 coil"):  # each coil's control valve
        assert float(flowing[name]) > 0
        assert float(still[name]) == 0
