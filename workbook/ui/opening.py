"""Open a study on one axis of a design file.

The panel opens on the design file: it is the one the engineer edits by hand. Record files
live in a ``records/`` folder beside the design's folder:
``<notebooks>/records/<design-stem>-<axis>.json`` with its review copy ``.html`` beside it
(the environment variable ``WORKBOOK_RECORDS_DIR`` moves them, as the tests do). When the
axis record holds other values than the design file (the file was edited by hand since, or
the record came from a colleague), the panel says so at the top, lists the differences and
offers to load the record's values; nothing is applied silently. A record that cannot be
read is named in the same place, and Record is refused until it is repaired or moved away.
"""

from __future__ import annotations

import copy
import os
from pathlib import Path

from .. import studies
from ..design_edit import design_changes
from ..errors import InputError


def record_paths(design_path, axis: str, records_dir=None) -> tuple[Path, Path]:
    """``(record.json, record.html)`` of ``axis`` of the design at ``design_path``."""
    design_path = Path(design_path)
    records_dir = records_dir or os.environ.get("WORKBOOK_RECORDS_DIR") or None
    folder = Path(records_dir) if records_dir else design_path.resolve().parent.parent / "records"
    stem = f"{design_path.stem}-{axis}"
    return folder / f"{stem}.json", folder / f"{stem}.html"


def recorded_values(record_json: Path, kind: str):
    """``(values, problem)``: the values the axis record holds for study ``kind`` (the axis
    inputs and the study's own settings; the axis inputs alone when the study is not in it),
    or ``(None, message)`` when the record cannot be read, ``(None, "")`` when there is none."""
    from ..record import load

    if not record_json.exists():
        return None, ""
    try:
        rec = load(record_json)
    except InputError as exc:
        return None, str(exc)
    values = rec.study_values(kind) if kind in rec.studies else rec.values()
    return values, ""


def open_study(kind: str, design_path, axis: str, records_dir=None):
    """A :class:`~workbook.ui.panel.StudyPanel` of study ``kind`` on ``axis`` of a design file,
    showing the design file's values (and, where the axis record differs, a notice)."""
    from ..design import load_design
    from .panel import StudyPanel

    module = studies.module(kind)
    design = load_design(design_path)
    if axis not in design.axes:
        raise InputError("axis", repr(axis), "one of " + ", ".join(design.axes))
    spec = design.axes[axis]
    values = copy.deepcopy({k: dict(v) for k, v in spec.values.items()})
    record_json, record_html = record_paths(design_path, axis, records_dir)
    rec_values, problem = recorded_values(record_json, kind)
    if rec_values is not None and not design_changes(values, rec_values):
        rec_values = None  # the record agrees with the file: nothing to say
    panel = StudyPanel(module, values, identity=design.identity_for(axis), record_path=record_json,
                       export_path=record_html, design_values=values, design_path=design_path, axis_key=axis,
                       record_values=rec_values, record_problem=problem)
    panel.axis_title = getattr(spec, "title", axis)
    return panel


__all__ = ["open_study", "record_paths", "recorded_values"]
