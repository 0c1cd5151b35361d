"""The record's data model and the inputs with units.

Expected values come from the field declarations of workbook/inputs.py (Field.parse is
the reference for what a text entry means) and from pint (through workbook.units) for the
display-unit conversion; nothing here restates a number the code computed.
"""

from __future__ import annotations

import math

import pytest
from hypothesis import HealthCheck, given, settings
from hypothesis import strategies as st

from workbook import units
from workbook.errors import InputError
from workbook.inputs import AXIS_SECTIONS, BY_KEY
from workbook.record import Record, Study, inputs_from_values, values_from_inputs


def _bounds_si(f, dim):
    lo = -1e6 if f.low is None else units.to_si(f.low, dim, f.key, f.unit)
    hi = 1e6 if f.high is None else units.to_si(f.high, dim, f.key, f.unit)
    return lo, hi


def _value_strategy(f):
    if f.dimension == "text":
        return st.text(st.characters(exclude_categories=("Cc", "Cf", "Cs", "Zl", "Zp")), max_size=10)
    if f.dimension == "choice":
        return st.sampled_from(f.choices)
    if f.dimension == "flag":
        return st.booleans()
    dim = f.list_dimension if f.dimension == "quantity_list" else f.dimension
    lo, hi = _bounds_si(f, dim)
    one = st.floats(0.001, 0.999).map(lambda t: lo + t * (hi - lo))
    if f.dimension == "quantity_list":
        return st.lists(one, min_size=1, max_size=4)
    if f.integer:
        return one.map(lambda v: float(min(max(round(v), lo), hi)))
    return one


@st.composite
def axis_values(draw):
    out = {}
    for sec in draw(st.lists(st.sampled_from(AXIS_SECTIONS), min_size=1, max_size=3, unique_by=lambda s: s.key)):
        out[sec.key] = {f.key: draw(_value_strategy(f)) for f in sec.fields}
    return out


@settings(max_examples=40, deadline=None, suppress_health_check=[HealthCheck.too_slow])
@given(axis_values())
def test_inputs_round_trip_is_lossless_to_the_last_bit(values):
    back = values_from_inputs(inputs_from_values(values))
    assert back == values
    for sec, fields in values.items():
        for key, v in fields.items():
            if isinstance(v, float):
                assert back[sec][key].hex() == v.hex()


def test_entries_hold_the_display_unit_of_their_field():
    f = BY_KEY["supply"]["relief_cracking"]
    si = f.parse("2320.6 psi")
    entry = inputs_from_values({"supply": {"relief_cracking": si}})["supply"]["relief_cracking"]
    assert entry["unit"] == f.unit == "bar"
    # source: NIST SP 811, 1 psi = 6894.757293168 Pa (exact from the pound and the inch) and
    # 1 bar = 1e5 Pa: 2320.6 psi = 160.0 bar
    assert entry["value"] == pytest.approx(2320.6 * 6894.757293168 / 1e5, rel=1e-12)
    assert entry["value"] == pytest.approx(160.0, abs=0.001)
    assert entry["si"] == si


def test_an_entry_without_si_is_parsed_from_value_and_unit():
    # source: Field.parse of the same text is the reference
    got = values_from_inputs({"cylinder": {"bore": {"value": 3.15, "unit": "in"}},
                              "operation": {"loads": {"value": [2, 9], "unit": "kN"}}})
    assert got["cylinder"]["bore"] == BY_KEY["cylinder"]["bore"].parse("3.15 in")
    assert got["operation"]["loads"] == BY_KEY["operation"]["loads"].parse(["2 kN", "9 kN"])


@pytest.mark.parametrize("values, field, allowed", [
    ({"cylinder": {"bore": -0.08}}, "cylinder.bore", "greater than 0 mm"),
    ({"cylinder": {"bore": float("nan")}}, "cylinder.bore", "not NaN"),
    ({"cylinder": {"bore_size": 0.08}}, "cylinder.bore_size", "one of bore, rod, stroke, rated_pressure"),
    ({"pump": {"displacement": 1.6e-5}}, "pump", "one of identity, cylinder"),
    ({"oil": {"grade": "VG47"}}, "oil.grade", "one of 'VG10'"),
    ({"study": {"pilot_ratios": []}}, "study.pilot_ratios", "at least one"),
])
def test_bad_values_name_the_field_and_what_is_allowed(values, field, allowed):
    with pytest.raises(InputError) as info:
        inputs_from_values(values)
    assert info.value.field == field and allowed in info.value.allowed


