"""Wall materials against the roughness tables in `fluids.friction` (PyPI, Caleb Bell).

fluids.friction.material_roughness holds Moody (1944) in metres; fluids.friction.HHR_roughness
holds Idel'chik's Handbook of Hydraulic Resistance as (min, max, typical) in metres;
fluids.friction.roughness_Farshad holds Farshad & Rieke's measured linings.
"""

from __future__ import annotations

import re

import pytest
from fluids.friction import HHR_roughness, material_roughness, roughness_Farshad

from branchwise.core.catalogs import material, materials, sizes, standards
from branchwise.core.errors import InputError

# Our values are Moody's feet figures rounded to two significant figures in mm: within 2 %.
MOODY = [
    ("copper", "roughness_m", "Brass"),
    ("galvanised", "roughness_m", "Galvanized iron"),
    ("cast-iron", "roughness_m", "Cast iron"),
    ("asphalted-cast-iron", "roughness_m", "Asphalted cast iron"),
    ("concrete", "roughness_m", "Concrete"),
    ("concrete", "aged_roughness_m", "Rough concrete"),
    ("riveted-steel", "roughness_m", "Riveted steel"),
    ("riveted-steel", "aged_roughness_m", "Rough riveted steel"),
    ("wood-stave", "roughness_m", "Wood stave"),
    ("wood-stave", "aged_roughness_m", "Rough wood stave"),
]


@pytest.mark.parametrize(("key", "attribute", "moody_name"), MOODY)
def test_roughness_matches_moody_in_fluids(key, attribute, moody_name):
    ours = getattr(material(key), attribute)
    # The table rounds Moody's feet to the millimetres the trade quotes (0.00015 ft = 0.0457 mm
    # written 0.045 mm): measured at most 1.64 % apart, the tolerance just above.
    assert ours == pytest.approx(material_roughness(moody_name), rel=0.017)


def test_commercial_steel():
    steel = material("commercial-steel")
    # Moody (1944): commercial steel 0.00015 ft (from memory; not in fluids' Moody table).
    assert steel.roughness_m == pytest.approx(0.00015 * 0.3048, rel=0.016)  # 0.045 mm: 1.57 %
    # Idel'chik: new, unused seamless steel tubes 0.02-0.1 mm.
    low, high, _ = HHR_roughness["Seamless steel tubes, New and unused"]
    assert low <= steel.roughness_m <= high
    # Idel'chik: seamless steel tubes, moderately corroded, 0.4 mm.
    assert steel.aged_roughness_m == HHR_roughness["Seamless steel tubes, Corroded, moderately"][2]


def test_aged_and_lined_values_from_idelchik_and_farshad():
    aged_ci = HHR_roughness["Cast-iron tubes, Used water pipelines"][2]
    assert material("cast-iron").aged_roughness_m == pytest.approx(aged_ci, rel=1e-12)
    low, high, _ = HHR_roughness[
        "Seamless steel tubes, Following multiple years of operation, generally corroded or with "
        "small amounts of scale"
    ]
    assert low <= material("galvanised").aged_roughness_m <= high
    low, high, _ = HHR_roughness[
        "Steel water conduits in generating stations, New, clean, seamless (without joints), "
        "well fitted"
    ]
    assert low <= material("stainless").roughness_m <= high
    cement = roughness_Farshad("Cement lining")
    assert material("ductile-iron-cement-lined").roughness_m == pytest.approx(cement, rel=1e-12)


def test_plastics_and_copper_are_smooth():
    # Field notes (common practice): plastics about 0.0015-0.007 mm; drawn tubing 0.0015 mm.
    for key in ("pvc", "pe"):
        assert 0.0015e-3 <= material(key).roughness_m <= 0.007e-3
    glass = material_roughness("Glass")  # Moody: drawn tubing, glass 0.000005 ft
    assert material("copper").roughness_m == pytest.approx(glass, rel=0.014)  # 1.5 µm: 1.32 %


def test_hazen_williams_c_is_common_practice():
    # Field notes (common practice): about 150 plastic and copper, 130-140 new steel.
    assert material("pvc").hazen_williams_c == 150
    assert material("pe").hazen_williams_c == 150
    assert 130 <= material("copper").hazen_williams_c <= 150
    assert 130 <= material("commercial-steel").hazen_williams_c <= 140
    for m in materials():
        assert m.hazen_williams_c is None or 90 <= m.hazen_williams_c <= 155, m.key


def test_every_value_names_its_source():
    for m in materials():
        assert re.fullmatch(r"[a-z]+(-[a-z]+)*", m.key), m.key
        assert "roughness:" in m.source and "aged:" in m.source, m.key
        if m.aged_roughness_m is not None:
            assert m.aged_roughness_m > m.roughness_m, m.key
        if m.hazen_williams_c is not None:
            assert "Hazen-Williams C:" in m.source, m.key


def test_every_pipe_catalog_points_at_a_known_material():
    for standard in standards():
        for schedule_size in sizes(standard, _any_schedule(standard))[:1]:
            assert material(schedule_size.material_hint).key == schedule_size.material_hint


def _any_schedule(standard: str) -> str:
    from branchwise.core.catalogs.pipes import table

    return next(iter(table(standard).schedules))


def test_lookup_forgives_case_spaces_and_aliases():
    assert material("Cast Iron").key == "cast-iron"
    assert material("galvanized").key == "galvanised"
    assert material("HDPE").key == "pe"
    assert material("carbon_steel").key == "commercial-steel"


def test_unknown_material_lists_close_keys():
    with pytest.raises(InputError) as info:
        material("cast iorn", field="branches[0].material")
    err = info.value
    assert err.field == "branches[0].material" and err.value == "cast iorn"
    assert "cast-iron" in err.reason
    with pytest.raises(InputError) as info:
        material("unobtainium")
    assert "commercial-steel" in info.value.reason  # no close match: lists every key
