"""Bad input: each case raises InputError whose message names the field and what is allowed."""

import math

import pytest

from workbook import inputs
from workbook.cylinder import Cylinder
from workbook.errors import InputError
from workbook.fluid import Oil

C = 273.15


def _field(section, key):
    return inputs.section(section)[key]


CASES = [
    # (description, callable, field named in the message, words of the allowed part)
    ("zero bore", lambda: _field("cylinder", "bore").parse("0 mm"), "bore", "greater than 0 mm"),
    ("negative bore", lambda: _field("cylinder", "bore").parse("-63 mm"), "bore", "greater than 0 mm"),
    ("pressure for a length", lambda: _field("cylinder", "rod").parse("160 bar"), "rod", "a pressure was given"),
    ("length for a pressure", lambda: _field("cylinder", "rated_pressure").parse("80 mm"), "rated_pressure",
     "a length was given"),
    ("rod not smaller than bore", lambda: Cylinder(0.05, 0.05), "rod", "smaller than the bore"),
    ("rod larger than bore", lambda: Cylinder(0.05, 0.08), "rod", "smaller than the bore"),
    ("NaN bore", lambda: Cylinder(math.nan, 0.02), "bore", "finite"),
    ("inf stroke", lambda: Cylinder(0.08, 0.045, math.inf), "stroke", "finite"),
    ("NaN text", lambda: _field("cylinder", "bore").parse("nan mm"), "bore", "start with a number"),
    ("inf number", lambda: _field("supply", "relief_cracking").parse(math.inf), "relief_cracking", "finite"),
    ("unknown unit", lambda: _field("cylinder", "bore").parse("80 smoots"), "bore", "not a unit known here"),
    ("negative friction", lambda: _field("operation", "friction").parse("-0.2 kN"), "friction", "at least 0 kN"),
    ("empty text", lambda: _field("operation", "friction").parse(""), "friction", "empty"),
    ("text for a number", lambda: _field("cylinder", "stroke").parse("long"), "stroke", "start with a number"),
    ("unknown choice", lambda: _field("flow_valve", "arrangement").parse("meter-sideways"), "arrangement",
     "meter-in"),
    ("efficiency above one", lambda: _field("supply", "volumetric_efficiency").parse(1.2), "volumetric_efficiency",
     "at most 1"),
    ("temperature below the bounds", lambda: _field("operation", "temp_min").parse("-100 degC"), "temp_min",
     "at least -60 degC"),
    ("temperature below pour point", lambda: Oil.from_grade("VG46").kinematic_viscosity(-45 + C),
     "oil temperature", "pour point"),
    ("temperature above 2 cSt validity", lambda: Oil.from_grade("VG22").kinematic_viscosity(200 + C),
     "oil temperature", "2 cSt"),
    ("nu100 above nu40", lambda: Oil(32e-6, 40e-6), "nu100", "below the 40 °C value"),
    ("unknown grade", lambda: Oil.from_grade("VG47"), "grade", "VG46"),
    ("empty pilot-ratio list", lambda: _field("study", "pilot_ratios").parse([]), "pilot_ratios", "at least one"),
    ("speed for a force in list", lambda: _field("operation", "loads").parse(["2 kN", "3 m/s"]), "loads",
     "a velocity was given"),
    ("unknown section key", lambda: inputs.CYLINDER.parse({"bore": "80 mm", "colour": "red"}, where="lift.cylinder"),
     "lift.cylinder.colour", "one of bore"),
    ("bad entry inside a section", lambda: inputs.CYLINDER.parse({"bore": "-1 mm"}, where="lift.cylinder"),
     "lift.cylinder.bore", "greater than 0"),
    ("wrong type for text", lambda: _field("identity", "machine").parse(12), "machine", "text"),
]


@pytest.mark.parametrize("what, call, field, words", CASES, ids=[c[0] for c in CASES])
def test_bad_input_is_named(what, call, field, words):
    with pytest.raises(InputError) as err:
        call()
    assert err.value.field == field, str(err.value)
    message = str(err.value)
    assert message.startswith(field + ":")
    assert "allowed:" in message
    if words:
        assert words in message, message


def test_at_least_twenty_cases():
    assert len(CASES) >= 20


def test_every_default_names_its_source():
    """House rule: an engineering default says where it comes from (a standard, "common
    practice", "from memory", the user's data sheet or the demo scenario)."""
    missing = [f"{s.key}.{f.key}" for s in inputs.SECTIONS for f in s.fields
               if f.dimension != "text" and f.default not in (None, "") and not f.source]
    assert not missing, missing
