"""Site files: a walkdown kept as human-editable TOML, read into an editable tree of strings.

A :class:`Site` keeps every value as typed (``"64 m"``, ``"4 in sch 40"``, ``6.2``) for reports
and in-place editing. Reading checks only the file's shape; :func:`.sitebuild.build` checks the
values, so the app can open a file with one bad value and show the error beside that field.

File layout (format 1; the keys are a contract)::

    format = 1
    name = "North cooling header"
    [record]       optional, for the walkdown record only: technician, date (text or a TOML
                   date), pressure_instrument, flow_instrument
    [fluid]        kind, temperature, pressure, concentration, salinity, density, viscosity,
                   kinematic_viscosity, name
    [conditions]   pressure_drop / total_flow / a branch's measured_flow: one, or several and
                   given = the one to solve from; elevation_change, friction, gravity,
                   velocity_limit optional
    [[branches]]   name; tag (the plant's line or valve tag, optional); diameter | size;
                   length; roughness | material (+ condition); minor_k;
                   fittings = { elbow-90 = 4 }; hw_c; valve_kv | valve_cv; measured_flow;
                   or segments = [ {diameter.., length.., ...}, ... ]
    [solve]        find = flows | diameter | length | roughness; branch; target_flow; segment
    [tolerances]   optional: gauge_accuracy, gauge_full_scale, flow_meter_accuracy,
                   target_flow_measured, roughness_factor = [low, high],
                   roughness_range = { "<branch>" = [low, high] }, diameter, length,
                   temperature, fitting_k, valve_kv (missing keys: common-practice defaults)

A branch is one pipe (its keys at the top of the branch) or a list of series ``segments``, each
with its own pipe keys; mixing the two is refused as ambiguous. ``solve.segment`` counts from 1.
"""

from __future__ import annotations

import difflib
import json
import re
from collections.abc import Mapping
from dataclasses import dataclass, field, fields
from datetime import date, time
from functools import cache
from pathlib import Path
from typing import Any

from .errors import InputError
from .units import describe

Value = str | int | float | bool | None
"""A value as it was typed: text with units, a number, or None when absent."""

FORMAT = 1

PIPE_KEYS = ("diameter", "size", "length", "roughness", "material", "condition", "minor_k",
             "hw_c", "fittings")
BRANCH_KEYS = ("name", "tag", *PIPE_KEYS, "valve_kv", "valve_cv", "measured_flow", "segments",
               "note")
FLUID_KEYS = ("kind", "name", "temperature", "pressure", "concentration", "salinity", "density",
              "viscosity", "kinematic_viscosity")
CONDITION_KEYS = ("pressure_drop", "total_flow", "elevation_change", "friction", "gravity",
                  "velocity_limit", "given")
SOLVE_KEYS = ("find", "branch", "target_flow", "segment")
TOLERANCE_KEYS = ("gauge_accuracy", "gauge_full_scale", "flow_meter_accuracy",
                  "target_flow_measured", "roughness_factor", "roughness_range", "diameter",
                  "length", "temperature", "fitting_k", "valve_kv")
RECORD_KEYS = ("technician", "date", "pressure_instrument", "flow_instrument")
TOP_KEYS = ("format", "kind", "name", "notes", "record", "fluid", "conditions", "branches",
            "solve", "tolerances")


@dataclass
class SegmentSpec:
    """One series pipe as typed. ``fittings`` maps a catalog fitting key to a count."""

    diameter: Value = None
    size: Value = None
    length: Value = None
    roughness: Value = None
    material: Value = None
    condition: Value = None
    minor_k: Value = None
    hw_c: Value = None
    fittings: dict[str, Value] = field(default_factory=dict)


@dataclass
class BranchSpec:
    """One branch as typed: its series segments (one for a plain pipe), valve and reading."""

    name: Value = ""
    tag: Value = None
    segments: list[SegmentSpec] = field(default_factory=lambda: [SegmentSpec()])
    valve_kv: Value = None
    valve_cv: Value = None
    measured_flow: Value = None
    note: Value = None


@dataclass
class RecordSpec:
    """Who took the readings, when, and with what, as typed: free text for the walkdown record
    (the reports' header, the JSON ``record``); the solve never reads it.

    date: text (``"2025-03-12"``, ``"12 March, morning"``); a TOML date in the file is kept as
    its ISO text. pressure_instrument / flow_instrument: the differential gauge and the flow
    meter (id, range, calibration), e.g. ``"DPG-14, 0-30 psid, cal. 2025-01"``.
    """

    technician: Value = None
    date: Value = None
    pressure_instrument: Value = None
    flow_instrument: Value = None


@dataclass
class FluidSpec:
    """The liquid as typed: a kind (or a preset key) and what that kind needs."""

    kind: Value = "water"
    name: Value = None
    temperature: Value = None
    pressure: Value = None
    concentration: Value = None
    salinity: Value = None
    density: Value = None
    viscosity: Value = None
    kinematic_viscosity: Value = None


@dataclass
class ConditionsSpec:
    """The readings and which one fixes the head (``given``), and the network's settings."""

    pressure_drop: Value = None
    total_flow: Value = None
    elevation_change: Value = None
    friction: Value = None
    gravity: Value = None
    velocity_limit: Value = None
    given: Value = None


