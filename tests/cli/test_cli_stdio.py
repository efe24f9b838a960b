"""The command line in a pipeline: ``python -m branchwise``, ``-`` for standard input and
output, the table's width, the exit statuses as documented, and ``branchwise import``."""

from __future__ import annotations

import os
import re
import subprocess
import sys
from pathlib import Path

import pytest

from branchwise.core.site.read import demo_text
from branchwise.tui.cli import EXIT_STATUSES, main

README = Path(__file__).resolve().parents[2] / "README.md"


def run(*args: str, stdin: str | None = None, env: dict[str, str] | None = None,
        cwd: Path | None = None) -> subprocess.CompletedProcess[str]:
    full = {**os.environ, **(env or {})}
    return subprocess.run([sys.executable, "-m", "branchwise", *args], input=stdin,
                          capture_output=True, text=True, timeout=120, env=full, cwd=cwd)


def test_python_dash_m_branchwise_is_the_command(tmp_path):
    out = run("--version", cwd=tmp_path)
    assert out.returncode == 0 and out.stdout.startswith("branchwise ")
    assert run("solve", cwd=tmp_path).stdout == subprocess.run(
        [sys.executable, "-m", "branchwise.tui.cli", "solve"], capture_output=True, text=True,
        timeout=120, cwd=tmp_path).stdout


def test_a_site_from_standard_input_and_the_output_to_standard_output(tmp_path):
    out = run("solve", "-", "-o", "-", "--format", "json", stdin=demo_text(), cwd=tmp_path)
    assert out.returncode == 0, out.stderr
    assert '"site": "Demo: chilled-water header, plant room B"' in out.stdout
    assert not (tmp_path / "-").exists()  # no file named '-'
    bad = run("solve", "-", stdin="name = [", cwd=tmp_path)
    assert bad.returncode == 2 and bad.stderr.startswith("branchwise: <stdin>")
    assert len(bad.stderr.splitlines()) == 1


def test_the_curve_wants_a_file_name(tmp_path):
    out = run("solve", "--curve", "-", cwd=tmp_path)
    assert out.returncode == 2 and "--curve: needs a file name" in out.stderr


def _widest(text: str) -> int:
    """The widest line of running text (the tables are never wrapped)."""
    return max(len(line) for line in text.split("\nFlows:")[0].splitlines())


def test_the_table_follows_the_width(tmp_path):
    narrow = run("solve", env={"COLUMNS": ""}, cwd=tmp_path).stdout  # not a terminal: 80
    assert _widest(narrow) <= 80
    wide = run("solve", env={"COLUMNS": "160"}, cwd=tmp_path).stdout
    assert _widest(wide) > 80 and _widest(wide) <= 160
    assert len(wide.split("\nFlows:")[0].splitlines()) < len(
        narrow.split("\nFlows:")[0].splitlines())
    forced = run("solve", "--width", "120", env={"COLUMNS": "60"}, cwd=tmp_path).stdout
    assert 80 < _widest(forced) <= 120
    to_file = tmp_path / "out.txt"
    run("solve", "-o", str(to_file), env={"COLUMNS": "200"}, cwd=tmp_path)
    assert _widest(to_file.read_text(encoding="utf-8")) <= 80  # a file: 80 unless --width
    bad = run("solve", "--width", "10", cwd=tmp_path)
    assert bad.returncode == 2 and "--width" in bad.stderr


def test_exit_statuses_are_documented_in_help_and_readme(capsys):
    for args in (["--help"], ["solve", "--help"], ["import", "--help"]):
        with pytest.raises(SystemExit) as done:
            main(args)
        assert done.value.code == 0
        assert " ".join(EXIT_STATUSES.split()) in " ".join(capsys.readouterr().out.split())
    readme = " ".join(README.read_text(encoding="utf-8").split())
    for status in ("0", "1", "2", "130"):
        assert re.search(rf"`{status}`", readme), status


def test_an_unexpected_fault_is_one_line_and_status_1(monkeypatch, capsys):
    import branchwise.core.site.solve as site_solve

    def broken(*args, **kwargs):
        raise RuntimeError("simulated fault")

    monkeypatch.setattr(site_solve, "solve_site", broken)
    assert main(["solve"]) == 1
    err = capsys.readouterr().err
    assert err == ("branchwise: internal error (RuntimeError: simulated fault); please report "
                   "it\n")


def test_import_writes_nothing_unless_the_whole_list_reads(tmp_path):
    good = tmp_path / "lines.csv"
    good.write_text("Name,Size,Length (m),Material\nA,3 in sch 40,10,commercial steel\n"
                    "B,2 in sch 40,12,commercial steel\n", encoding="utf-8")
    site = tmp_path / "site.toml"
    out = run("import", str(good), "-o", str(site), cwd=tmp_path)
    assert out.returncode == 0, out.stderr
    assert "2 branches (2 segments)" in out.stderr and site.exists()
    bad = tmp_path / "bad.csv"
    bad.write_text("Name,Size,Length (m),Material\nA,3 in sch 40,ten,commercial steel\n"
                   "B,2 in sch 99,12,commercial steel\n", encoding="utf-8")
    other = tmp_path / "other.toml"
    out = run("import", str(bad), "-o", str(other), cwd=tmp_path)
    assert out.returncode == 2 and not other.exists()
    lines = out.stderr.splitlines()
    assert lines[0].startswith("branchwise: bad.csv line 2, column 'Length (m)'")
    assert lines[1].startswith("branchwise: bad.csv line 3, column 'Size'")
    assert lines[-1] == "branchwise: bad.csv: 2 bad cells; nothing written"
    again = run("import", str(good), "-o", str(site), cwd=tmp_path)
    assert again.returncode == 2 and "already exists" in again.stderr


