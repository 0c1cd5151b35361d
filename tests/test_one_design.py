"""One design, one truth: a panel, the record's review copy and ``axisbook evaluate`` on the
same inputs report the same findings, and the command line refuses what would mislead.

Values of the bin tipper are `demo scenario`. What is checked here is not a formula but
that every screen tells the same verdict: each verdict item is identified by its level and
the rules that found it; the panel (every study's panel, at the design file's values), the
HTML review copy exported from the panel's record, the record that ``axisbook evaluate``
writes and the lines it prints must give the same set.
"""

from __future__ import annotations

import re
import shutil
import subprocess
import sys
from pathlib import Path

import pytest

from workbook.record import load, record_verdict
from workbook.studies.whole_axis import DEFAULT_STUDIES, not_applicable
from workbook.ui import open_study

ROOT = Path(__file__).resolve().parents[1]
DEMO = ROOT / "notebooks" / "designs" / "bin-tipper.toml"

#: variants of the demo (each an edit of the demo design file) and the axis they concern
VARIANTS = {
    "demo-lift": ("lift", []),
    "demo-tip": ("tip", []),
    # the tip metered in instead of out: the closed valve leaves the rod side at tank pressure
    "tip-meter-in": ("tip", [('[axes.tip.flow_valve]\n', '[axes.tip.flow_valve]\narrangement = "meter-in"\n')]),
    # the lift metered out, valve closed included (the rule set closes it in every case)
    "lift-meter-out": ("lift", [('arrangement = "meter-in"\ndirection = "retract"',
                                 'arrangement = "meter-out"\ndirection = "retract"')]),
    # an overrunning load without a holding valve: the lift lowers on the flow valve alone
    "lift-no-holding": ("lift", [('kind = "counterbalance"\nside = "cap"', 'kind = "none"\nside = "cap"')]),
}

_FOUND = re.compile(r"found by (.*?)\]\s*$")
_RULE = re.compile(r"[\w-]+ \(([A-Z0-9-]+)\)")


def _design(tmp_path: Path, name: str) -> Path:
    text = DEMO.read_text(encoding="utf-8")
    for old, new in VARIANTS[name][1]:
        assert old in text, f"the demo design changed: {old!r} not found"
        text = text.replace(old, new, 1)
    folder = tmp_path / name / "designs"
    folder.mkdir(parents=True)
    path = folder / "bin-tipper.toml"
    path.write_text(text, encoding="utf-8")
    return path


def unwrap(text: str) -> str:
    """The command line's output with wrapped verdict lines joined again (a continued line is
    indented under the text, 11 spaces)."""
    out = []
    for line in text.splitlines():
        if out and line.startswith(" " * 11) and line.strip():
            out[-1] += " " + line.strip()
        else:
            out.append(line)
    return "\n".join(out)


def _cli_items(stdout: str, axis: str) -> set:
    """(level, rule ids) of every verdict line the command line printed for ``axis``."""
    stdout = unwrap(stdout)
    block = stdout[stdout.index(f"Axis {axis}:"):]
    block = block.split("\n\n", 1)[0]
    out = set()
    for line in block.splitlines()[1:]:
        m = re.match(r"\s+(FAIL|CAUTION)\s", line)
        if not m:
            continue
        found = _FOUND.search(line)
        assert found, line
        out.add((m.group(1).lower(), tuple(_RULE.findall(found.group(1)))))
    return out


def _html_items(page: str) -> set:
    """(level, rule ids) of every row of the review copy's verdict table."""
    section = page[page.index('<section class="verdict"'):]
    section = section[:section.index("</section>")]
    out = set()
    for row in re.findall(r'<tr class="row-(fail|caution)">(.*?)</tr>', section, flags=re.S):
        level, cells = row
        found = re.findall(r"<td>(.*?)</td>", cells, flags=re.S)[-1]
        out.add((level, tuple(_RULE.findall(found.replace("&#x27;", "'")))))
    return out


def _items(verdict) -> set:
    return {(i.level, i.rule_ids) for i in verdict.items}


@pytest.mark.parametrize("name", list(VARIANTS))
def test_panel_review_copy_and_command_line_report_the_same_findings(tmp_path, monkeypatch, name):
    axis, _ = VARIANTS[name]
    design = _design(tmp_path, name)
    monkeypatch.setenv("WORKBOOK_RECORDS_DIR", str(tmp_path / name / "records"))
    proc = subprocess.run([sys.executable, "-m", "workbook", "evaluate", str(design), "--axis", axis,
                           "--out", str(tmp_path / name / "out")], capture_output=True, text=True,
                          encoding="utf-8", timeout=180)
    assert proc.returncode in (0, 1), proc.stderr
    cli = _cli_items(proc.stdout, axis)
    width = max(len(line) for line in proc.stdout.splitlines() if str(tmp_path) not in line)
    assert width <= 80, f"output not wrapped to 80 columns ({width})"
    record = load(tmp_path / name / "out" / f"bin-tipper-{axis}.json")
    assert _items(record_verdict(record)) == cli
    assert cli, "every variant of the demo has at least a caution (demo scenario)"
    # every study's panel opens on the design file and shows the same whole-axis verdict
    values = None
    for kind in DEFAULT_STUDIES:
        panel = open_study(kind, design, axis=axis)
        values = panel.values
        assert not panel.stale and panel.evaluation.complete
        assert _items(panel.evaluation.verdict()) == cli, kind
        assert panel.evaluation.verdict().counts == record_verdict(record).counts
        # the panel's own rendered verdict lists every item (level and rules, as data)
        shown = re.findall(r"wb-verdict-item wb-level-(fail|caution)' data-rules='([^']*)'",
                           panel.verdict_box.widget.value)
        assert {(lvl, tuple(r.split())) for lvl, r in shown} == cli
    # the review copy exported from a panel's record lists the same items, before the inputs
    panel.record()
    page = Path(panel.export()).read_text(encoding="utf-8")
    assert _html_items(page) == cli
    assert page.index('id="verdict"') < page.index('id="inputs"')
    # and a record made from the panel holds the same findings as the command line's
    assert _items(record_verdict(load(panel.record_path))) == cli
    skipped = [k for k in DEFAULT_STUDIES if not_applicable(k, values)]
    assert sorted(load(panel.record_path).studies) == sorted(set(DEFAULT_STUDIES) - set(skipped))


