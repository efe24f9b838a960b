"""Damaged and random site files: reading, building and solving either work or say which field
is wrong — never a traceback, never a hang, never a change to the file.

Robustness, no outside reference: the property is the promise of the house style ("a traceback
reaching a user is a bug"; "a file that fails to load is reported ... and left untouched").
Seeds and mutations are in ``site_mutations.py``; the case counts print at the end of the run.
Run the large profile with ``pytest tests/fuzz --hypothesis-profile=large``.
"""

from __future__ import annotations

import contextlib
import io
import re
import tempfile
import warnings
from collections.abc import Callable, Iterator
from pathlib import Path

import pytest
from fuzz_support import STATS, time_limit
from hypothesis import HealthCheck, given, settings
from hypothesis import strategies as st
from site_mutations import JUNK, SEEDS, VALUE_DAMAGE, mutated_site

from branchwise.core.errors import BranchwiseError, InputError, NoSolutionError
from branchwise.core.site.read import load_site, parse_site
from branchwise.core.site.solve import solve_site
from branchwise.core.site.spec import TOP_KEYS
from branchwise.tui.cli import main

NAME = "site.toml"


def at_least(cases: int, **kwargs: object) -> settings:
    """Settings for ``cases`` examples or the profile's count if larger (the ci profile's 60
    is few for files; ``--hypothesis-profile=large`` keeps its own)."""
    return settings(max_examples=max(cases, settings.default.max_examples), **kwargs)


_ROOMY = [HealthCheck.too_slow, HealthCheck.data_too_large, HealthCheck.large_base_example]
_FIELD_ROOT = re.compile(r"[.\[ ]")


@pytest.fixture(scope="module", autouse=True)
def private_data_dir() -> Iterator[None]:
    """A fluid kind that is not built in is looked up in the user's presets: keep those empty."""
    with tempfile.TemporaryDirectory() as folder, pytest.MonkeyPatch.context() as mp:
        mp.setenv("BRANCHWISE_DATA_DIR", folder)
        yield


@pytest.fixture(scope="module")
def folder() -> Iterator[Path]:
    """One folder for every case of a test (hypothesis reruns the body, not the fixture)."""
    with tempfile.TemporaryDirectory() as name:
        yield Path(name)


def _fresh(folder: Path, data: bytes) -> Path:
    for leftover in folder.iterdir():
        leftover.unlink()
    path = folder / NAME
    path.write_bytes(data)
    return path


def check_names_a_field(exc: BranchwiseError) -> None:
    """The error points at a field of the file (or at the file and line) in one printable
    line."""
    field = getattr(exc, "field", "")
    assert field, f"{type(exc).__name__} without a field: {exc}"
    known = field == NAME or field.startswith(f"{NAME} ") or _FIELD_ROOT.split(field)[0] in TOP_KEYS
    assert known or getattr(exc, "reason", "").startswith("unknown key"), str(exc)
    assert str(exc).isprintable(), repr(str(exc))
    if isinstance(exc, InputError):
        assert str(exc).startswith(f"{field}: "), str(exc)


def outcome(run: Callable[[], object]) -> tuple[str, BranchwiseError | None]:
    """Run ``run()``: ("ok", None), or ("input" / "no-solution", the error) after checking
    that the error names a field."""
    try:
        run()
    except InputError as exc:
        check_names_a_field(exc)
        return "input", exc
    except NoSolutionError as exc:
        check_names_a_field(exc)
        return "no-solution", exc
    return "ok", None


