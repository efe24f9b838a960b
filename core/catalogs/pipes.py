"""Standard pipe and tube sizes: outside diameter, wall and bore by nominal size and schedule.

One TOML file per standard under ``presets/pipes`` (ASME B36.10M and B36.19M steel, ASTM B88
copper, ASTM D1785 PVC, ISO 4427 and ASTM F714 polyethylene) holds the standard's own table, each
value beside its source. This module turns a (standard, nominal size, schedule) into a
:class:`PipeSize` in metres; :mod:`.sizetext` reads what people type (``3 in sch 40``).

Every length is in metres. The inner diameter is OD − 2·wall, with the wall the standard tabulates
(nominal for steel and copper, minimum for PVC and PE: see each file's header).
"""

from __future__ import annotations

from dataclasses import dataclass, field, replace
from fractions import Fraction
from functools import cache
from typing import Any

from ..errors import InputError, describe
from ..model import positive
from . import _data

INCH = 0.0254
"""Metres per inch (exact, by the 1959 international yard and pound agreement)."""
MM = 0.001


@dataclass(frozen=True)
class PipeSize:
    """One size of one standard: what a segment needs to know about its pipe.

    outside_diameter_m, wall_m, inner_diameter_m: metres. ``nominal`` is the display form of the
    nominal size (``"3"``, ``"1-1/2"``; for ISO 4427 the OD in mm, ``"110"``); ``schedule`` the
    standard's designation (``"40"``, ``"STD"``, ``"40S"``, ``"L"``, ``"SDR 11"``, ``"DR 17"``).
    ``label`` is the text to show (by NPS, or by DN where the user wrote DN):
    :func:`~.sizetext.parse_size` reads it back to this size; it takes no part in equality.
    ``material_hint`` is a key of ``presets/materials.toml`` for a default roughness. ``dn`` is
    the metric designation where the standard pairs one with the size (DN 80 for NPS 3).
    """

    standard: str
    nominal: str
    schedule: str
    outside_diameter_m: float
    wall_m: float
    inner_diameter_m: float
    label: str = field(compare=False)
    material_hint: str = ""
    dn: int | None = None


@dataclass(frozen=True)
class _Size:
    nominal: str
    value: Fraction  # nominal size as a number, in the table's nominal unit (in or mm)
    dn: int | None
    od_m: float


@dataclass(frozen=True)
class _Schedule:
    name: str
    source: str
    walls_m: dict[str, float]  # nominal -> wall


@dataclass(frozen=True)
class _Table:
    standard: str
    title: str
    material: str
    nominal_unit: str  # "in" or "mm"
    label_format: str
    source: str
    sizes: tuple[_Size, ...]
    schedules: dict[str, _Schedule]

    def size(self, nominal: str) -> _Size:
        return next(s for s in self.sizes if s.nominal == nominal)


def nominal_value(text: str) -> Fraction:
    """``"1-1/2"`` → 3/2, ``"3/4"`` → 3/4, ``"2.5"`` → 5/2: a nominal size as an exact number."""
    whole, _, frac = text.partition("-")
    if frac:
        return Fraction(whole) + Fraction(frac)
    return Fraction(text)


def _row(columns: list[str], row: list[Any]) -> dict[str, Any]:
    return dict(zip(columns, row, strict=True))


def _length(row: dict[str, Any], name: str, computed_from: str) -> float:
    """``od``/``wall`` of a row in metres, from the column the file says arithmetic uses."""
    if computed_from == "in":
        return float(Fraction(str(row[f"{name}_in"])) * Fraction(str(INCH)))
    return float(Fraction(str(row[f"{name}_mm"])) * Fraction(str(MM)))


def _load_table(name: str) -> _Table:
    raw = _data.load("pipes", name)
    computed_from = raw["computed_from"]
    sizes = []
    for row in raw["sizes"]:
        cells = _row(raw["size_columns"], row)
        sizes.append(
            _Size(
                nominal=str(cells["nominal"]),
                value=nominal_value(str(cells["nominal"])),
                dn=int(cells["dn"]) if "dn" in cells else None,
                od_m=_length(cells, "od", computed_from),
            )
        )
    if raw["nominal_unit"] == "mm":
        sizes = [_Size(s.nominal, s.value, int(s.value), s.od_m) for s in sizes]
    schedules = {}
    for sched_name, sched in raw["schedules"].items():
        walls = {}
        for row in sched["walls"]:
            cells = _row(raw["wall_columns"], row)
            walls[str(cells["nominal"])] = _length(cells, "wall", computed_from)
        schedules[sched_name] = _Schedule(sched_name, sched["source"], walls)
    return _Table(
        standard=raw["standard"],
        title=raw["title"],
        material=raw["material"],
        nominal_unit=raw["nominal_unit"],
        label_format=raw["label"],
        source=raw["source"],
        sizes=tuple(sorted(sizes, key=lambda s: s.value)),
        schedules=schedules,
    )


