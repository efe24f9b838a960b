"""Nothing hangs on an odd file, nothing is replaced silently.

Only a regular file is read (a FIFO or a device is refused before it is opened, so nothing
waits for a writer or reads for ever), and at most 16 MB of it; a write goes through a link to
its target, keeps the file's mode, and a recovery copy is the owner's only; a folder on the way
that is a file is named.
"""

from __future__ import annotations

import os
import stat
import sys
import threading

import pytest

from branchwise.core.errors import InputError
from branchwise.core.site.read import demo_site, demo_text, load_site
from branchwise.core.site.write import save_site
from branchwise.core.storage.atomic import atomic_write_text
from branchwise.core.storage.file_checks import MAX_READ_BYTES, check_replace, read_bytes
from branchwise.core.storage.paths import list_sites
from branchwise.core.storage.toml_files import load_toml

posix = pytest.mark.skipif(sys.platform == "win32", reason="FIFOs, devices and modes are POSIX")
HANG = 30.0
"""A guard against a hang only: each read below is refused at once."""


def _in_time(call):
    """Run ``call`` in a thread; fail (rather than hang the suite) if it does not return."""
    box: dict[str, object] = {}

    def run() -> None:
        try:
            box["value"] = call()
        except BaseException as exc:  # handed back to the test
            box["error"] = exc

    thread = threading.Thread(target=run, daemon=True)
    thread.start()
    thread.join(HANG)
    assert not thread.is_alive(), "the read did not return: it hangs"
    error = box.get("error")
    if isinstance(error, BaseException):
        raise error
    return box.get("value")


@posix
def test_a_fifo_is_refused_before_it_is_opened(tmp_path):
    fifo = tmp_path / "site.toml"
    os.mkfifo(fifo)
    for read in (lambda: load_site(fifo), lambda: load_toml(fifo)):
        with pytest.raises(InputError) as caught:
            _in_time(read)
        assert "FIFO" in caught.value.reason and "not a regular file" in caught.value.reason
    # In the sites folder: listed as a problem, the other sites still listed.
    save_site(demo_site(), tmp_path / "good.toml")
    listing = _in_time(lambda: list_sites(tmp_path))
    assert [e.path.name for e in listing] == ["good.toml"]
    assert any("FIFO" in p for p in listing.problems)


@posix
def test_a_device_and_a_folder_are_refused(tmp_path):
    with pytest.raises(InputError, match="is a device"):
        _in_time(lambda: load_site("/dev/zero"))
    with pytest.raises(InputError, match="is a folder"):
        load_site(tmp_path)


def test_a_file_over_the_cap_is_refused_without_reading_it(tmp_path):
    big = tmp_path / "huge.toml"
    with open(big, "wb") as handle:  # sparse: no disk space used
        handle.truncate(3 * 1024 ** 3)
    with pytest.raises(InputError) as caught:
        load_site(big)
    assert "3.0 GB" in caught.value.reason and "16.0 MB" in caught.value.reason
    small = tmp_path / "small.toml"
    small.write_bytes(b"x" * 100)
    assert read_bytes(small, limit=100) == b"x" * 100
    with pytest.raises(InputError):
        read_bytes(small, limit=99)
    assert MAX_READ_BYTES >= 12 * 1024 * 1024  # a site of 100,000 branches (~10 MB) still reads


@posix
def test_a_save_through_a_link_writes_the_target_and_keeps_its_mode(tmp_path):
    real = tmp_path / "real" / "site.toml"
    real.parent.mkdir()
    real.write_text(demo_text(), encoding="utf-8")
    os.chmod(real, 0o640)
    link = tmp_path / "link.toml"
    link.symlink_to(real)
    atomic_write_text(link, "name = 'new'\n")
    assert link.is_symlink() and real.read_text() == "name = 'new'\n"
    assert stat.S_IMODE(real.stat().st_mode) == 0o640
    assert (real.parent / "site.toml.bak").read_text(encoding="utf-8") == demo_text()
    assert not (tmp_path / "link.toml.bak").exists()


@posix
def test_a_private_file_is_the_owners_only_and_a_fifo_is_never_replaced(tmp_path):
    old = os.umask(0o022)
    try:
        atomic_write_text(tmp_path / "copy.toml", "a = 1\n", backup=False, private=True)
    finally:
        os.umask(old)
    assert stat.S_IMODE((tmp_path / "copy.toml").stat().st_mode) == 0o600
    fifo = tmp_path / "out.csv"
    os.mkfifo(fifo)
    with pytest.raises(InputError, match="FIFO"):
        atomic_write_text(fifo, "x\n")
    assert stat.S_ISFIFO(fifo.stat().st_mode)


def test_the_one_rule_for_replacing(tmp_path):
    new = tmp_path / "new.csv"
    check_replace(new, "--output", force=False)  # a new file: fine
    new.write_text("old\n")
    with pytest.raises(InputError, match="add --force"):
        check_replace(new, "--output", force=False)
    check_replace(new, "--output", force=True)
    os.chmod(new, 0o444)
    with pytest.raises(InputError, match="read-only"):
        check_replace(new, "--output", force=True)


def test_a_folder_on_the_way_that_is_a_file_is_named(tmp_path, monkeypatch):
    from branchwise.core.storage.paths import data_dir_problem

    blocker = tmp_path / "data"
    blocker.write_text("not a folder")
    monkeypatch.setenv("BRANCHWISE_DATA_DIR", str(blocker))
    with pytest.raises(InputError) as caught:
        atomic_write_text(blocker / "settings.toml", "a = 1\n")
    assert f"{blocker} is a file where a folder should be" in caught.value.reason
    with pytest.raises(InputError, match="a folder on the way is a file"):
        load_toml(blocker / "presets.toml")
    problem = data_dir_problem()
    assert problem is not None and f"the data folder {blocker} is a file" in problem
    assert "BRANCHWISE_DATA_DIR" in problem
    monkeypatch.setenv("BRANCHWISE_DATA_DIR", str(blocker / "inner"))
    assert f"{blocker} is a file" in (data_dir_problem() or "")
    monkeypatch.setenv("BRANCHWISE_DATA_DIR", str(tmp_path / "fine"))
    assert data_dir_problem() is None


def test_crlf_files_keep_their_line_endings(tmp_path):
    path = tmp_path / "windows.toml"
    path.write_bytes(demo_text().replace("\n", "\r\n").encode("utf-8"))
    site = load_site(path)
    site.conditions.pressure_drop = "61 kPa"
    site.branches[0].note = "checked"  # a new line in the file
    save_site(site, path)
    data = path.read_bytes()
    assert b"61 kPa" in data and b"checked" in data
    assert data.count(b"\n") == data.count(b"\r\n")  # every line ends CRLF
    unix = save_site(demo_site(), tmp_path / "unix.toml").read_bytes()
    assert b"\r" not in unix
    assert load_site(path).conditions.pressure_drop == "61 kPa"


