"""The verdict of a whole axis: every failing and cautioned finding of its studies, once.

Every screen that speaks of an axis (a study panel, the review copy, ``axisbook evaluate``)
builds its verdict here, from the findings of the studies that ran on one design, so that
all of them report the same set.

**One breach is one finding.** A study can test the quantity the axis check tests, against
the same limit (the rod-side pressure study and the axis check both grade the highest rod
pressure against the cylinder rating). :data:`SAME_BREACH` names such pairs; two findings
merge when their rules are paired there, their units and limits are equal and their values
agree to four significant digits (the number the screens show). The merged item keeps the
wording of the first (the axis check comes first in a record), the worst margin, and lists
every study and rule that found it. Findings whose values differ stay apart: they are
different statements, even if close.

**Worded as the breach.** :func:`breach_text` turns a finding into what is wrong with the
design: "Rod chamber pressure reaches 269.7 bar, above the 210 bar limit", and the worst case
from the finding's detail.

>>> fs = {"axis-check": [dict(rule_id="P-ROD-RATING", statement="Rod side within rating",
...        quantity="rod chamber pressure", value=269.7, limit=210.0, unit="bar", margin=-0.284,
...        level="fail", source="user's data sheet", detail="highest rod chamber pressure at: extend")],
...       "rod-pressure": [dict(rule_id="RP-ROD-CYLINDER", statement="Rod chamber within cylinder rating",
...        quantity="highest rod pressure", value=269.7, limit=210.0, unit="bar", margin=-0.284,
...        level="fail", source="user's data sheet", detail="worst case: extend, valve closed")]}
>>> v = verdict(fs)
>>> v.counts, [i.studies for i in v.items]
({'fail': 1, 'caution': 0, 'pass': 0}, [('axis-check', 'rod-pressure')])
>>> v.items[0].text
'Rod chamber pressure reaches 269.7 bar, above the 210 bar limit'
"""

from __future__ import annotations

import math
from dataclasses import dataclass
from typing import Iterable, Mapping

from ..formatting import number, pretty_unit

LEVELS = ("fail", "caution", "pass")

#: rule id of a study -> rule id(s) of the axis check that grade the same quantity
SAME_BREACH = {
    "RP-CAP-CYLINDER": "P-CAP-RATING",
    "RP-ROD-CYLINDER": "P-ROD-RATING",
    "RP-CAP-HOSE": "P-HOSE-RATING",
    "RP-ROD-HOSE": "P-HOSE-RATING",
    "RP-CAP-VALVE": "P-VALVE-RATING",
    "RP-ROD-VALVE": "P-VALVE-RATING",
    "CB-HOLDS": "H-HOLDS",
    "CB-SETTING": "H-CB-FACTOR",
    "CB-RATING-CYLINDER": "H-RATING",
    "CB-RATING-VALVE": "H-RATING",
    "CB-RATING-HOSE": "H-RATING",
    "CB-HEAT": "HEAT-SHARE",
    # the remedy restates the worst rod pressure against the lowest rating, whichever it is
    "RP-REMEDY": ("P-ROD-RATING", "P-HOSE-RATING", "P-VALVE-RATING"),
}


def _sig(v, digits: int = 4):
    if v is None:
        return None
    v = float(v)
    if v == 0 or not math.isfinite(v):
        return v
    return float(f"{v:.{digits}g}")


def _quantity(v, unit: str) -> str:
    unit = pretty_unit(unit or "")
    return f"{number(v)} {unit}".strip() if unit != "%" else f"{number(v)} %"


def _higher_is_worse(f: Mapping) -> bool:
    """The sense of the rule, read back from the stored margin: ``margin = (limit - value)/|limit|``
    when a higher value is worse, ``(value - limit)/|limit|`` otherwise."""
    value, limit, margin = f.get("value"), f.get("limit"), f.get("margin")
    if value is None or limit is None or margin is None or value == limit:
        return True
    return (margin >= 0) == (limit - value >= 0)


def breach_text(f: Mapping) -> str:
    """The finding worded as what is wrong (or nearly wrong) with the design.

    >>> breach_text(dict(quantity="valve port pressure", value=180.0, limit=210.0, unit="bar",
    ...                  margin=0.143, level="caution", statement=""))
    'Valve port pressure reaches 180 bar, within 14 % of the 210 bar limit'
    >>> breach_text(dict(quantity="smallest drop across the compensated valve", value=5.0, limit=8.0,
    ...                  unit="bar", margin=-0.375, level="fail", statement=""))
    'Smallest drop across the compensated valve falls to 5 bar, below the 8 bar limit'
    """
    what = (f.get("quantity") or f.get("statement") or f.get("rule_id") or "").strip().rstrip(".")
    what = what[:1].upper() + what[1:]
    value, limit, unit = f.get("value"), f.get("limit"), f.get("unit", "")
    if value is None:
        return f.get("statement", what)
    worse_up = _higher_is_worse(f)
    verb = "reaches" if worse_up else "falls to"
    text = f"{what} {verb} {_quantity(value, unit)}"
    if limit is None:
        return text
    margin = f.get("margin")
    if margin is None and value != limit and f.get("level") in ("fail", "caution"):
        # no margin stored (a rule whose limit is a reference, not a bound): say where it sits
        return f"{text}, {'above' if value > limit else 'below'} {_quantity(limit, unit)}"
    if margin is not None and margin < 0:
        side = "above" if worse_up else "below"
        return f"{text}, {side} the {_quantity(limit, unit)} limit"
    if margin is not None and margin == 0:
        return f"{text}, at the {_quantity(limit, unit)} limit"
    share = "" if margin is None else f"within {abs(margin) * 100:.2g} % of "
    return f"{text}, {share}the {_quantity(limit, unit)} limit"


