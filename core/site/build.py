"""From a :class:`~branchwise.core.site.read.Site` as typed to the core's SI objects.

:func:`build` converts every value through :mod:`.units`, :mod:`.fluids` and :mod:`.catalogs`
and checks it, naming the field as it appears in the file (``branches[1].length``, or
``branches[1].segments[0].length`` for a branch given as segments). Solving is in
:mod:`.sitesolve`.
"""

from __future__ import annotations

import threading
from collections.abc import Callable
from dataclasses import dataclass
from typing import TYPE_CHECKING, Any

from ..errors import InputError, describe
from ..finds import FINDS
from ..givens import GIVENS, make_given
from ..messages import marked
from ..model import (
    MIN_DIAMETER,
    STANDARD_GRAVITY,
    Branch,
    Find,
    FindFlows,
    FindUnknown,
    Given,
    Network,
    Segment,
    friction_model,
)
from ..names import name_key
from ..numerics.friction import RE_TURBULENT
from ..units import parse_quantity
from .fields import FieldPath
from .liquid import build_fluid
from .readings import RESERVED_NAMES, Reading, chosen
from .spec import BranchSpec, SegmentSpec, Site, Value
from .values import (
    at_least,
    number,
    optional_quantity,
    plain_number,
    quantity,
    size_or_bore,
    text_value,
)
from .valves import series_kv

if TYPE_CHECKING:
    from ..catalogs.materials import Material
    from ..numerics.uncertainty import Tolerances
    from ..storage.presets import PresetSource

CONDITIONS = ("new", "aged")


@dataclass(frozen=True)
class Built:
    """A site in SI, ready to solve.

    sizes[i][j] is the catalog size of segment j of branch i (None for a plain diameter);
    fittings_k[i][j] the K its fittings add (–); paths[i][j] the field path of that segment;
    tolerances: the site's ``[tolerances]`` as :class:`~.uncertainty.Tolerances`, or None when
    the file has no such table (the defaults apply).
    """

    network: Network
    given: Given
    find: Find
    sizes: tuple[tuple[Any, ...], ...]
    fittings_k: tuple[tuple[float, ...], ...]
    paths: tuple[tuple[str, ...], ...]
    notes: tuple[str, ...] = ()
    tolerances: Tolerances | None = None


# ---- branches ------------------------------------------------------------------------------

MAX_FITTINGS = 10_000
"""The most fittings of one kind a segment may count (a sanity bound, not a standard's)."""


