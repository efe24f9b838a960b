"""Writing site files: TOML text from a :class:`~branchwise.core.site.read.Site`, saved safely.

A site read from a file is written back through the comment-preserving ``tomlkit``: lines whose
values did not change keep their text and comments. Saving is atomic (a temporary file, fsync,
rename; the previous file kept as ``.bak``) and never replaces a file it should not.
"""

from __future__ import annotations

from collections.abc import Mapping
from datetime import date, time
from pathlib import Path
from typing import Any

from ..errors import InputError
from ..names import name_key
from .spec import (
    CONDITION_KEYS,
    FLUID_KEYS,
    FORMAT,
    PIPE_KEYS,
    RECORD_KEYS,
    SOLVE_KEYS,
    TOLERANCE_KEYS,
    VISIT_KEYS,
    SegmentSpec,
    Site,
    VisitSpec,
)


def _present(spec: Any, keys: tuple[str, ...]) -> dict[str, Any]:
    return {k: getattr(spec, k) for k in keys if getattr(spec, k, None) is not None}


def _segment_dict(seg: SegmentSpec) -> dict[str, Any]:
    out = _present(seg, PIPE_KEYS[:-1])
    if seg.fittings:
        out["fittings"] = dict(seg.fittings)
    return out


def site_to_dict(site: Site) -> dict[str, Any]:
    """The plain TOML structure of ``site`` in file order (None values left out)."""
    doc: dict[str, Any] = {"format": FORMAT, "name": site.name}
    if site.notes is not None:
        doc["notes"] = site.notes
    if site.record is not None:
        doc["record"] = _present(site.record, RECORD_KEYS)
    doc["fluid"] = _present(site.fluid, FLUID_KEYS)
    doc["conditions"] = _present(site.conditions, CONDITION_KEYS)
    branches = []
    for br in site.branches:
        out: dict[str, Any] = {"name": br.name}
        if br.tag is not None:
            out["tag"] = br.tag
        if len(br.segments) == 1:
            out.update(_segment_dict(br.segments[0]))
        else:
            out["segments"] = [_segment_dict(s) for s in br.segments]
        out.update(_present(br, ("valve_kv", "valve_cv", "measured_flow", "note")))
        branches.append(out)
    doc["branches"] = branches
    if site.solve is not None:
        doc["solve"] = _present(site.solve, SOLVE_KEYS)
    if site.tolerances is not None:
        tol = _present(site.tolerances, TOLERANCE_KEYS)
        if tol.get("roughness_factor") is not None:
            tol["roughness_factor"] = list(tol["roughness_factor"])
        if tol.get("roughness_range"):
            tol["roughness_range"] = {k: list(v) for k, v in tol["roughness_range"].items()}
        else:
            tol.pop("roughness_range", None)
        doc["tolerances"] = tol
    if site.visits:
        doc["visits"] = [_visit_dict(v) for v in site.visits]
    return doc


def _visit_dict(visit: VisitSpec) -> dict[str, Any]:
    out = _present(visit, VISIT_KEYS)
    if visit.measured:
        out["measured"] = dict(visit.measured)
    else:
        out.pop("measured", None)
    return out


NL = "\n"
HEADER = "branchwise site file: values are text with units (\"64 m\", \"3.068 in\", \"12 psi\")."


def dump_site(site: Site) -> str:
    """TOML text for ``site``. A site read from a file keeps that file's comments and layout
    wherever its values did not change (the comment-preserving writer ``tomlkit``)."""
    import tomlkit

    from ..storage.toml_files import plain

    if site.origin is not None:
        doc = tomlkit.parse(site.origin)
    else:
        doc = tomlkit.document()
        doc.add(tomlkit.comment(HEADER))
        doc.add(tomlkit.nl())
    values = site_to_dict(site)
    if "kind" in doc:  # a file that says what it is keeps saying so
        values = {"format": values.pop("format"), "kind": plain(doc["kind"]), **values}
    _sync(doc, values, tomlkit, plain)
    return _line_endings(tomlkit.dumps(doc), site.origin)


def _line_endings(text: str, origin: str | None) -> str:
    """``text`` with the line endings of the file it was read from: a file written on Windows
    (CRLF) stays CRLF throughout, the lines changed included."""
    if origin is None or "\r\n" not in origin or origin.count("\r\n") * 2 < origin.count("\n"):
        return text.replace("\r\n", "\n")
    return text.replace("\r\n", "\n").replace("\n", "\r\n")


