"""The data model of the design record: :class:`Record` and :class:`Study`.

One record per axis, holding one design. A record holds the identity the user gives
(machine, axis, revision, author, date: the keys of :data:`workbook.inputs.IDENTITY`), the
version of the library that wrote it, the schema version, the axis inputs (once: every
study of the record ran on them), an ordered mapping of studies and free notes. A study
that ran on other axis inputs than the record's is refused: a record never mixes designs.

A study holds

``inputs``    its own settings (the ``study`` section: target flow, sweep range, ...); the
              axis sections it was given are lifted into the record's ``inputs``. Both are
              section -> field -> entry, the sections and fields of :mod:`workbook.inputs`.
              A quantity entry is ``{"value": 80.0, "unit": "mm", "si": 0.08}``: the value
              in the field's display unit for people, the SI value for a lossless return
              (display-unit conversion can move the last bit). Text, choice and flag
              entries are ``{"value": "VG46"}``; a list is
              ``{"value": [2.0, 9.0], "unit": "kN", "si": [2000.0, 9000.0]}``.
``results``   name -> ``{"value": float, "unit": str, "label": str}``.
``findings``  list of ``{rule_id, statement, quantity, value, limit, unit, margin, level,
              source, detail}``; ``level`` is ``"pass"``, ``"caution"`` or ``"fail"``;
              ``margin`` is a fraction of the limit (0.12 is 12 %), or None.
``figures``   name -> ``{title, x_label, y_label, x, series, limits}``: curve data, so that
              an export can draw the curve without a plotting library. A ``None`` in a
              series is a gap.
``notes``     list of text.

Everything is checked when it is built; a bad part raises
:class:`~workbook.errors.InputError` naming the part. Numbers must be finite: a record
never holds NaN.

>>> values = {"cylinder": {"bore": 0.08, "rod": 0.045}}
>>> s = Study("restrictor-sizing", "Restrictor for lowering", inputs=inputs_from_values(values),
...           results={"speed": {"value": 0.1, "unit": "m/s", "label": "Lowering speed"}})
>>> s.inputs["cylinder"]["bore"]
{'value': 80.0, 'unit': 'mm', 'si': 0.08}
>>> s.input_value("cylinder", "bore")
0.08
>>> r = Record({"machine": "BT-2", "axis": "lift", "date": "2026-11-30"}).with_study(s)
>>> list(r.studies), r.machine, r.revision
(['restrictor-sizing'], 'BT-2', 'A')
"""

from __future__ import annotations

import copy
import dataclasses
import math
from dataclasses import dataclass
from dataclasses import field as dc_field
from typing import Any, Iterable, Mapping

import numpy as np

from .. import CAUTION, __version__, safetext, units
from ..errors import InputError
from ..fields import Field
from ..inputs import AXIS_SECTIONS, BY_KEY, IDENTITY, SECTIONS

#: schema version this library writes
SCHEMA_VERSION = 2
#: schema versions this library reads (version 1 is migrated on load: see :class:`Record`)
SUPPORTED_SCHEMA_VERSIONS = (1, 2)
#: sections that are a study's own settings; every other section describes the axis and is
#: held once per record
STUDY_SECTIONS = ("study",)
#: the sections that describe the axis (held once per record)
_AXIS_KEYS = tuple(s.key for s in AXIS_SECTIONS if s.key not in STUDY_SECTIONS)
#: the note a record migrated from schema version 1 carries
MIGRATED_NOTE = ("Migrated from record schema version 1: the axis inputs, which every study held "
                 "alike, are now held once.")
#: levels of a finding, worst first
LEVELS = ("fail", "caution", "pass")
#: keys of a finding, in the order they are stored
FINDING_KEYS = ("rule_id", "statement", "quantity", "value", "limit", "unit", "margin", "level",
                "source", "detail")
_FINDING_REQUIRED = ("rule_id", "statement", "level", "source")
_FINDING_NUMBERS = ("value", "limit", "margin")
_PLAIN = ("text", "choice", "flag")  # kinds stored without a unit
_FIGURE_KEYS = ("title", "x_label", "y_label", "x", "series", "limits", "bands")


