"""Every unit alias the parser accepts gives pint's own conversion of the canonical name
(source: pint, a fresh default registry, independent of the workbook's; gallon is the US
liquid gallon, NIST SP 811: 1 gal = 3.785 411 784 L; 1 cc = 1 cm³, common practice)."""

from __future__ import annotations

import pint
import pytest

from workbook import units
from workbook.units import to_si

REF = pint.UnitRegistry()   # a registry of its own: the reference, not the code under test

# (text with the alias, dimension, canonical pint expression of the same quantity)
CASES = [
    ("104 °F", "temperature", "degree_Fahrenheit", 104.0),
    ("104 degF", "temperature", "degree_Fahrenheit", 104.0),
    ("-40 °F", "temperature", "degree_Fahrenheit", -40.0),
    ("40 °C", "temperature", "degree_Celsius", 40.0),
    ("40 ℃", "temperature", "degree_Celsius", 40.0),
    ("40 degC", "temperature", "degree_Celsius", 40.0),
    ("313 K", "temperature", "kelvin", 313.0),
    ("2300 psi", "pressure", "pound_force_per_square_inch", 2300.0),
    ("160 bar", "pressure", "bar", 160.0),
    ("16 MPa", "pressure", "megapascal", 16.0),
    ("10 gpm", "flow", "gallon / minute", 10.0),
    ("40 L/min", "flow", "liter / minute", 40.0),
    ("16 cc", "displacement", "centimeter ** 3", 16.0),
    ("16 cm³", "displacement", "centimeter ** 3", 16.0),
    ("16 cm**3", "displacement", "centimeter ** 3", 16.0),
    ("12 mm²", "area", "millimeter ** 2", 12.0),
    ("46 cSt", "kinematic_viscosity", "centistokes", 46.0),
    ("46 mm²/s", "kinematic_viscosity", "millimeter ** 2 / second", 46.0),
    ("250 µm", "length", "micrometer", 250.0),
    ("250 μm", "length", "micrometer", 250.0),
    ("2.5 in", "length", "inch", 2.5),
    ("5000 lbf", "force", "pound_force", 5000.0),
    ("10 hp", "power", "horsepower", 10.0),
    ("1500 rpm", "shaft_speed", "revolution / minute", 1500.0),
    # volumes with the power written as a digit or a superscript (common practice in data sheets)
    ("1 cm3", "volume", "centimeter ** 3", 1.0),
    ("1 mm³", "volume", "millimeter ** 3", 1.0),
    ("1 mm3", "volume", "millimeter ** 3", 1.0),
    ("1 dm³", "volume", "decimeter ** 3", 1.0),
    ("1 dm3", "volume", "decimeter ** 3", 1.0),
    ("1 m³", "volume", "meter ** 3", 1.0),
    ("1 m3", "volume", "meter ** 3", 1.0),
    ("90 in3", "volume", "inch ** 3", 90.0),
    ("12 mm2", "area", "millimeter ** 2", 12.0),
    ("1.3 m2", "area", "meter ** 2", 1.3),
    ("870 kg/m3", "density", "kilogram / meter ** 3", 870.0),
    ("46 mm2/s", "kinematic_viscosity", "millimeter ** 2 / second", 46.0),
    ("40 m3/h", "flow", "meter ** 3 / hour", 40.0),
    ("40 cm3/s", "flow", "centimeter ** 3 / second", 40.0),
    # temperature scales written in two parts or as words (NIST SP 811 4.2.1.1 for the scales)
    ("15 deg C", "temperature", "degree_Celsius", 15.0),
    ("15 deg c", "temperature", "degree_Celsius", 15.0),
    ("15 ° C", "temperature", "degree_Celsius", 15.0),
    ("15 degrees C", "temperature", "degree_Celsius", 15.0),
    ("15 Celsius", "temperature", "degree_Celsius", 15.0),
    ("15 degree Celsius", "temperature", "degree_Celsius", 15.0),
    ("59 deg F", "temperature", "degree_Fahrenheit", 59.0),
    ("59 ℉", "temperature", "degree_Fahrenheit", 59.0),
    ("59 Fahrenheit", "temperature", "degree_Fahrenheit", 59.0),
    # flows: litres per minute however it is written, US gallons per minute (NIST SP 811)
    ("40 l/min", "flow", "liter / minute", 40.0),
    ("40 lpm", "flow", "liter / minute", 40.0),
    ("40 LPM", "flow", "liter / minute", 40.0),
    ("10 GPM", "flow", "gallon / minute", 10.0),
    ("0.5 bar/lpm", "pressure_per_flow", "bar / (liter / minute)", 0.5),
    # pump displacement per revolution: the revolution is the unit of the shaft, so cm³/rev is
    # the volume of one revolution (common practice)
    ("16 cc/rev", "displacement", "centimeter ** 3", 16.0),
    ("16 cm³/rev", "displacement", "centimeter ** 3", 16.0),
    ("16 cm3/rev", "displacement", "centimeter ** 3", 16.0),
    ("16 cm^3/rev", "displacement", "centimeter ** 3", 16.0),
    ("16 ml/rev", "displacement", "milliliter", 16.0),
    ("1 in3/rev", "displacement", "inch ** 3", 1.0),
    ("16 cm3", "displacement", "centimeter ** 3", 16.0),
    # shaft speeds: a rotational frequency written in 1/min or Hz counts revolutions (ISO 80000-3:
    # rotational frequency n, unit s^-1; motor plates write min^-1 for revolutions per minute)
    ("1500 RPM", "shaft_speed", "revolution / minute", 1500.0),
    ("1500 rev/min", "shaft_speed", "revolution / minute", 1500.0),
    ("1450 1/min", "shaft_speed", "revolution / minute", 1450.0),
    ("1450 min-1", "shaft_speed", "revolution / minute", 1450.0),
    ("1450 min⁻¹", "shaft_speed", "revolution / minute", 1450.0),
    ("1450 min^-1", "shaft_speed", "revolution / minute", 1450.0),
    ("25 Hz", "shaft_speed", "revolution / second", 25.0),
    # forces and masses
    ("25 kN", "force", "kilonewton", 25.0),
    ("500 kgf", "force", "kilogram_force", 500.0),
    ("5 t", "mass", "metric_ton", 5.0),
    ("5 tonne", "mass", "metric_ton", 5.0),
    # other capitalisations of the trade's non-SI abbreviations
    ("2300 PSI", "pressure", "pound_force_per_square_inch", 2300.0),
    ("10 HP", "power", "horsepower", 10.0),
    ("7e-4 /K", "per_temperature", "1 / kelvin", 7e-4),
    ("0.04 Pa·s", "dynamic_viscosity", "pascal * second", 0.04),
    ("10 cmH2O", "pressure", "centimeter_H2O", 10.0),       # a digit inside a name is not a power
]