def load_build_solve(folder: Path, data: bytes, label: str = "site-seeds") -> str:
    """The file read from disk, and its text read from memory, built and solved; ``label``
    counts the outcome in the summary."""
    path = _fresh(folder, data)
    with time_limit(label):
        result, _ = outcome(lambda: solve_site(load_site(path)))
        try:
            text = data.decode("utf-8")
        except UnicodeDecodeError:
            text = None
        # The app reads text it already holds through parse_site: the same outcome.
        if text is not None and not text.startswith("\ufeff"):  # load_site skips a BOM
            from_text, _ = outcome(lambda: solve_site(parse_site(text, path)))
            assert from_text == result, (result, from_text)
    assert path.read_bytes() == data, "the site file was changed"
    assert [p.name for p in folder.iterdir()] == [NAME], "a file was written beside the site"
    STATS[f"{label} {result}"] += 1
    return result


@pytest.mark.parametrize("seed", sorted(SEEDS))
def test_every_seed_solves(folder: Path, seed: str) -> None:
    # The mutations start from valid files; a seed that stopped solving would fuzz nothing.
    assert load_build_solve(folder, SEEDS[seed].encode("utf-8")) == "ok"


@at_least(150, suppress_health_check=_ROOMY)
@given(data=mutated_site())
def test_mutated_site_loads_or_names_a_field(folder: Path, data: bytes) -> None:
    load_build_solve(folder, data, "site-damaged")


@at_least(150, suppress_health_check=_ROOMY)
@given(data=mutated_site(max_mutations=3, ops=VALUE_DAMAGE))
def test_site_with_changed_values_builds_solves_or_names_a_field(
    folder: Path, data: bytes
) -> None:
    load_build_solve(folder, data, "site-values")


@given(data=JUNK)
def test_random_bytes_load_or_name_a_field(folder: Path, data: bytes) -> None:
    load_build_solve(folder, data, "site-junk")


def cli_solve(folder: Path, data: bytes, fmt: str, units: str) -> int:
    """``branchwise solve`` in-process: exit 0 with output, or 2 with one line on stderr."""
    path = _fresh(folder, data)
    out, err = io.StringIO(), io.StringIO()
    with (time_limit("cli"), contextlib.redirect_stdout(out), contextlib.redirect_stderr(err),
          warnings.catch_warnings(record=True) as warned):
        warnings.simplefilter("always")
        code = main(["solve", str(path), "--format", fmt, "--units", units])
    assert code in (0, 2), code
    # Python prints a warning to the terminal, under the answer or the one-line error.
    assert not warned, [f"{w.filename}:{w.lineno}: {w.message}" for w in warned]
    if code == 0:
        # only CSV, which is data alone, says its warnings and cautions on standard error
        said = [line for line in err.getvalue().splitlines()
                if not (fmt == "csv" and line.startswith(("branchwise: caution: ",
                                                          "branchwise: warning: ",
                                                          "branchwise: assumed: ")))]
        assert out.getvalue().strip() and not said, err.getvalue()
    else:
        message = err.getvalue()
        assert out.getvalue() == ""
        assert message.startswith(f"branchwise: {path}: "), message
        assert message.count("\n") == 1 and message.endswith("\n"), repr(message)
        assert "Traceback" not in message
    assert path.read_bytes() == data, "the site file was changed"
    assert [p.name for p in folder.iterdir()] == [NAME], "a file was written beside the site"
    STATS[f"cli exit-{code}"] += 1
    return code


FORMATS = st.sampled_from(["table", "json", "csv", "markdown", "html"])
UNITS = st.sampled_from(["si", "us"])


@at_least(100, suppress_health_check=_ROOMY)
@given(data=st.one_of(mutated_site(), mutated_site(3, VALUE_DAMAGE), JUNK), fmt=FORMATS,
       units=UNITS)
def test_cli_solve_of_a_damaged_file_exits_0_or_2_with_one_line(
    folder: Path, data: bytes, fmt: str, units: str
) -> None:
    cli_solve(folder, data, fmt, units)


@pytest.mark.parametrize("seed", sorted(SEEDS))
def test_cli_solves_every_seed(folder: Path, seed: str) -> None:
    assert cli_solve(folder, SEEDS[seed].encode("utf-8"), "table", "si") == 0
