"""The unit layer's tables against outside facts: every dimension's internal unit is the SI
unit of the units module's table (SI brochure, BIPM; pint's own registry as the reference for
the conversion), every example an error message offers is accepted input of its dimension,
and the aliases are read as what they name (NIST SP 811 for °F, °C; US gallon 3.785 411 784 L).
"""

from __future__ import annotations

import re

import pint
import pytest

from workbook import units
from workbook.errors import InputError

REF = pint.UnitRegistry()   # the reference registry, independent of the workbook's

#: the internal unit of each dimension name, as documented in the units module (SI brochure)
SI = {
    "length": "m", "area": "m**2", "volume": "m**3", "pressure": "Pa", "flow": "m**3/s",
    "kinematic_viscosity": "m**2/s", "dynamic_viscosity": "Pa*s", "temperature": "K", "force": "N",
    "mass": "kg", "density": "kg/m**3", "velocity": "m/s", "angle": "rad", "time": "s", "power": "W",
    "shaft_speed": "revolution/s", "displacement": "m**3", "per_temperature": "1/K",
    "pressure_per_flow": "Pa/(m**3/s)", "dimensionless": "dimensionless",
}

#: one quantity of each dimension in a unit other than the internal one, and its SI value by
#: hand (NIST SP 811 factors; 1 cP = 1 mPa s; 1 rpm = 1/60 rev/s)
OUTSIDE = {
    "length": ("63 mm", 0.063), "area": ("12 mm**2", 12e-6), "volume": ("1.5 L", 1.5e-3),
    "pressure": ("160 bar", 160e5), "flow": ("60 L/min", 1e-3), "kinematic_viscosity": ("46 cSt", 46e-6),
    "dynamic_viscosity": ("40 cP", 0.040), "temperature": ("40 degC", 313.15), "force": ("25 kN", 25e3),
    "mass": ("800 g", 0.8), "density": ("0.87 g/cm**3", 870.0), "velocity": ("100 mm/s", 0.1),
    "angle": ("180 deg", 3.141592653589793), "time": ("2 min", 120.0), "power": ("7.5 kW", 7500.0),
    "shaft_speed": ("1500 rpm", 25.0), "displacement": ("16 cm**3", 16e-6), "per_temperature": ("7e-4 1/K", 7e-4),
    "pressure_per_flow": ("1 bar/(L/min)", 1e5 * 60000), "dimensionless": ("15 %", 0.15),
}


def test_every_dimension_has_its_si_unit():
    assert units.INTERNAL_UNIT == SI
    assert set(units.EXAMPLES) == set(SI)


@pytest.mark.parametrize("dimension", sorted(SI))
def test_every_dimension_converts_to_si(dimension):
    text, si = OUTSIDE[dimension]
    assert units.to_si(text, dimension, field="x") == pytest.approx(si, rel=1e-12)
    # and back, and through pint's own registry
    unit = text.split(" ", 1)[1]
    assert units.from_si(si, dimension, unit) == pytest.approx(float(text.split(" ", 1)[0]), rel=1e-12)
    ref = REF.Quantity(float(text.split(" ", 1)[0]), REF.Unit(unit.replace("%", "percent")))
    assert ref.to(REF.Unit(SI[dimension])).magnitude == pytest.approx(si, rel=1e-12)


@pytest.mark.parametrize("dimension", sorted(SI))
def test_every_example_offered_is_accepted(dimension):
    # an error message tells the user "e.g. <these>": each must be valid input of its dimension
    examples = re.sub(r"\s+\([a-z ]+\)", "", units.EXAMPLES[dimension]).split(",")   # drop "(per revolution)"
    assert examples
    for ex in examples:
        value = units.to_si(ex.strip(), dimension, field="x")
        assert value == value and value > 0, ex


@pytest.mark.parametrize("dimension", sorted(set(SI) - {"dimensionless"}))
def test_a_wrong_dimension_names_the_field_and_the_example(dimension):
    other = "1 kg" if dimension not in ("mass",) else "1 m"
    with pytest.raises(InputError) as err:
        units.to_si(other, dimension, field="the field")
    msg = str(err.value)
    assert "the field" in msg and units.EXAMPLES[dimension] in msg


@pytest.mark.parametrize("text, dimension, si", [
    ("104 °F", "temperature", 313.15),          # NIST SP 811: t/°C = (t/°F - 32)/1.8
    ("212 °F", "temperature", 373.15),
    ("100 ℃", "temperature", 373.15),
    ("0 °C", "temperature", 273.15),
    ("1 cm³", "volume", 1e-6),
    ("1 mm²", "area", 1e-6),
    ("1 µm", "length", 1e-6),                   # micro sign U+00B5
    ("1 μm", "length", 1e-6),                   # Greek mu U+03BC
    ("1 gpm", "flow", 3.785411784e-3 / 60),     # NIST SP 811: US gallon
    ("1 cc", "displacement", 1e-6),             # common practice: 1 cc = 1 cm³
])
def test_aliases_mean_what_they_name(text, dimension, si):
    assert units.to_si(text, dimension, field="x") == pytest.approx(si, rel=1e-12, abs=1e-12)


def test_from_si_and_quantity_take_the_aliases():
    assert units.from_si(373.15, "temperature", "°F") == pytest.approx(212.0, abs=1e-9)
    assert units.from_si(373.15, "temperature", "℃") == pytest.approx(100.0, abs=1e-9)
    assert units.quantity(313.15, "temperature", "°F").magnitude == pytest.approx(104.0, abs=1e-9)
    assert units.check_unit("cm³", "volume") == "cm³"
    with pytest.raises(KeyError):
        units.check_unit("°F", "pressure")
