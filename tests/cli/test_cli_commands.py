"""``branchwise`` commands: the headless solve (no Textual), output formats, demo, where, help."""

from __future__ import annotations

import csv
import io
import json
import subprocess
import sys

import pytest

from branchwise.core.report.lines import CAUTIONS
from branchwise.core.site.read import demo_text
from branchwise.tui.cli import main

STANDARD_GRAVITY = 9.80665  # m/s², ISO 80000-3 / CGPM 1901


def run(*args: str, env: dict[str, str] | None = None) -> subprocess.CompletedProcess[str]:
    return subprocess.run([sys.executable, "-m", "branchwise.tui.cli", *args],
                          capture_output=True, text=True, timeout=120, env=env)


def test_solve_without_arguments_solves_the_demo_and_loads_no_textual():
    code = ("import sys\nfrom branchwise.tui.cli import main\nrc = main(['solve'])\n"
            "print('TEXTUAL' if 'textual' in sys.modules else 'NO-TEXTUAL', rc, "
            "file=sys.stderr)\n")
    out = subprocess.run([sys.executable, "-c", code], capture_output=True, text=True,
                         timeout=120)
    assert out.returncode == 0, out.stderr
    assert out.stderr.strip() == "NO-TEXTUAL 0"
    assert "AHU-1 coil" in out.stdout and "Bypass" in out.stdout
    assert "Cautions:" in out.stdout


def test_bare_command_without_a_terminal_prints_the_demo_solve():
    out = run()  # stdin/stdout are pipes here, so no app is started
    assert out.returncode == 0, out.stderr
    assert "AHU-1 coil" in out.stdout and "Traceback" not in out.stderr


def test_json_has_the_contract_keys_and_consistent_values(capsys):
    assert main(["solve", "--format", "json"]) == 0
    doc = json.loads(capsys.readouterr().out)
    for key in ("pressure_drop_pa", "head_loss_m", "total_flow_m3_s", "fluid", "branches",
                "solved", "warnings", "cautions"):
        assert key in doc
    assert set(doc["fluid"]) >= {"name", "density_kg_m3", "viscosity_pa_s"}
    branch_keys = {"name", "flow_m3_s", "share", "velocity_m_s", "reynolds", "friction_factor",
                   "regime", "diameter_m", "length_m", "roughness_m", "major_loss_m",
                   "minor_loss_m", "segments"}
    for b in doc["branches"]:
        assert set(b) >= branch_keys
        for seg in b["segments"]:
            assert set(seg) >= branch_keys - {"name", "flow_m3_s", "share", "segments"}
    bypass = next(b for b in doc["branches"] if b["name"] == "Bypass")
    assert len(bypass["segments"]) == 1  # two segments: the first at the top, one more listed
    # flows add up; every branch loses the same head; Δp = ρ g (H + Δz) (Darcy–Weisbach network)
    assert sum(b["flow_m3_s"] for b in doc["branches"]) == pytest.approx(doc["total_flow_m3_s"])
    for b in doc["branches"]:
        assert b["head_loss_m"] == pytest.approx(doc["head_loss_m"], rel=1e-9)
    rho = doc["fluid"]["density_kg_m3"]
    assert doc["pressure_drop_pa"] == pytest.approx(
        rho * STANDARD_GRAVITY * (doc["head_loss_m"] + doc["elevation_change_m"]))
    # 10 psid in the demo file: psi = 6.894 757 E+03 Pa (NIST SP 811)
    assert doc["pressure_drop_pa"] == pytest.approx(68947.57, rel=1e-6)
    assert doc["solved"] is None and doc["warnings"] == [] and len(doc["cautions"]) == 4


def test_json_of_a_diameter_solve_names_the_catalog_size(tmp_path, capsys):
    text = demo_text().replace("# [solve]", "[solve]").replace('# find = "diameter"',
                                                               'find = "diameter"')
    text = text.replace('# branch = "', 'branch = "').replace("# target_flow", "target_flow")
    path = tmp_path / "site.toml"
    path.write_text(text)
    assert main(["solve", str(path), "--format", "json"]) == 0
    solved = json.loads(capsys.readouterr().out)["solved"]
    assert solved["quantity"] == "diameter" and solved["branch"] == "AHU-2 coil"
    # ASME B36.10M: the schedule 40 size with a bore at least the one found
    assert solved["catalog_size"].endswith("sch 40")
    assert solved["value_si"] <= solved["catalog_inner_diameter_m"]
    # a bigger bore carries at least the target flow (220 US gpm, gallon = 231 in³)
    assert solved["flow_at_catalog_size_m3_s"] >= 220 * 231 * 0.0254**3 / 60


