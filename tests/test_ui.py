"""The study panels in a kernel: entries with units, refusals, stale results, record and reopen.

These drive the same widgets the notebooks show (ipywidgets and bokeh models, without a
browser); the browser tests in tests/browser drive them in a real JupyterLab.
"""

import json
import shutil
from pathlib import Path

import pytest

from workbook import CAUTION, inputs, studies
from workbook.design import load_design
from workbook.errors import InputError
from workbook.record import load
from workbook.ui import open_study
from workbook.ui.controls import QuantityControl
from workbook.ui.panel import StudyPanel

ROOT = Path(__file__).resolve().parents[1]
DESIGN = ROOT / "notebooks" / "designs" / "bin-tipper.toml"


@pytest.fixture
def workdir(tmp_path, monkeypatch):
    """A copy of the designs folder, with records going to a temporary folder."""
    shutil.copytree(DESIGN.parent, tmp_path / "designs")
    monkeypatch.setenv("WORKBOOK_RECORDS_DIR", str(tmp_path / "records"))
    return tmp_path


def test_control_takes_units_and_refuses_with_a_message():
    ctl = QuantityControl("cylinder", inputs.CYLINDER["bore"], 0.080)
    assert ctl.submit("3.15 in")
    assert ctl.value == pytest.approx(0.08001)  # NIST SP 811: 1 in = 25.4 mm exactly
    assert ctl.slider.value == pytest.approx(80.01)
    assert not ctl.submit("160 bar")
    assert ctl.value == pytest.approx(0.08001), "the last valid value stays"
    assert "not accepted" in ctl.message.value and "a length" in ctl.message.value
    assert "wb-invalid" in ctl.widget._dom_classes
    assert ctl.submit("80 mm") and "wb-invalid" not in ctl.widget._dom_classes


@pytest.mark.parametrize("kind, axis, field, good", [
    ("restrictor-sizing", "lift", "study.target_flow", "3 gpm"),
    ("speed-vs-load", "lift", "operation.target_speed", "3 in/s"),
    ("rod-pressure", "tip", "cylinder.bore", "2.5 in"),
    ("counterbalance", "lift", "holding.setting", "500 psi"),
])
def test_each_study_updates_keeps_last_result_on_bad_entry_and_records(workdir, kind, axis, field, good):
    panel = open_study(kind, workdir / "designs" / "bin-tipper.toml", axis=axis)
    assert CAUTION in panel.widget.children[-1].value  # beside the record actions, once
    before = json.dumps(panel.outcome.results, sort_keys=True)
    plot = next(iter(panel.plots.values()))
    source = next(iter(plot.sources.values()))
    ys_before = list(source.data["y"])
    assert panel.set(field, good)
    after = json.dumps(panel.outcome.results, sort_keys=True)
    assert after != before, "a new entry moves a result"
    assert next(iter(panel.plots.values())) is plot, "figures update in place"
    assert list(source.data["y"]) != ys_before, "the plot's data changed"
    # a refused entry keeps the last valid results, marked out of date
    assert not panel.set(field, "-5 mm")
    assert panel.stale
    assert json.dumps(panel.outcome.results, sort_keys=True) == after
    assert "Out of date" in panel.results_box.widget.value
    with pytest.raises(InputError):
        panel.record()  # out-of-date results are never recorded
    assert panel.set(field, good)
    assert not panel.stale
    rec = panel.record()
    assert kind in rec.studies
    saved = load(panel.record_path)
    assert saved.studies[kind].results == panel.outcome.to_study().results
    html_path = panel.export()
    text = html_path.read_text(encoding="utf-8")
    assert "Caution" in text
    for f in saved.studies[kind].findings:
        assert f["source"].replace("'", "&#x27;") in text


