"""What every study returns, and small helpers to state results and findings.

An :class:`Outcome` holds, in the record's own forms (see :mod:`workbook.record`):

* ``results``: ``{key: {"value": number in display unit, "unit": str, "label": str}}``,
* ``findings``: a list of finding mappings (``rule_id, statement, quantity, value, limit,
  unit, margin, level, source, detail``), sorted fail, caution, pass,
* ``figures``: curve data ``{key: {"title", "x_label", "y_label", "x", "series", "limits"}}``,
* ``regimes``: for each figure and series, the regime label of every point (shown in the
  panels' hover readout and as dotted stretches; not stored in the record),

and :meth:`Outcome.summary` gives the deterministic plain-text summary a notebook ends with.
"""

from __future__ import annotations

import math
from dataclasses import dataclass, field
from typing import Iterable, Mapping

import numpy as np

from .. import CAUTION, inputs, units
from ..errors import InternalDefect
from ..formatting import number as _num
from ..grading import grade_margin
from ..record import Study, inputs_from_values
from ..record.model import STUDY_SECTIONS

LEVEL_ORDER = {"fail": 0, "caution": 1, "pass": 2}


def result(label: str, si_value, dimension: str, unit: str) -> dict:
    """A result entry in display units.

    >>> result("Bore", 0.08, "length", "mm")
    {'value': 80.0, 'unit': 'mm', 'label': 'Bore'}
    """
    value = units.from_si(float(si_value), dimension, unit) if dimension != "dimensionless" else float(si_value)
    if not math.isfinite(value):
        raise InternalDefect(f"result {label}", "a value that is not finite")
    return {"value": float(value), "unit": unit if dimension != "dimensionless" or unit else "", "label": label}


def ratio_result(label: str, value: float, percent: bool = False) -> dict:
    """A dimensionless result, optionally in percent."""
    v = float(value) * (100.0 if percent else 1.0)
    return {"value": v, "unit": "%" if percent else "", "label": label}


def grade(value: float, limit: float, caution_share: float, higher_is_worse: bool = True) -> tuple[str, float]:
    """Level and margin of ``value`` against ``limit``.

    The workbook's one grading rule, :func:`workbook.grading.grade_margin`: the margin is
    the share of the limit still unused, ``(limit - value)/|limit|`` when a higher value is
    worse, ``(value - limit)/|limit|`` otherwise. Negative margin fails; a margin below
    ``caution_share`` is a caution.

    >>> grade(200e5, 210e5, 0.10)
    ('caution', 0.047619047619047616)
    """
    margin, level = grade_margin(value, limit, caution_share, higher_is_worse)
    return level, margin


def finding(rule_id: str, statement: str, quantity: str, value, limit, dimension: str, unit: str,
            level: str, source: str, margin: float | None = None, detail: str = "") -> dict:
    """A finding entry with value and limit converted to ``unit``."""
    def conv(v):
        if v is None:
            return None
        v = float(v)
        if not math.isfinite(v):
            # a NaN or infinity here is a defect of the study, never something to hide as "–"
            raise InternalDefect(f"finding {rule_id}", "a value that is not finite")
        if dimension == "dimensionless":
            return v * (100.0 if unit == "%" else 1.0)
        return float(units.from_si(v, dimension, unit))

    return {
        "rule_id": rule_id, "statement": statement, "quantity": quantity,
        "value": conv(value), "limit": conv(limit), "unit": unit,
        "margin": None if margin is None else _finite_margin(rule_id, margin),
        "level": level, "source": source, "detail": detail,
    }


def as_alternative(item: dict, what: str) -> dict:
    """A finding about an alternative the design did not choose: a miss is a caution, not a
    fail (it informs the choice; it does not make the axis unsafe)."""
    out = dict(item)
    if out["level"] == "fail":
        out["level"] = "caution"
    note = f"{what} is an alternative, not the design's valve"
    out["detail"] = f"{out['detail']}; {note}" if out.get("detail") else note
    return out


def _finite_margin(rule_id: str, margin) -> float:
    m = float(margin)
    if not math.isfinite(m):
        raise InternalDefect(f"finding {rule_id}", "a margin that is not finite")
    return m


def sort_findings(items: Iterable[Mapping]) -> list[dict]:
    """Findings sorted fail, caution, pass (stable within a level)."""
    return sorted((dict(f) for f in items), key=lambda f: LEVEL_ORDER.get(f["level"], 3))


def curve(values) -> np.ndarray:
    """A curve for a figure: a flat float array, non-finite points as NaN (gaps)."""
    arr = np.array(values, dtype=float).ravel()
    arr[~np.isfinite(arr)] = np.nan
    return arr


#: most points a recorded curve keeps (a review figure needs no more; the panel draws all)
RECORD_POINTS = 121
#: significant digits of a recorded curve point (what a figure can show)
CURVE_DIGITS = 4
#: significant digits of a recorded result or finding number (beyond any tolerance of recheck,
#: short of the float noise of a unit conversion: 36.00000000000001 mm is stored as 36)
NUMBER_DIGITS = 12


def tidy(value: float, digits: int = NUMBER_DIGITS) -> float:
    """``value`` to ``digits`` significant digits, as the shortest float that prints so.

    >>> tidy(36.00000000000001), tidy(210.00000000000003), tidy(269.73124551234567)
    (36.0, 210.0, 269.731245512)
    """
    v = float(value)
    return float(f"{v:.{digits}g}") if math.isfinite(v) and v != 0 else v


