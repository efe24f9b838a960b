"""Readings of unit text are remembered (the app reads the whole site on every keystroke):
the same value as a fresh reading, errors never remembered (each names its own field), the
memory bounded."""

from __future__ import annotations

import pytest

from branchwise.core.errors import InputError
from branchwise.core.site import values
from branchwise.core.units import parse
from branchwise.core.units.parse import parse_quantity, read_quantity


@pytest.mark.parametrize(("text", "kind", "default"), [
    ("68 kPa", "pressure", None), ("3.068 in", "diameter", None),
    ("18 degC", "temperature", None), ("12.5", "length", "ft"), (12.5, "length", "m"),
    (3, "length", "m"), ("2,000 ft", "length", None),
])
def test_a_remembered_reading_is_the_fresh_one(text: object, kind: str,
                                               default: str | None) -> None:
    first = parse_quantity(text, kind, "a", default)
    again = parse_quantity(text, kind, "b", default)
    assert again == first == read_quantity(text, kind, "c", default)


def test_the_kind_and_the_default_unit_are_part_of_what_is_remembered() -> None:
    assert parse_quantity("12", "length", "a", "m") == 12.0
    # 1 ft = 0.3048 m exactly (the international foot, 1959)
    assert parse_quantity("12", "length", "a", "ft") == pytest.approx(12 * 0.3048)
    parse_quantity("5 m", "length", "a")
    with pytest.raises(InputError) as caught:
        parse_quantity("5 m", "pressure", "b")
    assert caught.value.field == "b"


def test_an_error_names_each_field_and_true_is_not_one() -> None:
    for field in ("branches[0].length", "branches[1].length"):
        with pytest.raises(InputError) as caught:
            parse_quantity("5 furlongz", "length", field)
        assert caught.value.field == field
    parse_quantity(1, "fraction", "a")
    with pytest.raises(InputError):
        parse_quantity(True, "fraction", "b")


def test_the_memory_is_bounded() -> None:
    for i in range(parse.READ_CACHE_SIZE + 10):
        parse_quantity(f"{i} m", "length", "a")
    assert len(parse._read) <= parse.READ_CACHE_SIZE
    for i in range(values.SIZE_CACHE_SIZE + 10):
        values.size_or_bore(f"ID {i + 1} mm", "size")
    assert len(values._sizes) <= values.SIZE_CACHE_SIZE


def test_a_size_error_names_each_field() -> None:
    assert values.size_or_bore("3 in sch 40", "a") == values.read_size_or_bore("3 in sch 40", "b")
    for field in ("branches[0].size", "branches[2].size"):
        with pytest.raises(InputError) as caught:
            values.size_or_bore("3 in sch 41", field)
        assert caught.value.field == field
