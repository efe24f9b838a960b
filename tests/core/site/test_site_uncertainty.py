"""A site's [tolerances] table: reading, writing, bad values, and the bands it gives.

References named beside each check:
- NIST SP 811 (2008), appendix B: psi = 6.894 757 E+03 Pa, inch = 0.0254 m (exact); a
  temperature interval of 1 °F = 1/1.8 K and of 1 °C = 1 K (B.9 and 4.2.1.1).
- GUM, JCGM 100:2008: 4.3.7 (a ± a rectangular distribution has u = a/√3) and 5.1.2 (law of
  propagation: u(y) = |∂y/∂x| u(x) for one input).
- Fully rough Colebrook (von Kármán–Prandtl rough-pipe law, Nikuradse 1933): f does not depend
  on the flow, so Q = C √Δp exactly.
- Hagen–Poiseuille: laminar Q = π D⁴ Δp / (128 μ L), so Q ∝ 1/μ at a fixed Δp; water viscosity
  from the `iapws` package (IAPWS 2008).
- Sampling error of a quantile: sd = √(p(1−p)/N) / pdf(x_p).
"""

from __future__ import annotations

import math
import tomllib

import pytest

from branchwise.core.errors import InputError
from branchwise.core.messages import render
from branchwise.core.numerics.uncertainty import Tolerances
from branchwise.core.report.band import tolerance_text
from branchwise.core.site.build import build
from branchwise.core.site.read import DEMO_PATH, demo_text, load_site, parse_site
from branchwise.core.site.solve import solve_site, uncertainty_for_site
from branchwise.core.site.write import dump_site
from branchwise.core.units.display import restate

PSI = 6894.757  # Pa, NIST SP 811
INCH = 0.0254  # m, NIST SP 811 (exact)

ONE_PIPE = """format = 1
name = "Test line"

[fluid]
{fluid}

[conditions]
pressure_drop = "{dp}"
friction = "{friction}"

[[branches]]
name = "Line"
diameter = "{d}"
length = "{length}"
roughness = "{eps}"
{extra}"""

NO_OTHER_SPREAD = """
[tolerances]
flow_meter_accuracy = "0 %"
roughness_factor = [1, 1]
diameter = "0 %"
length = "0 %"
fitting_k = "0 %"
"""


def one_pipe(tolerances: str, fluid: str = 'kind = "water"\ntemperature = "20 degC"',
             dp: str = "50 kPa", friction: str = "colebrook", d: str = "100 mm",
             length: str = "40 m", eps: str = "0.045 mm", extra: str = "") -> str:
    return ONE_PIPE.format(fluid=fluid, dp=dp, friction=friction, d=d, length=length,
                           eps=eps, extra=extra) + tolerances


# ---- reading: units as typed --------------------------------------------------------------

def test_typed_tolerances_become_si_with_nist_factors():
    text = one_pipe("""
[tolerances]
gauge_accuracy = "0.5 %"
gauge_full_scale = "15 psid"
flow_meter_accuracy = "2.5 %"
target_flow_measured = false
roughness_factor = [0.8, 4]
roughness_range = { "line" = ["0.0018 in", "0.02 in"] }
diameter = "2 %"
length = "10 %"
temperature = "3.6 degF"
fitting_k = "30 %"
""")
    tol = build(parse_site(text)).tolerances
    assert tol.gauge_full_scale == pytest.approx(15 * PSI, rel=1e-6)  # NIST SP 811 psi
    assert tol.temperature_k == pytest.approx(2.0, rel=1e-12)  # 3.6 °F interval = 2 K (SP 811)
    assert tol.roughness_m == {"Line": pytest.approx((0.0018 * INCH, 0.02 * INCH), rel=1e-12)}
    assert (tol.gauge_percent, tol.flow_meter_percent, tol.diameter_percent,
            tol.length_percent, tol.fitting_k_percent) == (0.5, 2.5, 2.0, 10.0, 30.0)
    assert tol.roughness_factor == (0.8, 4.0) and tol.target_flow_measured is False


