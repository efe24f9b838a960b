"""What a site engineer gets from ``branchwise solve``: a table that fits a terminal yet keeps
every figure, a CSV that imports into a spreadsheet as one rectangle, and the walkdown record
(who, when, which instruments, line tags) in the table, the Markdown and the JSON."""

from __future__ import annotations

import csv
import io
import json

import pytest

from branchwise.core.report.csv_report import CSV_LABELS
from branchwise.core.report.lines import CAUTIONS
from branchwise.core.site.read import demo_text
from branchwise.core.units import format_number
from branchwise.tui.cli import main

INCH, FOOT = 0.0254, 0.3048            # m, NIST SP 811 (exact)
GPM = 231 * INCH**3 / 60               # m³/s: US gallon = 231 in³ (NIST SP 811)
FAST = ["--samples", "2000"]
# per unit system: m³/s per flow unit, m per length unit (velocity per time), m per bore unit
UNITS = {"si": (1e-3, 1.0, 1e-3), "us": (GPM, FOOT, INCH)}


def solve(capsys, *args: str) -> str:
    assert main(["solve", *args]) == 0
    return capsys.readouterr().out


def demo_json(capsys) -> dict:
    return json.loads(solve(capsys, "--format", "json"))


def section(text: str, title: str) -> list[str]:
    lines = text.splitlines()
    start = lines.index(title) + 1
    end = next((i for i in range(start, len(lines)) if not lines[i]), len(lines))
    return lines[start:end]


# ---- the text table ------------------------------------------------------------------------

@pytest.mark.parametrize("args", [[], ["--units", "us"], ["--uncertainty", *FAST],
                                  ["--units", "us", "--uncertainty", *FAST]])
def test_demo_table_fits_eighty_columns(capsys, args):
    # A terminal's usual 80 columns (newcomer trial: the old table was ~125 wide).
    text = solve(capsys, *args)
    assert max(len(line) for line in text.splitlines()) <= 80, text


@pytest.mark.parametrize("system", ["si", "us"])
def test_table_keeps_every_figure_of_each_branch(capsys, system):
    # The JSON (SI) converted by NIST SP 811 factors must be found, to four significant
    # figures, in the two tables: nothing a site engineer needs was dropped to fit.
    doc = demo_json(capsys)
    text = solve(capsys, "--units", system)
    flow_u, length_u, bore_u = UNITS[system]
    flows, losses = section(text, "Flows:"), section(text, "Pipes and head losses:")
    assert flows[0].split()[:3] == ["Branch", "Tag", "Seg"]
    for b in doc["branches"]:
        row = next(line for line in flows if line.startswith(b["name"] + " ")).split()
        assert b["tag"] in row
        for value in (b["flow_m3_s"] / flow_u, b["velocity_m_s"] / length_u, b["reynolds"]):
            shown = f"{value:.0f}" if value == b["reynolds"] else format_number(value)
            assert shown in row, (shown, row)
        assert b["regime"] in row
        row = next(line for line in losses if line.startswith(b["name"] + " ")).split()
        for value in (b["diameter_m"] / bore_u, b["length_m"] / length_u,
                      b["major_loss_m"] / length_u, b["minor_loss_m"] / length_u,
                      b["valve_loss_m"] / length_u, b["friction_factor"]):
            assert format_number(value) in row, (value, row)
    # a second segment keeps its own row in both tables (the Bypass has two)
    assert sum(1 for line in losses if line.split()[:1] == ["2"]) == 1


def test_seg_column_only_when_a_branch_has_segments(tmp_path, capsys):
    text = demo_text()
    start = text.index('[[branches]]\nname = "Bypass"')
    end = text.index("# [solve]")
    site = tmp_path / "site.toml"
    site.write_text(text[:start] + text[end:], encoding="utf-8")  # the Bypass removed
    out = solve(capsys, str(site))
    assert "Seg" not in section(out, "Flows:")[0] and "Seg" not in out


# ---- CSV -----------------------------------------------------------------------------------

@pytest.mark.parametrize("args", [[], ["--units", "us"], ["--uncertainty", *FAST]])
def test_csv_is_one_rectangle_with_labelled_rows(capsys, args):
    text = solve(capsys, "--format", "csv", *args)
    rows = list(csv.reader(io.StringIO(text)))
    # RFC 4180 2.4 ("each line should contain the same number of fields"); no comment lines
    assert {len(r) for r in rows} == {len(rows[0])}
    assert not any(line.startswith("#") for line in text.splitlines())
    assert rows[0][0] == "Branch" and rows[0][-1] == "Tag"
    data = [r for r in rows[1:] if r[0] not in CSV_LABELS]
    extra = [r for r in rows[1:] if r[0] in CSV_LABELS]
    assert [r[0] for r in data] == ["AHU-1 coil", "AHU-2 coil", "AHU-3 coil", "Bypass", "Bypass"]
    assert rows.index(extra[0]) == len(data) + 1  # the labelled rows come after the data
    assert [r[1] for r in extra if r[0] == "Caution"] == list(CAUTIONS)
    # label, text, then empty cells; a Value row: label, name with unit, number
    assert all(not any(r[3 if r[0] == "Value" else 2:]) for r in extra)
    assert all(float(r[2]) == float(r[2]) for r in extra if r[0] == "Value")
    labels = [r[0] for r in extra]
    assert labels == sorted(labels, key=CSV_LABELS.index)  # in the order of CSV_LABELS
    record = [r[1] for r in extra if r[0] == "Record"]
    assert record[0] == "Readings taken 2025-03-12 by R. Example (demo)"
    if "--uncertainty" in args:
        assert any(r[0] == "Band" for r in extra)


