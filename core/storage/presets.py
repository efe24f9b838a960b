"""User presets over the shipped ones: the user's own liquids, materials and site defaults.

The user's own presets live in one hand-editable file, ``presets.toml`` in the data folder::

    format = 1
    kind = "presets"

    [site_defaults]
    unit_system = "us"

    [fluids.brine-22]          # a user fluid; same key as a shipped one overrides it
    density = 1180.0

The shipped presets are data owned by other modules, passed in as one callable per kind, so
this module depends on none of them. Saving goes through a comment-preserving TOML round trip
and :func:`~.atomic.atomic_write_text`. A file that does not load is listed in
``problems``, left byte for byte as it is, and refuses every save until the person fixes it;
the shipped presets keep working meanwhile.
"""

from __future__ import annotations

import copy
import math
import re
from collections.abc import Callable, Mapping, MutableMapping
from pathlib import Path
from typing import Any, Protocol

from ..errors import InputError
from ..model import FRICTION_MODELS, STANDARD_GRAVITY
from .paths import presets_path
from .settings import UNIT_SYSTEMS
from .toml_files import editable, load_toml, migrate, plain, save_document, sync_table

__all__ = ["PRESET_KINDS", "SITE_DEFAULTS", "PresetSource", "PresetStore", "check_key"]

PRESET_KINDS = ("fluids", "materials")
_KEY = re.compile(r"[a-z0-9](?:[a-z0-9-]{0,38}[a-z0-9])?")
GRAVITY_RANGE = (9.7, 9.9)
"""Accepted local gravity, m/s². WGS 84 normal gravity runs from about 9.780 at the equator to
9.832 m/s² at the poles (from memory — verify), less about 0.003 m/s² per km of height."""


class PresetSource(Protocol):
    """Where saved presets come from when a site is built: a :class:`PresetStore`, or a test's
    dict-backed stand-in."""

    def get(self, kind: str, key: str) -> dict[str, Any]: ...


ShippedPresets = Callable[[], Mapping[str, Mapping[str, Any]]]
"""Returns the shipped presets of one kind: key → values."""


def check_key(field: str, key: object) -> str:
    """``key`` if it is 1–40 lowercase letters, digits and inner hyphens (``brine-22``)."""
    if not isinstance(key, str) or not _KEY.fullmatch(key):
        reason = "must be 1–40 lowercase letters, digits or hyphens, not starting or ending in -"
        raise InputError(field, key, reason)
    return key


def _check_value(field: str, value: object) -> object:
    """A copy of ``value`` if TOML can hold it: text, whole or finite number, true/false,
    and lists or tables of those."""
    if isinstance(value, bool | int | str):
        return value
    if isinstance(value, float):
        if not math.isfinite(value):
            raise InputError(field, value, "must be a finite number")
        return value
    if isinstance(value, list | tuple):
        return [_check_value(f"{field}[{i}]", item) for i, item in enumerate(value)]
    if isinstance(value, Mapping):
        out: dict[str, object] = {}
        for name, item in value.items():
            if not isinstance(name, str) or not name:
                raise InputError(field, name, "names of values must be non-empty text")
            out[name] = _check_value(f"{field}.{name}", item)
        return out
    raise InputError(field, value, "must be text, a number, true/false, a list or a table")


def _check_site_default(field: str, name: str, value: object) -> object:
    """One ``[site_defaults]`` value: ``unit_system``, ``friction_model`` or ``gravity`` (m/s²)."""
    if name == "unit_system":
        if value not in UNIT_SYSTEMS:
            raise InputError(field, value, "must be si or us")
    elif name == "friction_model":
        if value not in FRICTION_MODELS:
            raise InputError(field, value, f"must be one of {', '.join(FRICTION_MODELS)}")
    elif name == "gravity":
        low, high = GRAVITY_RANGE
        if (isinstance(value, bool) or not isinstance(value, int | float)
                or not low <= float(value) <= high):
            raise InputError(field, value, f"must be between {low} and {high} m/s²")
        value = float(value)
    else:
        raise InputError(field, value, "unknown site default")
    return value


SITE_DEFAULTS: dict[str, object] = {
    "unit_system": "si",
    "friction_model": "colebrook",
    "gravity": STANDARD_GRAVITY,
}


