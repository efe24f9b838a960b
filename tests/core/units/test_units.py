"""Units at the boundary: conversions checked against NIST SP 811, and every kind of bad text.

Reference: B. N. Taylor and A. Thompson, NIST Special Publication 811 (2008 edition), "Guide for
the Use of the International System of Units", Appendix B.8 (factors in alphabetical order) and
B.9 (factors by kind of quantity). Factors there are exact or rounded to 7 significant digits
(6 for the water columns), hence the relative tolerances below.
"""

from __future__ import annotations

import math

import pytest
from hypothesis import given
from hypothesis import strategies as st

from branchwise.core import units
from branchwise.core.errors import InputError

EXACT = 1e-12
SEVEN_DIGITS = 1e-6  # a factor printed to 7 significant digits is within 5e-7 of the truth
SIX_DIGITS = 2e-6

NIST_SP811 = [
    # text, kind, SI value per NIST SP 811 (2008) App. B, tolerance
    ("1 in", "length", 2.54e-2, EXACT),                     # inch = 2.54 E-02 m (exact)
    ('1"', "diameter", 2.54e-2, EXACT),                     # inch, drawing notation
    ("1 ft", "length", 3.048e-1, EXACT),                    # foot = 3.048 E-01 m (exact)
    ("1 psi", "pressure", 6.894757e3, SEVEN_DIGITS),        # pound-force per square inch
    ("1 psid", "pressure", 6.894757e3, SEVEN_DIGITS),       # the same, differential
    ("1 gal/min", "flow", 6.309020e-5, SEVEN_DIGITS),       # gallon [U.S.] per minute
    ("1 gpm", "flow", 3.785412e-3 / 60, SEVEN_DIGITS),      # gallon [U.S.] = 3.785 412 E-03 m³
    ("1 USgpm", "flow", 3.785412e-3 / 60, SEVEN_DIGITS),
    ("1 L/s", "flow", 1.0e-3, EXACT),                       # liter = 1.0 E-03 m³
    ("1 m3/h", "flow", 1 / 3600, EXACT),
    ("1 cP", "viscosity", 1.0e-3, EXACT),                   # centipoise = 1.0 E-03 Pa·s
    ("1 cSt", "kinematic_viscosity", 1.0e-6, EXACT),        # centistokes = 1.0 E-06 m²/s
    ("1 bar", "pressure", 1.0e5, EXACT),                    # bar = 1.0 E+05 Pa
    ("1 ftH2O", "pressure", 2.98898e3, SIX_DIGITS),         # foot of water (39.2 °F)
    ("1 inH2O", "pressure", 2.49082e2, SIX_DIGITS),         # inch of water (39.2 °F)
    ("1 cmH2O", "pressure", 9.80638e1, SIX_DIGITS),         # centimeter of water (4 °C)
    ("1 lb/ft^3", "density", 1.601846e1, SEVEN_DIGITS),     # pound per cubic foot
    ("1 ft/s", "velocity", 3.048e-1, EXACT),                # foot per second (exact)
    ("1 mil", "roughness", 2.54e-5, EXACT),                 # mil (0.001 in) = 2.54 E-05 m
]


@pytest.mark.parametrize(("text", "kind", "si", "rel"), NIST_SP811)
def test_factor_matches_nist_sp811(text, kind, si, rel):
    assert units.parse_quantity(text, kind, "f") == pytest.approx(si, rel=rel)


@pytest.mark.parametrize(("fahrenheit", "kelvin"), [
    # NIST SP 811 (2008) B.9: T/K = (t/°F + 459.67)/1.8
    (32.0, 273.15), (65.0, (65 + 459.67) / 1.8), (-40.0, 233.15), (212.0, 373.15),
])
def test_fahrenheit_to_kelvin(fahrenheit, kelvin):
    assert units.parse_quantity(f"{fahrenheit} degF", "temperature", "t") == pytest.approx(
        kelvin, abs=1e-9)


@pytest.mark.parametrize(("text", "kelvin"), [
    ("18 degC", 291.15), ("18 °C", 291.15), ("0 degC", 273.15),  # NIST SP 811: T = t + 273.15
    ("-5.5 degC", 267.65), ("300 K", 300.0),
])
def test_celsius_offset_unit_is_split_from_the_number(text, kelvin):
    assert units.parse_quantity(text, "temperature", "t") == pytest.approx(kelvin, abs=1e-12)