# ---------------------------------------------------------------------------- checks
def _text(value: Any, where: str, allowed: str = "text") -> str:
    if not isinstance(value, str):
        raise InputError(where, f"a {type(value).__name__} ({value!r})"[:120], allowed)
    try:
        value.encode("utf-8")
    except UnicodeEncodeError:
        raise InputError(where, repr(value)[:120], "text that UTF-8 can encode (no lone surrogates)") from None
    return value


def _number(value: Any, where: str, allowed: str = "a finite number", none_ok: bool = False):
    if value is None and none_ok:
        return None
    if isinstance(value, bool) or not isinstance(value, (int, float, np.integer, np.floating)):
        raise InputError(where, f"a {type(value).__name__} ({value!r})"[:120], allowed)
    value = float(value)
    if not math.isfinite(value):
        raise InputError(where, repr(value), allowed + " (not NaN or infinite)")
    return value


def _numbers(value: Any, where: str, gaps: bool = False) -> list:
    if isinstance(value, np.ndarray):
        value = value.tolist()
    if not isinstance(value, (list, tuple)):
        raise InputError(where, f"a {type(value).__name__}", "a list of finite numbers")
    allowed = "a finite number" + (" or None for a gap" if gaps else "")
    return [_number(v, f"{where}[{i}]", allowed, none_ok=gaps) for i, v in enumerate(value)]


def _mapping(value: Any, where: str, allowed: str) -> Mapping:
    if not isinstance(value, Mapping):
        raise InputError(where, f"a {type(value).__name__}", allowed)
    return value


def _text_list(value: Any, where: str) -> list:
    if isinstance(value, str) or not isinstance(value, (list, tuple)):
        raise InputError(where, f"a {type(value).__name__}", "a list of text")
    return [_text(v, f"{where}[{i}]") for i, v in enumerate(value)]


def _known_field(section: str, key: str, where: str) -> Field:
    sec = BY_KEY.get(section)
    if sec is None:
        raise InputError(where, f"an unknown section {section!r}", "one of " + ", ".join(BY_KEY))
    try:
        return sec[key]
    except KeyError:
        raise InputError(f"{where}.{key}", "an unknown field", "one of " + ", ".join(sec.keys)) from None


def _entry(f: Field, entry: Any, where: str) -> dict:
    """Check one input entry against its field; return a clean copy."""
    entry = _mapping(entry, where, "an entry {'value': ..., 'unit': ..., 'si': ...}")
    extra = sorted(set(entry) - {"value", "unit", "si"})
    if extra:
        raise InputError(f"{where}.{extra[0]}", "an unknown part", "value, unit, si")
    if "value" not in entry:
        raise InputError(f"{where}.value", "nothing (the value is missing)", f.allowed())
    value = entry["value"]
    if value is None:
        if not f.optional:
            raise InputError(f"{where}.value", "None", f.allowed())
        return {"value": None}
    if f.dimension == "text":
        return {"value": _text(value, f"{where}.value")}
    if f.dimension == "flag":
        if not isinstance(value, bool):
            raise InputError(f"{where}.value", repr(value), "true or false")
        return {"value": value}
    if f.dimension == "choice":
        if value not in f.choices:
            raise InputError(f"{where}.value", repr(value), f.allowed())
        return {"value": value}
    unit = _text(entry.get("unit", f.unit), f"{where}.unit", "a unit, as text")
    dimension = f.list_dimension if f.dimension == "quantity_list" else f.dimension
    try:  # the stored unit must measure the field's dimension ("bar" for a bore is refused)
        units.to_si(1.0, dimension, f.key, default_unit=unit or None)
    except InputError as exc:
        first = value[0] if isinstance(value, list) and value else value
        shown = f"{_g(first) if isinstance(first, float) else repr(first)} {unit}".strip()
        raise InputError(where, safetext.excerpt(shown, 60), exc.allowed) from None
    if f.dimension == "quantity_list":
        out = {"value": _numbers(value, f"{where}.value"), "unit": unit}
        if not out["value"] and not f.optional:
            raise InputError(f"{where}.value", "an empty list", f.allowed() + " (at least one)")
        if "si" in entry:
            out["si"] = _numbers(entry["si"], f"{where}.si")
            if len(out["si"]) != len(out["value"]):
                raise InputError(f"{where}.si", f"{len(out['si'])} values", f"{len(out['value'])} values, one per entry")
        return out
    out = {"value": _number(value, f"{where}.value"), "unit": unit}
    if "si" in entry:
        out["si"] = _number(entry["si"], f"{where}.si")
    return out


