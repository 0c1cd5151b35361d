"""Design files (TOML): the demo, error messages with file, line and key, and dump/load.

The reference for what an entry means is the field declaration (Field.parse of the same
text, read independently with the standard library's tomllib); line numbers are found by
searching the raw text in the test.
"""

from __future__ import annotations

import math
from pathlib import Path

import pytest
from hypothesis import HealthCheck, given, settings
from hypothesis import strategies as st

try:
    import tomllib
except ModuleNotFoundError:  # Python 3.10
    import tomli as tomllib

from workbook import units
from workbook.design import DesignFileError, dump_design, load_design, loads_design
from workbook.errors import InputError
from workbook.inputs import AXIS_SECTIONS, BY_KEY
from workbook.record import inputs_from_values, values_from_inputs

DEMO = Path(__file__).resolve().parents[1] / "notebooks" / "designs" / "bin-tipper.toml"
TEXT = DEMO.read_text(encoding="utf-8")


def test_demo_values_equal_what_the_fields_parse():
    design = load_design(DEMO)
    raw = tomllib.loads(TEXT)
    defaults = raw.get("defaults", {})
    assert list(design.axes) == ["lift", "tip"]
    for key, axis in design.axes.items():
        own = raw["axes"][key]
        for sec in AXIS_SECTIONS:
            for f in sec.fields:
                entry = own.get(sec.key, {}).get(f.key, defaults.get(sec.key, {}).get(f.key))
                expected = f.default_si() if entry is None else f.parse(entry)
                assert axis.values[sec.key][f.key] == expected, (key, sec.key, f.key)
    assert design.machine["machine"] == raw["machine"]["name"] == "BT-2 bin tipper"   # demo scenario
    ident = design.identity_for("tip")
    assert set(ident) == set(BY_KEY["identity"].keys) and ident["axis"] == "tip" and ident["date"] == "2026-11-30"


def test_demo_settings_follow_from_its_own_numbers():
    """demo scenario, checked with force balance and continuity by hand:
    load-induced pressure p = F / A (A1 = pi D^2/4 cap side, A3 = pi (D^2-d^2)/4 rod side);
    counterbalance setting at least 1.3 x that pressure (common practice);
    metered flow q = v A of the chamber the valve serves (lift: metered into the rod side, A3;
    tip: metered out of the rod side, A3)."""
    d = load_design(DEMO)
    lift, tip = d.axes["lift"].values, d.axes["tip"].values
    a1 = math.pi / 4 * lift["cylinder"]["bore"] ** 2
    assert lift["holding"]["side"] == "cap" and lift["flow_valve"]["direction"] == "retract"
    assert lift["holding"]["setting"] >= 1.3 * max(lift["operation"]["loads"]) / a1
    a3_lift = math.pi / 4 * (lift["cylinder"]["bore"] ** 2 - lift["cylinder"]["rod"] ** 2)
    assert lift["flow_valve"]["arrangement"] == "meter-in"
    assert lift["flow_valve"]["setting"] == pytest.approx(lift["operation"]["target_speed"] * a3_lift, rel=0.02)
    a3 = math.pi / 4 * (tip["cylinder"]["bore"] ** 2 - tip["cylinder"]["rod"] ** 2)
    loads = tip["operation"]["loads"]
    assert min(loads) < 0 < max(loads)                                   # over centre
    assert tip["holding"]["side"] == "rod" and tip["flow_valve"]["direction"] == "extend"
    assert tip["holding"]["setting"] >= 1.3 * -min(loads) / a3
    assert tip["flow_valve"]["setting"] == pytest.approx(tip["operation"]["target_speed"] * a3, rel=0.02)
    # one power unit: both axes see the same supply
    assert lift["supply"] == tip["supply"]


def _line_of(text, needle):
    return next(i for i, line in enumerate(text.splitlines(), 1) if needle in line)


def _tip_stroke(new):
    return TEXT.replace('stroke = "400 mm"', new)


