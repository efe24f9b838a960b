"""``branchwise solve --uncertainty`` and ``--curve``: the JSON object, the band column, the
ranked list, seeds, bad options and bad [tolerances], and the system curve file.

References named beside each check:
- NIST SP 811 (2008), appendix B: psi = 6.894 757 E+03 Pa.
- GUM, JCGM 100:2008, 4.3.7: a ± a rectangular distribution has u = a/√3; 5.1.2: the variance
  shares of the linear estimate add up to one.
- Continuity at the headers (mass conservation): the branch flows add up to the total flow at
  every point of a system curve.
"""

from __future__ import annotations

import contextlib
import csv
import io
import json
import math
import tempfile
from pathlib import Path

import pytest
from hypothesis import given, settings
from hypothesis import strategies as st

from branchwise.core.site.read import demo_text
from branchwise.core.units import format_number
from branchwise.tui.cli import main

PSI = 6894.757  # Pa, NIST SP 811
FAST = ["--samples", "2000"]  # enough draws for ordered percentiles, quick to run


def solve_json(capsys, *args: str) -> dict:
    assert main(["solve", "--format", "json", *args]) == 0
    return json.loads(capsys.readouterr().out)


@pytest.fixture(scope="module")
def demo_bands() -> dict:
    """The demo site's JSON with bands (one Monte Carlo run shared by several tests)."""
    out = io.StringIO()
    with contextlib.redirect_stdout(out):
        assert main(["solve", "--format", "json", "--uncertainty", *FAST]) == 0
    return json.loads(out.getvalue())


def test_json_uncertainty_object_has_the_issue_keys(demo_bands):
    u = demo_bands["uncertainty"]
    assert u["samples"] == 2000 and u["seed"] == 0
    names = {f"branch '{b['name']}' flow" for b in demo_bands["branches"]}
    assert set(u["outputs"]) == names | {"total flow", "pressure drop"}
    for band in u["outputs"].values():
        assert {"p5", "p50", "p95", "linear_sigma"} <= set(band)
    assert set(u["ranking"]) == set(u["outputs"])
    # the contract keys of the plain solve are all still there
    for key in ("pressure_drop_pa", "head_loss_m", "total_flow_m3_s", "fluid", "branches",
                "solved", "warnings", "cautions"):
        assert key in demo_bands


def test_without_the_option_there_is_no_band(capsys):
    assert solve_json(capsys)["uncertainty"] is None
    assert main(["solve"]) == 0
    assert "P5–P95" not in capsys.readouterr().out
    assert main(["solve", "--format", "csv"]) == 0
    assert "P5" not in capsys.readouterr().out


def test_bands_are_ordered_and_hold_the_deterministic_answer(demo_bands):
    u = demo_bands["uncertainty"]
    nominal = {f"branch '{b['name']}' flow": b["flow_m3_s"] for b in demo_bands["branches"]}
    nominal |= {"total flow": demo_bands["total_flow_m3_s"],
                "pressure drop": demo_bands["pressure_drop_pa"]}
    for name, band in u["outputs"].items():
        assert band["nominal"] == pytest.approx(nominal[name], rel=1e-12), name
        assert band["p5"] <= band["p50"] <= band["p95"], name
        assert band["p5"] <= band["nominal"] <= band["p95"], name


def test_ranking_and_inputs_follow_the_gum_and_the_site_tolerances(demo_bands):
    u = demo_bands["uncertainty"]
    for name, rows in u["ranking"].items():
        shares = [share for _, share in rows]
        assert shares == sorted(shares, reverse=True), name
        assert sum(shares) == pytest.approx(1.0, rel=1e-9), name  # JCGM 100:2008, 5.1.2
    gauge = next(i for i in u["inputs"] if i["kind"] == "gauge")
    # demo [tolerances]: 1 % of a 30 psid full scale (NIST SP 811 psi), u = a/√3 (GUM 4.3.7)
    assert gauge["half_width"] == pytest.approx(0.01 * 30 * PSI, rel=1e-6)
    assert gauge["standard_uncertainty"] == pytest.approx(gauge["half_width"] / math.sqrt(3))
    assert u["outputs"]["pressure drop"]["linear_sigma"] == pytest.approx(
        gauge["standard_uncertainty"], rel=1e-6)  # Δp is the reading itself