def _inputs(inputs: Any, where: str = "inputs") -> dict:
    inputs = _mapping(inputs, where, "a mapping section -> field -> entry")
    out: dict = {}
    for section, fields in inputs.items():
        sec_where = f"{where}.{section}"
        fields = _mapping(fields, sec_where, "a mapping field -> entry")
        if section not in BY_KEY:
            raise InputError(sec_where, "an unknown section", "one of " + ", ".join(BY_KEY))
        out[section] = {}
        for key, entry in fields.items():
            f = _known_field(section, key, sec_where)
            out[section][key] = _entry(f, entry, f"{sec_where}.{key}")
    return out


def finding_entry(finding: Any, where: str = "finding") -> dict:
    """A finding as the record stores it, from a mapping or an object with those attributes.

    Missing optional parts take ``""`` (text) or ``None`` (numbers); ``level`` is lower-cased
    (an enum's ``value`` is used).

    >>> finding_entry({"rule_id": "R1", "statement": "ok", "level": "PASS", "source": "common practice"})["level"]
    'pass'
    """
    if isinstance(finding, Mapping):
        get = lambda k: finding.get(k)  # noqa: E731
        extra = sorted(set(finding) - set(FINDING_KEYS))
        if extra:
            raise InputError(f"{where}.{extra[0]}", "an unknown part", "one of " + ", ".join(FINDING_KEYS))
    else:
        get = lambda k: getattr(finding, k, None)  # noqa: E731
    out: dict = {}
    for key in FINDING_KEYS:
        value = get(key)
        if key in _FINDING_REQUIRED and value is None:
            raise InputError(f"{where}.{key}", "nothing (it is missing)", "text")
        if key == "level":
            value = getattr(value, "value", value)
            value = _text(value, f"{where}.level", "one of " + ", ".join(LEVELS)).strip().lower()
            if value not in LEVELS:
                raise InputError(f"{where}.level", repr(value), "one of " + ", ".join(LEVELS))
        elif key in _FINDING_NUMBERS:
            value = _number(value, f"{where}.{key}", "a finite number or None", none_ok=True)
        else:
            value = _text("" if value is None else value, f"{where}.{key}")
        out[key] = value
    return out


def _result(name: str, value: Any, where: str) -> dict:
    if not isinstance(value, Mapping):
        raise InputError(where, f"a {type(value).__name__}", "{'value': number, 'unit': text, 'label': text}")
    extra = sorted(set(value) - {"value", "unit", "label"})
    if extra:
        raise InputError(f"{where}.{extra[0]}", "an unknown part", "value, unit, label")
    return {
        "value": _number(value.get("value"), f"{where}.value"),
        "unit": _text(value.get("unit", ""), f"{where}.unit"),
        "label": _text(value.get("label", name), f"{where}.label"),
    }


