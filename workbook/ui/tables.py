"""Results table, findings list and caution banner as HTML widgets that update in place.

Both render the record's own forms (see :mod:`workbook.record`): a result is
``{"value": number, "unit": "mm/s", "label": "Speed, cold oil"}`` and a finding is a
mapping with ``rule_id, statement, quantity, value, limit, unit, margin, level, source,
detail``. Levels are shown as a word and a mark, never by colour alone.
"""

from __future__ import annotations

import html
from typing import Iterable, Mapping

import ipywidgets as W

from .. import CAUTION
from ..formatting import number

LEVEL_MARK = {"fail": "&#10007; FAIL", "caution": "&#9650; CAUTION", "pass": "&#10003; PASS"}
LEVEL_STYLE = {
    "fail": "background:#fde7e9;color:#8a0010;font-weight:bold",
    "caution": "background:#fff4d6;color:#6b4a00;font-weight:bold",
    "pass": "color:#1d5c2e",
}
STALE_NOTE = ("<div class='wb-stale-note' style='color:#8a0010;font-weight:bold'>"
              "&#9888; Out of date: an entry above was not accepted, so these are the last valid "
              "results.</div>")


def caution_html() -> str:
    return ("<div class='wb-caution' style='border-left:4px solid #8a0010;padding:4px 10px;"
            f"background:#fafafa'>{html.escape(CAUTION)}</div>")


_CELL = "padding:2px 10px 2px 6px;vertical-align:top;text-align:left"
_NUM = _CELL + ";text-align:right;font-family:monospace;white-space:nowrap"


def source_html(source: str, limit: int = 40) -> str:
    """A source on screen: shortened to ``limit`` characters, the whole text on hover."""
    text = str(source)
    if len(text) <= limit:
        return html.escape(text)
    short = text[:limit].rsplit(" ", 1)[0].rstrip(";,(") + " …"
    return f"<span title='{html.escape(text, quote=True)}' style='border-bottom:1px dotted #888'>{html.escape(short)}</span>"


def results_html(results: Mapping[str, Mapping], title: str = "Results") -> str:
    from ..record.verdict import pretty_unit

    rows = "".join(
        f"<tr><td style='{_CELL}'>{html.escape(str(r.get('label', key)))}</td>"
        f"<td style='{_NUM}'>{html.escape(number(r.get('value')))}</td>"
        f"<td style='{_CELL}'>{html.escape(pretty_unit(str(r.get('unit', ''))))}</td></tr>"
        for key, r in results.items()
    )
    return (f"<div class='wb-results'><b>{html.escape(title)}</b>"
            "<table style='border-collapse:collapse;min-width:36em;line-height:1.35'>"
            f"<tr><th style='{_CELL};text-align:left'>Quantity</th><th style='{_CELL}'>Value</th>"
            f"<th style='{_CELL}'>Unit</th></tr>"
            f"{rows}</table></div>")


def findings_html(findings: Iterable[Mapping], title: str = "Checks") -> str:
    from ..record.verdict import margin_text, pretty_unit

    items = list(findings)
    counts = {lvl: sum(1 for f in items if f.get("level") == lvl) for lvl in ("fail", "caution", "pass")}
    head = (f"<b>{html.escape(title)}</b>: {counts['fail']} fail, {counts['caution']} caution, "
            f"{counts['pass']} pass")
    rows = []
    for f in items:
        lvl = f.get("level", "pass")
        margin = f.get("margin")
        margin_shown = "–" if margin is None else margin_text(margin)
        unit = html.escape(pretty_unit(str(f.get("unit", ""))))
        value = "" if f.get("value") is None else f"{html.escape(number(f.get('value')))} {unit}"
        limit = "" if f.get("limit") is None else f"{html.escape(number(f.get('limit')))} {unit}"
        rows.append(
            f"<tr class='wb-finding wb-level-{lvl}'>"
            f"<td style='{LEVEL_STYLE.get(lvl, '')};{_CELL};white-space:nowrap'>{LEVEL_MARK.get(lvl, lvl)}</td>"
            f"<td style='{_CELL};white-space:nowrap'><code>{html.escape(str(f.get('rule_id', '')))}</code></td>"
            f"<td style='{_CELL};min-width:22em'>{html.escape(str(f.get('statement', '')))}"
            + (f"<br><span style='color:#555;font-size:92%'>{html.escape(pretty_unit(str(f['detail'])))}</span>"
               if f.get("detail") else "")
            + "</td>"
            f"<td style='{_NUM}'>{value}</td>"
            f"<td style='{_NUM}'>{limit}</td>"
            f"<td style='{_NUM}'>{html.escape(margin_shown)}</td>"
            f"<td style='{_CELL};color:#444;font-size:92%;min-width:12em'>{source_html(f.get('source', ''))}</td></tr>"
        )
    return (f"<div class='wb-findings'>{head}<table style='border-collapse:collapse;width:100%;line-height:1.35'>"
            f"<tr><th style='{_CELL}'>Level</th><th style='{_CELL}'>Rule</th><th style='{_CELL};text-align:left'>"
            f"Check</th><th style='{_CELL}'>Value</th><th style='{_CELL}'>Limit</th><th style='{_CELL}'>Margin</th>"
            f"<th style='{_CELL};text-align:left'>Source</th></tr>"
            + "".join(rows) + "</table></div>")