def _segment(seg: SegmentSpec, path: str,
             material_for: Callable[[str, str], Material]) -> tuple[Segment, Any, float]:
    from ..catalogs import fittings_k

    if seg.diameter is not None and seg.size is not None:
        raise InputError(f"{path}.size", describe(seg.size), "give diameter or size, not both")
    size = None
    d_value: Value
    if seg.size is not None:
        size, diameter = size_or_bore(text_value(seg.size, f"{path}.size") or "", f"{path}.size")
        d_path, d_value = f"{path}.size", seg.size
    else:
        diameter = quantity(seg.diameter, "diameter", f"{path}.diameter")
        d_path, d_value = f"{path}.diameter", seg.diameter
    at_least(diameter, d_path, d_value, 0.0, strict=True)
    if diameter < MIN_DIAMETER:  # said of the bore here, before a roughness is held to it
        raise InputError(d_path, describe(d_value), "is narrower than any pipe (at least "
                         f"{marked('diameter', MIN_DIAMETER)})")

    length = quantity(seg.length, "length", f"{path}.length")
    at_least(length, f"{path}.length", seg.length, 0.0, strict=False)

    if seg.roughness is not None and seg.material is not None:
        raise InputError(f"{path}.material", describe(seg.material),
                         "give roughness or material, not both")
    condition = text_value(seg.condition, f"{path}.condition")
    if condition is not None and condition not in CONDITIONS:
        raise InputError(f"{path}.condition", condition, "must be new or aged")
    hw_c = plain_number(seg.hw_c, f"{path}.hw_c")
    at_least(hw_c, f"{path}.hw_c", seg.hw_c, 0.0, strict=True)
    m_path = f"{path}.material"
    if seg.roughness is not None:
        if condition is not None:
            raise InputError(f"{path}.condition", condition, "applies to a material, not to "
                             "a roughness given as a value")
        roughness = quantity(seg.roughness, "roughness", f"{path}.roughness")
        at_least(roughness, f"{path}.roughness", seg.roughness, 0.0, strict=False)
    else:
        key = text_value(seg.material, f"{path}.material")
        if key is None:
            if size is None:
                why = ("give a roughness or a material as well: a Hazen–Williams C covers "
                       f"turbulent flow only, and below Reynolds {RE_TURBULENT:.0f} the loss "
                       "comes from Darcy–Weisbach, which needs the roughness"
                       if hw_c is not None else "give a roughness or a material")
                raise InputError(f"{path}.roughness", "nothing", why)
            key, m_path = size.material_hint, f"{path}.size"
        mat = material_for(key, m_path)
        roughness = mat.roughness_m
        if condition == "aged":
            if mat.aged_roughness_m is None:
                raise InputError(f"{path}.condition", condition,
                                 f"no aged roughness is listed for {mat.name}")
            roughness = mat.aged_roughness_m
        if hw_c is None:
            hw_c = mat.hazen_williams_c
    if roughness >= diameter / 2:
        r_path, r_value = ((f"{path}.roughness", seg.roughness) if seg.roughness is not None
                           else (m_path, seg.material))
        half = marked("roughness", diameter / 2)
        raise InputError(r_path, describe(r_value), f"must be below half the diameter ({half})")
    minor_k = plain_number(seg.minor_k, f"{path}.minor_k") or 0.0
    at_least(minor_k, f"{path}.minor_k", seg.minor_k, 0.0, strict=False)
    counts: dict[str, float] = {}
    for key, count in seg.fittings.items():
        n = number(count, f"{path}.fittings.{key}")
        at_least(n, f"{path}.fittings.{key}", count, 0.0, strict=False)
        if n > MAX_FITTINGS:  # else the sum is refused as the segment's minor_k, not typed
            raise InputError(f"{path}.fittings.{key}", describe(count), "is more fittings of "
                             f"one kind than a pipe holds (at most {MAX_FITTINGS:,})")
        counts[key] = n
    k_fittings = fittings_k(counts, diameter, f"{path}.fittings") if counts else 0.0
    segment = Segment(diameter, length, roughness, minor_k + k_fittings, hw_c)
    return segment, size, k_fittings


def _branch(br: BranchSpec, i: int, material_for: Callable[[str, str], Material]
            ) -> tuple[Branch, list[Any], list[float], list[str]]:
    path = f"branches[{i}]"
    name = text_value(br.name, f"{path}.name")
    if name is None:
        raise InputError(f"{path}.name", "nothing", "every branch needs a name")
    if not br.segments:
        raise InputError(f"{path}.segments", "[]", "a branch needs at least one segment")
    many = len(br.segments) > 1
    segs, sizes, ks, paths = [], [], [], []
    for j, spec in enumerate(br.segments):
        seg_path = f"{path}.segments[{j}]" if many else path
        seg, size, k = _segment(spec, seg_path, material_for)
        segs.append(seg)
        sizes.append(size)
        ks.append(k)
        paths.append(seg_path)
    if br.valve_kv is not None and br.valve_cv is not None:
        raise InputError(f"{path}.valve_cv", describe(br.valve_cv),
                         "give valve_kv or valve_cv, not both")
    value, unit = (br.valve_cv, "cv") if br.valve_cv is not None else (br.valve_kv, "kv")
    kv = series_kv(value, f"{path}.valve_{unit}", unit)
    return Branch(name, tuple(segs), kv), sizes, ks, paths


# ---- conditions and what to find -----------------------------------------------------------

def _given(site: Site, names: list[str]) -> Given:
    """The given condition from the reading :func:`.readings.chosen` picks (SI). The other
    readings are read too: one that is no reading of its kind is refused by its field, as the
    given would be (it would otherwise drop out of the comparison and the weighing unsaid)."""
    reading, others = chosen(site)
    given = _reading(reading, names)
    for other in others:
        _reading(other, names)
    return given