def _figure(name: str, fig: Any, where: str) -> dict:
    fig = _mapping(fig, where, "{'title', 'x_label', 'y_label', 'x', 'series', 'limits'}")
    extra = sorted(set(fig) - set(_FIGURE_KEYS))
    if extra:
        raise InputError(f"{where}.{extra[0]}", "an unknown part", ", ".join(_FIGURE_KEYS))
    x = _numbers(fig.get("x", []), f"{where}.x")
    series_in = _mapping(fig.get("series", {}), f"{where}.series", "a mapping label -> list of numbers")
    series = {}
    for label, ys in series_in.items():
        _text(label, f"{where}.series", "text labels")
        ys = _numbers(ys, f"{where}.series.{label}", gaps=True)
        if len(ys) != len(x):
            raise InputError(f"{where}.series.{label}", f"{len(ys)} points", f"{len(x)} points, one per x")
        series[label] = ys
    limits_in = _mapping(fig.get("limits", {}), f"{where}.limits", "a mapping label -> number")
    limits = {}
    for label, v in limits_in.items():
        _text(label, f"{where}.limits", "text labels")
        limits[label] = _number(v, f"{where}.limits.{label}")
    bands_in = _mapping(fig.get("bands", {}), f"{where}.bands", "a mapping label -> [x from, x to]")
    bands = {}
    for label, span in bands_in.items():
        _text(label, f"{where}.bands", "text labels")
        pair = _numbers(span, f"{where}.bands.{label}")
        if len(pair) != 2 or pair[0] > pair[1]:
            raise InputError(f"{where}.bands.{label}", repr(pair), "[x from, x to] with from <= to")
        bands[label] = pair
    out = {
        "title": _text(fig.get("title", name), f"{where}.title"),
        "x_label": _text(fig.get("x_label", ""), f"{where}.x_label"),
        "y_label": _text(fig.get("y_label", ""), f"{where}.y_label"),
        "x": x,
        "series": series,
        "limits": limits,
    }
    if bands:
        out["bands"] = bands   # shaded x ranges (a regime band); only stored when there is one
    return out


# ---------------------------------------------------------------------------- inputs
def _si_quantity(si: float, dimension: str):
    return units.registry().Quantity(si, units.INTERNAL_UNIT[dimension])


def inputs_from_values(values: Mapping[str, Mapping[str, Any]]) -> dict:
    """Input entries of a study from SI values, driven by the declarations of :mod:`workbook.inputs`.

    ``values`` is ``{section_key: {field_key: SI value}}`` (what ``Section.parse`` returns).
    Each value is checked by its field (bounds, choices) and stored in the field's display
    unit with full float precision, and as SI. Sections and fields come out in catalogue
    order.

    >>> inputs_from_values({"supply": {"relief_cracking": 160e5}})
    {'supply': {'relief_cracking': {'value': 160.0, 'unit': 'bar', 'si': 16000000.0}}}
    >>> inputs_from_values({"cylinder": {"bore": -0.08}})
    Traceback (most recent call last):
    ...
    workbook.errors.InputError: cylinder.bore: got -80 mm; allowed: a length greater than 0 mm and at most 1000 mm
    """
    values = _mapping(values, "inputs", "a mapping section -> field -> SI value")
    unknown = [s for s in values if s not in BY_KEY]
    if unknown:
        raise InputError(str(unknown[0]), "an unknown section", "one of " + ", ".join(BY_KEY))
    out: dict = {}
    for sec in SECTIONS:
        if sec.key not in values:
            continue
        given = _mapping(values[sec.key], sec.key, "a mapping field -> SI value")
        for key in given:
            _known_field(sec.key, key, sec.key)
        entries = {}
        for f in sec.fields:
            if f.key not in given:
                continue
            entries[f.key] = _entry_from_si(f, given[f.key], f"{sec.key}.{f.key}")
        out[sec.key] = entries
    return out


def _entry_from_si(f: Field, si: Any, where: str) -> dict:
    try:
        if si is None:
            f.parse(None)  # raises unless optional
            return {"value": None}
        if f.dimension in _PLAIN:
            return {"value": f.parse(si)}
        if f.dimension == "quantity_list":
            si_list = _numbers(si, where)
            f.parse([_si_quantity(v, f.list_dimension) for v in si_list])
            return {"value": [_display(f, v, f.list_dimension) for v in si_list], "unit": f.unit, "si": si_list}
        si = _number(si, where, f"an SI {f.dimension.replace('_', ' ')} as a finite number")
        f.parse(_si_quantity(si, f.dimension))
        return {"value": _display(f, si, f.dimension), "unit": f.unit, "si": si}
    except InputError as exc:
        if exc.field.startswith(where):
            raise
        raise exc.qualified(where) from None


def _display(f: Field, si: float, dimension: str) -> float:
    """The display value of ``si``: the shortest decimal in the field's unit that converts
    back to exactly ``si`` (a rod typed as "36 mm" is stored as 36, not 36.00000000000001);
    the full conversion when no shorter one does."""
    full = float(units.from_si(si, dimension, f.unit)) if f.unit else float(si)
    if not f.unit or not math.isfinite(full) or full == 0:
        return full
    for digits in (6, 9, 12, 15):
        short = float(f"{full:.{digits}g}")
        try:
            if units.to_si(short, dimension, f.key, default_unit=f.unit) == si:
                return short
        except InputError:
            break
    return full


