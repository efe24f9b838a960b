"""Pipe wall materials: absolute roughness (new and aged) and Hazen–Williams C.

The numbers and their sources live in ``presets/materials.toml`` (Moody 1944, Idel'chik's handbook,
common practice); this module reads them once and hands them out in SI. A pipe size's
``material_hint`` is a key here.
"""

from __future__ import annotations

from dataclasses import dataclass
from functools import cache
from typing import Any

from ..errors import InputError, describe
from . import _data


@dataclass(frozen=True)
class Material:
    """A wall material.

    roughness_m: absolute roughness of new pipe, m. aged_roughness_m: a typical value after years
    of water service, m, or None when none is offered. hazen_williams_c: Hazen–Williams C for
    water (–), or None where the method does not apply. ``source`` names where each number comes
    from, in the order roughness; aged; C.
    """

    key: str
    name: str
    roughness_m: float
    aged_roughness_m: float | None
    hazen_williams_c: float | None
    source: str
    aliases: tuple[str, ...] = ()


def _material(raw: dict[str, Any]) -> Material:
    aged = raw.get("aged_roughness_mm")
    c = raw.get("hazen_williams_c")
    parts = [
        f"roughness: {raw['roughness_source']}",
        f"aged: {raw['aged_source']}",
        f"Hazen-Williams C: {raw['hazen_williams_source']}" if c is not None else "",
    ]
    return Material(
        key=raw["key"],
        name=raw["name"],
        roughness_m=float(raw["roughness_mm"]) * 1e-3,
        aged_roughness_m=None if aged is None else float(aged) * 1e-3,
        hazen_williams_c=None if c is None else float(c),
        source="; ".join(p for p in parts if p),
        aliases=tuple(raw.get("aliases", ())),
    )


@cache
def _materials() -> dict[str, Material]:
    return {m.key: m for m in (_material(raw) for raw in _data.load("materials.toml")["material"])}


@cache
def _by_name() -> dict[str, Material]:
    names: dict[str, Material] = {}
    for m in _materials().values():
        names[m.key] = m
        for alias in m.aliases:
            names.setdefault(alias, m)
    return names


def materials() -> list[Material]:
    """Every material shipped, in file order."""
    return list(_materials().values())


def material(key: str, field: str = "material") -> Material:
    """The material ``key`` or one of its aliases (``galvanized`` → ``galvanised``).

    Case, spaces and underscores are forgiven (``Cast Iron`` → ``cast-iron``). An unknown key
    raises InputError naming close keys.
    """
    wanted = "-".join(str(key).strip().lower().replace("_", " ").split())
    found = _by_name().get(wanted)
    if found is None:
        close = _data.close_matches(wanted, list(_by_name()))
        keys = [_by_name()[c].key for c in close] or list(_materials())
        unique = list(dict.fromkeys(keys))
        raise InputError(field, describe(key),
                         f"unknown material; did you mean {_data.spoken_list(unique)}")
    return found
