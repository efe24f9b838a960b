"""Where branchwise keeps the files people keep: presets, settings, sites and recovery copies.

Everything lives under one data folder so that a user can find, back up or delete it in one
place. The folder comes from ``platformdirs`` (the usual per-user data location of each
operating system) unless the environment variable ``BRANCHWISE_DATA_DIR`` names another one;
tests point it at a temporary folder. Nothing here creates a folder: folders appear only when
something is written into them (see :func:`branchwise.core.storage.toml_files.atomic_write_text`).
"""

from __future__ import annotations

import os
import re
from collections.abc import Iterator
from dataclasses import dataclass
from pathlib import Path
from typing import NamedTuple

from ..errors import InputError
from .toml_files import load_toml

APP_NAME = "branchwise"
DATA_DIR_ENV = "BRANCHWISE_DATA_DIR"
"""Environment variable that overrides the data folder (a path; ``~`` is expanded)."""

PRESETS_FILE = "presets.toml"
SETTINGS_FILE = "settings.toml"
SITES_FOLDER = "sites"
RECOVERY_FOLDER = "recovery"
UNSAVED_NAME = "untitled"
"""Stem of the recovery copy of a site that has never been saved."""


def data_dir() -> Path:
    """The user data folder, absolute; ``BRANCHWISE_DATA_DIR`` wins when set and not empty.

    Not created here: reading a missing folder simply finds no files.
    """
    override = os.environ.get(DATA_DIR_ENV, "").strip()
    if override:
        return Path(override).expanduser().absolute()
    import platformdirs  # lazy: keeps start-up free of it until a file is needed

    return Path(platformdirs.user_data_dir(APP_NAME, appauthor=False)).absolute()


def data_dir_problem(base: Path | None = None) -> str | None:
    """What is wrong with the data folder, in words, or None: a file where it should be (or
    on the way to it) leaves nothing to save settings, presets or recovery copies into."""
    from .file_checks import file_in_the_way

    folder = _base(base)
    blocker = folder if folder.exists() and not folder.is_dir() else file_in_the_way(folder)
    if blocker is None:
        return None
    if blocker == folder:
        return (f"the data folder {folder} is a file, not a folder: nothing can be saved there "
                f"(move the file away, or set {DATA_DIR_ENV} to a folder)")
    return (f"the data folder {folder} cannot be made: {blocker} is a file, not a folder "
            f"(move it away, or set {DATA_DIR_ENV} to another folder)")


def _base(base: Path | None) -> Path:
    return data_dir() if base is None else Path(base)


def presets_path(base: Path | None = None) -> Path:
    """The user presets file (``presets.toml``) in ``base`` or the data folder."""
    return _base(base) / PRESETS_FILE


def settings_path(base: Path | None = None) -> Path:
    """The settings file (``settings.toml``) in ``base`` or the data folder."""
    return _base(base) / SETTINGS_FILE


def sites_dir(base: Path | None = None) -> Path:
    """The folder offered by default for saving sites."""
    return _base(base) / SITES_FOLDER


def recovery_dir(base: Path | None = None) -> Path:
    """The folder for autosave copies of unsaved work."""
    return _base(base) / RECOVERY_FOLDER


def recovery_path(site_path: Path | None, base: Path | None = None) -> Path:
    """Where the autosave copy of ``site_path`` (or of a never-saved site, ``None``) goes.

    The name keeps the site's stem so a person browsing the folder knows what it is, plus a
    short hash of the site's resolved path so that two ``pump-room.toml`` files in different
    folders do not share one recovery copy, and one file reached by two paths (``../plant/``,
    a link) has one. Each running instance adds its owner to this name
    (:mod:`.recovery`); a name without one is a copy from before owners were kept.
    """
    folder = recovery_dir(base)
    if site_path is None:
        return folder / f"{UNSAVED_NAME}.toml"
    resolved = Path(site_path).expanduser().resolve()
    stem = re.sub(r"[^A-Za-z0-9_-]+", "-", resolved.stem).strip("-") or "site"
    import hashlib  # only for a saved site's copy: not loaded before the first screen

    digest = hashlib.sha256(str(resolved).encode("utf-8")).hexdigest()[:10]
    return folder / f"{stem}-{digest}.toml"


def where_files_live(base: Path | None = None) -> dict[str, Path]:
    """What lives where, in the order a ``where`` command would print it.

    Keys: ``data_dir``, ``presets_file``, ``settings_file``, ``sites_dir``, ``recovery_dir``.
    """
    root = _base(base)
    return {
        "data_dir": root,
        "presets_file": presets_path(root),
        "settings_file": settings_path(root),
        "sites_dir": sites_dir(root),
        "recovery_dir": recovery_dir(root),
    }


class SiteEntry(NamedTuple):
    """One site file: its path, its ``name`` (or the file stem) and modification time (s)."""

    path: Path
    name: str
    modified: float


@dataclass(frozen=True)
class SiteListing:
    """Site files, most recently modified first, and what could not be read (messages)."""

    sites: list[SiteEntry]
    problems: list[str]

    def __iter__(self) -> Iterator[SiteEntry]:
        return iter(self.sites)

    def __len__(self) -> int:
        return len(self.sites)


def list_sites(directory: Path | None = None) -> SiteListing:
    """The ``*.toml`` site files in ``directory`` (default: :func:`sites_dir`).

    Files that do not load are skipped and reported in ``problems``; a missing folder is
    simply empty. Also lists the recovery folder when given :func:`recovery_dir`.
    """
    folder = sites_dir() if directory is None else Path(directory)
    sites: list[SiteEntry] = []
    problems: list[str] = []
    if not folder.is_dir():
        return SiteListing(sites, problems)
    for path in sorted(folder.glob("*.toml")):
        try:
            doc = load_toml(path)
            modified = path.stat().st_mtime
        except InputError as exc:
            problems.append(str(exc))
            continue
        except OSError as exc:
            problems.append(str(InputError(path.name, str(path), f"cannot read: {exc}")))
            continue
        name = doc.get("name")
        label = name.strip() if isinstance(name, str) and name.strip() else path.stem
        sites.append(SiteEntry(path, label, modified))
    sites.sort(key=lambda entry: entry.modified, reverse=True)
    return SiteListing(sites, problems)