def values_from_inputs(inputs: Mapping[str, Mapping[str, Any]]) -> dict:
    """SI values ``{section: {field: SI}}`` back from input entries, through ``Field.parse``.

    An entry with ``si`` is returned exactly (lossless); one without is parsed from
    ``value`` and ``unit``. If both are present they must agree. Bounds and units are
    checked by the field; a bad entry raises :class:`~workbook.errors.InputError`.

    >>> e = inputs_from_values({"cylinder": {"bore": 0.08}, "oil": {"grade": "VG46"}})
    >>> values_from_inputs(e)
    {'cylinder': {'bore': 0.08}, 'oil': {'grade': 'VG46'}}
    >>> values_from_inputs({"cylinder": {"bore": {"value": 5, "unit": "bar"}}})
    Traceback (most recent call last):
    ...
    workbook.errors.InputError: inputs.cylinder.bore: got 5 bar; allowed: a length with a unit, e.g. 63 mm, 2.5 in (a pressure was given)
    """
    clean = _inputs(inputs, "inputs")
    out: dict = {}
    for section, fields in clean.items():
        out[section] = {key: _value_from_entry(BY_KEY[section][key], entry, f"{section}.{key}")
                        for key, entry in fields.items()}
    return out


def _value_from_entry(f: Field, entry: Mapping, where: str):
    value = entry["value"]
    try:
        if value is None:
            return f.parse(None)
        if f.dimension in _PLAIN:
            return f.parse(value)
        unit = entry.get("unit", f.unit)
        if f.dimension == "quantity_list":
            dim = f.list_dimension
            from_value = [_as_si(v, unit, dim, f.key) for v in value]
            if "si" in entry:
                _agree(from_value, entry["si"], where, unit)
                return f.parse([_si_quantity(v, dim) for v in entry["si"]])
            return f.parse([_si_quantity(v, dim) for v in from_value])
        from_value = _as_si(value, unit, f.dimension, f.key)
        if "si" in entry:
            _agree([from_value], [entry["si"]], where, unit)
            return f.parse(_si_quantity(entry["si"], f.dimension))
        return f.parse(_si_quantity(from_value, f.dimension))
    except InputError as exc:
        if exc.field.startswith(where):
            raise
        raise exc.qualified(where) from None


def _as_si(value: float, unit: str, dimension: str, key: str) -> float:
    try:
        return units.to_si(float(value), dimension, key, default_unit=unit or None)
    except InputError as exc:
        raise type(exc)(exc.field, f"{_g(value)} {unit}".strip(), exc.allowed) from None


def _g(x: float) -> str:
    return f"{x:g}" if float(f"{x:g}") == x else repr(x)


def _agree(from_value: list, si: list, where: str, unit: str) -> None:
    for a, b in zip(from_value, si):
        if not math.isclose(a, b, rel_tol=1e-9, abs_tol=1e-300):
            raise InputError(where, f"value {a!r} (SI) and si {b!r} that disagree",
                             f"a value in {unit or 'the display unit'} that equals si to 9 digits")