def _sync(doc: Any, values: Mapping[str, Any], tomlkit: Any, plain: Any) -> None:
    """Make the tomlkit container ``doc`` hold ``values``, touching only what changed."""
    for name in [name for name in doc if name not in values]:
        del doc[name]
    for name, value in values.items():
        old = doc.get(name)
        if isinstance(value, dict) and name in TABLES:
            if not isinstance(old, Mapping) or old is None:
                doc[name] = old = tomlkit.table()
            _sync_table(old, value, tomlkit, plain)
        elif name == "roughness_range" and isinstance(value, dict) and isinstance(old, Mapping):
            _sync_table(old, value, tomlkit, plain)  # [tolerances.roughness_range] keeps its layout
        elif name == "branches":
            _sync_branches(doc, old, value, tomlkit, plain)
        elif name == "visits":
            _sync_visits(doc, old, value, tomlkit, plain)
        elif old is None or not _unchanged(plain(old), value):
            doc[name] = _item(value, tomlkit)


TABLES = ("record", "fluid", "conditions", "solve", "tolerances")
"""The top-level ``[tables]`` of a site file."""


def _unchanged(old: Any, value: Any) -> bool:
    """Whether the file's ``old`` value already says ``value``: a TOML date read as its ISO
    text (``record.date``) stays a TOML date in the file."""
    if isinstance(old, date | time) and isinstance(value, str):
        return old.isoformat() == value
    return bool(old == value)


def _body(table: Any) -> list[tuple[Any, Any]]:
    """The (key, item) list of a tomlkit table, or [] for an inline table."""
    container = getattr(table, "value", None)
    return getattr(container, "body", [])


def _detach_after(table: Any) -> list[tuple[Any, Any]]:
    """Cut off and return what ends ``table`` but belongs to the header after it.

    Comment lines right below a table's last key (no blank line between) are that table's
    own and stay; from the first blank line on, the comment block and blank lines stand
    before the next header (``# [solve] ...`` above ``[tolerances]``) and are returned.
    """
    body = _body(table)
    last_key = max((i for i, (key, _) in enumerate(body) if key is not None), default=-1)
    cut = len(body)
    for i in range(last_key + 1, len(body)):
        if type(body[i][1]).__name__ == "Whitespace":
            cut = i
            break
    after = body[cut:]
    del body[cut:]
    return after


def _sync_table(table: Any, values: Mapping[str, Any], tomlkit: Any, plain: Any) -> None:
    """:func:`_sync` for a ``[table]``: keys added go below its last key and own comments,
    above the blank line and comments that stand before the next header."""
    after = _detach_after(table)
    _sync(table, values, tomlkit, plain)
    _body(table).extend(after)


def _table_before(doc: Any, aot: Any) -> Any:
    """The ``[table]`` written just above the array ``aot`` in ``doc``, or None."""
    previous = None
    for _, item in getattr(doc, "body", []):
        if item is aot:
            return previous if type(previous).__name__ == "Table" else None
        if type(item).__name__ not in ("Whitespace", "Comment"):
            previous = item
    return None


def _branch_key(name: Any) -> str:
    return name_key(str(name))


