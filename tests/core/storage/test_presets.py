"""The files people keep: data folder, TOML reading, format versions, presets, settings, sites.

Outside references used below: Python's ``tomllib`` (the standard-library TOML 1.0 parser)
reads back every file written; ``tomlkit``'s own parser independently locates the line of
each syntax error; ``platformdirs`` gives the per-user data folder; POSIX ``umask`` semantics
decide the mode of a new file.
"""

from __future__ import annotations

import os
import stat
import tomllib
from pathlib import Path

import platformdirs
import pytest
import tomlkit

from branchwise.core.errors import InputError
from branchwise.core.storage.atomic import atomic_write_text
from branchwise.core.storage.paths import data_dir, list_sites, where_files_live
from branchwise.core.storage.presets import PresetStore
from branchwise.core.storage.settings import Settings
from branchwise.core.storage.toml_files import FORMAT, load_toml, migrate

SHIPPED_FLUIDS = {"water-20c": {"density": 998.21, "viscosity": 1.0016e-3}}
SHIPPED_MATERIALS = {"commercial-steel": {"roughness": 4.5e-5}}


@pytest.fixture
def data(tmp_path: Path, monkeypatch: pytest.MonkeyPatch) -> Path:
    folder = tmp_path / "data"
    monkeypatch.setenv("BRANCHWISE_DATA_DIR", str(folder))
    return folder


def make_store() -> PresetStore:
    return PresetStore(
        shipped={"fluids": lambda: SHIPPED_FLUIDS, "materials": lambda: SHIPPED_MATERIALS}
    )


# Data folder ---------------------------------------------------------------------------------


def test_data_dir_follows_environment_and_is_not_created_by_reading(data: Path) -> None:
    assert data_dir() == data
    store = make_store()
    assert store.list("fluids") == SHIPPED_FLUIDS
    Settings.load()
    list_sites()
    assert not data.exists()  # reading never creates folders
    places = where_files_live()
    assert set(places) == {"data_dir", "presets_file", "settings_file", "sites_dir", "recovery_dir"}
    assert all(path == data or data in path.parents for path in places.values())


def test_data_dir_default_is_the_platform_user_data_folder(monkeypatch: pytest.MonkeyPatch) -> None:
    monkeypatch.delenv("BRANCHWISE_DATA_DIR", raising=False)
    # Reference: platformdirs' own answer for the app name.
    assert data_dir() == Path(platformdirs.user_data_dir("branchwise", appauthor=False))


# Atomic writes --------------------------------------------------------------------------------


def test_atomic_write_keeps_previous_version_as_backup(tmp_path: Path) -> None:
    target = tmp_path / "new" / "north.toml"
    atomic_write_text(target, "a = 1\n")
    assert target.read_text() == "a = 1\n"
    assert not (tmp_path / "new" / "north.toml.bak").exists()
    atomic_write_text(target, "a = 2\n")
    assert target.read_text() == "a = 2\n"
    assert (tmp_path / "new" / "north.toml.bak").read_text() == "a = 1\n"
    atomic_write_text(target, "a = 3\n", backup=False)
    assert (tmp_path / "new" / "north.toml.bak").read_text() == "a = 1\n"
    assert sorted(p.name for p in target.parent.iterdir()) == ["north.toml", "north.toml.bak"]


def test_atomic_write_sweeps_only_stale_temporary_files(tmp_path: Path) -> None:
    target = tmp_path / "north.toml"
    stale = tmp_path / ".north.toml.0badf00d.tmp"
    stale_backup = tmp_path / ".north.toml.bak.0badf00d.tmp"
    fresh = tmp_path / ".north.toml.1234abcd.tmp"  # maybe another writer, mid-save
    other = tmp_path / ".south.toml.0badf00d.tmp"
    for path in (stale, stale_backup, fresh, other):
        path.write_text("partial")
    for path in (stale, stale_backup, other):
        os.utime(path, (1_700_000_000, 1_700_000_000))
    atomic_write_text(target, "a = 1\n")
    assert not stale.exists() and not stale_backup.exists()
    assert fresh.exists() and other.exists()


