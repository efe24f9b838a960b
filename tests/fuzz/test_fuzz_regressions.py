"""Site files the fuzz tests found that ended in a traceback, kept as plain regression tests:
each must now be an InputError naming the file and line (or the field).

Robustness, no outside reference. Limits of Python itself are the cause: the recursion limit
(about 1000 frames) and the 4300-digit limit on turning text into an int (CPython 3.11+,
``sys.get_int_max_str_digits``). Unit-text regressions are in test_fuzz_units.py.
"""

from __future__ import annotations

import tempfile
import warnings
from pathlib import Path
from typing import Any

import pytest
from fuzz_support import time_limit

from branchwise.core.catalogs import fittings_k, material, parse_size
from branchwise.core.errors import InputError
from branchwise.core.fluids import fluid_from_spec
from branchwise.core.site.build import build
from branchwise.core.site.read import load_site, parse_site
from branchwise.core.site.solve import solve_site
from branchwise.core.storage.toml_files import MAX_DEPTH, migrate

HANG_SECONDS = 60.0
"""A guard against a hang only (a loaded machine may be slow; the proofs are on the work)."""

HEAD = 'format = 1\nname = "x"\n[fluid]\nkind = "water"\ntemperature = "20 degC"\n'

DEEP_FILES = {
    "arrays past the recursion limit": HEAD + "notes = " + "[" * 5000 + "]" * 5000 + "\n",
    "inline tables past the recursion limit":
        HEAD + "notes = " + "{ a = " * 3000 + "1" + " }" * 3000 + "\n",
    "arrays a little too deep": HEAD + "notes = " + "[" * 40 + "1" + "]" * 40 + "\n",
}


@pytest.mark.parametrize("text", DEEP_FILES.values(), ids=DEEP_FILES)
def test_deeply_nested_file_names_the_line(tmp_path: Path, text: str) -> None:
    path = tmp_path / "site.toml"
    path.write_text(text, encoding="utf-8")
    with pytest.raises(InputError, match=f"nested more than {MAX_DEPTH} levels") as caught:
        load_site(path)
    assert caught.value.field == "site.toml line 6", caught.value.field
    assert path.read_text(encoding="utf-8") == text


def test_dotted_keys_thousands_deep_are_refused_before_copying(tmp_path: Path) -> None:
    # Found as a RecursionError in the deep copy that brings a document to the current format.
    text = HEAD + "a." * 3000 + "b = 1\n"
    path = tmp_path / "site.toml"
    path.write_text(text, encoding="utf-8")
    with pytest.raises(InputError, match="nested more than") as caught:
        load_site(path)
    assert caught.value.field == "site.toml line 6"
    # Deep only when a table header and a dotted key add up: no one line to point at.
    path.write_text(HEAD + "[" + "a." * 15 + "b]\n" + "c." * 10 + "d = 1\n", encoding="utf-8")
    with pytest.raises(InputError, match="nested more than") as caught:
        load_site(path)
    assert caught.value.field == "site.toml"
    assert caught.value.value.startswith("a.a.a")  # the path to the deep point
    # The same document parsed elsewhere is refused by migrate, before its deep copy.
    doc: dict = {"b": 1}
    for _ in range(3000):
        doc = {"a": doc}
    with pytest.raises(InputError, match="nested more than"):
        migrate(doc, "site", "site.toml")


@pytest.mark.parametrize("line", ["a." * 20_000 + "b = 1", "[" + "a." * 20_000 + "b]",
                                  '[["x". "y". ' + '"z".' * 20_000 + '"w"]]'])
def test_long_dotted_key_is_refused_before_parsing(tmp_path: Path, line: str,
                                                   monkeypatch: pytest.MonkeyPatch) -> None:
    # Found: Python's TOML parser takes time as the square of a dotted key's parts (2.8 s for
    # 8000 parts on the test machine); 20 000 parts would take about 20 s. The proof that the
    # work stays small is that the parser is never called (the clock would measure the
    # machine); the time limit only guards against a hang.
    import tomllib

    calls: list[int] = []
    real = tomllib.loads

    def counted(text: str, **options: Any) -> dict[str, Any]:
        calls.append(len(text))
        return real(text, **options)

    monkeypatch.setattr(tomllib, "loads", counted)
    path = tmp_path / "site.toml"
    path.write_text(HEAD + line + "\n", encoding="utf-8")
    with time_limit("dotted key", HANG_SECONDS), \
            pytest.raises(InputError, match="nested more than") as caught:
        load_site(path)
    assert calls == []  # refused before the parser saw it
    assert caught.value.field == "site.toml line 6"