def _reading(reading: Reading, names: list[str]) -> Given:
    kind = GIVENS[reading.kind]
    value = parse_quantity(reading.value, kind.quantity, reading.path)
    return make_given(kind.key, value, None if reading.branch is None else names[reading.branch])


def _find(site: Site, network: Network) -> Find:
    s = site.solve
    if s is None:
        return FindFlows()
    find = text_value(s.find, "solve.find") or "flows"
    if find not in FINDS:
        raise InputError("solve.find", find, f"must be one of {', '.join(FINDS)}")
    if find == "flows":
        # A branch, target and segment kept beside find = "flows" are the sizing question
        # set aside (the app keeps it when the person switches to the flows): not used.
        return FindFlows()
    branch = text_value(s.branch, "solve.branch")
    if branch is None:
        raise InputError("solve.branch", "nothing", f"name the branch whose {find} to find")
    index = network.index_of(branch, "solve.branch")
    target = quantity(s.target_flow, "flow", "solve.target_flow")
    if target == 0:
        raise InputError("solve.target_flow", describe(s.target_flow), "must not be zero")
    n_seg = len(network.branches[index].segments)
    seg = 1 if s.segment is None else plain_number(s.segment, "solve.segment")
    if seg is None or seg != int(seg) or not 1 <= seg <= n_seg:
        raise InputError("solve.segment", describe(s.segment),
                         f"must be a segment number from 1 to {n_seg} (counted from 1)")
    return FindUnknown(find, network.branches[index].name, target, int(seg) - 1)


BRANCH_CACHE_SIZE = 4096
"""How many branches are kept built (see :func:`_branch_once`)."""

Built_branch = tuple[Branch, tuple[Any, ...], tuple[float, ...], tuple[str, ...]]
_built: dict[tuple[int, str], Built_branch] = {}
_built_for: list[object] = [None]
"""The user's presets the kept branches were built with (a material may come from them)."""
_built_lock = threading.Lock()


def _branch_once(br: BranchSpec, i: int, material_for: Callable[[str, str], Material],
                 user: object) -> Built_branch:
    """:func:`_branch`, remembered: the app builds the whole site on every keystroke, where
    one branch (or none) has changed. A branch is kept by its place and everything typed in it
    (its ``repr``: ``1`` and ``True`` and ``"1"`` differ), for the user's presets file as it is
    now (a new file drops every kept branch); the model's objects are immutable, so one built
    branch serves every build. Errors are never kept (each names its field). At most
    :data:`BRANCH_CACHE_SIZE` branches are kept. user: the user's presets now."""
    key = (i, repr(br))
    with _built_lock:
        if _built_for[0] is not user:
            _built.clear()
            _built_for[0] = user
        found = _built.get(key)
    if found is None:
        branch, sizes, ks, paths = _branch(br, i, material_for)
        found = (branch, tuple(sizes), tuple(ks), tuple(paths))
        with _built_lock:
            if len(_built) >= BRANCH_CACHE_SIZE:
                _built.clear()
            if _built_for[0] is user:
                _built[key] = found
    return found


def _materials() -> Callable[[str, str], Material]:
    """The user's or the shipped material of a key, each key looked up once for one build (a
    lookup checks whether the user's presets file has changed)."""
    from ..storage.user_presets import material_for

    found: dict[str, Material] = {}

    def lookup(key: str, field: str) -> Material:
        mat = found.get(key)
        if mat is None:
            mat = found[key] = material_for(key, field)
        return mat

    return lookup


def build(site: Site, presets: PresetSource | None = None) -> Built:
    """The core objects for ``site``; every bad value is an InputError naming its field (and
    carrying the site's branch names, :attr:`InputError.names`).

    presets: where a fluid kind that is not built in is looked up (default: the user's
    :class:`~branchwise.core.storage.presets.PresetStore`, read only when needed).
    """
    try:
        return _build(site, presets)
    except InputError as exc:
        raise exc.naming([b.name for b in site.branches]) from None


