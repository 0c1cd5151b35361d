"""Diff of two records, on hand-made pairs (the expected changes are built into each pair)."""

from __future__ import annotations

import pytest

from workbook.record import Record, Study, diff, inputs_from_values


def _finding(rule, level, quantity=""):
    return {"rule_id": rule, "statement": f"{rule} check", "quantity": quantity, "level": level,
            "source": "common practice"}


def _study(bore=0.08, speed=0.1, level="pass", notes=()):
    return Study("restrictor-sizing", "Lowering restrictor",
                 inputs=inputs_from_values({"cylinder": {"bore": bore, "rod": 0.045}}),
                 results={"speed": {"value": speed, "unit": "m/s", "label": "Lowering speed"},
                          "q": {"value": 3e-4, "unit": "m**3/s", "label": "Cap outflow"}},
                 findings=[_finding("P-RATED", "pass", "p1"), _finding("CB", level)], notes=list(notes))


def _record(**kw):
    return Record({"machine": "BT-2", "axis": "lift"}).with_study(_study(**kw))


def test_identical_records_give_an_empty_diff():
    d = diff(_record(), _record())
    assert d.is_empty and "no change" in d.to_text()


def test_a_changed_input_is_listed_with_old_and_new_and_unit():
    d = diff(_record(), _record(bore=0.1))
    assert len(d.inputs) == 1
    c = d.inputs[0]
    # the axis inputs are held once per record, so the change is the record's, not a study's
    assert (c.study, c.section, c.field, c.old, c.new, c.new_unit) == ("", "cylinder", "bore", 80.0, 100.0, "mm")
    assert "cylinder.bore (Bore D): 80 mm -> 100 mm" in d.to_text()


def test_a_moved_result_has_its_relative_change():
    d = diff(_record(speed=0.1), _record(speed=0.12))
    (c,) = d.results
    # relative change by hand: (0.12 - 0.1) / 0.1 = 0.2
    assert c.name == "speed" and c.relative == pytest.approx(0.2, rel=1e-12)
    assert "+20 %" in d.to_text()
    assert diff(_record(speed=0.1), _record(speed=0.1 * (1 + 1e-9)), rtol=1e-6).results == []


def test_a_level_change_is_listed():
    d = diff(_record(level="pass"), _record(level="fail"))
    (c,) = d.levels
    assert (c.rule_id, c.old, c.new) == ("CB", "pass", "fail")
    assert "finding CB: PASS -> FAIL" in d.to_text()


def test_added_and_removed_studies_and_notes():
    old = _record()
    new = old.without_study("restrictor-sizing").with_study(Study("counterbalance")).with_note("checked")
    d = diff(old, new)
    assert d.studies_added == ["counterbalance"] and d.studies_removed == ["restrictor-sizing"]
    assert d.notes_added == [("", "checked")]
    assert not d.is_empty
    text = d.to_text()
    assert "study added: counterbalance" in text and "study removed: restrictor-sizing" in text


def test_a_library_version_alone_is_not_a_change():
    old = _record()
    new = Record(old.identity, old.studies, library_version="9.9.9", inputs=old.inputs)
    d = diff(old, new)
    assert d.is_empty and "library version 0.1.0 -> 9.9.9" in d.to_text()


def test_identity_changes_and_new_findings():
    old = _record()
    s = _study()
    s2 = Study(s.kind, s.title, s.inputs, s.results, [*s.findings, _finding("CAV", "caution")])
    new = Record(dict(old.identity, revision="B")).with_study(s2)
    d = diff(old, new)
    assert d.identity == [("revision", "A", "B")]
    assert [(c.rule_id, c.old, c.new) for c in d.levels] == [("CAV", None, "caution")]
