"""A line list (CSV from a spreadsheet) read into a site's branches.

The columns are found by the trade's words in their titles, in any case and order:

=============  =====================================================================
key            column titles
=============  =====================================================================
name           name, branch, line, circuit (required)
tag            tag, line tag, tag no, line no, line number
size           size, pipe size, nominal size, NPS, DN (``3 in sch 40``, ``DN80``…)
schedule       schedule, sch (joined to the size: ``3`` + ``40`` → ``3 in sch 40``)
diameter       bore, ID, inner diameter, inside diameter, diameter
length         length, pipe length, run
material       material, pipe material; condition (new or aged)
roughness      roughness, absolute roughness, epsilon
fittings       fittings (``4 elbow-90; 2 gate-valve`` or ``elbow-90=4, gate-valve=2``)
minor_k        K, minor K, K total, fittings K
valve          Kv, valve Kv, Cv, valve Cv (several in series: ``160 + 40``)
measured_flow  measured flow
note           note, notes, remarks, comment
=============  =====================================================================

A unit goes in the title (``Length (ft)``, ``Bore [mm]``, ``Length, m``) for the column's bare
numbers, or in the cell (``76 m``), which wins. Rows with the same name one after another are
the series segments of one branch. Other columns (service, insulation…) are left out and named.

Nothing is half-read: every bad cell is found (by its line in the file and its column title)
and reported together in one :class:`LineListError`; only a file that reads whole gives
branches.
"""

from __future__ import annotations

import csv
import io
import re
from dataclasses import dataclass, field, replace

from ..errors import InputError, describe
from ..names import name_key
from .spec import BranchSpec, ConditionsSpec, FluidSpec, SegmentSpec, Site

MAX_ROWS = 10_000
"""More rows than any header has branches: refused rather than read slowly."""

WORDS: dict[str, tuple[str, ...]] = {
    "name": ("name", "branch", "branch name", "line", "line name", "circuit"),
    "tag": ("tag", "line tag", "tag no", "tag number", "line no", "line number"),
    "size": ("size", "pipe size", "nominal size", "nps", "dn"),
    "schedule": ("schedule", "sch", "sched"),
    "diameter": ("bore", "id", "inner diameter", "inside diameter", "internal diameter",
                 "diameter"),
    "length": ("length", "pipe length", "run", "run length"),
    "material": ("material", "pipe material"),
    "condition": ("condition",),
    "roughness": ("roughness", "absolute roughness", "epsilon"),
    "fittings": ("fittings",),
    "minor_k": ("k", "minor k", "k total", "total k", "fittings k", "minor loss k"),
    "valve_kv": ("kv", "valve kv"),
    "valve_cv": ("cv", "valve cv"),
    "measured_flow": ("measured flow", "flow measured", "clamp on flow"),
    "note": ("note", "notes", "remarks", "remark", "comment", "comments"),
}
KINDS = {"diameter": "diameter", "length": "length", "roughness": "roughness",
         "measured_flow": "flow"}
"""Columns of quantities: a bare number takes the unit of the column's title."""
SEGMENT_KEYS = ("size", "diameter", "length", "material", "condition", "roughness", "minor_k",
                "fittings")
BRANCH_KEYS = ("tag", "valve_kv", "valve_cv", "measured_flow", "note")

_UNIT = re.compile(r"^(?P<word>.*?)\s*(?:\((?P<p>[^)]*)\)|\[(?P<b>[^\]]*)\]|,\s*(?P<c>.+))\s*$")
_BARE = re.compile(r"^[+-]?(?:\d{1,3}(?:,\d{3})+(?:\.\d*)?|\d+(?:\.\d*)?|\.\d+)"
                   r"(?:[eE][+-]?\d+)?$")
"""A number alone in a cell (a thousands comma too: the unit's reader then takes it with US
customary units only, as typed in a site)."""
_FITTING = re.compile(r"^(?:(?P<n1>\d+(?:\.\d+)?)\s*(?:x|×)?\s*(?P<k1>[^=]+?)|"
                      r"(?P<k2>[^=]+?)\s*(?:=|x|×)\s*(?P<n2>\d+(?:\.\d+)?))$", re.IGNORECASE)


