"""The system curve as CSV, in the reader's units with the unit in each column title."""

from __future__ import annotations

import csv
import io

from ..numerics.curve import SystemCurve
from ..units import Units, units_for


def to_csv(curve: SystemCurve, reader: Units | str = "si") -> str:
    """The curve as CSV text in the reader's units (SI: L/s, kPa, m; US: gpm, psi, ft), the
    unit in each header (``Total flow (L/s)``), one row per point, values to 10 significant
    figures (``10``, not ``9.999999999999991``); the last column, ``Operating point``, is 1 on
    the operating point's row."""
    u = units_for(reader)
    flow, pressure, head = u.label("flow"), u.label("pressure"), u.label("head")
    out = io.StringIO()
    writer = csv.writer(out, lineterminator="\n")
    writer.writerow([f"Total flow ({flow})", f"Pressure drop ({pressure})",
                     f"Driving head ({head})"]
                    + [f"Flow {name} ({flow})" for name in curve.branch_names]
                    + ["Operating point"])
    for i, total in enumerate(curve.total_flow):
        numbers = [u.value(float(total), "flow"),
                   u.value(float(curve.pressure_drop[i]), "pressure"),
                   u.value(float(curve.driving_head[i]), "head"),
                   *(u.value(float(q), "flow") for q in curve.branch_flows[i])]
        writer.writerow([f"{a:.10g}" for a in numbers] + [int(i == curve.operating_index)])
    return out.getvalue()
