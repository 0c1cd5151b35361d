"""The JSON Schema of the design record (JSON Schema Draft 2020-12).

The shipped files ``schema/record-<version>.json`` describe the structure (version 2 is
written; version 1, where every study held every axis input, is still read and migrated). Its identity and inputs
parts are generic; :func:`record_schema` fills them in from the catalogue of
:mod:`workbook.inputs` (each field's own :meth:`~workbook.fields.Field.json_schema`), so
adding a field to the catalogue is all it takes for records to carry it.

>>> s = record_schema()
>>> s["$defs"]["inputs"]["properties"]["cylinder"]["properties"]["bore"]["required"]
['value', 'unit']
>>> first_problem({"schema_version": 2})
('', "'library_version' is a required property", 'library_version')
"""

from __future__ import annotations

import copy
import itertools
import json
from functools import lru_cache
from importlib import resources

from ..fields import Field
from ..inputs import IDENTITY, SECTIONS

#: schema version -> shipped schema file
SCHEMA_FILES = {1: "record-1.json", 2: "record-2.json"}
#: the file of the version this library writes
SCHEMA_FILE = SCHEMA_FILES[2]


#: schema problems looked at to choose the one to report (validation stops there)
MAX_PROBLEMS = 20


@lru_cache(maxsize=4)
def shipped_schema_text(version: int = 2) -> str:
    """Text of the shipped schema file of ``version`` (package data)."""
    return (resources.files("workbook.record") / "schema" / SCHEMA_FILES[version]).read_text(encoding="utf-8")


def _value_schema(f: Field) -> dict:
    return f.json_schema()


def _si_schema(f: Field) -> dict:
    if f.dimension == "quantity_list":
        base = {"type": "array", "items": {"type": "number"}, "minItems": 0 if f.optional else 1}
    else:
        base = {"type": "number"}
    return {"anyOf": [base, {"type": "null"}]} if f.optional else base


def field_entry_schema(f: Field) -> dict:
    """Schema of one stored input entry of field ``f``."""
    props: dict = {"value": _value_schema(f)}
    required = ["value"]
    if f.dimension not in ("text", "choice", "flag"):
        props["unit"] = {"type": "string"}
        props["si"] = _si_schema(f)
        if not f.optional:
            required.append("unit")
    return {"type": "object", "required": required, "additionalProperties": False, "properties": props,
            "description": f.label}


@lru_cache(maxsize=4)
def _record_schema(version: int = 2) -> dict:
    schema = json.loads(shipped_schema_text(version))
    defs = schema["$defs"]
    defs["identity"] = {
        "description": defs["identity"]["description"],
        "type": "object",
        "additionalProperties": False,
        "properties": {f.key: {"type": "string", "description": f.label} for f in IDENTITY.fields},
    }
    defs["inputs"] = {
        "description": defs["inputs"]["description"],
        "type": "object",
        "additionalProperties": False,
        "properties": {
            sec.key: {
                "type": "object",
                "title": sec.title,
                "additionalProperties": False,
                "properties": {f.key: field_entry_schema(f) for f in sec.fields},
            }
            for sec in SECTIONS
        },
    }
    return schema


def record_schema(version: int = 2) -> dict:
    """The full schema: the shipped file with identity and inputs from the catalogue (a copy)."""
    return copy.deepcopy(_record_schema(version))


@lru_cache(maxsize=4)
def validator(version: int = 2):
    """A :class:`jsonschema.Draft202012Validator` of :func:`record_schema` (built once)."""
    import jsonschema

    schema = _record_schema(version)
    jsonschema.Draft202012Validator.check_schema(schema)
    return jsonschema.Draft202012Validator(schema)


def first_problem(document) -> tuple[str, str, str] | None:
    """The most relevant schema violation of ``document`` as ``(path, message, part)``, or None.

    ``path`` is dotted (a study is named by its key where it has one); ``part`` is the name of
    a missing required part, else the last element of the path.
    """
    import jsonschema

    version = document.get("schema_version") if isinstance(document, dict) else None
    version = version if version in SCHEMA_FILES and not isinstance(version, bool) else max(SCHEMA_FILES)
    # the first few problems only: a damaged record with millions of bad parts must not
    # collect them all (time and memory) before the most relevant one is named
    errors = list(itertools.islice(validator(version).iter_errors(document), MAX_PROBLEMS))
    if not errors:
        return None
    err = jsonschema.exceptions.best_match(errors)
    names = []
    node = document
    for step in err.absolute_path:
        if isinstance(step, int) and isinstance(node, list) and names and names[-1] == "studies":
            item = node[step] if step < len(node) else None
            key = item.get("key") if isinstance(item, dict) else None
            names.append(str(key) if isinstance(key, str) and key else f"[{step}]")
        else:
            names.append(f"[{step}]" if isinstance(step, int) else str(step))
        try:
            node = node[step]
        except (KeyError, IndexError, TypeError):
            node = None
    path = ".".join(names).replace(".[", "[")
    part = names[-1] if names else ""
    if err.validator == "required" and isinstance(err.instance, dict):
        missing = [k for k in err.validator_value if k not in err.instance]
        if missing:
            part = missing[0]
    message = err.message
    if len(message) > 200:
        message = message[:197] + "..."
    return path, message, part


__all__ = ["record_schema", "shipped_schema_text", "validator", "first_problem", "field_entry_schema", "SCHEMA_FILE",
           "SCHEMA_FILES"]