def test_recording_writes_one_design_and_the_design_file_keeps_its_comments(workdir):
    """Record from two panels after changing a shared input: the record holds one design
    (every study re-run on it) and the design file holds the input too, comments intact."""
    design = workdir / "designs" / "bin-tipper.toml"
    before = design.read_text(encoding="utf-8")
    first = open_study("rod-pressure", design, axis="tip")
    assert first.set("cylinder.rod", "32 mm")
    assert [(s, k) for s, k, _a, _b in first.changes_from_design()] == [("cylinder", "rod")]
    assert "Rod d" in first.changes_box.widget.value and "32 mm" in first.changes_box.widget.value
    rec = first.record()
    # every applicable study, on the one design: the axis inputs are held once
    assert set(rec.studies) == {"axis-check", "restrictor-sizing", "speed-vs-load", "rod-pressure", "counterbalance"}
    assert rec.inputs["cylinder"]["rod"]["si"] == pytest.approx(0.032)
    assert all("cylinder" not in s.inputs for s in rec.studies.values())
    after = design.read_text(encoding="utf-8")
    assert 'rod = "32 mm"' in after and 'rod = "36 mm"' not in after
    # every comment line of the file is still there, in the same order
    comments = [ln for ln in before.splitlines() if ln.lstrip().startswith("#")]
    assert [ln for ln in after.splitlines() if ln.lstrip().startswith("#")] == comments
    assert load_design(design).axes["tip"].values["cylinder"]["rod"] == pytest.approx(0.032)
    # a second panel opens on the file (which now agrees with the record): no notice
    other = open_study("counterbalance", design, axis="tip")
    assert other.values["cylinder"]["rod"] == pytest.approx(0.032) and other.record_values is None
    assert other.set("supply.relief_full_flow", "165 bar")
    rec2 = other.record()
    assert rec2.inputs["supply"]["relief_full_flow"]["si"] == pytest.approx(165e5)
    assert rec2.inputs["cylinder"]["rod"]["si"] == pytest.approx(0.032)
    saved = load(first.record_path)
    assert saved == rec2 and 'relief_full_flow = "165 bar"' in design.read_text(encoding="utf-8")
    assert [ln for ln in design.read_text(encoding="utf-8").splitlines() if ln.lstrip().startswith("#")] == comments


def test_opening_a_design_that_differs_from_its_record_says_so_and_applies_nothing(workdir):
    design = workdir / "designs" / "bin-tipper.toml"
    first = open_study("rod-pressure", design, axis="tip")
    assert first.set("cylinder.rod", "32 mm")
    first.record()
    # the engineer edits the design file by hand afterwards
    text = design.read_text(encoding="utf-8")
    design.write_text(text.replace('bore = "63 mm"', 'bore = "100 mm"'), encoding="utf-8")
    again = open_study("speed-vs-load", design, axis="tip")
    assert again.values["cylinder"]["bore"] == pytest.approx(0.1)         # the file wins on opening
    assert again.notice_box.layout.display != "none"
    notice = again.notice.value
    assert "holds other values than bin-tipper.toml" in notice
    assert "Bore D" in notice and "100 mm" in notice and "63 mm" in notice
    assert again.load_record_values()
    assert again.values["cylinder"]["bore"] == pytest.approx(0.063)
    assert again.controls[("cylinder", "bore")].entry.value == "63 mm"
    assert again.notice_box.layout.display == "none"
    # loading changes the panel only; the design file waits for Record
    assert 'bore = "100 mm"' in design.read_text(encoding="utf-8")


def test_record_and_export_are_refused_while_stale_and_no_file_changes(workdir):
    design = workdir / "designs" / "bin-tipper.toml"
    panel = open_study("rod-pressure", design, axis="tip")
    with pytest.raises(InputError) as info:
        panel.export()
    assert "press Record study first" in str(info.value)
    panel.record()
    panel.export()
    files = {p: p.read_bytes() for p in (panel.record_path, panel.export_path, design)}
    assert not panel.set("cylinder.bore", "-3 mm")
    for action in (panel.record, panel.export):
        with pytest.raises(InputError) as info:
            action()
        assert "out-of-date results" in str(info.value)
    # the buttons say why, at the button
    panel.record_button.click()
    assert "out-of-date results" in panel.record_status.value
    panel.export_button.click()
    assert "out-of-date results" in panel.record_status.value
    assert {p: p.read_bytes() for p in files} == files
    # a valid change that is not recorded yet: export refuses to show the old design as this one
    assert panel.set("cylinder.bore", "70 mm")
    with pytest.raises(InputError) as info:
        panel.export()
    assert "press Record study first" in str(info.value)
    assert {p: p.read_bytes() for p in files} == files


def test_cross_field_refusal_is_shown_at_the_field_not_raised(workdir):
    panel = open_study("rod-pressure", workdir / "designs" / "bin-tipper.toml", axis="tip")
    good = panel.summary()
    assert not panel.set("cylinder.rod", "70 mm")  # larger than the 63 mm bore
    assert panel.stale and panel.error is not None and panel.error.field == "cylinder.rod"
    assert "smaller than the bore" in panel.controls[("cylinder", "rod")].message.value
    assert panel.summary().startswith(good)
    assert panel.set("cylinder.rod", "36 mm") and not panel.stale


def test_unknown_field_name_is_explained(capsys):
    values = {s.key: s.defaults() for s in inputs.AXIS_SECTIONS}
    panel = StudyPanel(studies.module("restrictor-sizing"), values)
    assert not panel.set("cylinder.colour", "red")
    assert "not a field of this study" in capsys.readouterr().out


