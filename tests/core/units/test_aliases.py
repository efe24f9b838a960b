"""Trade spellings of units, each checked against a value from outside the program.

Every accepted spelling is a common-practice way of writing a unit (drawings, line lists,
instrument data sheets, pump curves); the value it must give is taken from

* NIST SP 811 (2008), appendix B.8 and B.9 — B. N. Taylor and A. Thompson, "Guide for the Use of
  the International System of Units" (factors exact or to 7 significant digits, 6 for the water
  columns), written out below as numbers, and
* a stock ``pint.UnitRegistry()`` — not the program's own — asked for the unit by its full,
  correctly spelled name (``centipoise``, ``foot_H2O_4C``, ``imperial_gallon / minute``).

Neither copies the program's alias table: the tests name the unit each spelling must mean.
"""

from __future__ import annotations

import math

import pint
import pytest
from hypothesis import given
from hypothesis import strategies as st

from branchwise.core import units
from branchwise.core.errors import InputError
from branchwise.core.units.aliases import UNIT_ALIASES

STOCK = pint.UnitRegistry()
"""pint as shipped, for the canonical spelling of each unit."""

NIST_DIGITS = 1e-6  # 7 significant digits
WATER_DIGITS = 2e-6  # NIST gives the water columns to 6

SI_UNITS = {"pressure": "Pa", "flow": "m^3/s", "length": "m", "head": "m", "roughness": "m",
            "diameter": "m", "viscosity": "Pa*s", "kinematic_viscosity": "m^2/s"}


def stock(amount: float, unit: str, kind: str) -> float:
    """``amount`` of ``unit`` in SI, by pint as shipped."""
    return float(STOCK.Quantity(amount, unit).to(SI_UNITS[kind]).magnitude)


