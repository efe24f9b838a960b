"""Every output says what was assumed or resolved from the site (the Assumed list).

References: ASME B36.10M (NPS 4 sch 40: OD 114.3 mm, wall 6.02 mm); `fluids.fittings.Cv_to_Kv`
(the exact Cv/Kv from the US gallon and the psi); Moody (1944) for commercial steel, 0.045 mm
as commonly written; standard gravity 9.80665 m/s² (CGPM 1901); 1 atm = 101.325 kPa (exact).
"""

from __future__ import annotations

import json

import pytest
from fluids.fittings import Cv_to_Kv

from branchwise.core.report import render
from branchwise.core.site.read import demo_text, parse_site
from branchwise.core.site.solve import solve_site


@pytest.fixture(scope="module")
def demo():
    return solve_site(parse_site(demo_text()))


def _by(doc: dict, code: str, branch: str | None) -> list[str]:
    return [a["message"] for a in doc["assumptions"] if a["code"] == code and a["branch"] == branch]


def test_the_json_lists_what_was_assumed(demo) -> None:
    doc = json.loads(render(demo, "json"))
    assert {"code", "branch", "message"} == set(doc["assumptions"][0])
    bore = _by(doc, "bore-from-size", "AHU-1 coil")
    assert bore and f"{114.3 - 2 * 6.02:.4g} mm" in bore[0] and "ASME B36.10M" in bore[0]
    kv = _by(doc, "kv-from-cv", "AHU-2 coil")
    assert kv and f"Kv {Cv_to_Kv(110):.4g}" in kv[0]
    eps = _by(doc, "roughness-from-material", "AHU-1 coil")
    assert eps and "ε = 0.045 mm" in eps[0]
    assert _by(doc, "fittings-k", "AHU-1 coil")  # elbows, gate valves and a tee
    assert _by(doc, "pressure-default", None)[0].count("101.3 kPa") == 1
    assert "9.80665" in _by(doc, "gravity-default", None)[0]
    # The demo gives the friction model and the elevation: nothing assumed for them.
    assert not _by(doc, "friction-default", None) and not _by(doc, "elevation-default", None)


@pytest.mark.parametrize("fmt", ["table", "markdown", "html"])
def test_every_readable_report_has_the_list(demo, fmt: str) -> None:
    text = render(demo, fmt)
    assert "Assumed" in text and "bore 102.3 mm" in text


def test_a_c_value_under_a_darcy_model_is_said_to_be_unused() -> None:
    site = demo_text().replace('length = "62 m"', 'length = "62 m"\nhw_c = 120', 1)
    doc = json.loads(render(solve_site(parse_site(site)), "json"))
    unused = _by(doc, "hw-c-unused", "AHU-1 coil")
    assert unused and "not used" in unused[0]


def test_us_readers_get_the_list_in_their_units(demo) -> None:
    text = render(demo, "table", "us")
    assert "bore 4.026 in" in text  # ASME B36.10M: NPS 4 sch 40, 4.026 in


@pytest.mark.parametrize(("typed", "earth"), [("9.79 m/s^2", True), ("9.18 m/s^2", False),
                                              ("100 m/s^2", False), ("32.2 ft/s^2", True)])
def test_a_typed_gravity_is_said_and_one_no_place_on_earth_has_is_questioned(typed, earth):
    # Surface gravity is about 9.76–9.84 m/s² anywhere on the Earth (from memory); a typed g
    # changes every flow with a lift (two digits swapped, 9.18, moved them 5 %) and was said
    # nowhere but in the JSON.
    site = parse_site(demo_text())
    site.conditions.gravity = typed
    said = _by(json.loads(render(solve_site(site), "json")), "gravity-typed", None)
    assert len(said) == 1 and "as typed" in said[0]
    assert ("not Earth's" in said[0]) is not earth
    text = render(solve_site(site), "text")
    assert "as typed (standard gravity 9.80665" in " ".join(text.split())


def test_an_aged_material_cites_the_aged_figure_not_the_new_pipes():
    # "commercial-steel aged": ε 0.4 mm was said with Moody's new-pipe source (0.046 mm).
    site = demo_text().replace('material = "commercial-steel"', 'material = "commercial-steel"\n'
                               'condition = "aged"', 1)
    doc = json.loads(render(solve_site(parse_site(site)), "json"))
    said = _by(doc, "roughness-from-material", "AHU-1 coil")
    # the value and the figure its cited source gives agree (the catalog's aged entry)
    assert said and "(aged)" in said[0] and "Moody" not in said[0]
    value = said[0].split("ε = ")[1].split(" (")[0]
    assert value in said[0].split(" (", 2)[2], said[0]
    new = _by(doc, "roughness-from-material", "AHU-2 coil")
    assert new and "Moody (1944)" in new[0]