def verdict_html(v, title: str = "Whole axis") -> str:
    """The whole axis's verdict (:class:`workbook.record.verdict.Verdict`): the counts, then
    every fail and caution worded as the breach, its worst case, margin, source and the
    studies that found it; studies that could not run on these inputs are named."""
    from ..record.verdict import margin_text

    lvl = v.level
    c = v.counts
    head = (f"<div class='wb-verdict-head' style='{LEVEL_STYLE.get(lvl, '')};padding:3px 8px'>"
            f"<span class='wb-verdict-level'>{LEVEL_MARK.get(lvl, lvl)}</span> "
            f"<b>{html.escape(title)}</b>: <span class='wb-verdict-counts'>{c['fail']} fail, "
            f"{c['caution']} caution, {c['pass']} pass</span>"
            "<span style='font-weight:normal'> (every study of this axis at the inputs below; the same "
            "findings as the record and <code>axisbook evaluate</code>)</span></div>")
    rows = []
    for item in v.items:
        case = (f"<br><span style='color:#555;font-size:90%'>{html.escape(item.case)}</span>"
                if item.case else "")
        case += "".join(f"<br><span style='color:#1d3f5c;font-size:90%'>{html.escape(r)}</span>"
                        for r in item.remedies)
        rows.append(
            f"<tr class='wb-verdict-item wb-level-{item.level}' data-rules='{html.escape(' '.join(item.rule_ids))}'>"
            f"<td style='{LEVEL_STYLE.get(item.level, '')};white-space:nowrap;padding:2px 6px;text-align:left'>"
            f"{LEVEL_MARK.get(item.level, item.level)}</td>"
            f"<td style='padding:2px 6px;text-align:left'>{html.escape(item.text)}{case}</td>"
            f"<td style='text-align:right;white-space:nowrap;padding:2px 6px;text-align:right'>{html.escape(margin_text(item.margin))}</td>"
            f"<td style='color:#444;padding:2px 6px;font-size:90%;text-align:left'>{source_html(item.source)}<br>"
            f"<span style='color:#666'>found by {html.escape(item.found_by)}</span></td></tr>")
    for study, why in v.incomplete:
        rows.append(f"<tr class='wb-verdict-item wb-level-notrun'><td style='{LEVEL_STYLE['fail']};padding:2px 6px;text-align:left'>"
                    f"&#9888; NOT RUN</td><td colspan='3' style='padding:2px 6px;text-align:left'>The {html.escape(study)} study "
                    f"refuses these inputs: {html.escape(why)}</td></tr>")
    table = ""
    if rows:
        table = ("<table style='border-collapse:collapse;width:100%;font-size:92%;line-height:1.3'>"
                 "<tr><th>Level</th><th style='text-align:left'>Breach and worst case</th><th>Margin</th>"
                 "<th style='text-align:left'>Source</th></tr>" + "".join(rows) + "</table>")
    return f"<div class='wb-verdict'>{head}{table}</div>"


def differences_html(rows, title: str, empty: str = "") -> str:
    """A table of inputs that differ: ``rows`` of (label, section title, first text, second text),
    with ``title`` naming the two columns as ``(heading, first, second)``."""
    heading, first, second = title
    if not rows:
        return f"<div class='wb-differences wb-none' style='color:#555'>{html.escape(empty)}</div>" if empty else ""
    body = "".join(
        f"<tr class='wb-difference'><td style='padding:1px 8px'>{html.escape(lbl)}"
        f"<span style='color:#666'> ({html.escape(sec)})</span></td>"
        f"<td style='padding:1px 8px;font-family:monospace;text-align:left'>{html.escape(a)}</td>"
        f"<td style='padding:1px 8px;font-family:monospace;text-align:left'>{html.escape(b)}</td></tr>"
        for lbl, sec, a, b in rows)
    return (f"<div class='wb-differences'><b>{html.escape(heading)}</b>"
            f"<table style='border-collapse:collapse'><tr><th style='text-align:left;padding:1px 8px'>Input</th>"
            f"<th style='text-align:left;padding:1px 8px'>{html.escape(first)}</th>"
            f"<th style='text-align:left;padding:1px 8px'>{html.escape(second)}</th></tr>{body}</table></div>")


class HtmlBox:
    """An HTML widget with a stale flag; :meth:`update` replaces its content in place."""

    def __init__(self, css_class: str):
        self.widget = W.HTML("")
        self.widget.add_class(css_class)
        self._body = ""
        self.stale = False

    def update(self, body: str) -> None:
        self._body = body
        self.stale = False
        self.widget.value = body

    def mark_stale(self, stale: bool = True) -> None:
        self.stale = stale
        self.widget.value = (STALE_NOTE + f"<div style='opacity:0.55'>{self._body}</div>") if stale else self._body


__all__ = ["results_html", "findings_html", "caution_html", "verdict_html", "source_html", "differences_html", "HtmlBox", "number",
           "LEVEL_MARK"]
