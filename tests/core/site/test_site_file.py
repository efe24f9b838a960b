"""Site files: every solve direction through a file equals the core solve of a network built by
hand; reading, writing (comments kept, never a silent overwrite) and the demo site.

The hand-built networks convert units with the exact definitions behind NIST SP 811 (2008)
written out in the test (inch = 0.0254 m, foot = 0.3048 m, US gallon = 231 in³, pound = 0.453 592 37
kg with standard gravity 9.806 65 m/s², cP = 1E-3 Pa·s), never through branchwise's unit module.
"""

from __future__ import annotations

import tomllib

import numpy as np
import pytest
from fluids.fittings import Cv_to_Kv  # exact Cv/Kv from the gallon and the psi (fluids docs)

from branchwise.core import catalogs
from branchwise.core.errors import InputError
from branchwise.core.model import (
    Branch,
    FindFlows,
    FindUnknown,
    Fluid,
    MeasuredFlow,
    Network,
    PressureDrop,
    Segment,
    TotalFlow,
    branch,
)
from branchwise.core.numerics.solve import solve
from branchwise.core.site.read import (
    DEMO_PATH,
    demo_site,
    demo_text,
    load_site,
    parse_site,
)
from branchwise.core.site.solve import solve_site
from branchwise.core.site.write import dump_site, save_site

INCH, FOOT = 0.0254, 0.3048                      # NIST SP 811: exact
GALLON = 231 * INCH**3                           # US gallon = 231 in³ (≈ 3.785 412 E-03 m³)
PSI = 0.45359237 * 9.80665 / INCH**2             # lbf/in² (≈ 6.894 757 E+03 Pa)
CP = 1e-3                                        # NIST SP 811: centipoise, exact

SITE = """
format = 1
name = "Test header"

[fluid]
kind = "custom"
density = "998.2 kg/m^3"
viscosity = "1.0016 cP"

[conditions]
{given}
elevation_change = "1.5 m"

[[branches]]
name = "A"
diameter = "102.26 mm"
length = "64 m"
roughness = "0.045 mm"
minor_k = 6.2
{measured}

[[branches]]
name = "B"
diameter = "3.068 in"
length = "250 ft"
roughness = "0.0018 in"
valve_cv = 90

[[branches]]
name = "C"
segments = [
    {{ diameter = "2.067 in", length = "30 m", roughness = "0.045 mm", minor_k = 2 }},
    {{ diameter = "52.5 mm", length = "12 m", roughness = "0.1 mm" }},
]
{solve}
"""

GIVEN_TEXT = {
    "pressure_drop": ('pressure_drop = "11.5 psi"', ""),
    "total_flow": ('total_flow = "400 gpm"', ""),
    "measured_flow": ("", 'measured_flow = "12 L/s"'),
}
GIVEN_SI = {
    "pressure_drop": PressureDrop(11.5 * PSI),
    "total_flow": TotalFlow(400 * GALLON / 60),
    "measured_flow": MeasuredFlow("A", 12e-3),
}


def network_by_hand() -> Network:
    fluid = Fluid("Custom fluid", 998.2, 1.0016 * CP)
    return Network(
        fluid,
        (
            branch("A", 0.10226, 64.0, 0.045e-3, 6.2),
            branch("B", 3.068 * INCH, 250 * FOOT, 0.0018 * INCH, valve_kv=Cv_to_Kv(90)),
            Branch("C", (Segment(2.067 * INCH, 30.0, 0.045e-3, 2.0),
                         Segment(0.0525, 12.0, 0.1e-3, 0.0))),
        ),
        elevation_change=1.5,
    )


def site_text(given: str, find: str = "flows", target: float | None = None,
              branch_name: str = "B", segment: int = 1) -> str:
    cond, measured = GIVEN_TEXT[given]
    solve_table = ""
    if find != "flows":
        solve_table = (f'[solve]\nfind = "{find}"\nbranch = "{branch_name}"\n'
                       f'target_flow = "{float(target) * 1000!r} L/s"\nsegment = {segment}\n')
    return SITE.format(given=cond, measured=measured, solve=solve_table)


