"""How a branch's values appear in the branch table, and how typed cell text goes back in.

Each column shows the values as typed and reads a typed cell the same way the site file does:
a size column takes a catalog size (``3 in sch 40``) or an inner diameter (``77.9 mm``,
``ID 3 in``; a bare nominal size such as ``3 in`` is refused for want of a schedule);
the wall column takes a roughness (``0.045 mm``) or a material key with an optional ``aged``;
the valve column takes ``Kv 160`` or ``Cv 110`` (a bare number is a Kv). A bare number takes the
column's display unit.
"""

from __future__ import annotations

import re
from collections import Counter
from collections.abc import Callable
from typing import TYPE_CHECKING

from branchwise.core.errors import InputError
from branchwise.core.names import name_key
from branchwise.core.site.spec import BranchSpec, SegmentSpec
from branchwise.core.site.valves import series_kv
from branchwise.core.units.numbers import plain_float

from ...state.values import (
    bare_number,
    is_bare_number,
    is_plain_diameter,
    text_of,
    with_unit,
)

if TYPE_CHECKING:
    from ...workspace import Workspace

COLUMNS = (
    ("name", "Branch"),
    ("tag", "Tag"),
    ("flow", "Flow"),
    ("reading", "Reading"),  # beside the flow it is compared with, in sight at 80 columns
    ("size", "Size/ID"),
    ("length", "Length"),
    ("wall", "ε or material"),
    ("k", "K+fittings"),
    ("valve", "Valve"),
)
BRANCH_COLUMNS = ("name", "tag", "valve", "reading")
"""Columns that belong to the whole branch (blank on a further segment's row)."""
WIDE_COLUMNS = ("tag",)
"""Columns shown only where there is room (100 columns or more)."""
UNIT_KINDS = {"size": "diameter", "length": "length", "wall": "roughness", "reading": "flow",
              "flow": "flow"}
FIELD_COLUMNS = {
    "name": "name", "tag": "tag", "diameter": "size", "size": "size", "length": "length",
    "roughness": "wall", "material": "wall", "condition": "wall", "minor_k": "k",
    "fittings": "k", "hw_c": "k", "valve_kv": "valve", "valve_cv": "valve",
    "measured_flow": "reading", "segments": "name",
}
"""The column that shows each field of an error's path."""

_VALVE = re.compile(r"\s*(kv|cv)?\s*[:=]?\s*(.+?)\s*\Z", re.I)


def size_text(seg: SegmentSpec) -> str:
    """The Size/ID cell: the size as typed, or the bore — written ``ID 3 in`` where the bare
    length would read as a nominal size (so that the cell reads back as the same bore)."""
    if seg.size is not None:
        return text_of(seg.size)
    bore = text_of(seg.diameter)
    return f"ID {bore}" if bore and _nominal(bore) else bore


def _nominal(text: str) -> bool:
    """True when a plain length is also a nominal size (``3 in``, ``80 mm``): a size field
    refuses it for want of a schedule."""
    from branchwise.core.catalogs.bare_size import refusal

    return refusal(text, "size") is not None


def wall_text(seg: SegmentSpec) -> str:
    if seg.material is not None:
        condition = text_of(seg.condition)
        return f"{text_of(seg.material)}{' ' + condition if condition else ''}"
    return text_of(seg.roughness)


def k_text(seg: SegmentSpec) -> str:
    k = text_of(seg.minor_k)
    count = 0.0
    for value in seg.fittings.values():
        try:  # (a count typed "1_0" is no count: the site refuses it, the cell does not add it)
            count += (plain_float(value) if isinstance(value, int | float | str)
                      else float("nan"))
        except (ValueError, OverflowError):
            count = float("nan")
    if not seg.fittings:
        return k
    fittings = f"{count:g} fitting{'' if count == 1 else 's'}" if count == count else "fittings"
    return f"{k} + {fittings}" if k else fittings


def valve_text(br: BranchSpec) -> str:
    if br.valve_kv is not None:
        return f"Kv {text_of(br.valve_kv)}"
    if br.valve_cv is not None:
        return f"Cv {text_of(br.valve_cv)}"
    return ""


def cell_text(br: BranchSpec, seg: SegmentSpec, column: str) -> str:
    """What a cell shows (the flow column is filled from the answer, not here)."""
    return {
        "name": lambda: text_of(br.name),
        "tag": lambda: text_of(br.tag),
        "size": lambda: size_text(seg),
        "length": lambda: text_of(seg.length),
        "wall": lambda: wall_text(seg),
        "k": lambda: k_text(seg),
        "valve": lambda: valve_text(br),
        "reading": lambda: text_of(br.measured_flow),
    }.get(column, lambda: "")()


