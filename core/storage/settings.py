"""Display settings and the recent-sites list, kept in ``settings.toml`` in the data folder.

Loading never fails: a value that is wrong is reported in ``problems`` and replaced by its
default; a file that does not load at all marks the settings ``broken``, and :meth:`Settings.save`
then refuses to overwrite it unless told to (``force=True``), so a hand edit gone wrong is never
lost silently. Saving keeps the person's comments and any keys this version does not know.
"""

from __future__ import annotations

from collections.abc import MutableMapping
from dataclasses import dataclass, field
from pathlib import Path

from ..errors import InputError
from .paths import settings_path
from .toml_files import editable, load_toml, migrate, plain, save_document, sync_table

UNIT_SYSTEMS = ("si", "us")
MAX_RECENT = 10
"""Length of the recent-sites list."""


@dataclass
class Settings:
    """How the app shows things and what it opened last; kept in ``settings.toml``.

    ``display_units`` maps a quantity name (``"flow"``) to a unit string (``"gpm"``); the
    strings are checked by the units module when used, not here. ``recent_sites`` is most
    recent first, at most :data:`MAX_RECENT`.
    """

    unit_system: str = "si"
    theme: str | None = None
    """The app's colour theme by name (None: Textual's default); checked by the app."""
    display_units: dict[str, str] = field(default_factory=dict)
    recent_sites: list[Path] = field(default_factory=list)
    last_site: Path | None = None
    path: Path = field(default_factory=settings_path)
    problems: list[str] = field(default_factory=list)
    broken: bool = False

    @classmethod
    def load(cls, data_dir: Path | None = None) -> Settings:
        """The saved settings, or defaults. Never raises: what is wrong goes to ``problems``;
        a file that does not load at all sets ``broken`` so that :meth:`save` leaves it be."""
        settings = cls(path=settings_path(data_dir))
        if not settings.path.exists():
            return settings
        name = settings.path.name
        try:
            doc = migrate(load_toml(settings.path), "settings", settings.path)
        except InputError as exc:
            settings.problems.append(str(exc))
            settings.broken = True
            return settings
        report = settings.problems.append
        system = doc.get("unit_system", "si")
        if system in UNIT_SYSTEMS:
            settings.unit_system = system
        else:
            report(str(InputError(f"{name} unit_system", system, "must be si or us")))
        theme = doc.get("theme")
        if isinstance(theme, str) and theme.strip():
            settings.theme = theme.strip()
        elif theme is not None:
            report(str(InputError(f"{name} theme", theme, "must be a theme's name")))
        units = doc.get("display_units", {})
        if not isinstance(units, dict):
            units = {}
            report(str(InputError(f"{name} display_units", units, "must be a table")))
        for quantity, unit in units.items():
            if isinstance(unit, str) and unit.strip():
                settings.display_units[quantity] = unit
            else:
                report(str(InputError(f"{name} display_units.{quantity}", unit, "must be text")))
        recent = doc.get("recent_sites", [])
        if not isinstance(recent, list):
            report(str(InputError(f"{name} recent_sites", recent, "must be a list of paths")))
            recent = []
        for i, item in enumerate(recent):
            if isinstance(item, str) and item:
                settings.recent_sites.append(Path(item))
            else:
                report(str(InputError(f"{name} recent_sites[{i}]", item, "must be a path")))
        del settings.recent_sites[MAX_RECENT:]
        last = doc.get("last_site")
        if isinstance(last, str) and last:
            settings.last_site = Path(last)
        elif last is not None:
            report(str(InputError(f"{name} last_site", last, "must be a path")))
        return settings

    def remember_site(self, site: Path) -> None:
        """Put ``site`` first in the recent list (once) and make it the last site."""
        site = Path(site).expanduser().absolute()
        self.recent_sites = [site] + [p for p in self.recent_sites if p != site]
        del self.recent_sites[MAX_RECENT:]
        self.last_site = site

    def forget_site(self, site: Path) -> None:
        """Drop ``site`` from the recent list (for example, its file is gone)."""
        site = Path(site).expanduser().absolute()
        self.recent_sites = [p for p in self.recent_sites if p != site]
        if self.last_site == site:
            self.last_site = None

    def save(self, *, force: bool = False) -> None:
        """Write the settings, keeping the person's comments and any keys this version ignores.

        A file that did not load is not overwritten unless ``force`` (then its text is kept as
        ``settings.toml.bak``).
        """
        if self.unit_system not in UNIT_SYSTEMS:
            raise InputError("settings.unit_system", self.unit_system, "must be si or us")
        units = {str(k): str(v) for k, v in self.display_units.items()}
        recent = [str(p) for p in self.recent_sites[:MAX_RECENT]]
        header = "branchwise settings; hand edits are kept"
        if self.broken and not force:
            reason = f"has an error and must be fixed first ({'; '.join(self.problems)})"
            raise InputError(self.path.name, str(self.path), reason)
        try:
            doc = editable(self.path, "settings", header)
        except InputError:
            if not force:
                raise
            import tomlkit

            doc = tomlkit.document()
            doc.add(tomlkit.comment(header))
        if plain(doc.get("unit_system")) != self.unit_system:
            doc["unit_system"] = self.unit_system
        if self.theme is None:
            doc.pop("theme", None)
        elif plain(doc.get("theme")) != self.theme:
            doc["theme"] = self.theme
        if plain(doc.get("recent_sites")) != recent:
            doc["recent_sites"] = recent
        if self.last_site is None:
            doc.pop("last_site", None)
        elif plain(doc.get("last_site")) != str(self.last_site):
            doc["last_site"] = str(self.last_site)
        table = doc.get("display_units")
        if not isinstance(table, MutableMapping) and units:
            import tomlkit

            doc["display_units"] = table = tomlkit.table()
        if isinstance(table, MutableMapping):
            sync_table(table, units)
        save_document(self.path, doc, "settings")
        self.problems, self.broken = [], False
