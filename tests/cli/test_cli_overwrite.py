"""One overwrite rule for every file the command line writes (``solve -o``, ``--curve``,
``demo``): an existing file only with --force, its old text kept as .bak; never a FIFO, a device
or a read-only file; hints quote a path a shell would misread."""

from __future__ import annotations

import os
import shlex
import sys

import pytest

from branchwise.tui.cli import main

posix = pytest.mark.skipif(sys.platform == "win32", reason="FIFOs and modes are POSIX")


@pytest.mark.parametrize("option", [["-o"], ["--curve"], ["--output"]])
def test_an_existing_output_is_replaced_only_with_force_and_kept_as_bak(tmp_path, capsys,
                                                                          option):
    target = tmp_path / "out.txt"
    target.write_text("another site's work\n")
    assert main(["solve", *option, str(target)]) == 2
    out, err = capsys.readouterr()
    assert "already exists" in err and "--force" in err and err.count("\n") == 1
    assert target.read_text() == "another site's work\n"
    assert main(["solve", *option, str(target), "--force"]) == 0
    assert target.read_text() != "another site's work\n"
    assert (tmp_path / "out.txt.bak").read_text() == "another site's work\n"


@posix
def test_a_read_only_fifo_or_device_output_is_refused_even_with_force(tmp_path, capsys):
    locked = tmp_path / "locked.csv"
    locked.write_text("kept\n")
    os.chmod(locked, 0o444)
    assert main(["solve", "-o", str(locked), "--force"]) == 2
    assert "read-only" in capsys.readouterr().err and locked.read_text() == "kept\n"
    fifo = tmp_path / "pipe.csv"
    os.mkfifo(fifo)
    for target in (fifo, "/dev/null"):
        assert main(["solve", "-o", str(target), "--force"]) == 2
        assert "not a regular file" in capsys.readouterr().err


def test_demo_keeps_the_same_rule_and_quotes_its_hints(tmp_path, capsys, monkeypatch):
    monkeypatch.chdir(tmp_path)
    assert main(["demo", "--", "-dash.toml"]) == 0
    out = capsys.readouterr().out
    assert "branchwise open ./-dash.toml" in out
    assert main(["demo", "my site.toml"]) == 0
    out = capsys.readouterr().out
    assert f"branchwise open {shlex.quote('my site.toml')}" in out
    assert shlex.split(out.splitlines()[1].split(": ", 1)[1])[2] == "my site.toml"
    assert main(["demo", "my site.toml"]) == 2
    assert "--force" in capsys.readouterr().err
    assert main(["demo", "my site.toml", "--force"]) == 0
    assert (tmp_path / "my site.toml.bak").is_file()


def test_open_without_a_terminal_keeps_the_rule_too(tmp_path, capsys):
    site = tmp_path / "site.toml"
    assert main(["demo", str(site)]) == 0
    out = tmp_path / "out.md"
    out.write_text("kept\n")
    assert main(["open", str(site), "--format", "markdown", "-o", str(out)]) == 2
    assert out.read_text() == "kept\n"
    assert main(["open", str(site), "--format", "markdown", "-o", str(out), "--force"]) == 0
    assert out.read_text().startswith("#")
