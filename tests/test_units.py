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


# ---------------------------------------------------------------------------- what a unit was read as
TEMPERATURE = "a temperature with a unit, e.g. 40 degC, 104 degF, 313 K"
FORCE = "a force with a unit, e.g. 25 kN, 5000 lbf"
PRESSURE = "a pressure with a unit, e.g. 160 bar, 2300 psi, 16 MPa"
ANGLE = "an angle with a unit, e.g. 30 deg"


@pytest.mark.parametrize("text, dimension, field, message", [
    # SI symbols that mean something else: C is the coulomb, F the farad (SI brochure, table 4)
    ("15 C", "temperature", "temp_min", f"temp_min: got '15 C'; allowed: {TEMPERATURE} "
     "(C is the coulomb, an electric charge; for a temperature write 15 degC or 15 °C)"),
    ("60 F", "temperature", "temp_max", f"temp_max: got '60 F'; allowed: {TEMPERATURE} "
     "(F is the farad, an electric capacitance; for a temperature write 60 degF or 60 °F)"),
    ("40 deg", "temperature", "design_temp", f"design_temp: got '40 deg'; allowed: {TEMPERATURE} "
     "(deg is the degree of arc, an angle; for a temperature write 40 degC or 40 degF)"),
    ("7e-4 1/C", "per_temperature", "expansion", "expansion: got '7e-4 1/C'; allowed: a coefficient per "
     "temperature with a unit, e.g. 7e-4 1/K (C is the coulomb, an electric charge; for a coefficient per "
     "degree write 7e-4 1/K or 7e-4 1/degC)"),
    # a mass where a force is wanted (NIST SP 811 B.8: lb is the pound mass, lbf the pound-force)
    ("10 lb", "force", "friction", f"friction: got '10 lb'; allowed: {FORCE} "
     "(lb is the pound as a mass; the pound-force is lbf: write 10 lbf)"),
    ("800 kg", "force", "friction", f"friction: got '800 kg'; allowed: {FORCE} (a mass is not a force: write "
     "the force in N, kN or lbf; a mass of 1 t weighs 9.807 kN at standard gravity)"),
    ("800 kgf", "mass", "mass", "mass: got '800 kgf'; allowed: a mass with a unit, e.g. 800 kg, 1800 lb "
     "(a force is not a mass: write the mass in kg, t or lb)"),
    ("25 kn", "force", "friction", f"friction: got '25 kn'; allowed: {FORCE} "
     "(kn is the knot, a speed; for kilonewtons write 25 kN)"),
    ("2 m", "time", "dwell", "dwell: got '2 m'; allowed: a time with a unit, e.g. 2 s "
     "(m is the metre; for minutes write 2 min)"),
    # a percent is a ratio, not an angle (slope 1 % = atan(0.01) = 0.5729 deg by hand)
    ("1 %", "angle", "inclination", f"inclination: got '1 %'; allowed: {ANGLE} "
     "(a percent is a ratio, not an angle: write an angle such as 3 deg; a slope of 1 % is an angle of 0.5729 deg)"),
    ("5 bar", "angle", "half_angle", f"half_angle: got '5 bar'; allowed: {ANGLE} (a pressure was given)"),
    ("1 %", "pressure", "setting", f"setting: got '1 %'; allowed: {PRESSURE} (a percentage was given)"),
    ("3 deg", "pressure", "setting", f"setting: got '3 deg'; allowed: {PRESSURE} (an angle was given)"),
    ("5 pct", "dimensionless", "droop", "droop: got '5 pct'; allowed: a plain number or a percentage, e.g. "
     "0.61, 3, 15 % (pct reads as the picocarat, a mass; for a percentage write 5 %)"),
    ("5 bar", "dimensionless", "cd", "cd: got '5 bar'; allowed: a plain number or a percentage, e.g. "
     "0.61, 3, 15 % (a pressure was given)"),
    # gauge and absolute marks: pressures are gauge throughout (DESIGN.md, Fluid)
    ("160 barg", "pressure", "relief_cracking", f"relief_cracking: got '160 barg'; allowed: {PRESSURE} "
     "(pressures are gauge here: write 160 bar, without the gauge mark 'g')"),
    ("160 bar g", "pressure", "relief_cracking", f"relief_cracking: got '160 bar g'; allowed: {PRESSURE} "
     "(pressures are gauge here: write 160 bar, without the gauge mark 'g')"),
    ("160 bar(g)", "pressure", "relief_cracking", f"relief_cracking: got '160 bar(g)'; allowed: {PRESSURE} "
     "(pressures are gauge here: write 160 bar, without the gauge mark 'g')"),
    ("2300 psig", "pressure", "relief_cracking", f"relief_cracking: got '2300 psig'; allowed: {PRESSURE} "
     "(pressures are gauge here: write 2300 psi, without the gauge mark 'g')"),
    ("0.3 bar abs", "pressure", "cavitation_abs", f"cavitation_abs: got '0.3 bar abs'; allowed: {PRESSURE} "
     "(write the pressure without the absolute mark 'abs': pressures here are gauge except in a field whose "
     "name says absolute, such as the cavitation limit, which takes the absolute value as written: 0.3 bar)"),
    ("14.7 psia", "pressure", "tank_pressure", f"tank_pressure: got '14.7 psia'; allowed: {PRESSURE} "
     "(write the pressure without the absolute mark 'a': pressures here are gauge except in a field whose "
     "name says absolute, such as the cavitation limit, which takes the absolute value as written: 14.7 psi)"),
    # symbols with the wrong case: SI symbols are case-sensitive (SI brochure, 5.2)
    ("16 Mpa", "pressure", "rated_pressure", f"rated_pressure: got '16 Mpa'; allowed: {PRESSURE} "
     "('Mpa' is not a unit known here; did you mean MPa? unit symbols are case-sensitive)"),
    ("25 KN", "force", "friction", f"friction: got '25 KN'; allowed: {FORCE} "
     "('KN' is not a unit known here; did you mean kN? unit symbols are case-sensitive)"),
    ("46 cst", "kinematic_viscosity", "nu40", "nu40: got '46 cst'; allowed: a kinematic viscosity with a "
     "unit, e.g. 46 cSt, 46 mm**2/s ('cst' is not a unit known here; did you mean cSt? unit symbols are "
     "case-sensitive)"),
    # the unit as typed is echoed, not pint's spelling of it
    ("16 cm³/turnip", "displacement", "displacement", "displacement: got '16 cm³/turnip'; allowed: a "
     "displacement with a unit, e.g. 16 cm**3, 1 in**3 (per revolution) ('cm³/turnip' is not a unit known here)"),
])
def test_what_a_unit_was_read_as_and_what_to_write(text, dimension, field, message):
    with pytest.raises(InputError) as err:
        units.to_si(text, dimension, field)
    assert err.value.field == field
    assert str(err.value) == message


