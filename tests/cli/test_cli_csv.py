"""The CSV as tidy data: a header with ASCII units, one row per segment and nothing else,
numbers at full precision, formula-like texts neutralised; what is not a row goes to the
readable formats and, from the command line, to standard error."""

from __future__ import annotations

import csv
import io
import json
import math

import pytest

from branchwise.core.report.csv_report import FORMULA_STARTS, ascii_unit, safe_text, to_csv
from branchwise.core.report.lines import CAUTIONS
from branchwise.core.site.read import demo_text, parse_site
from branchwise.core.site.solve import solve_site, with_uncertainty
from branchwise.tui.cli import main

INCH, FOOT = 0.0254, 0.3048            # m, NIST SP 811 (exact)
GPM = 231 * INCH**3 / 60               # m³/s: US gallon = 231 in³ (NIST SP 811)
FAST = ["--samples", "500"]


def solve(capsys, *args: str) -> tuple[str, str]:
    assert main(["solve", *args]) == 0
    captured = capsys.readouterr()
    return captured.out, captured.err


def records(text: str) -> list[dict[str, str]]:
    return list(csv.DictReader(io.StringIO(text)))


@pytest.mark.parametrize("args", [[], ["--units", "us"], ["--uncertainty", *FAST]])
def test_one_row_per_segment_and_nothing_else(capsys, args):
    text, _ = solve(capsys, "--format", "csv", *args)
    rows = list(csv.reader(io.StringIO(text)))
    assert {len(r) for r in rows} == {len(rows[0])}  # RFC 4180 2.4: one width
    data = records(text)
    # the demo: three coils and a bypass of two series segments
    assert [(r["Branch"], r["Segment"]) for r in data] == [
        ("AHU-1 coil", "1"), ("AHU-2 coil", "1"), ("AHU-3 coil", "1"), ("Bypass", "1"),
        ("Bypass", "2")]
    assert all(h.isascii() for h in rows[0])  # a spreadsheet's default import reads it right
    assert not any(c in text for c in CAUTIONS)


@pytest.mark.parametrize(("system", "unit", "per_m3_s"),
                         [("si", "L/s", 1e3), ("us", "gpm", 1 / GPM)])
def test_flows_sum_to_the_total(capsys, system, unit, per_m3_s):
    """csv.DictReader, the way a script reads it: the flow column sums to the total flow of
    the JSON (a branch's flow on its first segment only) to 1e-9."""
    doc = json.loads(solve(capsys, "--format", "json")[0])
    text, _ = solve(capsys, "--format", "csv", "--units", system)
    flows = [float(r[f"Flow ({unit})"]) for r in records(text) if r[f"Flow ({unit})"]]
    total = doc["total_flow_m3_s"] * per_m3_s
    assert math.fsum(flows) == pytest.approx(total, rel=1e-9)
    assert len(flows) == len(doc["branches"])


def test_numbers_at_full_precision(capsys):
    doc = json.loads(solve(capsys, "--format", "json")[0])
    data = records(solve(capsys, "--format", "csv")[0])
    first = doc["branches"][0]
    # SI: L/s = 1e-3 m³/s (SI Brochure, 9th ed.); every double printed so that it reads back
    assert float(data[0]["Flow (L/s)"]) == pytest.approx(first["flow_m3_s"] * 1e3, rel=1e-15)
    assert float(data[0]["Reynolds"]) == first["reynolds"]
    assert float(data[0]["Friction factor"]) == first["friction_factor"]
    assert len(data[0]["Friction factor"].replace(".", "").lstrip("0")) > 8


def test_headers_take_ascii_units():
    assert ascii_unit("m^3/h") == "m3/h"
    assert ascii_unit("degC") == "degC"
    assert ascii_unit("um") == "um"
    assert ascii_unit("kg/m^3") == "kg/m3"


@pytest.mark.parametrize("text", ["=HYPERLINK(\"http://x\",\"y\")", "+1+2", "-2+3", "@SUM(A1)",
                                  "\tcmd", "\ufF1dSUM(1)"])
