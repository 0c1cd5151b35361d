"""Evaluation of a design file into records, and re-checking of a saved record.

:func:`evaluate_design` runs the studies on every axis of a :class:`~workbook.design.Design`
and builds one :class:`~workbook.record.Record` per axis. A study that does not apply to an
axis (the counterbalance study on an axis without a holding valve) is left out and the
record's notes say why. Bad input met by a study is raised as a
:class:`~workbook.design.DesignFileError` that names the design file, the line and the
dotted key of the value (``axes.tip.flow_valve.setting``, or the ``[defaults]`` entry it
came from).

:func:`recheck` re-runs every study of a saved record with the library as it is now, on
the inputs the record holds, and reports what moved: results beyond a relative tolerance,
findings whose level changed, results, findings or curves that appeared or vanished, and
studies that the current library refuses to run on the recorded inputs.

A result counts as moved when ``|new - old| > max(rtol * |old|, atol)``. ``atol`` (default
``1e-9``, in the result's own display unit: bar, mm/s, kW, L/min, %) is a floor for values
at or near zero, where a relative change means nothing (a heat of 1e-17 kW against 0 kW
is round-off, not drift). Curves are compared point by point with the same rule.

>>> from workbook.design import loads_design
>>> d = loads_design('''
... [machine]
... name = "BT-2"
... [axes.lift.cylinder]
... bore = "80 mm"
... rod = "45 mm"
... [axes.lift.holding]
... kind = "none"
... ''', "demo.toml")
>>> out = evaluate_design(d, studies=("axis-check", "counterbalance"))
>>> rec, outcomes = out["lift"]
>>> list(rec.studies), [o.kind for o in outcomes]
(['axis-check'], ['axis-check'])
>>> rec.notes[-1]
'counterbalance study left out: holding.kind is none (the axis has no load-holding valve)'
>>> recheck(rec).ok
True
"""

from __future__ import annotations

import dataclasses
import math
from dataclasses import dataclass, field
from typing import Iterable, Sequence

from . import __version__
from . import studies as _studies
from .design import Design, DesignFileError
from .errors import InputError
from .inputs import AXIS_SECTIONS, BY_KEY
from .record import LevelChange, Record, Study, diff
from .studies import machine_cycle as _machine
from .studies.whole_axis import DEFAULT_STUDIES, not_applicable
from .studies.whole_axis import evaluate as evaluate_values

#: default relative tolerance of :func:`recheck`
RTOL = 1e-6
#: default absolute floor of :func:`recheck`, in each result's display unit
ATOL = 1e-9


# ---------------------------------------------------------------------------- evaluation
def design_key(design: Design, axis_key: str, name: str) -> str:
    """The dotted design-file key of the input a study calls ``name`` on ``axis_key``.

    ``"flow_valve.setting"`` becomes ``"axes.<axis>.flow_valve.setting"``, or
    ``"defaults.flow_valve.setting"`` when the axis takes it from ``[defaults]``. A name
    that is not ``section.field`` maps to the axis table itself.

    A bare field key that one axis section alone has (``"nu100"``, as a physics model
    names it) is taken as that section's field. A study setting the file does not give
    whose default is worked out from other inputs (the sweep range from the load cases)
    maps to those inputs (:data:`DERIVED_FROM`), never to a key that is not in the file.

    >>> from workbook.design import loads_design
    >>> d = loads_design('[defaults.oil]\\nnu100 = "60 cSt"\\n[axes.lift.operation]\\nloads = ["9 kN"]\\n', "d.toml")
    >>> design_key(d, "lift", "nu100"), design_key(d, "lift", "study.load_max")
    ('defaults.oil.nu100', 'axes.lift.operation.loads')
    """
    head = name.split("[", 1)[0].strip()
    parts = head.split(".")
    if len(parts) == 1:
        owners = [s.key for s in AXIS_SECTIONS if parts[0] in s.keys]
        if len(owners) == 1:
            parts = [owners[0], parts[0]]
    if len(parts) >= 2 and parts[0] in BY_KEY and parts[1] in BY_KEY[parts[0]].keys:
        sec, fld = parts[0], parts[1]
        own = ("axes", axis_key, sec, fld)
        shared = ("defaults", sec, fld)
        if own not in design.lines and shared in design.lines:
            return ".".join(shared)
        if own not in design.lines and (sec, fld) in DERIVED_FROM:
            return design_key(design, axis_key, ".".join(DERIVED_FROM[sec, fld]))
        return ".".join(own)
    return f"axes.{axis_key}"


