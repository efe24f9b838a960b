"""A solved site as JSON: SI values for scripts.

The keys are a contract with scripts that read them: ``pressure_drop_pa``, ``head_loss_m``,
``total_flow_m3_s``, ``fluid``, ``branches`` (first segment's values at the top of each branch,
the others under ``segments``), ``solved``, ``warnings``, ``cautions``. Keys may be added, never
renamed (added since: ``record`` {``technician``, ``date``, ``pressure_instrument``,
``flow_instrument``}, each branch's ``tag``, ``given``, ``other_readings``, ``uncertainty``,
``schema_version``, ``assumptions`` [{``code``, ``branch``, ``message``}],
``reconciliation``, ``history``: the site's visits and trends,
:meth:`branchwise.core.history.History.to_json`, null without ``[[visits]]``). The published
JSON Schema is ``result.schema.json`` (:mod:`.schema`): a key added here is described there too.
"""

from __future__ import annotations

import json
import math
from typing import Any

from ..givens import branch_of, kind_of
from ..messages import render
from ..numerics.results import SegmentResult
from ..site.readings import compare
from ..site.reconcile import solves_from_all
from ..site.solve import SiteResult
from ..site.spec import RECORD_KEYS, RecordSpec, Site
from . import band
from .lines import CAUTIONS, version
from .schema import SCHEMA_VERSION


def _num(value: float) -> float | None:
    """JSON has no NaN or infinity: such values become null."""
    return float(value) if math.isfinite(value) else None


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
    if solves_from_all(sr.site):  # the reconciled pressure drop fixes the head
        return {"quantity": "all", "branch": None, "value_si": g.value}
    return {"quantity": kind_of(g).key, "branch": branch_of(g),
            "value_si": g.value}


def _readings_json(sr: SiteResult) -> list[dict[str, Any]]:
    return [{"quantity": c.kind, "branch": c.branch, "value_si": c.read, "solved_si": c.solved,
             "difference": c.difference, "within_band": c.within}
            for c in compare(sr.site, sr.result, sr.uncertainty)]


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


def history_json(site: Site) -> tuple[dict[str, Any] | None, list[str]]:
    """The ``history`` object of a site with earlier visits (None without), and a note when a
    visit cannot be solved (the answer of today stands; the note says why the history is
    missing)."""
    if not site.visits:
        return None, []
    from ..errors import BranchwiseError
    from ..history import history_of

    try:
        return history_of(site).to_json(), []
    except BranchwiseError as exc:
        return None, [f"history not worked out: {exc}"]


def to_dict(sr: SiteResult) -> dict[str, Any]:
    """The result as plain data in SI (the JSON contract; see the module docstring)."""
    r, net = sr.result, sr.result.network
    history, history_notes = history_json(sr.site)
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
        "schema_version": SCHEMA_VERSION,
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
        "notes": [render(n) for n in (*sr.notes, *r.notes, *history_notes)],
        "reconciliation": (sr.reconciliation.to_json() if sr.reconciliation is not None
                           else None),
        "assumptions": [{"code": a.code, "branch": a.branch, "message": a.message}
                        for a in sr.assumptions],
        "convergence": {"converged": r.convergence.converged,
                        "iterations": r.convergence.iterations,
                        "residual": _num(r.convergence.residual)},
        "cautions": list(CAUTIONS),
        "uncertainty": band.uncertainty_json(sr),
        "history": history,
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


def record_json(site: Site) -> dict[str, str | None]:
    """The ``record`` object of the JSON: who took the readings, when and with what (free
    text as typed; None where not given)."""
    r = site.record or RecordSpec()
    return {key: (getattr(r, key) if isinstance(getattr(r, key), str) else None)
            for key in RECORD_KEYS}
