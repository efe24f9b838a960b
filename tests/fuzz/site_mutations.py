"""Valid site files to start from, and hypothesis strategies that damage them.

The seeds cover every fluid kind, every given (pressure drop, total flow, a measured branch
flow), every find, series segments, catalog sizes, fittings, valves, a ``[tolerances]`` table
and a hand-written format-0 file. The mutations are the ways a file gets damaged in the field
or by hand: bytes flipped, a file cut short, lines lost, doubled or swapped, a value moved to
the wrong key, a value of the wrong type, and values chosen to break parsers (NaN, huge
numbers, deep nesting, very long text, odd unicode).
"""

from __future__ import annotations

import json
import re

from hypothesis import strategies as st

from branchwise.core.site.read import demo_text

# ---- valid sites ---------------------------------------------------------------------------

CUSTOM_SEGMENTS = """\
format = 1
name = "Custom liquid, a measured branch"

[fluid]
kind = "custom"
density = "998.2 kg/m^3"
viscosity = "1.0016 cP"

[conditions]
elevation_change = "1.5 m"
gravity = "9.81 m/s^2"
velocity_limit = "2.5 m/s"

[[branches]]
name = "A"
diameter = "102.26 mm"
length = "64 m"
roughness = "0.045 mm"
minor_k = 6.2
measured_flow = "12 L/s"

[[branches]]
name = "B"
diameter = "3.068 in"
length = "250 ft"
roughness = "0.0018 in"
valve_cv = 90

[[branches]]
name = "C"
segments = [
    { diameter = "2.067 in", length = "30 m", roughness = "0.045 mm", minor_k = 2 },
    { diameter = "52.5 mm", length = "12 m", roughness = "0.1 mm" },
]
"""

SEAWATER_LENGTH = """\
format = 1
kind = "site"
name = "Seawater cooling, length of a buried run"
notes = "Total flow from the pump curve."

[fluid]
kind = "seawater"
temperature = "25 degC"
salinity = "35 g/kg"
pressure = "2 bar"

[conditions]
total_flow = "180 m^3/h"
friction = "haaland"

[[branches]]
name = "North"
size = "DN150 sch 40"
length = "220 m"
material = "cast-iron"
condition = "aged"
fittings = { elbow-90-long-radius = 6, butterfly-valve = 2 }

[[branches]]
name = "South"
size = "6 in sch 40"
length = "180 m"
material = "galvanised"
valve_kv = 400

[solve]
find = "length"
branch = "South"
target_flow = "80 m^3/h"

[tolerances]
gauge_accuracy = "1 %"
flow_meter_accuracy = "3 %"
roughness_factor = [0.5, 3]
roughness_range = { "North" = ["0.2 mm", "1 mm"] }
diameter = "1 %"
length = "5 %"
temperature = "2 K"
fitting_k = "25 %"
"""

GLYCOL_DIAMETER = """\
format = 1
name = "Glycol loop, size a branch"

[fluid]
kind = "propylene-glycol"
temperature = "5 degC"
concentration = "30 %"

[conditions]
pressure_drop = "85 kPa"
elevation_change = "-2 ft"
friction = "churchill"

[[branches]]
name = "Coil 1"
size = "2 in type L"
length = "40 ft"
fittings = { elbow-90 = 8, ball-valve = 2 }

[[branches]]
name = "Coil 2"
size = "2-1/2 in sch 40"
length = "55 ft"
material = "commercial-steel"
minor_k = 3

[solve]
find = "diameter"
branch = "Coil 2"
target_flow = "12 L/s"
"""

WATER_ROUGHNESS = """\
# format 0: written by hand, no format key
name = "Old main, effective roughness"

[fluid]
kind = "water"
temperature = "60 degF"
pressure = "4 bar"

[conditions]
pressure_drop = "12 mH2O"
friction = "swamee-jain"

[[branches]]
name = "Old main"
diameter = "150 mm"
length = "1.2 km"
roughness = "0.26 mm"
hw_c = 100

[[branches]]
name = "New main"
size = "160 mm SDR 11"
length = "1.1 km"
material = "pe"

[solve]
find = "roughness"
branch = "Old main"
target_flow = "15 L/s"

[tolerances]
gauge_full_scale = "2 bar"
gauge_accuracy = "0.5 %"
target_flow_measured = true
"""

