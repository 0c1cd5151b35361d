"""The computational cores of the studies: inputs (SI values by section) in, an
:class:`~workbook.studies.base.Outcome` (results, findings, curves, summary) out.

Each study module exposes ``KIND``, ``TITLE``, ``PURPOSE``, ``FIELDS`` (the inputs its panel
shows, as ``(section, key)`` pairs) and ``run(values) -> Outcome``. The panels in
:mod:`workbook.ui` and the command line's re-check call the same ``run``.
"""

from __future__ import annotations

import importlib

#: study kind -> module name inside this package
KINDS = {
    "restrictor-sizing": "sizing",
    "speed-vs-load": "speed",
    "rod-pressure": "rod_pressure",
    "counterbalance": "counterbalance",
    "axis-check": "axis_check",
    "axis-motion": "motion",
}


def module(kind: str):
    """The study module of ``kind``."""
    from ..errors import InputError

    if kind not in KINDS:
        raise InputError("study kind", repr(kind), "one of " + ", ".join(KINDS))
    return importlib.import_module(f"{__name__}.{KINDS[kind]}")


def run(kind: str, values):
    """Run the study ``kind`` on ``values`` ({section: {field: SI}})."""
    return module(kind).run(values)


__all__ = ["KINDS", "module", "run"]
