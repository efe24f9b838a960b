"""A solved site as JSON (SI, for scripts), a text table, CSV, and a Markdown walkdown record.

The JSON keys are a contract with scripts that read them: ``pressure_drop_pa``, ``head_loss_m``,
``total_flow_m3_s``, ``fluid``, ``branches`` (first segment's values at the top of each branch,
the others under ``segments``), ``solved``, ``warnings``, ``cautions``. Keys may be added, never
renamed. The table, CSV and Markdown are in the reader's unit system (``si`` or ``us``).
"""

from __future__ import annotations

import csv
import io
import json
import math
from collections.abc import Iterator
from datetime import datetime
from typing import Any

from . import bandtext
from .model import MeasuredFlow, PressureDrop, TotalFlow
from .results import BranchResult, SegmentResult
from .sitefile import Site
from .sitesolve import SiteResult
from .sitewrite import site_to_dict
from .units import display_unit as _unit
from .units import format_number, format_quantity, to_unit, unit_label

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
        branches.append({
            "name": b.name, "flow_m3_s": b.flow, "share": _num(b.share), **_segment_json(first),
            "size": size.label if size is not None else None,
            "valve_kv": net.branches[i].valve_kv, "valve_loss_m": b.valve_loss,
            "head_loss_m": _num(b.head_loss),
            "segments": [_segment_json(s) for s in rest],
        })
    return {
        "site": sr.site.title,
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


# ---- rows in the reader's units ------------------------------------------------------------

COLUMNS: tuple[tuple[str, str | None], ...] = (
    ("Branch", None), ("Seg", None), ("Flow", "flow"), ("P5–P95", "flow"), ("Share", "%"),
    ("Velocity", "velocity"), ("Reynolds", None), ("f", None), ("Regime", None),
    ("Diameter", "diameter"), ("Length", "length"), ("Major loss", "head"),
    ("Minor loss", "head"), ("Valve loss", "head"),
)


def _units_row(system: str) -> list[str]:
    return ["", "", *(("%" if k == "%" else unit_label(_unit(k, system))) if k else ""
                      for _, k in COLUMNS[2:])]


def _rows(sr: SiteResult, system: str) -> Iterator[tuple[BranchResult, int, list[str]]]:
    def q(value: float, kind: str) -> str:
        return format_number(to_unit(value, kind, _unit(kind, system)))

    for b in sr.result.branches:
        for j, s in enumerate(b.segments):
            first = j == 0
            share = format_number(b.share * 100, 3) if first and math.isfinite(b.share) else ""
            yield b, j, [
                b.name if first else "", str(j + 1) if len(b.segments) > 1 else "",
                q(b.flow, "flow") if first else "",
                bandtext.flow_band_cell(sr, b.name, system) if first else "", share,
                q(s.velocity, "velocity"), f"{s.reynolds:.0f}",
                format_number(s.friction_factor, 4), s.regime,
                q(s.diameter, "diameter"), q(s.length, "length"),
                q(s.major_loss, "head"), q(s.minor_loss, "head"),
                q(b.valve_loss, "head") if first and b.valve_loss else "",
            ]


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
        f"Fluid: {fl.name}: density {format_quantity(fl.density, 'density', system)}, "
        f"viscosity {format_quantity(fl.viscosity, 'viscosity', system)} ({fl.source})",
        f"Given: {_given_text(sr, system)}; elevation change "
        f"{format_quantity(net.elevation_change, 'length', system)}; friction {net.friction}",
        f"Pressure drop {format_quantity(r.pressure_drop, 'pressure', system)}, head loss "
        f"{format_quantity(r.head_loss, 'head', system)}, total flow "
        f"{format_quantity(r.total_flow, 'flow', system)}",
    ]


