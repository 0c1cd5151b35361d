"""The saved study notebook is a design record a reviewer reads without running it.

Each panel keeps a static snapshot of itself in the notebook's saved outputs (HTML: the
caution, the whole axis's verdict, the inputs that differ from the design file, the study's
results and findings with level, margin and source, and its figures as SVG). These tests read
the committed notebooks as files and as nbconvert's HTML, with no kernel, and check that the
snapshot is the one the current library gives for the demo (demo scenario), small, free of
widget ids, and that one changed input moves only a few of its lines.
"""

from __future__ import annotations

import difflib
import html
import json
import re
import shutil
from pathlib import Path

import nbformat
import pytest

from workbook import CAUTION
from workbook.tools.notebooks import IGNORE_TAG, STUDIES

ROOT = Path(__file__).resolve().parents[1]
NOTEBOOKS = ROOT / "notebooks"
#: the notebooks whose panel is a study of one axis (the machine-cycle notebook has its own view)
PANEL_NOTEBOOKS = [name for name, spec in STUDIES.items() if (NOTEBOOKS / name).exists()
                   and spec[0] in ("restrictor-sizing", "speed-vs-load", "rod-pressure", "counterbalance")]


def _snapshot(nb) -> str:
    for cell in nb.cells:
        if cell.cell_type == "code" and IGNORE_TAG in cell.metadata.get("tags", []) and "panel.show()" in cell.source:
            pages = [o["data"]["text/html"] for o in cell.outputs if "text/html" in o.get("data", {})]
            pages = ["".join(p) if isinstance(p, list) else p for p in pages]
            pages = [p for p in pages if "wb-snapshot" in p]
            assert len(pages) == 1, "the panel cell keeps exactly one snapshot"
            return pages[0]
    raise AssertionError("no panel cell")


def _spec(name):
    kind, axis = STUDIES[name][:2]
    return kind, axis


@pytest.mark.parametrize("name", PANEL_NOTEBOOKS)
def test_saved_notebook_reads_as_a_design_record_without_a_kernel(name, tmp_path, monkeypatch):
    from nbconvert import HTMLExporter

    from workbook.ui import open_study

    nb = nbformat.read(NOTEBOOKS / name, as_version=4)
    saved = _snapshot(nb)
    page, _ = HTMLExporter().from_notebook_node(nb)       # no kernel runs here
    assert "wb-snapshot" in page and "data:image/svg+xml;base64," in page
    # each saved figure is a standalone SVG document (an image needs its namespace)
    import base64

    for data in re.findall(r"data:image/svg\+xml;base64,([A-Za-z0-9+/=]+)", saved):
        svg = base64.b64decode(data).decode("utf-8")
        assert svg.startswith('<svg xmlns="http://www.w3.org/2000/svg"') and svg.rstrip().endswith("</svg>")
    assert html.escape(CAUTION) in page or CAUTION in page
    # the same verdict and findings the live panel shows for the demo, now
    monkeypatch.setenv("WORKBOOK_RECORDS_DIR", str(tmp_path / "records"))
    monkeypatch.chdir(NOTEBOOKS)
    kind, axis = _spec(name)
    panel = open_study(kind, STUDIES_DESIGN, axis=axis)
    assert saved == panel.snapshot_html(), (
        f"{name}: the saved snapshot is not what the panel shows now: run `make refresh-notebooks`")
    verdict = panel.evaluation.verdict()
    counts = verdict.counts
    assert "Whole axis" in page and f"{counts['fail']} fail, {counts['caution']} caution, {counts['pass']} pass" in page
    text = html.unescape(page)       # nbconvert writes the saved HTML out again in its own form
    for item in verdict.items:
        assert item.text in text, item.text
    for f in panel.outcome.findings:
        assert f["rule_id"] in text and f["source"] in text, (f["rule_id"], f["source"])


STUDIES_DESIGN = "designs/bin-tipper.toml"


@pytest.mark.parametrize("name", PANEL_NOTEBOOKS)
def test_saved_notebook_is_small_and_holds_no_widget_id(name):
    text = (NOTEBOOKS / name).read_text(encoding="utf-8")
    assert len(text.encode("utf-8")) < 500_000
    assert "application/vnd.jupyter.widget-view+json" not in text
    assert "model_id" not in text and not re.search(r"0x[0-9a-f]{6,}", text)
    nb = json.loads(text)
    assert "widgets" not in nb["metadata"]


def test_one_changed_input_moves_a_few_lines_of_the_snapshot(tmp_path, monkeypatch):
    """A stale snapshot is marked so, and a changed input changes only the lines whose
    results moved (the snapshot holds a table row or a drawn element a line)."""
    from workbook.ui import open_study

    shutil.copytree(NOTEBOOKS / "designs", tmp_path / "designs")
    monkeypatch.setenv("WORKBOOK_RECORDS_DIR", str(tmp_path / "records"))
    monkeypatch.chdir(tmp_path)
    panel = open_study("rod-pressure", "designs/bin-tipper.toml", axis="tip")
    before = panel.snapshot_html().splitlines()
    assert panel.set("ratings.hose_rating", "260 bar")      # moves one rating and its findings
    after = panel.snapshot_html().splitlines()
    changed = [ln for ln in difflib.unified_diff(before, after, lineterm="", n=0)
               if ln[:1] in "+-" and not ln.startswith(("+++", "---"))]
    assert changed, "the snapshot did not follow the new input"
    # each changed line shows twice (old and new); the figure's scale is set by the valve rating
    assert len(changed) / 2 < 0.25 * len(before), (len(changed), len(before))
    assert not panel.set("cylinder.bore", "abc")
    stale = panel.snapshot_html()
    assert "OUT OF DATE" in stale and "260 bar" in stale
