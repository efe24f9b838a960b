"""Words of a site file as people write them: friction models, liquid kinds, values quoted back.

Each accepted spelling must give the same site as the project's own key; the spellings are common
practice (MEG/MPG for mono-ethylene/propylene glycol in HVAC and process line lists;
"Colebrook–White" is Colebrook's equation as C. F. Colebrook and C. M. White's names give it).
"""

from __future__ import annotations

import pytest
from site_texts import PUMP_ROOM

from branchwise.core.errors import InputError
from branchwise.core.fluids import liquid
from branchwise.core.model import friction_model
from branchwise.core.site.read import parse_site
from branchwise.core.site.solve import solve_site


@pytest.mark.parametrize(("text", "model"), [
    ("Hazen-Williams", "hazen-williams"), ("Hazen Williams", "hazen-williams"),
    ("hazen_williams", "hazen-williams"), ("HAZEN–WILLIAMS", "hazen-williams"),
    ("COLEBROOK", "colebrook"), ("Colebrook-White", "colebrook"), (" colebrook ", "colebrook"),
    ("Swamee Jain", "swamee-jain"), ("Churchill", "churchill"), ("Laminar", "laminar"),
])
def test_friction_model_ignores_case_spaces_underscores_and_dashes(text, model):
    assert friction_model(text) == model


@pytest.mark.parametrize("text", ["hazen", "colebrook white x", "", "darcy", 3])
def test_unknown_friction_model_names_the_choices(text):
    with pytest.raises(InputError) as caught:
        friction_model(text)
    assert caught.value.field == "conditions.friction"
    assert "colebrook" in caught.value.reason


def test_a_site_written_with_capitals_solves_as_the_key():
    site = PUMP_ROOM.replace('pressure_drop = "68 kPa"',
                             'pressure_drop = "68 kPa"\nfriction = "Colebrook-White"')
    plain = PUMP_ROOM.replace('pressure_drop = "68 kPa"',
                              'pressure_drop = "68 kPa"\nfriction = "colebrook"')
    assert solve_site(parse_site(site)).result.flows == pytest.approx(
        solve_site(parse_site(plain)).result.flows, rel=0)
    assert solve_site(parse_site(site)).built.network.friction == "colebrook"


@pytest.mark.parametrize(("text", "key"), [
    ("EG", "ethylene-glycol"), ("eg", "ethylene-glycol"), ("MEG", "ethylene-glycol"),
    ("PG", "propylene-glycol"), ("MPG", "propylene-glycol"),
    ("sea-water", "seawater"), ("sea water", "seawater"), ("Sea Water", "seawater"),
    ("Sea_Water", "seawater"), ("SEAWATER", "seawater"), ("Ethylene Glycol", "ethylene-glycol"),
])
def test_liquid_kinds_by_the_names_the_trade_writes(text, key):
    found = liquid(text)
    assert found is not None and found.key == key


def test_a_glycol_written_eg_is_the_same_liquid():
    def fluid_of(kind: str):
        text = PUMP_ROOM.replace('kind = "water"', f'kind = "{kind}"\nconcentration = "30 %"')
        return solve_site(parse_site(text)).built.network.fluid

    eg, key = fluid_of("EG"), fluid_of("ethylene-glycol")
    assert (eg.density, eg.viscosity) == (key.density, key.viscosity)


