"""Open a study on one axis of a design file, where it was left last time.

Record files live in a ``records/`` folder beside the design's folder:
``<notebooks>/records/<design-stem>-<axis>.json`` with its review copy ``.html`` beside it
(the environment variable ``WORKBOOK_RECORDS_DIR`` moves them, as the tests do).
When the record holds this study, the panel reopens with the recorded inputs.
"""

from __future__ import annotations

import copy
import os
from pathlib import Path

from .. import studies
from ..errors import InputError


def record_paths(design_path, axis: str, records_dir=None) -> tuple[Path, Path]:
    """``(record.json, record.html)`` of ``axis`` of the design at ``design_path``."""
    design_path = Path(design_path)
    records_dir = records_dir or os.environ.get("WORKBOOK_RECORDS_DIR") or None
    folder = Path(records_dir) if records_dir else design_path.resolve().parent.parent / "records"
    stem = f"{design_path.stem}-{axis}"
    return folder / f"{stem}.json", folder / f"{stem}.html"


def open_study(kind: str, design_path, axis: str, records_dir=None, reopen: bool = True):
    """A :class:`~workbook.ui.panel.StudyPanel` of study ``kind`` on ``axis`` of a design file."""
    from ..design import load_design
    from ..record import load
    from .panel import StudyPanel

    module = studies.module(kind)
    design = load_design(design_path)
    if axis not in design.axes:
        raise InputError("axis", repr(axis), "one of " + ", ".join(design.axes))
    spec = design.axes[axis]
    values = copy.deepcopy({k: dict(v) for k, v in spec.values.items()})
    record_json, record_html = record_paths(design_path, axis, records_dir)
    reopened = False
    if reopen and record_json.exists():
        rec = load(record_json)
        if kind in rec.studies:
            for section, fields in rec.studies[kind].values().items():
                values.setdefault(section, {}).update(fields)
            reopened = True
    panel = StudyPanel(module, values, identity=design.identity_for(axis),
                       record_path=record_json, export_path=record_html)
    panel.reopened = reopened
    panel.axis_title = getattr(spec, "title", axis)
    return panel


__all__ = ["open_study", "record_paths"]