@pytest.mark.parametrize("typed", ['"2 K"', '"2 delta_degC"', '"2 degC"', '"2 °C"'])
def test_a_temperature_tolerance_is_an_interval_not_a_temperature(typed):
    # NIST SP 811, 4.2.1.1: an interval of 1 °C equals an interval of 1 K ("2 degC" is a step,
    # not the temperature 2 °C = 275.15 K).
    site = parse_site(one_pipe(f"\n[tolerances]\ntemperature = {typed}\n"))
    assert build(site).tolerances.temperature_k == pytest.approx(2.0, rel=1e-12)


def test_missing_keys_keep_the_defaults_and_no_table_means_defaults():
    site = parse_site(one_pipe('\n[tolerances]\nlength = "8 %"\n'))
    tol = build(site).tolerances
    assert tol == Tolerances(length_percent=8.0)  # the rest: the common-practice defaults
    assert build(parse_site(one_pipe(""))).tolerances is None


# ---- writing: the table survives a round trip, comments and all ---------------------------

def test_demo_tolerances_round_trip_with_comments():
    site = load_site(DEMO_PATH)
    assert site.tolerances is not None and site.tolerances.gauge_full_scale == "30 psid"
    assert dump_site(site) == demo_text()  # unchanged: byte for byte
    site.tolerances.length = "10 %"
    site.tolerances.roughness_range = {"AHU-3 coil": ["0.0018 in", "0.02 in"]}
    text = dump_site(site)
    assert "# of full scale: a class 1 differential gauge" in text
    assert "# chilled-water supply" in text
    doc = tomllib.loads(text)
    assert doc["tolerances"]["length"] == "10 %"
    assert doc["tolerances"]["roughness_range"] == {"AHU-3 coil": ["0.0018 in", "0.02 in"]}
    assert parse_site(text) == site
    site.tolerances = None
    assert "tolerances" not in tomllib.loads(dump_site(site))


def test_new_site_with_tolerances_round_trips_without_origin():
    site = parse_site(one_pipe("""
[tolerances]
roughness_factor = [1, 10]
[tolerances.roughness_range]
"Line" = ["0.05 mm", "0.5 mm"]
"""))
    assert dump_site(site).count("[tolerances") >= 1
    again = parse_site(dump_site(site))
    assert again == site
    site.origin = None
    assert parse_site(dump_site(site)) == site


# ---- bad values name tolerances.<key> -----------------------------------------------------

BAD = [
    ('gauge_accuracy = 1', "tolerances.gauge_accuracy", "percent sign"),
    ('gauge_accuracy = "1"', "tolerances.gauge_accuracy", "percent sign"),
    ('gauge_accuracy = "1 kPa"', "tolerances.gauge_accuracy", "is not a fraction"),
    ('gauge_accuracy = "-1 %"', "tolerances.gauge_accuracy", "not below zero"),
    ('gauge_accuracy = "100 %"', "tolerances.gauge_accuracy", "below 100"),
    ('flow_meter_accuracy = "100 %"', "tolerances.flow_meter_accuracy", "below 100"),
    ('fitting_k = "150 %"', "tolerances.fitting_k", "at most 100"),
    ('gauge_full_scale = "30 kPa"', "tolerances.gauge_full_scale", "below the pressure drop"),
    ('gauge_full_scale = "0 kPa"', "tolerances.gauge_full_scale", "positive"),
    ('gauge_full_scale = "250 m"', "tolerances.gauge_full_scale", "is not a pressure"),
    ("target_flow_measured = 1", "tolerances.target_flow_measured", "true or false"),
    ('target_flow_measured = "false"', "tolerances.target_flow_measured", "without quotes"),
    ("roughness_factor = [2, 1]", "tolerances.roughness_factor", "0 < low ≤ high"),
    ("roughness_factor = [3]", "tolerances.roughness_factor", "pair"),
    ('roughness_factor = "3"', "tolerances.roughness_factor", "pair"),
    ('roughness_factor = ["x", 2]', "tolerances.roughness_factor[0]", "plain number"),
    ('roughness_range = { "Tower" = ["0.1 mm", "1 mm"] }',
     'tolerances.roughness_range."Tower"', "no such branch"),
    ('roughness_range = { "Line" = ["0.1 kPa", "1 mm"] }',
     'tolerances.roughness_range."Line"[0]', "is not a roughness"),
    ('roughness_range = { "Line" = ["1 mm", "0.1 mm"] }',
     'tolerances.roughness_range."Line"', "0 < low ≤ high"),
    ('temperature = 2', "tolerances.temperature", "needs a unit"),
    ('temperature = "2"', "tolerances.temperature", "needs a unit"),
    ('temperature = "-2 K"', "tolerances.temperature", "not below zero"),
    ('temperature = "2 kPa"', "tolerances.temperature", "is not a temperature"),
    ('gauge_acuracy = "1 %"', "tolerances.gauge_acuracy", "did you mean 'gauge_accuracy'"),
]