def test_entries_whose_value_and_si_disagree_or_have_the_wrong_unit_are_refused():
    with pytest.raises(InputError, match="cylinder.bore: got value 0.08 .* and si 0.09"):
        values_from_inputs({"cylinder": {"bore": {"value": 80.0, "unit": "mm", "si": 0.09}}})
    with pytest.raises(InputError, match="cylinder.bore: got 80 bar; allowed: a length"):
        values_from_inputs({"cylinder": {"bore": {"value": 80.0, "unit": "bar"}}})


def test_study_checks_its_parts_and_refuses_nan():
    with pytest.raises(InputError, match=r"figures.f.series.a: got 1 points; allowed: 2 points"):
        Study("k", figures={"f": {"x": [0.0, 1.0], "series": {"a": [1.0]}}})
    with pytest.raises(InputError, match=r"findings\[0\].level: got 'ok'"):
        Study("k", findings=[{"rule_id": "R", "statement": "s", "level": "ok", "source": "x"}])
    with pytest.raises(InputError, match=r"findings\[0\].source: got nothing"):
        Study("k", findings=[{"rule_id": "R", "statement": "s", "level": "pass"}])
    with pytest.raises(InputError, match=r"results.v.value: got inf"):
        Study("k", results={"v": {"value": math.inf}})
    with pytest.raises(InputError, match=r"inputs.cylinder.bore.value: got a str"):
        Study("k", inputs={"cylinder": {"bore": {"value": "80 mm"}}})
    with pytest.raises(InputError, match="kind"):
        Study(" ")


def test_findings_from_objects_are_accepted():
    class Level:
        value = "CAUTION"

    class Finding:
        rule_id, statement, level, source = "V1", "return line fast", Level(), "common practice"
        value, limit, unit, margin = 4.4, 4.0, "m/s", -0.1
    s = Study("lines", findings=[Finding()])
    assert s.findings[0]["level"] == "caution" and s.findings[0]["detail"] == ""


def test_input_value_reads_back_through_the_field():
    si = BY_KEY["operation"]["temp_max"].parse("60 degC")
    s = Study("k", inputs=inputs_from_values({"operation": {"temp_max": si}}))
    assert s.input_value("operation", "temp_max") == si
    with pytest.raises(InputError, match="operation.temp_min: got an input this study did not record"):
        s.input_value("operation", "temp_min")


def test_with_study_keeps_everything_recorded():
    a = Study("restrictor-sizing", results={"d": {"value": 1.2e-3, "unit": "m"}})
    b = Study("counterbalance", notes=["pilot ratio 3"])
    r = Record({"machine": "BT-2", "axis": "lift"}, notes=["first"]).with_study(a).with_study(b)
    a2 = Study("restrictor-sizing", results={"d": {"value": 1.3e-3, "unit": "m"}})
    r2 = r.with_study(a2)
    assert list(r2.studies) == ["restrictor-sizing", "counterbalance"]   # replaced in place
    assert r2.studies["counterbalance"] == b and r2.notes == ["first"]
    assert r.studies["restrictor-sizing"] == a                            # the old record is untouched
    assert r2.without_study("counterbalance").studies.keys() == {"restrictor-sizing"}


def test_record_findings_come_worst_first_with_their_study():
    def f(rule, level):
        return {"rule_id": rule, "statement": rule, "level": level, "source": "common practice"}
    r = Record({"axis": "tip"}).with_study(Study("a", findings=[f("A1", "pass"), f("A2", "fail")])) \
        .with_study(Study("b", findings=[f("B1", "caution"), f("B2", "fail")]))
    assert [(x["study"], x["rule_id"]) for x in r.findings()] == [("a", "A2"), ("b", "B2"), ("b", "B1"), ("a", "A1")]


def test_identity_follows_the_catalogue():
    r = Record({"machine": "BT-2"})
    assert set(r.identity) == set(BY_KEY["identity"].keys)
    assert r.revision == BY_KEY["identity"]["revision"].default
    with pytest.raises(InputError, match="identity.serial: got an unknown entry; allowed: one of machine"):
        Record({"serial": "1"})
    with pytest.raises(InputError, match="identity.date: got a date"):
        import datetime
        Record({"date": datetime.date(2026, 11, 30)})
