"""The readings kept beside the given, against the answer, as the Split screen states them.

The words are the reports' (``core.report.readings_lines``), the figures in the user's display
units; under :data:`WIDE` columns a shorter line keeps the difference in sight at 80×24, and
``w`` lists the full one. Whether a reading lies inside the P5–P95 band is said once a band
has been worked out for the answer shown (``b``).
"""

from __future__ import annotations

from typing import TYPE_CHECKING

from branchwise.core.errors import InputError

if TYPE_CHECKING:
    from ...app import BranchwiseApp
    from ...state.outcome import Outcome

MARK = "≈"
"""The mark in front of a reading's line (warnings carry ⚠, notes •)."""


def reading_lines(app: BranchwiseApp, shown: Outcome, short: bool = False) -> list[str]:
    """One line per reading not solved from: what was read, what the solve gives, the
    difference (and the band, when there is one); ``short``: the line for a narrow screen."""
    from branchwise.core.site.readings import compare

    sr = shown.solved
    band = getattr(app, "latest_band", None)
    if band is not None and band.solved is not None and band.revision == shown.revision:
        sr = band.solved  # the same answer, with its P5–P95 band
    try:
        comparisons = compare(sr)
    except InputError:
        return []  # the site's own check says why (it is shown beside the given)
    lines = []
    for c in comparisons:
        kind = "pressure" if c.kind == "pressure_drop" else "flow"
        read, solved = app.fmt(c.read, kind), app.fmt(c.solved, kind)
        diff = f"{c.difference:+.1%}"
        if short:
            what = {"pressure_drop": "Δp", "total_flow": "total"}.get(c.kind, c.branch)
            band_text = "" if c.within is None else ", in band" if c.within else ", OUT of band"
            lines.append(f"{MARK} Also read {what}: {read}; solve {solved} ({diff}{band_text})")
            continue
        what = {"pressure_drop": "pressure drop", "total_flow": "total flow"}.get(
            c.kind, f"measured flow in '{c.branch}'")
        band_text = ("" if c.within is None else "; within the P5–P95 band" if c.within
                     else "; outside the P5–P95 band")
        lines.append(f"{MARK} Also read: {what} {read}; the solve gives {solved} "
                     f"({diff}{band_text})")
    return lines
