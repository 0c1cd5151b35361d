"""Review forms of a record: Markdown and self-contained HTML.

Both show, in this order: the identity, the caution (:data:`workbook.CAUTION`), the verdict
of the whole axis (:mod:`workbook.record.verdict`: counts by level, then every fail and every
caution worded as the breach, with its worst case, value, limit, margin, source and the
studies that found it: the same list the panels and ``axisbook evaluate`` show), the axis
inputs once (grouped by catalogue section, with units), then every study with its own
settings, results, findings (level, value, limit, margin and source), figures and notes, and
last the record's own notes.

The HTML needs nothing else to open: styles are inline, figures are inline SVG drawn from
the stored curve data, there is no script, font or link to fetch, and a print stylesheet
keeps tables and figures whole on paper. Every piece of text that a person typed is
escaped (``html.escape(..., quote=True)``). A finding's level is a word and a mark
(``FAIL`` with a filled square, ``CAUTION`` with a triangle, ``PASS`` with a ring), never
colour alone.

>>> from workbook.record import Record
>>> page = to_html(Record({"machine": "<BT-2>", "axis": "lift"}))
>>> "&lt;BT-2&gt;" in page and "<BT-2>" not in page
True
"""

from __future__ import annotations

import html
import re
from pathlib import Path

from .. import CAUTION
from ..formatting import number, pretty_unit
from ..inputs import BY_KEY, SECTIONS
from .model import LEVELS, Record, Study
from .store import atomic_write_text
from .svg import ACCENT, line_chart
from .verdict import margin_text, record_verdict

LEVEL_WORD = {"fail": "FAIL", "caution": "CAUTION", "pass": "PASS"}
LEVEL_MARK = {"fail": "\u25a0", "caution": "\u25b2", "pass": "\u25cb"}  # filled square, triangle, ring


def _esc(text) -> str:
    return html.escape(str(text), quote=True)


def _num(v, digits: int = 6) -> str:
    """The review copy's numbers: :func:`workbook.formatting.number` with a blank where missing."""
    return number(v, digits, missing="")


def _unused_sections(record: Record) -> list[str]:
    """Titles of the input sections of ``record`` that only a study absent from it uses (the
    motion inputs of a record without the axis-motion study)."""
    kinds = {s.kind for s in record.studies.values()}
    return [sec.title for sec in SECTIONS if sec.only_for and sec.only_for not in kinds and record.inputs.get(sec.key)]


def _input_rows(inputs, skip: tuple[str, ...] = ()):
    """(section title, [(label, key, value text, unit)]) in catalogue order (an axis without
    a holding valve shows only its kind: the valve's settings are not part of the design);
    sections titled in ``skip`` are left out."""
    order = [s.key for s in SECTIONS] + [k for k in inputs if k not in BY_KEY]
    for sec_key in order:
        entries = inputs.get(sec_key)
        sec = BY_KEY.get(sec_key)
        if not entries or (sec and sec.title in skip):
            continue
        rows = []
        if sec_key == "holding" and entries.get("kind", {}).get("value") == "none":
            entries = {"kind": entries["kind"]}
        for key, entry in entries.items():
            try:
                label = sec[key].label if sec else key
            except KeyError:
                label = key
            value = entry.get("value")
            rows.append((label, key, "(not given)" if value is None else _num(value),
                         pretty_unit(entry.get("unit", ""))))
        yield (sec.title if sec else sec_key), rows


def _inputs_lead(skipped: list[str]) -> str:
    text = "Every study of this record ran on these inputs."
    if skipped:
        text += (" Not shown: " + ", ".join(skipped) + " (kept in the JSON record; the study that uses "
                 "them is not in this record).")
    return text


def _counts(record: Record) -> dict:
    """Distinct findings by level (one breach found by two studies counts once)."""
    return dict(record_verdict(record).counts)


def _verdict_rows(record: Record):
    """(level, breach, worst case, value, limit, margin, source, found by) of every fail and caution."""
    for item in record_verdict(record).items:
        unit = pretty_unit(item.unit)
        case = "; ".join(p for p in (item.case, *item.remedies) if p)
        value = "" if item.value is None else f"{_num(item.value, 4)} {unit}".strip()
        limit = "" if item.limit is None else f"{_num(item.limit, 4)} {unit}".strip()
        yield (item.level, item.text, case, value, limit,
               "" if item.margin is None else margin_text(item.margin), item.source, item.found_by)