@cache
def tables() -> dict[str, _Table]:
    """Every shipped pipe table, by standard name (loaded on first call, then cached)."""
    loaded = (_load_table(name) for name in _data.pipe_files())
    return {t.standard: t for t in loaded}


def standards() -> list[str]:
    """Names of the pipe standards shipped, e.g. ``"ASME B36.10M"``, in file order."""
    return list(tables())


def _squash(text: str) -> str:
    return "".join(ch for ch in text.upper() if ch.isalnum() or ch == ".")


def table(standard: str, field: str = "standard") -> _Table:
    """The table of ``standard``; case, spaces and the ASME/ASTM/ISO prefix are optional."""
    wanted = _squash(standard)
    for name, t in tables().items():
        full = _squash(name)
        short = full.removeprefix("ASME").removeprefix("ASTM").removeprefix("ISO")
        if wanted in (full, short):
            return t
    known = standards()
    raise InputError(field, describe(standard),
                     f"unknown pipe standard; known: {_data.spoken_list(known)}")


def schedule_name(t: _Table, schedule: str) -> str | None:
    """The table's own spelling of ``schedule`` (``"sch 40s"`` → ``"40S"``), or None."""
    wanted = _squash(schedule)
    for prefix in ("SCHEDULE", "SCH", "TYPE"):
        wanted = wanted.removeprefix(prefix)
    for name in t.schedules:
        squashed = _squash(name)
        if wanted == squashed or _same_ratio(wanted, squashed):
            return name
    return None


def _same_ratio(a: str, b: str) -> bool:
    """``SDR11`` = ``SDR11.0``; ``DR17`` = ``SDR17`` is not assumed (different standards)."""
    for prefix in ("SDR", "DR"):
        if a.startswith(prefix) and b.startswith(prefix) and a[len(prefix) :] and b[len(prefix) :]:
            try:
                return Fraction(a[len(prefix) :]) == Fraction(b[len(prefix) :])
            except ValueError:
                return False
    return False


def make(t: _Table, nominal: str, schedule: str) -> PipeSize:
    """The :class:`PipeSize` for a size and schedule known to exist in ``t``."""
    size = t.size(nominal)
    wall = t.schedules[schedule].walls_m[nominal]
    return PipeSize(
        standard=t.standard,
        nominal=nominal,
        schedule=schedule,
        outside_diameter_m=size.od_m,
        wall_m=wall,
        inner_diameter_m=size.od_m - 2.0 * wall,
        label=t.label_format.format(nominal=nominal, schedule=schedule),
        material_hint=t.material,
        dn=size.dn,
    )


def sizes(standard: str, schedule: str) -> list[PipeSize]:
    """Every size of ``standard`` listed for ``schedule``, smallest nominal first.

    An unknown standard or schedule raises InputError (field ``standard`` or ``schedule``) naming
    the valid ones.
    """
    t = table(standard)
    name = schedule_name(t, schedule)
    if name is None:
        valid = _data.spoken_list(list(t.schedules))
        reason = f"{t.standard} has no such schedule; it lists {valid}"
        raise InputError("schedule", describe(schedule), reason)
    walls = t.schedules[name].walls_m
    return [make(t, s.nominal, name) for s in t.sizes if s.nominal in walls]


BORE_MATCH = 1e-6
"""Relative slack when matching a found bore to a catalog bore (far below any wall tolerance)."""


def smallest_at_least(inner_diameter_m: float, like: PipeSize) -> PipeSize | None:
    """The smallest size of ``like``'s standard and schedule whose bore is ≥ ``inner_diameter_m``.

    inner_diameter_m: the required inner diameter, m. Returns None when even the largest listed
    size is too small (the caller says so, it does not guess another schedule).
    """
    required = positive("inner_diameter", inner_diameter_m)
    candidates = sorted(sizes(like.standard, like.schedule), key=lambda p: p.inner_diameter_m)
    for candidate in candidates:
        # 1e-6 relative (0.1 µm in 100 mm): a bore found for the flow a pipe carries now comes
        # back as that pipe, whatever the last digits of the solve.
        if candidate.inner_diameter_m >= required * (1.0 - BORE_MATCH):
            return dn_labelled(candidate) if like.label.startswith("DN") else candidate
    return None


def dn_labelled(size: PipeSize) -> PipeSize:
    """``size`` labelled by its DN (``DN65 sch 40``) when it has one, as a user who wrote DN
    reads it; the label still reads back to the same size."""
    if size.dn is None or not size.label.startswith(f"NPS {size.nominal}"):
        return size
    return replace(size, label=f"DN{size.dn}" + size.label[len(f"NPS {size.nominal}"):])
