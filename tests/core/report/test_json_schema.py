"""The JSON report against its published schema (core/report/result.schema.json), checked with
the general-purpose ``jsonschema`` validator (Draft 2020-12): every find, every given, with and
without the uncertainty band."""

from __future__ import annotations

import copy
import json
from dataclasses import replace

import pytest
from jsonschema import Draft202012Validator

from branchwise.core.errors import NoSolutionError
from branchwise.core.report.json_report import to_json
from branchwise.core.report.schema import SCHEMA_VERSION, result_schema
from branchwise.core.site.read import demo_site
from branchwise.core.site.solve import solve_site, with_uncertainty
from branchwise.core.site.spec import SolveSpec
from branchwise.tui.cli import main

GIVENS = {
    "pressure_drop": lambda s: s,
    "total_flow": lambda s: replace(s, conditions=replace(
        s.conditions, total_flow="600 gpm", given="total_flow")),
    "measured_flow": lambda s: _measured(s),
    "all": lambda s: replace(_measured(s), conditions=replace(
        s.conditions, total_flow="600 gpm", given="all")),
}
FINDS = {
    "flows": None,
    "diameter": SolveSpec(find="diameter", branch="AHU-2 coil", target_flow="220 gpm"),
    "length": SolveSpec(find="length", branch="AHU-2 coil", target_flow="150 gpm"),
    "roughness": SolveSpec(find="roughness", branch="AHU-2 coil", target_flow="160 gpm"),
}


def _measured(site):
    branches = list(site.branches)
    branches[2] = replace(branches[2], measured_flow="80 gpm")
    return replace(site, branches=branches,
                   conditions=replace(site.conditions, given="AHU-3 coil"))


@pytest.fixture(scope="module")
def validator():
    schema = result_schema()
    Draft202012Validator.check_schema(schema)  # the schema itself is a valid 2020-12 schema
    return Draft202012Validator(schema)


def _doc(given: str, find: str, banded: bool) -> dict:
    site = GIVENS[given](demo_site())
    if FINDS[find] is not None:
        site = replace(site, solve=copy.deepcopy(FINDS[find]))
    solved = solve_site(site)
    if banded:
        solved = with_uncertainty(solved, 200, 0)
    return json.loads(to_json(solved))


@pytest.mark.parametrize("banded", [False, True], ids=["plain", "uncertainty"])
@pytest.mark.parametrize("find", list(FINDS))
@pytest.mark.parametrize("given", list(GIVENS))
def test_every_output_validates(validator, given, find, banded):
    try:
        doc = _doc(given, find, banded)
    except NoSolutionError as exc:  # a combination without an answer has no JSON to check
        pytest.skip(f"no answer: {exc}")
    errors = sorted(validator.iter_errors(doc), key=lambda e: list(e.path))
    assert not errors, [f"{list(e.path)}: {e.message}" for e in errors[:5]]
    assert doc["schema_version"] == SCHEMA_VERSION
    assert (doc["solved"] is None) == (find == "flows")
    assert (doc["uncertainty"] is None) == (not banded)
    assert doc["given"]["quantity"] == given


def _described(schema: dict, node: dict, doc: object, path: str, out: list[str]) -> None:
    """Every key of ``doc`` is named in the schema ``node`` (following $ref and allOf)."""
    while "$ref" in node:
        node = schema["$defs"][node["$ref"].split("/")[-1]]
    if "oneOf" in node:
        for option in node["oneOf"]:
            if option.get("type") != "null" and doc is not None:
                _described(schema, option, doc, path, out)
        return
    if isinstance(doc, dict):
        props: dict = {}
        for part in [node, *node.get("allOf", [])]:
            while "$ref" in part:
                part = schema["$defs"][part["$ref"].split("/")[-1]]
            props |= part.get("properties", {})
        for key, value in doc.items():
            if key in props:
                _described(schema, props[key], value, f"{path}.{key}", out)
            elif "additionalProperties" in node:
                _described(schema, node["additionalProperties"], value, f"{path}.{key}", out)
            else:
                out.append(f"{path}.{key}")
    elif isinstance(doc, list) and "items" in node:
        for item in doc[:3]:
            _described(schema, node["items"], item, f"{path}[]", out)


@pytest.mark.parametrize(("given", "find"), [("pressure_drop", "diameter"),
                                             ("measured_flow", "flows")])
def test_the_schema_describes_every_key(given, find):
    """The schema is open (keys are only added), so validation alone would let a new key pass
    unnamed: a key added to the JSON must be described in result.schema.json too."""
    schema = result_schema()
    doc = _doc(given, find, True)
    missing: list[str] = []
    _described(schema, schema, doc, "$", missing)
    assert not missing, f"describe these keys in core/report/result.schema.json: {missing}"


def test_the_command_line_json_validates(validator, capsys):
    assert main(["solve", "--format", "json", "--units", "us", "--uncertainty",
                 "--samples", "100"]) == 0
    doc = json.loads(capsys.readouterr().out)
    assert not list(validator.iter_errors(doc))