def solved_lines(sr: SiteResult, system: str = "si") -> list[str]:
    """The found unknown and, for a catalog pipe, the size to buy and what it carries."""
    s = sr.result.solved
    if s is None:
        return []
    kind = {"diameter": "diameter", "length": "length", "roughness": "roughness"}[s.quantity]
    seg = f" (segment {s.segment + 1})" if len(sr.result.branch(s.branch).segments) > 1 else ""
    lines = [f"{s.quantity.capitalize()} of '{s.branch}'{seg} to carry "
             f"{format_quantity(s.target_flow, 'flow', system)}: "
             f"{format_quantity(s.value, kind, system)}"]
    if sr.catalog is not None:
        c = sr.catalog
        lines.append(
            f"Smallest catalog size at least that large: {c.size.label} "
            f"(inner diameter {format_quantity(c.size.inner_diameter_m, 'diameter', system)}); "
            f"with it the branch carries {format_quantity(c.flow, 'flow', system)} "
            f"({_held_text(sr, system)}).")
    return lines


# ---- text table ----------------------------------------------------------------------------

def _grid(header: list[str], units: list[str], rows: list[list[str]]) -> list[str]:
    keep = [i for i in range(len(header)) if any(r[i] for r in rows) or i == 0]
    table = [[row[i] for i in keep] for row in (header, units, *rows)]
    widths = [max(len(r[i]) for r in table) for i in range(len(keep))]

    def line(row: list[str]) -> str:
        cells = [row[0].ljust(widths[0])]
        cells += [c.rjust(w) if c[:1].isdigit() or c[:1] == "-" else c.ljust(w)
                  for c, w in zip(row[1:], widths[1:], strict=True)]
        return "  ".join(cells).rstrip()

    return [line(table[0]), line(table[1]), *(line(r) for r in table[2:])]


def _notes(sr: SiteResult) -> list[str]:
    return [*sr.notes, *sr.result.notes, *(sr.uncertainty.notes if sr.uncertainty else ())]


def to_table(sr: SiteResult, system: str = "si") -> str:
    """A readable plain-text report in the ``system`` units (``si`` or ``us``)."""
    rows = [cells for _, _, cells in _rows(sr, system)]
    out = [sr.site.title, "", *summary_lines(sr, system), ""]
    out += _grid([c for c, _ in COLUMNS], _units_row(system), rows)
    if sr.result.solved:
        out += ["", *solved_lines(sr, system)]
    if sr.uncertainty is not None:
        out += ["", *bandtext.summary_lines(sr, system), "", *bandtext.ranking_lines(sr, system)]
    if sr.result.warnings:
        out += ["", "Warnings:"]
        out += [f"  - {w.branch + ': ' if w.branch else ''}{w.message} [{w.code}]"
                for w in sr.result.warnings]
    notes = _notes(sr)
    if notes:
        out += ["", "Notes:", *(f"  - {n}" for n in notes)]
    out += ["", "Cautions:", *(f"  - {c}" for c in CAUTIONS)]
    return "\n".join(out) + "\n"


# ---- CSV -----------------------------------------------------------------------------------

def to_csv(sr: SiteResult, system: str = "si") -> str:
    """One row per segment, units in the header (``Flow (L/s)``), for a spreadsheet; with
    uncertainty bands, ``Flow P5`` and ``Flow P95`` columns after the flow and the total bands
    as ``#`` rows; the cautions follow as one-cell rows starting with ``#``."""
    buf = io.StringIO()
    writer = csv.writer(buf, lineterminator="\n")
    units = _units_row(system)
    header = [f"{c} ({u})" if u else c for (c, _), u in zip(COLUMNS, units, strict=True)]
    band = sr.uncertainty is not None
    flow_unit = units[2]
    header[3:4] = [f"Flow P5 ({flow_unit})", f"Flow P95 ({flow_unit})"] if band else []
    writer.writerow(header)
    for b, j, cells in _rows(sr, system):
        cells[0] = b.name  # every row names its branch, so rows can be sorted and filtered
        cells[1] = str(j + 1)
        pair = bandtext.band_range(sr, f"branch '{b.name}' flow", system) if j == 0 else None
        cells[3:4] = ([format_number(v) for v in pair] if pair else ["", ""]) if band else []
        writer.writerow(cells)
    for line in bandtext.summary_lines(sr, system):
        writer.writerow([f"# {line}"])
    for caution in CAUTIONS:  # after the data, as "#" lines a reader can skip (comment="#")
        writer.writerow([f"# {caution}"])
    return buf.getvalue()


