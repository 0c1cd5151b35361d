"""The demo's committed design records: they still hold with this library, and the review
loop from revision A to revision B reads as a reviewer expects (demo scenario).

The records in notebooks/records/ are what a design team commits beside its design files;
`make demo-records` writes them. When a change of the library moves a result, `recheck`
reports it here, and the records are regenerated and their diff reviewed like any other.
"""

from __future__ import annotations

import subprocess
import sys
from pathlib import Path

import pytest

from workbook.record import load, record_verdict
from workbook.review import recheck

ROOT = Path(__file__).resolve().parents[1]
RECORDS = ROOT / "notebooks" / "records"
AXES = ("lift", "tip")


@pytest.mark.parametrize("stem", ["bin-tipper", "bin-tipper-rev-b"])
@pytest.mark.parametrize("axis", AXES)
def test_committed_demo_records_still_hold(stem, axis):
    path = RECORDS / f"{stem}-{axis}.json"
    assert path.is_file(), f"{path} missing: run `make demo-records`"
    report = recheck(load(path))
    assert report.ok, report.to_text()
    assert path.stat().st_size <= 100_000
    assert path.with_suffix(".html").is_file()


def test_revision_b_fixes_what_revision_a_failed():
    a = record_verdict(load(RECORDS / "bin-tipper-tip.json"))
    b = record_verdict(load(RECORDS / "bin-tipper-rev-b-tip.json"))
    failed_a = {i.rule_ids[0] for i in a.items if i.level == "fail"}
    assert {"P-ROD-RATING", "P-HOSE-RATING", "RUNAWAY"} <= failed_a
    assert not [i for i in b.items if i.level == "fail"], b.to_text()


def test_compare_from_a_to_b_lists_the_changed_inputs_and_the_findings_that_moved():
    proc = subprocess.run([sys.executable, "-m", "workbook", "compare", str(RECORDS / "bin-tipper-tip.json"),
                           str(RECORDS / "bin-tipper-rev-b-tip.json")], capture_output=True, text=True,
                          encoding="utf-8", timeout=120)
    assert proc.returncode == 1, proc.stderr
    text = " ".join(proc.stdout.split())
    assert "identity revision: 'A' -> 'B'" in text
    assert "input supply.relief_full_flow (Relief full-flow pressure): 172 bar -> 118 bar" in text
    assert "input holding.side" in text
    assert "finding P-ROD-RATING (rod chamber pressure): FAIL -> CAUTION" in text
    assert "finding RUNAWAY (share of points running away): FAIL -> PASS" in text
    readme = (ROOT / "README.md").read_text(encoding="utf-8")
    assert "axisbook compare notebooks/records/bin-tipper-tip.json notebooks/records/bin-tipper-rev-b-tip.json" \
        in readme
