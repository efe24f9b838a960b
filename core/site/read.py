"""Reading site files: TOML text into a :class:`~.spec.Site`, and the bundled demo site.

Reading checks only the file's shape (known keys, tables where tables belong); :func:`.build.build`
checks the values, so that the app can open a file with one bad value and show the error beside
that field. The layout of the file is described in :mod:`.spec`.
"""

from __future__ import annotations

import difflib
import re
from collections.abc import Mapping
from dataclasses import fields
from datetime import date, time
from functools import cache
from pathlib import Path
from typing import TYPE_CHECKING, Any, TypeVar

from ..errors import InputError, describe

if TYPE_CHECKING:
    from importlib.resources.abc import Traversable

    from _typeshed import DataclassInstance

from .spec import (
    BRANCH_KEYS,
    CONDITION_KEYS,
    FLUID_KEYS,
    PIPE_KEYS,
    RECORD_KEYS,
    SOLVE_KEYS,
    TOLERANCE_KEYS,
    TOP_KEYS,
    VISIT_KEYS,
    BranchSpec,
    ConditionsSpec,
    FluidSpec,
    RecordSpec,
    SegmentSpec,
    Site,
    SolveSpec,
    TolerancesSpec,
    Value,
    VisitSpec,
)

# ---- reading ---------------------------------------------------------------------------------

SpecT = TypeVar("SpecT", bound="DataclassInstance")

_BARE_KEY = re.compile(r"[A-Za-z0-9_-]+")
"""A TOML bare key; any other key (empty, spaces, dots) is shown quoted."""


def _known(table: Mapping[str, Any], keys: tuple[str, ...], path: str) -> None:
    for key in table:
        if key not in keys:
            import json  # only for the message: not loaded before the app's first screen

            close = difflib.get_close_matches(key, keys, n=1)
            hint = f" (did you mean '{close[0]}'?)" if close else ""
            shown = key if _BARE_KEY.fullmatch(key) else json.dumps(key)  # as TOML quotes it
            where = f"{path}.{shown}" if path else shown
            known = ", ".join(keys)
            raise InputError(where, describe(table[key]), f"unknown key{hint}; known: {known}")


def _table(value: object, path: str) -> Mapping[str, Any]:
    if value is None:
        return {}
    if not isinstance(value, Mapping):
        raise InputError(path, describe(value), "must be a table ([section] or { ... })")
    return value


def _scalar(value: object, path: str) -> Value:
    if value is None or isinstance(value, str | int | float | bool):
        return value
    raise InputError(path, describe(value), "must be text or a number")


def _fill(spec: SpecT, table: Mapping[str, Any], keys: tuple[str, ...], path: str) -> SpecT:
    """Copy the scalar values of ``table`` into the dataclass ``spec``."""
    _known(table, keys, path)
    for name in keys:
        if name in table and name in {f.name for f in fields(spec)}:
            setattr(spec, name, _scalar(table[name], f"{path}.{name}" if path else name))
    return spec


def _segment(table: Mapping[str, Any], path: str) -> SegmentSpec:
    pipe = {k: v for k, v in table.items() if k != "fittings"}
    seg = _fill(SegmentSpec(), pipe, tuple(k for k in PIPE_KEYS if k != "fittings"), path)
    fittings = _table(table.get("fittings"), f"{path}.fittings")
    seg.fittings = {str(k): _scalar(v, f"{path}.fittings.{k}") for k, v in fittings.items()}
    return seg