def test_number_longer_than_python_reads_names_the_line(tmp_path: Path) -> None:
    path = tmp_path / "site.toml"
    path.write_text(HEAD + "[conditions]\npressure_drop = " + "9" * 5000 + "\n", encoding="utf-8")
    with pytest.raises(InputError, match="a number longer than 4300 digits") as caught:
        load_site(path)
    assert caught.value.field == "site.toml line 7"


def test_a_site_nested_as_deep_as_the_format_allows_still_loads(tmp_path: Path) -> None:
    # The depth limit must not refuse a real file: segments with fittings are the deepest.
    text = HEAD + ('[conditions]\npressure_drop = "10 kPa"\n[[branches]]\nname = "A"\n'
                   'segments = [{ diameter = "50 mm", length = "10 m", roughness = "0.05 mm",'
                   ' fittings = { elbow-90 = 2 } }]\n')
    path = tmp_path / "site.toml"
    path.write_text(text, encoding="utf-8")
    assert load_site(path).branches[0].segments[0].fittings == {"elbow-90": 2}


@pytest.mark.parametrize(("line", "field"), [('format = "\\n"', "format"),
                                            ('kind = "\\r\\nsettings"', "kind")])
def test_format_and_kind_errors_stay_on_one_line(tmp_path: Path, line: str, field: str) -> None:
    # Found with format = "\n": the message carried the newline itself.
    path = tmp_path / "site.toml"
    path.write_text(line + "\n" + HEAD.replace("format = 1\n", ""), encoding="utf-8")
    with pytest.raises(InputError) as caught:
        load_site(path)
    assert caught.value.field == f"site.toml {field}"
    assert "\n" not in str(caught.value) and "\r" not in str(caught.value), str(caught.value)


ODD_SIZES = ["2-1/0 in sch 40", "1/0 in sch 40", "nps " + "9" * 5000 + " sch 40",
             "DN" + "9" * 5000 + " sch 40", "9" * 5000 + " mm SDR 11", "3 in\nsch 41",
             "3 in sch 40 \n pvc copper"]


@pytest.mark.parametrize("text", ODD_SIZES, ids=range(len(ODD_SIZES)))
def test_odd_pipe_size_text_is_one_line_naming_the_field(text: str) -> None:
    # Found: "2-1/0 in sch 40" raised ZeroDivisionError, 5000 digits a ValueError.
    with pytest.raises(InputError) as caught:
        parse_size(text, "branches[1].size")
    assert caught.value.field == "branches[1].size"
    assert "\n" not in str(caught.value) and len(str(caught.value)) < 400


def test_catalog_and_fluid_errors_show_text_on_one_line() -> None:
    # Found: a key or name holding a newline was shown as typed, splitting the message.
    for call in (lambda: fittings_k({"elbow\n91": 1}, 0.05, "fittings"),
                 lambda: material("steel\nold", "material"),
                 lambda: fluid_from_spec("water", temperature_k=293.15, name="a\nb"),
                 lambda: fluid_from_spec("sea\nwater", temperature_k=293.15)):
        with pytest.raises(InputError) as caught:
            call()
        assert "\n" not in str(caught.value), str(caught.value)


# ---- left for the owner of core/sitebuild.py -----------------------------------------------
# These errors show the value as typed; text with a line break splits the message (the CLI
# joins the lines, the app would show two). Suggested fix: pass describe(value) as at the
# other raises there, or have InputError itself show its value on one line (core/errors.py).

BASE = ('[fluid]\nkind = "water"\ntemperature = "20 degC"\n[conditions]\npressure_drop = "1 kPa"\n'
        '[[branches]]\nname = "A"\ndiameter = "50 mm"\nlength = "10 m"\nroughness = "0.05 mm"\n')