#: study settings whose default is worked out from other inputs -> the input it comes from
DERIVED_FROM = {("study", "load_min"): ("operation", "loads"), ("study", "load_max"): ("operation", "loads")}


def _located(design: Design, axis_key: str, kind: str, exc: InputError) -> DesignFileError:
    key = design_key(design, axis_key, exc.field)
    allowed = exc.allowed
    if key == f"axes.{axis_key}":
        # not an input of the catalogue: say which study and which quantity
        allowed = f"{allowed} (study {kind}, {exc.field})"
    else:
        allowed = f"{allowed} (study {kind})"
    return design.error(key, exc.given, allowed)


def evaluate_axis(design: Design, axis_key: str, studies: Sequence[str] = DEFAULT_STUDIES):
    """``(Record, [Outcome, ...])`` of one axis of ``design``; see :func:`evaluate_design`.

    The studies run through :func:`workbook.studies.whole_axis.evaluate`, the same call a
    study panel makes, so the record and its verdict are what the panel shows.
    """
    axis = design.axes.get(axis_key)
    if axis is None:
        raise design.error("axes", repr(axis_key), "one of the axes of the design: " + ", ".join(design.axes))
    ev = evaluate_values(axis.values, studies)
    for kind, exc in ev.refused.items():
        if isinstance(exc, DesignFileError):
            raise exc
        raise _located(design, axis_key, kind, exc) from None
    source = design.source or "a design file"
    record = ev.to_record(design.identity_for(axis_key),
                          notes=[f"Evaluated from {source}, axis {axis_key} ({axis.title})."])
    return record, list(ev.outcomes.values())


def evaluate_design(design: Design, studies: Sequence[str] = DEFAULT_STUDIES,
                    axes: Iterable[str] | None = None) -> dict:
    """Run ``studies`` on every axis of ``design`` (or only ``axes``).

    Returns ``{axis_key: (Record, [Outcome, ...])}`` in the design's axis order. Each record
    has the identity ``design.identity_for(axis)``, one study per kind (keyed by the kind)
    and notes naming the design file and any study left out. Raises
    :class:`~workbook.design.DesignFileError` for an unknown axis or a value a study
    refuses, and :class:`~workbook.errors.InputError` for an unknown study kind.
    """
    for kind in studies:
        _studies.module(kind)  # unknown kinds fail before any work
    wanted = list(design.axes) if axes is None else list(dict.fromkeys(axes))
    for key in wanted:
        if key not in design.axes:
            raise design.error("axes", repr(key), "one of the axes of the design: " + ", ".join(design.axes))
    return {key: evaluate_axis(design, key, studies) for key in design.axes if key in wanted}


def evaluate_machine(design: Design):
    """``(Record, MachineOutcome)`` of the design's machine cycle, or None without a ``[cycle]``.

    The record is an ordinary record with identity axis ``"machine"`` holding the study
    :mod:`workbook.studies.machine_cycle` (its inputs in the study's note, so that
    :func:`recheck` re-runs it). A refusal is located at ``cycle`` in the design file.
    """
    if design.cycle is None:
        return None
    try:
        outcome = _machine.run_machine({k: a.values for k, a in design.axes.items()}, design.cycle)
    except DesignFileError:
        raise
    except InputError as exc:
        key = exc.field if exc.field.startswith(("axes.", "cycle.")) else f"cycle.{exc.field}"
        raise design.error(key, exc.given, exc.allowed) from None
    ident = design.identity_for(next(iter(design.axes)))
    record = _machine.to_record(outcome, ident, notes=[f"Evaluated from {design.source or 'a design file'}, "
                                                       "the machine cycle over every axis."])
    return record, outcome