def _sync_branches(doc: Any, old: Any, branches: list[dict[str, Any]], tomlkit: Any,
                   plain: Any) -> None:
    """Match each branch to its old ``[[branches]]`` table by name (by place if renamed), so a
    branch's comments move with it when branches are reordered and go when it is deleted; the
    comment block before the next header keeps its place before that header."""
    if not isinstance(old, tomlkit.items.AoT) or not branches:
        aot = tomlkit.aot()
        for br in branches:
            table = tomlkit.table()
            _sync(table, br, tomlkit, plain)
            aot.append(table)
        if branches:
            doc["branches"] = aot
        elif "branches" in doc:
            del doc["branches"]
        return
    tables = list(old)
    # What stands before each header (blank line, comment block), and what ends the array.
    before = _table_before(doc, old)  # the [table] above the first header, if any
    leads = [_detach_after(t) for t in ([before] if before is not None else []) + tables]
    if before is None:
        leads.insert(0, [])
    tail = leads.pop()
    wanted = {_branch_key(br.get("name")) for br in branches}
    by_name: dict[str, int] = {}
    for i, t in enumerate(tables):
        by_name.setdefault(_branch_key(plain(t.get("name"))), i)
    used: set[int] = set()
    order: list[int | None] = []
    for i, br in enumerate(branches):
        j = by_name.get(_branch_key(br.get("name")))
        if j is None or j in used:  # renamed: the table in its place, if no one claims it
            j = i if (i < len(tables) and i not in used
                      and _branch_key(plain(tables[i].get("name"))) not in wanted) else None
        if j is not None:
            used.add(j)
        order.append(j)
    new_tables: list[Any] = []
    for k, (j, br) in enumerate(zip(order, branches, strict=True)):
        table = tomlkit.table() if j is None else tables[j]
        _sync(table, br, tomlkit, plain)
        # What stood before a header goes before it again; what stood before the first
        # header speaks of the whole array and stays before the first one.
        lead = leads[0] if k == 0 else leads[j] if j else []
        lead = lead or [(None, tomlkit.ws(NL))]
        if k > 0:
            _body(new_tables[-1]).extend(lead)
        elif before is not None:
            _body(before).extend(lead)
        new_tables.append(table)
    _body(new_tables[-1]).extend(tail)
    del old[:]
    for table in new_tables:
        old.append(table)


def _sync_visits(doc: Any, old: Any, visits: list[dict[str, Any]], tomlkit: Any,
                 plain: Any) -> None:
    """Keep each ``[[visits]]`` table the file holds, in place (an earlier visit is written
    back exactly as it was), and add new visits as tables after them."""
    if not isinstance(old, tomlkit.items.AoT):
        aot = tomlkit.aot()
        for visit in visits:
            table = tomlkit.table()
            _sync(table, visit, tomlkit, plain)
            aot.append(table)
        doc["visits"] = aot
        return
    tables = list(old)
    for i, visit in enumerate(visits):
        if i < len(tables):
            _sync(tables[i], visit, tomlkit, plain)
        else:
            last = list(old)[-1] if len(old) else None
            body = _body(last) if last is not None else []
            if body and type(body[-1][1]).__name__ != "Whitespace":
                body.append((None, tomlkit.ws(NL)))  # a blank line before the new header
            table = tomlkit.table()
            _sync(table, visit, tomlkit, plain)
            old.append(table)
    if len(tables) > len(visits):
        del old[len(visits):]


def _item(value: Any, tomlkit: Any) -> Any:
    if isinstance(value, dict):
        inline = tomlkit.inline_table()
        inline.update({k: _item(v, tomlkit) for k, v in value.items()})
        return inline
    if isinstance(value, list):
        array = tomlkit.array()
        for item in value:
            array.append(_item(item, tomlkit))
        array.multiline(len(value) > 1 or any(isinstance(v, dict) for v in value))
        return array
    return value


def save_site(site: Site, path: str | Path, overwrite: bool = False) -> Path:
    """Write ``site`` to ``path`` atomically (the previous file kept as ``.bak``).

    An existing file is replaced only if it is the file this site was read from and has not
    changed on disk since, or if ``overwrite`` is True; otherwise InputError. Afterwards
    ``site.source`` is ``path`` and ``site.origin`` the text written.
    """
    from ..storage.atomic import atomic_write_text
    from ..storage.file_checks import is_read_only, read_text

    path = Path(path)
    text = dump_site(site)
    if (path.exists() or path.is_symlink()) and not overwrite:
        own = site.source is not None and _same(site.source, path)
        try:
            on_disk: str | None = read_text(path)  # a regular file only: a FIFO never answers
        except InputError:
            on_disk = None
        if on_disk != text and not (own and on_disk == site.origin):
            reason = ("already exists and was changed since it was read" if own
                      else "already exists; choose another name or overwrite it")
            raise InputError(path.name, str(path), reason)
        if is_read_only(path):
            raise InputError(path.name, str(path), "is read-only")
    atomic_write_text(path, text)
    site.source, site.origin = path, text
    return path


def _same(a: Path, b: Path) -> bool:
    try:
        return a.resolve() == b.resolve()
    except OSError:
        return False