@pytest.mark.parametrize("given", list(GIVEN_TEXT))
def test_flows_through_a_site_file_match_the_core(given):
    got = solve_site(parse_site(site_text(given))).result
    want = solve(network_by_hand(), GIVEN_SI[given], FindFlows())
    np.testing.assert_allclose(got.flows, want.flows, rtol=1e-9)
    assert got.pressure_drop == pytest.approx(want.pressure_drop, rel=1e-9)


# target flow as a multiple of the branch's flow in the plain solve: more flow needs a wider or
# shorter pipe; less flow needs a rougher one
FINDS = [("diameter", "B", 1, 1.2), ("length", "B", 1, 1.1), ("roughness", "B", 1, 0.95),
         ("diameter", "C", 2, 1.1), ("length", "C", 1, 1.05)]


@pytest.mark.parametrize("given", list(GIVEN_TEXT))
@pytest.mark.parametrize(("find", "name", "segment", "factor"), FINDS)
def test_every_unknown_through_a_site_file_matches_the_core(given, find, name, segment, factor):
    net = network_by_hand()
    base = solve(net, GIVEN_SI[given], FindFlows())
    target = factor * base.flows[net.index_of(name)]
    got = solve_site(parse_site(site_text(given, find, target, name, segment))).result
    want = solve(net, GIVEN_SI[given], FindUnknown(find, name, target, segment - 1))
    assert got.solved is not None and want.solved is not None
    assert got.solved.value == pytest.approx(want.solved.value, rel=1e-9)
    np.testing.assert_allclose(got.flows, want.flows, rtol=1e-9)


def test_catalog_size_rounds_up_within_the_same_schedule_and_is_resolved():
    # ASME B36.10M Schedule 40 inner diameters (OD − 2·wall): NPS 3: 88.9 − 2·5.49 = 77.92 mm,
    # NPS 3-1/2: 101.6 − 2·5.74 = 90.12 mm, NPS 4: 114.3 − 2·6.02 = 102.26 mm.
    text = site_text("pressure_drop").replace('diameter = "3.068 in"', 'size = "3 in sch 40"')
    text = text.replace('roughness = "0.0018 in"', 'material = "commercial-steel"')
    net = network_by_hand()
    base = solve(net, GIVEN_SI["pressure_drop"], FindFlows()).flows[1]
    sr = solve_site(parse_site(text.replace("\n\n[[branches]]\nname = \"C\"", "\n\n[solve]\n"
                    f'find = "diameter"\nbranch = "B"\ntarget_flow = "{1.25 * base * 1000} L/s"'
                    '\n\n[[branches]]\nname = "C"', 1)))
    found = sr.result.solved.value
    assert 0.07792 < found <= 0.10226
    expected_id = 0.09012 if found <= 0.09012 else 0.10226
    assert sr.catalog is not None
    assert sr.catalog.size.inner_diameter_m == pytest.approx(expected_id, abs=1e-6)
    resized = sr.built.network.replace_branch(1, Branch("B", (Segment(
        expected_id, 250 * FOOT, 0.045e-3, 0.0),), Cv_to_Kv(90)))
    again = solve(resized, GIVEN_SI["pressure_drop"], FindFlows())
    assert sr.catalog.flow == pytest.approx(again.flows[1], rel=1e-9)
    assert sr.catalog.flow >= 1.25 * base * (1 - 1e-9)  # a larger bore carries at least the target


def test_fittings_add_crane_k_at_the_segment_bore():
    from fluids.fittings import K_gate_valve_Crane
    from fluids.friction import ft_Crane

    text = site_text("pressure_drop").replace(
        "minor_k = 6.2", "minor_k = 6.2\nfittings = { elbow-90 = 4, gate-valve = 2 }")
    built = solve_site(parse_site(text)).built
    k = built.network.branches[0].segments[0].minor_k - 6.2
    # Crane TP-410 via the fluids package: standard elbow K = 30 f_T, gate valve fully open;
    # within 1 % (the catalog computes f_T by Crane's formula at the Sch 40 bore).
    d = 0.10226
    assert k == pytest.approx(4 * 30 * ft_Crane(d) + 2 * K_gate_valve_Crane(d, d, 0), rel=0.01)