@pytest.mark.parametrize(("line", "field", "reason"), BAD, ids=[b[0] for b in BAD])
def test_bad_tolerance_names_its_field(line, field, reason):
    with pytest.raises(InputError) as err:
        build(parse_site(one_pipe(f"\n[tolerances]\n{line}\n")))
    assert err.value.field == field
    assert reason in err.value.reason


@pytest.mark.parametrize(("line", "quoted"), [('gauge_accuracy = "-1 %"', "-1 %"),
                                             ('length = "200 %"', "200 %"),
                                             ('temperature = "-2 K"', "-2 K")])
def test_a_tolerance_out_of_bounds_is_quoted_as_typed(line, quoted):
    # It was quoted as the core read it ("got -1.0", "got 200.0").
    with pytest.raises(InputError) as err:
        build(parse_site(one_pipe(f"\n[tolerances]\n{line}\n")))
    assert str(err.value).endswith(f"got {quoted}")


def test_a_roughness_factor_reaching_half_the_bore_is_named_as_typed():
    # Colebrook is meaningless at ε ≥ D/2; the check runs when the bands are asked for.
    site = parse_site(one_pipe("\n[tolerances]\nroughness_factor = [1, 2000]\n"))
    with pytest.raises(InputError) as err:
        uncertainty_for_site(site, samples=100)
    assert err.value.field == "tolerances.roughness_factor"


# ---- the bands a site gives ---------------------------------------------------------------

def test_gauge_band_of_a_fully_rough_line_follows_root_dp_and_the_gum():
    # Fully rough (ε/D = 0.05; a custom liquid of tiny viscosity puts Re near 1e9): Q = C √Δp.
    # The reading is uniform on Δp ± a, a = 10 % of a 100 kPa full scale.
    fluid = 'kind = "custom"\ndensity = "1000 kg/m^3"\nviscosity = "1e-7 cP"'
    text = one_pipe(NO_OTHER_SPREAD + 'gauge_accuracy = "10 %"\ngauge_full_scale = "100 kPa"\n'
                    'temperature = "3 K"\n', fluid=fluid, eps="5 mm")
    res = uncertainty_for_site(parse_site(text), samples=4000, seed=3)
    dp, a = 50e3, 0.10 * 100e3
    q = res.outputs["total flow"]
    # every draw on the rough-pipe law: Q/Q0 = √(Δp/Δp0) (the drawn Δp is the drawn reading)
    ratio = res.draws["total flow"] / q.nominal
    root = (res.draws["pressure drop"] / dp) ** 0.5
    assert ratio == pytest.approx(root, rel=1e-6)
    assert res.draws["pressure drop"].min() >= dp - a and res.draws["pressure drop"].max() <= dp + a
    # P95 of Q at the reading's P95, Δp + 0.9 a; quantile sampling sd ≈ √(0.05·0.95/4000)·2a
    # in Δp, about 1.9e-3 of Q: 3.5 sd allowed
    assert q.p95 / q.nominal == pytest.approx(math.sqrt((dp + 0.9 * a) / dp), rel=6.5e-3)
    assert q.p5 / q.nominal == pytest.approx(math.sqrt((dp - 0.9 * a) / dp), rel=6.5e-3)
    # GUM: u(Q) = |dQ/dΔp| u(Δp) = Q/(2Δp) · a/√3 (JCGM 100:2008, 4.3.7 and 5.1.2)
    assert q.linear_sigma == pytest.approx(q.nominal / (2 * dp) * a / math.sqrt(3), rel=1e-4)
    assert res.ranking["total flow"] == [("pressure gauge", pytest.approx(1.0))]
    # a custom liquid has no temperature: the tolerance is left out, and the result says so
    assert not any(i.kind == "temperature" for i in res.inputs)
    assert any("temperature tolerance not applied" in n for n in res.notes)