DEMO_SIZING = demo_text().replace("# [solve] ", "[solve]").replace("# find = ", "find = ") \
    .replace("# branch = ", "branch = ").replace("# target_flow = ", "target_flow = ")

SEEDS: dict[str, str] = {
    "demo": demo_text(),
    "demo-sizing": DEMO_SIZING,
    "custom-segments": CUSTOM_SEGMENTS,
    "seawater-length": SEAWATER_LENGTH,
    "glycol-diameter": GLYCOL_DIAMETER,
    "water-roughness": WATER_ROUGHNESS,
}
"""Valid site files; :func:`test_fuzz_sitefile.test_every_seed_solves` keeps them valid."""

# ---- values that break things --------------------------------------------------------------

ODD_VALUES = [
    "nan", "+nan", "-nan", "inf", "-inf", "1e308", "-1e308", "1.7976931348623157e308", "-0.0",
    "0", "-1", "5e-324", "9" * 400, "1" + "0" * 4500, "-" + "9" * 5000, "0x7fffffffffffffff",
    "true", "false", "[]", "[[]]", "{}", "[1, 2]", '["a", "b"]', "[[1], [2, [3]]]",
    '{ a = 1 }', '{ diameter = "1 m", length = "1 m" }', "[{}]", '[{ name = "x" }]',
    "1979-05-27T07:32:00Z", "07:32:00", "1979-05-27",
    '"nan m"', '"NaN kPa"', '"inf m"', '"-inf L/s"', '"1e999 m"', '"-1e999 m"', '"1e-999 m"',
    '"1e308 km"', '"1e308 mile"', '"1e-320 mm"', '"0 m"', '"-5 m"', '"0 L/s"', '"0 Pa"',
    '"1 m^9"', '"1 m**-9"', '"1 ((((m))))"', '"1 m/"', '"1 /m"', '"1 m^0"', '"1 kPa kPa kPa"',
    '"1 degC"', '"-300 degC"', '"1e9 K"', '"0 K"', '"1 %"', '"1e9 %"', '"-50 %"', '"100 %"',
    '"3 in sch 40"', '"3 in sch 41"', '"DN0 sch 40"', '"0 in type L"', '"1e400 mm SDR 11"',
    '"1/0 in sch 40"', '"99999999999999999999 in sch 40"', '""', '" "', '"\\u0000"',
    '"\\u202e kPa"', '"\u00b5m"', '"12 \u00b5m"', '"1 m\u00b2/s"', '"\U0001f6b0"',
    '"\u0661\u0662 m"', '"\uff11\uff12 m"', '"1\u00a0m"', '"1,5 m"', '"1.5.5 m"', '"--1 m"',
    '"1e5e5 m"', '"1 m # comment"', '"1 \\" m"', '"\'"', '"\\""',
    '"' + "x" * 20_000 + '"', '"1 ' + "m*" * 5000 + 'm"', '"1 ' + "(" * 3000 + '"',
    '"water"', '"custom"', '"flows"', '"diameter"', '"aged"', '"commercial-steel"',
]
"""TOML value texts to drop in place of a value (each is valid TOML or fails to parse)."""


def _toml_string(text: str) -> str:
    return json.dumps(text, ensure_ascii=False)  # JSON escapes are valid TOML basic strings


def _nested(depth: int, inner: str, kind: str) -> str:
    if kind == "array":
        return "[" * depth + inner + "]" * depth
    return "{ a = " * depth + inner + " }" * depth


VALUES = st.one_of(
    st.sampled_from(ODD_VALUES),
    st.text(max_size=40).map(_toml_string),
    st.floats(allow_nan=True, allow_infinity=True).map(repr),
    st.integers(min_value=-(2**70), max_value=2**70).map(str),
    st.builds(lambda n, u: _toml_string(f"{n!r} {u}"),
              st.floats(allow_nan=True, allow_infinity=True),
              st.sampled_from(["m", "mm", "in", "ft", "kPa", "psi", "L/s", "gpm", "degC",
                               "cP", "kg/m^3", "%", "m/s", "cSt", "bar", "K", ""])),
    st.builds(_nested, st.integers(1, 3000), st.sampled_from(ODD_VALUES[:12]),
              st.sampled_from(["array", "table"])),
)
"""Any value: odd ones, random text, numbers of any size, deep nesting."""