def _build(site: Site, presets: PresetSource | None) -> Built:
    fluid = build_fluid(site, presets)
    if not site.branches:
        raise InputError("branches", "nothing", "a site needs at least one [[branches]] table")
    branches, sizes, ks, paths = [], [], [], []
    from ..storage.user_presets import store

    seen: dict[str, int] = {}
    materials, user = _materials(), store()
    for i, spec in enumerate(site.branches):
        br, s, k, p = _branch_once(spec, i, materials, user)
        key = name_key(br.name)
        if key in RESERVED_NAMES:
            raise InputError(f"branches[{i}].name", br.name, "is a word conditions.given "
                             "keeps for a reading of its own; give the branch another name")
        if key in seen:
            raise InputError(f"branches[{i}].name", br.name,
                             f"duplicates branches[{seen[key]}].name")
        seen[key] = i
        branches.append(br)
        sizes.append(tuple(s))
        ks.append(tuple(k))
        paths.append(tuple(p))
    c = site.conditions
    friction = friction_model(text_value(c.friction, "conditions.friction") or "colebrook")
    elevation = optional_quantity(c.elevation_change, "length", "conditions.elevation_change")
    gravity = optional_quantity(c.gravity, "acceleration", "conditions.gravity")
    at_least(gravity, "conditions.gravity", c.gravity, 0.0, strict=True)
    limit = optional_quantity(c.velocity_limit, "velocity", "conditions.velocity_limit")
    at_least(limit, "conditions.velocity_limit", c.velocity_limit, 0.0, strict=True)
    try:
        network = Network(
            fluid, tuple(branches), elevation or 0.0, gravity or STANDARD_GRAVITY,
            friction,
            3.0 if limit is None else limit,
        )
    except InputError as exc:  # the model names segments[0] even of a one-pipe branch
        raise _as_written(exc, site) from None
    given = _given(site, [b.name for b in branches])
    find = _find(site, network)
    notes: list[str] = []
    tolerances = None
    if site.tolerances is not None:
        from .tolerances import build_tolerances

        tolerances = build_tolerances(site.tolerances, network, given, _gauge_reading(site))
    return Built(network, given, find, tuple(sizes), tuple(ks), tuple(paths), tuple(notes),
                 tolerances)


def _gauge_reading(site: Site) -> float | None:
    """The site's pressure drop reading, Pa (None without one, or where it cannot be read:
    the reading's own check says why)."""
    typed = site.conditions.pressure_drop
    if typed is None:
        return None
    try:
        return parse_quantity(typed, "pressure", "conditions.pressure_drop")
    except InputError:
        return None


def _as_written(exc: InputError, site: Site) -> InputError:
    """``exc`` with a model path (``branches[1].segments[0].hw_c``) as the file writes it, and
    the value as the site typed it (``1e9 mi``, not the model's metres)."""
    path = FieldPath.parse(exc.field)
    field, value = str(path), exc.marked_value
    typed = _typed_at(site, path)
    if typed is not None:
        field, value = typed[0], describe(typed[1])
    i = path.branch
    if i is not None and i < len(site.branches):
        field = str(FieldPath.parse(field).as_written(len(site.branches[i].segments)))
    if (field, value) == (exc.field, exc.marked_value):
        return exc
    return InputError(field, value, exc.marked_reason)


def _typed_at(site: Site, path: FieldPath) -> tuple[str, Value] | None:
    """The field path and the value the site typed for a model's field path, or None."""
    name = path.name
    if path.area == "conditions" and not path.key:
        typed = getattr(site.conditions, name, None)
        return (path.text, typed) if typed is not None else None
    i = path.branch
    if i is None or i >= len(site.branches) or path.key:
        return None
    br = site.branches[i]
    if path.segment is None:
        if name not in ("valve_kv", "valve_cv"):  # the model's Kv may come from a Cv
            return None
        key = "valve_cv" if br.valve_cv is not None else "valve_kv"
        typed = getattr(br, key)
        return (f"branches[{i}].{key}", typed) if typed is not None else None
    j = path.segment
    if j >= len(br.segments):
        return None
    seg = br.segments[j]
    if name == "diameter" and seg.diameter is None and seg.size is not None:
        return f"branches[{i}].segments[{j}].size", seg.size
    typed = getattr(seg, name, None) if name in ("diameter", "length", "roughness") else None
    return (path.text, typed) if typed is not None else None
