"""Terminal escape codes in a name, tag or record line reach no terminal raw: every report
shows them escaped (``\\x1b``), as error messages do, and JSON keeps the exact text as valid
JSON escapes."""

from __future__ import annotations

import json

import pytest

from branchwise.core.site.read import demo_text
from branchwise.tui.cli import main

NASTY = "\\u001b]0;PWNED\\u0007\\u001b[2J\\u009b31m\\u202e"
"""A window title, a screen clear, an 8-bit CSI and a right-to-left override, as TOML escapes."""


def _site(tmp_path):
    text = demo_text()
    text = text.replace('name = "AHU-1 coil"', f'name = "AHU-1{NASTY} coil"', 1)
    text = text.replace('tag = "CHW-101"', f'tag = "CHW{NASTY}-101"', 1)
    text = text.replace('technician = ', f'technician = "T{NASTY}" #', 1)
    path = tmp_path / "nasty.toml"
    path.write_text(text, encoding="utf-8")
    return path


@pytest.mark.parametrize("fmt", ["table", "csv", "markdown", "json"])
def test_no_control_character_reaches_the_output(tmp_path, capsys, fmt):
    site = _site(tmp_path)
    assert main(["solve", str(site), "--format", fmt]) == 0
    out = capsys.readouterr().out
    bad = [c for c in out if (ord(c) < 0x20 and c not in "\n\t") or 0x7f <= ord(c) < 0xa0
           or c == "\u202e"]
    assert bad == []
    if fmt == "json":
        names = [b["name"] for b in json.loads(out)["branches"]]
        assert "AHU-1\x1b]0;PWNED\x07\x1b[2J\x9b31m\u202e coil" in names  # exact, as data
    else:
        assert "AHU-1\\x1b]0;PWNED\\x07\\x1b[2J\\x9b31m\\u202e coil" in out


def test_the_output_file_is_inert_too(tmp_path, capsys):
    site = _site(tmp_path)
    out = tmp_path / "out.md"
    assert main(["solve", str(site), "--format", "markdown", "-o", str(out)]) == 0
    assert "\x1b" not in out.read_text(encoding="utf-8")