def test_temperature_band_comes_from_the_site_water_model_and_matches_iapws():
    # Laminar, Δp fixed, no elevation: Q ∝ 1/μ (Hagen–Poiseuille); μ falls as T rises, so the
    # P95 of Q is at T0 + 0.9 δ. μ from `iapws` (IAPWS 2008); the band uses an ln-linear chord
    # of the site's model over T0 ± δ, whose curvature error at 2 K is below 1e-3; the
    # quantile's sampling error is about 2e-4.
    iapws = pytest.importorskip("iapws")
    text = one_pipe(NO_OTHER_SPREAD + 'gauge_accuracy = "0 %"\ntemperature = "3.6 degF"\n',
                    dp="1 kPa", friction="laminar", d="4 mm", length="2 m", eps="0 mm")
    res = uncertainty_for_site(parse_site(text), samples=4000, seed=5)
    q = res.outputs["total flow"]

    def mu(t_k: float) -> float:
        return iapws.IAPWS95(T=t_k, P=0.101325).mu

    t0, dt = 293.15, 2.0  # 20 °C; 3.6 °F interval = 2 K (NIST SP 811)
    assert q.p95 / q.nominal == pytest.approx(mu(t0) / mu(t0 + 0.9 * dt), rel=2e-3)
    assert q.p5 / q.nominal == pytest.approx(mu(t0) / mu(t0 - 0.9 * dt), rel=2e-3)
    assert res.ranking["total flow"][0][0] == "temperature"


def _laminar_water(temperature: str, tolerance: str | None) -> str:
    """One laminar pipe of water at ``temperature``; every spread but the temperature's off (a
    ``tolerance`` of None leaves the common-practice default, unwritten)."""
    written = f'temperature = "{tolerance}"\n' if tolerance is not None else ""
    return one_pipe(NO_OTHER_SPREAD + 'gauge_accuracy = "0 %"\n' + written,
                    fluid=f'kind = "water"\ntemperature = "{temperature}"',
                    dp="1 kPa", friction="laminar", d="4 mm", length="2 m", eps="0 mm")


def _laminar_band_by_viscosity(res, t0: float, low: float, high: float) -> str:
    """Check a laminar pipe's band (Δp fixed: Q ∝ 1/μ, rising with T) drawn uniformly over
    ``low``–``high`` K: its P5 and P95 at 5 % and 95 % of that range, μ from iapws (IAPWS
    2008; the chord's curvature error and the quantiles' sampling error each below 2e-3).
    Returns the note of the cut."""
    iapws = pytest.importorskip("iapws")

    def mu(t_k: float) -> float:
        return iapws.IAPWS95(T=t_k, P=0.101325).mu

    q = res.outputs["total flow"]
    for quantile, share in ((q.p5, 0.05), (q.p95, 0.95)):
        assert quantile / q.nominal == pytest.approx(mu(t0) / mu(low + share * (high - low)),
                                                     rel=2e-3)
    (note,) = [render(n) for n in res.notes if "temperature drawn" in n]
    return note