@pytest.mark.parametrize("text, needle, key, given, allowed", [
    (TEXT.replace('bore = "80 mm"', 'bore = "-80 mm"'), 'bore = "-80 mm"', "axes.lift.cylinder.bore",
     "'-80 mm'", "a length greater than 0 mm and at most 1000 mm"),
    (_tip_stroke('stroke = "400 bar"'), 'stroke = "400 bar"', "axes.tip.cylinder.stroke", "'400 bar'",
     "a length with a unit"),
    (_tip_stroke('strok = "400 mm"'), 'strok = "400 mm"', "axes.tip.cylinder.strok", "an unknown cylinder entry",
     "one of bore, rod, stroke, rated_pressure"),
    (TEXT.replace("[axes.tip.cylinder]", "[axes.tip.cylindr]"), "[axes.tip.cylindr]", "axes.tip.cylindr",
     "an unknown section", "one of title, cylinder, oil, supply"),
    (_tip_stroke('stroke = "400"'), 'stroke = "400"', "axes.tip.cylinder.stroke", "'400' (the unit is missing)",
     'written as text with its unit, e.g. "'),
    (_tip_stroke("stroke = 400"), "stroke = 400", "axes.tip.cylinder.stroke", "400 (the unit is missing)",
     "written as text with its unit"),
    (TEXT.replace('"-3 kN"]', '-3]'), '-3]', "axes.tip.operation.loads", "-3 (the unit is missing)",
     "a list of forces"),
    (TEXT.replace('relief_cracking = "160 bar"', 'relief_cracking = "160 kW"'), 'relief_cracking = "160 kW"',
     "defaults.supply.relief_cracking", "'160 kW'", "a pressure with a unit"),
    (TEXT.replace('revision = "A"', 'rev = "A"'), 'rev = "A"', "machine.rev", "an unknown entry",
     "one of name, revision, author, date"),
    (TEXT + "\n[pumps]\nsize = 1\n", "[pumps]", "pumps", "an unknown table", "one of machine, defaults, axes"),
    (TEXT.replace('side = "rod"', 'side = "piston"'), 'side = "piston"', "axes.tip.holding.side", "'piston'",
     "one of 'cap', 'rod'"),
])
def test_bad_entries_name_file_line_and_dotted_key(text, needle, key, given, allowed):
    with pytest.raises(DesignFileError) as info:
        loads_design(text, "bin-tipper.toml")
    e = info.value
    line = _line_of(text, needle)
    assert str(e).startswith(f"bin-tipper.toml, line {line}, {key}: got {given}"), str(e)
    assert allowed in e.allowed
    assert (e.file, e.line, e.key) == ("bin-tipper.toml", line, key)
    assert isinstance(e, InputError)


def test_toml_syntax_errors_give_the_line(tmp_path):
    text = _tip_stroke('stroke = "400 mm')
    path = tmp_path / "bin-tipper.toml"
    path.write_text(text, encoding="utf-8")
    with pytest.raises(DesignFileError) as info:
        load_design(path)
    line = _line_of(text, 'stroke = "400 mm')
    assert str(info.value).startswith(f"bin-tipper.toml, line {line}: got TOML it cannot read")


def test_defaults_are_shared_and_overridden_per_axis():
    text = TEXT.replace('[axes.tip.cylinder]', '[axes.tip.supply]\nrelief_cracking = "150 bar"\n\n[axes.tip.cylinder]')
    d = loads_design(text)
    relief = BY_KEY["supply"]["relief_cracking"]
    assert d.axes["lift"].values["supply"]["relief_cracking"] == relief.parse("160 bar")
    assert d.axes["tip"].values["supply"]["relief_cracking"] == relief.parse("150 bar")
    # not given anywhere: the field's default
    assert d.axes["tip"].values["limits"] == BY_KEY["limits"].defaults()


def test_design_without_axes_is_refused():
    with pytest.raises(DesignFileError, match=r"x.toml, axes: got a design without axes"):
        loads_design('[machine]\nname = "BT-2"\n', "x.toml")


def test_dump_and_load_round_trip_the_demo():
    d = load_design(DEMO)
    for complete in (True, False):
        text = dump_design(d, complete=complete)
        assert loads_design(text) == d
    assert '"80 mm"' in dump_design(d)


cyl = BY_KEY["cylinder"]


@settings(max_examples=25, deadline=None, suppress_health_check=[HealthCheck.too_slow])
@given(bore=st.floats(1e-4, 1.0), stroke=st.floats(1e-4, 20.0), temp=st.floats(-60, 150),
       name=st.text(st.characters(exclude_categories=("Cc", "Cf", "Cs", "Zl", "Zp")), max_size=20),
       loads=st.lists(st.floats(-5e7, 5e7), min_size=1, max_size=4))
def test_dump_and_load_round_trip_any_values(bore, stroke, temp, name, loads):
    d = load_design(DEMO)
    values = {k: dict(v) for k, v in d.axes["lift"].values.items()}
    values["cylinder"].update(bore=bore, stroke=stroke)
    values["operation"].update(temp_min=units.to_si(temp, "temperature", "t", "degC"), loads=loads)
    from dataclasses import replace
    d2 = replace(d, machine=dict(d.machine, author=name),
                 axes={**d.axes, "lift": replace(d.axes["lift"], values=values)})
    assert loads_design(dump_design(d2)) == d2


def test_design_values_go_into_a_record_and_back():
    for axis in load_design(DEMO).axes.values():
        assert values_from_inputs(inputs_from_values(axis.values)) == axis.values