def test_recording_needs_a_record_path():
    values = {s.key: s.defaults() for s in inputs.AXIS_SECTIONS}
    panel = StudyPanel(studies.module("restrictor-sizing"), values)
    panel.record_button.click()
    assert "record file" in panel.record_status.value


def test_a_candidate_that_cannot_be_sized_never_blocks_the_main_answer(workdir):
    """10 gpm through the restrictor at 20 bar: the 4 mm needle seat cannot pass it (demo
    scenario), so the needle is "not possible here" with the reason, and the orifice and the
    throttle are sized as usual; nothing is refused and no folded field is blamed."""
    panel = open_study("restrictor-sizing", workdir / "designs" / "bin-tipper.toml", axis="lift")
    assert panel.set("study.target_flow", "10 gpm")
    assert not panel.stale and panel.error is None
    res = panel.outcome.results
    assert "orifice_drill" in res and "throttle_bore" in res and "needle_lift" not in res
    needle = [f for f in panel.outcome.findings if f["rule_id"] == "SZ-NEEDLE"]
    assert needle and needle[0]["statement"] == "Needle throttle: not possible here"
    assert "cannot pass 37.85 L/min" in needle[0]["detail"]       # 10 US gal/min = 37.85 L/min (NIST SP 811)
    assert "not possible here" in panel.findings_box.widget.value
    assert panel.folds.selected_index is None
    assert list(panel.outcome.figures["flow_vs_drop"]["series"]) == ["orifice (drilled)", "long throttle"]


def test_a_refusal_caused_by_a_folded_field_opens_its_section(workdir):
    panel = open_study("rod-pressure", workdir / "designs" / "bin-tipper.toml", axis="tip")
    assert panel.folds.selected_index is None
    # the sweep range is folded away under the study's settings; a highest sweep load below
    # the lowest one is refused by the study (a cross-field check), not by the entry itself
    fold = panel._fold_of[("study", "load_max")]
    assert panel.set("study.load_min", "5 kN")
    assert not panel.set("study.load_max", "1 kN")
    assert panel.error is not None and panel.error.field == "study.load_max"
    assert panel.folds.selected_index == fold
    assert "wb-invalid" in panel.controls[("study", "load_max")].widget._dom_classes


#: refused entries: (study, field, typed text, what the message must say is allowed)
REFUSED = [
    ("rod-pressure", "cylinder.bore", "-63 mm", "greater than 0"),
    ("rod-pressure", "cylinder.bore", "160 bar", "a length"),
    ("rod-pressure", "cylinder.rod", "abc", ""),
    ("rod-pressure", "cylinder.rod", "70 mm", "smaller than the bore"),
    ("rod-pressure", "cylinder.rated_pressure", "5 kN", "a pressure"),
    ("rod-pressure", "supply.relief_full_flow", "12 mm", "a pressure"),
    ("rod-pressure", "operation.loads", "2 kN, 3 bar", "force"),
    ("rod-pressure", "operation.temp_min", "20 kg", "temperature"),
    ("rod-pressure", "ratings.hose_rating", "-1 bar", ""),
    ("rod-pressure", "flow_valve.setting", "7 mm", "a flow"),
    ("rod-pressure", "study.points", "3", ""),
    ("counterbalance", "holding.setting", "-5 mm", "a pressure"),
    ("counterbalance", "holding.pilot_ratio", "3 deg", ""),
    ("counterbalance", "study.pilot_ratios", "x", ""),
    ("speed-vs-load", "operation.target_speed", "3 kg", "velocity"),
    ("speed-vs-load", "oil.nu40", "46 bar", "viscosity"),
    ("restrictor-sizing", "study.target_flow", "-3 L/min", ""),
]


@pytest.mark.parametrize("kind, name, typed, allowed", REFUSED, ids=[f"{k}:{n}={t}" for k, n, t, _ in REFUSED])
def test_refused_entries_name_the_field_as_the_user_sees_it_and_echo_what_was_typed(workdir, kind, name, typed,
                                                                                   allowed):
    axis = "tip" if kind == "rod-pressure" else "lift"
    panel = open_study(kind, workdir / "designs" / "bin-tipper.toml", axis=axis)
    section, key = name.split(".")
    field = inputs.section(section)[key]
    assert not panel.set(name, typed)
    assert panel.stale
    ctl = panel.controls[(section, key)]
    # the message beside the field echoes the typed text and says what is allowed
    assert "not accepted" in ctl.message.value and html_escape(typed) in ctl.message.value
    assert allowed in ctl.message.value
    # the status line names the field by its label and section, never by an internal key
    status = panel.status.value
    assert html_escape(field.label) in status and html_escape(inputs.section(section).title) in status
    assert name not in status
    assert html_escape(repr(typed)) in status


def html_escape(text: str) -> str:
    import html

    return html.escape(text)
