"""The design record of an axis: data model, JSON exchange form, review exports and diff.

>>> from workbook.record import Record, Study, inputs_from_values, to_markdown
>>> s = Study("restrictor-sizing", "Lowering restrictor",
...           inputs=inputs_from_values({"cylinder": {"bore": 0.08}}))
>>> r = Record({"machine": "BT-2 bin tipper", "axis": "lift", "date": "2026-11-30"}).with_study(s)
>>> "Caution" in to_markdown(r)
True

Layer: generic data and files. Imports only the standard library, numpy, jsonschema and the
boundary modules (errors, units, fields, inputs); never the physics, checks or widgets.
"""

from .diff import InputChange, LevelChange, RecordDiff, ResultChange, diff
from .errors import RecordError
from .export import export_html, export_markdown, to_html, to_markdown
from .model import (
    FINDING_KEYS,
    LEVELS,
    SCHEMA_VERSION,
    SUPPORTED_SCHEMA_VERSIONS,
    Record,
    Study,
    finding_entry,
    inputs_from_values,
    values_from_inputs,
)
from .schema import record_schema
from .store import digest, load, loads, save, to_json
from .verdict import Verdict, VerdictItem, record_verdict, verdict

__all__ = [
    "Record", "Study", "inputs_from_values", "values_from_inputs", "finding_entry",
    "save", "load", "loads", "to_json", "digest", "record_schema",
    "to_markdown", "to_html", "export_html", "export_markdown",
    "diff", "RecordDiff", "InputChange", "ResultChange", "LevelChange",
    "Verdict", "VerdictItem", "verdict", "record_verdict",
    "RecordError", "SCHEMA_VERSION", "SUPPORTED_SCHEMA_VERSIONS", "LEVELS", "FINDING_KEYS",
]
