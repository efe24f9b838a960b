"""The unit parser on random and damaged text: a finite SI float or an InputError naming the
field, for every kind of quantity — never another exception, never a hang.

Robustness, no outside reference (the unit factors themselves are checked against NIST SP 811
in tests/core/units/test_units.py). Mutations start from values as people type them on site.
"""

from __future__ import annotations

import math
from typing import Any

import pytest
from fuzz_support import STATS, time_limit
from hypothesis import HealthCheck, given, settings
from hypothesis import strategies as st

from branchwise.core.errors import InputError, describe
from branchwise.core.units import KINDS, parse_quantity

FIELD = "branches[3].segments[1].length"

TYPED: dict[str, list[str]] = {
    "pressure": ["68 kPa", "10 psid", "1.5 bar", "12 mH2O", "30 ftH2O", "250 mbar", "-3 inH2O",
                 "0.2 MPa", "14.7 psi", "101325 Pa"],
    "flow": ["12 L/s", "220 gpm", "80 m^3/h", "500 L/min", "0.01 m³/s", "40 lpm", "3 igpm",
             "2 USgpm", "1.5 lps"],
    "length": ["64 m", "180 ft", "2.5 km", "120 in", "3 '", '6 "', "1e3 mm"],
    "diameter": ["102.26 mm", "2.067 in", "0.1 m", '3.068"', "4 inch"],
    "roughness": ["0.045 mm", "0.0018 in", "45 um", "1.5 mil", "12 µm", "1.5e-6 m"],
    "head": ["12 m", "40 ft", "-2 ft"],
    "velocity": ["2.5 m/s", "8 ft/s", "120 m/min"],
    "temperature": ["18 degC", "44 degF", "293.15 K", "60 °F", "5 °C", "-10 degC"],
    "density": ["998.2 kg/m^3", "62.4 lb/ft^3", "1.02 g/cm^3", "1025 kg/m3"],
    "viscosity": ["1.0016 cP", "1 mPa*s", "0.001 Pa·s", "1.3 mPa s"],
    "kinematic_viscosity": ["1 cSt", "1e-6 m^2/s", "1 mm²/s"],
    "acceleration": ["9.81 m/s^2", "32.2 ft/s^2", "9.80665 m/s²"],
    "fraction": ["30 %", "0.3", "25 percent"],
    "salinity": ["35 g/kg", "3.5 %", "0.035"],
}
"""Values of every kind as typed on site (each parses: test_every_typed_value_parses)."""

ODD_CHARS = list("0123456789.eE+-*/^()°%\"' _,#²³⁻¹·µμ\t\n\r\x00\x7f\u00a0\u202e\ufeff℃Å√∞") + [
    "\U0001f6b0", "\u0301", "\ud7ff", "\uff11", "\u0661", "nan", "inf", "**", "^-", "e308",
    "e-400", "1" * 400, "m" * 300, "(" * 50, ")" * 50, "m*" * 200, "/m" * 100, "kPa",
    "gpm", "degC", "delta_degC", "_", "__", "[length]", "pi", "dimensionless",
]


@st.composite
def damaged(draw: st.DrawFn, text: str) -> str:
    """``text`` with one to four random edits: characters inserted, deleted, replaced,
    repeated, the text cut, or the unit wrapped, powered or doubled."""
    for _ in range(draw(st.integers(1, 4))):
        at = draw(st.integers(0, len(text)))
        piece = draw(st.one_of(st.sampled_from(ODD_CHARS), st.text(max_size=5)))
        op = draw(st.sampled_from(["insert", "delete", "replace", "repeat", "cut", "wrap",
                                   "power", "number"]))
        if op == "insert":
            text = text[:at] + piece + text[at:]
        elif op == "delete":
            text = text[:at] + text[at + draw(st.integers(1, 4)):]
        elif op == "replace":
            text = text[:at] + piece + text[at + 1:]
        elif op == "repeat":
            text = text[:at] + text[at:] * draw(st.integers(2, 50))
        elif op == "cut":
            text = text[:at]
        elif op == "wrap":
            depth = draw(st.integers(1, 600))
            number, _, unit = text.partition(" ")
            text = f"{number} {'(' * depth}{unit}{')' * depth}"
        elif op == "power":
            text += draw(st.sampled_from(["^", "**", "^-", ""])) + str(draw(st.integers(-99, 99)))
        else:
            _, _, unit = text.partition(" ")
            number = draw(st.one_of(
                st.floats(allow_nan=True, allow_infinity=True).map(repr),
                st.sampled_from(["1e308", "1e309", "-1e309", "1e-330", "nan", "NaN", "inf",
                                 "Infinity", "9" * 500, "0x10", "1_000", "١٢", "½", "1,5",
                                 "1.2.3", ".", "-", "+.e5", "00012", "1e", "1e+"])))
            text = f"{number} {unit}"
    return text