# ---------------------------------------------------------------------------- Markdown
#: what a Markdown renderer would turn into a link by itself (GFM autolinks): a scheme's
#: colon before "//", the dot after "www", the "@" of an address; each is escaped
_AUTOLINK = re.compile(r"(?i)(?<=[a-z0-9+.-])(:)(?=//)|(?<=\bwww)(\.)|(?<=[a-z0-9._%+-])(@)(?=[a-z0-9-])")


def _md(text) -> str:
    """Escape text for a Markdown table cell or line: HTML-escaped, markup characters escaped,
    and bare addresses kept as text (``https\\://``, ``www\\.``, ``a\\@b``), never made links.

    >>> _md("see https://example.com or www.example.com, mail a@b.example")
    'see https\\\\://example.com or www\\\\.example.com, mail a\\\\@b.example'
    """
    out = str(text)
    for ch in "\\`*_[]|#~":
        out = out.replace(ch, "\\" + ch)
    out = _AUTOLINK.sub(lambda m: "\\" + m.group(0), out)
    out = html.escape(out, quote=True)
    return out.replace("\r\n", " ").replace("\n", " ").replace("\r", " ")


def _md_table(head, rows) -> list[str]:
    lines = ["| " + " | ".join(head) + " |", "|" + "|".join("---" for _ in head) + "|"]
    lines += ["| " + " | ".join(r) + " |" for r in rows]
    return lines + [""]


def to_markdown(record: Record) -> str:
    """The record as Markdown text."""
    ident = record.identity
    out = [f"# Design record: {_md(ident.get('machine', ''))}, axis {_md(ident.get('axis', ''))}", "",
           f"> **{_md(CAUTION)}**", ""]
    rows = [[_md(BY_KEY["identity"][k].label), _md(v)] for k, v in ident.items()]
    rows += [["Library version", _md(record.library_version)], ["Schema version", str(record.schema_version)]]
    out += _md_table(["Identity", ""], rows)
    c = _counts(record)
    out += ["## Verdict of the axis", "",
            "Findings: " + ", ".join(f"{c[lvl]} {LEVEL_WORD[lvl]}" for lvl in LEVELS), ""]
    vrows = [[f"{LEVEL_MARK[lvl]} **{LEVEL_WORD[lvl]}**", _md(text) + (f" ({_md(case)})" if case else ""),
              _md(value), _md(limit), _md(margin), _md(source), _md(found)]
             for lvl, text, case, value, limit, margin, source, found in _verdict_rows(record)]
    if vrows:
        out += _md_table(["Level", "Breach", "Value", "Limit", "Margin", "Source", "Found by"], vrows)
    if record.inputs:
        skipped = _unused_sections(record)
        out += ["## Design inputs", "", _md(_inputs_lead(skipped)), ""]
        for title, rows in _input_rows(record.inputs, tuple(skipped)):
            out += [f"**{_md(title)}**", ""]
            out += _md_table(["Input", "Value"], [[_md(lbl), f"{_md(v)} {_md(u)}".strip()] for lbl, _k, v, u in rows])
    for n, (key, study) in enumerate(record.studies.items(), 1):
        out += [f"## {n}. {_md(study.title or study.kind)}", ""]
        if study.inputs:
            settings = [f"{_md(lbl)} {_md(v)} {_md(u)}".strip() for _t, rows in _input_rows(study.inputs)
                        for lbl, _k, v, u in rows]
            out += ["**Study settings:** " + "; ".join(settings), ""]
        if study.results:
            out += ["### Results", ""]
            out += _md_table(["Result", "Value"],
                             [[_md(r["label"]), f"{_num(r['value'], 4)} {_md(pretty_unit(r['unit']))}".strip()]
                              for r in study.results.values()])
        if study.findings:
            out += ["### Checks of this study", ""]
            rows = []
            for f in study.findings:
                unit = _md(pretty_unit(f["unit"]))
                rows.append([f"{LEVEL_MARK[f['level']]} **{LEVEL_WORD[f['level']]}**", _md(f["statement"]),
                             f"{_num(f['value'], 4)} {unit}".strip() if f["value"] is not None else "",
                             f"{_num(f['limit'], 4)} {unit}".strip() if f["limit"] is not None else "",
                             margin_text(f["margin"]) if f["margin"] is not None else "", _md(f["source"])])
            out += _md_table(["Level", "Check", "Value", "Limit", "Margin", "Source"], rows)
        if study.figures:
            out += ["### Figures", ""]
            for name, fig in study.figures.items():
                series = ", ".join(_md(s) for s in fig["series"]) or "no series"
                limits = "; ".join(f"{_md(k)} = {_num(v, 5)}" for k, v in fig["limits"].items())
                out.append(f"- **{_md(fig['title'])}**: {_md(fig['y_label'])} against {_md(fig['x_label'])}, "
                           f"{len(fig['x'])} points; series: {series}" + (f"; limits: {limits}" if limits else "")
                           + " (drawn in the HTML export)")
            out.append("")
        if study.notes:
            out += ["### Notes", ""] + [f"- {_md(t)}" for t in study.notes] + [""]
    if record.notes:
        out += ["## Record notes", ""] + [f"- {_md(t)}" for t in record.notes] + [""]
    out += [f"_Written by workbook {_md(record.library_version)}, record schema version "
            f"{record.schema_version}._", ""]
    return "\n".join(out)