def test_atomic_write_mode_follows_umask_then_previous_file(tmp_path: Path) -> None:
    target = tmp_path / "site.toml"
    old_umask = os.umask(0o022)
    try:
        atomic_write_text(target, "a = 1\n")
    finally:
        os.umask(old_umask)
    # Reference: POSIX open(2) — a file created with mode 0o666 under umask 022 gets 0o644.
    assert stat.S_IMODE(target.stat().st_mode) == 0o644
    target.chmod(0o600)
    atomic_write_text(target, "a = 2\n")
    assert stat.S_IMODE(target.stat().st_mode) == 0o600


def test_atomic_write_reports_an_unwritable_folder(tmp_path: Path) -> None:
    blocker = tmp_path / "file"
    blocker.write_text("not a folder")
    with pytest.raises(InputError) as caught:
        atomic_write_text(blocker / "x.toml", "a = 1\n")
    assert caught.value.field == "x.toml"
    assert "could not save" in caught.value.reason


# Reading TOML -------------------------------------------------------------------------------

BROKEN = [
    # (text, line counted by hand, words expected in the reason)
    ("format = 1\n\n[fluids.brine]\ndensity = 1180\nnote = site A\n", 5, "not valid TOML"),
    ("format = 1\n[fluids.x]\ndensity 1180\n", 3, "expected `=`"),
    ("a = 1\nb = 2\na = 3\n", 3, "set twice"),
    ('a = 1\nname = "abc\n', 2, "not closed"),
    ('a = 1\nb = "x\x00y"\n', 2, "does not allow"),
    ("a = 1\n[fluids.x\n", 2, "header is not closed"),
]


@pytest.mark.parametrize(("text", "line", "words"), BROKEN)
def test_broken_toml_names_file_line_and_reason(
    tmp_path: Path, text: str, line: int, words: str
) -> None:
    path = tmp_path / "north.toml"
    path.write_bytes(text.encode())
    with pytest.raises(tomlkit.exceptions.ParseError) as other:
        tomlkit.parse(text)
    assert other.value.line == line  # Reference: tomlkit's parser finds the same line.
    with pytest.raises(InputError) as caught:
        load_toml(path)
    assert caught.value.field == f"north.toml line {line}"
    assert words in caught.value.reason
    offending = text.splitlines()[line - 1].strip().replace("\x00", "\\x00")
    assert caught.value.value == offending
    assert path.read_bytes() == text.encode()


def test_binary_junk_and_missing_files_are_input_errors(tmp_path: Path) -> None:
    junk = tmp_path / "junk.toml"
    junk.write_bytes(b"a = 1\n\xff\xfe\x00\x81binary")
    with pytest.raises(InputError) as caught:
        load_toml(junk)
    assert caught.value.field == "junk.toml line 2"
    assert "not UTF-8" in caught.value.reason
    with pytest.raises(InputError) as caught:
        load_toml(tmp_path / "gone.toml", "site file")
    assert (caught.value.field, caught.value.reason) == ("site file", "file not found")


def test_byte_order_mark_is_accepted(tmp_path: Path) -> None:
    path = tmp_path / "bom.toml"
    path.write_bytes(b"\xef\xbb\xbfname = 'pump room'\n")
    assert load_toml(path) == {"name": "pump room"}


# Format versions ------------------------------------------------------------------------------


def test_format_zero_migrates_and_newer_formats_are_refused() -> None:
    old = {"name": "north"}
    assert migrate(old, "site", "north.toml") == {"name": "north", "format": FORMAT, "kind": "site"}
    assert old == {"name": "north"}  # the caller's dict is not changed
    current = {"format": 1, "kind": "site", "name": "x"}
    assert migrate(current, "site", "x.toml") == current
    with pytest.raises(InputError) as caught:
        migrate({"format": 2}, "site", Path("/a/north.toml"))
    assert caught.value.field == "north.toml format"
    assert caught.value.reason == (
        "written by a newer branchwise (format 2); this one reads format 1"
    )
    with pytest.raises(InputError, match="not a site file"):
        migrate({"format": 1, "kind": "settings"}, "site", "s.toml")
    for bad in ("1", 1.0, True, -1):
        with pytest.raises(InputError, match="whole number"):
            migrate({"format": bad}, "site", "x.toml")


# Presets ----------------------------------------------------------------------------------------


