"""What moved between two records of an axis.

:func:`diff` lists identity entries that changed, studies added or removed, and within the
studies both records hold: inputs that changed (the axis inputs, held once per record, and
each study's own settings) (old and new with their units), results that
moved (with the relative change), findings whose level changed (or that appeared or went),
figures whose curve data changed and notes added or removed. The library versions are
reported but do not by themselves make a diff non-empty: a new library that moves nothing
gives an empty diff.

Inputs are compared by their SI value where the entry has one; findings are matched by
rule id and quantity (and by order among equals).

>>> from workbook.record import Record, Study
>>> a = Record({"axis": "lift"}).with_study(Study("s", results={"v": {"value": 0.1, "unit": "m/s"}}))
>>> b = a.with_study(Study("s", results={"v": {"value": 0.11, "unit": "m/s"}}))
>>> d = diff(a, b)
>>> d.is_empty, round(d.results[0].relative, 3)
(False, 0.1)
>>> diff(a, a).is_empty
True
"""

from __future__ import annotations

from dataclasses import dataclass, field
from typing import Any

from ..inputs import BY_KEY
from .export import pretty_unit
from .model import Record, Study


@dataclass(frozen=True)
class InputChange:
    study: str
    section: str
    field: str
    old: Any          # value in the old entry's unit (None: the input was not recorded)
    new: Any
    old_unit: str = ""
    new_unit: str = ""


@dataclass(frozen=True)
class ResultChange:
    study: str
    name: str
    old: float | None  # None: the result is new
    new: float | None  # None: the result went
    unit: str = ""
    label: str = ""

    @property
    def relative(self) -> float | None:
        """(new - old) / |old|; None when old is zero or one side is missing."""
        if self.old is None or self.new is None or self.old == 0:
            return None
        return (self.new - self.old) / abs(self.old)


@dataclass(frozen=True)
class LevelChange:
    study: str
    rule_id: str
    quantity: str
    old: str | None   # None: the finding is new
    new: str | None   # None: the finding went
    statement: str = ""


@dataclass(frozen=True)
class RecordDiff:
    identity: list = field(default_factory=list)         # (key, old, new)
    studies_added: list = field(default_factory=list)
    studies_removed: list = field(default_factory=list)
    inputs: list = field(default_factory=list)           # InputChange
    results: list = field(default_factory=list)          # ResultChange
    levels: list = field(default_factory=list)           # LevelChange
    figures: list = field(default_factory=list)          # (study, figure name, "changed"|"added"|"removed")
    notes_added: list = field(default_factory=list)      # (study or "", text)
    notes_removed: list = field(default_factory=list)
    library_versions: tuple = ("", "")

    @property
    def is_empty(self) -> bool:
        return not (self.identity or self.studies_added or self.studies_removed or self.inputs or self.results
                    or self.levels or self.figures or self.notes_added or self.notes_removed)

    def to_text(self) -> str:
        """A readable summary, one change a line: identity, studies, inputs, then the findings
        whose level moved (what a reviewer reads first), then results, figures and notes."""
        old_v, new_v = self.library_versions
        lines = []
        if old_v != new_v:
            lines.append(f"library version {old_v} -> {new_v}")
        if self.is_empty:
            lines.append("no change in identity, studies, inputs, results, findings, figures or notes")
            return "\n".join(lines)
        for key, old, new in self.identity:
            lines.append(f"identity {key}: {old!r} -> {new!r}")
        for key in self.studies_added:
            lines.append(f"study added: {key}")
        for key in self.studies_removed:
            lines.append(f"study removed: {key}")
        for c in self.inputs:
            sec = BY_KEY.get(c.section)
            label = sec[c.field].label if sec and c.field in sec.keys else c.field
            where = f"[{c.study}] " if c.study else ""
            lines.append(f"{where}input {c.section}.{c.field} ({label}): "
                         f"{_show(c.old, c.old_unit)} -> {_show(c.new, c.new_unit)}")
        for c in self.levels:
            what = f"{c.rule_id}" + (f" ({c.quantity})" if c.quantity else "")
            lines.append(f"[{c.study}] finding {what}: {(c.old or 'absent').upper()} -> {(c.new or 'absent').upper()}")
        for c in self.results:
            rel = c.relative
            how = f" ({rel * 100:+.3g} %)" if rel is not None else (" (from zero)" if c.old == 0 else "")
            lines.append(f"[{c.study}] result {c.name} ({c.label}): {_show(c.old, c.unit)} -> "
                         f"{_show(c.new, c.unit)}{how}")
        for study, name, how in self.figures:
            lines.append(f"[{study}] figure {name} {how}")
        for study, text in self.notes_added:
            lines.append(f"{f'[{study}] ' if study else ''}note added: {text}")
        for study, text in self.notes_removed:
            lines.append(f"{f'[{study}] ' if study else ''}note removed: {text}")
        return "\n".join(lines)


