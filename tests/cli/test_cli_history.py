"""``branchwise history SITE``: every format, the units, the cautions, the JSON against its
published schema (the general-purpose ``jsonschema`` validator, Draft 2020-12), and bad visit
data refused on one line naming the field, the file left as it was (exit 2)."""

from __future__ import annotations

import csv
import io
import json
import re

import pytest
from jsonschema import Draft202012Validator

from branchwise.core.report.lines import CAUTIONS
from branchwise.core.report.schema import SCHEMA_VERSION, history_schema
from branchwise.core.site.read import demo_text
from branchwise.tui.cli import main

FLAG = "AHU-3 coil: resistance +46 % from 2024-09-18 to 2025-01-15 (band ± "


@pytest.fixture
def demo(tmp_path):
    path = tmp_path / "demo.toml"
    path.write_text(demo_text(), encoding="utf-8")
    return path


def test_the_table_shows_every_visit_the_trends_the_flags_and_the_cautions(demo, capsys):
    assert main(["history", str(demo), "--units", "us"]) == 0
    out = capsys.readouterr().out
    for text in ("2024-09-18", "2025-01-15", "2025-03-12 (today)", "Trends:", FLAG,
                 "ft/gpm²", "fouling, a valve moved, or a strainer filling", "Cautions:"):
        assert text in out, text
    assert CAUTIONS[0].split(":")[0] in out
    assert main(["history", str(demo)]) == 0
    assert "m/(L/s)²" in capsys.readouterr().out


def test_the_json_validates_against_the_published_schema(demo, capsys):
    schema = history_schema()
    Draft202012Validator.check_schema(schema)
    assert main(["history", str(demo), "--format", "json", "--units", "us"]) == 0
    doc = json.loads(capsys.readouterr().out)
    errors = list(Draft202012Validator(schema).iter_errors(doc))
    assert not errors, [f"{list(e.path)}: {e.message}" for e in errors[:5]]
    assert doc["schema_version"] == SCHEMA_VERSION and doc["cautions"] == list(CAUTIONS)
    history = doc["history"]
    assert set(history) >= {"visits", "trends"}
    for v in history["visits"]:
        assert set(v) >= {"date", "given", "readings", "pressure_drop_pa", "total_flow_m3_s",
                          "reconciliation", "branches"}
        for b in v["branches"]:
            assert set(b) >= {"name", "flow_m3_s", "resistance", "effective_roughness_m"}
    for t in history["trends"]:
        assert set(t) >= {"branch", "indicator", "first", "previous", "last", "change", "band",
                          "flagged"}
    assert [v["date"] for v in history["visits"]] == ["2024-09-18", "2025-01-15", "2025-03-12"]
    assert history["visits"][0]["reconciliation"]["degrees_of_freedom"] == 3
    assert history["visits"][2]["reconciliation"] is None  # one reading today
    flagged = [t for t in history["trends"] if t["flagged"]]
    assert {(t["branch"], t["indicator"]) for t in flagged} == {("AHU-3 coil", "resistance"),
                                                               ("AHU-3 coil", "flow")}


def test_the_solve_json_carries_the_history(demo, capsys):
    assert main(["solve", str(demo), "--format", "json"]) == 0
    doc = json.loads(capsys.readouterr().out)
    assert len(doc["history"]["visits"]) == 3
    assert main(["solve", "--format", "json"]) == 0  # the demo itself has its visits too
    assert json.loads(capsys.readouterr().out)["history"] is not None


def test_csv_is_one_row_per_visit_and_branch_with_the_flags_on_standard_error(demo, capsys):
    assert main(["history", str(demo), "--format", "csv", "--units", "us"]) == 0
    captured = capsys.readouterr()
    rows = list(csv.reader(io.StringIO(captured.out)))
    assert rows[0] == ["Date", "Branch", "Flow (gpm)", "Resistance (ft/gpm2)",
                       "Effective roughness (in)", "From"]
    assert len(rows) == 1 + 3 * 4
    assert rows[5][:2] == ["2025-01-15", "AHU-1 coil"] and float(rows[5][2]) == 332.0
    assert "branchwise: flagged: " + FLAG in captured.err
    assert captured.err.count("branchwise: caution: ") == len(CAUTIONS)


def test_beside_a_csv_each_visit_s_notes_are_on_standard_error_in_the_reader_s_units(
        demo, capsys):
    # The demo near freezing with a ± 10 K tolerance: each visit's band is drawn from 0 °C
    # (water freezes there), said per visit, in °F for a US reader (32 °F: the scale's zero).
    cold = demo.read_text(encoding="utf-8").replace('temperature = "2 K"', 'temperature = "10 K"')
    demo.write_text(re.sub(r'temperature = "4[345] degF"', 'temperature = "1 degC"', cold),
                    encoding="utf-8")
    assert main(["history", str(demo), "--format", "csv", "--units", "us"]) == 0
    notes = [line for line in capsys.readouterr().err.splitlines()
             if line.startswith("branchwise: note: ")]
    assert [n.split(": ")[2] for n in notes] == ["2024-09-18", "2025-01-15", "2025-03-12"]
    assert all("drawn over 32.00 °F – " in n and "freezes at 32.00 °F" in n for n in notes)


@pytest.mark.parametrize("fmt", ["markdown", "html"])
def test_markdown_and_html_carry_the_trends_and_the_cautions(demo, capsys, fmt):
    assert main(["history", str(demo), "--format", fmt]) == 0
    out = capsys.readouterr().out
    assert "Cautions" in out and CAUTIONS[-1] in out
    assert "AHU-3 coil: resistance +46 %" in out
    if fmt == "html":
        assert out.startswith("<!DOCTYPE html>") and "<script" not in out