def test_bare_number_takes_the_default_unit_given_by_the_caller():
    # 12 ft by the NIST inch-pound definition (foot = 0.3048 m exactly)
    assert units.parse_quantity(12, "length", "l", default_unit="ft") == pytest.approx(3.6576)
    assert units.parse_quantity("12", "length", "l", default_unit="ft") == pytest.approx(3.6576)
    assert units.parse_quantity("30 %", "fraction", "c") == pytest.approx(0.30)
    assert units.parse_quantity(0.3, "fraction", "c") == pytest.approx(0.30)


@pytest.mark.parametrize(("text", "kind", "reason"), [
    ("12 ft", "pressure", "is not a pressure"),     # a height in a pressure field
    ("64 kPa", "length", "is not a length"),
    ("68", "pressure", "needs a unit"),
    (68.0, "pressure", "needs a unit"),
    ("", "length", "is empty"),
    ("   ", "length", "is empty"),
    ("abc", "length", "must start with a number"),
    ("nan m", "length", "must start with a number"),
    (float("nan"), "length", "finite"),
    (float("inf"), "length", "finite"),
    ("1e400 m", "length", "finite"),
    ("1e308 km", "length", "too large"),            # finite number, overflows in conversion
    ("3 furlongz", "length", "unknown unit 'furlongz'"),
    ("3 FT", "length", "did you mean 'ft'"),  # kpa, KPA are read (aliases)
    ("3 m**", "length", "power"),
    ("3 ((m", "length", "incomplete"),
    ("3 m)", "length", "parentheses"),
    ("3 m\x00", "length", "cannot appear"),
    ("3 Pa/0", "pressure", "number"),
    ("1,5 bar", "pressure", "decimal point"),
    ("3 m.__class__", "length", "cannot appear"),
    ("3 m^99", "length", "power"),
    ("3 degC*m", "temperature", "not a temperature"),
    (True, "length", "number with a unit"),
    ([1, 2], "length", "number with a unit"),
])
def test_bad_text_is_an_input_error_naming_field_and_value(text, kind, reason):
    with pytest.raises(InputError) as caught:
        units.parse_quantity(text, kind, "branches[1].length")
    message = str(caught.value)
    assert message.startswith("branches[1].length: ")
    assert reason in message
    assert "\n" not in message and "\x00" not in message


def test_unknown_kind_is_a_programming_error():
    with pytest.raises(ValueError):
        units.parse_quantity("1 m", "colour", "f")


@pytest.mark.parametrize(("value", "kind", "system", "text"), [
    (68_000.0, "pressure", "si", "68.00 kPa"),
    (6_894.757, "pressure", "us", "1.000 psi"),             # NIST SP 811 psi
    (291.15, "temperature", "si", "18.00 °C"),
    (291.15, "temperature", "us", "64.40 °F"),              # 18 °C = 64.4 °F
    (0.0254, "diameter", "us", "1.000 in"),
    (3.785412e-3 / 60, "flow", "us", "1.000 gpm"),
    (1e-3, "flow", "si", "1.000 L/s"),
])
def test_format_quantity(value, kind, system, text):
    assert units.format_quantity(value, kind, system) == text


def test_format_quantity_in_a_chosen_unit_and_display_units():
    assert units.format_quantity(1e5, "pressure", unit="bar") == "1.000 bar"
    assert units.display_unit("flow", "us") == "gpm"
    assert units.display_unit("pressure", "si") == "kPa"
    for kind in units.KINDS:
        for system in units.SYSTEMS:  # every display unit reads back as its own kind
            units.check_unit(units.display_unit(kind, system), kind)
        for unit in units.unit_choices(kind):
            units.check_unit(unit, kind)


@given(st.floats(min_value=1e-6, max_value=1e6), st.sampled_from(sorted(units.KINDS)),
       st.sampled_from(units.SYSTEMS))
def test_displayed_text_reads_back_within_its_four_digits(value, kind, system):
    if kind == "temperature":
        value = 200.0 + value % 400.0  # K, a liquid's range
    unit = units.display_unit(kind, system)
    text = units.format_quantity(value, kind, system)
    back = units.parse_quantity(text, kind, "f")
    # Four significant figures: the shown number is within half a unit in the 4th digit.
    assert math.isclose(units.to_unit(back, kind, unit), units.to_unit(value, kind, unit),
                        rel_tol=5e-4)


def test_one_registry_created_lazily():
    assert units.registry() is units.registry()


_UNIT_TEXT = st.text(st.sampled_from(list("0123456789.eE+-*/^()°%\"' _,#\x00²³·kmgPaLsinftHOCFd")),
                     max_size=12)