def test_import_with_a_template_solves_in_a_pipeline(tmp_path):
    (tmp_path / "demo.toml").write_text(demo_text(), encoding="utf-8")
    lines = ("Name,Size,Length (ft),Material,Valve Kv\n"
             "North,4 in sch 40,200,commercial steel,160\n"
             "South,3 in sch 40,150,commercial steel,110\n")
    site = run("import", "-", "--template", "demo.toml", stdin=lines, cwd=tmp_path)
    assert site.returncode == 0, site.stderr
    solved = run("solve", "-", "--format", "csv", stdin=site.stdout, cwd=tmp_path)
    assert solved.returncode == 0, solved.stderr
    rows = solved.stdout.splitlines()
    assert [r.split(",")[0] for r in rows[1:]] == ["North", "South"]


def test_a_reading_that_cannot_be_weighed_is_named_by_its_branch_on_the_command_line(tmp_path):
    from branchwise.core.site.read import demo_text

    text = demo_text().replace('# measured_flow = "80 gpm"', 'measured_flow = "0 gpm"').replace(
        'friction = "colebrook"', 'friction = "colebrook"\ntotal_flow = "600 gpm"\ngiven = "all"')
    (tmp_path / "s.toml").write_text(text, encoding="utf-8")
    done = run("solve", str(tmp_path / "s.toml"))
    assert done.returncode == 2
    assert 'branch "AHU-3 coil" measured_flow' in done.stderr and "no name" not in done.stderr


def test_a_site_on_standard_input_in_another_encoding_is_told_to_be_utf8(tmp_path):
    done = subprocess.run([sys.executable, "-m", "branchwise", "solve", "-"],
                          input='name = "café"\n'.encode("latin-1"), capture_output=True,
                          timeout=120)
    assert done.returncode == 2
    err = done.stderr.decode()
    assert "is not UTF-8 text" in err and "CSV" not in err  # a site, not a line list


def test_no_folder_is_made_on_the_way_to_an_output(tmp_path):
    """`-o` into a folder that is not there (a typo in it, say) is refused by the option, and
    nothing is made; the same for `import -o` and `demo`."""
    site = tmp_path / "s.toml"
    assert run("demo", str(site)).returncode == 0
    missing = tmp_path / "no-such-folder"
    for args in (("solve", str(site), "-o", str(missing / "r.csv")),
                 ("history", str(site), "-o", str(missing / "h.txt")),
                 ("demo", str(missing / "d.toml"))):
        done = run(*args)
        assert done.returncode == 2, args
        assert f"its folder {missing} does not exist" in done.stderr, args
    assert not missing.exists()


def test_the_demo_to_standard_output_and_an_unknown_suffix_said(tmp_path):
    done = run("demo", "-", cwd=tmp_path)
    assert done.returncode == 0 and done.stdout.startswith("# branchwise demo site")
    assert not (tmp_path / "-").exists()
    (tmp_path / "s.toml").write_text(done.stdout, encoding="utf-8")
    done = run("solve", "s.toml", "-o", "out.weird", cwd=tmp_path)
    assert done.returncode == 0 and "writing the text table" in done.stderr
    quiet = run("solve", "s.toml", "-o", "out.txt", cwd=tmp_path)
    assert "writing the text table" not in quiet.stderr


def test_a_large_site_beside_a_csv_gets_a_bounded_stderr(tmp_path):
    """300 branches, each with its bore and roughness assumed: at most 40 'assumed' lines and
    one that counts the rest (a 3,000-branch site wrote about 6,000 lines)."""
    lines = ['format = 1', 'name = "many"', '[fluid]', 'kind = "water"',
             'temperature = "20 degC"', '[conditions]', 'pressure_drop = "50 kPa"']
    for i in range(300):
        lines += ['[[branches]]', f'name = "B{i}"', 'size = "3 in sch 40"', 'length = "40 m"',
                  'material = "commercial-steel"']
    (tmp_path / "many.toml").write_text("\n".join(lines) + "\n", encoding="utf-8")
    done = run("solve", str(tmp_path / "many.toml"), "--format", "csv")
    assert done.returncode == 0
    assumed = [x for x in done.stderr.splitlines() if x.startswith("branchwise: assumed:")]
    assert len(assumed) == 41 and "more (every one is in the Markdown" in assumed[-1]
    assert len(done.stdout.splitlines()) == 301  # the header and every branch's row
