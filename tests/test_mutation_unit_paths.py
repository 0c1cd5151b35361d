"""The less travelled paths of :mod:`workbook.units` (mutation testing of the unit layer): a
value that is not finite after conversion, the advice for an array whose unit carries an
absolute mark, the case hint that must not second-guess a symbol pint knows, and spellings of
workbook/unit_spelling.py no other test reads (superscript negative powers, Lpm). Each message
is the one the unit layer documents (house rule: bad input gets a clear message naming the
field and what is allowed, never a silent NaN).
"""

from __future__ import annotations

import math

import numpy as np
import pytest

from workbook import units
from workbook.errors import InputError


def _refusal(*args) -> InputError:
    with pytest.raises(InputError) as err:
        units.to_si(*args)
    return err.value


@pytest.mark.parametrize("value", [math.nan, math.inf, -math.inf])
def test_a_number_that_is_not_finite_is_refused_by_its_kind(value):
    # a plain number says "number"; a quantity names its dimension
    err = _refusal(value, "dimensionless", "study.share")
    assert (err.field, err.allowed) == ("study.share", "a finite number (not NaN or infinite)")
    err = _refusal(value, "pressure", "cylinder.rated_pressure", "bar")
    assert (err.field, err.allowed) == ("cylinder.rated_pressure", "a finite pressure (not NaN or infinite)")
    err = _refusal(np.array([1.0, value]), "kinematic_viscosity", "oil.nu40", "cSt")
    assert err.allowed == "a finite kinematic viscosity (not NaN or infinite)"


ABS_ADVICE = ("a pressure with a unit, e.g. 160 bar, 2300 psi, 16 MPa (write the pressure without the absolute "
              "mark 'abs': pressures here are gauge except in a field whose name says absolute, such as the "
              "cavitation limit, which takes the absolute value as written: {n} bar)")


@pytest.mark.parametrize("numbers, n", [([0.3, 0.5], "0.3"), ([2.5], "2.5"), ([], "1")])
def test_an_array_in_a_marked_unit_is_advised_with_its_first_number(numbers, n):
    """The advice repeats the first number of the array as typed (1 for an empty one, as for
    a unit without a number: unit_spelling.trap)."""
    err = _refusal(np.array(numbers), "pressure", "limits.cavitation_abs", "bar abs")
    assert (err.field, err.given, err.allowed) == ("limits.cavitation_abs", "an array", ABS_ADVICE.format(n=n))


def test_the_case_hint_leaves_a_symbol_pint_knows_alone():
    """Mm is the megametre (SI prefix M, BIPM SI Brochure): in an unknown unit it is not taken
    for a misspelt mm; KN is no SI symbol (k is the kilo prefix), so it is."""
    err = _refusal("5 Mm/qqq", "length", "cylinder.stroke")
    assert err.allowed == "a length with a unit, e.g. 63 mm, 2.5 in ('Mm/qqq' is not a unit known here)"
    err = _refusal("5 KN/qqq", "force", "operation.friction")
    assert err.allowed == ("a force with a unit, e.g. 25 kN, 5000 lbf ('KN/qqq' is not a unit known here; did you "
                           "mean kN? unit symbols are case-sensitive)")


@pytest.mark.parametrize("text, dimension, canonical, number", [
    # superscript negative powers (Unicode superscript minus, two and three) as a data sheet prints them
    ("16 N·mm⁻²", "pressure", "newton / millimeter ** 2", 16.0),
    ("870 kg·m⁻³", "density", "kilogram / meter ** 3", 870.0),
    # the capitalised spelling of litres per minute on pump plates
    ("20 Lpm", "flow", "liter / minute", 20.0),
])
def test_more_spellings_against_pints_canonical_unit(text, dimension, canonical, number):
    """Each spelling gives what pint gives for the canonical unit name (pint's own conversion,
    not the alias table); and by hand: 1 N/mm² = 1 MPa, 1 L/min = 1e-3/60 m³/s (NIST SP 811)."""
    expected = units.registry().Quantity(number, canonical).to(units.INTERNAL_UNIT[dimension]).magnitude
    assert units.to_si(text, dimension, "f") == pytest.approx(expected, rel=1e-12)


def test_the_superscript_and_lpm_spellings_by_hand():
    # NIST SP 811: 1 N/mm² = 1 MPa; 1 L = 1e-3 m³
    assert units.to_si("16 N·mm⁻²", "pressure", "f") == pytest.approx(16e6, rel=1e-12)
    assert units.to_si("20 Lpm", "flow", "f") == pytest.approx(20e-3 / 60, rel=1e-12)
    assert units.to_si("870 kg·m⁻³", "density", "f") == pytest.approx(870.0, rel=1e-12)


def test_dimension_names_in_words():
    # the words the design-file guide and the messages use for a dimension (units.noun)
    assert units.noun("dimensionless") == "plain number"
    assert units.noun("per_temperature") == "coefficient per temperature"
    assert units.noun("kinematic_viscosity") == "kinematic viscosity"
