"""A preset is checked when it is added, never when a site later uses it: a built-in liquid's
name is refused (the built-in model would always win), a value the liquid refuses is said under
the preset's own name; and a presets file that does not load is named when a site asks for one
of its liquids or materials."""

from __future__ import annotations

import pytest

from branchwise.tui.cli import main

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
"""


@pytest.fixture(autouse=True)
def data_dir(tmp_path, monkeypatch):
    folder = tmp_path / "data"
    monkeypatch.setenv("BRANCHWISE_DATA_DIR", str(folder))
    return folder


def run(capsys, *argv: str) -> tuple[int, str]:
    code = main(list(argv))
    return code, capsys.readouterr().err


@pytest.mark.parametrize("name", ["water", "seawater", "ethylene-glycol", "custom"])
def test_a_built_in_liquid_name_is_refused(capsys, data_dir, name):
    code, err = run(capsys, "presets", "add", "fluids", name, "density=1000 kg/m^3",
                    "viscosity=1 cP")
    assert code == 2 and "built-in liquid" in err and err.count("\n") == 1
    assert not (data_dir / "presets.toml").exists()


@pytest.mark.parametrize(("values", "field", "words"), [
    (("density=870 kg/m^3", "viscosity=-3 cP"), "viscosity", "more than zero"),
    (("density=-870 kg/m^3", "viscosity=3 cP"), "density", "more than zero"),
    (("density=870 kg/m^3", "kinematic_viscosity=0 cSt"), "kinematic_viscosity",
     "more than zero"),
    (("kind=ethylene-glycol", "concentration=95 %"), "concentration", "60 %"),
    (("kind=ethylene-glycol", "concentration=30 %", "temperature=-40 degC"), "temperature",
     "freezes"),
])
def test_a_value_the_liquid_refuses_is_said_at_add(capsys, data_dir, values, field, words):
    code, err = run(capsys, "presets", "add", "fluids", "light-oil", *values)
    assert code == 2 and f"fluids.light-oil.{field}" in err and words in err
    assert not (data_dir / "presets.toml").exists()


def test_a_negative_roughness_is_refused_at_add(capsys, data_dir):
    code, err = run(capsys, "presets", "add", "materials", "old", "roughness=-0.5 mm")
    assert code == 2 and "materials.old.roughness" in err and "negative" in err


def test_a_broken_presets_file_is_named_when_a_site_uses_it(tmp_path, capsys, data_dir):
    assert run(capsys, "presets", "add", "fluids", "light-oil", "density=870 kg/m^3",
               "kinematic_viscosity=32 cSt")[0] == 0
    assert run(capsys, "presets", "add", "materials", "old-steel", "roughness=0.5 mm")[0] == 0
    site = tmp_path / "skid.toml"
    site.write_text(SITE.format(kind="light-oil", material="commercial-steel"))
    assert main(["solve", str(site)]) == 0
    capsys.readouterr()
    with open(data_dir / "presets.toml", "a", encoding="utf-8") as handle:
        handle.write("[[[\n")  # damaged by hand
    code, err = run(capsys, "solve", str(site))
    assert code == 2 and "presets file could not be read" in err and "presets.toml" in err
    site.write_text(SITE.format(kind="water", material="old-steel").replace(
        'kind = "water"', 'kind = "water"\ntemperature = "20 degC"'))
    code, err = run(capsys, "solve", str(site))
    assert code == 2 and "presets file could not be read" in err
