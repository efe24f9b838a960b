"""What the core made of the highlighted row: the bore, ε, ΣK and Kv it will use.

The table shows the values as typed (``3 in sch 40``, ``commercial-steel``, ``7 fittings``,
``Cv 110``); the lines under it show them as understood (``bore 77.92 mm``, ``ε 0.045 mm``,
``ΣK 3.18``, ``Kv 95.15``), with every column of the row, so that the valve and the reading are
in sight even where the table is too narrow for their columns.
"""

from __future__ import annotations

from typing import TYPE_CHECKING

from branchwise.core.model import CV_PER_KV

from ...state.values import text_of

if TYPE_CHECKING:
    from branchwise.core.site.build import Built
    from branchwise.core.site.spec import Site

    from ...workspace import Workspace


def understood_lines(app: Workspace, site: Site, built: Built | None, i: int,
                     j: int) -> list[str]:
    """Two lines on branch ``i``, segment ``j``: the pipe as understood, then the branch's
    K, valve and reading; a note when the site cannot be read (the error says why)."""
    if not 0 <= i < len(site.branches):
        return []
    spec = site.branches[i]
    name = text_of(spec.name) or f"branch {i + 1}"
    many = len(spec.segments) > 1
    where = f"{name}{f' segment {j + 1}' if many else ''}"
    if built is None or i >= len(built.network.branches) or j >= len(
            built.network.branches[i].segments):
        return [f"{where}: bore, ε, ΣK and valve not worked out yet (see the message below)"]
    branch = built.network.branches[i]
    seg = branch.segments[j]
    size = built.sizes[i][j]
    bore = f"bore {app.fmt(seg.diameter, 'diameter')}"
    if size is not None:
        bore += f" ({size.label}, {size.standard})"
    pipe = [bore, f"length {app.fmt(seg.length, 'length')}",
            f"ε {app.fmt(seg.roughness, 'roughness')}"]
    fittings = built.fittings_k[i][j]
    typed = seg.minor_k - fittings
    k = f"ΣK {seg.minor_k:.3g}"
    if fittings:
        k += f" ({typed:.3g} typed + {fittings:.3g} fittings)"
    valve = ("no valve" if branch.valve_kv is None
             else f"Kv {branch.valve_kv:.4g} = Cv {branch.valve_kv * CV_PER_KV:.4g}")
    reading = text_of(spec.measured_flow)
    rest = [k, valve, f"reading {reading}" if reading else "no reading"]
    tag = text_of(spec.tag)
    head = f"{where}{f' ({tag})' if tag else ''} as read:"
    return [f"{head} {' · '.join(pipe)}", f"  {' · '.join(rest)}"]