def export_markdown(record: Record, path) -> Path:
    """Write :func:`to_markdown` to ``path`` atomically."""
    return atomic_write_text(path, to_markdown(record))


# ---------------------------------------------------------------------------- HTML
_CSS = f"""
:root {{ --accent: {ACCENT}; }}
* {{ box-sizing: border-box; }}
body {{ margin: 1.2rem auto; max-width: 90rem; padding: 0 1rem; color: #000; background: #fff;
  font: 13.5px/1.3 system-ui, -apple-system, "Segoe UI", Roboto, Helvetica, Arial, sans-serif; }}
h1 {{ font-size: 1.6rem; margin: 0 0 .8rem; border-bottom: 3px solid var(--accent); padding-bottom: .3rem; }}
h2 {{ font-size: 1.2rem; margin: 1.2rem 0 .3rem; border-bottom: 1px solid #000; }}
h3 {{ font-size: 1.02rem; margin: 1.2rem 0 .3rem; color: var(--accent); }}
h4 {{ font-size: .95rem; margin: .8rem 0 .2rem; }}
.caution {{ border: 2px solid #000; border-left: 10px solid var(--accent); padding: .6rem .9rem;
  margin: 0 0 1.2rem; font-weight: 600; }}
table {{ border-collapse: collapse; margin: .2rem 0 .8rem; width: 100%; }}
th, td {{ text-align: left; vertical-align: top; padding: .15rem .5rem; border-bottom: 1px solid #ccc; }}
th {{ border-bottom: 2px solid #000; font-weight: 600; }}
td.num {{ text-align: right; font-variant-numeric: tabular-nums; white-space: nowrap; }}
code {{ font-family: ui-monospace, Menlo, Consolas, monospace; font-size: .9em; }}
.level {{ font-weight: 700; white-space: nowrap; }}
.level .mark {{ display: inline-block; width: 1.1em; }}
.level-fail {{ color: #000; }}
.level-caution {{ color: #000; }}
.level-pass {{ color: #333; font-weight: 600; }}
tr.row-fail td {{ background: #f3f3f3; }}
.cards {{ display: grid; grid-template-columns: repeat(auto-fill, minmax(21rem, 1fr)); gap: .2rem 1.2rem;
  align-items: start; }}
.cards h4 {{ margin: .4rem 0 0; }}
.cards.two {{ grid-template-columns: 1fr 1fr; }}
.cards table {{ margin: 0; }}
.figures {{ display: grid; grid-template-columns: repeat(auto-fill, minmax(27rem, 1fr)); gap: .4rem 1rem; }}
table.verdict td:nth-child(2) {{ min-width: 24rem; }}
.settings {{ margin: .2rem 0 .4rem; }}
abbr.source {{ text-decoration: none; border-bottom: 1px dotted #666; cursor: help; }}
.source {{ white-space: nowrap; }}
.summary span {{ margin-right: 1.2rem; }}
.meta {{ color: #444; font-size: .88rem; }}
figure {{ margin: .3rem 0 .6rem; }}
figcaption {{ font-weight: 600; margin-bottom: .2rem; }}
svg.chart {{ max-width: 100%; height: auto; font-family: inherit; }}
footer {{ margin-top: 2.5rem; border-top: 1px solid #000; padding-top: .4rem; font-size: .85rem; }}
@media print {{
  @page {{ margin: 15mm; }}
  body {{ margin: 0; max-width: none; font-size: 10.5pt; }}
  h2 {{ break-after: avoid; }}
  h3, h4 {{ break-after: avoid; }}
  table, figure, .caution {{ break-inside: avoid; }}
  section.study {{ break-before: page; }}
  tr.row-fail td {{ background: none; }}
}}
"""