def test_seed_reproducibility_through_the_command(capsys):
    one = solve_json(capsys, "--seed", "7", "--samples", "500")["uncertainty"]
    again = solve_json(capsys, "--seed", "7", "--samples", "500")["uncertainty"]
    other = solve_json(capsys, "--seed", "8", "--samples", "500")["uncertainty"]
    assert one == again and one["seed"] == 7  # --seed alone implies --uncertainty
    assert other["outputs"]["total flow"]["p5"] != one["outputs"]["total flow"]["p5"]


def test_band_column_and_ranked_bars_in_the_table(capsys):
    assert main(["solve", "--uncertainty", *FAST]) == 0
    text = capsys.readouterr().out
    header = next(line for line in text.splitlines() if line.startswith("Branch"))
    assert "P5–P95" in header
    row = next(line for line in text.splitlines() if line.startswith("AHU-1 coil")).split()
    at = next(i for i, cell in enumerate(row) if "–" in cell)  # the P5–P95 cell
    low, high = (float(v) for v in row[at].split("–"))
    flow = float(row[at - 1])
    assert low <= flow <= high
    assert "What dominates the spread of the total flow" in text
    ranked = text.split("What dominates")[1].splitlines()[1:4]
    assert all("█" in line or "▏" in line for line in ranked[:2])


def test_band_in_the_markdown_record_and_the_csv(capsys):
    assert main(["solve", "--format", "markdown", "--uncertainty", *FAST, "--units", "us"]) == 0
    md = capsys.readouterr().out
    assert "## Uncertainty" in md and "| Flow (gpm) | P5–P95 (gpm) |" in md
    assert "| Input | Limit | Share of the total flow variance |" in md
    assert main(["solve", "--format", "csv", "--uncertainty", *FAST]) == 0
    rows = list(csv.reader(io.StringIO(capsys.readouterr().out)))
    assert {len(r) for r in rows} == {len(rows[0])}  # RFC 4180 2.4: one width for every row
    assert rows[0][3:6] == ["Flow (L/s)", "Flow P5 (L/s)", "Flow P95 (L/s)"]
    for r in rows[1:]:
        if r[3]:
            assert float(r[4]) <= float(r[3]) <= float(r[5]), r


def test_a_found_unknown_gets_its_band_and_is_ranked(tmp_path, capsys):
    text = demo_text().replace("# [solve]", "[solve]").replace('# find = "diameter"',
                                                               'find = "diameter"')
    text = text.replace('# branch = "', 'branch = "').replace("# target_flow", "target_flow")
    path = tmp_path / "size.toml"
    path.write_text(text)
    doc = solve_json(capsys, str(path), "--uncertainty", "--samples", "1000")
    u = doc["uncertainty"]
    found = "branch 'AHU-2 coil' diameter (found)"
    assert u["focus"] == found
    band = u["outputs"][found]
    assert band["p5"] <= doc["solved"]["value_si"] <= band["p95"]
    assert band["nominal"] == pytest.approx(doc["solved"]["value_si"], rel=1e-12)


# ---- bad options and bad tolerances: one line, exit 2, the file untouched -----------------

@pytest.mark.parametrize(("args", "field"), [
    (["--samples", "0"], "--samples"), (["--samples", "-5"], "--samples"),
    (["--samples", "2000000"], "--samples"), (["--samples", "1e9"], "--samples"),
    (["--samples", "many"], "--samples"), (["--samples", "12.5"], "--samples"),
    (["--seed", "-1"], "--seed"), (["--seed", "x"], "--seed"),
])
def test_bad_samples_or_seed_is_one_line_exit_2(capsys, args, field):
    assert main(["solve", *args]) == 2
    out, err = capsys.readouterr()
    assert out == "" and err.count("\n") == 1
    assert err.startswith(f"branchwise: {field}: must be a whole number")


