"""``branchwise presets``: the user's own liquids and materials, used by a site by their key."""

from __future__ import annotations

import json

import pytest

from branchwise.core.site.read import demo_text
from branchwise.tui.cli import main


@pytest.fixture(autouse=True)
def data_dir(tmp_path, monkeypatch):
    folder = tmp_path / "data"
    monkeypatch.setenv("BRANCHWISE_DATA_DIR", str(folder))
    return folder


def run(*argv: str, capsys) -> tuple[int, str, str]:
    code = main(list(argv))
    captured = capsys.readouterr()
    return code, captured.out, captured.err


SITE = """format = 1
name = "Oil skid"
[fluid]
kind = "{kind}"
[conditions]
pressure_drop = "50 kPa"
[[branches]]
name = "A"
diameter = "52.5 mm"
length = "20 m"
material = "{material}"
[[branches]]
name = "B"
diameter = "40.9 mm"
length = "12 m"
material = "commercial-steel"
"""


def test_a_saved_liquid_and_material_are_used_by_a_site(tmp_path, capsys):
    code, out, _ = run("presets", "add", "fluids", "light-oil", "density=870 kg/m^3",
                       "kinematic_viscosity=32 cSt", "name=Light oil", capsys=capsys)
    assert code == 0 and "saved fluids preset 'light-oil'" in out
    code, out, _ = run("presets", "add", "materials", "old-steel", "roughness=0.5 mm",
                       "hazen_williams_c=100", capsys=capsys)
    assert code == 0
    site = tmp_path / "skid.toml"
    site.write_text(SITE.format(kind="light-oil", material="old-steel"), encoding="utf-8")
    code, out, err = run("solve", str(site), "--format", "json", capsys=capsys)
    assert code == 0, err
    doc = json.loads(out)
    assert doc["fluid"]["density_kg_m3"] == pytest.approx(870.0)
    # 32 cSt = 32e-6 m²/s (NIST SP 811: 1 cSt = 1e-6 m²/s), μ = ν ρ
    assert doc["fluid"]["viscosity_pa_s"] == pytest.approx(32e-6 * 870.0)
    assert doc["branches"][0]["roughness_m"] == pytest.approx(0.5e-3)  # 0.5 mm, SI exact
    assert doc["branches"][1]["roughness_m"] == pytest.approx(0.045e-3)  # shipped steel
    code, out, _ = run("presets", "list", capsys=capsys)
    assert "light-oil" in out and "old-steel" in out and "yours" in out
    assert "commercial-steel" in out and "shipped" in out


def test_deleting_brings_back_the_shipped_value_and_shipped_ones_are_read_only(tmp_path, capsys):
    assert run("presets", "add", "materials", "commercial-steel", "roughness=0.2 mm",
               capsys=capsys)[0] == 0
    code, _, _ = run("presets", "delete", "materials", "commercial-steel", capsys=capsys)
    assert code == 0
    code, _, err = run("presets", "delete", "materials", "commercial-steel", capsys=capsys)
    assert code == 2 and "read-only" in err and err.count("\n") == 1


@pytest.mark.parametrize(("argv", "field"), [
    (("add", "materials", "bad", "roughness=5 kg"), "materials.bad.roughness"),
    (("add", "fluids", "thin", "density=900 kg/m^3"), "fluids.thin.viscosity"),
    (("add", "fluids", "x", "colour=red"), "fluids.x.colour"),
    (("add", "fluids", "Bad Key", "density=900 kg/m^3", "viscosity=2 cP"), "fluids.Bad Key"),
    (("add", "materials", "m", "roughness"), "materials.m"),
    (("delete", "fluids", "nothing-here"), "fluids.nothing-here"),
])
def test_bad_presets_are_one_line_errors_and_nothing_is_written(argv, field, data_dir, capsys):
    code, _, err = run("presets", *argv, capsys=capsys)
    assert code == 2
    assert err.startswith("branchwise: presets: ") and field in err
    assert err.count("\n") == 1 and "Traceback" not in err
    assert not (data_dir / "presets.toml").exists()


def test_demo_site_still_solves_with_presets_present(capsys):
    assert run("presets", "add", "materials", "old-steel", "roughness=0.5 mm",
               capsys=capsys)[0] == 0
    assert "AHU-1 coil" in demo_text()
    code, out, _ = run("solve", capsys=capsys)
    assert code == 0 and "AHU-1 coil" in out


def test_a_refused_preset_value_is_quoted_as_typed(data_dir, capsys):
    """A custom liquid takes no temperature: refused, quoting '500degC' (it quoted 773.15)."""
    code, _, err = run("presets", "add", "fluids", "hot", "density=900 kg/m^3",
                       "kinematic_viscosity=1 cSt", "temperature=500degC", capsys=capsys)
    assert code == 2 and "fluids.hot.temperature" in err
    assert "got 500degC" in err and "773" not in err
