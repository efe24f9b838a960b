"""A site as typed: the tree of values a site file holds, every value kept as the person wrote it.

A :class:`Site` keeps every value as typed (``"64 m"``, ``"4 in sch 40"``, ``6.2``) for reports
and in-place editing; :mod:`.read` fills it from a file and checks only its shape,
:mod:`.build` checks the values and turns them into the core's SI objects, and :mod:`.write`
saves it keeping the file's comments.

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
                   total_flow_meter_accuracy, target_flow_measured, roughness_factor = [low, high],
                   roughness_range = { "<branch>" = [low, high] }, diameter, length,
                   temperature, fitting_k, valve_kv (missing keys: common-practice defaults)
    [[visits]]     optional, earlier visits (``[conditions]`` and ``[record]`` are today's):
                   date (YYYY-MM-DD, text or a TOML date), technician, pressure_instrument,
                   flow_instrument, notes; that day's pressure_drop, total_flow, given,
                   measured = { "AHU-3 coil" = "80 gpm" }; temperature (the liquid's that day)

A branch is one pipe (its keys at the top of the branch) or a list of series ``segments``, each
with its own pipe keys; mixing the two is refused as ambiguous. ``solve.segment`` counts from 1.
"""

from __future__ import annotations

from dataclasses import dataclass, field
from pathlib import Path

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
                  "total_flow_meter_accuracy", "target_flow_measured", "roughness_factor",
                  "roughness_range", "diameter", "length", "temperature", "fitting_k",
                  "valve_kv")
RECORD_KEYS = ("technician", "date", "pressure_instrument", "flow_instrument")
VISIT_KEYS = ("date", "technician", "pressure_instrument", "flow_instrument", "notes",
              "pressure_drop", "total_flow", "given", "measured", "temperature")
TOP_KEYS = ("format", "kind", "name", "notes", "record", "fluid", "conditions", "branches",
            "solve", "tolerances", "visits")


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
class VisitSpec:
    """An earlier visit as typed: its record, its readings and the liquid's temperature that
    day (see :mod:`.visits`). ``measured`` maps a branch's name to its clamp-on reading;
    ``date`` is ISO text (``"2025-03-12"``; a TOML date in the file is kept as that text)."""

    date: Value = None
    technician: Value = None
    pressure_instrument: Value = None
    flow_instrument: Value = None
    notes: Value = None
    pressure_drop: Value = None
    total_flow: Value = None
    given: Value = None
    measured: dict[str, Value] = field(default_factory=dict)
    temperature: Value = None


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
    :mod:`branchwise.core.site.tolerances`); None takes the common-practice default.

    Percentages are text with ``%`` (``"3 %"``); gauge_full_scale a pressure; temperature a
    temperature difference (``"2 K"``, ``"2 delta_degC"``); roughness_factor two numbers
    (low, high) multiplying the entered roughness; roughness_range maps a branch name to two
    roughness values (``["0.05 mm", "0.5 mm"]``) that replace the factor on that branch.
    """

    gauge_accuracy: Value = None
    gauge_full_scale: Value = None
    flow_meter_accuracy: Value = None
    total_flow_meter_accuracy: Value = None
    """The header's own total-flow meter, when it has one (None: as flow_meter_accuracy)."""
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
    visits: list[VisitSpec] = field(default_factory=list)
    """Earlier visits, as the file lists them; ``conditions`` and ``record`` are today's."""
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