# ---- Markdown walkdown record --------------------------------------------------------------

def inputs_as_entered(site: Site) -> list[tuple[str, str]]:
    """Every value of ``site`` with its field path, as typed (for the record)."""
    out: list[tuple[str, str]] = []

    def walk(prefix: str, value: Any) -> None:
        if isinstance(value, dict):
            for k, v in value.items():
                walk(f"{prefix}.{k}" if prefix else k, v)
        elif isinstance(value, list):
            for i, v in enumerate(value):
                walk(f"{prefix}[{i}]", v)
        else:
            out.append((prefix, value if isinstance(value, str) else json.dumps(value)))

    doc = site_to_dict(site)
    for key in ("format", "kind"):
        doc.pop(key, None)
    walk("", doc)
    return out


def _md(text: str) -> str:
    return text.replace("|", "\\|").replace("\n", " ")


def to_markdown(
    sr: SiteResult, system: str = "si", date: datetime | None = None, source: str | None = None
) -> str:
    """A walkdown record a technician can paste into a work order."""
    date = date or datetime.now().astimezone()
    src = source or (str(sr.site.source) if sr.site.source else "(not saved)")
    out = [
        f"# Walkdown record: {_md(sr.site.title)}", "",
        f"- Date: {date.strftime('%Y-%m-%d %H:%M %Z').strip()}",
        f"- Site file: `{src}`",
        f"- Calculated with branchwise {version()}; units: {system.upper()}", "",
    ]
    if isinstance(sr.site.notes, str) and sr.site.notes.strip():
        out += [_md(sr.site.notes.strip()), ""]
    out += ["## Inputs as entered", "", "| Field | Value |", "|---|---|"]
    out += [f"| `{path}` | {_md(value)} |" for path, value in inputs_as_entered(sr.site)]
    out += ["", "## Results", "", *(f"- {_md(s)}" for s in summary_lines(sr, system)), ""]
    rows = [cells for _, _, cells in _rows(sr, system)]
    units = _units_row(system)
    header = [f"{c} ({u})" if u else c for (c, _), u in zip(COLUMNS, units, strict=True)]
    keep = [i for i in range(len(header)) if any(r[i] for r in rows) or i == 0]
    out.append("| " + " | ".join(header[i] for i in keep) + " |")
    out.append("|" + "|".join("---" for _ in keep) + "|")
    out += ["| " + " | ".join(_md(r[i]) for i in keep) + " |" for r in rows]
    if sr.result.solved:
        out += ["", "## Solved unknown", "", *(f"- {_md(s)}" for s in solved_lines(sr, system))]
    out += bandtext.markdown_lines(sr, system)
    out += ["", "## Warnings", ""]
    out += ([f"- {_md((w.branch + ': ') if w.branch else '')}{_md(w.message)} (`{w.code}`)"
             for w in sr.result.warnings] or ["- None."])
    notes = _notes(sr)
    if notes:
        out += ["", "## Notes", "", *(f"- {_md(n)}" for n in notes)]
    out += ["", "## Cautions", "", *(f"- {c}" for c in CAUTIONS)]
    return "\n".join(out) + "\n"


def render(sr: SiteResult, fmt: str = "table", system: str = "si") -> str:
    """``sr`` in one of :data:`FORMATS`."""
    if fmt == "json":
        return to_json(sr)
    if fmt == "csv":
        return to_csv(sr, system)
    if fmt == "markdown":
        return to_markdown(sr, system)
    return to_table(sr, system)
