"""Every text that reaches an export is escaped, field by field: a hostile text put in one
field at a time must never reach the HTML review copy or the Markdown copy raw
(source: html.escape of the Python standard library; the HTML5 rule that ``<`` opens a tag)."""

from __future__ import annotations

import pytest

from workbook.record import Record, Study, inputs_from_values, to_html, to_markdown

HOSTILE = "<img src=x onerror=alert(1)>"


def _finding(**over):
    f = {"rule_id": "R-1", "statement": "a plain statement", "quantity": "rod pressure", "value": 240.0,
         "limit": 210.0, "unit": "bar", "margin": -0.14, "level": "fail", "source": "common practice",
         "detail": "a plain detail"}
    f.update(over)
    return f


def _record(where: str, level: str = "fail", detail: str = "a plain detail") -> Record:
    h = HOSTILE
    finding = _finding(**{"level": level, "detail": detail, **({where.split(".", 1)[1]: h} if where.startswith("finding.") else {})})
    results = {"p1": {"value": 17.9, "unit": h if where == "result.unit" else "bar",
                      "label": h if where == "result.label" else "cap pressure"}}
    fig = {"title": h if where == "figure.title" else "speed", "x_label": "load [kN]", "y_label": "speed [mm/s]",
           "x": [0.0, 1.0], "series": {(h if where == "figure.series" else "20 degC"): [1.0, 2.0]},
           "limits": {(h if where == "figure.limit" else "target"): 1.5}}
    s = Study("rod-pressure", h if where == "study.title" else "Rod side",
              inputs=inputs_from_values({"cylinder": {"bore": 0.08, "rod": 0.045}}),
              results=results, findings=[finding], figures={"f": fig},
              notes=[h] if where == "study.note" else ["plain note"])
    ident = {"machine": h if where == "identity.machine" else "bin tipper",
             "axis": h if where == "identity.axis" else "tip", "author": "A", "date": "2026-12-02"}
    return Record(ident, {"s": s}, notes=[h] if where == "record.note" else [])


FIELDS = ["finding.statement", "finding.detail", "finding.source", "finding.quantity", "finding.rule_id",
          "finding.unit", "result.label", "result.unit", "figure.title", "figure.series", "figure.limit",
          "study.title", "study.note", "identity.machine", "identity.axis", "record.note"]


@pytest.mark.parametrize("detail", ["a plain detail", ""])
@pytest.mark.parametrize("level", ["fail", "pass"])
@pytest.mark.parametrize("where", FIELDS)
def test_hostile_text_in_one_field_is_escaped_in_html(where, level, detail):
    try:
        page = to_html(_record(where, level, detail))
    except Exception as exc:  # a refusal of the hostile text is also safe, but must be an input error
        from workbook.errors import InputError
        from workbook.record import RecordError
        assert isinstance(exc, (InputError, RecordError, ValueError)), exc
        return
    assert HOSTILE not in page
    assert "<img" not in page.lower()


@pytest.mark.parametrize("level", ["fail", "pass"])
@pytest.mark.parametrize("where", FIELDS)
def test_hostile_text_in_one_field_is_escaped_in_markdown(where, level):
    try:
        text = to_markdown(_record(where, level))
    except Exception as exc:
        from workbook.errors import InputError
        from workbook.record import RecordError
        assert isinstance(exc, (InputError, RecordError, ValueError)), exc
        return
    assert HOSTILE not in text
    assert "<img" not in text.lower()


def test_the_statement_reaches_the_html_escaped():
    # the field-by-field test must see the text at all: a passing check's statement is listed
    # in its study's table, escaped (html.escape); a fail is worded as its breach in the verdict
    import html
    page = to_html(_record("finding.statement", "pass"))
    assert html.escape(HOSTILE, quote=True) in page
