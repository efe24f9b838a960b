"""A solved site as JSON (SI, for scripts), a text table, CSV, and a Markdown walkdown record.

The JSON keys are a contract with scripts that read them: ``pressure_drop_pa``, ``head_loss_m``,
``total_flow_m3_s``, ``fluid``, ``branches`` (first segment's values at the top of each branch,
the others under ``segments``), ``solved``, ``warnings``, ``cautions``. Keys may be added, never
renamed (added since: ``record`` {``technician``, ``date``, ``pressure_instrument``,
``flow_instrument``} and each branch's ``tag``). The table, CSV and Markdown
(:mod:`.reporttext`) are in the reader's unit system (``si`` or ``us``); the lines they share
(summary, solved unknown, record) are here.
"""

from __future__ import annotations

import json
import math
from typing import Any

from . import bandtext
from .model import MeasuredFlow, PressureDrop, TotalFlow
from .results import SegmentResult
from .sitefile import RECORD_KEYS, RecordSpec, Site
from .sitesolve import SiteResult
from .units import fluid_name, format_quantity

CAUTIONS = (
    "Pressurised, hot or hazardous lines can injure: keep clear of them unless the owner's "
    "procedures allow the work.",
    "These figures are estimates for planning and troubleshooting; confirm them with site "
    "measurements before acting on them.",
    "Follow local codes, the owner's procedures and the engineer of record.",
    "A licensed professional decides design and safety questions.",
)
FORMATS = ("table", "json", "csv", "markdown")


def version() -> str:
    """The installed branchwise version, or ``unknown`` when run from an uninstalled tree."""
    from importlib.metadata import PackageNotFoundError
    from importlib.metadata import version as _version

    try:
        return _version("branchwise")
    except PackageNotFoundError:
        return "unknown"


def _num(value: float) -> float | None:
    """JSON has no NaN or infinity: such values become null."""
    return float(value) if math.isfinite(value) else None


# ---- JSON ----------------------------------------------------------------------------------

def _segment_json(seg: SegmentResult) -> dict[str, Any]:
    return {
        "velocity_m_s": _num(seg.velocity), "reynolds": _num(seg.reynolds),
        "friction_factor": _num(seg.friction_factor), "regime": seg.regime,
        "diameter_m": seg.diameter, "length_m": seg.length, "roughness_m": seg.roughness,
        "minor_k": seg.minor_k, "major_loss_m": _num(seg.major_loss),
        "minor_loss_m": _num(seg.minor_loss),
    }


def _given_json(sr: SiteResult) -> dict[str, Any]:
    g = sr.built.given
    if isinstance(g, PressureDrop):
        return {"quantity": "pressure_drop", "branch": None, "value_si": g.value}
    if isinstance(g, TotalFlow):
        return {"quantity": "total_flow", "branch": None, "value_si": g.value}
    branch = g.branch if isinstance(g, MeasuredFlow) else None
    return {"quantity": "measured_flow", "branch": branch, "value_si": g.value}


def _readings_json(sr: SiteResult) -> list[dict[str, Any]]:
    from .readings import compare

    return [{"quantity": c.kind, "branch": c.branch, "value_si": c.read, "solved_si": c.solved,
             "difference": c.difference, "within_band": c.within} for c in compare(sr)]


def _solved_json(sr: SiteResult) -> dict[str, Any] | None:
    s = sr.result.solved
    if s is None:
        return None
    pick = sr.catalog
    return {
        "quantity": s.quantity, "branch": s.branch, "segment": s.segment + 1,
        "value_si": s.value, "target_flow_m3_s": s.target_flow,
        "catalog_size": pick.size.label if pick else None,
        "catalog_inner_diameter_m": pick.size.inner_diameter_m if pick else None,
        "flow_at_catalog_size_m3_s": pick.flow if pick else None,
        "held": _given_json(sr)["quantity"] if pick else None,
    }


