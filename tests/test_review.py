"""Evaluation of design files into records and re-checking of saved records (in process).

Values of the bin tipper are `demo scenario`; the expected relative changes below are
derived by hand from the perturbation each test makes.
"""

from __future__ import annotations

import dataclasses
import pathlib

import pytest

from workbook import __version__
from workbook.design import DesignFileError, load_design, loads_design
from workbook.errors import InputError
from workbook.record import Record, Study, inputs_from_values, load, save
from workbook.review import DEFAULT_STUDIES, design_key, evaluate_design, recheck, rerun_values

DEMO = pathlib.Path(__file__).resolve().parents[1] / "notebooks" / "designs" / "bin-tipper.toml"


@pytest.fixture(scope="module")
def demo_design():
    return load_design(DEMO)


@pytest.fixture(scope="module")
def evaluated(demo_design):
    return evaluate_design(demo_design)


def _replace_study(record: Record, key: str, **parts) -> Record:
    s = record.studies[key]
    fields = dict(kind=s.kind, title=s.title, inputs=s.inputs, results=s.results, findings=s.findings,
                  figures=s.figures, notes=s.notes)
    fields.update(parts)
    return record.with_study(Study(**fields), key=key)


def test_evaluate_design_builds_one_record_per_axis(evaluated, demo_design):
    assert list(evaluated) == ["lift", "tip"]
    for axis, (record, outcomes) in evaluated.items():
        assert record.identity == demo_design.identity_for(axis)
        assert list(record.studies) == list(DEFAULT_STUDIES)
        assert [o.kind for o in outcomes] == list(DEFAULT_STUDIES)
        for o in outcomes:
            # the record keeps 12 significant digits (no float noise): equal to that precision
            rec_results = record.studies[o.kind].results
            assert rec_results.keys() == o.results.keys()
            assert all(rec_results[k]["value"] == pytest.approx(o.results[k]["value"], rel=1e-11)
                       and rec_results[k]["unit"] == o.results[k]["unit"] for k in o.results)
            rec_findings = record.studies[o.kind].findings
            assert [(f["rule_id"], f["level"], f["source"]) for f in rec_findings] == \
                [(f["rule_id"], f["level"], f["source"]) for f in o.findings]
            assert all(a["value"] == pytest.approx(b["value"], rel=1e-11) for a, b in zip(rec_findings, o.findings)
                       if b["value"] is not None)
        assert record.notes[0] == f"Evaluated from bin-tipper.toml, axis {axis} ({demo_design.axes[axis].title})."
    # demo scenario: the closed meter-out valve puts the tip's rod side above its ratings
    tip_levels = {f["rule_id"]: f["level"] for f in evaluated["tip"][0].findings()}
    assert tip_levels["P-ROD-RATING"] == "fail"


def test_evaluate_design_picks_axes_and_studies(demo_design):
    out = evaluate_design(demo_design, studies=("rod-pressure",), axes=["tip"])
    assert list(out) == ["tip"] and list(out["tip"][0].studies) == ["rod-pressure"]
    with pytest.raises(DesignFileError, match=r"axes: got 'roll'; allowed: one of the axes of the design: lift, tip"):
        evaluate_design(demo_design, axes=["roll"])
    with pytest.raises(InputError, match="study kind: got 'guess'"):
        evaluate_design(demo_design, studies=("guess",))


def test_study_that_does_not_apply_is_left_out_with_a_note():
    d = loads_design('[machine]\nname = "T"\n[axes.slide.holding]\nkind = "none"\n', "slide.toml")
    record, outcomes = evaluate_design(d)["slide"]
    assert "counterbalance" not in record.studies
    assert [o.kind for o in outcomes] == [k for k in DEFAULT_STUDIES if k != "counterbalance"]
    assert "counterbalance study left out: holding.kind is none (the axis has no load-holding valve)" in record.notes