class LineListError(InputError):
    """Every bad cell of a line list (``problems``, each an InputError whose field is
    ``LINES.csv line 7, column 'Length (ft)'``); the message names the first and the count."""

    def __init__(self, source: str, problems: list[InputError]) -> None:
        self.problems = problems
        first = problems[0]
        more = f" (and {len(problems) - 1} more)" if len(problems) > 1 else ""
        super().__init__(first.field, first.marked_value, first.marked_reason + more)
        self.source = source


@dataclass(frozen=True)
class Column:
    """A column the list uses: its position, its title as written, what it holds, its unit."""

    index: int
    title: str
    key: str
    unit: str = ""


@dataclass
class LineList:
    """What a line list gave: the branches, the columns used and those left out."""

    branches: list[BranchSpec]
    columns: list[Column] = field(default_factory=list)
    ignored: list[str] = field(default_factory=list)

    def site(self, name: str, like: Site | None = None) -> Site:
        """A site of these branches: ``like``'s liquid, readings, record and tolerances (its
        branch readings and what to find left out, as they name its own branches), or water
        at 20 °C with no reading yet."""
        if like is None:
            return Site(name=name, fluid=FluidSpec(kind="water", temperature="20 degC"),
                        conditions=ConditionsSpec(), branches=list(self.branches))
        conditions = like.conditions
        if conditions.given not in (None, "pressure_drop", "total_flow"):
            conditions = replace(conditions, given=None)
        return replace(like, branches=list(self.branches), conditions=conditions, solve=None,
                       source=None, origin=None,
                       name=like.name if isinstance(like.name, str) and like.name else name)


def _words(title: str) -> tuple[str, str]:
    """A title's words (lowercase, punctuation as spaces) and the unit it carries."""
    text, unit = title.strip(), ""
    m = _UNIT.match(text)
    if m and m.group("word"):
        text, unit = m.group("word"), (m.group("p") or m.group("b") or m.group("c") or "")
    words = re.sub(r"[\s_./#:-]+", " ", text.casefold()).strip()
    return words, unit.strip()


def columns(header: list[str], source: str) -> tuple[list[Column], list[str]]:
    """The columns of ``header`` this module reads, and the titles it leaves out."""
    lookup = {w: key for key, words in WORDS.items() for w in words}
    found: list[Column] = []
    ignored: list[str] = []
    seen: dict[str, str] = {}
    for i, title in enumerate(header):
        words, unit = _words(title)
        key = lookup.get(words)
        if key is None:
            if title.strip():
                ignored.append(title.strip())
            continue
        if key in seen:
            raise InputError(f"{source} line 1", title, f"says the same as column '{seen[key]}'")
        seen[key] = title
        found.append(Column(i, title.strip(), key, unit))
    if "name" not in seen:
        raise InputError(f"{source} line 1", describe(", ".join(header)),
                         "has no name column (a title such as 'Name', 'Branch' or 'Line')")
    return found, ignored


def _cell_value(col: Column, text: str) -> str:
    """A cell as a site value: a bare number takes the column's unit; DN and NPS columns put
    their word in front of a bare size (``DN`` + ``80`` → ``DN80``)."""
    if col.key in KINDS and col.unit and _BARE.match(text):
        return f"{text} {col.unit}"
    if col.key == "size" and _BARE.match(text):
        words, _ = _words(col.title)
        if words in ("dn", "nps"):
            return f"{words.upper()}{'' if words == 'dn' else ' '}{text}"
        if col.unit:
            return f"{text} {col.unit}"
    return text


def fittings_of(text: str, where: str) -> dict[str, int | float]:
    """``4 elbow-90; 2 gate-valve`` (or ``elbow-90=4, gate-valve=2``) as catalog keys and
    counts; the keys are checked against the catalog when the site is built."""
    out: dict[str, int | float] = {}
    for part in re.split(r"[;,+]", text):
        if not part.strip():
            continue
        m = _FITTING.match(part.strip())
        if m is None:
            raise InputError(where, describe(text), "must list fittings as '4 elbow-90; "
                             "2 gate-valve' (a count and a fitting's key)")
        count = float(m.group("n1") or m.group("n2"))
        key = re.sub(r"\s+", "-", (m.group("k1") or m.group("k2")).strip().casefold())
        out[key] = out.get(key, 0) + (int(count) if count.is_integer() else count)
    return out