def test_water_by_kind_and_temperature_uses_the_fluid_models():
    from iapws import IAPWS97

    text = site_text("pressure_drop").replace(
        'kind = "custom"\ndensity = "998.2 kg/m^3"\nviscosity = "1.0016 cP"',
        'kind = "water"\ntemperature = "68 degF"')
    fluid = solve_site(parse_site(text)).result.network.fluid
    ref = IAPWS97(T=293.15, P=0.101325)  # 68 °F = 20 °C; IAPWS-IF97 via the iapws package
    assert fluid.density == pytest.approx(ref.rho, rel=1e-5)
    assert fluid.viscosity == pytest.approx(ref.mu, rel=1e-3)


# ---- reading and writing ----------------------------------------------------------------

def test_dump_of_an_unchanged_site_is_the_file_itself():
    assert dump_site(load_site(DEMO_PATH)) == demo_text()


def test_edits_keep_comments_and_other_lines():
    site = load_site(DEMO_PATH)
    site.branches[0].segments[0].length = "70 m"
    site.conditions.pressure_drop = None
    site.branches[2].measured_flow = "80 gpm"
    text = dump_site(site)
    assert "# chilled-water supply" in text and "# coil and control valve together" in text
    doc = tomllib.loads(text)
    assert doc["branches"][0]["length"] == "70 m"
    assert "pressure_drop" not in doc["conditions"]
    assert doc["branches"][2]["measured_flow"] == "80 gpm"
    assert parse_site(text) == site


def test_round_trip_of_branch_changes():
    site = demo_site()
    site.branches.pop(1)
    site.branches[0].segments.append(site.branches[0].segments[0].__class__(
        diameter="50 mm", length="3 m", roughness="0.01 mm"))
    again = parse_site(dump_site(site))
    assert again == site
    assert len(again.branches[0].segments) == 2


def test_new_site_without_origin_round_trips():
    site = demo_site()
    site.origin = None
    text = dump_site(site)
    assert text.startswith("# branchwise site file")
    assert parse_site(text) == site


def test_save_refuses_to_overwrite_another_file(tmp_path):
    target = tmp_path / "other.toml"
    target.write_text("format = 1\nname = 'someone else'\n")
    with pytest.raises(InputError, match="already exists"):
        save_site(demo_site(), target)
    assert target.read_text() == "format = 1\nname = 'someone else'\n"
    save_site(demo_site(), target, overwrite=True)
    assert load_site(target) == demo_site()
    assert (tmp_path / "other.toml.bak").read_text() == "format = 1\nname = 'someone else'\n"


def test_save_back_to_its_own_file_but_not_after_an_outside_edit(tmp_path):
    path = tmp_path / "site.toml"
    site = demo_site()
    save_site(site, path)
    site.name = "Renamed"
    save_site(site, path)  # its own file, unchanged on disk since: fine
    assert load_site(path).name == "Renamed"
    path.write_text(path.read_text().replace("Renamed", "Edited elsewhere"))
    site.name = "Mine"
    with pytest.raises(InputError, match="changed since it was read"):
        save_site(site, path)
    assert "Edited elsewhere" in path.read_text()


def test_demo_site_is_realistic():
    sr = solve_site(demo_site())
    r = sr.result
    # common practice for chilled water: 1–3 m/s; a header Δp of 50–100 kPa
    assert 50e3 <= r.pressure_drop <= 100e3
    for b in r.branches:
        for s in b.segments:
            assert 1.0 <= s.velocity <= 3.0, b.name
    assert not r.warnings
    assert "made-up" in demo_text()