# text, kind, the unit it must mean (full pint name), NIST SP 811 value in SI (None: exact SI)
SPELLINGS = [
    # centipoise = 1.0 E-03 Pa·s (NIST B.8); pint reads "cp" as a cup, "cps" as counts/s
    ("2.5 cp", "viscosity", "centipoise", 2.5e-3),
    ("2.5 CP", "viscosity", "centipoise", 2.5e-3),
    ("2.5 cps", "viscosity", "centipoise", 2.5e-3),
    ("2.5 Cp", "viscosity", "centipoise", 2.5e-3),
    # pascal second: the SI unit of dynamic viscosity (NIST SP 811 table 3); pint reads "Pas"
    # as pascals
    ("0.0013 Pas", "viscosity", "pascal * second", 1.3e-3),
    ("0.0013 Pa s", "viscosity", "pascal * second", 1.3e-3),
    ("0.0013 Pa.s", "viscosity", "pascal * second", 1.3e-3),
    ("1.3 mPas", "viscosity", "millipascal * second", 1.3e-3),
    # centistokes = 1.0 E-06 m²/s (NIST B.8)
    ("40 cst", "kinematic_viscosity", "centistokes", 40e-6),
    # foot of water (39.2 °F) = 2.98898 E+03 Pa (NIST B.8): the conventional column, pint's
    # foot_H2O_4C; pint's own foot_H2O takes 1000 kg/m³ and is not what these mean
    ("12 ft hd", "pressure", "foot_H2O_4C", 12 * 2.98898e3),
    ("12 ft head", "pressure", "foot_H2O_4C", 12 * 2.98898e3),
    ("12 feet of head", "pressure", "foot_H2O_4C", 12 * 2.98898e3),
    ("12 ft H2O", "pressure", "foot_H2O_4C", 12 * 2.98898e3),
    ("12 ft of water", "pressure", "foot_H2O_4C", 12 * 2.98898e3),
    ("12 FT HD", "pressure", "foot_H2O_4C", 12 * 2.98898e3),
    # centimeter of water (4 °C) = 98.0638 Pa (NIST B.8), so a metre is 9806.38 Pa
    ("3 m hd", "pressure", "meter_H2O_4C", 3 * 9.80638e3),
    ("3 metres of head", "pressure", "meter_H2O_4C", 3 * 9.80638e3),
    # inch of water (39.2 °F) = 249.082 Pa (NIST B.8)
    ("4 inches of water", "pressure", "inch_H2O_4C", 4 * 249.082),
    # a head field is a height of the liquid itself: foot = 0.3048 m exactly (NIST B.8)
    ("12 ft hd", "head", "foot", 12 * 0.3048),
    ("3 m head", "head", "meter", 3.0),
    # mil (0.001 in) = 2.54 E-05 m exactly (NIST B.8); pint's mil is an angle
    ("5 mils", "roughness", "thou", 5 * 2.54e-5),
    ("5 mil", "length", "thou", 5 * 2.54e-5),
    # pound-force per square inch = 6.894 757 E+03 Pa (NIST B.8)
    ("11.5 PSI", "pressure", "pound_force / inch ** 2", 11.5 * 6.894757e3),
    ("11.5 Psi", "pressure", "pound_force / inch ** 2", 11.5 * 6.894757e3),
    ("11.5 lb/in²", "pressure", "pound_force / inch ** 2", 11.5 * 6.894757e3),
    ("11.5 lbs/in2", "pressure", "pound_force / inch ** 2", 11.5 * 6.894757e3),
    ("11.5 lb/sq in", "pressure", "pound_force / inch ** 2", 11.5 * 6.894757e3),
    ("11.5 lb / in²", "pressure", "pound_force / inch ** 2", 11.5 * 6.894757e3),
    # kilopascal, megapascal: SI prefixes (NIST SP 811 table 5)
    ("68 KPA", "pressure", "kilopascal", 68e3),
    ("68 Kpa", "pressure", "kilopascal", 68e3),
    ("68 kpa", "pressure", "kilopascal", 68e3),
    ("1.2 MPA", "pressure", "megapascal", 1.2e6),
    # kilogram-force per square centimeter = 9.806 65 E+04 Pa exactly (NIST B.8)
    ("2 kg/cm²", "pressure", "kilogram_force / centimeter ** 2", 2 * 9.80665e4),
    ("2 kg/cm2", "pressure", "kilogram_force / centimeter ** 2", 2 * 9.80665e4),
    ("2 ksc", "pressure", "kilogram_force / centimeter ** 2", 2 * 9.80665e4),
    # liter = 1.0 E-03 m³ exactly (NIST B.8)
    ("12 LPS", "flow", "liter / second", 12e-3),
    ("12 lps", "flow", "liter / second", 12e-3),
    ("12 l/s", "flow", "liter / second", 12e-3),
    ("600 LPM", "flow", "liter / minute", 600e-3 / 60),
    ("45 CMH", "flow", "meter ** 3 / hour", 45 / 3600),
    ("45 m3/hr", "flow", "meter ** 3 / hour", 45 / 3600),
    # gallon [U.S.] per minute = 6.309 020 E-05 m³/s (NIST B.8)
    ("400 US gpm", "flow", "gallon / minute", 400 * 6.309020e-5),
    ("400 USgpm", "flow", "gallon / minute", 400 * 6.309020e-5),
    ("400 gpm", "flow", "gallon / minute", 400 * 6.309020e-5),
    ("400 GPM", "flow", "gallon / minute", 400 * 6.309020e-5),
    # gallon [Canadian and U.K. (Imperial)] = 4.546 09 E-03 m³ exactly (NIST B.8)
    ("400 imp gpm", "flow", "imperial_gallon / minute", 400 * 4.54609e-3 / 60),
    ("400 UK gpm", "flow", "imperial_gallon / minute", 400 * 4.54609e-3 / 60),
    ("400 Imp GPM", "flow", "imperial_gallon / minute", 400 * 4.54609e-3 / 60),
]


@pytest.mark.parametrize(("text", "kind", "unit", "nist"), SPELLINGS)
def test_spelling_means_the_unit_by_nist_and_by_stock_pint(text, kind, unit, nist):
    amount = float(text.split()[0])
    rel = WATER_DIGITS if "H2O" in unit else NIST_DIGITS
    value = units.parse_quantity(text, kind, "f")
    assert value == pytest.approx(nist, rel=rel)
    assert value == pytest.approx(stock(amount, unit, kind), rel=1e-12)


@pytest.mark.parametrize("text", ["20 ℃", "20 °C", "20 ° C", "20 Celsius", "20 celsius",
                                  "20 degrees Celsius", "68 °F", "68 ℉", "68 Fahrenheit",
                                  "68 fahrenheit", "68 F"])
def test_temperature_scales(text):
    # NIST SP 811 §4.2.1.1: T/K = t/°C + 273.15; B.9: t/°C = (t/°F − 32)/1.8; 68 °F = 20 °C
    assert units.parse_quantity(text, "temperature", "t") == pytest.approx(293.15, abs=1e-9)