def _branch(table: object, path: str) -> BranchSpec:
    table = _table(table, path)
    _known(table, BRANCH_KEYS, path)
    br = BranchSpec()
    for key in ("name", "valve_kv", "valve_cv", "measured_flow", "note"):
        if key in table:
            setattr(br, key, _scalar(table[key], f"{path}.{key}"))
    if "tag" in table:
        br.tag = _words(table["tag"], f"{path}.tag")
    own = {k: v for k, v in table.items() if k in PIPE_KEYS}
    if "segments" in table:
        segments = table["segments"]
        if not isinstance(segments, list) or not segments:
            raise InputError(f"{path}.segments", describe(segments),
                             "must be a list of one or more tables: [ {diameter = ...}, ... ]")
        if own:
            key = next(iter(own))
            raise InputError(f"{path}.{key}", describe(own[key]),
                             "a branch with segments gives its pipe values in each segment")
        br.segments = [_segment(_table(s, f"{path}.segments[{j}]"), f"{path}.segments[{j}]")
                       for j, s in enumerate(segments)]
    else:
        br.segments = [_segment(own, path)]
    return br


def _words(value: object, path: str, dates: bool = False) -> str:
    """Free text for the record; with ``dates``, a TOML date or date-time becomes its ISO text."""
    if isinstance(value, str):
        return value
    if dates and isinstance(value, date | time):  # datetime is a date
        return value.isoformat()
    key = path.rsplit(".", 1)[-1]
    hint = f' ({key} = "{value}")' if isinstance(value, int | float | date | time) else ""
    raise InputError(path, describe(value), f"must be text in quotes{hint}")


def _record(table: Mapping[str, Any]) -> RecordSpec:
    _known(table, RECORD_KEYS, "record")
    spec = RecordSpec()
    for key in (k for k in RECORD_KEYS if k in table):
        setattr(spec, key, _words(table[key], f"record.{key}", key == "date"))
    return spec


def _pair(value: object, path: str) -> list[Value]:
    if not isinstance(value, list):
        raise InputError(path, describe(value), "must be a pair [low, high]")
    return [_scalar(v, f"{path}[{i}]") for i, v in enumerate(value)]


def _tolerances(table: Mapping[str, Any]) -> TolerancesSpec:
    path = "tolerances"
    plain = {k: v for k, v in table.items() if k not in ("roughness_factor", "roughness_range")}
    spec = _fill(TolerancesSpec(), plain, TOLERANCE_KEYS, path)
    if "roughness_factor" in table:
        spec.roughness_factor = _pair(table["roughness_factor"], f"{path}.roughness_factor")
    ranges = _table(table.get("roughness_range"), f"{path}.roughness_range")
    spec.roughness_range = {str(k): _pair(v, f'{path}.roughness_range."{k}"')
                            for k, v in ranges.items()}
    return spec


def _visit(value: object, path: str) -> VisitSpec:
    """One ``[[visits]]`` table: its shape, a date that is a date, and at least one reading."""
    from .visits import has_reading, visit_date

    table = _table(value, path)
    _known(table, VISIT_KEYS, path)
    spec = VisitSpec()
    for key in ("technician", "pressure_instrument", "flow_instrument", "notes"):
        if key in table:
            setattr(spec, key, _words(table[key], f"{path}.{key}"))
    for key in ("pressure_drop", "total_flow", "given", "temperature"):
        if key in table:
            setattr(spec, key, _scalar(table[key], f"{path}.{key}"))
    measured = _table(table.get("measured"), f"{path}.measured")
    spec.measured = {str(k): _scalar(v, f'{path}.measured."{k}"') for k, v in measured.items()}
    spec.date = _words(table["date"], f"{path}.date", True) if "date" in table else None
    visit_date(spec.date, f"{path}.date")
    if not has_reading(spec):
        raise InputError(path, "no reading", "a visit needs at least one reading: "
                         "pressure_drop, total_flow or measured = { \"<branch>\" = ... }")
    return spec


def site_from_dict(doc: Mapping[str, Any], source: Path | None = None) -> Site:
    """A :class:`Site` from a parsed, migrated TOML document. Checks shape, not values; an
    error carries the names of the file's branches (:attr:`InputError.names`)."""
    try:
        return _site(doc, source)
    except InputError as exc:
        raise exc.naming(_branch_names(doc)) from None