_KIND_OF_KEY = {
    "diameter": "diameter", "size": "diameter", "length": "length", "roughness": "roughness",
    "pressure_drop": "pressure", "pressure": "pressure", "gauge_full_scale": "pressure",
    "total_flow": "flow", "measured_flow": "flow", "target_flow": "flow",
    "temperature": "temperature", "elevation_change": "head", "gravity": "acceleration",
    "velocity_limit": "velocity", "density": "density", "viscosity": "viscosity",
    "kinematic_viscosity": "kinematic_viscosity", "concentration": "fraction",
    "salinity": "salinity",
}
_UNITS_OF_KIND = {
    "diameter": ["mm", "in", "m"], "length": ["m", "ft", "km", "mm"],
    "roughness": ["mm", "in", "um", "mil"], "pressure": ["kPa", "psi", "bar", "ftH2O", "Pa"],
    "flow": ["L/s", "gpm", "m^3/h", "L/min"], "temperature": ["degC", "degF", "K"],
    "head": ["m", "ft"], "acceleration": ["m/s^2", "ft/s^2"], "velocity": ["m/s", "ft/s"],
    "density": ["kg/m^3", "lb/ft^3"], "viscosity": ["cP", "Pa*s"],
    "kinematic_viscosity": ["cSt", "m^2/s"], "fraction": ["%", ""], "salinity": ["g/kg", "%"],
}
_WORDS = ['"water"', '"seawater"', '"ethylene-glycol"', '"propylene-glycol"', '"custom"',
          '"flows"', '"diameter"', '"length"', '"roughness"', '"new"', '"aged"', '"laminar"',
          '"hazen-williams"', '"colebrook"', '"A"', '"B"', '"C"', '"North"', '"Bypass"',
          '"AHU-2 coil"', '"Coil 2"', '"pvc"', '"copper"', '"2 in sch 80"', '"DN100 sch 10S"',
          '"1 in type K"', '"110 mm SDR 17"', '"3 %"', '"0.5 %"', "true", "false"]


@st.composite
def plausible(draw: st.DrawFn, key: str) -> str:
    """A value of the kind ``key`` holds, of any size and sign: it reaches the solver."""
    kind = _KIND_OF_KEY.get(key)
    number = draw(st.sampled_from(["", "", "", "-"])) + f"{draw(st.floats(1e-6, 1e6)):.4g}"
    if kind is None:
        return draw(st.one_of(st.sampled_from(_WORDS), st.just(number),
                              st.integers(-3, 400).map(str)))
    return _toml_string(f"{number} {draw(st.sampled_from(_UNITS_OF_KIND[kind]))}".strip())


# ---- mutations -----------------------------------------------------------------------------

_ASSIGNMENT = re.compile(rb"^(\s*[\w\-\"\.]+\s*=\s*)(.*)$")


def _lines(data: bytes) -> list[bytes]:
    return data.split(b"\n")


def _value_lines(lines: list[bytes]) -> list[int]:
    return [i for i, line in enumerate(lines) if _ASSIGNMENT.match(line)]


ANY_DAMAGE = ("flip", "truncate", "delete-line", "duplicate-line", "swap-lines", "insert-text",
              "set-value", "swap-values", "delete-span", "header", "long-line")
VALUE_DAMAGE = ("plausible-value",) * 4 + ("set-value", "swap-values", "delete-line")
"""Damage that mostly keeps the file valid TOML, so that the case reaches building and
solving: values replaced, moved between keys, or lines lost."""