def test_study_refusal_is_located_in_the_design_file():
    text = DEMO.read_text(encoding="utf-8").replace('bore = "80 mm"', 'bore = "90 mm"')
    d = loads_design(text, "wide.toml")
    line = next(n for n, ln in enumerate(text.splitlines(), 1) if ln.strip() == 'target_speed = "80 mm/s"')
    with pytest.raises(DesignFileError) as info:
        evaluate_design(d, axes=["lift"])
    err = info.value
    assert (err.file, err.line, err.key) == ("wide.toml", line, "axes.lift.operation.target_speed")
    assert "(study speed-vs-load)" in err.allowed


def test_design_key_prefers_the_axis_then_the_defaults(demo_design):
    # the lift sets its own flow setting; both axes take the oil temperatures from [defaults]
    assert design_key(demo_design, "lift", "flow_valve.setting") == "axes.lift.flow_valve.setting"
    assert design_key(demo_design, "lift", "operation.temp_max") == "defaults.operation.temp_max"
    # not given anywhere: the axis's own key (the file line is then the axis's table)
    # a sweep limit not in the file is blamed on the load cases that set it
    assert design_key(demo_design, "tip", "study.load_max") == "axes.tip.operation.loads"
    assert design_key(demo_design, "tip", "operation.loads[2]") == "axes.tip.operation.loads"
    assert design_key(demo_design, "tip", "Pump flow") == "axes.tip"


def test_recheck_of_a_fresh_record_is_clean_also_after_a_json_round_trip(evaluated, tmp_path):
    record = evaluated["lift"][0]
    report = recheck(record)
    assert report.ok and not report.drifts and not report.levels and not report.filled
    assert report.studies == list(DEFAULT_STUDIES)
    again = load(save(record, tmp_path / "lift.json"))
    assert recheck(again).ok
    assert report.to_text().endswith("No drift: every result, finding and curve is as recorded.")


def test_recheck_reports_a_moved_result_with_its_relative_change(evaluated):
    record = evaluated["tip"][0]
    results = {k: dict(v) for k, v in record.studies["rod-pressure"].results.items()}
    key = next(k for k, v in results.items() if v["value"] != 0)
    old = results[key]["value"]
    results[key]["value"] = old * 1.05
    report = recheck(_replace_study(record, "rod-pressure", results=results))
    assert not report.ok
    (drift,) = report.drifts
    assert (drift.study, drift.key, drift.unit) == ("rod-pressure", key, results[key]["unit"])
    assert drift.old == pytest.approx(old * 1.05) and drift.new == old
    # recorded 1.05 x, re-run x: 1/1.05 - 1 (derived by hand)
    assert drift.relative == pytest.approx(1 / 1.05 - 1)
    assert key in report.to_text() and "Drift: 1 item(s)" in report.to_text()
    # the tolerance decides
    assert recheck(_replace_study(record, "rod-pressure", results=results), rtol=0.05).ok


def test_recheck_relative_tolerance(evaluated):
    record = evaluated["lift"][0]
    results = {k: dict(v) for k, v in record.studies["axis-check"].results.items()}
    results["p_pump_max"]["value"] *= 1 + 5e-7     # inside rtol 1e-6
    results["near_zero"] = {"value": 0.0, "unit": "kW", "label": "x"}
    base = _replace_study(record, "axis-check", results=results)
    report = recheck(base)
    # the made-up result is not computed by the library: it vanished, and nothing else moved
    assert [(d.key, d.new) for d in report.drifts] == [("near_zero", None)]
    assert recheck(base, rtol=1e-7).drifts[0].key == "p_pump_max"


def test_recheck_absolute_floor(evaluated):
    """With rtol 0 a change of 5e-10 bar is inside the floor atol 1e-9 and outside atol 0;
    a drift from a recorded zero has no relative change."""
    record = evaluated["lift"][0]
    results = {k: dict(v) for k, v in record.studies["axis-check"].results.items()}
    results["p_pump_max"]["value"] += 5e-10
    nudged = _replace_study(record, "axis-check", results=results)
    assert recheck(nudged, rtol=0, atol=1e-9).ok
    (d,) = recheck(nudged, rtol=0, atol=0).drifts
    assert d.key == "p_pump_max" and d.new - d.old == pytest.approx(-5e-10, rel=1e-3)
    results["p_pump_max"] = dict(results["p_pump_max"], value=0.0)
    (d,) = recheck(_replace_study(record, "axis-check", results=results)).drifts
    assert d.old == 0.0 and d.relative is None and "(from zero)" in d.to_text()