# ---------------------------------------------------------------------------- recheck
@dataclass(frozen=True)
class Drift:
    """A result of a re-run study that differs from the recorded one.

    ``old`` is None when the result appeared, ``new`` is None when it vanished; ``relative``
    is ``(new - old)/|old|`` (None when old is zero, a side is missing or the unit changed).
    """

    study: str
    key: str
    label: str
    old: float | None
    new: float | None
    unit: str
    relative: float | None = None
    new_unit: str | None = None  # set only when the unit itself changed

    def to_text(self) -> str:
        def show(v, unit):
            return "(none)" if v is None else f"{v:.6g} {unit}".rstrip()

        if self.old is None:
            how = "appeared"
        elif self.new is None:
            how = "vanished"
        elif self.new_unit is not None:
            how = f"unit changed {self.unit!r} -> {self.new_unit!r}"
        elif self.relative is None:
            how = "from zero"
        else:
            how = f"{self.relative * 100:+.3g} %"
        new_unit = self.unit if self.new_unit is None else self.new_unit
        return (f"[{self.study}] result {self.key} ({self.label}): {show(self.old, self.unit)} -> "
                f"{show(self.new, new_unit)} ({how})")


@dataclass(frozen=True)
class RecheckReport:
    """What moved when the studies of a record were re-run with the current library."""

    identity: dict
    rtol: float
    atol: float
    old_version: str
    new_version: str
    drifts: list = field(default_factory=list)     # Drift
    levels: list = field(default_factory=list)     # record.LevelChange
    figures: list = field(default_factory=list)    # (study, figure, "changed" | "added" | "removed")
    refused: list = field(default_factory=list)    # (study, message): the current library refuses the inputs
    unknown: list = field(default_factory=list)    # (study, kind): no study of that kind in this library
    filled: list = field(default_factory=list)     # (study, "section.field"): not recorded, default used
    studies: list = field(default_factory=list)    # study keys re-run

    @property
    def ok(self) -> bool:
        """True when every study re-ran and nothing moved beyond the tolerance."""
        return not (self.drifts or self.levels or self.figures or self.refused or self.unknown)

    def to_text(self) -> str:
        """Plain text, one item a line; the last line says whether the record still holds."""
        ident = self.identity
        lines = [f"Recheck of {ident.get('machine', '')}, axis {ident.get('axis', '')}: "
                 f"{len(self.studies)} studies re-run with workbook {self.new_version} "
                 f"(recorded with {self.old_version}); tolerance rtol {self.rtol:g}, atol {self.atol:g}"]
        lines += [d.to_text() for d in self.drifts]
        for c in self.levels:
            what = c.rule_id + (f" ({c.quantity})" if c.quantity else "")
            lines.append(f"[{c.study}] finding {what}: {(c.old or 'absent').upper()} -> {(c.new or 'absent').upper()}")
        lines += [f"[{s}] figure {name} {how}" for s, name, how in self.figures]
        lines += [f"[{s}] refused by the current library: {msg}" for s, msg in self.refused]
        lines += [f"[{s}] not re-run: this library has no study of kind {k!r}" for s, k in self.unknown]
        if self.filled:
            by_study: dict = {}
            for s, name in self.filled:
                by_study.setdefault(s, []).append(name)
            for s, names in by_study.items():
                lines.append(f"[{s}] not recorded, catalogue default used: {', '.join(names)}")
        if self.ok:
            lines.append("No drift: every result, finding and curve is as recorded.")
        else:
            n = len(self.drifts) + len(self.levels) + len(self.figures) + len(self.refused) + len(self.unknown)
            lines.append(f"Drift: {n} item(s) differ from the record.")
        return "\n".join(lines)


def _moved(old: float, new: float, rtol: float, atol: float) -> bool:
    return abs(new - old) > max(rtol * abs(old), atol)


def _curve_moved(a: dict, b: dict, rtol: float, atol: float) -> bool:
    if set(a) != set(b) or set(a["series"]) != set(b["series"]) or set(a["limits"]) != set(b["limits"]):
        return True
    pairs = [(a["x"], b["x"])] + [(a["series"][k], b["series"][k]) for k in a["series"]]
    pairs += [([a["limits"][k]], [b["limits"][k]]) for k in a["limits"]]
    for xa, xb in pairs:
        if len(xa) != len(xb):
            return True
        for u, v in zip(xa, xb):
            if (u is None) != (v is None):
                return True
            if u is not None and _moved(u, v, rtol, atol):
                return True
    return False