@dataclass
class SolveSpec:
    """What to find, as typed. ``segment`` counts from 1."""

    find: Value = "flows"
    branch: Value = None
    target_flow: Value = None
    segment: Value = None


@dataclass
class TolerancesSpec:
    """The ± limits on the readings and the line, as typed (see
    :mod:`branchwise.core.sitetolerances`); None takes the common-practice default.

    Percentages are text with ``%`` (``"3 %"``); gauge_full_scale a pressure; temperature a
    temperature difference (``"2 K"``, ``"2 delta_degC"``); roughness_factor two numbers
    (low, high) multiplying the entered roughness; roughness_range maps a branch name to two
    roughness values (``["0.05 mm", "0.5 mm"]``) that replace the factor on that branch.
    """

    gauge_accuracy: Value = None
    gauge_full_scale: Value = None
    flow_meter_accuracy: Value = None
    target_flow_measured: Value = None
    roughness_factor: list[Value] | None = None
    roughness_range: dict[str, list[Value]] = field(default_factory=dict)
    diameter: Value = None
    length: Value = None
    temperature: Value = None
    fitting_k: Value = None
    valve_kv: Value = None


@dataclass
class Site:
    """A whole site as typed. ``source`` is the file it came from; ``origin`` that file's text
    (kept so a save can preserve the comments and notice edits made behind our back)."""

    name: Value = ""
    fluid: FluidSpec = field(default_factory=FluidSpec)
    conditions: ConditionsSpec = field(default_factory=ConditionsSpec)
    branches: list[BranchSpec] = field(default_factory=list)
    solve: SolveSpec | None = None
    notes: Value = None
    tolerances: TolerancesSpec | None = None
    record: RecordSpec | None = None
    source: Path | None = field(default=None, compare=False)
    origin: str | None = field(default=None, compare=False, repr=False)

    @property
    def title(self) -> str:
        """The site's name, or the file's stem, or "Untitled site"."""
        if isinstance(self.name, str) and self.name.strip():
            return self.name.strip()
        return self.source.stem if self.source else "Untitled site"

    def measured_branches(self) -> list[int]:
        """Indices of the branches that carry a measured flow."""
        return [i for i, b in enumerate(self.branches) if b.measured_flow is not None]


# ---- reading ---------------------------------------------------------------------------------

_BARE_KEY = re.compile(r"[A-Za-z0-9_-]+")
"""A TOML bare key; any other key (empty, spaces, dots) is shown quoted."""


def _known(table: Mapping[str, Any], keys: tuple[str, ...], path: str) -> None:
    for key in table:
        if key not in keys:
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


def _fill(spec: Any, table: Mapping[str, Any], keys: tuple[str, ...], path: str) -> Any:
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


def site_from_dict(doc: Mapping[str, Any], source: Path | None = None) -> Site:
    """A :class:`Site` from a parsed, migrated TOML document. Checks shape, not values."""
    _known(doc, TOP_KEYS, "")
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
    return site


def parse_site(text: str, source: str | Path = "<string>") -> Site:
    """A :class:`Site` from TOML text; errors name ``source`` and the line for bad TOML."""
    from .tomlfile import migrate, parse_toml

    name = Path(source).name
    doc = parse_toml(text, name)
    site = site_from_dict(migrate(doc, "site", name), Path(source) if source != "<string>"
                          else None)
    site.origin = text
    return site


def load_site(path: str | Path) -> Site:
    """Read the site file ``path`` (never modifies it). InputError names the file and line."""
    from .tomlfile import load_toml, migrate

    path = Path(path)
    doc = migrate(load_toml(path), "site", path)
    site = site_from_dict(doc, path)
    site.origin = path.read_bytes().decode("utf-8").removeprefix("\ufeff")
    return site


# ---- the demo --------------------------------------------------------------------------------

DEMO_NAME = "demo-site.toml"


@cache
def demo_text() -> str:
    """The bundled demo site file, comments and all."""
    from importlib.resources import files

    return files("branchwise.presets").joinpath(DEMO_NAME).read_text(encoding="utf-8")


def demo_site() -> Site:
    """A fresh :class:`Site` of the bundled demo (no ``source``: saving asks for a path)."""
    site = parse_site(demo_text(), DEMO_NAME)
    site.source = None
    return site


def _demo_path() -> Path:
    from importlib.resources import files

    return Path(str(files("branchwise.presets").joinpath(DEMO_NAME)))


DEMO_PATH = _demo_path()
"""The bundled demo site file (read it with :func:`demo_text`; never write to it)."""


_ELSEWHERE = {"build": "sitebuild", "Built": "sitebuild", "solve_site": "sitesolve",
              "SiteResult": "sitesolve", "CatalogPick": "sitesolve", "dump_site": "sitewrite",
              "save_site": "sitewrite", "site_to_dict": "sitewrite",
              "uncertainty_for_site": "sitesolve"}


def __getattr__(name: str) -> Any:
    """Writing, building and solving live in :mod:`.sitewrite`, :mod:`.sitebuild` and
    :mod:`.sitesolve` (which import this module); their main names are reachable here too,
    loaded on first use: ``sitefile.save_site``, ``sitefile.solve_site``..."""
    if name in _ELSEWHERE:
        from importlib import import_module

        return getattr(import_module(f".{_ELSEWHERE[name]}", __package__), name)
    raise AttributeError(f"module {__name__!r} has no attribute {name!r}")
