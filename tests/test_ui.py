"""The study panels in a kernel: entries with units, refusals, stale results, record and reopen.

These drive the same widgets the notebooks show (ipywidgets and bokeh models, without a
browser); the browser tests in tests/browser drive them in a real JupyterLab.
"""

import json
import shutil
from pathlib import Path

import pytest

from workbook import CAUTION, studies
from workbook.design import load_design
from workbook.record import load
from workbook.ui import open_study
from workbook.ui.controls import QuantityControl
from workbook.ui.panel import StudyPanel
from workbook import inputs

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
    assert CAUTION in panel.widget.children[0].value
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
    with pytest.raises(Exception):
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


def test_saved_study_reopens_with_recorded_values(workdir):
    design = workdir / "designs" / "bin-tipper.toml"
    first = open_study("rod-pressure", design, axis="tip")
    assert first.set("cylinder.rod", "32 mm")
    first.record()
    again = open_study("rod-pressure", design, axis="tip")
    assert again.reopened
    assert again.values["cylinder"]["rod"] == pytest.approx(0.032)
    assert again.controls[("cylinder", "rod")].entry.value == "32 mm"
    assert again.summary() == first.summary()
    # a second study recorded into the same record keeps the first (nothing recorded is lost)
    other = open_study("counterbalance", design, axis="tip")
    other.record()
    rec = load(first.record_path)
    assert set(rec.studies) == {"rod-pressure", "counterbalance"}


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