# ---------------------------------------------------------------------------- study
@dataclass(frozen=True)
class Study:
    """One study of an axis: inputs with units, results, findings, curve data and notes.

    Built from plain data and checked at once (see the module docstring for the parts).

    >>> Study("restrictor-sizing", results={"dp": {"value": float("nan"), "unit": "bar"}})
    Traceback (most recent call last):
    ...
    workbook.errors.InputError: results.dp.value: got nan; allowed: a finite number (not NaN or infinite)
    """

    kind: str
    title: str = ""
    inputs: Mapping[str, Mapping[str, Any]] = dc_field(default_factory=dict)
    results: Mapping[str, Mapping[str, Any]] = dc_field(default_factory=dict)
    findings: list = dc_field(default_factory=list)
    figures: Mapping[str, Mapping[str, Any]] = dc_field(default_factory=dict)
    notes: list = dc_field(default_factory=list)

    def __post_init__(self):
        kind = _text(self.kind, "kind")
        if not kind.strip():
            raise InputError("kind", "an empty kind", "a short name such as 'restrictor-sizing'")
        set_ = lambda k, v: object.__setattr__(self, k, v)  # noqa: E731
        set_("title", _text(self.title, "title"))
        set_("inputs", _inputs(self.inputs))
        results = _mapping(self.results, "results", "a mapping name -> result")
        set_("results", {_text(k, "results", "text names"): _result(k, v, f"results.{k}") for k, v in results.items()})
        if isinstance(self.findings, (str, Mapping)) or not isinstance(self.findings, Iterable):
            raise InputError("findings", f"a {type(self.findings).__name__}", "a list of findings")
        set_("findings", [finding_entry(f, f"findings[{i}]") for i, f in enumerate(self.findings)])
        figures = _mapping(self.figures, "figures", "a mapping name -> figure")
        set_("figures", {_text(k, "figures", "text names"): _figure(k, v, f"figures.{k}") for k, v in figures.items()})
        set_("notes", _text_list(self.notes, "notes"))

    def input_value(self, section: str, field: str):
        """The SI value of one recorded input (through ``Field.parse``).

        >>> s = Study("x", inputs=inputs_from_values({"supply": {"relief_cracking": 16e6}}))
        >>> s.input_value("supply", "relief_cracking")
        16000000.0
        """
        f = _known_field(section, field, section)
        recorded = self.inputs.get(section, {})
        if field not in recorded:
            known = [f"{s}.{k}" for s, fs in self.inputs.items() for k in fs]
            raise InputError(f"{section}.{field}", "an input this study did not record",
                             "one of " + (", ".join(known) if known else "(no inputs recorded)"))
        return _value_from_entry(f, recorded[field], f"{section}.{field}")

    def values(self) -> dict:
        """Every recorded input as SI values ``{section: {field: SI}}``."""
        return values_from_inputs(self.inputs)

    def to_dict(self) -> dict:
        """Plain data (a deep copy), as JSON stores it."""
        return copy.deepcopy({
            "kind": self.kind, "title": self.title, "inputs": self.inputs, "results": self.results,
            "findings": self.findings, "figures": self.figures, "notes": self.notes,
        })

    @classmethod
    def from_dict(cls, data: Mapping) -> "Study":
        data = _mapping(data, "study", "a mapping")
        extra = sorted(set(data) - {"kind", "title", "inputs", "results", "findings", "figures", "notes"})
        if extra:
            raise InputError(extra[0], "an unknown part of a study",
                             "kind, title, inputs, results, findings, figures, notes")
        if "kind" not in data:
            raise InputError("kind", "nothing (it is missing)", "a short name such as 'restrictor-sizing'")
        return cls(**copy.deepcopy(dict(data)))


# ---------------------------------------------------------------------------- one design
def _entry_key(entry: Mapping):
    """What makes two stored entries the same input: the SI value where there is one."""
    if "si" in entry:
        si = entry["si"]
        return tuple(si) if isinstance(si, list) else si
    value = entry.get("value")
    return (tuple(value) if isinstance(value, list) else value), entry.get("unit")


def _entry_text(entry: Mapping) -> str:
    value = entry.get("value")
    if isinstance(value, list):
        value = ", ".join(f"{v:.6g}" for v in value)
    elif isinstance(value, float):
        value = f"{value:.6g}"
    return f"{value} {entry.get('unit', '')}".strip()


def _catalogue_order(inputs: Mapping) -> dict:
    out = {}
    for sec in SECTIONS:
        if sec.key in inputs and inputs[sec.key]:
            out[sec.key] = {f.key: inputs[sec.key][f.key] for f in sec.fields if f.key in inputs[sec.key]}
    return out