def _table(head, rows, num_cols=(), row_classes=None, cls="") -> str:
    table_attr = f' class="{cls}"' if cls else ""
    out = [f"<table{table_attr}><thead><tr>" + "".join(f"<th>{h}</th>" for h in head) + "</tr></thead><tbody>"]
    for i, row in enumerate(rows):
        row_attr = f' class="{row_classes[i]}"' if row_classes else ""
        cells = "".join(f'<td class="num">{c}</td>' if j in num_cols else f"<td>{c}</td>" for j, c in enumerate(row))
        out.append(f"<tr{row_attr}>{cells}</tr>")
    out.append("</tbody></table>")
    return "".join(out)


def _level_html(level: str) -> str:
    return (f'<span class="level level-{level}"><span class="mark" aria-hidden="true">{LEVEL_MARK[level]}</span>'
            f"{LEVEL_WORD[level]}</span>")


def _source_html(source: str, limit: int = 40) -> str:
    """A source, shortened to ``limit`` characters on screen with the full text on hover
    (and in print, where the whole text is shown)."""
    if len(source) <= limit:
        return f'<span class="source">{_esc(source)}</span>'
    short = source[:limit].rsplit(" ", 1)[0].rstrip(";,(") + " …"
    return f'<abbr class="source" title="{_esc(source)}">{_esc(short)}</abbr>'


def _cards(rows_by_section) -> str:
    out = ['<div class="cards">']
    for title, rows in rows_by_section:
        out.append(f"<div><h4>{_esc(title)}</h4>")
        out.append(_table(["Input", "Value"], [[_esc(lbl), f"{_esc(v)} {_esc(u)}".strip()] for lbl, _k, v, u in rows],
                          num_cols=(1,), cls="inputs"))
        out.append("</div>")
    out.append("</div>")
    return "".join(out)


def _study_html(n: int, key: str, study: Study) -> str:
    out = [f'<section class="study" id="study-{n}">', f"<h2>{n}. {_esc(study.title or study.kind)}</h2>"]
    if study.inputs:
        settings = [f"{_esc(lbl)} {_esc(v)} {_esc(u)}".strip() for _t, rows in _input_rows(study.inputs)
                    for lbl, _k, v, u in rows]
        out.append(f'<p class="settings"><b>Study settings:</b> {"; ".join(settings)}</p>')
    if study.results:
        rows = [[_esc(r["label"]), f"{_esc(_num(r['value'], 4))} {_esc(pretty_unit(r['unit']))}".strip()]
                for r in study.results.values()]
        half = (len(rows) + 1) // 2
        out.append('<h3>Results</h3><div class="cards two">'
                   + "".join(f"<div>{_table(['Result', 'Value'], part, num_cols=(1,))}</div>"
                             for part in (rows[:half], rows[half:]) if part) + "</div>")
    if study.findings:
        flagged = [f for f in study.findings if f["level"] != "pass"]
        passed = [f for f in study.findings if f["level"] == "pass"]
        out.append("<h3>Checks of this study</h3>")
        if flagged:
            out.append('<p class="meta">Fails and cautions, in the verdict above with their worst case: '
                       + ", ".join(f"{_level_html(f['level'])} <code>{_esc(f['rule_id'])}</code>" for f in flagged)
                       + ". The checks that pass:</p>")
        rows, classes = [], []
        for f in passed:
            unit = _esc(pretty_unit(f["unit"]))
            # the worst case of a fail or caution is in the verdict above; a pass needs none
            statement = f'<span title="{_esc(f["detail"])}">{_esc(f["statement"])}</span>' if f["detail"] \
                else _esc(f["statement"])
            rows.append([_level_html(f["level"]), statement,
                         f"{_esc(_num(f['value'], 4))} {unit}".strip() if f["value"] is not None else "",
                         f"{_esc(_num(f['limit'], 4))} {unit}".strip() if f["limit"] is not None else "",
                         _esc(margin_text(f["margin"]) if f["margin"] is not None else ""),
                         f'<span class="meta">{_esc(f["source"])}</span>'])
            classes.append(f"row-{f['level']}")
        if rows:
            out.append(_table(["Level", "Check", "Value", "Limit", "Margin", "Source"], rows,
                              num_cols=(2, 3, 4), row_classes=classes))
    if study.figures:
        out.append('<div class="figures">')
        for fig in study.figures.values():
            out.append(f"<figure><figcaption>{_esc(fig['title'])}</figcaption>{line_chart(fig)}</figure>")
        out.append("</div>")
    if study.notes:
        out.append("<h3>Notes</h3><ul>" + "".join(f"<li>{_esc(t)}</li>" for t in study.notes) + "</ul>")
    out.append("</section>")
    return "\n".join(out)