@pytest.mark.parametrize("written", [True, False], ids=["typed", "default"])
def test_a_temperature_tolerance_past_boiling_is_cut_at_the_boiling_point(written):
    # Water at 99 °C ± 2 K at 1 atm: the liquid in the pipe is below its boiling point, so the
    # temperature is drawn uniformly from 97 °C to the boiling point (the rectangular
    # distribution, given that the water is liquid), typed or not. Laminar, Δp fixed: Q ∝ 1/μ,
    # rising with T, so the P5 and P95 of Q sit at 5 % and 95 % of that range. References:
    # the boiling point from iapws (IAPWS-IF97 saturation temperature at 101.325 kPa), μ from
    # iapws (IAPWS 2008); the chord's curvature error over 3 K and the quantiles' sampling
    # error are each below 2e-3.
    iapws = pytest.importorskip("iapws")
    t_boil = iapws.iapws97._TSat_P(0.101325)
    site = parse_site(_laminar_water("99 degC", "2 K" if written else None))
    res = uncertainty_for_site(site, samples=4000, seed=5)
    low, high = 372.15 - 2.0, t_boil
    (temperature,) = [i for i in res.inputs if i.kind == "temperature"]
    t0 = 372.15
    assert t0 + temperature.centre - temperature.half_width == pytest.approx(low, abs=1e-9)
    assert t0 + temperature.centre + temperature.half_width == pytest.approx(high, abs=2e-3)
    note = _laminar_band_by_viscosity(res, t0, low, high)
    assert "97 °C – 99.97 °C only" in note and "boils at 99.97 °C" in note


def test_a_temperature_tolerance_below_freezing_is_cut_at_the_freezing_point():
    # Water at 1 °C ± 3 K: drawn from 0 °C (water freezes there at atmospheric pressure) to
    # 4 °C. μ from iapws (IAPWS 2008); laminar, Q ∝ 1/μ; P5 of Q at 0.2 °C, P95 at 3.8 °C.
    res = uncertainty_for_site(parse_site(_laminar_water("1 degC", "3 K")), samples=4000,
                               seed=5)
    note = _laminar_band_by_viscosity(res, 274.15, 273.15, 277.15)
    assert "0 °C – 4 °C only" in note and "freezes" in note


def test_a_tolerance_past_both_ends_is_cut_at_both_and_shown_as_drawn():
    # Water at 50 °C ± 60 K at 1 atm: drawn from 0 °C (freezing) to the boiling point, both
    # said; the ranking shows the range drawn from the nominal, not a ± it never drew, and the
    # JSON gives the range's centre. Boiling point from iapws (IAPWS-IF97 at 101.325 kPa).
    iapws = pytest.importorskip("iapws")
    t_boil = iapws.iapws97._TSat_P(0.101325)
    res = uncertainty_for_site(parse_site(_laminar_water("50 degC", "60 K")), samples=400,
                               seed=2)
    (note,) = [render(n) for n in res.notes if "temperature drawn" in n]
    assert "0 °C – 99.97 °C only" in note
    assert "freezes at 0 °C" in note and "boils at 99.97 °C" in note
    (temperature,) = [i for i in res.inputs if i.kind == "temperature"]
    t0 = 323.15
    low = t0 + temperature.centre - temperature.half_width
    high = t0 + temperature.centre + temperature.half_width
    assert low == pytest.approx(273.15, abs=1e-5) and high == pytest.approx(t_boil, abs=1e-5)
    assert tolerance_text(temperature) == "−50.0 … +50.0 K"  # −50 K … +49.97 K, 3 digits
    assert tolerance_text(temperature, "us") == "−90.0 … +90.0 °F"  # 1 K = 1.8 °F, exact