def rerun_values(record: Record, key: str) -> tuple[dict, list]:
    """Values to re-run the study ``key`` of ``record``: catalogue defaults overlaid with the
    record's axis inputs and the study's own settings.

    Returns ``(values, filled)`` where ``filled`` lists the ``"section.field"`` names of the
    study's FIELDS that the record did not hold (they take their defaults).
    """
    study = record.studies[key]
    values = {s.key: s.defaults() for s in AXIS_SECTIONS}
    recorded = record.study_values(key)
    for sec, fields in recorded.items():
        values.setdefault(sec, {}).update(fields)
    mod_fields = ()
    if study.kind in _studies.KINDS:
        mod_fields = getattr(_studies.module(study.kind), "FIELDS", ())
    filled = [f"{s}.{k}" for s, k in mod_fields if k not in recorded.get(s, {})]
    return values, filled


def recheck(record: Record, rtol: float = RTOL, atol: float = ATOL) -> RecheckReport:
    """Re-run every study of ``record`` with the current library and report what moved.

    Each study runs on the record's axis inputs and its own settings
    (:meth:`~workbook.record.Record.study_values`), any input not recorded taking the
    catalogue default. The re-run studies form a new record (same
    identity, inputs and notes), which :func:`workbook.record.diff` compares with the saved
    one; results within ``max(rtol*|old|, atol)`` count as unmoved.
    """
    for name, v in (("rtol", rtol), ("atol", atol)):
        if isinstance(v, bool) or not isinstance(v, (int, float)) or not math.isfinite(v) or v < 0:
            raise InputError(name, repr(v), "a finite number of 0 or more (1e-6 is one part in a million)")
    new = record
    refused, unknown, filled, rerun = [], [], [], []
    for key, study in record.studies.items():
        if study.kind == _machine.KIND:  # the machine record: re-run on the inputs its study holds
            try:
                outcome = _machine.run_machine(*_machine.record_inputs(record))
            except InputError as exc:
                refused.append((key, str(exc)))
                continue
            fresh = outcome.to_study()
            new = new.with_study(Study(study.kind, study.title, inputs=study.inputs, results=fresh.results,
                                       findings=fresh.findings, figures=fresh.figures, notes=study.notes), key=key)
            rerun.append(key)
            continue
        if study.kind not in _studies.KINDS:
            unknown.append((key, study.kind))
            continue
        values, missing = rerun_values(record, key)
        filled += [(key, name) for name in missing]
        try:
            outcome = _studies.run(study.kind, values)
        except InputError as exc:
            refused.append((key, str(exc)))
            continue
        fresh = outcome.to_study()
        # keep what the user recorded (inputs, title, notes); compare only what the library computes
        new = new.with_study(Study(study.kind, study.title, inputs=study.inputs, results=fresh.results,
                                   findings=fresh.findings, figures=fresh.figures, notes=study.notes), key=key)
        rerun.append(key)
    new = dataclasses.replace(new, library_version=__version__)
    d = diff(record, new)
    drifts = []
    for c in d.results:
        if c.study not in rerun:
            continue
        ra = record.studies[c.study].results.get(c.name)
        rb = new.studies[c.study].results.get(c.name)
        if ra is not None and rb is not None:
            if ra["unit"] != rb["unit"]:
                drifts.append(Drift(c.study, c.name, rb["label"], ra["value"], rb["value"], ra["unit"], None,
                                    new_unit=rb["unit"]))
                continue
            if not _moved(ra["value"], rb["value"], rtol, atol):
                continue
        drifts.append(Drift(c.study, c.name, c.label, c.old, c.new, c.unit, c.relative))
    levels = [c for c in d.levels if isinstance(c, LevelChange) and c.study in rerun]
    figures = []
    for s, name, how in d.figures:
        if s not in rerun:
            continue
        if how == "changed" and not _curve_moved(record.studies[s].figures[name], new.studies[s].figures[name],
                                                 rtol, atol):
            continue
        figures.append((s, name, how))
    return RecheckReport(dict(record.identity), float(rtol), float(atol), record.library_version, __version__,
                         drifts, levels, figures, refused, unknown, filled, rerun)


__all__ = ["evaluate_design", "evaluate_axis", "evaluate_machine", "recheck", "RecheckReport", "Drift", "DEFAULT_STUDIES",
           "not_applicable", "design_key", "rerun_values", "RTOL", "ATOL"]
