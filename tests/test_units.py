"""Unit parsing and conversion against NIST SP 811 factors and pint's own conversions."""

import math

import numpy as np
import pytest

from workbook import units
from workbook.errors import InputError


# NIST SP 811 (2008), Appendix B: conversion factors
@pytest.mark.parametrize(
    "text, dimension, expected_si, source",
    [
        ("1 psi", "pressure", 6.894757e3, "NIST SP 811 B.8: psi -> Pa = 6.894 757 E+03"),
        ("1 gallon", "volume", 3.785412e-3, "NIST SP 811 B.8: gallon [U.S.] -> m3 = 3.785 412 E-03"),
        ("1 in", "length", 2.54e-2, "NIST SP 811 B.8: inch -> m = 2.54 E-02 (exact)"),
        ("1 lbf", "force", 4.448222, "NIST SP 811 B.8: pound-force -> N = 4.448 222 E+00"),
        ("1 bar", "pressure", 1.0e5, "NIST SP 811 B.8: bar -> Pa = 1.0 E+05 (exact)"),
        ("1 cSt", "kinematic_viscosity", 1.0e-6, "NIST SP 811 B.8: centistokes -> m2/s = 1.0 E-06"),
        ("1 hp", "power", 7.456999e2, "NIST SP 811 B.8: horsepower (550 ft lbf/s) -> W = 7.456 999 E+02"),
        ("1 lb", "mass", 4.535924e-1, "NIST SP 811 B.8: pound (avoirdupois) -> kg = 4.535 924 E-01"),
    ],
)
def test_nist_sp811_factors(text, dimension, expected_si, source):
    assert units.to_si(text, dimension, "x") == pytest.approx(expected_si, rel=2e-7), source


def test_user_spellings_of_the_trade():
    # NIST SP 811: 1 US gallon = 3.785 411 784 L exactly; gpm is US gallons per minute (common practice)
    assert units.to_si("10 gpm", "flow", "pump flow") == pytest.approx(10 * 3.785411784e-3 / 60, rel=1e-12)
    assert units.to_si("40 L/min", "flow", "q") == pytest.approx(40e-3 / 60, rel=1e-12)
    assert units.to_si("63 mm", "length", "bore") == pytest.approx(0.063)
    assert units.to_si("2.5 in", "length", "bore") == pytest.approx(0.0635)
    assert units.to_si("160 bar", "pressure", "p") == pytest.approx(16e6)
    assert units.to_si("2300 psi", "pressure", "p") == pytest.approx(2300 * 6.894757293168e3, rel=1e-9)
    assert units.to_si("46 cSt", "kinematic_viscosity", "nu") == pytest.approx(46e-6)
    assert units.to_si("25 kN", "force", "F") == pytest.approx(25e3)
    assert units.to_si("5000 lbf", "force", "F") == pytest.approx(5000 * 4.4482216152605, rel=1e-9)
    # temperature scales (NIST SP 811 4.2.1.1): T/K = t/°C + 273.15 ; t/°F = 1.8 t/°C + 32
    assert units.to_si("40 degC", "temperature", "T") == pytest.approx(313.15)
    assert units.to_si("104 degF", "temperature", "T") == pytest.approx(313.15)
    assert units.to_si("40 °C", "temperature", "T") == pytest.approx(313.15)
    assert units.to_si("-10 degC", "temperature", "T") == pytest.approx(263.15)
    assert units.to_si("1500 rpm", "shaft_speed", "n") == pytest.approx(25.0)
    assert units.to_si("16 cm³", "displacement", "V") == pytest.approx(16e-6)


def test_agrees_with_pint_directly():
    # pint: the reference library for unit conversion
    import pint

    reg = pint.UnitRegistry()
    for text, target, dim in [("3.15 in", "m", "length"), ("2300 psi", "Pa", "pressure"),
                              ("12 gallon/minute", "m**3/s", "flow"), ("7.5 kW", "W", "power")]:
        number, unit = text.split(" ", 1)
        ref = reg.Quantity(float(number), unit).to(target).magnitude
        assert units.to_si(text, dim, "x") == pytest.approx(ref, rel=1e-12)


def test_quantities_and_bare_numbers():
    q = units.registry().Quantity(63, "mm")
    assert units.to_si(q, "length", "bore") == pytest.approx(0.063)
    assert units.to_si(63, "length", "bore", default_unit="mm") == pytest.approx(0.063)
    arr = units.to_si(np.array([1.0, 2.0]), "pressure", "p", default_unit="bar")
    assert np.allclose(arr, [1e5, 2e5])


def test_round_trip_from_si():
    for v, dim, unit in [(0.063, "length", "in"), (16e6, "pressure", "psi"), (313.15, "temperature", "degF")]:
        back = units.to_si(f"{units.from_si(v, dim, unit)!r} {unit}", dim, "x")
        assert back == pytest.approx(v, rel=1e-12)


@pytest.mark.parametrize(
    "value, dimension, needle",
    [
        ("5 bar", "length", "a pressure was given"),
        ("63 furlongs_per_fortnight", "length", "not a unit known here"),
        ("mm 63", "length", "start with a number"),
        ("63", "length", "the unit is missing"),
        ("", "pressure", "empty"),
        ("nan bar", "pressure", "start with a number"),
        (float("nan"), "pressure", "finite"),
        (math.inf, "pressure", "finite"),
        ([1, 2], "pressure", "allowed"),
    ],
)
def test_bad_unit_input_names_the_field(value, dimension, needle):
    kw = {"default_unit": "bar"} if isinstance(value, float) else {}
    with pytest.raises(InputError) as err:
        units.to_si(value, dimension, "my field", **kw)
    assert err.value.field == "my field"
    assert str(err.value).startswith("my field:")
    assert needle in str(err.value)