def test_put_round_trips_through_an_independent_reader(data: Path) -> None:
    store = make_store()
    values = {"density": 1180.0, "viscosity": 2.1e-3, "source": "lab sheet 14", "tags": ["a", 1]}
    store.put("fluids", "brine-22", values)
    assert store.get("fluids", "brine-22") == values
    assert make_store().get("fluids", "brine-22") == values  # a fresh store reads it back
    # Reference: the standard-library TOML parser reads what was written.
    raw = tomllib.loads((data / "presets.toml").read_text())
    assert raw["format"] == FORMAT and raw["kind"] == "presets"
    assert raw["fluids"]["brine-22"] == values
    assert make_store().list("fluids") == {**SHIPPED_FLUIDS, "brine-22": values}


def test_user_key_overrides_shipped_and_delete_restores_it(data: Path) -> None:
    store = make_store()
    assert not store.is_user("fluids", "water-20c")
    store.put("fluids", "water-20c", {"density": 999.0})
    assert store.get("fluids", "water-20c") == {"density": 999.0}
    assert store.list("fluids")["water-20c"] == {"density": 999.0}
    assert store.is_user("fluids", "water-20c") and store.is_shipped("fluids", "water-20c")
    store.delete("fluids", "water-20c")
    assert store.get("fluids", "water-20c") == SHIPPED_FLUIDS["water-20c"]
    assert not make_store().is_user("fluids", "water-20c")


def test_shipped_presets_are_read_only(data: Path) -> None:
    store = make_store()
    with pytest.raises(InputError, match="shipped presets are read-only"):
        store.delete("materials", "commercial-steel")
    with pytest.raises(InputError, match="no such preset"):
        store.delete("materials", "unobtainium")
    with pytest.raises(InputError, match="no such preset"):
        store.get("materials", "unobtainium")
    assert not data.exists()


@pytest.mark.parametrize("key", ["Brine", "-brine", "brine-", "brine_22", "", "x" * 41, "né"])
def test_bad_keys_are_refused(data: Path, key: str) -> None:
    with pytest.raises(InputError) as caught:
        make_store().put("fluids", key, {"density": 1000.0})
    assert caught.value.value == key
    assert not data.exists()


@pytest.mark.parametrize("values", [{}, {"density": float("nan")}, {"density": None}, [1, 2]])
def test_bad_values_are_refused(data: Path, values: object) -> None:
    with pytest.raises(InputError):
        make_store().put("fluids", "brine", values)  # type: ignore[arg-type]
    assert not data.exists()


def test_unknown_kind_is_refused(data: Path) -> None:
    with pytest.raises(InputError, match="must be one of fluids, materials"):
        make_store().list("pumps")


def test_comments_survive_a_put(data: Path) -> None:
    data.mkdir()
    hand_written = (
        "# my presets, kept by hand\n"
        "format = 1\n"
        'kind = "presets"\n'
        "\n"
        "[fluids.brine]  # from the 2024 lab sheet\n"
        "density = 1180.0  # measured at 15 C\n"
        "viscosity = 0.0021\n"
    )
    (data / "presets.toml").write_text(hand_written)
    store = make_store()
    store.put("fluids", "brine", {"density": 1180.0, "viscosity": 0.0023})
    store.put("materials", "old-cast-iron", {"roughness": 1.0e-3})
    text = (data / "presets.toml").read_text()
    for kept in ("# my presets, kept by hand", "# from the 2024 lab sheet", "# measured at 15 C"):
        assert kept in text
    raw = tomllib.loads(text)  # Reference: standard-library parser.
    assert raw["fluids"]["brine"] == {"density": 1180.0, "viscosity": 0.0023}
    assert raw["materials"]["old-cast-iron"] == {"roughness": 1.0e-3}
    assert (data / "presets.toml.bak").read_text().startswith("# my presets")


def test_format_zero_user_file_is_read_and_upgraded_on_save(data: Path) -> None:
    data.mkdir()
    (data / "presets.toml").write_text("[materials.mine]\nroughness = 2e-4\n")
    store = make_store()
    assert store.problems == [] and store.get("materials", "mine") == {"roughness": 2e-4}
    store.put("materials", "other", {"roughness": 3e-4})
    raw = tomllib.loads((data / "presets.toml").read_text())
    assert (raw["format"], raw["kind"]) == (FORMAT, "presets")