def check(value: object, kind: str, default_unit: str | None) -> None:
    with time_limit("units"):
        try:
            si = parse_quantity(value, kind, FIELD, default_unit=default_unit)
        except InputError as exc:
            assert exc.field == FIELD, exc.field
            assert str(exc).startswith(f"{FIELD}: ") and exc.reason, str(exc)
            assert "\n" not in str(exc) and "\r" not in str(exc), repr(str(exc))
            STATS["units input-error"] += 1
            return
    assert isinstance(si, float) and math.isfinite(si), (value, si)
    STATS["units value"] += 1


KIND = st.sampled_from(sorted(KINDS))


@st.composite
def kind_and_default(draw: st.DrawFn) -> tuple[str, str | None]:
    kind = draw(KIND)
    choices = [None, KINDS[kind].si or None, *KINDS[kind].choices]
    return kind, draw(st.sampled_from(choices))


@pytest.mark.parametrize("kind", sorted(TYPED))
def test_every_typed_value_parses(kind: str) -> None:
    # The mutations start from valid text; a seed that failed would fuzz nothing.
    assert set(TYPED) == set(KINDS)
    for text in TYPED[kind]:
        assert math.isfinite(parse_quantity(text, kind, FIELD)), text


@settings(suppress_health_check=[HealthCheck.too_slow, HealthCheck.filter_too_much])
@given(data=st.data(), spec=kind_and_default())
def test_damaged_typed_value_is_a_number_or_names_the_field(
    data: st.DataObject, spec: tuple[str, str | None]
) -> None:
    kind, default = spec
    seed = data.draw(st.sampled_from(TYPED[data.draw(st.sampled_from(sorted(TYPED)))]))
    check(data.draw(damaged(seed)), kind, default)


@given(text=st.text(max_size=60), spec=kind_and_default())
def test_random_text_is_a_number_or_names_the_field(
    text: str, spec: tuple[str, str | None]
) -> None:
    check(text, *spec)


@given(number=st.floats(allow_nan=True, allow_infinity=True), unit=st.text(max_size=30),
       spec=kind_and_default())
def test_any_number_with_random_unit_text(
    number: float, unit: str, spec: tuple[str, str | None]
) -> None:
    check(f"{number!r} {unit}", *spec)


NOT_TEXT = st.one_of(
    st.integers(min_value=-(10**4000), max_value=10**4000), st.floats(), st.booleans(),
    st.none(), st.lists(st.integers(), max_size=3), st.dictionaries(st.text(), st.integers()),
    st.binary(max_size=10), st.tuples(st.floats(), st.text()),
)


@given(value=NOT_TEXT, spec=kind_and_default())
def test_values_of_any_type_from_a_toml_file(value: object, spec: tuple[str, str | None]) -> None:
    # A TOML file can hold integers of any size, floats, booleans, lists and tables.
    check(value, *spec)


# ---- what the fuzzing found (each once a traceback or a hang) -----------------------------

UNIT_CASES = {
    "integer beyond the float range": 10**400,
    "3000 unit names": "1 " + "m*" * 3000 + "m",
    "parentheses 3000 deep": "1 " + "(" * 3000 + "m" + ")" * 3000,
    "a vulgar fraction as a unit name": "0 ¼",
    "a prefixed offset unit": "9.81 mdegC/s^2",
    "power of a power": "1 m^9^9^9",
    "5000-digit power": "1 m^" + "1" * 5000,
    "a unit name 100 000 letters long": "1 " + "m" * 100_000,
}


@pytest.mark.parametrize("value", UNIT_CASES.values(), ids=UNIT_CASES)
def test_unit_parser_refuses_with_the_field(value: object,
                                            monkeypatch: pytest.MonkeyPatch) -> None:
    # "m^9^9^9" ran for ever inside pint; pint's preprocessing of one name grows as length².
    # The proof that the work stays small is what pint is handed: a few short names at most,
    # whatever the size of the text (the clock would measure the machine; the time limit
    # only guards against a hang).
    from branchwise.core.units import registry
    from branchwise.core.units.grammar import MAX_UNIT_NAME_LENGTH, MAX_UNIT_NAMES

    handed: list[str] = []
    kind = type(registry())
    for method in ("__contains__", "parse_units", "parse_expression"):
        real = getattr(kind, method)

        def spy(self: Any, text: Any, *args: Any, _real: Any = real, **kw: Any) -> Any:
            handed.append(str(text))
            return _real(self, text, *args, **kw)

        monkeypatch.setattr(kind, method, spy)
    with time_limit("unit cases", 60.0), pytest.raises(InputError) as caught:
        parse_quantity(value, "length", "branches[0].length")
    assert caught.value.field == "branches[0].length"
    assert len(handed) <= 2 * MAX_UNIT_NAMES + 2, len(handed)
    bound = MAX_UNIT_NAMES * (MAX_UNIT_NAME_LENGTH + 8)
    assert all(len(text) <= bound for text in handed), max(map(len, handed))


def test_describe_shows_values_python_cannot_print() -> None:
    nested: list = []
    for _ in range(100_000):
        nested = [nested]
    assert describe(10**5000) == "a whole number of about 5000 digits"
    assert describe(nested) == "a list nested too deeply to show"