def to_dict(sr: SiteResult) -> dict[str, Any]:
    """The result as plain data in SI (the JSON contract; see the module docstring)."""
    r, net = sr.result, sr.result.network
    branches = []
    for i, b in enumerate(r.branches):
        first, *rest = b.segments
        size = sr.built.sizes[i][0]
        tag = sr.site.branches[i].tag if i < len(sr.site.branches) else None
        branches.append({
            "name": b.name, "tag": tag if isinstance(tag, str) else None,
            "flow_m3_s": b.flow, "share": _num(b.share), **_segment_json(first),
            "size": size.label if size is not None else None,
            "valve_kv": net.branches[i].valve_kv, "valve_loss_m": b.valve_loss,
            "head_loss_m": _num(b.head_loss),
            "segments": [_segment_json(s) for s in rest],
        })
    return {
        "site": sr.site.title,
        "record": record_json(sr.site),
        "branchwise_version": version(),
        "units": "SI",
        "given": _given_json(sr),
        "pressure_drop_pa": r.pressure_drop,
        "head_loss_m": r.head_loss,
        "driving_head_m": r.driving_head,
        "elevation_change_m": net.elevation_change,
        "total_flow_m3_s": r.total_flow,
        "friction_model": net.friction,
        "gravity_m_s2": net.gravity,
        "fluid": {
            "name": net.fluid.name, "kind": net.fluid.kind,
            "density_kg_m3": net.fluid.density, "viscosity_pa_s": net.fluid.viscosity,
            "kinematic_viscosity_m2_s": net.fluid.kinematic_viscosity,
            "source": net.fluid.source,
        },
        "branches": branches,
        "solved": _solved_json(sr),
        "other_readings": _readings_json(sr),
        "warnings": [{"code": w.code, "branch": w.branch, "message": w.message}
                     for w in r.warnings],
        "notes": [*sr.notes, *r.notes],
        "convergence": {"converged": r.convergence.converged,
                        "iterations": r.convergence.iterations,
                        "residual": _num(r.convergence.residual)},
        "cautions": list(CAUTIONS),
        "uncertainty": bandtext.uncertainty_json(sr),
    }


def _finite(obj: Any) -> Any:
    """``obj`` with every NaN or infinite float replaced by None (JSON null)."""
    if isinstance(obj, float):
        return _num(obj)
    if isinstance(obj, dict):
        return {k: _finite(v) for k, v in obj.items()}
    if isinstance(obj, list):
        return [_finite(v) for v in obj]
    return obj


def to_json(sr: SiteResult, indent: int | None = 2) -> str:
    """:func:`to_dict` as strict JSON text: a value that is not finite is written as null."""
    doc = _finite(to_dict(sr))
    return json.dumps(doc, indent=indent, ensure_ascii=False, allow_nan=False) + "\n"


# ---- lines shared by the reports -----------------------------------------------------------

def _given_text(sr: SiteResult, system: str) -> str:
    g = sr.built.given
    if isinstance(g, PressureDrop):
        return f"pressure drop {format_quantity(g.value, 'pressure', system)}"
    if isinstance(g, TotalFlow):
        return f"total flow {format_quantity(g.value, 'flow', system)}"
    return f"measured flow {format_quantity(g.value, 'flow', system)} in '{g.branch}'"


def _held_text(sr: SiteResult, system: str) -> str:
    g = sr.built.given
    if isinstance(g, TotalFlow):
        return (f"the total flow of {format_quantity(g.value, 'flow', system)} held: the other "
                "branches then carry less")
    if isinstance(g, MeasuredFlow):
        return (f"the measured {format_quantity(g.value, 'flow', system)} in '{g.branch}' held, "
                "so the driving head is unchanged")
    return f"the pressure drop of {format_quantity(g.value, 'pressure', system)} held"


def summary_lines(sr: SiteResult, system: str = "si") -> list[str]:
    """The few lines above a results table: fluid, given condition, head, total flow."""
    r, net = sr.result, sr.result.network
    fl = net.fluid
    return [
        f"Fluid: {fluid_name(fl, system)}: density "
        f"{format_quantity(fl.density, 'density', system)}, "
        f"viscosity {format_quantity(fl.viscosity, 'viscosity', system)} ({fl.source})",
        f"Given: {_given_text(sr, system)}; elevation change "
        f"{format_quantity(net.elevation_change, 'length', system)}; friction {net.friction}",
        f"Pressure drop {format_quantity(r.pressure_drop, 'pressure', system)}, head loss "
        f"{format_quantity(r.head_loss, 'head', system)}, total flow "
        f"{format_quantity(r.total_flow, 'flow', system)}",
        *readings_lines(sr, system),
    ]