CORRUPT = "format = 1\n[fluids.brine]\ndensity = 1180\nviscosity = 0..002\n"


@pytest.mark.parametrize(
    ("text", "expected"),
    [
        (CORRUPT, "presets.toml line 4"),
        ("format = 2\n[fluids.future]\na = 1\n", "newer branchwise (format 2)"),
        (b"\x00\x01\x02\xff junk", "presets.toml line 1"),
    ],
)
def test_corrupt_user_file_is_reported_untouched_and_shipped_still_work(
    data: Path, text: str | bytes, expected: str
) -> None:
    data.mkdir()
    path = data / "presets.toml"
    path.write_bytes(text if isinstance(text, bytes) else text.encode())
    before = path.read_bytes()
    store = make_store()
    assert store.broken and len(store.problems) == 1 and expected in store.problems[0]
    assert store.list("fluids") == SHIPPED_FLUIDS
    assert store.get("materials", "commercial-steel") == SHIPPED_MATERIALS["commercial-steel"]
    with pytest.raises(InputError, match="must be fixed first"):
        store.put("fluids", "brine", {"density": 1180.0})
    with pytest.raises(InputError, match="must be fixed first"):
        store.put_site_defaults({"unit_system": "us"})
    with pytest.raises(InputError, match="must be fixed first"):
        store.delete("fluids", "brine")
    assert path.read_bytes() == before
    assert sorted(p.name for p in data.iterdir()) == ["presets.toml"]


def test_bad_entry_is_reported_but_the_rest_loads_and_is_kept(data: Path) -> None:
    data.mkdir()
    (data / "presets.toml").write_text(
        "format = 1\n[fluids.Brine]\ndensity = 1\n[fluids.ok]\ndensity = 2\n[site_defaults]\n"
        "gravity = 98.1\n"
    )
    store = make_store()
    assert not store.broken
    assert any("fluids.Brine" in p for p in store.problems)
    assert any("site_defaults.gravity" in p and "98.1" in p for p in store.problems)
    assert store.get("fluids", "ok") == {"density": 2}
    store.put("fluids", "more", {"density": 3.0})
    assert "[fluids.Brine]" in (data / "presets.toml").read_text()  # the person's text stays


def test_site_defaults(data: Path) -> None:
    store = make_store()
    # Reference: standard gravity 9.80665 m/s² (ISO 80000-3; CGPM 1901).
    assert store.site_defaults() == {
        "unit_system": "si",
        "friction_model": "colebrook",
        "gravity": 9.80665,
    }
    store.put_site_defaults({"unit_system": "us", "gravity": 9.79})
    assert make_store().site_defaults()["unit_system"] == "us"
    assert make_store().site_defaults()["gravity"] == 9.79
    for bad in ({"gravity": 98.1}, {"friction_model": "moody"}, {"unit_system": "imperial"}):
        with pytest.raises(InputError):
            store.put_site_defaults(bad)


def test_shipped_provider_is_asked_once(data: Path) -> None:
    calls: list[int] = []

    def provider() -> dict[str, dict[str, float]]:
        calls.append(1)
        return SHIPPED_FLUIDS

    store = PresetStore(shipped={"fluids": provider})
    assert calls == []  # nothing loaded until asked
    store.list("fluids")
    store.get("fluids", "water-20c")
    assert len(calls) == 1


@pytest.mark.parametrize("c", ['"1_20"', "true", "1" * 400])
def test_a_hand_written_hazen_williams_c_is_checked_where_it_is_used(data: Path, c: str) -> None:
    # A presets file written by hand is not checked when read: "1_20" was used as C 120,
    # true as C 1, a 400-digit integer ended in an internal error. Where the material is used,
    # it is refused naming the preset's field.
    from branchwise.core.storage.user_presets import material_for

    data.mkdir()
    (data / "presets.toml").write_text(
        f'format = 1\n[materials.m6]\nroughness = "0.05 mm"\nhazen_williams_c = {c}\n')
    with pytest.raises(InputError) as caught:
        material_for("m6", "branches[0].material")
    assert caught.value.field == "materials.m6.hazen_williams_c"
