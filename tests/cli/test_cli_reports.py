"""What a site engineer gets from ``branchwise solve``: a table that fits a terminal yet keeps
every figure, and the walkdown record (who, when, which instruments, line tags) in the table,
the Markdown and the JSON (the CSV: tests/cli/test_cli_csv.py)."""

from __future__ import annotations

import json

import pytest

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


@pytest.mark.parametrize(("name", "fmt"), [("r.csv", "csv"), ("r.JSON", "json"),
                                           ("r.md", "markdown"), ("r.html", "html"),
                                           ("r.txt", "table")])
def test_without_format_the_output_name_chooses_it_and_says_so(tmp_path, capsys, name, fmt):
    """`-o r.csv` writes CSV (it wrote the text table, which a spreadsheet then misread); the
    choice is said on standard error; --format still wins."""
    out = tmp_path / name
    assert main(["solve", "-o", str(out)]) == 0
    err = capsys.readouterr().err
    text = out.read_text(encoding="utf-8")
    by_option = tmp_path / f"by-option-{name}"
    assert main(["solve", "--format", fmt, "-o", str(by_option)]) == 0
    assert text == by_option.read_text(encoding="utf-8")
    assert ("as the name" in err) == (fmt != "table")
    if fmt == "table":
        return
    assert main(["solve", "--format", "table", "-o", str(out), "--force"]) == 0
    assert out.read_text(encoding="utf-8") != text  # the option wins over the name


def test_a_diameter_band_with_draws_that_have_no_pipe_prints_no_python_warning(tmp_path, capsys):
    # A quarter of the draws had no diameter; the search stepped those far out and numpy's
    # "RuntimeWarning: overflow encountered in exp" reached the person's terminal.
    import warnings

    text = demo_text().replace(
        '# [solve]                          # find one unknown instead of the flows\n'
        '# find = "diameter"                # flows | diameter | length | roughness\n'
        '# branch = "AHU-2 coil"\n# target_flow = "220 gpm"',
        '[solve]\nfind = "diameter"\nbranch = "AHU-2 coil"\ntarget_flow = "330 gpm"')
    assert 'target_flow = "330 gpm"' in text
    site = tmp_path / "d.toml"
    site.write_text(text, encoding="utf-8")
    with warnings.catch_warnings(record=True) as seen:
        warnings.simplefilter("always")
        assert main(["solve", str(site), "--uncertainty", "--samples", "3000"]) == 0
    assert not [w for w in seen if issubclass(w.category, RuntimeWarning)], seen
    assert "have no solution" in capsys.readouterr().out  # the draws left out are said