def _show(value, unit: str) -> str:
    if value is None:
        return "(none)"
    if isinstance(value, list):
        text = ", ".join(f"{v:.6g}" if isinstance(v, float) else str(v) for v in value)
    elif isinstance(value, float):
        text = f"{value:.6g}"
    else:
        text = repr(value) if isinstance(value, str) else str(value)
    return f"{text} {pretty_unit(unit)}".strip()


def _entry_key(entry: dict):
    return entry.get("si", entry.get("value")), None if "si" in entry else entry.get("unit")


def _inputs(key: str, a_inputs, b_inputs) -> list:
    out = []
    sections = list(a_inputs) + [s for s in b_inputs if s not in a_inputs]
    for sec in sections:
        ea, eb = a_inputs.get(sec, {}), b_inputs.get(sec, {})
        for fld in list(ea) + [f for f in eb if f not in ea]:
            old, new = ea.get(fld), eb.get(fld)
            if old is not None and new is not None and _entry_key(old) == _entry_key(new):
                continue
            out.append(InputChange(key, sec, fld, None if old is None else old.get("value"),
                                   None if new is None else new.get("value"),
                                   "" if old is None else old.get("unit", ""), "" if new is None else new.get("unit", "")))
    return out


def _results(key: str, a: Study, b: Study, rtol: float) -> list:
    out = []
    for name in list(a.results) + [n for n in b.results if n not in a.results]:
        ra, rb = a.results.get(name), b.results.get(name)
        old = None if ra is None else ra["value"]
        new = None if rb is None else rb["value"]
        if old is not None and new is not None:
            if old == new and ra["unit"] == rb["unit"]:
                continue
            if rtol and old != 0 and abs(new - old) <= rtol * abs(old) and ra["unit"] == rb["unit"]:
                continue
        src = rb or ra
        out.append(ResultChange(key, name, old, new, src["unit"], src["label"]))
    return out


def _finding_keys(study: Study) -> dict:
    seen: dict = {}
    out = {}
    for f in study.findings:
        base = (f["rule_id"], f["quantity"])
        n = seen.get(base, 0)
        seen[base] = n + 1
        out[(*base, n)] = f
    return out


def _levels(key: str, a: Study, b: Study) -> list:
    fa, fb = _finding_keys(a), _finding_keys(b)
    out = []
    for k in list(fa) + [k for k in fb if k not in fa]:
        old, new = fa.get(k), fb.get(k)
        lo = None if old is None else old["level"]
        ln = None if new is None else new["level"]
        if lo != ln:
            out.append(LevelChange(key, k[0], k[1], lo, ln, (new or old)["statement"]))
    return out


def diff(old: Record, new: Record, rtol: float = 0.0) -> RecordDiff:
    """Differences from ``old`` to ``new``; results within ``rtol`` (relative) count as unmoved."""
    identity = [(k, old.identity.get(k, ""), new.identity.get(k, ""))
                for k in list(old.identity) + [k for k in new.identity if k not in old.identity]
                if old.identity.get(k, "") != new.identity.get(k, "")]
    added = [k for k in new.studies if k not in old.studies]
    removed = [k for k in old.studies if k not in new.studies]
    inputs, results, levels, figures, notes_added, notes_removed = [], [], [], [], [], []
    inputs += _inputs("", old.inputs, new.inputs)
    for key, a in old.studies.items():
        b = new.studies.get(key)
        if b is None:
            continue
        inputs += _inputs(key, a.inputs, b.inputs)
        results += _results(key, a, b, rtol)
        levels += _levels(key, a, b)
        for name in list(a.figures) + [n for n in b.figures if n not in a.figures]:
            if name not in b.figures:
                figures.append((key, name, "removed"))
            elif name not in a.figures:
                figures.append((key, name, "added"))
            elif a.figures[name] != b.figures[name]:
                figures.append((key, name, "changed"))
        notes_added += [(key, t) for t in b.notes if t not in a.notes]
        notes_removed += [(key, t) for t in a.notes if t not in b.notes]
    notes_added += [("", t) for t in new.notes if t not in old.notes]
    notes_removed += [("", t) for t in old.notes if t not in new.notes]
    return RecordDiff(identity, added, removed, inputs, results, levels, figures, notes_added, notes_removed,
                      (old.library_version, new.library_version))


__all__ = ["diff", "RecordDiff", "InputChange", "ResultChange", "LevelChange"]