@pytest.mark.parametrize("text, dimension, canonical, number", CASES)
def test_alias_gives_pints_conversion_of_the_canonical_name(text, dimension, canonical, number):
    expected = REF.Quantity(number, REF.Unit(canonical)).to(units.INTERNAL_UNIT[dimension]).magnitude
    assert to_si(text, dimension, field="x") == pytest.approx(expected, rel=1e-12, abs=1e-12)


def test_fahrenheit_is_not_celsius():
    # 104 degF = 40 degC = 313.15 K (NIST SP 811: t/degC = (t/degF - 32)/1.8)
    assert to_si("104 °F", "temperature") == pytest.approx(313.15, abs=1e-9)
    assert to_si("32 °F", "temperature") == pytest.approx(273.15, abs=1e-9)


@pytest.mark.parametrize("unit, dimension, si, expected", [
    # from_si checked against outside figures, not against itself
    ("degF", "temperature", 313.15, 104.0),                 # NIST SP 811
    ("°F", "temperature", 273.15, 32.0),                    # NIST SP 811
    ("°C", "temperature", 273.15, 0.0),                     # NIST SP 811
    ("psi", "pressure", 6894.757293168361, 1.0),            # NIST SP 811: 1 psi = 6.894 757 kPa
    ("gpm", "flow", 3.785411784e-3 / 60, 1.0),              # NIST SP 811: US gallon
    ("cc", "volume", 1e-6, 1.0),                            # common practice
    ("cm³", "volume", 1e-6, 1.0),
])
def test_from_si_against_published_factors(unit, dimension, si, expected):
    assert units.from_si(si, dimension, unit) == pytest.approx(expected, rel=1e-9, abs=1e-9)