def test_csv_carries_warnings_as_labelled_rows(tmp_path, capsys):
    site = tmp_path / "site.toml"  # a high pressure drop: velocities beyond the limit
    text = demo_text().replace('"10 psid"', '"60 psid"').replace('"30 psid"', '"100 psid"')
    site.write_text(text, encoding="utf-8")
    doc = json.loads(solve(capsys, str(site), "--format", "json"))
    assert doc["warnings"]
    rows = list(csv.reader(io.StringIO(solve(capsys, str(site), "--format", "csv"))))
    warned = [r[1] for r in rows if r[0] == "Warning"]
    assert len(warned) == len(doc["warnings"])
    assert all(w["code"] in text for w, text in zip(doc["warnings"], warned, strict=True))


# ---- the record ----------------------------------------------------------------------------

def test_record_and_tags_in_json_markdown_and_table(capsys):
    doc = demo_json(capsys)
    file = __import__("tomllib").loads(demo_text())  # the demo file as Python's TOML reader sees it
    assert doc["record"] == file["record"]
    assert [b["tag"] for b in doc["branches"]] == [b["tag"] for b in file["branches"]]
    md = solve(capsys, "--format", "markdown")
    assert "- Readings taken 2025-03-12 by R. Example (demo)" in md
    assert f"- Pressure instrument: {file['record']['pressure_instrument']}" in md
    assert "| Branch | Tag | Seg | Flow (L/s) |" in md
    assert "| AHU-1 coil | CHW-101 |" in md
    table = solve(capsys)
    head = table.split("\n\n")[0].splitlines()
    assert head[1:] == ["Readings taken 2025-03-12 by R. Example (demo)",
                        f"Pressure instrument: {file['record']['pressure_instrument']}",
                        f"Flow instrument: {file['record']['flow_instrument']}"]


def test_without_a_record_the_keys_are_null_and_no_lines_appear(tmp_path, capsys):
    text = demo_text()
    start, end = text.index("[record]"), text.index("[fluid]")
    text = text[:start] + text[end:]
    text = "\n".join(line for line in text.splitlines() if not line.startswith("tag = "))
    site = tmp_path / "site.toml"
    site.write_text(text + "\n", encoding="utf-8")
    doc = json.loads(solve(capsys, str(site), "--format", "json"))
    assert doc["record"] == {"technician": None, "date": None, "pressure_instrument": None,
                             "flow_instrument": None}
    assert all(b["tag"] is None for b in doc["branches"])
    for key in ("pressure_drop_pa", "head_loss_m", "total_flow_m3_s", "fluid", "branches",
                "solved", "warnings", "cautions"):  # the contract keys stay (issue 4)
        assert key in doc
    table = solve(capsys, str(site))
    assert "Readings taken" not in table and "Tag" not in table
    assert "| Tag |" not in solve(capsys, str(site), "--format", "markdown")


@pytest.mark.parametrize("system", ["si", "us"])
def test_csv_carries_the_answer_a_solve_was_for(tmp_path, capsys, system):
    """The found diameter, its catalog size, the given reading and the total flow are in the
    CSV's Result rows, in the CSV's units, matching the JSON's SI values."""
    text = demo_text().replace("# [solve]", "[solve]").replace(
        '# find = "diameter"', 'find = "diameter"').replace(
        '# branch = "AHU-2 coil"', 'branch = "AHU-2 coil"').replace(
        '# target_flow = "220 gpm"', 'target_flow = "220 gpm"')
    path = tmp_path / "site.toml"
    path.write_text(text, encoding="utf-8")
    data = json.loads(solve(capsys, str(path), "--format", "json"))
    rows = list(csv.reader(io.StringIO(solve(capsys, str(path), "--format", "csv",
                                             "--units", system))))
    assert len({len(r) for r in rows}) == 1
    result = [r[1] for r in rows if r[0] == "Result"]
    bore = UNITS[system][2]
    found = data["solved"]["value_si"] / bore
    unit = "mm" if system == "si" else "in"
    assert any(f"{format_number(found)} {unit}" in line for line in result), result
    assert any(data["solved"]["catalog_size"] in line for line in result)
    total = data["total_flow_m3_s"] / UNITS[system][0]
    assert any(f"total flow {format_number(total)}" in line for line in result)
    assert rows.index(next(r for r in rows if r[0] == "Result")) > 4  # after the data rows
    values = {r[1]: r[2] for r in rows if r[0] == "Value"}  # numbers a spreadsheet can use
    number = float(values[f"diameter of 'AHU-2 coil' (found) ({unit})"])
    assert number == pytest.approx(found, rel=1e-5)
    assert float(values[f"total flow ({'L/s' if system == 'si' else 'gpm'})"]) == pytest.approx(
        total, rel=1e-5)
    assert values["catalog size for 'AHU-2 coil'"] == data["solved"]["catalog_size"]


def test_a_found_roughness_is_set_beside_the_materials_table_value(tmp_path, capsys):
    # Commercial steel, new: 0.045 mm (Moody 1944 and handbook tables; the shipped value is
    # checked against the HHR table of the `fluids` library in tests/references).
    from branchwise.core.catalogs import material

    text = demo_text().replace("# [solve]", "[solve]").replace(
        '# find = "diameter"', 'find = "roughness"').replace(
        '# branch = "AHU-2 coil"', 'branch = "AHU-2 coil"').replace(
        '# target_flow = "220 gpm"', 'target_flow = "160 gpm"')
    path = tmp_path / "site.toml"
    path.write_text(text, encoding="utf-8")
    found = json.loads(solve(capsys, str(path), "--format", "json"))["solved"]["value_si"]
    table = material("commercial-steel").roughness_m  # m
    assert table == pytest.approx(4.5e-5)
    out = " ".join(solve(capsys, str(path)).split())
    assert f"({found / table:.2g}× the table value for new commercial-steel, 0.04500 mm)" in out