def test_one_breach_found_by_two_studies_is_one_finding():
    """The tip's rod side with the meter-out valve closed (demo scenario) is graded by the
    axis check and by the rod-pressure study against the same 210 bar rating: one item."""
    from workbook.design import load_design
    from workbook.studies.whole_axis import evaluate

    v = evaluate(load_design(DEMO).axes["tip"].values).verdict()
    rod = [i for i in v.items if "P-ROD-RATING" in i.rule_ids]
    assert len(rod) == 1 and rod[0].studies[:2] == ("axis-check", "rod-pressure")
    assert "RP-ROD-CYLINDER" in rod[0].rule_ids
    assert not [i for i in v.items if i.rule_ids == ("RP-ROD-CYLINDER",)]
    assert rod[0].text.startswith("Rod chamber pressure reaches ") and "above the 210 bar limit" in rod[0].text


def _two_records(tmp_path: Path) -> Path:
    out = tmp_path / "out"
    subprocess.run([sys.executable, "-m", "workbook", "evaluate", str(DEMO), "--out", str(out),
                    "--study", "axis-check"], capture_output=True, text=True, timeout=180)
    return out


def test_compare_refuses_records_of_other_axes_unless_forced(tmp_path):
    out = _two_records(tmp_path)
    run = [sys.executable, "-m", "workbook", "compare", str(out / "bin-tipper-lift.json"),
           str(out / "bin-tipper-tip.json")]
    proc = subprocess.run(run, capture_output=True, text=True, timeout=60)
    assert proc.returncode == 2 and "Traceback" not in proc.stderr
    assert "axis 'tip' against one of axis 'lift'" in proc.stderr and "--force" in proc.stderr
    assert proc.stdout == ""
    forced = subprocess.run(run + ["--force"], capture_output=True, text=True, timeout=60)
    assert forced.returncode == 1 and "identity axis: 'lift' -> 'tip'" in forced.stdout


def test_compare_into_a_closed_pipe_ends_quietly(tmp_path):
    """``axisbook compare a b | head -1``: the reader closes the pipe after one line."""
    out = _two_records(tmp_path)
    shutil.copy(out / "bin-tipper-tip.json", tmp_path / "old.json")
    text = (DEMO.read_text(encoding="utf-8").replace('bore = "63 mm"', 'bore = "70 mm"'))
    (tmp_path / "b.toml").write_text(text, encoding="utf-8")
    subprocess.run([sys.executable, "-m", "workbook", "evaluate", str(tmp_path / "b.toml"), "--out",
                    str(tmp_path / "new")], capture_output=True, text=True, timeout=180)
    new = tmp_path / "new" / "b-tip.json"
    compare = f"{sys.executable} -m workbook compare {tmp_path / 'old.json'} {new} --force"
    proc = subprocess.run(["bash", "-c", f"{compare} | head -1"], capture_output=True, text=True, timeout=120)
    assert proc.returncode == 0 and proc.stdout.startswith("Compare ") and len(proc.stdout.splitlines()) == 1
    assert "Traceback" not in proc.stderr and "BrokenPipe" not in proc.stderr, proc.stderr
    # a reader that is gone before the first line is written (`true` exits at once): the
    # write meets a closed pipe, and the command ends quietly with exit 0
    proc = subprocess.run(["bash", "-c", f"{compare} | true; echo \"rc=${{PIPESTATUS[0]}}\" >&2"],
                          capture_output=True, text=True, timeout=120)
    assert proc.stderr.strip() == "rc=0", proc.stderr


@pytest.mark.parametrize("axis", ["lift", "tip"])
def test_review_copy_opens_with_the_verdict_in_order_and_names_no_internal_key(tmp_path, axis):
    from workbook.design import load_design
    from workbook.inputs import SECTIONS
    from workbook.record import to_html, to_markdown
    from workbook.review import evaluate_axis

    record, _ = evaluate_axis(load_design(DEMO), axis)
    page = to_html(record)
    v = record_verdict(record)
    section = page[page.index('<section class="verdict"'):]
    section = section[:section.index("</section>")]
    rows = re.findall(r'<tr class="row-(fail|caution)">(.*?)</tr>', section, flags=re.S)
    # every fail, then every caution, in the verdict's order: exactly the record's items
    assert [lvl for lvl, _ in rows] == [i.level for i in v.items]
    assert [tuple(_RULE.findall(re.findall(r"<td>(.*?)</td>", r, flags=re.S)[-1])) for _, r in rows] == \
        [i.rule_ids for i in v.items]
    levels = [lvl for lvl, _ in rows]
    assert levels == sorted(levels, key=["fail", "caution"].index)
    # the verdict comes before any input table
    assert page.index('id="verdict"') < page.index('id="inputs"') < page.index('class="study"')
    # labels, not internal keys: no field key is shown as a key (in code or its own cell)
    for sec in SECTIONS:
        for f in sec.fields:
            assert f"<code>{f.key}</code>" not in page and f"<td>{f.key}</td>" not in page, f.key
    assert "kind rod-pressure" not in page and "Study rod-pressure" not in page
    md = to_markdown(record)
    assert md.index("## Verdict of the axis") < md.index("## Design inputs")
