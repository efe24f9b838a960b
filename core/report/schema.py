"""The JSON report's published schema (``result.schema.json`` beside this module, JSON Schema
2020-12), shipped with the package and read through ``importlib.resources``.

The schema is open: keys are added, never renamed or removed (see
:mod:`.json_report`), so a reader ignores keys it does not know. Whoever adds a key to the
JSON describes it in the schema file under the object it belongs to; the tests validate every
output against the schema and check that it describes every key.
"""

from __future__ import annotations

import json
from functools import cache
from typing import Any

SCHEMA_FILE = "result.schema.json"
SCHEMA_VERSION = "1.4"
"""``schema_version`` of the JSON: major 1 for as long as keys are only added; the minor
number rises with each key added."""


@cache
def _text() -> str:
    from importlib.resources import files

    return files("branchwise.core.report").joinpath(SCHEMA_FILE).read_text(encoding="utf-8")


def result_schema() -> dict[str, Any]:
    """The JSON Schema of :func:`~.json_report.to_json`'s output (a fresh copy)."""
    schema: dict[str, Any] = json.loads(_text())
    return schema


def history_schema() -> dict[str, Any]:
    """The JSON Schema of ``branchwise history --format json``: ``$defs/history_document`` of
    the one schema file, so that the two documents can never describe a visit differently."""
    schema = result_schema()
    return {"$schema": schema["$schema"], "$id": "urn:branchwise:history",
            "title": "branchwise history",
            "description": "The JSON of 'branchwise history' (SI); keys are only ever added.",
            "$ref": "#/$defs/history_document", "$defs": schema["$defs"]}