class PresetStore:
    """The user's fluids, materials and site defaults over the shipped ones.

    ``data_dir`` is the data folder (default: :func:`data_dir`); ``shipped`` maps a kind
    (``"fluids"``, ``"materials"``) to a callable returning its shipped presets. A user preset
    with a shipped key overrides it; deleting the user one brings the shipped one back.
    """

    def __init__(
        self,
        data_dir: Path | None = None,
        shipped: Mapping[str, ShippedPresets] | None = None,
    ) -> None:
        self.path = presets_path(data_dir)
        self._providers = dict(shipped or {})
        unknown = sorted(set(self._providers) - set(PRESET_KINDS))
        if unknown:
            raise ValueError(f"shipped presets for unknown kinds: {', '.join(unknown)}")
        self._shipped: dict[str, dict[str, dict[str, Any]]] = {}
        self.problems: list[str] = []
        self.broken = False
        self._user: dict[str, dict[str, dict[str, Any]]] = {}
        self._defaults: dict[str, object] = {}
        self.reload()

    def reload(self) -> None:
        """Read the user file again; problems are collected in ``problems``, never raised."""
        self.problems, self.broken = [], False
        self._user = {kind: {} for kind in PRESET_KINDS}
        self._defaults = {}
        if not self.path.exists():
            return
        try:
            doc = migrate(load_toml(self.path), "presets", self.path)
            for name in (*PRESET_KINDS, "site_defaults"):
                if not isinstance(doc.get(name, {}), dict):
                    raise InputError(f"{self.path.name} {name}", doc[name], "must be a table")
        except InputError as exc:
            self.problems.append(str(exc))
            self.broken = True
            return
        for kind in PRESET_KINDS:
            for key, values in doc.get(kind, {}).items():
                where = f"{self.path.name} {kind}.{key}"
                try:
                    check_key(where, key)
                    clean = _check_value(where, values)
                    if not isinstance(clean, dict):
                        raise InputError(where, values, "must be a table of values")
                    self._user[kind][key] = clean
                except InputError as exc:
                    self.problems.append(str(exc))
        for name, value in doc.get("site_defaults", {}).items():
            try:
                where = f"{self.path.name} site_defaults.{name}"
                self._defaults[name] = _check_site_default(where, name, value)
            except InputError as exc:
                self.problems.append(str(exc))

    def _kind(self, kind: str) -> str:
        if kind not in PRESET_KINDS:
            raise InputError("kind", kind, f"must be one of {', '.join(PRESET_KINDS)}")
        return kind

    def shipped(self, kind: str) -> dict[str, dict[str, Any]]:
        """The shipped presets of ``kind`` (asked of the provider once, then kept)."""
        self._kind(kind)
        if kind not in self._shipped:
            provider = self._providers.get(kind)
            found = provider() if provider is not None else {}
            self._shipped[kind] = {key: dict(values) for key, values in found.items()}
        return copy.deepcopy(self._shipped[kind])

    def list(self, kind: str) -> dict[str, dict[str, Any]]:
        """Every preset of ``kind``: shipped ones, then the user's, a user key winning."""
        merged = self.shipped(kind)
        merged.update(copy.deepcopy(self._user[kind]))
        return merged

    def get(self, kind: str, key: str) -> dict[str, Any]:
        """The values of one preset (the user's if both exist)."""
        self._kind(kind)
        if key in self._user[kind]:
            return copy.deepcopy(self._user[kind][key])
        shipped = self.shipped(kind)
        if key in shipped:
            return shipped[key]
        raise InputError(f"{kind}.{key}", key, "no such preset")

    def is_user(self, kind: str, key: str) -> bool:
        """Whether ``key`` is (or overrides with) a user preset."""
        return key in self._user[self._kind(kind)]

    def is_shipped(self, kind: str, key: str) -> bool:
        """Whether ``key`` is a shipped preset (possibly overridden by the user)."""
        return key in self.shipped(kind)

    def put(self, kind: str, key: str, values: Mapping[str, Any]) -> None:
        """Save a user preset; a shipped key is overridden, not changed. Comments are kept."""
        self._kind(kind)
        where = f"{kind}.{key}"
        check_key(where, key)
        clean = _check_value(where, values)
        if not isinstance(values, Mapping) or not clean:
            raise InputError(where, values, "must be a table with at least one value")
        self._refuse_if_broken()
        import tomlkit

        doc = editable(self.path, "presets", "branchwise user presets; hand edits are kept")
        if kind not in doc:
            doc[kind] = tomlkit.table(is_super_table=True)
        entry = doc[kind].get(key)
        if not isinstance(entry, MutableMapping):
            doc[kind][key] = entry = tomlkit.table()
        if not isinstance(clean, dict):  # checked above: values is a mapping
            raise InputError(where, values, "must be a table with at least one value")
        sync_table(entry, clean)
        save_document(self.path, doc, "presets")
        self.reload()

    def delete(self, kind: str, key: str) -> None:
        """Remove a user preset; a shipped one it overrode becomes visible again."""
        self._kind(kind)
        if key not in self._user[kind] and self.is_shipped(kind, key):
            raise InputError(f"{kind}.{key}", key, "shipped presets are read-only")
        self._refuse_if_broken()
        doc = editable(self.path, "presets", "")
        table = doc.get(kind)
        if table is None or key not in table:
            raise InputError(f"{kind}.{key}", key, "no such preset")
        del table[key]
        if not table:
            del doc[kind]
        save_document(self.path, doc, "presets")
        self.reload()

    def site_defaults(self) -> dict[str, object]:
        """Defaults for a new site: ``unit_system``, ``friction_model``, ``gravity`` (m/s²)."""
        return {**SITE_DEFAULTS, **self._defaults}

    def put_site_defaults(self, values: Mapping[str, object]) -> None:
        """Save the given site defaults (others are left as they are in the file)."""
        clean = {
            name: _check_site_default(f"site_defaults.{name}", name, value)
            for name, value in values.items()
        }
        self._refuse_if_broken()
        import tomlkit

        doc = editable(self.path, "presets", "branchwise user presets; hand edits are kept")
        if "site_defaults" not in doc:
            doc["site_defaults"] = tomlkit.table()
        table = doc["site_defaults"]
        sync_table(table, {**{k: plain(v) for k, v in table.items()}, **clean})
        save_document(self.path, doc, "presets")
        self.reload()

    def _refuse_if_broken(self) -> None:
        if self.broken:
            reason = f"has an error and must be fixed first ({'; '.join(self.problems)})"
            raise InputError(self.path.name, str(self.path), reason)