def test_the_traps_are_still_what_pint_says_they_are():
    # pint (the reference library): the symbols the messages above explain really are these units
    import pint

    reg = pint.UnitRegistry()
    assert str(reg.Unit("C")) == "coulomb" and str(reg.Unit("F")) == "farad"
    assert str(reg.Unit("kn")) == "knot" and str(reg.Unit("lb")) == "pound" and str(reg.Unit("m")) == "meter"
    assert str(reg.Unit("pct")) == "picocarat"
    assert reg.Quantity(1, "percent").to("dimensionless").magnitude == pytest.approx(0.01)


def test_an_angle_needs_an_angle_unit():
    # pint counts the radian as dimensionless; the workbook does not let a ratio pass as one
    q = units.registry().Quantity
    assert units.to_si("3 deg", "angle", "a") == pytest.approx(math.radians(3), rel=1e-12)
    assert units.to_si("0.25 turn", "angle", "a") == pytest.approx(math.pi / 2, rel=1e-12)
    assert units.to_si(3, "angle", "a", default_unit="deg") == pytest.approx(math.radians(3), rel=1e-12)
    with pytest.raises(InputError) as err:
        units.to_si(q(0.5, "dimensionless"), "angle", "inclination")
    assert str(err.value) == (f"inclination: got 0.5 dimensionless; allowed: {ANGLE} (a plain number or ratio "
                              "is not an angle: write the angle with its unit, e.g. 3 deg)")


def test_what_kind_of_value_was_given_reads_as_english():
    for value, words in [(None, "None"), ([1], "a list"), ({}, "a dict"), (1j, "a complex"), (object(), "an object")]:
        with pytest.raises(InputError) as err:
            units.to_si(value, "length", "bore")
        assert err.value.given == words
