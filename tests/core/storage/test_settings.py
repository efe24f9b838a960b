"""Settings, the sites folder and recovery copies.

Outside reference: Python's ``tomllib`` (standard-library TOML 1.0 parser) reads back every file
written; file modification times come from the operating system (``os.utime``).
"""

from __future__ import annotations

import os
import tomllib
from pathlib import Path

import pytest

from branchwise.core.errors import InputError
from branchwise.core.storage.atomic import atomic_write_text
from branchwise.core.storage.paths import list_sites, recovery_dir, recovery_path, sites_dir
from branchwise.core.storage.settings import MAX_RECENT, Settings


@pytest.fixture
def data(tmp_path: Path, monkeypatch: pytest.MonkeyPatch) -> Path:
    folder = tmp_path / "data"
    monkeypatch.setenv("BRANCHWISE_DATA_DIR", str(folder))
    return folder


def test_defaults_without_a_file(data: Path) -> None:
    settings = Settings.load()
    assert (settings.unit_system, settings.display_units) == ("si", {})
    assert (settings.recent_sites, settings.last_site, settings.problems) == ([], None, [])
    assert not data.exists()


def test_round_trip_and_recent_list(data: Path, tmp_path: Path) -> None:
    settings = Settings.load()
    settings.unit_system = "us"
    settings.display_units = {"flow": "gpm", "pressure": "psi"}
    sites = [tmp_path / f"site-{i}.toml" for i in range(MAX_RECENT + 3)]
    for site in sites:
        settings.remember_site(site)
    settings.remember_site(sites[4])  # again: moves to the front, not listed twice
    settings.save()
    again = Settings.load()
    assert again.unit_system == "us"
    assert again.display_units == {"flow": "gpm", "pressure": "psi"}
    assert again.last_site == sites[4]
    expected = [sites[4], *[s for s in reversed(sites) if s != sites[4]]][:MAX_RECENT]
    assert again.recent_sites == expected and len(again.recent_sites) == MAX_RECENT
    raw = tomllib.loads((data / "settings.toml").read_text())  # Reference: tomllib.
    assert raw["format"] == 1 and raw["kind"] == "settings"
    assert raw["recent_sites"] == [str(p) for p in expected]
    again.forget_site(sites[4])
    assert sites[4] not in again.recent_sites and again.last_site is None


def test_comments_and_unknown_keys_survive_save(data: Path) -> None:
    data.mkdir()
    (data / "settings.toml").write_text(
        "# set up for the north plant\n"
        'unit_system = "si"  # the client works in SI\n'
        'future_option = "keep me"\n'
        "[display_units]\n"
        'flow = "m3/h"  # as on the meters\n'
    )
    settings = Settings.load()
    assert settings.problems == []
    settings.display_units["pressure"] = "kPa"
    settings.save()
    text = (data / "settings.toml").read_text()
    for kept in ("# set up for the north plant", "# the client works in SI", "# as on the meters"):
        assert kept in text
    raw = tomllib.loads(text)  # Reference: tomllib.
    assert raw["future_option"] == "keep me"
    assert raw["display_units"] == {"flow": "m3/h", "pressure": "kPa"}


def test_bad_values_fall_back_to_defaults_with_problems(data: Path) -> None:
    data.mkdir()
    (data / "settings.toml").write_text(
        'unit_system = "imperial"\nrecent_sites = ["/a.toml", 3]\n[display_units]\nflow = 7\n'
    )
    settings = Settings.load()
    assert not settings.broken
    assert settings.unit_system == "si"
    assert settings.recent_sites == [Path("/a.toml")]
    assert settings.display_units == {}
    assert len(settings.problems) == 3
    assert any("settings.toml unit_system" in p and "imperial" in p for p in settings.problems)


def test_broken_file_is_kept_until_forced(data: Path) -> None:
    data.mkdir()
    path = data / "settings.toml"
    path.write_bytes(b'unit_system = "us"\nrecent_sites = ["/a.toml",\n')
    before = path.read_bytes()
    settings = Settings.load()
    assert settings.broken and settings.unit_system == "si"
    assert "settings.toml line" in settings.problems[0]
    settings.unit_system = "us"
    with pytest.raises(InputError, match="must be fixed first"):
        settings.save()
    assert path.read_bytes() == before
    settings.save(force=True)
    assert tomllib.loads(path.read_text())["unit_system"] == "us"
    assert (data / "settings.toml.bak").read_bytes() == before
    assert Settings.load().problems == []


def test_save_refuses_a_bad_unit_system(data: Path) -> None:
    settings = Settings.load()
    settings.unit_system = "metric"
    with pytest.raises(InputError, match="must be si or us"):
        settings.save()
    assert not data.exists()


def test_list_sites_names_order_and_problems(data: Path) -> None:
    folder = sites_dir()
    assert list(list_sites()) == []  # missing folder: empty, not an error
    atomic_write_text(folder / "north.toml", 'format = 1\nname = "North pump house"\n')
    atomic_write_text(folder / "south.toml", "format = 1\n")
    atomic_write_text(folder / "south.toml", "format = 1\n")  # leaves south.toml.bak
    (folder / "broken.toml").write_text("name = \n")
    (folder / ".north.toml.1234abcd.tmp").write_text("partial")
    os.utime(folder / "north.toml", (1_700_000_000, 1_700_000_000))
    os.utime(folder / "south.toml", (1_700_000_500, 1_700_000_500))
    listing = list_sites()
    assert [(e.path.name, e.name) for e in listing] == [
        ("south.toml", "south"),
        ("north.toml", "North pump house"),
    ]
    assert [e.modified for e in listing] == [1_700_000_500, 1_700_000_000]
    assert len(listing.problems) == 1 and listing.problems[0].startswith("broken.toml line 1")


def test_recovery_paths(data: Path, tmp_path: Path) -> None:
    a = recovery_path(tmp_path / "one" / "pump room.toml")
    b = recovery_path(tmp_path / "two" / "pump room.toml")
    assert a != b and a.parent == b.parent == recovery_dir() == data / "recovery"
    assert a.name.startswith("pump-room-") and a.suffix == ".toml"
    assert a == recovery_path(tmp_path / "one" / "pump room.toml")
    assert recovery_path(None) == data / "recovery" / "untitled.toml"
    assert not data.exists()