@pytest.mark.parametrize(("old", "new", "field"), [
    ('gauge_accuracy = "1 %"', "gauge_accuracy = 1", "tolerances.gauge_accuracy"),
    ('gauge_full_scale = "30 psid"', 'gauge_full_scale = "5 psid"',
     "tolerances.gauge_full_scale"),
    ("roughness_factor = [0.5, 3]", "roughness_factor = [3, 0.5]",
     "tolerances.roughness_factor"),
    ('temperature = "2 K"', 'temperature = "2"', "tolerances.temperature"),
    ('# roughness_range = { "AHU-3 coil"', 'roughness_range = { "AHU-9 coil"',
     'tolerances.roughness_range."AHU-9 coil"'),
])
@pytest.mark.parametrize("flag", [[], ["--uncertainty"]])
def test_bad_tolerance_in_the_file(tmp_path, capsys, old, new, field, flag):
    path = tmp_path / "site.toml"
    text = demo_text()
    assert old in text
    path.write_text(text.replace(old, new, 1), encoding="utf-8")
    before = path.read_bytes()
    assert main(["solve", str(path), *flag]) == 2
    out, err = capsys.readouterr()
    assert out == "" and err.count("\n") == 1
    assert err.startswith(f"branchwise: {path}: {field}: "), err
    assert path.read_bytes() == before
    assert [p.name for p in tmp_path.iterdir()] == ["site.toml"]


# ---- the system curve ---------------------------------------------------------------------

GPM = 231 * 0.0254**3 / 60  # m³/s: US gallon = 231 in³, inch = 0.0254 m (NIST SP 811)


@pytest.mark.parametrize(("units", "flow_unit", "flow_si", "dp_unit", "dp_si"), [
    ("si", "L/s", 1e-3, "kPa", 1e3),   # NIST SP 811: litre = 1e-3 m³, exact
    ("us", "gpm", GPM, "psi", PSI),
])
def test_curve_csv_is_written_and_passes_through_the_operating_point(
        tmp_path, capsys, units, flow_unit, flow_si, dp_unit, dp_si):
    path = tmp_path / "curve.csv"
    doc = solve_json(capsys, "--curve", str(path), "--units", units)
    rows = list(csv.DictReader(path.open()))
    total_col, dp_col = f"Total flow ({flow_unit})", f"Pressure drop ({dp_unit})"
    op = [r for r in rows if r["Operating point"] == "1"]
    assert len(op) == 1
    # written to 10 significant figures
    assert float(op[0][total_col]) * flow_si == pytest.approx(doc["total_flow_m3_s"], rel=1e-9)
    assert float(op[0][dp_col]) * dp_si == pytest.approx(doc["pressure_drop_pa"], rel=2e-6)
    flows = [float(r[total_col]) for r in rows]
    dps = [float(r[dp_col]) for r in rows]
    assert flows[0] == 0 and dps[0] == 0  # no flow, no loss (no elevation change in the demo)
    assert max(flows) * flow_si == pytest.approx(1.5 * doc["total_flow_m3_s"], rel=1e-9)
    assert all(b > a for a, b in zip(dps, dps[1:], strict=False))  # Δp rises with the flow
    branch_columns = [f"Flow {b['name']} ({flow_unit})" for b in doc["branches"]]
    assert all(k in rows[0] for k in branch_columns)
    for r in rows:  # continuity at the headers
        total = sum(float(r[k]) for k in branch_columns)
        assert total == pytest.approx(float(r[total_col]), rel=1e-8, abs=1e-12)


def test_curve_refuses_an_existing_file_unless_forced(tmp_path, capsys):
    path = tmp_path / "curve.csv"
    path.write_text("keep me\n")
    assert main(["solve", "--curve", str(path)]) == 2
    out, err = capsys.readouterr()
    assert out == "" and err.count("\n") == 1 and "--curve: already exists" in err
    assert path.read_text() == "keep me\n"
    assert main(["solve", "--curve", str(path), "--force"]) == 0
    assert path.read_text().startswith("Total flow (L/s),Pressure drop (kPa)")