def flow_cells(app: Workspace) -> dict[int, str]:
    """The Flow column: each branch's flow in the present answer (or the last good one),
    by branch index, in the display unit; a branch the answer does not name has none, nor
    do two rows that now share a name (the last answer's flow would be one of theirs)."""
    shown = app.outcome if app.outcome is not None and app.outcome.ok else app.good
    if shown is None or shown.solved is None:
        return {}
    names = {name_key(br.name): br.flow for br in shown.solved.result.branches}
    typed = [name_key(text_of(br.name)) for br in app.site.branches]
    rows_named = Counter(typed)
    out = {}
    for i, name in enumerate(typed):
        flow = names.get(name)
        if flow is not None and rows_named[name] == 1:  # two rows of one name: whose?
            out[i] = app.fmt(flow, "flow", unit=False)
    return out


def edit_text(br: BranchSpec, seg: SegmentSpec, column: str) -> str:
    """What the cell editor starts with (the K column edits the free K only)."""
    return text_of(seg.minor_k) if column == "k" else cell_text(br, seg, column)


def valve_problem(text: str) -> str | None:
    """What is wrong with a typed valve (None: it reads as one Kv or Cv, or several in
    series). The site file's own reading (``core.valvetext.series_kv``) judges it, so the form
    refuses just what the site would, and says which term is at fault."""
    probe = BranchSpec()
    set_valve(probe, text)
    value, unit = (probe.valve_cv, "cv") if probe.valve_cv is not None else (probe.valve_kv,
                                                                              "kv")
    try:
        series_kv(value, f"valve_{unit}", unit)
    except InputError as exc:
        return exc.reason
    return None


def same_pipe(seg: SegmentSpec) -> SegmentSpec:
    """A new segment of ``seg``'s pipe (size and wall), its length and fittings still to type."""
    return SegmentSpec(size=seg.size, diameter=seg.diameter, material=seg.material,
                       condition=seg.condition, roughness=seg.roughness)


def set_size(seg: SegmentSpec, text: str, unit: str) -> None:
    """A typed Size/ID cell into the segment, read as the site file reads a size: a bore
    written as one (``ID 3 in``) or a plain length that is no nominal size (``77.9 mm``) is the
    diameter; anything else — a catalog size, or a plain nominal size such as ``3 in``, which
    the site then refuses with the choices beside the cell — is the size."""
    from branchwise.core.catalogs.bare_size import bore_text

    text = text.strip()
    bore = bore_text(text) if text else None
    if not text:
        seg.size = seg.diameter = None
    elif bore is not None:
        seg.diameter, seg.size = with_unit(bore, unit), None
    elif is_plain_diameter(text) and not _nominal(with_unit(text, unit)):
        seg.diameter, seg.size = with_unit(text, unit), None
    else:
        seg.size, seg.diameter = with_unit(text, unit), None


def set_wall(seg: SegmentSpec, text: str, unit: str) -> None:
    text = text.strip()
    seg.roughness = seg.material = seg.condition = None
    if not text:
        return
    if text[0].isdigit() or text[0] == ".":
        seg.roughness = with_unit(text, unit)
        return
    words = text.split()
    if len(words) > 1 and words[-1].lower() in ("new", "aged"):
        seg.condition = words[-1].lower()
        words = words[:-1]
    seg.material = " ".join(words)


def set_k(seg: SegmentSpec, text: str) -> None:
    text = text.strip()
    seg.minor_k = (bare_number(text) if is_bare_number(text) else text) if text else None


def set_valve(br: BranchSpec, text: str) -> None:
    br.valve_kv = br.valve_cv = None
    m = _VALVE.match(text)
    if not text.strip() or m is None:
        return
    kind, value = (m.group(1) or "kv").lower(), m.group(2)
    # Several valves in series: "Kv 160 + Kv 40" is kept as the site file's "160 + 40".
    value = re.sub(rf"\+\s*{kind}\b\s*[:=]?\s*", "+ ", value, flags=re.I)
    number: int | float | str = bare_number(value) if is_bare_number(value) else value
    if kind == "cv":
        br.valve_cv = number
    else:
        br.valve_kv = number


def set_tag(br: BranchSpec, text: str) -> None:
    """The plant's line or valve tag: free text, blank for none."""
    br.tag = " ".join(text.split()) or None


def setter(column: str, unit: Callable[[str], str]) -> Callable[[BranchSpec, SegmentSpec, str],
                                                                 None] | None:
    """The function that writes a typed cell of ``column`` into a branch and segment, or None
    for a column that is not typed into (the flow, or the name: see ``rename_branch``)."""
    def length(br: BranchSpec, seg: SegmentSpec, text: str) -> None:
        seg.length = with_unit(text, unit("length")) or None

    table: dict[str, Callable[[BranchSpec, SegmentSpec, str], None]] = {
        "size": lambda br, seg, text: set_size(seg, text, unit("diameter")),
        "length": length,
        "wall": lambda br, seg, text: set_wall(seg, text, unit("roughness")),
        "k": lambda br, seg, text: set_k(seg, text),
        "valve": lambda br, seg, text: set_valve(br, text),
        "tag": lambda br, seg, text: set_tag(br, text),
    }
    return table.get(column)