@pytest.mark.parametrize(("added", "field", "quoted"), [
    # a value the liquid does not take: quoted as typed, not as its SI number (was 279.817)
    ('kind = "custom"\ndensity = "1000 kg/m3"\nviscosity = "1 cP"\ntemperature = "44 degF"',
     "fluid.temperature", "44 degF"),
    ('kind = "EG"\nconcentration = "30 %"\nsalinity = "35 g/kg"\ntemperature = "44 degF"',
     "fluid.salinity", "35 g/kg"),
    # out of a model's range: the temperature as typed, whatever the reader's units
    ('kind = "EG"\nconcentration = "30 %"\ntemperature = "-40 degF"', "fluid.temperature",
     "-40 degF"),
    ('kind = "water"\ntemperature = "250 degF"', "fluid.temperature", "250 degF"),
    # a bare 30 read as a fraction of one (3000 %): said so, quoting the 30 typed
    ('kind = "EG"\nconcentration = 30\ntemperature = "5 degC"', "fluid.concentration", "30"),
    ('kind = "EG"\nconcentration = "30"\ntemperature = "5 degC"', "fluid.concentration", "30"),
])
def test_fluid_errors_quote_the_value_as_typed(added, field, quoted):
    text = PUMP_ROOM.replace('kind = "water"\ntemperature = "18 degC"', added)
    with pytest.raises(InputError) as caught:
        solve_site(parse_site(text))
    assert caught.value.field == field
    assert caught.value.value == quoted
    assert str(caught.value).endswith(f"got {quoted}")
    if field == "fluid.concentration":
        assert "fraction of one here (3000 %)" in str(caught.value) and "'30 %'" in str(
            caught.value)


@pytest.mark.parametrize(("old", "new", "field", "quoted"), [
    # beyond the model's sane bounds: the value as typed, not the model's SI number
    ('length = "64 m"', 'length = "1e9 mi"', "branches[0].length", "1e9 mi"),
    ('diameter = "102.26 mm"', 'diameter = "500 ft"', "branches[0].diameter", "500 ft"),
    ('pressure_drop = "68 kPa"', 'pressure_drop = "68 kPa"\nelevation_change = "1e6 ft"',
     "conditions.elevation_change", "1e6 ft"),
])
def test_model_bounds_quote_the_value_as_typed(old, new, field, quoted):
    with pytest.raises(InputError) as caught:
        solve_site(parse_site(PUMP_ROOM.replace(old, new)))
    assert (caught.value.field, caught.value.value) == (field, quoted)


def test_a_hazen_williams_c_under_another_model_is_said_not_dropped():
    # common practice: C belongs to the Hazen-Williams formula alone; under Colebrook it has
    # no part in the answer, and the outputs say so
    text = PUMP_ROOM.replace('minor_k = 6.2', 'minor_k = 6.2\nhw_c = 120')
    solved = solve_site(parse_site(text))
    said = [a for a in solved.assumptions if a.code == "hw-c-unused"]
    assert said and said[0].branch == "Condenser A"
    assert "hw_c 120 is not used: friction is colebrook" in said[0].message
    plain = solve_site(parse_site(PUMP_ROOM))
    assert solved.result.flows == pytest.approx(plain.result.flows, rel=0)
    assert not any(a.code == "hw-c-unused" for a in plain.assumptions)


@pytest.mark.parametrize(("old", "new", "field"), [
    ("minor_k = 6.5", 'minor_k = "6_5"', "branches[1].minor_k"),
    ("valve_kv = 160", 'valve_kv = "1_60"', "branches[0].valve_kv"),
    ("valve_cv = 110", 'valve_cv = "1_10 + 40"', "branches[1].valve_cv"),
])
def test_an_underscore_in_a_number_is_refused_not_read_as_a_digit_separator(old, new, field):
    # Python reads "6_5" as 65; no one writes a measurement so (common practice: digits are
    # grouped with a comma or a thin space, ISO 80000-1, 7.3.1 — from memory). A K of 65
    # instead of 6.5 moved the branch's flow by 44 % with no word.
    from branchwise.core.site.build import build
    from branchwise.core.site.read import demo_text

    text = demo_text()
    assert old in text
    with pytest.raises(InputError) as caught:
        build(parse_site(text.replace(old, new, 1)))
    assert caught.value.field == field
    assert "_" in str(caught.value.value)


def test_a_number_beyond_a_float_is_quoted_as_typed():
    from branchwise.core.site.build import build
    from branchwise.core.site.read import demo_text

    with pytest.raises(InputError) as caught:
        build(parse_site(demo_text().replace("minor_k = 6.5", 'minor_k = "1e400"', 1)))
    assert str(caught.value).endswith("got 1e400")  # it said "got inf"