@pytest.mark.parametrize(("fluid", "limit"), [
    ('kind = "ethylene_glycol"\nconcentration = "30 %"\ntemperature = "95 degC"',
     "the tabulated range"),
    ('kind = "seawater"\nsalinity = "35 g/kg"\ntemperature = "1 degC"', "Sharqawy"),
])
def test_a_tolerance_past_a_property_model_s_range_is_not_cut(fluid, limit):
    # The glycol table ends at 100 °C and the seawater correlation at 0 °C, but the liquid
    # goes on (a 30 % glycol boils above 100 °C and seawater freezes near −1.9 °C at 35 g/kg:
    # both recalled from memory): no draw is cut there. Typed, the tolerance is refused,
    # naming the model's limit; as the unwritten default it is left out, with a note.
    typed = parse_site(one_pipe('\n[tolerances]\ntemperature = "10 K"\n', fluid=fluid))
    with pytest.raises(InputError) as err:
        uncertainty_for_site(typed, samples=100)
    assert err.value.field == "tolerances.temperature" and limit in str(err.value)
    near = fluid.replace('"95 degC"', '"99 degC"').replace('"1 degC"', '"0.5 degC"')
    res = uncertainty_for_site(parse_site(one_pipe("", fluid=near)), samples=100)
    assert not any(i.kind == "temperature" for i in res.inputs)
    assert any("temperature tolerance not applied" in n and limit in render(n)
               for n in res.notes)
    # The ± of the default (2 K, common practice: Tolerances) is a difference of
    # temperatures: 2 K, or 3.6 °F where temperatures are in °F (1 K = 1.8 °F, exact).
    note = next(n for n in res.notes if "not applied" in n)
    assert render(note).startswith("temperature tolerance not applied: ± 2 K ")
    assert restate(note, "us").startswith("temperature tolerance not applied: ± 3.6 °F ")
    assert restate(note, "si", {"temperature": "degF"}).startswith(
        "temperature tolerance not applied: ± 3.6 °F ")
    assert "± 2 K" in restate(note, "us", {"temperature": "K"})


@pytest.mark.parametrize(("system", "chosen", "note", "row"), [
    ("si", None, "± 2 K", "± 2.00 K"),
    ("us", None, "± 3.6 °F", "± 3.60 °F"),
    ("si", "degF", "± 3.6 °F", "± 3.60 °F"),
    ("si", "°F", "± 3.6 °F", "± 3.60 °F"),  # as a settings file may spell it
    ("us", "K", "± 2 K", "± 2.00 K"),
    ("us", "degC", "± 2 K", "± 2.00 K"),  # a degree Celsius is a kelvin
    ("si", "degR", "± 3.6 degR", "± 3.60 degR"),  # a degree Rankine is a degree Fahrenheit
])
def test_a_temperature_difference_is_in_the_degrees_temperatures_are_shown_in(
        system, chosen, note, row):
    # The note of a tolerance left out and the band's row of a tolerance drawn read the same
    # difference in the same unit: 1 K = 1.8 °F = 1.8 °R, by the scales' definitions.
    from branchwise.core.messages import temperature_difference_text
    from branchwise.core.numerics.sampling import InputTolerance
    from branchwise.core.units import Units

    chosen_units = {"temperature": chosen} if chosen else {}
    assert restate(f"± {temperature_difference_text(2.0)}", system, chosen_units) == note
    drawn = InputTolerance("temperature", "temperature", 2.0)
    assert tolerance_text(drawn, Units(system, chosen_units)) == row


def test_site_bands_are_ordered_seeded_and_hold_the_solve(capsys):
    site = load_site(DEMO_PATH)
    sr = solve_site(site)
    one = uncertainty_for_site(site, samples=1000, seed=11)
    assert one.to_dict() == uncertainty_for_site(site, samples=1000, seed=11).to_dict()
    assert capsys.readouterr() == ("", "")  # pure: nothing printed
    assert one.outputs["total flow"].nominal == pytest.approx(sr.result.total_flow, rel=1e-12)
    for name, b in one.outputs.items():
        assert b.p5 <= b.p50 <= b.p95 and b.p5 <= b.nominal <= b.p95, name
    gauge = next(i for i in one.inputs if i.kind == "gauge")
    assert gauge.half_width == pytest.approx(0.01 * 30 * PSI, rel=1e-6)  # 1 % of 30 psid
    # explicit tolerances replace the site's table
    narrow = uncertainty_for_site(site, samples=1000, seed=11,
                                  tolerances=Tolerances(gauge_percent=0.1))
    assert next(i for i in narrow.inputs if i.kind == "gauge").half_width == pytest.approx(
        0.001 * 10 * PSI, rel=1e-6)  # percent of the 10 psid reading without a full scale


def test_a_band_with_negative_ends_reads_without_a_double_dash(monkeypatch):
    # A reverse flow has negative band ends: "-6.27 to -4.14", never "-6.27–-4.14".
    from branchwise.core.report import band as bandtext

    monkeypatch.setattr(bandtext, "band_range", lambda sr, name, system: (-6.273, -4.139))
    assert bandtext.flow_band_cell(None, "A") == "-6.273 to -4.139"
    monkeypatch.setattr(bandtext, "band_range", lambda sr, name, system: (4.139, 6.273))
    assert bandtext.flow_band_cell(None, "A") == "4.139–6.273"