def test_formula_like_texts_are_neutralised(text):
    """OWASP, CSV Injection: a cell starting with = + - @ tab or CR is led by a quote (a tab
    or line break in a name is a space, so it leads nothing)."""
    out = safe_text(text)
    assert out.startswith("'") or not out.startswith(FORMULA_STARTS)
    assert " ".join(text.split()) in out


def test_a_branch_named_like_a_formula_is_written_as_text(tmp_path, capsys):
    site_text = demo_text().replace('name = "AHU-1 coil"', 'name = "=HYPERLINK(\\"x\\")"')
    site_text = site_text.replace('tag = "CHW-101"', 'tag = "@cmd"')
    path = tmp_path / "site.toml"
    path.write_text(site_text, encoding="utf-8")
    data = records(solve(capsys, str(path), "--format", "csv")[0])
    assert data[0]["Branch"] == "'=HYPERLINK(\"x\")" and data[0]["Tag"] == "'@cmd"
    # numbers stay numbers, even negative ones (a reverse flow)
    assert all(not r["Flow (L/s)"].startswith("'") for r in data)


def test_the_cautions_and_warnings_go_to_standard_error(tmp_path, capsys):
    site = tmp_path / "site.toml"  # a high pressure drop: velocities beyond the limit
    text = demo_text().replace('"10 psid"', '"60 psid"').replace('"30 psid"', '"100 psid"')
    site.write_text(text, encoding="utf-8")
    doc = json.loads(solve(capsys, str(site), "--format", "json")[0])
    assert doc["warnings"]
    out, err = solve(capsys, str(site), "--format", "csv")
    assert all(f"branchwise: caution: {c}" in err for c in CAUTIONS)
    assert err.count("branchwise: warning: ") == len(doc["warnings"])
    assert "caution" not in out and "velocity-high" not in out


def test_band_columns_hold_the_flow(capsys):
    data = records(solve(capsys, "--format", "csv", "--uncertainty", *FAST)[0])
    for r in data:
        if r["Flow (L/s)"]:
            assert float(r["Flow P5 (L/s)"]) <= float(r["Flow (L/s)"]) <= float(
                r["Flow P95 (L/s)"])
        else:
            assert r["Flow P5 (L/s)"] == r["Flow P95 (L/s)"] == ""


def test_the_app_export_and_the_command_line_write_the_same_csv(capsys):
    """The app's `c` writes core.report.csv_report.to_csv of its answer: the same text."""
    sr = solve_site(parse_site(demo_text(), "demo-site.toml"))
    out, _ = solve(capsys, "--format", "csv", "--units", "us")
    assert to_csv(sr, "us") == out
    banded = with_uncertainty(sr, 500, 0)
    out, _ = solve(capsys, "--format", "csv", "--uncertainty", *FAST)
    assert to_csv(banded, "si") == out


def test_a_branch_with_no_valve_has_no_valve_loss(tmp_path, capsys):
    """Blank, as in the table, Markdown and HTML: a 0 would read as a valve that loses nothing
    (the demo's bypass without its balancing valve; each coil keeps its control valve)."""
    site = tmp_path / "site.toml"
    text = demo_text()
    assert "valve_kv = 12 " in text
    site.write_text(text.replace("valve_kv = 12 ", "# valve_kv = 12 "), encoding="utf-8")
    doc = json.loads(solve(capsys, str(site), "--format", "json")[0])
    data = records(solve(capsys, str(site), "--format", "csv")[0])
    firsts = [r for r in data if r["Segment"] == "1"]
    assert [b["valve_kv"] is None for b in doc["branches"]] == [False, False, False, True]
    for row, branch in zip(firsts, doc["branches"], strict=True):
        if branch["valve_kv"] is None:
            assert row["Valve loss (m)"] == ""
        else:
            assert float(row["Valve loss (m)"]) == branch["valve_loss_m"] > 0