def readings_lines(sr: SiteResult, system: str = "si") -> list[str]:
    """The readings kept beside the given one, each against what the solve makes of it."""
    from .readings import compare

    lines = []
    for c in compare(sr):
        kind = "pressure" if c.kind == "pressure_drop" else "flow"
        what = {"pressure_drop": "pressure drop", "total_flow": "total flow"}.get(
            c.kind, f"measured flow in '{c.branch}'")
        band = ("" if c.within is None else
                "; within the P5–P95 band" if c.within else "; outside the P5–P95 band")
        lines.append(f"Also read: {what} {format_quantity(c.read, kind, system)}; the solve "
                     f"gives {format_quantity(c.solved, kind, system)} "
                     f"({c.difference:+.1%}{band})")
    return lines


def solved_lines(sr: SiteResult, system: str = "si") -> list[str]:
    """The found unknown and, for a catalog pipe, the size to buy and what it carries."""
    s = sr.result.solved
    if s is None:
        return []
    kind = {"diameter": "diameter", "length": "length", "roughness": "roughness"}[s.quantity]
    seg = f" (segment {s.segment + 1})" if len(sr.result.branch(s.branch).segments) > 1 else ""
    lines = [f"{s.quantity.capitalize()} of '{s.branch}'{seg} to carry "
             f"{format_quantity(s.target_flow, 'flow', system)}: "
             f"{format_quantity(s.value, kind, system)}{_against_table(sr, system)}"]
    if sr.catalog is not None:
        c = sr.catalog
        lines.append(
            f"Smallest catalog size at least that large: {c.size.label} "
            f"(inner diameter {format_quantity(c.size.inner_diameter_m, 'diameter', system)}); "
            f"with it the branch carries {format_quantity(c.flow, 'flow', system)} "
            f"({_held_text(sr, system)}).")
    return lines


def _against_table(sr: SiteResult, system: str) -> str:
    """For a found roughness, the material's table value for new pipe beside it ('' when the
    segment names no material): how much rougher the line has become."""
    from .errors import BranchwiseError
    from .userpresets import material_for

    s = sr.result.solved
    if s is None or s.quantity != "roughness":
        return ""
    names = [b.name for b in sr.site.branches]
    if s.branch not in names:
        return ""
    specs = sr.site.branches[names.index(s.branch)].segments
    key = specs[s.segment].material if s.segment < len(specs) else None
    if not isinstance(key, str):
        return ""
    try:
        new = material_for(key.strip(), "material").roughness_m
    except BranchwiseError:
        return ""
    if new <= 0:
        return f" (the table value for {key.strip()} is smooth, 0)"
    return (f" ({s.value / new:.2g}× the table value for new {key.strip()}, "
            f"{format_quantity(new, 'roughness', system)})")


def _text(value: object) -> str:
    """A record value as one line of text ('' when absent or blank)."""
    return " ".join(value.split()) if isinstance(value, str) else ""


def record_json(site: Site) -> dict[str, str | None]:
    """The ``record`` object of the JSON: who took the readings, when and with what (free
    text as typed; None where not given)."""
    r = site.record or RecordSpec()
    return {key: (getattr(r, key) if isinstance(getattr(r, key), str) else None)
            for key in RECORD_KEYS}


def record_lines(site: Site) -> list[str]:
    """The record's lines for a report header: ``Readings taken 2025-03-12 by R. Example``,
    ``Pressure instrument: ...``, ``Flow instrument: ...`` ([] without a ``[record]``)."""
    r = site.record
    if r is None:
        return []
    when, who = _text(r.date), _text(r.technician)
    out = []
    if when or who:
        out.append("Readings taken" + (f" {when}" if when else "") + (f" by {who}" if who else ""))
    for label, value in (("Pressure instrument", r.pressure_instrument),
                         ("Flow instrument", r.flow_instrument)):
        if _text(value):
            out.append(f"{label}: {_text(value)}")
    return out


def render(sr: SiteResult, fmt: str = "table", system: str = "si") -> str:
    """``sr`` in one of :data:`FORMATS`."""
    if fmt == "json":
        return to_json(sr)
    from . import reporttext

    if fmt == "csv":
        return reporttext.to_csv(sr, system)
    if fmt == "markdown":
        return reporttext.to_markdown(sr, system)
    return reporttext.to_table(sr, system)


_ELSEWHERE = ("to_table", "to_csv", "to_markdown", "inputs_as_entered", "COLUMNS")


def __getattr__(name: str) -> Any:
    """The text table, CSV and Markdown live in :mod:`.reporttext` (which imports this
    module); their names are reachable here too (``report.to_csv``), loaded on first use."""
    if name in _ELSEWHERE:
        from . import reporttext

        return getattr(reporttext, name)
    raise AttributeError(f"module {__name__!r} has no attribute {name!r}")