def _raw_value_site(case: str) -> str:
    if case == "unknown fluid kind":
        return BASE.replace('kind = "water"', 'kind = "0\\n0"')
    if case == "pipe condition":
        return BASE.replace('roughness = "0.05 mm"', 'material = "pvc"\ncondition = "new\\nx"')
    if case == "solve.find":
        return BASE + '[solve]\nfind = "x\\ny"\n'
    if case == "friction":
        return BASE.replace('pressure_drop = "1 kPa"\n',
                            'pressure_drop = "1 kPa"\nfriction = "x\\ny"\n')
    return BASE + '[[branches]]\nname = "A\\nB"\ndiameter = "50 mm"\nlength = "1 m"\n' \
        'roughness = "0.05 mm"\n' + '[[branches]]\nname = "a\\nb"\ndiameter = "50 mm"\n' \
        'length = "1 m"\nroughness = "0.05 mm"\n'


@pytest.mark.parametrize(("case", "field"), [
    ("unknown fluid kind", "fluid.kind"), ("pipe condition", "branches[0].condition"),
    ("solve.find", "solve.find"), ("friction", "conditions.friction"),
    ("duplicate branch name", "branches[2].name")])
def test_sitebuild_errors_stay_on_one_line(case: str, field: str) -> None:
    with tempfile.TemporaryDirectory() as folder, pytest.MonkeyPatch.context() as mp:
        mp.setenv("BRANCHWISE_DATA_DIR", folder)  # no user fluid presets
        with pytest.raises(InputError) as caught:
            build(parse_site(_raw_value_site(case)))
    assert caught.value.field == field, str(caught.value)
    assert "\n" not in str(caught.value), str(caught.value)


@pytest.mark.parametrize(("line", "field"), [
    ("minor_k = " + "9" * 400, "branches[0].minor_k"),
    ("valve_kv = " + "9" * 400, "branches[0].valve_kv"),
    ("fittings = { elbow-90 = " + "9" * 400 + " }", "branches[0].fittings.elbow-90")])
def test_plain_number_beyond_the_float_range_names_the_field(line: str, field: str) -> None:
    # Found by the large profile: TOML integers have no size limit; float() overflows past
    # about 1.8e308. Suggested fix: catch OverflowError in plain_number, as parse_quantity does.
    with pytest.raises(InputError) as caught:
        build(parse_site(BASE + line + "\n"))
    assert caught.value.field == field


def test_empty_key_is_named() -> None:
    # Found by the large profile: '""=""' gave ': unknown key; ..., got ' with no field at all.
    with pytest.raises(InputError) as caught:
        parse_site('"" = ""\n')
    assert caught.value.field.strip(), str(caught.value)


# ---- numbers at the edge of the float range: refused (model bounds) or solved without numpy
# RuntimeWarnings, which `branchwise solve` would otherwise print under a good answer.

EDGE_OF_FLOAT = {
    "Kv of 1e-200 (kv squared underflows to 0)": 'valve_kv = 1e-200\n',
    "measured flow of 1e-320 L/s (64/Re overflows)": 'measured_flow = "1e-320 L/s"\n',
}


@pytest.mark.parametrize("line", EDGE_OF_FLOAT.values(), ids=EDGE_OF_FLOAT)
def test_solve_at_the_edge_of_the_float_range_warns_nothing(line: str) -> None:
    text = BASE + line + ('[[branches]]\nname = "B"\ndiameter = "80 mm"\nlength = "20 m"\n'
                          'roughness = "0.05 mm"\n')
    if "measured_flow" in line:
        text = text.replace('pressure_drop = "1 kPa"\n', "")
    with warnings.catch_warnings():
        warnings.simplefilter("error", RuntimeWarning)
        try:
            solve_site(parse_site(text))
        except InputError:
            pass  # refusing the value is a fine answer too


# ---- parse_site (the app's path for text it already holds) reads through parse_toml -------


def test_parse_site_deeply_nested_text_names_the_line() -> None:
    with pytest.raises(InputError, match="nested more than"):
        parse_site(DEEP_FILES["arrays past the recursion limit"], "site.toml")


def test_parse_site_overlong_number_names_the_line() -> None:
    with pytest.raises(InputError, match="a number longer than"):
        parse_site(HEAD + "[conditions]\npressure_drop = " + "9" * 5000 + "\n", "site.toml")