def _segment(cells: dict[str, str]) -> SegmentSpec:
    seg = SegmentSpec()
    for key in SEGMENT_KEYS:
        if key in cells and key != "fittings":
            setattr(seg, key, _plain(cells[key]) if key == "minor_k" else cells[key])
    if "material" in cells:
        seg.material = re.sub(r"\s+", "-", cells["material"].strip().casefold())
    return seg


def _at(source: str, line: int, by_key: dict[str, Column], key: str) -> str:
    """``lines.csv line 7, column 'Length (ft)'`` (the key's own word without a column)."""
    where = f"{source} line {line}"
    if key in by_key:
        return f"{where}, column '{by_key[key].title}'"
    return f"{where}, {key.replace('_', ' ')}" if key else where


def _row(cells: dict[str, str], by_key: dict[str, Column],
         where: str) -> tuple[BranchSpec, SegmentSpec]:
    """One row as a branch (its name, tag, valve, reading) and its segment's pipe."""
    def at(key: str) -> str:
        return f"{where}, column '{by_key[key].title}'"

    name = cells.get("name", "")
    if not name:
        raise InputError(at("name"), "nothing", "every row needs a name")
    if "schedule" in cells:
        if "size" not in cells:
            raise InputError(at("schedule"), describe(cells["schedule"]),
                             "a schedule needs a size beside it")
        size = cells["size"]
        if re.fullmatch(r"[\d.\s/-]+", size):
            size += " in"
        sch = re.sub(r"^sch(?:edule)?\.?\s*", "", cells["schedule"].strip(), flags=re.I)
        cells["size"] = f"{size} sch {sch}"
    segment = _segment(cells)
    if "fittings" in cells:
        segment.fittings = dict(fittings_of(cells["fittings"], at("fittings")))
    branch = BranchSpec(name=name, segments=[segment])
    for key in BRANCH_KEYS:
        if key in cells:
            value = cells[key]
            if key.startswith("valve"):  # "Kv 120" in a Kv column: the number alone
                word = key.removeprefix("valve_")
                one = re.fullmatch(rf"{word}\s*(\d+(?:\.\d*)?|\.\d+)", value.strip(), re.I)
                value = one.group(1) if one else value
                setattr(branch, key, _plain(value))
            else:
                setattr(branch, key, value)
    return branch, segment


def _plain(text: str) -> str | int | float:
    """A bare number as a number (``3`` → 3, ``6.5`` → 6.5), so the site file holds K and Kv
    as TOML numbers; other text as it is."""
    if not _BARE.match(text) or "," in text:  # "1,000": a K or Kv is no length of US
        return text  # units: the site reads it as typed and refuses it, naming its field
    value = float(text)
    return int(value) if value.is_integer() and "e" not in text.lower() else value


def read_line_list(text: str, source: str = "lines.csv") -> LineList:
    """The branches of a line list (CSV text; a comma, semicolon or tab between cells); see
    the module docstring. Raises :class:`LineListError` with every bad cell, or InputError
    for a file that is not a line list at all."""
    text = text.removeprefix("\ufeff")
    if not text.strip():
        raise InputError(source, "an empty file", "holds no line list")
    first = text.splitlines()[0]
    delimiter = max(",;\t", key=first.count)
    reader = csv.reader(io.StringIO(text), delimiter=delimiter)
    try:
        header = next(reader)
        cols, ignored = columns(header, source)
        rows: list[tuple[int, list[str]]] = []
        for row in reader:
            if any(cell.strip() for cell in row):
                rows.append((reader.line_num, row))
            if len(rows) > MAX_ROWS:
                raise InputError(source, f"more than {MAX_ROWS:,} rows", "is too long for a "
                                 "line list")
    except csv.Error as exc:
        raise InputError(f"{source} line {reader.line_num}", "", f"is not CSV: {exc}") from None
    if not rows:
        raise InputError(source, "a header only", "has no rows under its titles")
    problems: list[InputError] = []
    branches: list[BranchSpec] = []
    by_key = {c.key: c for c in cols}
    first_line: dict[str, tuple[int, str]] = {}
    for line, row in rows:
        cells = {c.key: _cell_value(c, row[c.index].strip()) for c in cols
                 if c.index < len(row) and row[c.index].strip()}
        try:
            branch, segment = _row(cells, by_key, f"{source} line {line}")
        except InputError as exc:
            problems.append(exc)
            continue
        name = str(branch.name)
        if branches and branches[-1].name == name:  # a further segment of the branch above
            branches[-1].segments.append(segment)
            _check(branches[-1], len(branches[-1].segments) - 1, line, by_key, source,
                   problems)
            continue
        key = name_key(name)  # as a site tells its branches apart
        if key in first_line:
            at_line, spelt = first_line[key]
            again = (f"is used again (first on line {at_line})" if spelt == name else
                     f"is '{spelt}' of line {at_line} again (names are told apart by more than "
                     "letter case and spaces)")
            problems.append(InputError(_at(source, line, by_key, "name"), describe(name),
                                       f"{again}; the rows of one branch go one after "
                                       "another"))
            continue
        first_line[key] = (line, name)
        branches.append(branch)
        _check(branch, 0, line, by_key, source, problems)
    if problems:
        raise LineListError(source, problems)
    return LineList(branches, cols, ignored)