def worst_case(f: Mapping) -> str:
    """Where the finding is worst, from its detail ("" when it says nothing of a case), with
    units as people write them (°C, not degC)."""
    return pretty_unit(str(f.get("detail") or "").strip())


@dataclass(frozen=True)
class VerdictItem:
    """One breach (or near breach) of the axis, as every screen shows it."""

    level: str
    text: str                 # worded as the breach
    case: str                 # where it is worst (the finding's detail)
    value: float | None
    limit: float | None
    unit: str
    margin: float | None
    source: str
    rule_ids: tuple           # every rule that found it, first the one whose words are shown
    studies: tuple            # every study that found it
    remedies: tuple = ()      # what a study proposes to change (its remedy findings' words)

    @property
    def found_by(self) -> str:
        """``"axis-check (P-ROD-RATING), rod-pressure (RP-ROD-CYLINDER)"``."""
        return ", ".join(f"{s} ({r})" for s, r in zip(self.studies, self.rule_ids))

    def to_line(self) -> str:
        """One plain-text line: level, breach, case, remedy, source, who found it."""
        case = f"; {self.case}" if self.case else ""
        case += "".join(f"; {r}" for r in self.remedies)
        margin = "" if self.margin is None else f"; margin {margin_text(self.margin)}"
        return (f"{self.level.upper():<8} {self.text}{margin}{case} [source: {self.source}; "
                f"found by {self.found_by}]")


def margin_text(m) -> str:
    """One margin format everywhere: signed percent, at most three significant digits.

    >>> margin_text(-0.2843), margin_text(0.0476), margin_text(None), margin_text(-78.2)
    ('-28.4 %', '+4.76 %', '–', '-7820 %')
    """
    if m is None:
        return "–"
    if abs(m) >= 10:  # a margin on a limit near zero: whole percent, never an exponent
        return f"{m * 100:+.0f} %"
    return f"{m * 100:+.3g} %"


@dataclass(frozen=True)
class Verdict:
    """The whole axis's verdict: counts by level and every fail and caution, once each."""

    items: tuple              # VerdictItem, fails first, then cautions
    counts: dict              # level -> number of distinct findings (after merging)
    passes: int = 0
    incomplete: tuple = ()    # (study, why) of studies that could not run on these inputs

    @property
    def level(self) -> str:
        if self.counts.get("fail"):
            return "fail"
        if self.counts.get("caution") or self.incomplete:
            return "caution"
        return "pass"

    def headline(self) -> str:
        """``"FAIL: 4 fail, 6 caution, 27 pass"``."""
        c = self.counts
        text = f"{self.level.upper()}: {c['fail']} fail, {c['caution']} caution, {c['pass']} pass"
        if self.incomplete:
            text += f"; {len(self.incomplete)} study not evaluated" if len(self.incomplete) == 1 else \
                f"; {len(self.incomplete)} studies not evaluated"
        return text

    def to_text(self) -> str:
        lines = [self.headline()]
        lines += ["  " + i.to_line() for i in self.items]
        lines += [f"  NOT RUN  {s}: {why}" for s, why in self.incomplete]
        return "\n".join(lines)

    def keys(self) -> list:
        """What identifies each item, for comparing two verdicts: (level, rule ids, value, limit)."""
        return [(i.level, i.rule_ids, _sig(i.value), _sig(i.limit)) for i in self.items]


def _merge_keys(f: Mapping) -> list:
    rules = SAME_BREACH.get(f["rule_id"], f["rule_id"])
    rules = (rules,) if isinstance(rules, str) else tuple(rules)
    # a pass and a fail of "the same" quantity are never one finding
    return [(rule, f.get("unit", ""), _sig(f.get("limit")), _sig(f.get("value")), f["level"]) for rule in rules]


def verdict(findings_by_study: Mapping[str, Iterable[Mapping]], incomplete: Iterable = ()) -> Verdict:
    """The verdict of the findings ``{study key: [finding, ...]}`` (in study order).

    Passing findings are counted (merged the same way) but not listed.
    """
    groups: dict = {}
    order: list = []
    for study, findings in findings_by_study.items():
        for f in findings:
            keys = _merge_keys(f)
            key = next((k for k in keys if k in groups), keys[0])
            if key not in groups:
                groups[key] = []
                order.append(key)
            groups[key].append((study, f))
    items, counts = [], {lvl: 0 for lvl in LEVELS}
    for key in order:
        members = groups[key]
        study0, f0 = members[0]
        counts[f0["level"]] += 1
        if f0["level"] == "pass":
            continue
        margins = [f["margin"] for _, f in members if f.get("margin") is not None]
        sources = list(dict.fromkeys(f.get("source", "") for _, f in members if f.get("source")))
        remedies = tuple(dict.fromkeys(f["statement"] for _, f in members[1:]
                                       if f["rule_id"].endswith("-REMEDY")))
        items.append(VerdictItem(
            level=f0["level"], text=breach_text(f0), case=worst_case(f0), value=f0.get("value"),
            limit=f0.get("limit"), unit=f0.get("unit", ""), margin=min(margins) if margins else None,
            source="; ".join(sources), rule_ids=tuple(f["rule_id"] for _, f in members),
            studies=tuple(s for s, _ in members), remedies=remedies))
    items.sort(key=lambda i: LEVELS.index(i.level))
    return Verdict(tuple(items), counts, counts["pass"], tuple(incomplete))


def record_verdict(record) -> Verdict:
    """The verdict of a :class:`~workbook.record.Record` (its studies in record order)."""
    return verdict({key: s.findings for key, s in record.studies.items()})


__all__ = ["verdict", "record_verdict", "Verdict", "VerdictItem", "breach_text", "margin_text", "number",
           "pretty_unit", "SAME_BREACH"]
