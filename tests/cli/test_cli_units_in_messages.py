"""The command line states the quantities in its messages in the --units system.

Factors: NIST SP 811 (2008), appendix B — 1 US gallon = 231 in³ exactly, so 1 gpm =
6.30901964e-5 m³/s; 1 psi = 6894.757 Pa; 1 ft = 0.3048 m exactly.
"""

from __future__ import annotations

import re

import pytest

from branchwise.core.site.read import demo_text
from branchwise.tui.cli import main

GPM = 0.0254**3 * 231 / 60


def _impossible_length_site(tmp_path):
    text = demo_text().replace('# [solve]', '[solve]').replace(
        '# find = "diameter"', 'find = "length"').replace(
        '# branch = "AHU-2 coil"', 'branch = "AHU-2 coil"').replace(
        '# target_flow = "220 gpm"', 'target_flow = "2200 gpm"')
    assert 'target_flow = "2200 gpm"' in text, "the demo's [solve] example changed"
    path = tmp_path / "site.toml"
    path.write_text(text, encoding="utf-8")
    return path


def test_no_solution_in_us_units_reads_gpm_and_psi(tmp_path, capsys):
    path = _impossible_length_site(tmp_path)
    assert main(["solve", str(path), "--units", "us"]) == 2
    err = capsys.readouterr().err.strip()
    assert err.count("\n") == 0
    assert "2200 gpm" in err and "10.00 psi" in err and "L/s" not in err and "kPa" not in err


def test_no_solution_in_si_reads_litres_per_second(tmp_path, capsys):
    path = _impossible_length_site(tmp_path)
    assert main(["solve", str(path)]) == 2
    err = capsys.readouterr().err.strip()
    litres = float(re.search(r"cannot pass ([\d.]+) L/s", err).group(1))
    assert litres == pytest.approx(2200 * GPM * 1000, rel=1e-3)


def test_fluid_line_in_us_units_gives_fahrenheit(capsys):
    assert main(["solve", "--units", "us"]) == 0
    out = capsys.readouterr().out
    # The demo's water is at 44 °F; the line must not fall back to Celsius in US units.
    assert "Fluid: Water at 44.0 °F" in out and "°C" not in out


def test_a_freezing_liquid_is_refused_in_the_units_asked_for(tmp_path, capsys):
    # CoolProp INCOMP::MEG[0.3] freezes at about -14.6 °C (5.8 °F); -40 °F is -40 °C.
    text = demo_text().replace('kind = "water"', 'kind = "ethylene-glycol"\nconcentration = "30 %"'
                               ).replace('temperature = "44 degF"', 'temperature = "-40 degF"')
    path = tmp_path / "cold.toml"
    path.write_text(text, encoding="utf-8")
    assert main(["solve", str(path), "--units", "us"]) == 2
    err = capsys.readouterr().err
    # The limit in the reader's units; the value quoted as it was typed in the file.
    assert "freezes at 5." in err and "°F, got -40 degF" in err and "°C" not in err
    assert main(["solve", str(path)]) == 2
    err = capsys.readouterr().err
    assert "freezes at -14." in err and "°C, got -40 degF" in err


@pytest.mark.parametrize("fmt", ["table", "json", "csv", "markdown"])
@pytest.mark.parametrize("system", ["si", "us"])
def test_no_marker_character_reaches_any_output(tmp_path, capsys, fmt, system):
    # Sites that raise every kind of marked text: fast branches (velocity warnings), a valve
    # hint, a temperature tolerance cut where the liquid freezes (its range, a fluid limit).
    fast = demo_text().replace('pressure_drop = "10 psid"', 'pressure_drop = "28 psid"')
    cold = demo_text().replace('temperature = "2 K"', 'temperature = "20 K"').replace(
        'temperature = "44 degF"', 'temperature = "34 degF"')
    for i, text in enumerate((fast, cold)):
        path = tmp_path / f"s{i}.toml"
        path.write_text(text, encoding="utf-8")
        main(["solve", str(path), "--format", fmt, "--units", system, "--uncertainty",
              "--samples", "200"])
    impossible = _impossible_length_site(tmp_path)
    main(["solve", str(impossible), "--format", fmt, "--units", system])
    captured = capsys.readouterr()
    text = captured.out + captured.err
    assert "\ue000" not in text and "\ue001" not in text
    # each site did produce its marked text: a velocity warning, a fluid limit, a no-solution
    flat = " ".join(text.split())  # a text table wraps its notes
    assert "velocity" in flat and "where the liquid can be" in flat and "cannot pass" in flat
