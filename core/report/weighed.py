"""The lines of a reconciliation (:mod:`branchwise.core.numerics.reconcile`): the verdict, the
reconciled state and each reading against it, in the reader's units; written once for the text
table, the Markdown and HTML reports and the app."""

from __future__ import annotations

from ..givens import GIVENS
from ..numerics.reconcile_result import ReadingFit
from ..site.readings import readings
from ..site.solve import SiteResult
from ..units import Units, units_for

TITLE = "Readings weighed together"


def reading_fit_line(f: ReadingFit, reader: Units | str = "si") -> str:
    """``the clamp-on on 'AHU-3 coil': read 80.00 gpm, reconciled 76.95 gpm (σ 2.86 gpm before
    weighing), normalised residual +1.10 (the residual over its own σ after weighing)``.

    The σ is the spread of the reading against the model before the weighing (its instrument's
    and the model's); the normalised residual divides by the smaller spread of the residual
    left after it, so the two do not divide into each other (a reader did the sum and was
    puzzled)."""
    u = units_for(reader)
    kind = GIVENS[f.reading].quantity
    label = f.label[:1].upper() + f.label[1:]
    return (f"{label}: read {u.quantity(f.measured_si, kind)}, reconciled "
            f"{u.quantity(f.reconciled_si, kind)} (σ {u.quantity(f.sigma_si, kind)} before "
            f"weighing), normalised residual {f.normalised_residual:+.2f} (the residual over "
            "its own σ after weighing)")


def weighed_lines(sr: SiteResult, reader: Units | str = "si") -> list[str]:
    """The verdict, the reconciled state and every reading; one line when there is one reading
    (nothing to weigh it against); none for a site without readings."""
    u = units_for(reader)
    rec = sr.reconciliation
    if rec is None:
        held = readings(sr.site)
        return (["One reading only: nothing to weigh it against (a second reading of the same "
                 "header — a gauge, a meter, a clamp-on — would be checked against it)."]
                if len(held) == 1 else [])
    state = (f"Reconciled: pressure drop {u.quantity(rec.pressure_drop_pa, 'pressure')}, "
             f"total flow {u.quantity(rec.total_flow_m3_s, 'flow')}, head "
             f"{u.quantity(rec.head_m, 'head')} (weighted least squares, each reading by its "
             "instrument's and the model's uncertainty)")
    return [rec.verdict, state, *(reading_fit_line(f, u) for f in rec.readings)]