@pytest.mark.parametrize("given", ["pressure_drop", "total_flow", "AHU-3 coil", "all"])
def test_a_full_scale_below_the_gauges_reading_is_refused_whatever_the_given(given):
    # A gauge cannot read past its full scale (common practice); "30 kPa" for a 0–30 psid
    # dial is a unit slip. Beside another given the gauge is still weighed, and a full scale
    # of 30 kPa (for 206.8 kPa) made it about 7× too precise.
    text = demo_text().replace('gauge_full_scale = "30 psid"', 'gauge_full_scale = "30 kPa"')
    text = text.replace('friction = "colebrook"', 'friction = "colebrook"\n'
                        f'total_flow = "620 gpm"\ngiven = "{given}"')
    text = text.replace('# measured_flow = "80 gpm"', 'measured_flow = "77 gpm"')
    with pytest.raises(InputError) as err:
        build(parse_site(text))
    assert err.value.field == "tolerances.gauge_full_scale"
    assert "below the pressure drop read on the gauge" in err.value.reason


def test_under_hazen_williams_the_band_says_the_pipes_condition_is_not_drawn():
    # Under Hazen–Williams a line's condition is its C; no tolerance draws C, and the roughness
    # factor does not apply: the band must say it leaves the ageing out (it said nothing, and
    # a roughness factor of [0.1, 10] gave the same band as [0.5, 3]).
    text = demo_text().replace('friction = "colebrook"', 'friction = "hazen-williams"')
    text = text.replace('roughness = "0.0018 in"', 'roughness = "0.0018 in"\nhw_c = 120')
    res = uncertainty_for_site(parse_site(text), samples=200, seed=1)
    assert not any(i.kind == "roughness" for i in res.inputs)
    assert any("condition is not drawn" in n and "Hazen–Williams" in n for n in res.notes)


def test_a_roughness_range_that_leaves_out_the_entered_roughness_is_said():
    # The band is then of another line than the answer (a band of 3.36–3.80 L/s beside an
    # answer of 4.85 L/s, with no word).
    text = demo_text().replace(
        '# roughness_range = { "AHU-3 coil" = ["0.0018 in", "0.02 in"] }',
        'roughness_range = { "AHU-3 coil" = ["1 mm", "2 mm"] }')
    assert 'roughness_range = { "AHU-3 coil" = ["1 mm", "2 mm"] }' in text
    res = uncertainty_for_site(parse_site(text), samples=200, seed=1)
    said = [render(n) for n in res.notes if "does not hold the roughness entered" in n]
    assert len(said) == 1 and "AHU-3 coil" in said[0] and "1 mm … 2 mm" in said[0]
    assert "0.04572 mm" in said[0]  # 0.0018 in = 0.04572 mm (NIST SP 811: 1 in = 25.4 mm)
    inside = demo_text().replace(
        '# roughness_range = { "AHU-3 coil" = ["0.0018 in", "0.02 in"] }',
        'roughness_range = { "AHU-3 coil" = ["0.0018 in", "0.02 in"] }')
    notes = uncertainty_for_site(parse_site(inside), samples=200, seed=1).notes
    assert not any("does not hold" in n for n in notes)


def test_a_roughness_range_ending_at_the_entered_roughness_in_another_unit_holds_it():
    # 0.045 mm = 0.000045 m (SI prefixes, exact): no note from the round-off of a conversion.
    text = demo_text().replace(
        '# roughness_range = { "AHU-3 coil" = ["0.0018 in", "0.02 in"] }',
        'roughness_range = { "AHU-3 coil" = ["0.000045 m", "0.0002 m"] }')
    text = text.replace('roughness = "0.0018 in"', 'roughness = "0.045 mm"')
    notes = uncertainty_for_site(parse_site(text), samples=200, seed=1).notes
    assert not any("does not hold" in n for n in notes)