def _branch_names(doc: Mapping[str, Any]) -> list[Value]:
    """The ``name`` of each ``[[branches]]`` table as typed (None where a table has none)."""
    tables = doc.get("branches")
    if not isinstance(tables, list):
        return []
    return [t.get("name") if isinstance(t, Mapping) and isinstance(t.get("name"), str)
            else None for t in tables]


def _site(doc: Mapping[str, Any], source: Path | None) -> Site:
    _known(doc, TOP_KEYS, "")
    if not any(key in doc for key in ("fluid", "conditions", "branches")):
        raise InputError("fluid", "nothing", "this file holds no site: no [fluid], [conditions] "
                         "or [[branches]] table (`branchwise demo FILE` writes one to start from)")
    site = Site(source=source)
    site.name = _scalar(doc.get("name", ""), "name")
    site.notes = _scalar(doc.get("notes"), "notes")
    if "record" in doc:
        site.record = _record(_table(doc["record"], "record"))
    site.fluid = _fill(FluidSpec(), _table(doc.get("fluid"), "fluid"), FLUID_KEYS, "fluid")
    conditions = _table(doc.get("conditions"), "conditions")
    site.conditions = _fill(ConditionsSpec(), conditions, CONDITION_KEYS, "conditions")
    branches = doc.get("branches", [])
    if not isinstance(branches, list):
        raise InputError("branches", describe(branches), "must be [[branches]] tables")
    site.branches = [_branch(b, f"branches[{i}]") for i, b in enumerate(branches)]
    if "solve" in doc:
        site.solve = _fill(SolveSpec(), _table(doc["solve"], "solve"), SOLVE_KEYS, "solve")
    if "tolerances" in doc:
        site.tolerances = _tolerances(_table(doc["tolerances"], "tolerances"))
    visits = doc.get("visits", [])
    if not isinstance(visits, list):
        raise InputError("visits", describe(visits), "must be [[visits]] tables")
    site.visits = [_visit(v, f"visits[{i}]") for i, v in enumerate(visits)]
    return site


def parse_site(text: str, source: str | Path = "<string>") -> Site:
    """A :class:`Site` from TOML text; errors name ``source`` and the line for bad TOML."""
    from ..storage.toml_files import migrate, parse_toml

    name = Path(source).name
    doc = parse_toml(text, name)
    site = site_from_dict(migrate(doc, "site", name), Path(source) if source != "<string>"
                          else None)
    site.origin = text
    return site


def load_site(path: str | Path) -> Site:
    """Read the site file ``path`` (never modifies it). InputError names the file and line."""
    from ..storage.file_checks import read_bytes
    from ..storage.toml_files import decode_text, migrate, parse_toml

    path = Path(path)
    text = decode_text(read_bytes(path), path.name)  # read once: a regular file, size capped
    doc = migrate(parse_toml(text, path.name), "site", path)
    site = site_from_dict(doc, path)
    site.origin = text
    return site


# ---- the demo --------------------------------------------------------------------------------

DEMO_NAME = "demo-site.toml"


@cache
def demo_text() -> str:
    """The bundled demo site file, comments and all."""
    return _demo_file().read_text(encoding="utf-8")


def demo_site() -> Site:
    """A fresh :class:`Site` of the bundled demo (no ``source``: saving asks for a path)."""
    site = parse_site(demo_text(), DEMO_NAME)
    site.source = None
    return site


def _demo_file() -> Path | Traversable:
    """The demo's file in the shipped presets: in the package's folder when it is one (so
    that starting the app loads none of ``importlib.resources``), else through it."""
    import branchwise.presets as presets

    beside = Path(presets.__file__).parent / DEMO_NAME if presets.__file__ else None
    if beside is not None and beside.is_file():
        return beside
    from importlib.resources import files

    return files("branchwise.presets").joinpath(DEMO_NAME)


DEMO_PATH = Path(str(_demo_file()))
"""The bundled demo site file (read it with :func:`demo_text`; never write to it)."""