@st.composite
def mutation(draw: st.DrawFn, data: bytes, ops: tuple[str, ...] = ANY_DAMAGE) -> bytes:
    """``data`` with one random damage of the kinds ``ops``."""
    op = draw(st.sampled_from(ops))
    lines = _lines(data)
    if op == "flip" and data:
        at = draw(st.integers(0, len(data) - 1))
        return data[:at] + bytes([data[at] ^ (1 << draw(st.integers(0, 7)))]) + data[at + 1:]
    if op == "truncate":
        return data[: draw(st.integers(0, len(data)))]
    if op == "delete-span" and data:
        start = draw(st.integers(0, len(data) - 1))
        return data[:start] + data[start + draw(st.integers(1, 200)):]
    if op == "insert-text":
        at = draw(st.integers(0, len(data)))
        junk = draw(st.one_of(st.text(max_size=20).map(lambda s: s.encode("utf-8", "replace")),
                              st.binary(max_size=20)))
        return data[:at] + junk + data[at:]
    if op in ("delete-line", "duplicate-line", "swap-lines") and lines:
        i = draw(st.integers(0, len(lines) - 1))
        j = draw(st.integers(0, len(lines) - 1))
        if op == "delete-line":
            del lines[i]
        elif op == "duplicate-line":
            lines.insert(j, lines[i])
        else:
            lines[i], lines[j] = lines[j], lines[i]
        return b"\n".join(lines)
    assigned = _value_lines(lines)
    if op in ("set-value", "plausible-value") and assigned:
        i = draw(st.sampled_from(assigned))
        head = _ASSIGNMENT.match(lines[i]).group(1)  # type: ignore[union-attr]
        key = head.split(b"=")[0].strip().decode("utf-8", "replace")
        value = draw(VALUES if op == "set-value" else plausible(key))
        lines[i] = head + value.encode("utf-8", "replace")
        return b"\n".join(lines)
    if op == "swap-values" and len(assigned) > 1:
        i, j = draw(st.lists(st.sampled_from(assigned), min_size=2, max_size=2, unique=True))
        mi, mj = _ASSIGNMENT.match(lines[i]), _ASSIGNMENT.match(lines[j])
        lines[i] = mi.group(1) + mj.group(2)  # type: ignore[union-attr]
        lines[j] = mj.group(1) + mi.group(2)  # type: ignore[union-attr]
        return b"\n".join(lines)
    if op == "header":
        header = draw(st.sampled_from([
            b"[fluid]", b"[conditions]", b"[[branches]]", b"[solve]", b"[tolerances]",
            b"[branches]", b"[[fluid]]", b"[fluid.kind]", b"[a." * 500 + b"b]",
            b"[tolerances.roughness_range]", b"[[branches.segments]]", b"[branches.fittings]",
        ]))
        lines.insert(draw(st.integers(0, len(lines))), header)
        return b"\n".join(lines)
    if op == "long-line":
        key = draw(st.sampled_from([b"name", b"notes", b"x", b"a." * 2000 + b"b"]))
        line = key + b" = " + draw(VALUES).encode("utf-8", "replace")
        lines.insert(draw(st.integers(0, len(lines))), line)
        return b"\n".join(lines)
    return data


@st.composite
def mutated_site(draw: st.DrawFn, max_mutations: int = 4,
                 ops: tuple[str, ...] = ANY_DAMAGE) -> bytes:
    """A seed site with one to ``max_mutations`` damages of the kinds ``ops`` in turn."""
    data = SEEDS[draw(st.sampled_from(sorted(SEEDS)))].encode("utf-8")
    for _ in range(draw(st.integers(1, max_mutations))):
        data = draw(mutation(data, ops))
    return data


JUNK = st.one_of(
    st.binary(max_size=400),
    st.text(max_size=200).map(lambda s: s.encode("utf-8", "surrogatepass")),
    st.lists(st.sampled_from([b"[", b"]", b"{", b"}", b"=", b'"', b"'", b"\n", b"a", b"1",
                              b".", b",", b"#", b"\\", b" ", b"\r", b"\t", b'"""', b"0x",
                              b"nan", b"inf", b"e", b"-", b"+", b":", b"T", b"\xef\xbb\xbf"]),
             max_size=200).map(b"".join),
)
"""Random bytes, random text and random TOML punctuation."""