def to_html(record: Record) -> str:
    """The record as one self-contained HTML page (no script, no external reference)."""
    ident = record.identity
    heading = f"Design record: {_esc(ident.get('machine', ''))}, axis {_esc(ident.get('axis', ''))}"
    ident_rows = [[_esc(BY_KEY["identity"][k].label), _esc(v)] for k, v in ident.items()]
    ident_rows += [["Library version", _esc(record.library_version)], ["Schema version", str(record.schema_version)]]
    c = _counts(record)
    summary = "".join(f"<span>{_level_html(lvl)} {c[lvl]}</span>" for lvl in LEVELS)
    vrows, vclasses = [], []
    for lvl, text, case, value, limit, margin, source, found in _verdict_rows(record):
        breach = _esc(text) + (f'<br><span class="meta">{_esc(case)}</span>' if case else "")
        vrows.append([_level_html(lvl), breach, _esc(value), _esc(limit), _esc(margin),
                      f'<span class="meta">{_esc(source)}</span>', f'<span class="meta">{_esc(found)}</span>'])
        vclasses.append(f"row-{lvl}")
    verdict_html = ['<section class="verdict" id="verdict"><h2>Verdict of the axis</h2>',
                    f'<p class="summary">Findings: {summary}</p>',
                    '<p class="meta">Every fail and caution of the axis, once each, worded as the breach with its '
                    "worst case; each study below lists its own checks again with their margins.</p>"]
    if vrows:
        verdict_html.append(_table(["Level", "Breach", "Value", "Limit", "Margin", "Source", "Found by"], vrows,
                                   num_cols=(2, 3, 4), row_classes=vclasses, cls="verdict"))
    else:
        verdict_html.append("<p>No finding fails or needs caution.</p>")
    verdict_html.append("</section>")
    inputs_html = []
    if record.inputs:
        inputs_html = ['<section class="inputs" id="inputs"><h2>Design inputs</h2>',
                       f"<p>{_esc(_inputs_lead(_unused_sections(record)))}</p>",
                       _cards(_input_rows(record.inputs, tuple(_unused_sections(record)))), "</section>"]
    parts = [
        "<!DOCTYPE html>",
        '<html lang="en"><head><meta charset="utf-8">',
        '<meta name="viewport" content="width=device-width, initial-scale=1">',
        f"<title>{heading}</title>",
        f"<style>{_CSS}</style></head><body>",
        f"<header><h1>{heading}</h1>",
        f'<p class="caution" role="note">{_esc(CAUTION)}</p>',
        '<p class="meta identity">' + " &middot; ".join(f"{lbl}: {val}" for lbl, val in ident_rows) + "</p>",
        "</header>",
        "<main>", *verdict_html, *inputs_html,
    ]
    parts += [_study_html(n, key, s) for n, (key, s) in enumerate(record.studies.items(), 1)]
    if record.notes:
        parts.append("<section><h2>Record notes</h2><ul>" + "".join(f"<li>{_esc(t)}</li>" for t in record.notes)
                     + "</ul></section>")
    parts += ["</main>",
              f"<footer>Written by workbook {_esc(record.library_version)}, record schema version "
              f"{record.schema_version}. {_esc(CAUTION)}</footer>",
              "</body></html>", ""]
    return "\n".join(parts)


def export_html(record: Record, path) -> Path:
    """Write :func:`to_html` to ``path`` atomically; return the path."""
    return atomic_write_text(path, to_html(record))


__all__ = ["to_markdown", "to_html", "export_html", "export_markdown", "pretty_unit", "LEVEL_WORD", "LEVEL_MARK"]