def test_output_to_a_file_and_never_over_the_site(demo, tmp_path, capsys):
    target = tmp_path / "history.md"
    assert main(["history", str(demo), "--format", "markdown", "-o", str(target)]) == 0
    assert "## Trends" in target.read_text(encoding="utf-8")
    assert main(["history", str(demo), "-o", str(demo)]) == 2
    assert "--output" in capsys.readouterr().err
    assert demo.read_text(encoding="utf-8") == demo_text()


SECOND_READINGS = ('pressure_drop = "10.1 psid"\n', 'given = "pressure_drop"\nmeasured = '
                   '{ "AHU-1 coil" = "332 gpm", "AHU-3 coil" = "63 gpm" }\n')


def _no_reading(text: str) -> str:
    for line in SECOND_READINGS:
        assert line in text
        text = text.replace(line, "")
    return text


@pytest.mark.parametrize(("change", "field", "reason"), [
    (lambda t: t.replace('date = "2025-01-15"', 'date = "15.01.2025"'), "visits[1].date",
     "must be a date"),
    (lambda t: t.replace('"AHU-1 coil" = "335 gpm"', '"AHU-9" = "335 gpm"'),
     'visits[0].measured."AHU-9"', "no branch of that name"),
    (_no_reading, "visits[1]:", "a visit needs at least one reading"),
], ids=["date", "branch", "no-reading"])
def test_bad_visit_data_exits_2_naming_the_field_and_changes_nothing(tmp_path, capsys, change,
                                                                     field, reason):
    text = change(demo_text())
    assert text != demo_text()
    path = tmp_path / "site.toml"
    path.write_bytes(text.encode())
    assert main(["history", str(path)]) == 2
    err = capsys.readouterr().err
    assert len(err.strip().splitlines()) == 1 and "Traceback" not in err
    assert f"site.toml: {field}" in err and reason in err, err
    assert path.read_bytes() == text.encode()  # nothing lost: the file is only read


def test_a_site_with_no_visit_and_no_reading_is_refused(tmp_path, capsys):
    text = demo_text().split("# Earlier visits")[0].replace(
        'pressure_drop = "10 psid"', "# no reading yet")
    path = tmp_path / "bare.toml"
    path.write_text(text, encoding="utf-8")
    assert main(["history", str(path)]) == 2
    assert "visits" in capsys.readouterr().err


FIRST_CLAMP_ONS = 'measured = { "AHU-1 coil" = "335 gpm", "AHU-3 coil" = "77 gpm" }'
SECOND_CLAMP_ONS = 'measured = { "AHU-1 coil" = "332 gpm", "AHU-3 coil" = "63 gpm" }'


def _run(tmp_path, capsys, old: str, new: str, *args: str) -> tuple[int, str, str]:
    text = demo_text()
    assert old in text
    path = tmp_path / "site.toml"
    path.write_text(text.replace(old, new), encoding="utf-8")
    code = main(["history", str(path), "--units", "us", *args])
    captured = capsys.readouterr()
    return code, captured.out, captured.err


@pytest.mark.parametrize("clamp_ons", [FIRST_CLAMP_ONS, SECOND_CLAMP_ONS], ids=["first", "last"])
def test_a_clamp_on_reading_zero_is_a_note_not_a_crash(tmp_path, capsys, clamp_ons):
    """A flow reading of 0 is a line shut or a meter fault (common practice): the branch's
    figures at that visit are not trended, a note names the visit and the branch."""
    zero = re.sub(r'"AHU-1 coil" = "\d+ gpm"', '"AHU-1 coil" = "0 gpm"', clamp_ons)
    code, out, err = _run(tmp_path, capsys, clamp_ons, zero)
    assert code == 0 and not err, err
    assert "AHU-1 coil: its clamp-on reads no flow" in " ".join(out.split())
    assert "-100 %" not in out and "± 0.0 % ⚑" not in out
    code, out, _ = _run(tmp_path, capsys, clamp_ons, zero, "--format", "json")
    assert code == 0 and "NaN" not in out and "Infinity" not in out
    json.loads(out)


def test_a_reversed_flow_is_said_as_a_reversal(tmp_path, capsys):
    code, out, _ = _run(tmp_path, capsys, '"AHU-1 coil" = "335 gpm"', '"AHU-1 coil" = "-335 gpm"')
    assert code == 0
    row = next(line for line in out.splitlines() if line.startswith("AHU-1 coil  flow"))
    assert "reversed ⚑" in row and "%" not in row  # by hand: -335 → +332 is no "-199 %"
    assert "AHU-1 coil: the flow reversed between 2024-09-18 and 2025-01-15" in " ".join(
        out.split())


def test_a_visit_after_today_s_record_exits_2_naming_its_date(tmp_path, capsys):
    code, out, err = _run(tmp_path, capsys, 'date = "2025-01-15"', 'date = "2026-01-01"')
    assert code == 2 and not out and len(err.strip().splitlines()) == 1
    assert "site.toml: visits[1].date: after today's record date (2025-03-12" in err, err


def test_today_s_bad_clamp_on_names_the_branch_by_its_name(tmp_path, capsys):
    code, _, err = _run(tmp_path, capsys, '# measured_flow = "80 gpm"', 'measured_flow = "80 psi"')
    assert code == 2 and len(err.strip().splitlines()) == 1
    assert 'branch "AHU-3 coil" measured_flow: is not a flow' in err and "no name" not in err