def test_recheck_reports_level_changes_and_results_that_appear(evaluated):
    record = evaluated["tip"][0]
    s = record.studies["axis-check"]
    findings = [dict(f) for f in s.findings]
    i = next(n for n, f in enumerate(findings) if f["rule_id"] == "P-ROD-RATING")
    findings[i]["level"] = "pass"
    results = dict(s.results)
    gone = results.pop("pump_flow")
    report = recheck(_replace_study(record, "axis-check", findings=findings, results=results))
    assert [(c.rule_id, c.old, c.new) for c in report.levels] == [("P-ROD-RATING", "pass", "fail")]
    (d,) = report.drifts
    assert (d.key, d.old, d.new, d.unit) == ("pump_flow", None, gone["value"], "L/min")
    assert "appeared" in report.to_text() and "PASS -> FAIL" in report.to_text()


def test_recheck_fills_unrecorded_inputs_with_defaults_and_reports_them():
    s = Study("axis-check", inputs=inputs_from_values({"cylinder": {"bore": 0.07, "rod": 0.04}}))
    values, filled = rerun_values(Record({"axis": "a"}).with_study(s), "axis-check")
    assert values["cylinder"]["bore"] == 0.07 and values["cylinder"]["rod"] == 0.04
    assert values["supply"]["relief_cracking"] == 160e5  # the catalogue default
    assert "supply.relief_cracking" in filled and "cylinder.bore" not in filled
    report = recheck(Record({"axis": "a"}).with_study(s))
    assert ("axis-check", "supply.relief_cracking") in report.filled
    # the study recorded no results: every re-run result appeared
    assert report.drifts and all(d.old is None for d in report.drifts)
    assert "catalogue default used" in report.to_text()


def test_recheck_refused_and_unknown_studies_are_not_ok():
    # no load pushes on the cap side: the counterbalance study has nothing to hold
    refused = Study("counterbalance", inputs=inputs_from_values({"operation": {"loads": [-1000.0]}}))
    unknown = Study("hand-sum", results={"x": {"value": 1.0, "unit": "bar"}})
    report = recheck(Record({"axis": "a"}).with_study(refused).with_study(unknown))
    assert not report.ok
    assert [s for s, _ in report.refused] == ["counterbalance"] and "operation.loads" in report.refused[0][1]
    assert report.unknown == [("hand-sum", "hand-sum")]
    assert report.studies == []


def test_recheck_compares_curves_with_the_tolerance(evaluated):
    record = evaluated["lift"][0]
    figs = {k: dict(v) for k, v in record.studies["speed-vs-load"].figures.items()}
    name = next(iter(figs))
    fig = figs[name]
    label = next(iter(fig["series"]))
    series = dict(fig["series"])
    series[label] = [None if v is None else v * (1 + 1e-9) for v in series[label]]
    figs[name] = dict(fig, series=series)
    assert recheck(_replace_study(record, "speed-vs-load", figures=figs)).ok
    series[label] = [None if v is None else v * 1.01 + 1 for v in fig["series"][label]]
    figs[name] = dict(fig, series=series)
    report = recheck(_replace_study(record, "speed-vs-load", figures=figs))
    assert report.figures == [("speed-vs-load", name, "changed")]


def test_recheck_refuses_a_bad_tolerance(evaluated):
    for bad in (-1.0, float("nan"), float("inf"), "1e-6"):
        with pytest.raises(InputError, match="rtol"):
            recheck(evaluated["lift"][0], rtol=bad)


def test_recheck_names_both_library_versions(evaluated):
    old = dataclasses.replace(evaluated["lift"][0], library_version="0.0.9")
    report = recheck(old)
    assert report.ok and (report.old_version, report.new_version) == ("0.0.9", __version__)
    assert "recorded with 0.0.9" in report.to_text()