def as_list(values, digits: int = CURVE_DIGITS) -> list:
    """A curve as the record stores it: floats to ``digits`` significant digits, gaps as None."""
    arr = np.asarray(values, dtype=float).ravel()
    return [tidy(v, digits) if math.isfinite(v) else None for v in arr]


def _record_index(n: int) -> np.ndarray:
    """Indices of the points a recorded curve keeps: all, or ``RECORD_POINTS`` evenly spread
    (both ends kept)."""
    if n <= RECORD_POINTS:
        return np.arange(n)
    return np.unique(np.round(np.linspace(0, n - 1, RECORD_POINTS)).astype(int))


def figures_for_record(figures: Mapping) -> dict:
    """Figures as the record stores them: curves as lists, at most :data:`RECORD_POINTS`
    points at :data:`CURVE_DIGITS` significant digits (a review figure's precision; the
    record stays small and its diff readable), limits to :data:`NUMBER_DIGITS`."""
    out = {}
    for key, fig in figures.items():
        x = np.asarray(fig["x"], dtype=float).ravel()
        idx = _record_index(x.size)
        out[key] = {**fig, "x": as_list(x[idx]),
                    "series": {name: as_list(np.asarray(ys, dtype=float).ravel()[idx])
                               for name, ys in fig["series"].items()},
                    "limits": {name: tidy(v) for name, v in fig.get("limits", {}).items()}}
        if fig.get("bands"):
            out[key]["bands"] = {name: [tidy(a, CURVE_DIGITS), tidy(b, CURVE_DIGITS)]
                                 for name, (a, b) in fig["bands"].items()}
        else:
            out[key].pop("bands", None)
    return out


def _tidy_result(r: Mapping) -> dict:
    return {**r, "value": tidy(r["value"])} if isinstance(r.get("value"), (int, float)) else dict(r)


def _tidy_finding(f: Mapping) -> dict:
    out = dict(f)
    for k in ("value", "limit", "margin"):
        if isinstance(out.get(k), (int, float)) and not isinstance(out.get(k), bool):
            out[k] = tidy(out[k])
    return out


@dataclass
class Outcome:
    """Results, findings and curves of one study run."""

    kind: str
    title: str
    values: Mapping[str, Mapping]
    fields: tuple
    results: dict = field(default_factory=dict)
    findings: list = field(default_factory=list)
    figures: dict = field(default_factory=dict)
    regimes: dict = field(default_factory=dict)
    notes: list = field(default_factory=list)

    def __post_init__(self):
        self.findings = sort_findings(self.findings)

    @property
    def worst_level(self) -> str:
        levels = [f["level"] for f in self.findings] or ["pass"]
        return min(levels, key=lambda lv: LEVEL_ORDER.get(lv, 3))

    def recorded_values(self) -> dict:
        """Every axis input the study ran on, as SI values by section.

        The study's FIELDS (what its panel shows) come first; every other field of the axis
        sections follows, so that a re-check re-runs on exactly these inputs and never on a
        catalogue default that the design had changed. Of the study's own settings (the
        ``study`` section) only those in its FIELDS are kept. A record lifts the axis sections
        into its one block of axis inputs (:class:`~workbook.record.Record`).
        """
        out: dict = {}
        for section, key in self.fields:
            out.setdefault(section, {})[key] = self.values[section][key]
        for sec in inputs.AXIS_SECTIONS:
            if sec.key not in self.values or sec.key in STUDY_SECTIONS:
                continue  # of the study's own settings, only those it uses (its FIELDS)
            for f in sec.fields:
                if f.key in self.values[sec.key]:
                    out.setdefault(sec.key, {}).setdefault(f.key, self.values[sec.key][f.key])
        return out

    def to_study(self, notes: Iterable[str] = ()) -> Study:
        """The study as the design record stores it."""
        return Study(kind=self.kind, title=self.title, inputs=inputs_from_values(self.recorded_values()),
                     results={k: _tidy_result(r) for k, r in self.results.items()},
                     findings=[_tidy_finding(f) for f in self.findings], figures=figures_for_record(self.figures),
                     notes=list(self.notes) + list(notes))

    def summary(self) -> str:
        """Deterministic plain text: caution, inputs, results, findings (4 significant digits)."""
        lines = [f"{self.title}", "=" * len(self.title), CAUTION, "", "Inputs:"]
        for section, key in self.fields:
            f = inputs.section(section)[key]
            lines.append(f"  {section + '.' + key:<32} {f.as_text(self.values[section][key], digits=4)}")
        lines += ["", "Results:"]
        for key, r in self.results.items():
            lines.append(f"  {r['label']:<46} {_num(r['value'])} {r['unit']}".rstrip())
        lines += ["", "Findings:"]
        for f in self.findings:
            margin = "" if f["margin"] is None else f" margin {f['margin'] * 100:+.0f} %"
            lines.append(f"  [{f['level'].upper():7}] {f['rule_id']}: {f['statement']}"
                         f" ({_num(f['value'])} vs {_num(f['limit'])} {f['unit']}{margin}; {f['source']})")
        return "\n".join(lines)


__all__ = ["Outcome", "as_alternative", "result", "ratio_result", "finding", "grade", "sort_findings", "curve", "LEVEL_ORDER"]
