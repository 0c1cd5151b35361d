"""Every study of one axis on one set of inputs: the one evaluation path.

A study panel, the command line's ``evaluate`` and the design record all call
:func:`evaluate`: it runs each study that applies to the axis on the same values
(``{section: {field: SI}}``), and gives

* the outcomes by study kind (in :data:`DEFAULT_STUDIES` order),
* the studies left out and why (the counterbalance study on an axis without a holding
  valve), and the studies that refused these inputs (with the error),
* :meth:`AxisEvaluation.verdict`, the whole axis's verdict
  (:func:`workbook.record.verdict.verdict`: every fail and caution once), and
* :meth:`AxisEvaluation.to_record`, the axis record: the axis inputs once and every study.

Because all of them come from one call on one set of values, the panel's verdict, the
record, its review copy and ``axisbook evaluate`` report the same findings.

>>> from workbook import inputs
>>> values = {s.key: s.defaults() for s in inputs.AXIS_SECTIONS}
>>> values["holding"]["kind"] = "none"
>>> ev = evaluate(values)
>>> list(ev.outcomes)[:2], ev.skipped
(['axis-check', 'restrictor-sizing'], {'counterbalance': 'holding.kind is none (the axis has no load-holding valve)'})
>>> rec = ev.to_record({"machine": "demo", "axis": "lift"})
>>> sorted(rec.studies) == sorted(ev.outcomes) and rec.inputs["cylinder"]["bore"]["unit"]
'mm'
"""

from __future__ import annotations

import copy
from dataclasses import dataclass, field
from typing import Iterable, Mapping, Sequence

from ..errors import InputError
from ..record import Record, verdict
from . import KINDS, module

#: the studies of an axis, in record order (the axis check first: its words lead the verdict)
DEFAULT_STUDIES = ("axis-check", "restrictor-sizing", "speed-vs-load", "rod-pressure", "counterbalance")
#: studies run only when asked for (``axisbook evaluate --study axis-motion``): the motion
#: study simulates in time, 1 to 20 s an axis on the demo (a hunting lowering is slow to
#: integrate), too slow for every panel update and every evaluation of the test suite
ON_REQUEST = ("axis-motion",)


def not_applicable(kind: str, values) -> str | None:
    """Why the study ``kind`` does not apply to an axis with ``values``, or None when it does.

    >>> not_applicable("counterbalance", {"holding": {"kind": "none"}})
    'holding.kind is none (the axis has no load-holding valve)'
    >>> not_applicable("axis-check", {"holding": {"kind": "none"}}) is None
    True
    """
    if kind == "counterbalance" and values.get("holding", {}).get("kind") == "none":
        return "holding.kind is none (the axis has no load-holding valve)"
    return None


@dataclass
class AxisEvaluation:
    """The studies of one axis run on one set of values."""

    values: Mapping
    outcomes: dict = field(default_factory=dict)     # kind -> Outcome
    skipped: dict = field(default_factory=dict)      # kind -> why it does not apply
    refused: dict = field(default_factory=dict)      # kind -> InputError

    @property
    def complete(self) -> bool:
        """True when every applicable study ran."""
        return not self.refused

    def verdict(self):
        """The whole axis's verdict (:class:`~workbook.record.verdict.Verdict`)."""
        incomplete = [(kind, str(exc)) for kind, exc in self.refused.items()]
        return verdict({kind: o.findings for kind, o in self.outcomes.items()}, incomplete)

    def to_record(self, identity: Mapping, notes: Iterable[str] = (),
                  study_notes: Mapping[str, Sequence[str]] | None = None) -> Record:
        """The axis record: the inputs once, every study that ran, the record's notes (then a
        note for each study left out). Refused when a study refused the inputs."""
        if self.refused:
            kind, exc = next(iter(self.refused.items()))
            raise InputError(exc.field, exc.given, f"{exc.allowed} (the {kind} study refuses these inputs, so "
                                                   "the axis cannot be recorded)")
        study_notes = study_notes or {}
        record = Record(identity)
        for note in notes:
            record = record.with_note(note)
        for kind, outcome in self.outcomes.items():
            record = record.with_study(outcome.to_study(notes=study_notes.get(kind, ())), key=kind)
        for kind, why in self.skipped.items():
            record = record.with_note(f"{kind} study left out: {why}")
        return record


def evaluate(values, kinds: Sequence[str] = DEFAULT_STUDIES, *, raise_refusal: bool = False) -> AxisEvaluation:
    """Run every study of ``kinds`` that applies to the axis on one deep copy of ``values``.

    A study that refuses the inputs is kept in ``refused`` (or re-raised with
    ``raise_refusal=True``, as the command line wants it), so the other studies still answer.
    """
    for kind in kinds:
        if kind not in KINDS:
            raise InputError("study kind", repr(kind), "one of " + ", ".join(KINDS))
    frozen = copy.deepcopy({k: dict(v) for k, v in values.items()})
    ev = AxisEvaluation(frozen)
    for kind in kinds:
        why = not_applicable(kind, frozen)
        if why is not None:
            ev.skipped[kind] = why
            continue
        try:
            ev.outcomes[kind] = module(kind).run(copy.deepcopy(frozen))
        except InputError as exc:
            if raise_refusal:
                raise
            ev.refused[kind] = exc
    return ev


__all__ = ["evaluate", "AxisEvaluation", "DEFAULT_STUDIES", "ON_REQUEST", "not_applicable"]