_FIELD_COLUMN = {"size": "size", "diameter": "diameter", "length": "length",
                 "roughness": "roughness", "material": "material", "condition": "condition",
                 "minor_k": "minor_k", "fittings": "fittings", "valve_kv": "valve_kv",
                 "valve_cv": "valve_cv", "measured_flow": "measured_flow", "name": "name",
                 "tag": "tag", "hw_c": "material", "note": "note"}


def _check(branch: BranchSpec, j: int, line: int, by_key: dict[str, Column], source: str,
           problems: list[InputError]) -> None:
    """Build segment ``j`` of ``branch`` (and, for the first, its valve and reading) alone,
    and note every bad cell of it: after each error the cell at fault is emptied and the rest
    built again, so that one bad cell hides no other."""
    from .build import build

    seg = replace(branch.segments[j], fittings=dict(branch.segments[j].fittings))
    alone = BranchSpec(name=branch.name, segments=[seg])
    if j == 0:
        for key in ("valve_kv", "valve_cv", "measured_flow", "tag", "note"):
            setattr(alone, key, getattr(branch, key))
    done: set[str] = set()
    for _ in range(len(SEGMENT_KEYS) + len(BRANCH_KEYS) + 1):
        site = Site(name="check", fluid=FluidSpec(kind="water", temperature="20 degC"),
                    conditions=ConditionsSpec(pressure_drop="10 kPa",
                                              given="pressure_drop"),
                    branches=[alone])
        try:
            build(site)
            return
        except InputError as exc:
            leaf = re.sub(r"\[\d+\]", "", exc.field).split(".")
            key = next((_FIELD_COLUMN[p] for p in reversed(leaf) if p in _FIELD_COLUMN), "")
            if key == "size" and "size" not in by_key and "diameter" in by_key:
                key = "diameter"
            if not key and len(leaf) > 1:
                key = leaf[-1]
            problems.append(InputError(_at(source, line, by_key, key), exc.marked_value,
                                       exc.marked_reason))
            if key in done or not _stand_in(seg, alone, key):
                return  # nothing more to take out: the rest is not this row's to say
            done.add(key)


_STAND_INS: dict[str, dict[str, object]] = {
    "size": {"size": None, "diameter": "50 mm"}, "diameter": {"size": None, "diameter": "50 mm"},
    "length": {"length": "1 m"}, "roughness": {"roughness": "0.045 mm", "material": None,
                                               "condition": None},
    "material": {"roughness": "0.045 mm", "material": None, "condition": None},
    "condition": {"condition": None}, "minor_k": {"minor_k": None}, "fittings": {"fittings": {}},
}
"""Valid values put in place of a bad cell while the rest of its row is checked."""


def _stand_in(seg: SegmentSpec, alone: BranchSpec, key: str) -> bool:
    """Put a valid value in place of the bad cell ``key`` (False: no such cell to replace)."""
    if key in _STAND_INS:
        for name, value in _STAND_INS[key].items():
            setattr(seg, name, value)
        return True
    if key in ("valve_kv", "valve_cv", "measured_flow", "tag", "note"):
        setattr(alone, key, None)
        return True
    return False
