"""The committed study notebooks: small, clean, and nbval really compares them."""

import json
import os
import pathlib
import re
import shutil
import subprocess
import sys

import pytest

ROOT = pathlib.Path(__file__).resolve().parents[1]
NOTEBOOKS = sorted((ROOT / "notebooks").glob("*.ipynb"))


def test_four_studies_are_committed():
    from workbook.tools.notebooks import STUDIES

    assert [p.name for p in NOTEBOOKS] == sorted(STUDIES)


@pytest.mark.parametrize("path", NOTEBOOKS, ids=lambda p: p.name)
def test_notebook_is_small_and_clean(path):
    text = path.read_text(encoding="utf-8")
    assert len(text.encode()) < 500_000
    nb = json.loads(text)
    assert "widgets" not in nb.get("metadata", {}), "saved widget state makes notebooks heavy"
    assert not re.search(r"0x[0-9a-f]{6,}", text), "memory address in a saved output"
    assert str(ROOT) not in text and "/home/" not in text and "/tmp/" not in text, "absolute path"
    assert "Caution" in "".join(nb["cells"][0]["source"])
    summary = nb["cells"][-1]
    assert "panel.summary()" in "".join(summary["source"])
    assert summary["outputs"], "the summary cell must carry its output for nbval to compare"
    shown = False
    for cell in nb["cells"]:
        src = "".join(cell.get("source", ""))
        if cell["cell_type"] != "code":
            continue
        # nbval's marker is a cell tag, not a comment the user reads
        assert "NBVAL" not in src
        if "panel.show()" in src:
            assert "nbval-ignore-output" in cell["metadata"].get("tags", []), "widget cells must not be compared"
            # no widget output (its model id changes every run); only the panel's static snapshot
            assert all("wb-snapshot" in "".join(o.get("data", {}).get("text/html", "")) and
                       set(o.get("data", {})) == {"text/html"} for o in cell["outputs"]), "stray widget output"
            shown = True
        elif shown:
            # no cell after the panel changes the design: Run All shows the design file's values
            assert "panel.set(" not in src and "panel.values" not in src, src
    assert shown


@pytest.mark.parametrize("path", NOTEBOOKS, ids=lambda p: p.name)
def test_bokehjs_loads_in_a_cell_of_its_own_before_the_panel(path):
    """The first code cell loads BokehJS and creates no widget; the panel comes after it (on
    first open the large inline script must not share the panel cell's widget messages)."""
    nb = json.loads(path.read_text(encoding="utf-8"))
    code = ["".join(c["source"]) for c in nb["cells"] if c["cell_type"] == "code"]
    assert "load_bokehjs()" in code[0], code[0]
    assert not any(w in code[0] for w in ("open_study", "open_machine", "ipywidgets", ".show()")), code[0]
    assert "panel.show()" in code[1], code[1]


def test_scripted_entry_sets_a_value_the_notebook_does_not_have():
    """The example entry each notebook suggests (``panel.set(...)`` in its text) changes the
    value the notebook opens on, so trying it shows something new."""
    from workbook import inputs
    from workbook.design import load_design
    from workbook.tools.notebooks import DESIGN, STUDIES

    design = load_design(ROOT / "notebooks" / DESIGN)
    checked = 0
    for name, (kind, axis, *_rest, try_line) in STUDIES.items():
        m = re.fullmatch(r'panel\.set\("(\w+)\.(\w+)", "([^"]+)"\)', try_line)
        if m is None or axis is None:
            continue
        section, key, text = m.groups()
        field = inputs.section(section)[key]
        opened = design.axes[axis].values[section][key]
        typed = field.parse(text)
        assert typed != opened, f"{name}: {try_line} sets {section}.{key} to the value it already has ({text})"
        checked += 1
    assert checked >= 4


def _suggested_entries():
    from workbook.tools.notebooks import STUDIES

    out = []
    for name, (kind, axis, *_rest, try_line) in STUDIES.items():
        m = re.fullmatch(r'panel\.set\("(\w+\.\w+)", "([^"]+)"\)', try_line)
        if m is not None and axis is not None:
            out.append(pytest.param(name, kind, axis, try_line, *m.groups(), id=name))
    return out


@pytest.mark.parametrize("name, kind, axis, try_line, field, text", _suggested_entries())
def test_the_suggested_entry_changes_what_the_study_shows(name, kind, axis, try_line, field, text, tmp_path, monkeypatch):
    """The entry a notebook suggests, typed into its panel, moves the study's results and its
    summary (so trying it proves that an entry changes the result), and the notebook's text
    is the template's."""
    from workbook.tools.notebooks import DESIGN
    from workbook.ui import open_study

    nb = json.loads((ROOT / "notebooks" / name).read_text(encoding="utf-8"))
    assert any(try_line in "".join(c["source"]) for c in nb["cells"] if c["cell_type"] == "markdown"), try_line
    shutil.copytree(ROOT / "notebooks" / "designs", tmp_path / "designs")
    monkeypatch.setenv("WORKBOOK_RECORDS_DIR", str(tmp_path / "records"))
    panel = open_study(kind, tmp_path / DESIGN, axis=axis)
    results, summary = json.dumps(panel.outcome.results, sort_keys=True), panel.summary()
    assert panel.set(field, text), f"{name}: {try_line} was refused"
    assert json.dumps(panel.outcome.results, sort_keys=True) != results, f"{name}: {try_line} moves no result"
    assert panel.summary() != summary


@pytest.mark.slow
def test_nbval_bites_when_an_input_changes(tmp_path):
    """Re-running a study with one input changed makes nbval's comparison fail."""
    src = ROOT / "notebooks" / "1-restrictor-sizing.ipynb"
    work = tmp_path / "nb"
    shutil.copytree(ROOT / "notebooks" / "designs", work / "designs")
    shutil.copy(src, work / src.name)
    # the notebook shows the design file: a changed input in the file changes what it prints
    design = work / "designs" / "bin-tipper.toml"
    text = design.read_text(encoding="utf-8")
    assert 'bore = "80 mm"' in text
    design.write_text(text.replace('bore = "80 mm"', 'bore = "90 mm"', 1), encoding="utf-8")
    env = dict(os.environ, WORKBOOK_RECORDS_DIR=str(tmp_path / "records"))
    cmd = [sys.executable, "-m", "pytest", "--nbval", "-q", "-p", "no:cacheprovider",
           "--rootdir", str(work), str(work / src.name)]
    changed_run = subprocess.run(cmd, cwd=work, env=env, capture_output=True, text=True, timeout=300)
    assert changed_run.returncode == 1, changed_run.stdout[-2000:]
    assert "90 mm" in changed_run.stdout or "mismatch" in changed_run.stdout.lower()
    # and the unchanged design passes the same run
    design.write_text(text, encoding="utf-8")
    same_run = subprocess.run(cmd, cwd=work, env=env, capture_output=True, text=True, timeout=300)
    assert same_run.returncode == 0, same_run.stdout[-2000:]
