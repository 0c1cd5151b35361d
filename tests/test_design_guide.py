"""The guide to the design file (notebooks/designs/README.md) is the catalogue rendered: it is
the committed file, it lists every field of every table with its unit, range and default or
"required", and its worked example is a design file the workbook reads and evaluates."""

from __future__ import annotations

import math
import re
from pathlib import Path

import pytest

from workbook import cycle_file, review, units
from workbook.design import loads_design, machine_fields
from workbook.errors import InputError
from workbook.inputs import AXIS_SECTIONS, CYCLE, IDENTITY
from workbook.tools import design_guide

try:
    import tomllib
except ModuleNotFoundError:  # Python 3.10
    import tomli as tomllib

ROOT = Path(__file__).resolve().parents[1]
GUIDE = ROOT / design_guide.GUIDE_PATH


@pytest.fixture(scope="module")
def text():
    return design_guide.render()


def _block(text: str, heading_start: str) -> str:
    """The part of the guide under the ``###`` heading that starts with ``heading_start``."""
    parts = re.split(r"(?m)^### ", text)
    found = [p for p in parts if p.startswith(heading_start)]
    assert len(found) == 1, f"one heading {heading_start!r} in the guide, found {len(found)}"
    return found[0]


def _row(block: str, key: str) -> list[str]:
    rows = [line for line in block.splitlines() if line.startswith(f"| `{key}` |")]
    assert len(rows) == 1, f"one row for {key!r}, found {len(rows)}"
    return [c.strip() for c in re.split(r"(?<!\\)\|", rows[0])[1:-1]]


def test_the_committed_guide_is_the_catalogue_rendered(text):
    committed = GUIDE.read_text(encoding="utf-8")
    assert committed == text, (f"{design_guide.GUIDE_PATH} is out of date with the catalogue: "
                               "run `make design-guide` and commit the result")


@pytest.mark.parametrize("sec", AXIS_SECTIONS, ids=lambda s: s.key)
def test_every_field_of_every_axis_section_has_its_row(text, sec):
    block = _block(text, f"`[axes.<key>.{sec.key}]` and `[defaults.{sec.key}]`")
    for f in sec.fields:
        key, meaning, unit, allowed, default, source = _row(block, f.key)
        assert f.label.replace("*", "\\*") in meaning
        assert (default == "**required**") == bool(f.required), f.key
        if f.is_quantity and f.unit:
            # the display unit as people write it (cm**3 as cm³), and the bounds in it
            shown = f.unit.replace("**3", "³").replace("**2", "²").replace("degC", "°C")
            assert unit.startswith(shown), (f.key, unit)
        if f.dimension == "choice":
            assert all(f"`{c}`" in allowed for c in f.choices)
        if f.high is not None and f.dimension != "choice":
            assert design_guide._num(f.high) in allowed, (f.key, allowed)
        if not f.required and f.source:
            assert source == design_guide._cell(f.source)


def test_the_machine_table_the_cycle_and_its_steps_have_every_key(text):
    block = _block(text, "`[machine]`")
    renamed = {f.key: k for k, f in machine_fields().items()}
    for f in IDENTITY.fields:
        if f.key in renamed:
            _row(block, renamed[f.key])
    block = _block(text, "`[cycle]`")
    for f in CYCLE.fields:
        assert (_row(block, f.key)[4] == "**required**") == bool(f.required)
    block = _block(text, "`[[cycle.steps]]`")
    for key in cycle_file.STEP_KEYS:
        _row(block, key)
    _row(_block(text, "`[axes.<key>]`"), "title")


def test_a_required_field_is_rendered_required(monkeypatch):
    # the lead sets Field.required; whatever it says is what the guide says
    import dataclasses

    from workbook import inputs

    sec = inputs.CYLINDER
    flagged = dataclasses.replace(sec["stroke"], required=True)
    changed = dataclasses.replace(sec, fields=tuple(flagged if f.key == "stroke" else f for f in sec.fields))
    monkeypatch.setattr(design_guide, "AXIS_SECTIONS",
                        tuple(changed if s.key == "cylinder" else s for s in design_guide.AXIS_SECTIONS))
    block = _block(design_guide.render(), "`[axes.<key>.cylinder]`")
    assert _row(block, "stroke")[4:] == ["**required**", "—"]
    assert _row(block, "bore")[4] != "**required**" or sec["bore"].required


def _example_of(text: str) -> str:
    found = re.findall(r"(?ms)^```toml\n(.*?)^```", text)
    assert len(found) == 1
    return found[0]


def test_the_worked_example_is_read_and_evaluated_without_a_bad_input():
    example = _example_of(GUIDE.read_text(encoding="utf-8"))
    assert example == design_guide.EXAMPLE
    design = loads_design(example, "compactor.toml")
    try:
        out = review.evaluate_design(design)
        machine = review.evaluate_machine(design)
    except InputError as exc:   # DesignFileError included
        pytest.fail(f"the guide's worked example is refused: {exc}; make the example complete")
    assert list(out) == ["press"] and machine is not None
    record, outcomes = out["press"]
    assert outcomes and record.studies


def test_the_worked_example_gives_every_required_entry():
    data = tomllib.loads(design_guide.EXAMPLE)
    for axis, spec in data["axes"].items():
        for sec in AXIS_SECTIONS:
            given = set(spec.get(sec.key, {})) | set(data.get("defaults", {}).get(sec.key, {}))
            missing = [f.key for f in sec.fields if f.required and f.key not in given]
            assert not missing, f"the example's axis {axis} leaves out required {sec.key} entries {missing}"
    missing = [f.key for f in CYCLE.fields if f.required and f.key not in data.get("cycle", {})]
    assert not missing, f"the example's [cycle] leaves out required entries {missing}"


def test_the_sign_example_by_hand(text):
    # weight along a rod pointing down: m g sin(-90 deg) = -600 kg x 9.80665 m/s^2 (standard
    # gravity, NIST SP 811) = -5883.99 N; with the -1.5 kN case: -7383.99 N
    assert 600 * 9.80665 * math.sin(math.radians(-90)) == pytest.approx(-5883.99, abs=1e-6)
    assert "= -5.884 kN, so the load cases 0 kN and -1.5 kN become -5.884 kN and -7.384 kN" in text
    assert "`-90 deg` a vertical cylinder with the rod pointing down" in text


@pytest.mark.parametrize("typed, dimension, canonical", design_guide.SPELLINGS)
def test_every_spelling_the_guide_shows_is_read_as_it_says(typed, dimension, canonical):
    assert units.to_si(typed, dimension, "x") == pytest.approx(units.to_si(canonical, dimension, "x"), rel=1e-12)


def test_check_says_to_run_make_design_guide(tmp_path, capsys):
    stale = tmp_path / "README.md"
    stale.write_text("# Design files\n", encoding="utf-8")
    assert design_guide.main(["--check", str(stale)]) == 1
    assert "run `make design-guide`" in capsys.readouterr().err
    assert design_guide.main([str(stale)]) == 0
    assert design_guide.main(["--check", str(stale)]) == 0