def test_demo_measured_flow_toggle_and_solve_example_work():
    text = demo_text().replace('pressure_drop = "10 psid"', '# pressure_drop = "10 psid"')
    text = text.replace('# measured_flow = "80 gpm"', 'measured_flow = "80 gpm"')
    text = text.replace("# [solve]", "[solve]").replace('# find = "diameter"', 'find = "diameter"')
    text = text.replace('# branch = "', 'branch = "').replace('# target_flow', 'target_flow')
    sr = solve_site(parse_site(text))
    assert isinstance(sr.built.given, MeasuredFlow)
    assert sr.result.solved is not None and sr.result.solved.quantity == "diameter"


def test_site_paths_in_errors():
    text = site_text("pressure_drop").replace('length = "250 ft"', 'length = "-250 ft"')
    with pytest.raises(InputError) as caught:
        solve_site(parse_site(text))
    assert caught.value.field == "branches[1].length"
    text = site_text("pressure_drop").replace('length = "12 m"', 'length = "12 kPa"')
    with pytest.raises(InputError) as caught:
        solve_site(parse_site(text))
    assert caught.value.field == "branches[2].segments[1].length"


def test_catalog_keyword_free_size_is_a_plain_inner_diameter():
    text = site_text("pressure_drop").replace('diameter = "102.26 mm"', 'size = "102.26 mm"')
    built = solve_site(parse_site(text)).built
    assert built.network.branches[0].segments[0].diameter == pytest.approx(0.10226)
    assert built.sizes[0][0] is None
    assert catalogs.parse_size("102.26 mm") is None


class Presets:
    """A stand-in for the user's preset store: one saved fluid, bare numbers in SI."""

    def get(self, kind: str, key: str) -> dict:
        if (kind, key) == ("fluids", "brine-22"):
            return {"kind": "custom", "name": "Brine 22", "density": 1180.0,
                    "viscosity": "2.1 cP"}
        raise InputError(f"{kind}.{key}", key, "no such preset")


def test_fluid_preset_key_with_site_values_on_top():
    from branchwise.core.site.build import build

    text = site_text("pressure_drop").replace('kind = "custom"', 'kind = "brine-22"')
    site = parse_site(text.replace('density = "998.2 kg/m^3"\n', ""))
    fluid = build(site, Presets()).network.fluid
    assert (fluid.name, fluid.density, fluid.viscosity) == ("Brine 22", 1180.0,
                                                            pytest.approx(1.0016e-3))
    with pytest.raises(InputError, match="fluid.kind"):
        build(parse_site(text.replace("brine-22", "brine-99")), Presets())


def test_aged_material_and_hazen_williams_c_come_from_the_material():
    from branchwise.core.site.build import build

    text = site_text("pressure_drop").replace(
        'roughness = "0.0018 in"', 'material = "commercial-steel"\ncondition = "aged"')
    seg = build(parse_site(text)).network.branches[1].segments[0]
    steel = catalogs.material("commercial-steel")
    assert seg.roughness == steel.aged_roughness_m > steel.roughness_m
    assert seg.hw_c == steel.hazen_williams_c
    with pytest.raises(InputError, match=r"branches\[1\].condition"):
        build(parse_site(text.replace('"aged"', '"rusty"')))


def test_a_hazen_williams_c_alone_is_told_why_a_roughness_is_still_needed():
    """Below Re 4000 the Hazen–Williams fit does not apply (it is a fit for turbulent water
    flow: Williams & Hazen, Hydraulic Tables, 1905/1920; common practice), so the loss there
    comes from Darcy–Weisbach and needs ε."""
    text = """
format = 1
name = "HW"
[fluid]
kind = "water"
temperature = "15 degC"
[conditions]
pressure_drop = "50 kPa"
friction = "hazen-williams"
[[branches]]
name = "A"
diameter = "100 mm"
length = "30 m"
hw_c = 120
"""
    with pytest.raises(InputError) as err:
        solve_site(parse_site(text))
    assert err.value.field == "branches[0].roughness"
    assert "Hazen–Williams C covers turbulent flow only" in str(err.value)