def _one_design(axis_inputs: dict, studies: dict) -> tuple[dict, dict]:
    """Lift the axis inputs out of the studies into one block; refuse studies that disagree.

    A study built by :meth:`~workbook.studies.base.Outcome.to_study` carries every input it
    ran on. The axis sections go to the record (once); the study keeps only its own
    settings (:data:`STUDY_SECTIONS`). Two studies that ran on different values of one axis
    input cannot share a record: :class:`~workbook.errors.InputError` names the input.
    """
    merged = {sec: dict(entries) for sec, entries in axis_inputs.items()}
    origin = {(sec, fld): "the record's inputs" for sec, entries in merged.items() for fld in entries}
    out = {}
    for key, study in studies.items():
        axis_part = {sec: e for sec, e in study.inputs.items() if sec in _AXIS_KEYS}
        if not axis_part:
            out[key] = study
            continue
        for sec, entries in axis_part.items():
            for fld, entry in entries.items():
                have = merged.get(sec, {}).get(fld)
                if have is None:
                    merged.setdefault(sec, {})[fld] = entry
                    origin[(sec, fld)] = f"study {key}"
                elif _entry_key(have) != _entry_key(entry):
                    label = BY_KEY[sec][fld].label
                    raise InputError(
                        f"studies.{key}.inputs.{sec}.{fld}",
                        f"{label} {_entry_text(entry)} where {origin[(sec, fld)]} has {_entry_text(have)}",
                        "one design per axis record: every study run on the same axis inputs (record "
                        "from one panel, which re-runs every study, or run axisbook evaluate)")
        own = {sec: e for sec, e in study.inputs.items() if sec not in _AXIS_KEYS}
        out[key] = dataclasses.replace(study, inputs=own)
    return _catalogue_order(merged), out


# ---------------------------------------------------------------------------- record
def _identity(identity: Any) -> dict:
    identity = _mapping(identity, "identity", "a mapping with " + ", ".join(IDENTITY.keys))
    unknown = sorted(set(identity) - set(IDENTITY.keys))
    if unknown:
        raise InputError(f"identity.{unknown[0]}", "an unknown entry", "one of " + ", ".join(IDENTITY.keys))
    out = {}
    for f in IDENTITY.fields:
        value = identity.get(f.key, f.default if f.default is not None else "")
        out[f.key] = _text(value, f"identity.{f.key}")
    return out