@given(_UNIT_TEXT, st.sampled_from(sorted(units.KINDS)))
def test_any_text_gives_a_finite_si_value_or_an_input_error(text, kind):
    # Robustness, no outside reference: pint's parser raises many exception types on junk;
    # the boundary must turn every one into an InputError naming the field.
    try:
        value = units.parse_quantity("1" + text, kind, "f")
    except InputError as exc:
        assert exc.field == "f" and "\n" not in str(exc)
    else:
        assert math.isfinite(value)


@pytest.mark.parametrize(("text", "kind", "expected"), [
    # NIST SP 811 (2008) App. B: inch of water (39.2 °F) = 249.082 Pa; foot of water (39.2 °F)
    # = 2988.98 Pa; cubic foot = 2.831685e-2 m³; US gallon = 3.785412e-3 m³.
    ("20 in wc", "pressure", 20 * 249.082),
    ("80 inwc", "pressure", 80 * 249.082),
    ('80 "WC', "pressure", 80 * 249.082),
    ("3 in. w.g.", "pressure", 3 * 249.082),
    ("20 ft wc", "pressure", 20 * 2988.98),
    ("1.5 cfs", "flow", 1.5 * 2.831685e-2),
    ("80.2 cfm", "flow", 80.2 * 2.831685e-2 / 60),
    ("0.5 MGD", "flow", 0.5e6 * 3.785412e-3 / 86400),
    ("30 gph", "flow", 30 * 3.785412e-3 / 3600),
    # °C and °F scales: T/K = t/°C + 273.15; t/°C = (t/°F − 32)/1.8 (NIST SP 811 §4.2.1.1)
    ("5 C", "temperature", 278.15),
    ("41 F", "temperature", 278.15),
    ("5 deg C", "temperature", 278.15),
])
def test_trade_spellings(text, kind, expected):
    assert units.parse_quantity(text, kind, "f") == pytest.approx(expected, rel=2e-6)


@pytest.mark.parametrize(("text", "kind"), [("9 psig", "pressure"), ("1 barg", "pressure"),
                                            ("5 C", "pressure"), ("41 F", "length")])
def test_gauge_units_and_bare_scales_elsewhere_are_refused_with_a_reason(text, kind):
    with pytest.raises(InputError) as err:
        units.parse_quantity(text, kind, "conditions.pressure_drop")
    assert err.value.field == "conditions.pressure_drop"


@pytest.mark.parametrize(("text", "words"), [
    ("10 psig", "add the atmosphere, 14.696 psi, and write psi"),
    ("2 barg", "add the atmosphere, 1.01325 bar, and write bar"),
    ("10 psia", "absolute already: write psi")])
def test_gauge_and_absolute_spellings_in_an_absolute_pressure_say_what_to_write(text, words):
    """The liquid's pressure is absolute: following the difference's advice ("write psi") for
    10 psig would give a pressure 14.7 psi low. The standard atmosphere is 101 325 Pa by
    definition (ISO 2533): 14.696 psi, 1.01325 bar (psi = 6894.757 Pa, NIST SP 811)."""
    with pytest.raises(InputError) as err:
        units.parse_quantity(text, "pressure", "fluid.pressure")
    assert words in err.value.reason


def test_a_temperature_difference_unit_is_no_temperature():
    """6.667 delta_degC is a difference of 6.667 K; as a temperature it was read as 6.667 K
    above absolute zero and refused as below freezing, a reason that misled."""
    with pytest.raises(InputError) as err:
        units.parse_quantity("6.667 delta_degC", "temperature", "fluid.temperature")
    assert "temperature difference, not a temperature" in err.value.reason


def test_minus_zero_is_zero():
    """`-0 m` reached the JSON as -0.0 (IEEE 754 keeps the sign of a zero; x + 0.0 drops it)."""
    assert math.copysign(1.0, units.parse_quantity("-0 m", "length", "x")) == 1.0


def test_a_liquid_name_reads_its_pressure_in_us_units_too():
    """'Water at 250 °F, 206.843 kPa' in US units (found in a trial): the pressure the name
    carries follows the units as its temperature does. 206.843 kPa / 6.894757 kPa per psi
    (NIST SP 811) = 30.00 psi; 121.11 °C = 250.0 °F."""
    from branchwise.core.fluids import fluid_from_spec
    from branchwise.core.units.display import fluid_name

    water = fluid_from_spec("water", temperature_k=394.261, pressure_pa=206843.0)
    assert fluid_name(water, "us") == "Water at 250 °F, 30.00 psi"
    assert fluid_name(water, "si").endswith("206.843 kPa")