def test_table_in_us_units_csv_and_markdown(capsys):
    assert main(["solve", "--units", "us"]) == 0
    table = capsys.readouterr().out
    assert "gpm" in table and "psi" in table and "ft/s" in table
    assert main(["solve", "--format", "csv"]) == 0
    captured = capsys.readouterr()
    rows = list(csv.reader(io.StringIO(captured.out)))
    # RFC 4180 2.4: each record holds the same number of fields (no '#' comment lines)
    assert {len(r) for r in rows} == {len(rows[0])}
    assert [line for line in captured.err.splitlines() if "caution" in line] == [
        f"branchwise: caution: {c}" for c in CAUTIONS]  # on standard error, not in the data
    assert rows[0][:4] == ["Branch", "Segment", "Tag", "Flow (L/s)"]
    assert [r[0] for r in rows[1:]] == ["AHU-1 coil", "AHU-2 coil", "AHU-3 coil", "Bypass",
                                       "Bypass"]
    assert main(["solve", "--format", "markdown"]) == 0
    md = capsys.readouterr().out
    for heading in ("# Walkdown record", "## Inputs as entered", "## Results", "## Warnings",
                    "## Cautions"):
        assert heading in md
    assert "| `conditions.pressure_drop` | 10 psid |" in md  # inputs as typed
    assert "branchwise " in md


def test_output_file(tmp_path, capsys):
    out = tmp_path / "report.md"
    assert main(["solve", "--format", "markdown", "-o", str(out)]) == 0
    assert capsys.readouterr().out == ""
    assert out.read_text().startswith("# Walkdown record")


def test_demo_writes_once_and_refuses_to_overwrite(tmp_path, capsys):
    path = tmp_path / "start.toml"
    assert main(["demo", str(path)]) == 0
    assert path.read_text() == demo_text()
    path.write_text("mine")
    assert main(["demo", str(path)]) == 2
    assert "already exists" in capsys.readouterr().err
    assert path.read_text() == "mine"
    assert main(["demo", str(path), "--force"]) == 0
    assert path.read_text() == demo_text()
    assert main(["demo", str(tmp_path)]) == 0  # a folder: the demo goes inside it
    assert (tmp_path / "demo-site.toml").read_text() == demo_text()


def test_demo_file_solves_and_is_never_modified(tmp_path, capsys):
    path = tmp_path / "d.toml"
    main(["demo", str(path)])
    before = path.read_bytes()
    assert main(["solve", str(path), "--format", "json"]) == 0
    assert main(["open", str(path)]) == 0  # no terminal under test: open solves instead
    assert path.read_bytes() == before


def test_where_prints_the_data_folder(tmp_path, monkeypatch, capsys):
    monkeypatch.setenv("BRANCHWISE_DATA_DIR", str(tmp_path))
    assert main(["where"]) == 0
    out = capsys.readouterr().out
    assert str(tmp_path) in out and "BRANCHWISE_DATA_DIR" in out
    assert list(tmp_path.iterdir()) == []  # printing where files live creates nothing


@pytest.mark.parametrize("args", [["--help"], ["solve", "--help"], ["demo", "--help"],
                                  ["open", "--help"], ["where", "--help"]])
def test_help_everywhere(args, capsys):
    with pytest.raises(SystemExit) as done:
        main(args)
    assert done.value.code == 0
    assert "usage: branchwise" in capsys.readouterr().out


def test_version(capsys):
    with pytest.raises(SystemExit) as done:
        main(["--version"])
    assert done.value.code == 0
    assert capsys.readouterr().out.startswith("branchwise ")


def test_demo_without_a_path_writes_into_the_current_folder(tmp_path, monkeypatch, capsys):
    monkeypatch.chdir(tmp_path)
    assert main(["demo"]) == 0
    assert (tmp_path / "demo-site.toml").read_text() == demo_text()
    assert "branchwise open demo-site.toml" in capsys.readouterr().out
    assert main(["demo"]) == 2  # never over an existing file
    err = capsys.readouterr().err.strip()
    assert err.startswith("branchwise: demo-site.toml: already exists") and err.count("\n") == 0
