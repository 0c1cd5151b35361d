"""The panels' level marks and counts, read back from the HTML they render and compared with
the findings they were given (by hand: each finding's row carries the word of its own level
and no other; the counts are the number of findings of each level)."""

from __future__ import annotations

import re

import pytest

from workbook.record.verdict import verdict
from workbook.ui.tables import findings_html, verdict_html

WORD = {"fail": "FAIL", "caution": "CAUTION", "pass": "PASS"}
# the mark of each level: U+2717 ballot x, U+25B2 triangle, U+2713 check mark (as entities)
MARK = {"fail": "&#10007;", "caution": "&#9650;", "pass": "&#10003;"}


def _f(rule_id, level, value, limit, margin):
    return {"rule_id": rule_id, "statement": f"statement {rule_id}", "quantity": f"quantity {rule_id}",
            "value": value, "limit": limit, "unit": "bar", "margin": margin, "level": level,
            "source": "common practice", "detail": ""}


FINDINGS = [_f("A-FAIL", "fail", 267.0, 210.0, -0.271), _f("B-FAIL", "fail", 230.0, 210.0, -0.095),
            _f("C-CAUT", "caution", 200.0, 210.0, 0.048), _f("D-PASS", "pass", 100.0, 210.0, 0.52),
            _f("E-PASS", "pass", 90.0, 210.0, 0.57), _f("F-PASS", "pass", 80.0, 210.0, 0.62)]


def _rows(page):
    return re.findall(r"<tr class='wb-finding wb-level-(\w+)'>(.*?)</tr>", page, flags=re.S)


@pytest.mark.parametrize("order", [FINDINGS, FINDINGS[::-1]])
def test_every_finding_row_shows_its_own_level_mark(order):
    page = findings_html(order)
    rows = _rows(page)
    assert len(rows) == len(order)
    for f, (cls, body) in zip(order, rows):
        assert cls == f["level"]
        first_cell = re.search(r"<td[^>]*>(.*?)</td>", body, flags=re.S).group(1)
        assert first_cell == f"{MARK[f['level']]} {WORD[f['level']]}", f["rule_id"]
        for other in set(WORD) - {f["level"]}:
            assert WORD[other] not in first_cell
        assert f"<code>{f['rule_id']}</code>" in body
        assert f"{f['value']:.4g} bar" in body and f"{f['limit']:.4g} bar" in body


def test_the_findings_head_counts_each_level():
    page = findings_html(FINDINGS, title="Checks")
    assert "<b>Checks</b>: 2 fail, 1 caution, 3 pass" in page
    assert "<b>Checks</b>: 0 fail, 0 caution, 1 pass" in findings_html(FINDINGS[3:4], title="Checks")


def test_the_verdict_head_and_items_carry_the_worst_level_and_counts():
    v = verdict({"axis-check": FINDINGS})
    page = verdict_html(v)
    head = re.search(r"<span class='wb-verdict-level'>(.*?)</span>", page).group(1)
    assert head == f"{MARK['fail']} FAIL"
    counts = re.search(r"<span class='wb-verdict-counts'>(.*?)</span>", page).group(1)
    assert counts == "2 fail, 1 caution, 3 pass"
    items = re.findall(r"<tr class='wb-verdict-item wb-level-(\w+)' data-rules='([^']*)'>\s*<td[^>]*>(.*?)</td>",
                       page, flags=re.S)
    assert [(lvl, rules) for lvl, rules, _ in items] == [("fail", "A-FAIL"), ("fail", "B-FAIL"), ("caution", "C-CAUT")]
    for lvl, _, cell in items:
        assert cell == f"{MARK[lvl]} {WORD[lvl]}"


def test_a_verdict_with_only_cautions_is_marked_caution():
    v = verdict({"axis-check": FINDINGS[2:]})
    page = verdict_html(v)
    assert re.search(r"<span class='wb-verdict-level'>(.*?)</span>", page).group(1) == f"{MARK['caution']} CAUTION"
    v = verdict({"axis-check": FINDINGS[3:]})
    assert re.search(r"<span class='wb-verdict-level'>(.*?)</span>", verdict_html(v)).group(1) == f"{MARK['pass']} PASS"
