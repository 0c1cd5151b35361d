"""The escaping and the table structure of the review copies, character by character, through
the public exports (workbook.record.to_markdown / to_html).

Sources: CommonMark 0.31 (a backslash escapes any ASCII punctuation: \\ ` * _ [ ] | # ~ are
the ones that make emphasis, code, links, table cells, headings and strike-through); GitHub
Flavored Markdown (its "autolink extension" links bare www., scheme:// and a@b text); the
Python standard library's html.escape(quote=True) for & < > " '. The level words and marks
are the export module's documented ones: FAIL with a filled square, CAUTION with a triangle,
PASS with a ring (never colour alone).
"""

from __future__ import annotations

import html
import re

import pytest

from workbook.record import Record, Study, export, inputs_from_values, to_html, to_markdown


def _record(note="plain note", statement="a plain statement", source="common practice", level="pass",
            detail="", label="cap pressure"):
    finding = {"rule_id": "R-1", "statement": statement, "quantity": "q", "value": 240.0, "limit": 210.0,
               "unit": "bar", "margin": -0.14, "level": level, "source": source, "detail": detail}
    s = Study("rod-pressure", "Rod side", inputs=inputs_from_values({"cylinder": {"bore": 0.08}}),
              results={"p1": {"value": 17.9, "unit": "bar", "label": label}}, findings=[finding], notes=[note])
    return Record({"machine": "bin tipper", "axis": "tip", "author": "A", "date": "2026-12-02"}, {"s": s})


def _md_note(text):
    """How ``text`` comes out as a Markdown note line of the study."""
    md = to_markdown(_record(note=text))
    line = next(ln for ln in md.splitlines() if ln.startswith("- ") and "ZZ" in ln)
    return line[2:]


@pytest.mark.parametrize("ch", list("\\`*_[]|#~"))
def test_each_markdown_markup_character_is_escaped(ch):
    assert _md_note(f"ZZ{ch}ZZ") == f"ZZ\\{ch}ZZ"


@pytest.mark.parametrize("ch, entity", [("&", "&amp;"), ("<", "&lt;"), (">", "&gt;"), ('"', "&quot;"), ("'", "&#x27;")])
def test_html_characters_in_markdown_and_html(ch, entity):
    assert _md_note(f"ZZ{ch}ZZ") == f"ZZ{entity}ZZ"
    assert f"<li>ZZ{entity}ZZ</li>" in to_html(_record(note=f"ZZ{ch}ZZ"))


@pytest.mark.parametrize("text, out", [
    ("ZZ https://example.com", "ZZ https\\://example.com"),      # GFM autolink of a scheme
    ("ZZ www.example.com", "ZZ www\\.example.com"),               # GFM autolink of www.
    ("ZZ a@b.example", "ZZ a\\@b.example"),                       # GFM autolink of an address
    ("ZZ ratio 3:1, 12.5 bar @ 40 degC", "ZZ ratio 3:1, 12.5 bar @ 40 degC"),   # no link: left as it is
    ("ZZ Xylophone", "ZZ Xylophone"),
    ("ZZ one\r\ntwo\nthree\rfour", "ZZ one two three four"),      # a line break would end the table row
])
def test_links_and_line_breaks(text, out):
    assert _md_note(text) == out


def test_the_markdown_table_of_a_study():
    md = to_markdown(_record(statement="stays | within", source="ISO 4413"))
    lines = md.splitlines()
    i = lines.index("| Level | Check | Value | Limit | Margin | Source |")
    assert lines[i + 1] == "|---|---|---|---|---|---|"
    assert lines[i + 2] == "| \u25cb **PASS** | stays \\| within | 240 bar | 210 bar | -14 % | ISO 4413 |"
    assert lines[i + 3] == ""


@pytest.mark.parametrize("level, mark, word", [("fail", "\u25a0", "FAIL"), ("caution", "\u25b2", "CAUTION"),
                                               ("pass", "\u25cb", "PASS")])
def test_level_words_and_marks(level, mark, word):
    assert export.LEVEL_WORD[level] == word and export.LEVEL_MARK[level] == mark
    page = to_html(_record(level=level))
    assert (f'<span class="level level-{level}"><span class="mark" aria-hidden="true">{mark}</span>{word}</span>'
            in page)


def test_the_html_table_of_a_passing_check():
    page = to_html(_record(detail="worst at 40 degC"))
    row = re.search(r'<tr class="row-pass">(.*?)</tr>', page).group(1)
    cells = re.findall(r"<td( class=\"num\")?>(.*?)</td>", row)
    assert [bool(c) for c, _ in cells] == [False, False, True, True, True, False]
    assert cells[1][1] == '<span title="worst at 40 degC">a plain statement</span>'
    assert [c for _, c in cells[2:5]] == ["240 bar", "210 bar", "-14 %"]
    head = re.search(r"<thead><tr>(.*?)</tr></thead><tbody><tr class=\"row-pass\">", page).group(1)
    assert head == "".join(f"<th>{h}</th>" for h in ["Level", "Check", "Value", "Limit", "Margin", "Source"])


def test_a_source_is_shown_whole_and_escaped():
    long = "user's data sheet; ISO 4413 (no component above its rating) <b>"
    page = to_html(_record(level="fail", source=long))
    # the verdict shows the whole source, escaped
    assert f'<span class="meta">{html.escape(long, quote=True)}</span>' in page and "<b>" not in page
    short = "common practice"
    assert f'<span class="meta">{short}</span>' in to_html(_record(source=short))


def test_the_results_cards_escape_their_labels():
    page = to_html(_record(label="p<sub>1</sub> & more"))
    assert "p&lt;sub&gt;1&lt;/sub&gt; &amp; more" in page and "<sub>" not in page
    md = to_markdown(_record(label="p*1* & more"))
    assert "| p\\*1\\* &amp; more | 17.9 bar |" in md


@pytest.mark.parametrize("detail", ["", "worst <i>here</i>"])
def test_a_statement_with_markup_is_escaped_in_the_study_table(detail):
    # html.escape(quote=True) of the statement (and of the detail it carries on hover)
    page = to_html(_record(statement="p1 < 210 bar & <b>held</b>", detail=detail))
    assert "p1 &lt; 210 bar &amp; &lt;b&gt;held&lt;/b&gt;" in page
    assert "<b>" not in page and "<i>" not in page