@dataclass(frozen=True)
class Record:
    """The design record of one axis.

    ``identity`` has the keys of :data:`workbook.inputs.IDENTITY` (missing ones take their
    defaults); each is also an attribute (``record.machine``). The date is whatever the
    user gives: the record never reads the clock, so a rerun gives the same record.

    >>> r = Record({"machine": "BT-2", "axis": "tip"})
    >>> r.with_note("first look").notes, r.notes
    (['first look'], [])
    """

    identity: Mapping[str, str]
    studies: Mapping[str, Study] = dc_field(default_factory=dict)
    notes: list = dc_field(default_factory=list)
    library_version: str = __version__
    schema_version: int = SCHEMA_VERSION
    inputs: Mapping[str, Mapping[str, Any]] = dc_field(default_factory=dict)

    def __post_init__(self):
        set_ = lambda k, v: object.__setattr__(self, k, v)  # noqa: E731
        set_("identity", _identity(self.identity))
        studies = _mapping(self.studies, "studies", "a mapping key -> Study")
        clean = {}
        for key, study in studies.items():
            key = _text(key, "studies", "text keys")
            if not key.strip():
                raise InputError("studies", "an empty study key", "a non-empty key")
            if isinstance(study, Mapping):
                try:
                    study = Study.from_dict(study)
                except InputError as exc:
                    raise exc.qualified(f"studies.{key}.{exc.field}") from None
            if not isinstance(study, Study):
                raise InputError(f"studies.{key}", f"a {type(study).__name__}", "a Study")
            clean[key] = study
        axis_inputs, clean = _one_design(_inputs(self.inputs, "inputs"), clean)
        set_("inputs", axis_inputs)
        set_("studies", clean)
        set_("notes", _text_list(self.notes, "notes"))
        set_("library_version", _text(self.library_version, "library_version"))
        if isinstance(self.schema_version, bool) or not isinstance(self.schema_version, int) \
                or self.schema_version not in SUPPORTED_SCHEMA_VERSIONS:
            raise InputError("schema_version", repr(self.schema_version),
                             "one of " + ", ".join(map(str, SUPPORTED_SCHEMA_VERSIONS)))
        if self.schema_version < SCHEMA_VERSION:
            set_("schema_version", SCHEMA_VERSION)
            if MIGRATED_NOTE not in self.notes:
                set_("notes", [*self.notes, MIGRATED_NOTE])

    def __getattr__(self, name: str):
        ident = self.__dict__.get("identity")
        if ident is not None and name in ident:
            return ident[name]
        raise AttributeError(name)

    def values(self) -> dict:
        """The axis inputs as SI values ``{section: {field: SI}}``."""
        return values_from_inputs(self.inputs)

    def study_values(self, key: str) -> dict:
        """What the study ``key`` ran on: the axis inputs and the study's own settings (SI)."""
        if key not in self.studies:
            raise InputError("study", repr(key), "one of " + ", ".join(self.studies))
        out = self.values()
        for sec, fields in self.studies[key].values().items():
            out.setdefault(sec, {}).update(fields)
        return out

    def with_study(self, study: Study, key: str | None = None) -> "Record":
        """A new record with ``study`` added under ``key`` (default: its kind), or replacing
        the study of that key in place; every other study and note is kept.

        A study that ran on other axis inputs than the record's is refused
        (:class:`~workbook.errors.InputError`): a record holds one design."""
        key = study.kind if key is None else key
        studies = dict(self.studies)
        studies[key] = study
        return dataclasses.replace(self, studies=studies)

    def without_study(self, key: str) -> "Record":
        """A new record without the study ``key``."""
        if key not in self.studies:
            raise InputError("study", repr(key), "one of " + ", ".join(self.studies))
        return dataclasses.replace(self, studies={k: v for k, v in self.studies.items() if k != key})

    def with_note(self, note: str) -> "Record":
        """A new record with ``note`` appended to the record's notes."""
        return dataclasses.replace(self, notes=[*self.notes, _text(note, "note")])

    def findings(self) -> list[dict]:
        """Every study's findings, worst level first (fail, caution, pass), then in study
        order; each a copy with an added ``"study"`` key."""
        out = [dict(f, study=key) for key, s in self.studies.items() for f in s.findings]
        return sorted(out, key=lambda f: LEVELS.index(f["level"]))

    def to_dict(self) -> dict:
        """Plain data without the digest; studies as a list (order is part of the content)."""
        return {
            "schema_version": self.schema_version,
            "library_version": self.library_version,
            "caution": CAUTION,
            "identity": dict(self.identity),
            "inputs": copy.deepcopy(self.inputs),
            "studies": [{"key": k, **s.to_dict()} for k, s in self.studies.items()],
            "notes": list(self.notes),
        }

    @classmethod
    def from_dict(cls, data: Mapping) -> "Record":
        data = _mapping(data, "record", "a mapping")
        if "caution" in data and not (isinstance(data["caution"], str) and data["caution"].strip()):
            raise InputError("caution", repr(data["caution"]), "the safety caution as text")
        studies_in = data.get("studies", [])
        if isinstance(studies_in, Mapping):
            studies = dict(studies_in)
        else:
            studies = {}
            for i, s in enumerate(studies_in):
                s = dict(_mapping(s, f"studies[{i}]", "a study"))
                key = s.pop("key", None)
                if key is None:
                    raise InputError(f"studies[{i}].key", "nothing (it is missing)", "a study key")
                if key in studies:
                    raise InputError(f"studies[{i}].key", repr(key), "a key not used by another study")
                studies[key] = s
        return cls(
            identity=data.get("identity", {}),
            inputs=data.get("inputs", {}),
            studies=studies,
            notes=list(data.get("notes", [])),
            library_version=data.get("library_version", __version__),
            schema_version=data.get("schema_version", SCHEMA_VERSION),
        )


__all__ = [
    "Record", "Study", "inputs_from_values", "values_from_inputs", "finding_entry",
    "SCHEMA_VERSION", "SUPPORTED_SCHEMA_VERSIONS", "LEVELS", "FINDING_KEYS", "STUDY_SECTIONS", "MIGRATED_NOTE",
]