@pytest.mark.parametrize(("text", "feet"), [
    # as US drawings and line lists write lengths; foot = 0.3048 m exactly (NIST B.8)
    ("180'-6\"", 180.5), ("180' 6\"", 180.5), ("180 ft 6 in", 180.5), ("180'6\"", 180.5),
    ("180 ft - 6 in", 180.5), ("180′ 6″", 180.5), ("6' 4-1/2\"", 6 + 4.5 / 12),
    ("6' 4½\"", 6 + 4.5 / 12), ("2,000 ft", 2000), ("1,250.5 ft", 1250.5),
    ("1½\"", 1.5 / 12), ("3/4\"", 0.75 / 12), ("1-1/2 in", 1.5 / 12), ("1 1/2 in", 1.5 / 12),
    ("¾ in", 0.75 / 12), ("12 ft", 12),
])
def test_lengths_as_drawings_write_them(text, feet):
    assert units.parse_quantity(text, "length", "l") == pytest.approx(feet * 0.3048, rel=1e-12)


def test_thousands_comma_with_us_flow_and_pressure():
    # gallon [U.S.] per minute (NIST B.8); psi (NIST B.8)
    assert units.parse_quantity("1,500 gpm", "flow", "f") == pytest.approx(1500 * 6.309020e-5,
                                                                           rel=NIST_DIGITS)
    assert units.parse_quantity("1,000 psi", "pressure", "p") == pytest.approx(6.894757e6,
                                                                               rel=NIST_DIGITS)


@pytest.mark.parametrize(("text", "kind", "words"), [
    # a decimal comma is refused, not guessed
    ("2,5 m", "length", "write 2.5 m"),
    ("1,5 bar", "pressure", "decimal point"),
    # a comma with three digits after it is a thousands comma in US units, a decimal comma in
    # much of the metric world: with metric units it is refused
    ("2,000 m", "length", "thousands or mark decimals"),
    ("1,500 kPa", "pressure", "thousands or mark decimals"),
    ("6' 14\"", "length", "12 inches or more"),
    ("1/0 in", "length", "fraction over zero"),
])
def test_ambiguous_numbers_are_refused_clearly(text, kind, words):
    with pytest.raises(InputError) as caught:
        units.parse_quantity(text, kind, "branches[0].length")
    assert words in caught.value.reason
    assert caught.value.value == text  # the value as typed


@pytest.mark.parametrize(("text", "kind", "words"), [
    # the refusal says what pint read the text as, with its dimension, and what the trade
    # spelling means where it has a meaning
    ("1 cp", "kinematic_viscosity", "'cp' reads as a cup, a volume; centipoise is 'cP'"),
    ("1 cp", "density", "'cp' reads as a cup, a volume"),
    ("1 ft hd", "length", "'ft hd' reads as foot·hectoday"),
    ("1 lb", "pressure", "'lb' reads as a pound, a mass"),
    ("20 hr", "flow", "'hr' reads as an hour, a time"),
    ("3 psi", "length", "'psi' reads as"),
    ("20 gpm", "pressure", "'gpm' reads as a US gallon per minute, a flow"),  # in words
])
def test_wrong_dimension_names_what_was_read(text, kind, words):
    with pytest.raises(InputError) as caught:
        units.parse_quantity(text, kind, "fluid.kinematic_viscosity")
    assert words in caught.value.reason
    assert caught.value.value == text


def test_every_alias_means_a_unit_of_its_kinds():
    # structure, no outside reference: every spelling of the table reads in the kinds it
    # names, and names no unit that pint could not read
    for alias in UNIT_ALIASES:
        for kind in alias.kinds or ("pressure", "flow", "temperature"):
            for spelling in alias.spellings:
                try:
                    units.parse_quantity(f"1 {spelling}", kind, "f")
                except InputError as exc:
                    assert alias.kinds == (), (spelling, kind, exc)  # a kind-free alias
                    assert "is not a" in exc.reason


_TRADE_TEXT = st.text(st.sampled_from(list("0123456789.,/- '\"½¾⅛″′ftinmcpPSILhdgusCF℃°²")),
                      max_size=14)


@given(_TRADE_TEXT, st.sampled_from(sorted(units.KINDS)))
def test_any_trade_text_gives_a_finite_value_or_an_input_error(text, kind):
    # Robustness, no outside reference: fractions, feet-and-inches, commas and trade
    # spellings in any order either read or are refused naming the field, never a traceback.
    try:
        value = units.parse_quantity(text, kind, "f")
    except InputError as exc:
        assert exc.field == "f" and "\n" not in str(exc)
    else:
        assert math.isfinite(value)


def test_display_units_take_the_trade_spellings_too():
    # a unit chosen for display (F6, --units) reads as it does in a field: 1 m³/h = 1/3600 m³/s
    assert units.check_unit("CMH", "flow") == "CMH"
    assert units.to_unit(1 / 3600, "flow", "CMH") == pytest.approx(1.0, rel=1e-12)