def test_curve_never_overwrites_the_site_file(tmp_path, capsys):
    site = tmp_path / "site.toml"
    site.write_text(demo_text())
    assert main(["solve", str(site), "--curve", str(site), "--force"]) == 2
    assert "--curve: is the site file" in capsys.readouterr().err
    assert site.read_text() == demo_text()


def test_help_describes_every_new_option(capsys):
    with pytest.raises(SystemExit):
        main(["solve", "--help"])
    text = " ".join(capsys.readouterr().out.split())
    for option, words in (("--uncertainty", "P5–P95"), ("--samples N", "Monte Carlo draws"),
                          ("--seed S", "same seed"), ("--curve FILE", "system curve"),
                          ("--force", "replace an existing --curve")):
        assert option in text and words in text, option


# ---- any value in any tolerance: exit 0 or 2, never an exception -------------------------

_TOL_LINES = [line.split("#")[0].rstrip() for line in
              demo_text().split("\n[tolerances]")[1].splitlines() if " = " in line
              and not line.startswith("#")]
_ODD = ['"0 %"', '"100 %"', '"1e308 %"', '"-1 %"', '"1e-300 %"', '"0 K"', '"1e308 K"',
        '"1e-300 K"', '"40 K"', '"1 psid"', '"1e308 psid"', "[0, 1]", "[1e-300, 1e300]",
        "[1, 1]", "[]", "{}", '{ "Bypass" = ["1e-9 mm", "20 mm"] }', "true", "nan", "-inf",
        '"2 degF"', '"5 mm"']


@given(st.lists(st.tuples(st.sampled_from(_TOL_LINES),
                          st.one_of(st.sampled_from(_ODD), st.integers(-10**6, 10**6))),
                min_size=1, max_size=3))
@settings(max_examples=40)
def test_any_value_in_any_tolerance_exits_0_or_2(changes):
    # Robustness, no outside reference: a bad tolerance is reported, never raised.
    text = demo_text()
    for line, value in changes:
        text = text.replace(line, f"{line.split(' = ')[0]} = {value}", 1)
    with tempfile.TemporaryDirectory() as folder:
        path = Path(folder) / "site.toml"
        path.write_bytes(text.encode())
        err = io.StringIO()
        with contextlib.redirect_stderr(err), contextlib.redirect_stdout(io.StringIO()):
            code = main(["solve", str(path), "--format", "json", "--samples", "50"])
        assert code in (0, 2)
        assert code == 0 or err.getvalue().count("\n") == 1
        assert path.read_bytes() == text.encode()


def test_ranking_fits_a_terminal_and_temperature_limits_read_in_fahrenheit(tmp_path, capsys):
    text = demo_text().replace('name = "AHU-2 coil"', 'name = "AHU-2 coil on the far mezzanine"')
    path = tmp_path / "site.toml"
    path.write_text(text, encoding="utf-8")
    assert main(["solve", str(path), "--uncertainty", "--samples", "2000", "--units", "us"]) == 0
    out = capsys.readouterr().out
    lines = out.splitlines()
    start = next(i for i, line in enumerate(lines) if line.startswith("What dominates"))
    ranking = lines[start:lines.index("", start)]
    assert all(len(line) <= 80 for line in ranking), ranking
    assert main(["solve", str(path), "--uncertainty", "--samples", "2000", "--format",
                 "json"]) == 0
    inputs = json.loads(capsys.readouterr().out)["uncertainty"]["inputs"]
    kelvin = next(i["half_width"] for i in inputs if i["kind"] == "temperature")
    # A temperature difference of 1 K is 1.8 °F (the scales' definitions, NIST SP 811 B.8).
    assert main(["solve", str(path), "--uncertainty", "--samples", "2000", "--units", "us",
                 "--format", "markdown"]) == 0
    markdown = capsys.readouterr().out  # every input with its limit, in the US units
    assert f"| temperature | ± {format_number(kelvin * 1.8, 3)} °F |" in markdown
